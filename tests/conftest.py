"""Shared fixtures: the two shipped Green Book road tables."""

from __future__ import annotations

import pytest

from curvetui.tables import road_table


@pytest.fixture(scope="session")
def us():
    """AASHTO Green Book 2018 table, US customary (mph, ft)."""
    return road_table("aashto-2018-us")


@pytest.fixture(scope="session")
def metric():
    """AASHTO Green Book 2018 table, metric (km/h, m)."""
    return road_table("aashto-2018-metric")

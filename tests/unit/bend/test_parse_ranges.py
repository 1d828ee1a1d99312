"""Range checks of the parse step at a table's ends in the other unit system.

A US table ends at 80 mph; 80 mph is exactly 128.74752 km/h (international mile of 1959,
1 mi = 1609.344 m, so 1 mph = 1.609344 km/h). Typed in full, that end must pass, and a
refusal must name the range with digits that tell it from the refused value.
"""

from __future__ import annotations

from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table


def _check(speed: float):
    table = road_table("aashto-2018-us", "us")
    return check_bend("road", {"speed": speed, "radius": 3000}, METRIC, table, rail_limits(None))


def test_table_top_typed_in_other_units_passes():
    rec = _check(128.74752)
    assert rec.status == "pass", rec.messages
    assert rec.to_json()["side_friction_max"] == 0.08  # Green Book 2018 Table 3-7, 80 mph


def test_refusal_names_the_range_with_telling_digits():
    rec = _check(128.748)
    assert rec.status == "error"
    text = " ".join(str(m) for m in rec.messages)
    assert "128.74752 km/h" in text and "got 128.748" in text

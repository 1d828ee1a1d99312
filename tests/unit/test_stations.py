"""Station text. Conventions (common practice, no single source): metric chainage as
km+metres (2+710.000); US customary 100-ft stations (27+10.00), as in state DOT manuals
such as the Indiana DOT Design Manual ch. 43."""

import pytest

from curvetui.stations import format_station, parse_station


@pytest.mark.parametrize(
    "value, units, text",
    [
        (2710.0, "metric", "2+710.000"),
        (420.5, "metric", "0+420.500"),
        (999.9996, "metric", "1+000.000"),
        (2710.0, "us", "27+10.00"),
        (5.25, "us", "0+05.25"),
    ],
)
def test_format_station(value, units, text):
    assert format_station(value, units) == text


@pytest.mark.parametrize(
    "text, units, value",
    [("2+710.5", "metric", 2710.5), ("27+10.00", "us", 2710.0), ("812", "metric", 812)],
)
def test_parse_station(text, units, value):
    assert parse_station(text, units) == pytest.approx(value)

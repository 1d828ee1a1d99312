"""curvetui.storage.sign_tables: the shipped table's provenance, and refusals."""

from __future__ import annotations

import pytest

from curvetui.core.signs import LEVELS, PARTS
from curvetui.storage.sign_tables import parse_sign_table, sign_table
from curvetui.storage.table_files import TableError, read_table_file


def test_every_row_has_a_source_for_every_value():
    t = sign_table()
    assert "2009" in t.edition and "2C-5" in t.edition
    assert list(t.differences) == [5, 10, 15, 20, 25]  # Table 2C-5's columns (read)
    for row in t.rows:
        for part in PARTS:
            assert row[part] in LEVELS
            assert row[f"{part}_source"].startswith(("read", "from memory"))
    assert len(t.friction_sources) == len(t.friction) == 3
    assert t.turn_max_advisory == 30 and t.turn_max_advisory_source.startswith("read")


def _data():
    return read_table_file(sign_table().path)


def test_missing_source_is_refused():
    data = _data()
    del data["rows"][0]["plaque_source"]
    with pytest.raises(TableError, match="plaque_source"):
        parse_sign_table(data, "x.toml")


def test_bad_level_and_rising_friction_refused():
    data = _data()
    data["rows"][0]["chevrons"] = "maybe"
    with pytest.raises(TableError, match="chevrons"):
        parse_sign_table(data, "x.toml")
    data = _data()
    data["signs"]["advisory"]["friction"][2]["f"] = 0.5
    with pytest.raises(TableError, match="must not rise"):
        parse_sign_table(data, "x.toml")


def test_unknown_name():
    with pytest.raises(TableError, match="CURVETUI_SIGNS: unknown sign table"):
        sign_table("no-such-table")


def test_series_rule_read_with_sources():
    # 600 ft (REFERENCES.md "Existing curves": read, secondary) converted exactly
    t = sign_table()
    assert t.series_tangent == 600 and t.series_tangent_si == 182.88
    assert t.series_tangent_source.startswith("read")
    assert (t.reverse_turn, t.reverse_curve, t.winding_road) == (
        "Reverse Turn",
        "Reverse Curve",
        "Winding Road",
    )
    assert t.series_names_source.startswith("from memory")
    assert "no source" in t.same_direction_note


def test_an_authority_file_changes_the_series_rule():
    data = _data()
    data["signs"]["units"] = "metric"
    data["signs"]["series"]["tangent_less_than"] = 120
    data["signs"]["series"]["winding_road"] = "Series of Bends"
    t = parse_sign_table(data, "x.toml")
    assert t.series_tangent_si == 120.0 and t.winding_road == "Series of Bends"


def test_series_rule_needs_its_sources():
    data = _data()
    del data["signs"]["series"]["names_source"]
    with pytest.raises(TableError, match="names_source"):
        parse_sign_table(data, "x.toml")
    data = _data()
    data["signs"]["series"]["tangent_less_than"] = -5
    with pytest.raises(TableError, match="tangent_less_than"):
        parse_sign_table(data, "x.toml")

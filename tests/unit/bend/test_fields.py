"""The field list is the one place inputs are declared; the faces read it.

Source: none outside the project; these check the project's structure (issue 12, item 1),
not an engineering value. The ranges themselves are checked against their sources in
the validation tests and in tests/unit/bend/test_rail_limits.py.
"""

from __future__ import annotations

from pathlib import Path

from curvetui.batch.columns import FIELD_OF_COLUMN, INPUTS
from curvetui.bend.fields import FIELDS, cli_name, docs_table, input_keys
from curvetui.cli import build_parser

README = Path(__file__).resolve().parents[3] / "README.md"


def test_readme_table_is_the_field_list():
    text = README.read_text(encoding="utf-8")
    start = text.index("<!-- fields table: start -->") + len("<!-- fields table: start -->")
    end = text.index("<!-- fields table: end -->")
    assert text[start:end].strip() == docs_table()


def test_every_field_is_a_batch_column_and_a_check_option():
    assert {f.key for f in FIELDS} <= set(FIELD_OF_COLUMN.values())
    assert set(INPUTS) >= {"id", "kind", *FIELD_OF_COLUMN}
    parser = build_parser()
    helps = parser.format_help()
    assert "check" in helps
    for kind in ("road", "rail"):
        args = ["check", kind, "--speed", "1", "--radius", "1"] + (
            ["--cant", "0"] if kind == "rail" else []
        )
        ns = parser.parse_args(args)
        for key in input_keys(kind):
            assert hasattr(ns, key), (kind, key, cli_name(key))


def test_designer_order_of_each_kind():
    # speed first, then the bend's shape, the cross-section, transitions and sight
    assert input_keys("road")[:4] == ("speed", "radius", "deflection", "pi_station")
    assert input_keys("rail")[:3] == ("speed", "low_speed", "radius")

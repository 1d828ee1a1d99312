"""The worksheet's form rows (curvetui.app.widgets.field_row): a label, the field, a unit.

Only the app's behaviour is under test (no engineering value); the app runs on a copy of
the bundled demo project, an invented scenario. That the rows draw exactly what a Label,
the field and a Static drew before is pinned by the snapshots (test_app_snapshots.py).
"""

from __future__ import annotations

import pytest
from app_screen import LARGE, copy_demo, drive, go_to, screen_text

from curvetui.app.widgets.field_input import FieldInput
from curvetui.app.widgets.field_row import LABEL_WIDTH, UNIT_WIDTH, FieldRow, first_line
from curvetui.app.widgets.worksheet import ALL_FIELDS


def test_a_long_label_is_cut_at_a_word():
    assert first_line("obstruction offset", 14) == "obstruction"
    assert first_line("superelevation", 14) == "superelevation"  # exactly the width
    assert first_line("slow train speed", 14) == "slow train"
    assert first_line("unbreakablelabelword", 14) == "unbreakablelab"
    assert first_line("", 14) == ""


@pytest.mark.app
def test_rows_show_label_field_and_unit_and_units_follow_the_bend(tmp_path):
    async def steps(app, pilot):
        sheet = app.query_one("#worksheet")
        rows = list(sheet.query(FieldRow))
        assert len(rows) == 3 + len(ALL_FIELDS)
        assert all(len(row.children) == 1 for row in rows)  # the field only
        speed = app.query_one("#row-speed", FieldRow)
        box = app.query_one("#in-speed")
        assert box.region.x == speed.region.x + LABEL_WIDTH
        assert box.region.right == speed.region.right - UNIT_WIDTH
        line = screen_text(app).splitlines()[speed.region.y]
        left, right = speed.region.x, speed.region.right
        assert line[left : left + LABEL_WIDTH].rstrip() == "speed"
        assert line[right - UNIT_WIDTH + 1 : right].rstrip() == "km/h"
        assert box.value in line[left + LABEL_WIDTH : right - UNIT_WIDTH]
        await go_to(app, pilot, "QS-01")  # a rail bend: cant in mm
        cant = app.query_one("#row-cant", FieldRow)
        assert cant.display and cant.unit == "mm"
        line = screen_text(app).splitlines()[cant.region.y]
        assert line[cant.region.x : cant.region.x + 4] == "cant"
        assert line[cant.region.right - UNIT_WIDTH + 1 : cant.region.right].rstrip() == "mm"

    drive(copy_demo(tmp_path), steps, LARGE)


@pytest.mark.app
def test_compact_fields_keep_textual_compact_look_and_other_classes(tmp_path):
    async def steps(app, pilot):
        box = app.query_one("#in-speed", FieldInput)
        assert box.compact and box.has_class("-textual-compact")
        assert box.styles.border_top[0] == ""  # compact: no border, as Input(compact=True)
        assert box.validate_on == set()  # the session checks what is typed
        lone = FieldInput(compact=True, classes="extra")
        assert lone.has_class("-textual-compact") and lone.has_class("extra") and lone.compact
        assert FieldInput().compact  # compact unless asked otherwise
        plain = FieldInput(compact=False)
        assert not plain.compact and not plain.has_class("-textual-compact")

    drive(copy_demo(tmp_path), steps, LARGE)

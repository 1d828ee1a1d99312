"""Numbers shown to the trade's precision; JSON keeps full precision.

Design superelevation is rounded *up* to the table's step (Iowa DOT's superelevation tables
round e up to 0.2 %, read earlier for e_max 6 %; the Green Book step of 0.1 % is from
memory); safe and maximum speeds rounded down and minimum speeds up, cant to 1 mm: common
practice, no source.
"""

from __future__ import annotations

from curvetui.bend.display import shown


def test_design_superelevation_rounds_up_to_the_step():
    assert shown("superelevation_design", 7.998) == "8.0"
    assert shown("superelevation_design", 6.01) == "6.1"
    assert shown("superelevation_design", 6.0) == "6.0"
    assert shown("superelevation_design", 5.01, step_pct=0.2) == "5.2"


def test_speeds_never_round_towards_a_more_generous_answer():
    assert shown("safe_speed", 100.6) == "100"
    assert shown("max_speed", 148.99) == "148"
    assert shown("min_speed", 45.1) == "46"


def test_cant_to_a_millimetre_and_absent_values():
    assert shown("cant_deficiency", 69.95) == "70"
    assert shown("cant_deficiency", 2.04, "us") == "2.0"
    assert shown("balancing_cant", None) == "-"

"""`curvetui design road|rail`: the proposal, the proposed bend's verdict, exit codes and
one-line errors naming the option and its range.

Values: 100 km/h, e_max 8 %, f_max 0.12 (Green Book 2018 Table 3-7, read) gives R_min
393.7 m (the Ethiopian Roads Authority Geometric Design Manual 2002 ch. 8 worked example,
read). The exit codes are the project's own (0 pass, 1 fail, 2 unusable input).
"""

from __future__ import annotations

import json

import pytest

from curvetui import CAUTION
from curvetui.cli import main


def run_json(capsys, *args):
    code = main(["design", *args, "--json"])
    return code, json.loads(capsys.readouterr().out)


def test_design_road_json_has_the_proposal_and_its_passing_evaluation(capsys):
    code, out = run_json(capsys, "road", "--speed", "100", "--emax", "8")
    assert code == 0
    assert out["figures"]["min_radius"] == pytest.approx(393.7, abs=0.05)
    assert out["proposed"]["radius"] >= 395
    assert out["evaluation"]["status"] == "pass"
    assert out["evaluation"]["radius"] == out["proposed"]["radius"]
    assert out["caution"] == CAUTION
    assert all(isinstance(line, str) for line in out["reasons"])


def test_design_rail_json_us_cant_on_the_quarter_inch(capsys):
    code, out = run_json(
        capsys,
        "rail",
        "--speed",
        "65",
        "--radius",
        "2864.79",
        "--units",
        "us",
        "--limits",
        "49cfr213-class3-5",
    )
    # 49 CFR 213 App. A Table 1 (read): 2 deg curve, 3 in cant, 3 in unbalance: 65 mph
    assert code == 0 and out["proposed"]["cant"] == 3.0
    assert out["evaluation"]["status"] == "pass"


def test_design_text_shows_the_proposal_the_verdict_and_the_caution(capsys):
    code = main(["design", "road", "--speed", "60", "--obstruction-offset", "2"])
    text = capsys.readouterr().out
    assert code == 0
    assert "Proposal for a road bend" in text and "Status: PASS" in text
    assert "sight:" in text and "brentq" in text
    assert "qualified engineer" in " ".join(text.split())


def test_design_refuses_a_speed_outside_the_table_with_its_range(capsys):
    code = main(["design", "road", "--speed", "200"])
    err = capsys.readouterr().err
    assert code == 2
    assert "--speed: must be a number from 15 to 130 km/h" in err
    assert "Traceback" not in err


def test_design_options_are_the_checks_options():
    import argparse

    from curvetui.bend.fields import fields_for
    from curvetui.cli import build_parser

    parser = build_parser("design")
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    design = sub.choices["design"]
    kinds = next(a for a in design._actions if isinstance(a, argparse._SubParsersAction))
    for kind in ("road", "rail"):
        options = {o for a in kinds.choices[kind]._actions for o in a.option_strings}
        assert {f.cli_option for f in fields_for(kind)} <= options


def test_json_flag_before_or_after_the_kind(capsys):
    """`design --json road ...` and `design road ... --json` both print JSON (the sub-command's
    own flag once reset the first to False)."""
    import json

    from curvetui.cli import main

    for args in (["design", "--json", "road"], ["design", "road", "--json"]):
        main([*args, "--speed", "80", "--emax", "8"])
        assert json.loads(capsys.readouterr().out)["kind"] == "road"

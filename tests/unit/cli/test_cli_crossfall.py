"""`curvetui crossfall`: the superelevation diagram as CSV, and the rotation_axis option.

The example is the Iowa DOT Design Manual's (e_max 6 %, 12 ft lanes, R 2000 ft, 50 mph:
e 4.4 %, runoff 1.5 x 12 x 4.4 / 0.50 = 158.4 ft, runout 158.4 x 2 / 4.4 = 72 ft; read, see
REFERENCES.md) with the Highway Engineering Handbook's two-thirds of e at the PC (read). The
stations are hand arithmetic from the bend's PC, which the geometry tests check.
"""

from __future__ import annotations

import csv
import io
import json

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from curvetui.cli import main

IOWA = [
    "--units", "us", "--speed", "50", "--radius", "2000", "--emax", "6",
    "--superelevation", "4.4", "--lane-width", "12", "--lanes-rotated", "2",
    "--deflection", "20", "--pi-station", "1000",
]  # fmt: skip


def crossfall(capsys, *args):
    code = main(["crossfall", *IOWA, *args])
    out = capsys.readouterr()
    rows = [line for line in out.out.splitlines() if not line.startswith("#")]
    return code, list(csv.DictReader(io.StringIO("\n".join(rows)))), out


def pc_of(capsys) -> float:
    main(["check", "road", *IOWA, "--json"])
    return json.loads(capsys.readouterr().out)["geometry"]["pc"]


def test_columns_and_the_pc_row(capsys):
    pc = pc_of(capsys)
    code, rows, out = crossfall(capsys, "--interval", "50")
    assert code == 0
    assert list(rows[0]) == [
        "station",
        "point",
        "element",
        "outside_slope_pct",
        "inside_slope_pct",
        "outside_elevation_ft",
        "centreline_elevation_ft",
        "inside_elevation_ft",
    ]
    row = next(r for r in rows if r["point"] == "pc")
    assert float(row["station"]) == pytest.approx(pc, abs=1e-4)
    assert row["element"] == "curve"
    # two-thirds of 4.4 % = 2.933 % on both halves; centreline axis, half width 12 x 2 = 24 ft:
    # outside edge +0.029333 x 24 = 0.704 ft, inside -0.704 ft
    assert float(row["outside_slope_pct"]) == pytest.approx(2.933, abs=5e-4)
    assert float(row["inside_slope_pct"]) == pytest.approx(2.933, abs=5e-4)
    assert float(row["outside_elevation_ft"]) == pytest.approx(0.704, abs=5e-5)
    assert float(row["centreline_elevation_ft"]) == 0.0
    assert float(row["inside_elevation_ft"]) == pytest.approx(-0.704, abs=5e-5)
    assert "CAUTION" in out.out and "axis of rotation: centreline" in out.out


def test_key_rows_by_hand_and_in_order(capsys):
    pc = pc_of(capsys)
    _, rows, _ = crossfall(capsys)
    keys = {r["point"]: float(r["station"]) for r in rows if r["point"]}
    # PC - 105.6 - 72, PC - 105.6, PC - 105.6 + 72, PC - 105.6 + 158.4
    assert keys["normal_crown_in"] == pytest.approx(pc - 177.6, abs=1e-3)
    assert keys["level_crown_in"] == pytest.approx(pc - 105.6, abs=1e-3)
    assert keys["reverse_crown_in"] == pytest.approx(pc - 33.6, abs=1e-3)
    assert keys["full_superelevation_in"] == pytest.approx(pc + 52.8, abs=1e-3)
    stations = [float(r["station"]) for r in rows]
    assert stations == sorted(stations)
    # every 25 ft (the US default interval) through the transitions
    assert any(float(r["station"]) == 500.0 and not r["point"] for r in rows)


def test_about_the_inside_edge(capsys):
    _, rows, _ = crossfall(capsys, "--rotation-axis", "INSIDE")
    full = next(r for r in rows if r["point"] == "full_superelevation_in")
    # about an edge n1 = 2 rotates both 12 ft lanes, crown between them: the inside edge is
    # held at -0.02 x 12 = -0.24 ft; centreline -0.24 + 0.044 x 12 = 0.288; outside
    # 0.288 + 0.528 = 0.816 ft
    assert float(full["inside_elevation_ft"]) == pytest.approx(-0.24, abs=5e-5)
    assert float(full["centreline_elevation_ft"]) == pytest.approx(0.288, abs=5e-5)
    assert float(full["outside_elevation_ft"]) == pytest.approx(0.816, abs=5e-5)


def test_short_curve_is_flagged_never_silent(capsys, tmp_path):
    target = tmp_path / "d.csv"
    code, _, out = crossfall(capsys, "--deflection", "3", "-o", str(target))
    text = target.read_text()
    assert "full_superelevation_in" not in text and "peak" in text
    assert "# NOTE: the curve is too short" in text
    assert "too short" in out.err
    assert code == 0  # a warning on the bend, not a failed check


def test_rotation_axis_is_an_option_of_check_road(capsys):
    code = main(["check", "road", *IOWA, "--rotation-axis", "outside", "--json"])
    assert code == 0
    assert json.loads(capsys.readouterr().out)["transition"]["rotation_axis"] == "outside"
    assert main(["check", "road", *IOWA, "--rotation-axis", "middle"]) == 2
    err = capsys.readouterr().err
    assert "--rotation-axis" in err and "'centreline', 'inside' or 'outside'" in err


def test_needs_a_deflection_and_a_sane_interval(capsys):
    assert main(["crossfall", "--speed", "80", "--radius", "300"]) == 2
    assert "deflection" in capsys.readouterr().err
    code = main(["crossfall", *IOWA, "--interval", "0"])
    assert code == 2 and "--interval" in capsys.readouterr().err


def test_project_bend(capsys, tmp_path):
    from pathlib import Path

    demo = Path(__file__).parents[3] / "projects" / "quillmere-valley-road.json"
    before = demo.read_bytes()
    assert main(["crossfall", "--project", str(demo), "--bend", "QV-02"]) == 0
    assert capsys.readouterr().out.startswith("station,point,element")
    assert main(["crossfall", "--project", str(demo), "--bend", "NOPE"]) == 2
    assert "QV-02" in capsys.readouterr().err  # the message lists the bends
    assert main(["crossfall", "--project", str(demo), "--bend", "QS-01"]) == 2
    assert "road bends only" in capsys.readouterr().err
    assert demo.read_bytes() == before


HOSTILE = ["", "-1", "0", "nan", "inf", "-inf", "1e308", "1e-320", "abc", "\x1b[2J", "2+7,5"]


@settings(
    max_examples=20,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture],  # capsys read each run
)
@given(
    option=st.sampled_from(
        ["--interval", "--deflection", "--spiral", "--pi-station", "--superelevation",
         "--lanes-rotated", "--rotation-axis", "--runoff-on-tangent", "--lane-width"]
    ),
    value=st.one_of(st.sampled_from(HOSTILE), st.text(max_size=12)),
)  # fmt: skip
def test_hostile_values_never_reach_the_user_as_a_defect(capsys, option, value):
    if "\x00" in value:
        return  # the OS cannot pass a NUL in an argument
    try:
        code = main(["crossfall", *IOWA, option, value])
    except SystemExit as stop:  # argparse's own refusal (a value like '-inf' read as an option)
        code = stop.code
    err = capsys.readouterr().err
    assert code in (0, 1, 2), err
    assert "Traceback" not in err and "internal error" not in err


@pytest.mark.parametrize("spiral", ["1e-320", "1e-300"])
def test_a_spiral_of_almost_no_length_warns_nothing_from_numpy(capsys, spiral):
    """Found by hand: a subnormal spiral length overflowed the ramp's slope and numpy's
    RuntimeWarning (with a source path) reached the user's terminal; the ramp is a step."""
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        code = main(["crossfall", *IOWA, "--spiral", spiral])
    captured = capsys.readouterr()
    assert code in (0, 1)
    assert "RuntimeWarning" not in captured.err and captured.out.startswith("station,")

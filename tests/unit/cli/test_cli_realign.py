"""`curvetui realign`: the survey file, the exit codes, the slew CSV.

The worked example (REFERENCES.md "Track realignment from versines (Hallade)", derived,
exact; method in outline from US Army TR 0671 3.18-3.28) is run through the command with
its designed diagram fixed: central versine 30 mm on a 12 m chord is R = c^2 / (8 v) =
144 / 0.24 = 600 m (by hand), transitions 3 spacings of 6 m = 18 m, and two of its slews as
hold points (station 24: 8 mm, station 48: -4 mm) so that the example's diagram is the one
design that meets them. The survey and the demo file are invented.
"""

from __future__ import annotations

import json

import pytest

from curvetui import CAUTION
from curvetui.cli import main

MEASURED = [0, 2, 9, 20, 28, 29, 30, 31, 32, 31, 19, 7, 2, 0]  # mm (REFERENCES.md)
DESIGNED = [0, 0, 10, 20, 30, 30, 30, 30, 30, 30, 20, 10, 0, 0]
SLEWS = [0, 0, 4, 6, 8, 6, 2, -2, -4, -2, 2, 4, 0, 0]
DEMO = "projects/harrowby-loop-versines.csv"


def write(tmp_path, text, name="survey.csv"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return str(path)


def example(tmp_path):
    rows = "".join(f"{6 * i},{v}\n" for i, v in enumerate(MEASURED))
    return write(tmp_path, "station,versine\n" + rows)


def test_worked_example_through_the_command(tmp_path, capsys):
    path = example(tmp_path)
    args = [
        "realign",
        path,
        "--chord",
        "12",
        "--radius",
        "600",
        "--transition",
        "18",
        "--hold",
        "24=8",
        "--hold",
        "48=-4",
        "--json",
    ]
    assert main(args) == 0
    got = json.loads(capsys.readouterr().out)
    slews = [r["slew"] for r in got["slews"]]
    designed = [r["designed"] for r in got["slews"]]
    assert slews == pytest.approx(SLEWS, abs=1e-9)
    assert designed == pytest.approx(DESIGNED, abs=1e-9)
    assert got["design"]["radius"] == pytest.approx(600.0, rel=1e-12)
    assert [r["direction"] for r in got["slews"]][4] == "out"
    assert [r["direction"] for r in got["slews"]][8] == "in"
    assert got["caution"] == CAUTION


def test_demo_survey_passes_and_writes_the_slew_csv(tmp_path, capsys):
    out = tmp_path / "slews.csv"
    code = main(
        [
            "realign",
            DEMO,
            "--chord",
            "20",
            "--speed",
            "100",
            "--low-speed",
            "60",
            "--hold",
            "1500",
            "-o",
            str(out),
        ]
    )
    text = capsys.readouterr().out
    assert code == 0
    assert "Designed curve: R" in text and "Rail checks: PASS" in text
    assert "binds" in text
    assert " ".join(CAUTION.split()) in " ".join(text.split())
    lines = out.read_text(encoding="utf-8").splitlines()
    assert lines[0] == "station_m,measured_mm,designed_mm,slew_mm,direction"
    assert lines[-1] == f"# {CAUTION}"
    assert any(line.startswith("# survey ") and "chord 20 m" in line for line in lines)
    row = [r for r in lines if r.startswith("1500.0000,")][0]
    assert row.split(",")[3] == "0.00"  # the hold


def test_rail_failure_exits_1(capsys):
    # 200 km/h on R about 1200 m: equilibrium cant 11.8 V^2 / R = 393 mm (REFERENCES.md's
    # 11.8 V^2/R) is beyond cant 180 + deficiency 160 mm (EN 13803 limits, from memory)
    code = main(["realign", DEMO, "--chord", "20", "--speed", "200", "--json"])
    got = json.loads(capsys.readouterr().out)
    assert code == 1
    assert got["rail"]["status"] == "fail"
    assert got["status"] == "fail"


def test_infeasible_limit_exits_1_with_the_smallest_limit(capsys):
    code = main(["realign", DEMO, "--chord", "20", "--slew-limit", "2"])
    text = " ".join(capsys.readouterr().out.split())
    assert code == 1
    assert "INFEASIBLE" in text and "smallest limit that works is" in text


def test_uneven_stations_named_by_row(tmp_path, capsys):
    rows = "".join(f"{10 * i + (3 if i == 5 else 0)},{v}\n" for i, v in enumerate(MEASURED))
    path = write(tmp_path, "station,versine\n" + rows)
    assert main(["realign", path, "--chord", "20"]) == 2
    err = capsys.readouterr().err
    assert "row 7, column station" in err and "half the chord" in err
    assert "Traceback" not in err


def test_bad_rows_named_and_hostile_text_escaped(tmp_path, capsys):
    text = (
        'Station,Versine\n0,0\n10,=HYPERLINK("http://x")\n20,\x1b[31mred\n30,nan\n'
        "40,1,2\n50,5\n60,1e9\n"
    )
    path = write(tmp_path, text)
    assert main(["realign", path, "--chord", "20"]) == 2
    err = capsys.readouterr().err
    assert "row 3, column versine: '=HYPERLINK" in err
    assert "row 4, column versine" in err and "\x1b" not in err and "\\x1b" in err
    assert "row 5, column versine" in err
    assert "row 6: 3 value(s)" in err
    assert "row 8, column versine: 1e+09 is outside" in err


def test_header_and_empty_file_refused(tmp_path, capsys):
    assert main(["realign", write(tmp_path, "chainage,offset\n0,1\n"), "--chord", "20"]) == 2
    err = capsys.readouterr().err
    assert "'chainage' is not a column" in err
    assert main(["realign", write(tmp_path, "", "e.csv"), "--chord", "20"]) == 2
    assert "empty" in capsys.readouterr().err


def test_output_never_over_the_survey(tmp_path, capsys):
    path = example(tmp_path)
    before = open(path, "rb").read()
    assert main(["realign", path, "--chord", "12", "-o", path]) == 2
    assert "never written over" in capsys.readouterr().err
    assert open(path, "rb").read() == before


@pytest.mark.parametrize(
    "extra, named",
    [
        (["--chord", "0"], "--chord"),
        (["--chord", "12", "--hold", "25"], "--hold"),
        (["--chord", "12", "--hold", "24=x"], "--hold"),
        (["--chord", "12", "--slew-limit", "-1"], "--slew-limit"),
        (["--chord", "12", "--radius", "3"], "--radius"),
        (["--chord", "12", "--radius", "600", "--transition", "10"], "--transition"),
        (["--chord", "12", "--cant", "50"], "--cant: needs --speed"),
    ],
)
def test_bad_options_exit_2_naming_the_option(tmp_path, capsys, extra, named):
    assert main(["realign", example(tmp_path), *extra]) == 2
    err = capsys.readouterr().err
    assert named in err and "Traceback" not in err


def test_missing_file_exit_2(tmp_path, capsys):
    assert main(["realign", str(tmp_path / "none.csv"), "--chord", "20"]) == 2
    assert "no such file" in capsys.readouterr().err


def test_us_units(tmp_path, capsys):
    # the worked example in inches on a 40 ft chord: R = 40^2 / (8 x 30 in / 12) ft = 80 ft
    rows = "".join(f"{20 * i},{v}\n" for i, v in enumerate(MEASURED))
    path = write(tmp_path, "station,versine\n" + rows)
    args = [
        "realign",
        path,
        "--chord",
        "40",
        "--units",
        "us",
        "--radius",
        "80",
        "--transition",
        "60",
        "--hold",
        "80=8",
        "--hold",
        "160=-4",
        "--json",
    ]
    assert main(args) == 0
    got = json.loads(capsys.readouterr().out)
    assert [r["slew"] for r in got["slews"]] == pytest.approx(SLEWS, abs=1e-9)
    assert got["units"]["slew"] == "in"


def test_hostile_file_name_cleaned_in_the_csv_comment(tmp_path, capsys):
    rows = "".join(f"{6 * i},{v}\n" for i, v in enumerate(MEASURED))
    path = write(tmp_path, "station,versine\n" + rows, name="=cmd|x\x1b[2J.csv")
    out = tmp_path / "slews.csv"
    assert main(["realign", path, "--chord", "12", "-o", str(out)]) == 0
    text = out.read_text(encoding="utf-8")
    assert "\x1b" not in text and "\x1b" not in capsys.readouterr().out
    for line in text.splitlines():
        assert not line.startswith(("=", "+", "-", "@"))


def test_infeasible_json_in_user_units(capsys):
    assert main(["realign", DEMO, "--chord", "20", "--slew-limit", "2", "--json"]) == 1
    got = json.loads(capsys.readouterr().out)
    assert got["design"]["feasible"] is False
    assert got["design"]["smallest_limit"] > 2  # mm
    assert "within 2 mm" in got["design"]["reason"]
    assert got["status"] == "fail"

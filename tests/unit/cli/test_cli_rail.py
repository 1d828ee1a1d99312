"""`check rail`: JSON keys, exit codes and one-line errors. Values are checked against hand
arithmetic with E = s v^2/(g R), s = 1500 mm (EN 13803 convention; REFERENCES.md, derived)."""

import json

import pytest

from curvetui.cli import main

KEYS = {
    "equilibrium_cant",
    "cant_deficiency",
    "cant_excess",
    "max_speed",
    "min_speed",
    "uncompensated_acceleration",
    "status",
    "messages",
}


def test_issue_example(capsys):
    code = main(
        [
            "check",
            "rail",
            "--speed",
            "120",
            "--radius",
            "1000",
            "--cant",
            "100",
            "--low-speed",
            "60",
            "--json",
        ]
    )
    out = json.loads(capsys.readouterr().out)
    assert KEYS <= out.keys() and code == 0
    assert out["equilibrium_cant"] == pytest.approx(169.95, abs=0.01)  # 11.8 x 120^2 / 1000
    assert out["cant_deficiency"] == pytest.approx(69.95, abs=0.01)
    assert out["cant_excess"] == pytest.approx(57.51, abs=0.01)
    # Vmax = sqrt(g R (Ea + I) / s) with the limits' I
    assert out["max_speed"] == pytest.approx(
        3.6 * (9.80665 * 1000 * (0.1 + out["deficiency_limit"] / 1000) / 1.5) ** 0.5, rel=1e-5
    )
    assert "qualified engineer" in out["caution"]


def test_no_low_speed_gives_null_excess(capsys):
    main(["check", "rail", "--speed", "120", "--radius", "1000", "--cant", "100", "--json"])
    out = json.loads(capsys.readouterr().out)
    assert out["cant_excess"] is None


def test_us_units_and_degree_of_curve(capsys):
    # textbook (read, REFERENCES): D 1.75 deg, 60 mph: E = 0.0007 D V^2 = 4.41 in
    r = 5729.5779513 / 1.75
    main(
        [
            "check",
            "rail",
            "--speed",
            "60",
            "--radius",
            f"{r}",
            "--cant",
            "2",
            "--units",
            "us",
            "--json",
        ]
    )
    out = json.loads(capsys.readouterr().out)
    assert out["equilibrium_cant"] == pytest.approx(4.41, abs=0.005)
    assert out["degree_of_curve_arc"] == pytest.approx(1.75, abs=1e-6)


def test_failure_exit_1(capsys):
    # 160 km/h on 600 m: E = 11.8 x 160^2/600 = 503 mm; with 150 mm applied, D = 353 mm > limits
    code = main(["check", "rail", "--speed", "160", "--radius", "600", "--cant", "150", "--json"])
    out = json.loads(capsys.readouterr().out)
    assert code == 1 and out["status"] == "fail"
    assert any(
        m["severity"] == "fail" and m["text"].startswith("cant deficiency") for m in out["messages"]
    )


@pytest.mark.parametrize(
    "args, fragment",
    [
        (["--speed", "0", "--radius", "1000", "--cant", "100"], "--speed"),
        (["--speed", "120", "--radius", "-3", "--cant", "100"], "--radius"),
        (["--speed", "120", "--radius", "1000", "--cant", "x"], "--cant"),
        (
            ["--speed", "120", "--radius", "1000", "--cant", "100", "--low-speed", "200"],
            "--low-speed: must be a number from 0 to 120",
        ),
        (["--speed", "120", "--radius", "1000", "--cant", "100", "--limits", "nope"], "--limits"),
        (["--speed", "120", "--radius", "1000", "--cant", "100", "--gauge", "5"], "--gauge"),
    ],
)
def test_bad_input(capsys, args, fragment):
    assert main(["check", "rail", *args]) == 2
    err = capsys.readouterr().err
    assert fragment in err and err.count("\n") == 1

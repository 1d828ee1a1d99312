"""The `check road` and `tables` commands: JSON keys, exit codes and one-line errors.

Values checked here are the Green Book's (AASHTO, A Policy on Geometric Design of Highways
and Streets, 7th ed., 2018): 100 km/h, e_max 8 %, f_max 0.12 (Table 3-7) gives
R_min = 100^2 / (127 x 0.20) = 393.7 m, printed as 394 m; the same 393.7 m is read in the
Ethiopian Roads Authority Geometric Design Manual (2002) ch. 8 worked example.
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from curvetui.cli import main

KEYS = {
    "lateral_acceleration",
    "lateral_acceleration_g",
    "side_friction_max",
    "side_friction_demand",
    "min_radius",
    "min_radius_rounded",
    "superelevation",
    "superelevation_design",
    "safe_speed",
    "status",
    "messages",
}


def run_json(capsys, *args) -> tuple[int, dict]:
    code = main(["check", "road", *args, "--json"])
    return code, json.loads(capsys.readouterr().out)


def test_issue_example_matches_green_book(capsys):
    code, out = run_json(capsys, "--speed", "100", "--radius", "400", "--emax", "8")
    assert KEYS <= out.keys()
    assert code == 0 and out["status"] == "pass"
    assert out["min_radius"] == pytest.approx(393.7, abs=0.05)  # ERA 2002 ch. 8, read
    assert out["min_radius_rounded"] == 394  # Green Book Table 3-7 (from memory)
    assert out["side_friction_max"] == 0.12  # Table 3-7, read (secondary compilation)
    # hand arithmetic: v = 27.78 m/s, a = v^2 / R = 1.929 m/s^2 = 0.1967 g
    assert out["lateral_acceleration"] == pytest.approx((100 / 3.6) ** 2 / 400, rel=1e-5)
    assert out["lateral_acceleration_g"] == pytest.approx(1.92901 / 9.80665, rel=1e-5)
    # 400 m is just above R_min, so Method 5 gives almost e_max, and f = V^2/(127R) - e
    assert 7.9 < out["superelevation_design"] <= 8.0
    assert out["side_friction_demand"] == pytest.approx(
        100**2 / (127 * 400) - out["superelevation"] / 100, abs=1e-5
    )
    assert out["caution"].lower().startswith("caution: local road or rail authority")


def test_given_superelevation_and_failure(capsys):
    # 80 km/h on 160 m with e 6 %: f = 6400 / (127 x 160) - 0.06 = 0.255 > f_max 0.14 (Table 3-7)
    code, out = run_json(capsys, "--speed", "80", "--radius", "160", "--superelevation", "6")
    assert code == 1 and out["status"] == "fail"
    assert out["superelevation"] == 6.0
    assert out["side_friction_demand"] == pytest.approx(6400 / (127 * 160) - 0.06, abs=1e-5)
    fails = [m["text"] for m in out["messages"] if m["severity"] == "fail"]
    assert any(m.startswith("radius") for m in fails)
    assert any(m.startswith("side friction") for m in fails)
    assert out["checks"]["radius"] == "fail" and out["checks"]["friction"] == "fail"


def test_us_customary_units(capsys):
    # 70 mph, e_max 8 %, f 0.10: R_min = 70^2 / (15 x 0.18) = 1814.8 ft (read, secondary source)
    code, out = run_json(capsys, "--speed", "70", "--radius", "2000", "--units", "us")
    assert out["min_radius"] == pytest.approx(1814.8, abs=0.05)
    assert out["min_radius_rounded"] == 1810  # 3 significant figures, as Table 3-7 prints
    assert out["lateral_acceleration"] == pytest.approx((70 * 5280 / 3600) ** 2 / 2000, rel=1e-5)


@pytest.mark.parametrize(
    "args, fragment",
    [
        (
            ["--speed", "0", "--radius", "400"],
            "--speed: must be a number from 15 to 130 km/h (table aashto-2018-metric)",  # noqa: E501
        ),
        (["--speed", "-20", "--radius", "400"], "--speed"),
        (["--speed", "fast", "--radius", "400"], "got 'fast'"),
        (["--speed", "100", "--radius", "nan"], "--radius: must be a number"),
        (["--speed", "100", "--radius", "0"], "--radius"),
        (["--speed", "100", "--radius", "400", "--emax", "14"], "--emax: must be a number from 4"),
        (["--speed", "100", "--radius", "400", "--table", "nope"], "--table: unknown road table"),
        (["--speed", "100", "--radius", "400", "--friction", "2"], "--friction"),
    ],
)
def test_bad_input_is_one_line_exit_2(capsys, args, fragment):
    code = main(["check", "road", *args])
    err = capsys.readouterr().err
    assert code == 2
    assert fragment in err
    assert err.count("\n") == 1 and "Traceback" not in err


def test_malformed_table_file(tmp_path, capsys):
    bad = tmp_path / "broken.toml"
    bad.write_text("[table\nname = 'x'\n")
    code = main(["check", "road", "--speed", "100", "--radius", "400", "--table", str(bad)])
    err = capsys.readouterr().err
    assert code == 2 and "not valid TOML" in err and err.count("\n") == 1


def test_table_row_without_source_is_refused(tmp_path, capsys):
    from curvetui.storage.tables import road_table

    text = road_table("aashto-2018-metric").path
    first_source = (
        'source = "f_max read: Green Book 2018 Table 3-7 (confirm against a licensed copy); '
        'running speed and gradient from memory"'
    )
    original = open(text, encoding="utf-8").read()
    body = original.replace(first_source, "", 1)
    assert body.count(first_source) == original.count(first_source) - 1  # one row lost it
    path = tmp_path / "nosource.toml"
    path.write_text(body)
    code = main(["check", "road", "--speed", "50", "--radius", "400", "--table", str(path)])
    assert code == 2 and "needs a 'source'" in capsys.readouterr().err


def test_missing_option_exits_2(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["check", "road", "--speed", "100"])
    assert exc.value.code == 2
    assert "--radius" in capsys.readouterr().err


def test_tables_lists_sources(capsys):
    assert main(["tables", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    names = {r["name"] for r in rows}
    assert {"aashto-2018-metric", "aashto-2018-us"} <= names
    assert all("7th ed., 2018" in r["source"] for r in rows if r["name"].startswith("aashto"))


def test_user_table_folder_is_loaded(tmp_path, monkeypatch, capsys):
    from curvetui.storage import tables

    src = tables.road_table("aashto-2018-metric").path
    text = (
        open(src, encoding="utf-8")
        .read()
        .replace('name = "aashto-2018-metric"', 'name = "shire-local"')
    )
    (tmp_path / "shire.toml").write_text(text)
    monkeypatch.setenv("CURVETUI_TABLES", str(tmp_path))
    tables.road_tables.cache_clear()
    try:
        code, out = run_json(capsys, "--speed", "100", "--radius", "400", "--table", "shire-local")
        assert code == 0 and out["table"] == "shire-local"
    finally:
        tables.road_tables.cache_clear()


def test_human_output_shows_caution_and_status():
    proc = subprocess.run(
        [sys.executable, "-m", "curvetui", "check", "road", "--speed", "100", "--radius", "400"],
        capture_output=True,
        text=True,
        check=False,
    )
    assert proc.returncode == 0
    assert "Status: PASS" in proc.stdout
    assert "local road or rail authority standards govern" in proc.stdout.replace("\n", " ")


def test_inputs_found_in_review_give_messages_not_tracebacks(capsys):
    # a deflection of 1e-300 degrees with a spiral: the spirals overlap; no radius fits
    base = ["check", "road", "--speed", "80", "--radius", "400", "--spiral", "50"]
    code = main([*base, "--deflection", "1e-300"])
    err = capsys.readouterr().err
    assert code == 2 and "spirals overlap" in err and "Traceback" not in err
    assert "radius of at least" not in err  # no radius a bend could have would do
    # 1e-320 and 5e-324 degrees are subnormal in radians: refused with the usable range
    for tiny in ("1e-320", "5e-324"):
        code = main([*base, "--deflection", tiny, "--spiral-out", "20"])
        err = capsys.readouterr().err
        assert code == 2 and "--deflection: must be a number from 1e-300 to 179" in err
    # R 2 m at 20 km/h, e 0: even 15 km/h needs f 0.89 > 0.40 (Green Book 2018 Table 3-7),
    # so the safe speed is unknown: the table prints "-" and the JSON null
    slow = ["check", "road", "--speed", "20", "--radius", "2", "--superelevation", "0"]
    assert main([*slow, "--obstruction-offset", "1", "--lane-width", "3"]) == 1
    assert "Safe speed" in capsys.readouterr().out
    # a lane of twice the radius puts the sight line (R - w/2) on the centre: refused
    assert main([*slow, "--obstruction-offset", "1", "--lane-width", "4"]) == 2
    err = capsys.readouterr().err
    assert "--lane-width: must be less than twice the radius (4 m)" in err
    assert main([*slow[:5], "1.8", "--obstruction-offset", "1"]) == 2  # default lane 3.6 m
    assert "--radius: must be more than half the lane width (1.8 m" in capsys.readouterr().err
    main(["check", "road", "--speed", "20", "--radius", "2", "--superelevation", "0", "--json"])
    assert json.loads(capsys.readouterr().out)["safe_speed"] is None

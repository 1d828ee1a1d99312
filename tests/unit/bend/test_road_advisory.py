"""The advisory speed, inferred design speed and signs through the faces: check road (JSON
and text), batch columns, and the metric step. Expected values are the REFERENCES.md worked
values (hand arithmetic in tests/validation/test_advisory_references.py)."""

from __future__ import annotations

import csv
import io
import json

from curvetui.batch.stream import batch_bytes
from curvetui.cli import main
from curvetui.core.units import METRIC, US
from curvetui.storage.tables import rail_limits, road_table


def _json(capsys, *args):
    code = main(["check", "road", "--units", "us", *args, "--json"])
    return code, json.loads(capsys.readouterr().out)


def test_check_road_json_r300_e4_turn(capsys):
    # R 300 ft, e 4 %: sqrt(15 x 300 x 0.22) = 31.46 mph -> 30 mph, Turn (REFERENCES, derived)
    _, rec = _json(
        capsys, "--speed", "30", "--radius", "300", "--superelevation", "4", "--posted-speed", "55"
    )
    a, s = rec["advisory"], rec["signs"]
    assert a["speed"] == 30 and abs(a["speed_calculated"] - 31.4643) < 1e-3
    assert a["friction"] == 0.18
    assert s["sign"] == "Turn" and s["speed_difference"] == 25
    assert s["warning_sign"] == "required" and s["chevrons"] == "required"
    assert "signs_single_bend" in [m["code"] for m in rec["messages"]]
    assert rec["caution"]


def test_fhwa_example_through_check_road(capsys):
    # FHWA-SA-10-001: R 716.20 ft, e 6.6 %: 47.59 mph, row 45 (hand working in validation)
    _, rec = _json(capsys, "--speed", "60", "--radius", "716.2", "--superelevation", "6.6")
    a = rec["advisory"]
    assert int(a["design_speed_inferred"]) == 47 and a["design_speed_inferred_row"] == 45
    assert a["design_speed_inferred_kind"] == "interpolated"
    assert "signs" not in rec  # no posted speed, no sign choice


def test_small_deflection_note_and_text_output(capsys):
    code = main(
        ["check", "road", "--units", "us", "--speed", "40", "--radius", "500",
         "--superelevation", "6", "--deflection", "4", "--posted-speed", "55"]
    )  # fmt: skip
    text = capsys.readouterr().out
    # 39.69 mph -> 35 mph advisory, above 30: a Curve sign; 55 - 35 = 20: chevrons required
    assert "advisory speed" in text.lower() and "Curve" in text
    assert "deflection under 6 degrees" in text
    assert "chevrons" in text and code in (0, 1)


def test_posted_speed_out_of_range_is_refused(capsys):
    code = main(["check", "road", "--speed", "50", "--radius", "200", "--posted-speed", "400"])
    out = capsys.readouterr()
    assert code != 0 and "posted" in (out.out + out.err).lower()
    assert "Traceback" not in out.err


def test_batch_columns_and_metric_step():
    # metric: R 200 m, e 5 %: sqrt(127 x 200 x 0.20) = 71.27 km/h (f 0.15 above 56.3 km/h)
    # -> 70 km/h with the 10 km/h step; posted 100: 30 km/h = 18.6 mph: the 15 mph column
    text = "id,kind,speed,radius,superelevation,posted_speed\nA,road,60,200,5,100\n"
    data, _ = batch_bytes(text, METRIC, road_table(None, "metric"), rail_limits(None, "metric"))
    rows = list(csv.DictReader(io.StringIO(data.decode("utf-8"))))
    row = rows[0]
    assert float(row["advisory.speed"]) == 70
    assert abs(float(row["advisory.speed_calculated"]) - 71.2741) < 1e-3
    assert row["signs.sign"] == "Curve" and row["signs.chevrons"] == "required"
    assert "advisory.design_speed_inferred" in row
    assert "advisory.superelevation" not in row  # a working value: JSON only


def test_batch_us_without_posted_speed():
    text = "id,kind,speed,radius,superelevation\nB,road,40,500,6\n"
    data, _ = batch_bytes(text, US, road_table(None, "us"), rail_limits(None, "us"))
    row = next(csv.DictReader(io.StringIO(data.decode("utf-8"))))
    assert float(row["advisory.speed"]) == 35  # 39.69 mph rounded down
    assert row["signs.sign"] == ""


def test_authority_sign_table_sets_the_metric_step(tmp_path, monkeypatch):
    # R 228 m, e 5 %: sqrt(127 x 228 x 0.20) = 76.10 km/h: 70 with the shipped 10 km/h step,
    # 75 with an authority's 5 km/h step (its own file, named by CURVETUI_SIGNS)
    from curvetui.storage.sign_tables import sign_table

    text = "id,kind,speed,radius,superelevation\nC,road,60,228,5\n"

    def advisory():
        data, _ = batch_bytes(text, METRIC, road_table(None, "metric"), rail_limits(None, "metric"))
        return float(next(csv.DictReader(io.StringIO(data.decode("utf-8"))))["advisory.speed"])

    assert advisory() == 70
    own = open(sign_table().path, encoding="utf-8").read()
    own = own.replace("metric_step = 10", "metric_step = 5").replace(
        'name = "mutcd-2009-table-2c-5"', 'name = "authority-test"'
    )
    path = tmp_path / "authority-test.toml"
    path.write_text(own, encoding="utf-8")
    monkeypatch.setenv("CURVETUI_SIGNS", str(path))
    assert advisory() == 75


def test_user_sign_table_name_is_text_not_markup(tmp_path, monkeypatch, capsys):
    from curvetui.storage.sign_tables import sign_table

    own = open(sign_table().path, encoding="utf-8").read()
    own = own.replace('name = "mutcd-2009-table-2c-5"', 'name = "[red]x[/red]"')
    path = tmp_path / "own.toml"
    path.write_text(own, encoding="utf-8")
    monkeypatch.setenv("CURVETUI_SIGNS", str(path))
    main(["check", "road", "--speed", "60", "--radius", "200", "--posted-speed", "100"])
    assert "[red]x[/red]" in capsys.readouterr().out


def test_text_output_gives_the_speeds_in_whole_units_to_the_safe_side(capsys):
    """R 500 ft, e 6 %: V = sqrt(15 x 500 x (0.06 + 0.15)) = 39.69 mph (f 0.15 at 35 mph and
    above, TxDOT; REFERENCES.md), shown as the advisory 35 (rounded down to 5 mph) beside
    its unrounded 39.686; the posted 55 and the difference 20 as whole mph (the display
    rule for speeds: common practice, no source)."""
    main(
        ["check", "road", "--units", "us", "--speed", "55", "--radius", "500", "--emax", "8",
         "--superelevation", "6", "--posted-speed", "55", "--deflection", "40"]
    )  # fmt: skip
    rows = {
        " ".join(line.strip("│ ").split("│")[0].split()): line.split("│")[-2].strip()
        for line in capsys.readouterr().out.splitlines()
        if line.count("│") >= 3
    }
    assert rows["speed"] == "35" and rows["speed calculated"] == "39.686"
    assert rows["posted speed"] == "55" and rows["speed difference"] == "20"

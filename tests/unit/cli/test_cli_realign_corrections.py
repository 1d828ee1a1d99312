"""`curvetui realign` with local versine corrections at the holds (a platform held at 0).

Local corrections at holds: common practice, no source. The slews are checked against the
versine relation written out here (s_{i+1} = 2 e_i + 2 s_i - s_{i-1}, s_{-1} = s_0 = 0,
e = measured - designed; derived, method in outline from US Army TR 0671 3.18-3.28), on the
unrounded JSON values (mm) and, to the rounding, on the CSV's. The survey is synthetic
(test input only).
"""

from __future__ import annotations

import csv
import json

import numpy as np

from curvetui.cli import main

PLATFORM = [240, 250, 260, 270, 280, 290]  # m: six stations held at 0


def survey_file(tmp_path):
    n, chord = 60, 20.0
    i = np.arange(n, dtype=float)
    d = chord**2 / (8 * 800) * np.clip(np.minimum((i - 10) / 6, (48 - i) / 8), 0, 1)
    s = 0.02 * np.sin(np.pi * (i - 5) / 50) ** 2 * np.sin(3 * np.pi * i / n)
    s[(i <= 5) | (i >= 55)] = 0.0
    sp = np.concatenate(([0.0], s, [0.0]))
    m = d + (sp[:-2] - 2 * sp[1:-1] + sp[2:]) / 2
    path = tmp_path / "survey.csv"
    path.write_text(
        "station,versine\n"
        + "".join(f"{a:g},{b:.4f}\n" for a, b in zip(i * 10, m * 1000, strict=True)),
        encoding="utf-8",
    )
    return str(path)


def holds():
    return [x for st in PLATFORM for x in ("--hold", str(st))]


def test_platform_met_with_corrections_by_default(tmp_path, capsys):
    path = survey_file(tmp_path)
    out = tmp_path / "slews.csv"
    code = main(["realign", path, "--chord", "20", *holds(), "-o", str(out), "--json"])
    got = json.loads(capsys.readouterr().out)
    assert code == 0 and got["status"] == "pass"
    assert got["design"]["corrections_allowed"] is True and got["design"]["correction_window"] == 2
    # the unrounded JSON slews against the recurrence on the JSON's versines (mm)
    e = [r["measured"] - r["designed"] for r in got["slews"]]
    prev, cur, mine = 0.0, 0.0, [0.0]
    for ei in e:
        prev, cur = cur, 2 * ei + 2 * cur - prev
        mine.append(cur)
    assert np.allclose(mine[:-1], [r["slew"] for r in got["slews"]], atol=1e-6)
    assert abs(mine[-1]) < 1e-6 and abs(mine[-2]) < 1e-6  # closes
    assert all(abs(r["slew"]) < 1e-6 for r in got["slews"] if r["station"] in PLATFORM)
    with open(out, encoding="utf-8") as f:
        lines = f.read().splitlines()
    assert any("include local versine corrections" in x for x in lines if x.startswith("#"))
    rows = list(csv.reader(x for x in lines if x and not x.startswith("#")))
    assert rows[0][-1] == "correction_mm"
    table = np.array([[float(v) for v in r[:4]] + [float(r[5])] for r in rows[1:]])
    st, m, d, s, c = table.T
    held = np.isin(st, PLATFORM)
    assert np.all(np.abs(s[held]) <= 0.005)  # held at 0 (to the CSV's 0.01 mm)
    near = np.any([np.abs(st - h) <= 20 for h in PLATFORM], axis=0)
    assert np.all(c[~near] == 0) and np.max(np.abs(c[near])) > 0.1
    json_c = np.array([r["correction"] for r in got["slews"]])
    assert np.allclose(c, json_c, atol=0.005)


def test_text_report_says_so(tmp_path, capsys):
    path = survey_file(tmp_path)
    assert main(["realign", path, "--chord", "20", *holds(), "--transition", "60,80"]) == 0
    text = capsys.readouterr().out
    assert "include local versine corrections" in text and "correction mm" in text
    assert "met with local corrections" in text


def test_no_corrections_refuses(tmp_path, capsys):
    path = survey_file(tmp_path)
    code = main(["realign", path, "--chord", "20", *holds(), "--no-corrections"])
    text = capsys.readouterr().out
    assert code == 1 and "INFEASIBLE" in text
    assert "not tried (--no-corrections)" in text and "correction mm" not in text


def test_limit_too_small_with_corrections_gives_smallest(tmp_path, capsys):
    path = survey_file(tmp_path)
    code = main(["realign", path, "--chord", "20", *holds(), "--slew-limit", "1", "--json"])
    got = json.loads(capsys.readouterr().out)
    assert code == 1
    small = got["design"]["smallest_limit"]
    assert small > 1 and got["design"]["max_slew"] <= small + 1e-6
    assert "even with local versine corrections" in got["design"]["reason"]
    assert all("correction" in r for r in got["slews"])

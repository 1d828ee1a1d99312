"""`curvetui batch`: exit codes, standard input and output, where results go, and that a
file that cannot be used leaves an earlier output whole. Ids are invented."""

from __future__ import annotations

import csv
import io
import subprocess
import sys

from curvetui import CAUTION
from curvetui.cli import main

GOOD = "id,kind,speed,radius,cant\nQV-01,road,100,400,\nQV-09,rail,120,800,100\n"
FAILING = GOOD + "QV-07,road,100,300,\n"


def rows_of(text: str) -> list[dict]:
    return list(csv.DictReader(io.StringIO(text)))


def test_all_pass_exits_0_and_writes_beside_the_input(tmp_path, capsys):
    src = tmp_path / "inventory.csv"
    src.write_text(GOOD)
    assert main(["batch", str(src)]) == 0
    out = rows_of((tmp_path / "inventory.checked.csv").read_text())
    assert [r["status"] for r in out] == ["pass", "pass"]
    err = capsys.readouterr().err
    assert "bends" in err and "results written to" in err
    assert " ".join(CAUTION.split()) in " ".join(err.split())


def test_a_failure_exits_1_and_is_in_the_summary(tmp_path, capsys):
    src = tmp_path / "inventory.csv"
    src.write_text(FAILING)
    dest = tmp_path / "out.csv"
    assert main(["batch", str(src), "-o", str(dest)]) == 1
    assert [r["status"] for r in rows_of(dest.read_text())] == ["pass", "pass", "fail"]
    err = " ".join(capsys.readouterr().err.split())
    assert "QV-07" in err and "FAIL radius" in err


def test_unusable_file_exits_2_and_keeps_the_old_output(tmp_path, capsys):
    src = tmp_path / "inventory.csv"
    src.write_text("id,speed\nQV-1,100\n")
    dest = tmp_path / "out.csv"
    dest.write_text("earlier results\n")
    assert main(["batch", str(src), "-o", str(dest)]) == 2
    assert dest.read_text() == "earlier results\n"
    assert "required columns missing: kind, radius" in " ".join(capsys.readouterr().err.split())
    assert not list(tmp_path.glob(".out.csv.*"))  # no temporary file left behind


def test_missing_input_and_output_over_input(tmp_path, capsys):
    assert main(["batch", str(tmp_path / "nowhere.csv")]) == 2
    src = tmp_path / "inventory.csv"
    src.write_text(GOOD)
    assert main(["batch", str(src), "-o", str(src)]) == 2
    assert src.read_text() == GOOD
    assert "overwrite the input" in capsys.readouterr().err


def test_standard_input_to_standard_output():
    """`-` for both, as in a pipeline: results on stdout, the summary on stderr only."""
    done = subprocess.run(
        [sys.executable, "-m", "curvetui", "batch", "-", "-o", "-"],
        input=FAILING.encode(),
        capture_output=True,
        timeout=120,
    )
    assert done.returncode == 1
    out = rows_of(done.stdout.decode())
    assert [r["id"] for r in out] == ["QV-01", "QV-09", "QV-07"]
    assert b"Batch check" in done.stderr and b"Batch check" not in done.stdout


def test_us_units_and_named_tables(tmp_path, capsys):
    """Per row with --columns all; by default only in the summary (issue 16, item 4)."""
    src = tmp_path / "inventory.csv"
    # 25 mph: within class 2's 30 mph for passenger trains (49 CFR 213.9, read)
    src.write_text("kind,speed,radius,cant\nroad,60,1200,\nrail,25,2864.789,3\n")
    dest = tmp_path / "out.csv"
    named = ["--units", "us", "--limits", "49cfr213-class1-2"]
    code = main(["batch", str(src), "-o", str(dest), *named, "--columns", "all"])
    out = rows_of(dest.read_text())
    assert code in (0, 1)
    assert out[0]["units"] == "us" and out[0]["table"] == "aashto-2018-us"
    assert out[1]["limits"] == "49cfr213-class1-2"
    capsys.readouterr()
    assert main(["batch", str(src), "-o", str(dest), *named]) == code
    out = rows_of(dest.read_text())
    assert not {"units", "table", "limits"} & set(out[0])
    err = " ".join(capsys.readouterr().err.split())
    assert "units: us" in err and "road table: aashto-2018-us" in err
    assert "rail limits: 49cfr213-class1-2" in err


def test_a_row_that_is_not_utf8_is_an_error_row_and_the_rest_run(tmp_path, capsys):
    """A Latin-1 cell costs its row (exit 1: a row has an error), not the file."""
    src = tmp_path / "inventory.csv"
    src.write_bytes(b"id,kind,speed,radius,note\nQV-1,road,80,300,caf\xe9\nQV-2,road,80,300,\n")
    dest = tmp_path / "out.csv"
    assert main(["batch", str(src), "-o", str(dest)]) == 1
    rows = list(csv.DictReader(dest.open(encoding="utf-8")))
    assert [(r["id"], r["status"]) for r in rows] == [("QV-1", "error"), ("QV-2", "pass")]
    assert rows[0]["note"] == "caf?" and "row 2: not UTF-8" in rows[0]["findings"]
    assert "not UTF-8" in capsys.readouterr().err  # the summary goes to stderr


def test_a_header_that_is_not_utf8_exits_2(tmp_path, capsys):
    src = tmp_path / "inventory.csv"
    src.write_bytes(b"id,kind,speed,radius,n\xf6te\nQV-1,road,80,300,x\n")
    dest = tmp_path / "out.csv"
    assert main(["batch", str(src), "-o", str(dest)]) == 2
    assert not dest.exists()
    assert "not UTF-8" in capsys.readouterr().err


def test_exit_code_counts_every_row_when_the_reader_closes_the_pipe_early(tmp_path):
    """`curvetui batch FILE -o - | head -c 100`: the rows are all checked though the output
    stops, the summary says so, and the exit code is that of the rows (1: the demo register
    holds failures and errors), not 0; no error from the final flush (issue 16, item 4)."""
    import subprocess
    import sys
    from pathlib import Path

    demo = (Path(__file__).parents[3] / "projects" / "quillmere-curve-register.csv").read_text(
        encoding="utf-8"
    )
    head, *rows = demo.splitlines()
    big = tmp_path / "big.csv"
    big.write_text(head + "\n" + "\n".join(rows * 700) + "\n", encoding="utf-8")  # ~12,600
    proc = subprocess.Popen(
        [sys.executable, "-m", "curvetui", "batch", str(big), "-o", "-"],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
    )
    assert len(proc.stdout.read(100)) == 100
    proc.stdout.close()  # the reader goes away long before the ~4 MB of output is written
    err = " ".join(proc.stderr.read().decode("utf-8").split())  # the console wraps lines
    assert proc.wait(timeout=120) == 1
    assert "closed it early" in err and f"every one of the {len(rows) * 700:,} rows" in err
    assert "Traceback" not in err and "Exception ignored" not in err


def test_columns_unknown_name_is_a_usage_error(tmp_path, capsys):
    src = tmp_path / "inventory.csv"
    src.write_text(GOOD)
    dest = tmp_path / "out.csv"
    assert main(["batch", str(src), "-o", str(dest), "--columns", "min_radius,radius_min"]) == 2
    err = " ".join(capsys.readouterr().err.split())
    assert "unknown result name 'radius_min'" in err and "advisory.speed" in err
    assert not dest.exists()


def test_a_file_named_parquet_that_is_not_parquet_exits_2(tmp_path, capsys):
    src = tmp_path / "inventory.parquet"
    src.write_text(GOOD)
    assert main(["batch", str(src)]) == 2
    assert "cannot read the file as Parquet" in " ".join(capsys.readouterr().err.split())
    assert not (tmp_path / "inventory.checked.parquet").exists()

"""Fuzzing the command line's arguments (issue 14, item 4): whatever is typed, the answer is
a result or a one-line message, with exit code 0 (pass), 1 (a check failed) or 2 (input
that cannot be used); no exception escapes. Bounded: few examples, no deadline,
derandomised in CI (tests/conftest.py). The expectations are the project's exit codes (the
README's table; 2 for unusable input follows the common practice of command lines, no
source); no engineering value is checked here.
"""

from __future__ import annotations

from fuzz_values import any_text, numbers_as_text, run
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from curvetui.cli import main

ROAD = (
    "--speed", "--radius", "--deflection", "--pi-station", "--superelevation", "--emax",
    "--friction", "--spiral", "--spiral-out", "--lanes-rotated", "--runoff-on-tangent",
    "--obstruction-offset", "--grade", "--lane-width",
)  # fmt: skip
RAIL = (
    "--speed", "--radius", "--cant", "--low-speed", "--gauge", "--deflection", "--pi-station",
    "--spiral", "--spiral-out",
)  # fmt: skip
SETOUT = ("--pi-station", "--spiral", "--spiral-out", "--interval", "--versine-chord")
FUZZ = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@st.composite
def check_args(draw) -> list[str]:
    kind = draw(st.sampled_from(["road", "rail"]))
    options = draw(st.lists(st.sampled_from(ROAD if kind == "road" else RAIL), unique=True))
    argv = ["check", kind]
    for opt in options:
        argv += [opt, draw(numbers_as_text)]
    if draw(st.booleans()):
        argv += ["--units", "us"]
    if draw(st.booleans()):
        argv.append("--json")
    return argv


@st.composite
def setout_args(draw) -> list[str]:
    argv = ["setout"]
    for opt in ("--radius", "--pi-easting", "--pi-northing", "--bearing", "--deflection"):
        argv += [opt, draw(st.one_of(numbers_as_text, st.sampled_from(["300", "20", "0"])))]
    for opt in draw(st.lists(st.sampled_from(SETOUT), unique=True)):
        argv += [opt, draw(numbers_as_text)]
    if draw(st.booleans()):
        argv += ["--csv", "-"]
    return argv


ROAD_80 = ["check", "road", "--speed", "80", "--radius", "400"]


@FUZZ
@given(check_args())
# the inputs issue 14 names, always tried
@example([*ROAD_80, "--deflection", "5e-324", "--spiral", "60", "--spiral-out", "20"])
@example([*ROAD_80, "--deflection", "1e-320", "--spiral", "60"])
@example([*ROAD_80, "--deflection", "20", "--pi-station", "9e305+0"])
@example(["check", "road", "--speed", "30", "--radius", "1.8", "--obstruction-offset", "3"])
@example(["check", "road", "--speed", "20", "--radius", "2", "--superelevation", "0"])
@example(["check", "rail", "--speed", "80", "--radius", "400", "--cant", "50", "--deflection",
          "5e-324", "--spiral", "60"])  # fmt: skip
def test_check_arguments(argv):
    code, _, err = run(argv)
    assert code in (0, 1, 2)
    if code == 2:
        assert err.startswith("curvetui") and err.count("\n") == 1  # one line


SETOUT_0 = ["setout", "--radius", "400", "--pi-easting", "0", "--pi-northing", "0"]


@FUZZ
@given(setout_args())
@example([*SETOUT_0, "--bearing", "0", "--deflection", "5e-324"])
@example([*SETOUT_0, "--bearing", "0", "--deflection", "1e-320", "--spiral", "50"])
@example([*SETOUT_0, "--bearing", "0", "--deflection", "  "])  # found by benchmarks/robustness
def test_setout_arguments(argv):
    code, _, err = run(argv)
    assert code in (0, 2)
    if code == 2:
        assert err.count("\n") == 1


@settings(max_examples=30, deadline=None)
@given(
    st.sampled_from(["batch", "sheet", "open", "check", "tables", "setout"]),
    st.one_of(st.sampled_from([".", "..", "/", "\udcff.csv", "\udc80.json"]), any_text),
)
@example("batch", ".")
@example("batch", "/")
def test_file_and_word_arguments(tmp_path_factory, command, text):
    # names that are folders, missing, or not text at all; no file is created here but by
    # `open` (which creates a project) and it goes to a fresh folder
    folder = tmp_path_factory.mktemp("f")
    name = text if text in (".", "..", "/") and command != "open" else str(folder / text)
    argv = {
        "batch": ["batch", name],
        "sheet": ["sheet", name, "--format", "md"],
        "open": ["open", "--print", str(folder / (text or "x"))],
        "check": ["check", "--project", name],
        "tables": ["tables", text],
        "setout": ["setout", text],
    }[command]
    if "\x00" in "".join(argv):  # the OS cannot pass a NUL in an argument
        return
    code, _, _ = run(argv)
    assert code in (0, 1, 2)


def test_the_last_resort_is_one_line_and_exit_3(monkeypatch, capsys):
    from curvetui.cli import tables_cmd

    def broken(args):
        raise RuntimeError("planted defect")

    monkeypatch.setattr(tables_cmd, "run", broken)
    assert main(["tables"]) == 3
    err = capsys.readouterr().err
    assert err.startswith("curvetui: internal error (RuntimeError at test_fuzz_cli.py:")
    assert err.count("\n") == 1 and "Traceback" not in err and "please report" in err

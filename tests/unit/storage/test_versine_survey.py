"""Reading a versine survey: header, separators, rows named by number and column.

Sources of the check values: the expected numbers are the file's own cells read back (no
engineering value is computed here); stations half a chord apart is the versine method's
layout (REFERENCES.md "Track realignment from versines", US Army TR 0671 3.18-3.28, read
in outline); the wording of the row and column messages is the project's own (common
practice, no source)."""

import pytest

from curvetui.storage.versine_survey import SurveyFileError, parse_survey, read_survey

GOOD = "station,versine\n" + "".join(f"{100 + 10 * i},{v}\n" for i, v in enumerate(range(8)))


def test_good_survey():
    s = parse_survey(GOOD, 10.0)
    assert s.stations == tuple(100.0 + 10 * i for i in range(8))
    assert s.versines == tuple(float(v) for v in range(8))
    assert s.rows == tuple(range(2, 10))


def test_semicolons_with_decimal_commas_any_case_any_order():
    text = "VERSINE;Station\n" + "".join(
        f"{v},5;{12.5 * i:g}\n".replace(".", ",") for i, v in enumerate(range(8))
    )
    s = parse_survey(text, 12.5)
    assert s.versines[1] == 1.5 and s.stations[2] == 25.0


def test_every_problem_named():
    text = "station,versine,note\n"
    with pytest.raises(SurveyFileError) as exc:
        parse_survey(text, 10.0)
    assert "row 1, column 3: 'note' is not a column" in str(exc.value)


def test_spacing_checked_from_the_first_station():
    text = GOOD.replace("140,4", "141,4")
    with pytest.raises(SurveyFileError) as exc:
        parse_survey(text, 10.0)
    assert "row 6, column station: 141 where 140 was expected" in str(exc.value)


def test_too_few_stations():
    with pytest.raises(SurveyFileError, match="at least 7"):
        parse_survey("station,versine\n0,1\n10,2\n", 10.0)


def test_read_refuses_a_folder_and_non_utf8(tmp_path):
    with pytest.raises(Exception, match="folder"):
        read_survey(str(tmp_path), 10.0)
    p = tmp_path / "latin.csv"
    p.write_bytes(GOOD.encode() + b"# caf\xe9\n")
    with pytest.raises(Exception, match="UTF-8"):
        read_survey(str(p), 10.0)

"""Reading a chain of PIs from a CSV file (curvetui.storage.pi_points): a good file, every
bad row named by its row number and column, too few points, repeated points, hostile text
shown escaped, and files that are not read (too large, not UTF-8, a folder).

The coordinates are invented (demo data); the expected values are the file's own text.
"""

from __future__ import annotations

import pytest

from curvetui.inputs import InputError
from curvetui.storage.pi_points import (
    MAX_POINTS_BYTES,
    PointsFileError,
    parse_points,
    read_points,
)

GOOD = "id,easting,northing\nS,1000,5000\nH-01,1600,5300\n,2400,5250\nE,3900,5900\n"


def test_a_good_file_gives_points_ids_and_rows(tmp_path):
    path = tmp_path / "pis.csv"
    path.write_text(GOOD, encoding="utf-8")
    chain = read_points(str(path))
    assert chain.points == ((1000, 5000), (1600, 5300), (2400, 5250), (3900, 5900))
    # the start and end rows name no bend; a blank PI id becomes B01
    assert chain.ids == ("H-01", "B01")
    assert chain.rows == (2, 3, 4, 5)


def test_columns_in_any_order_and_case_semicolons_with_decimal_commas():
    chain = parse_points("Northing;EASTING\n0;0\n100,5;0\n100,5;200\n")
    assert chain.points == ((0, 0), (0, 100.5), (200, 100.5))
    assert chain.ids == ("B01",)


def test_a_blank_id_skips_ids_already_taken():
    chain = parse_points("id,easting,northing\n,0,0\n,0,100\nB01,100,100\n,100,300\n,0,500\n")
    assert chain.ids == ("B02", "B01", "B03")


def test_every_bad_row_is_named_by_row_and_column():
    text = "easting,northing\n0,0\nabc,10\n5\n10,nan\n20,1e9\n"
    with pytest.raises(PointsFileError) as err:
        parse_points(text, "pis.csv")
    problems = err.value.problems
    assert "row 3, column easting: 'abc' is not a number" in problems
    assert "row 4: 1 value(s), the header has 2 column(s)" in problems
    assert "row 5, column northing: 'nan' is not a number" in problems
    assert any(p.startswith("row 6, column northing: 1e+09 is outside") for p in problems)
    assert str(err.value).startswith("pis.csv: cannot use this points file: row 3")
    assert isinstance(err.value, InputError)  # the command line's one-line error, exit 2


def test_a_header_is_required_and_unknown_columns_are_named():
    with pytest.raises(PointsFileError, match=r"row 1 \(the header\): columns easting, northing"):
        parse_points("0,0\n0,100\n100,100\n")
    with pytest.raises(PointsFileError, match=r"row 1, column 3: 'radius' is not a column"):
        parse_points("easting,northing,radius\n0,0,1\n")
    with pytest.raises(PointsFileError, match="empty"):
        parse_points("\n  \n")


@pytest.mark.parametrize("rows", [0, 1, 2])
def test_too_few_points(rows):
    text = "easting,northing\n" + "".join(f"{k * 100},{k * k}\n" for k in range(rows))
    with pytest.raises(PointsFileError, match=rf"{rows} point\(s\); a chain needs at least 3"):
        parse_points(text)


def test_repeated_points_and_repeated_ids_are_refused():
    with pytest.raises(PointsFileError, match=r"row 3: the same point as row 2"):
        parse_points("easting,northing\n0,0\n0,0\n100,100\n0,300\n")
    with pytest.raises(PointsFileError, match=r"row 5: the same point as row 3"):
        parse_points("easting,northing\n0,0\n0,100\n100,100\n0,100\n0,400\n")
    with pytest.raises(PointsFileError, match=r"row 4, column id: 'A' is the id of row 3 too"):
        parse_points("id,easting,northing\n,0,0\nA,0,100\nA,100,100\n,100,300\n")


def test_pis_in_line_or_turning_back_are_refused():
    with pytest.raises(PointsFileError, match=r"row 3: this PI is in line"):
        parse_points("easting,northing\n0,0\n0,100\n0,200\n100,300\n")
    with pytest.raises(PointsFileError, match=r"row 3: the chain turns straight back"):
        parse_points("easting,northing\n0,0\n0,100\n0,50\n")


def test_hostile_text_is_quoted_escaped_never_raw():
    text = "id,easting,northing\n,0,0\nQ\x1b]0;owned\x07,0,100\n,100,100\n"
    with pytest.raises(PointsFileError) as err:
        parse_points(text)
    message = str(err.value)
    assert "\x1b" not in message and "\x07" not in message
    assert "\\x1b]0;owned\\x07" in message and "control characters" in message
    # a long cell is cut in the message; a bidirectional override is shown as an escape
    with pytest.raises(PointsFileError) as err:
        parse_points("easting,northing\n" + "9" * 500 + "x,0\n\u202e1,2\n")
    assert "..." in str(err.value) and "\u202e" not in str(err.value)


def test_files_that_are_not_read(tmp_path):
    big = tmp_path / "big.csv"
    big.write_bytes(b"easting,northing\n" + b"0,0\n" * (MAX_POINTS_BYTES // 4 + 1))
    with pytest.raises(InputError, match="may be at most"):
        read_points(str(big))
    latin = tmp_path / "latin.csv"
    latin.write_bytes("id,easting,northing\nSt\xe9,0,0\n".encode("latin-1"))
    with pytest.raises(InputError, match="save it as UTF-8"):
        read_points(str(latin))
    with pytest.raises(InputError, match="a folder"):
        read_points(str(tmp_path))
    with pytest.raises(InputError, match="no such file"):
        read_points(str(tmp_path / "missing.csv"))

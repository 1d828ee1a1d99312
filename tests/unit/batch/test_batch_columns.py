"""Which result columns a batch writes (issue 16, item 4): --columns all|default|LIST.

The default's values are compared cell by cell with the ``all`` output of the same file
(itself compared with `check` row by row in test_batch.py); what is checked here is which
columns are written and that nothing a reader needs is lost: every FAIL, WARNING and ERROR
line is in ``findings``. Ids and place names are invented.
"""

from __future__ import annotations

import csv
import io

import pytest

from curvetui.batch import columns as cols
from curvetui.batch.header import BatchFileError
from curvetui.batch.stream import batch_bytes, run_batch
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table

ROAD = "QV-01,road,100,700,,24.5,,Harrow Lane\nQV-04,road,80,150,,,,Harrow Lane\n"
RAIL = "QS-01,rail,120,800,100,,,Harrowby cutting\nQS-03,rail,160,500,40,31,,Harrowby\n"
HEADER = "id,kind,speed,radius,cant,deflection,posted_speed,place\n"
ROAD_ONLY_RESULTS = {"side_friction_demand", "min_radius", "advisory.speed"}
RAIL_ONLY_RESULTS = {"cant_deficiency", "deficiency_limit", "max_speed"}


def run(text: str, columns=cols.DEFAULT, **kw):
    data, summary = batch_bytes(
        text, METRIC, road_table(None), rail_limits(None), columns=columns, **kw
    )
    rows = list(csv.reader(io.StringIO(data.decode("utf-8"))))
    return rows[0], [dict(zip(rows[0], r, strict=True)) for r in rows[1:]], summary


def test_parse_columns_modes_lists_and_groups():
    assert cols.parse_columns(None) == cols.DEFAULT
    assert cols.parse_columns(" Default ") == cols.DEFAULT
    assert cols.parse_columns("ALL") == cols.ALL
    assert cols.parse_columns("status, min_radius,min_radius") == ("status", "min_radius")
    assert cols.parse_columns("geometry.*") == ("geometry.*",)


@pytest.mark.parametrize("text", ["min_radius,radius_min", "sign", "nothing.*", ","])
def test_an_unknown_name_is_a_usage_error_listing_the_valid_ones(text):
    with pytest.raises(cols.ColumnsError) as caught:
        cols.parse_columns(text)
    said = str(caught.value)
    assert "--columns" in said and "min_radius" in said and "advisory.speed" in said
    assert "findings" in said and "geometry.*" in said


def test_default_by_kinds_present():
    names_road, _, _ = run(HEADER + ROAD)
    names_rail, _, _ = run(HEADER + RAIL)
    names_both, _, _ = run(HEADER + ROAD + RAIL)
    for names in (names_road, names_rail, names_both):
        assert not {"units", "table", "limits", "messages", "safe_speed"} & set(names)
        assert names[-3:] == ["row", "status", "findings"]
        assert names[:8] == HEADER.strip().split(",")  # the input columns first, as read
        assert {"geometry.type", "geometry.tangent", "geometry.length"} <= set(names)
    assert ROAD_ONLY_RESULTS <= set(names_road) and not RAIL_ONLY_RESULTS & set(names_road)
    assert RAIL_ONLY_RESULTS <= set(names_rail) and not ROAD_ONLY_RESULTS & set(names_rail)
    assert (ROAD_ONLY_RESULTS | RAIL_ONLY_RESULTS) <= set(names_both)
    assert "crash.curvature_cmf" in names_road and "crash.curvature_cmf" not in names_rail


def test_combined_crash_factor_only_with_a_measured_superelevation():
    """The combined factor is curvature x superelevation variance (HSM 1st ed. Eqs. 10-13 and
    10-14..16): without a measured e it cannot be formed, so the default writes the curvature
    factor alone, which a register from centrelines always has."""
    names, _, _ = run("id,kind,speed,radius,deflection\nQV-1,road,80,300,30\n")
    assert "crash.curvature_cmf" in names and "crash.cmf" not in names
    names, out, _ = run("id,kind,speed,radius,deflection,superelevation\nQV-1,road,80,300,30,4\n")
    assert {"crash.curvature_cmf", "crash.cmf"} <= set(names)
    # the variance factor is at least 1 (Eqs. 10-14..16), so the product is not below it
    assert float(out[0]["crash.cmf"]) >= float(out[0]["crash.curvature_cmf"]) > 1


def test_default_needs_its_inputs():
    """Geometry and crash factors only with a deflection column, signs only with a posted
    speed column."""
    names, _, _ = run("id,kind,speed,radius\nQV-1,road,80,300\n")
    assert not [n for n in names if n.startswith(("geometry.", "crash.", "signs."))]
    names, _, _ = run(HEADER + ROAD)
    assert {"signs.sign", "signs.plaque", "signs.chevrons"} <= set(names)
    assert "signs.series" not in names  # no register columns
    register = "id,kind,speed,radius,feature,begin_station,end_station,direction\n"
    names, rows, _ = run(
        register + "Q-1,road,60,150,Q,0,100,left\nQ-2,road,60,150,Q,150,250,right\n"
    )
    assert "signs.series" in names and "signs.sign" not in names  # no posted speed
    assert rows[0]["signs.series"]  # placed: the series sign on the first curve


def test_default_values_are_the_full_sets_values():
    text = HEADER + ROAD + RAIL + "QV-09,raod,80,300,,,,\n"
    _, default_rows, summary = run(text)
    _, all_rows, _ = run(text, cols.ALL)
    assert len(default_rows) == len(all_rows) == 5
    for short, full in zip(default_rows, all_rows, strict=True):
        for name, value in short.items():
            if name != "findings":
                assert value == full[name], name
        lines = [m for m in full["messages"].split("; ") if m and " NOTE " not in f" {m}"]
        assert short["findings"] == "; ".join(lines)
    statuses = [r["status"] for r in default_rows]
    assert statuses.count("fail") >= 2 and statuses[-1] == "error"
    fails = [r for r in default_rows if r["status"] == "fail"]
    assert all("FAIL" in r["findings"] for r in fails)  # a failed check is never hidden
    assert "ERROR row 6" in default_rows[-1]["findings"]
    assert summary.units == "metric" and summary.results[-1] == "findings"


def test_all_is_the_full_set_with_units_tables_and_every_message():
    names, rows, _ = run(HEADER + ROAD + RAIL, cols.ALL)
    assert names[8:] == list(cols.output_names(HEADER.strip().split(",")))
    assert {"units", "table", "limits", "messages", "safe_speed"} <= set(names)
    assert rows[0]["table"] == "aashto-2018-metric" and rows[2]["limits"] == "en13803-2010"


def test_a_list_is_written_in_its_order_with_row_and_status():
    names, rows, _ = run(HEADER + ROAD + RAIL, ("advisory.speed", "geometry.*", "messages"))
    results = names[8:]
    assert results[0] == "advisory.speed" and results[-3:] == ["messages", "row", "status"]
    assert "geometry.tangent" in results and "geometry.pc" not in results  # no PI station
    assert "findings" not in results  # messages holds every line already
    assert rows[0]["advisory.speed"] and rows[2]["advisory.speed"] == ""  # a rail row


def test_a_listed_result_the_file_cannot_give_names_the_input_it_needs():
    with pytest.raises(BatchFileError, match="geometry.tangent needs a deflection column"):
        run("id,kind,speed,radius\nQV-1,road,80,300\n", ("geometry.tangent",))


class _Pipe(io.RawIOBase):
    """A stream that cannot seek, as standard input from a pipe."""

    def __init__(self, data: bytes):
        self._data = io.BytesIO(data)

    def readable(self) -> bool:
        return True

    def seekable(self) -> bool:
        return False

    def read(self, size: int = -1) -> bytes:
        return self._data.read(size)


def test_a_stream_that_cannot_seek_gets_the_files_columns():
    """Standard input is copied aside to survey its kinds: the same output as the file."""
    text = (HEADER + ROAD + ROAD).encode()
    settings = (METRIC, road_table(None), rail_limits(None))
    piped = io.BytesIO()
    run_batch(_Pipe(text), piped, *settings, columns=cols.DEFAULT)
    from_file, _ = batch_bytes(text, *settings, columns=cols.DEFAULT)
    every, _ = batch_bytes(text, *settings)  # run_batch's own default: all columns
    assert piped.getvalue() == from_file and from_file != every
    header = piped.getvalue().split(b"\n")[0].decode()
    assert "min_radius" in header and "cant_deficiency" not in header  # road rows only

"""The working of a bend with a result the record leaves null prints words, not a crash.

Sources: Green Book 2018 Table 3-7 starts at 15 km/h, and at 15 km/h f_max is 0.40 (from
memory, as test_cli_road.py): on R 2 m with e 0 even 15 km/h needs f = 15^2 / (127 x 2) =
0.89 > 0.40, so no speed of the table is safe. 49 CFR 213.57 limits unbalance (cant
deficiency) and sets no cant excess limit (from memory).
"""

from __future__ import annotations

from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, US
from curvetui.reports.working import rail_working, road_working
from curvetui.storage.tables import rail_limits, road_table


def test_unknown_safe_speed_is_written_in_words():
    table = road_table(None, "metric")
    raw = {"speed": 20, "radius": 2, "superelevation": 0}
    record = check_bend("road", raw, METRIC, table, rail_limits(None, "metric")).to_json()
    assert record["safe_speed"] is None
    step = next(s for s in road_working(record, table, METRIC) if s.label == "Safe speed")
    assert step.result == "none: below the table's first row (15 km/h)"
    assert step.check == "fail"


def test_cants_serving_both_trains_without_an_excess_limit():
    limits = rail_limits("49cfr213-class3-5", "us")
    raw = {"speed": 60, "radius": 3000, "cant": 2, "low_speed": 30}
    record = check_bend("rail", raw, US, road_table(None, "us"), limits).to_json()
    assert record["excess_limit"] is None and record["cant_allowed_min"] is not None
    steps = {s.label: s for s in rail_working(record, limits, US)}
    most = steps["Most cant serving both trains"]
    assert most.substituted == "7"  # 213.57: 7 in on classes 3-5; no excess limit to add
    assert most.result.startswith("7 in")

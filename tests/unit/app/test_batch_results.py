"""The app's view of a checked CSV file reads each row's messages as items, never by
splitting the joined CSV cell (a message may itself contain "; ")."""

from __future__ import annotations

from curvetui.app.batch_results import RowKeeper, open_source
from curvetui.batch.stream import run_batch
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table


def test_a_message_with_a_semicolon_stays_one_item(tmp_path):
    # 100 km/h on R 200 m at e_max 8 %: R_min 393.7 m (Green Book 2018 Table 3-7), so the
    # radius and the side friction fail; the friction message reads "... exceeds f_max
    # 0.120; safe speed is ..." - one message with "; " inside
    path = tmp_path / "bends.csv"
    path.write_text("id,kind,speed,radius,emax\nB1,road,100,200,8\nB2,road,fast,200,8\n")
    table, limits = road_table(None, "metric"), rail_limits(None, "metric")
    source = open_source(path, METRIC, table, limits)
    keeper = RowKeeper(source)
    run_batch(path, None, METRIC, table, limits, on_table=keeper, workers=1)
    rows = {r.ident: r for r in keeper.rows()}
    b1 = rows["B1"]
    friction = [line for sev, line in b1.items if "side friction demand" in line]
    assert len(friction) == 1 and "; safe speed is" in friction[0]
    assert b1.first_message.startswith("FAIL radius")
    assert all(sev == "fail" for sev, line in b1.items if line.startswith("FAIL"))
    assert rows["B2"].items == (
        (
            "error",
            "ERROR row 3, column speed: must be a number from 15 to 130 km/h (table aashto-2018-metric), got 'fast'",  # noqa: E501
        ),
    )

"""Top speeds by traffic: 49 CFR 213.9 (classes 1-5) and 213.307 (classes 6-9).

Sources (../shared/REFERENCES.md, "Rail limits", read): 49 CFR 213.9 track class speed
limits, freight / passenger: class 1 10 / 15 mph, class 2 25 / 30, class 3 40 / 60,
class 4 60 / 80, class 5 80 / 90; 213.307: class 9 220 mph for every train (older
editions 200). Each limits file covers the classes its name says, so its top speed is its
highest class's. The curves checked are invented.
"""

from __future__ import annotations

import csv
import io

import pytest

from curvetui.batch.stream import batch_bytes
from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, MPH, US
from curvetui.storage.tables import TableError, parse_rail_limits, rail_limits, road_table

# file -> (freight, passenger) top speed in mph, 49 CFR 213.9(a) / 213.307 (read)
CFR_TOP = {
    "49cfr213-class1-2": (25, 30),  # 213.9: class 2 freight 25, passenger 30
    "49cfr213-class3-5": (80, 90),  # 213.9: class 5 freight 80, passenger 90
    "49cfr213-class6-9": (220, 220),  # 213.307: class 9 220 mph, all traffic
}


def rail(limits: str, **inputs):
    lim = rail_limits(limits, "us")
    return check_bend("rail", inputs, US, road_table(None, "us"), lim)


@pytest.mark.parametrize("name", sorted(CFR_TOP))
def test_each_file_carries_its_classes_top_speed_by_traffic(name):
    lim = rail_limits(name, "us")
    freight, passenger = CFR_TOP[name]
    assert lim.top_speed("freight") / MPH == pytest.approx(freight, abs=1e-9)
    assert lim.top_speed("passenger") / MPH == pytest.approx(passenger, abs=1e-9)
    assert "213." in lim.traffic_source  # the file names its source


@pytest.mark.parametrize("name", sorted(CFR_TOP))
@pytest.mark.parametrize("traffic", ["freight", "passenger", "Freight "])
def test_a_speed_above_the_traffics_top_is_refused_naming_it(name, traffic):
    top = CFR_TOP[name][0 if traffic.strip().lower() == "freight" else 1]
    at_top = rail(name, speed=top, radius=20000, cant=1, traffic=traffic)
    assert at_top.status != "error", at_top.messages  # accepted (class 9 fails its cant)
    assert at_top.values["traffic"] == traffic.strip().lower()
    above = rail(name, speed=top + 0.5, radius=20000, cant=1, traffic=traffic)
    assert above.status == "error"
    text = above.messages[0].text
    assert text.startswith("--speed: ") and f"to {top} mph" in text
    assert traffic.strip().lower() in text


def test_passenger_is_the_default_traffic():
    # class 2 passenger 30 mph (213.9, read): 30 passes without a traffic given
    rec = rail("49cfr213-class1-2", speed=30, radius=20000, cant=1)
    assert rec.status == "pass" and rec.values["traffic"] == "passenger"


def test_the_maximum_speed_stops_at_the_traffics_top():
    # R 20000 ft with 1 in of cant would allow about 100 mph on 3 in of unbalance (213.57);
    # the class 5 top is 80 mph for freight and 90 for passenger trains (213.9, read)
    freight = rail("49cfr213-class3-5", speed=50, radius=20000, cant=1, traffic="freight")
    passenger = rail("49cfr213-class3-5", speed=50, radius=20000, cant=1)
    assert freight.values["max_speed"] == pytest.approx(80, abs=1e-9)
    assert passenger.values["max_speed"] == pytest.approx(90, abs=1e-9)


def test_a_traffic_that_is_not_one_of_the_choices_names_them():
    rec = rail("49cfr213-class1-2", speed=20, radius=5000, cant=1, traffic="coal")
    assert rec.status == "error"
    assert rec.messages[0].text == "--traffic: must be 'passenger' or 'freight', got 'coal'"
    rec = rail("49cfr213-class1-2", speed=20, radius=5000, cant=1, traffic=2)
    assert rec.status == "error" and "--traffic: must be 'passenger' or 'freight'" in (
        rec.messages[0].text
    )


def test_limits_without_traffic_speeds_ignore_it_with_a_note():
    lim = rail_limits("en13803-2010", "metric")
    raw = {"speed": 120, "radius": 1000, "cant": 100, "traffic": "freight"}
    rec = check_bend("rail", raw, METRIC, road_table(None, "metric"), lim)
    assert rec.status != "error"
    assert rec.values["traffic"] is None
    assert "traffic_not_used" in [m.code for m in rec.messages]


def test_the_batch_takes_traffic_per_row():
    text = (
        "id,kind,speed,radius,cant,traffic\n"
        "F1,rail,80,20000,1,freight\n"
        "F2,rail,85,20000,1,FREIGHT\n"
        "P1,rail,85,20000,1,\n"
        "X1,rail,40,20000,1,coal\n"
    )
    data, _ = batch_bytes(text, US, road_table(None, "us"), rail_limits("49cfr213-class3-5"))
    rows = {r["id"]: r for r in csv.DictReader(io.StringIO(data.decode()))}
    assert rows["F1"]["status"] == "pass"
    assert rows["F2"]["status"] == "error"
    assert "row 3, column speed: must be a number from 1 to 80 mph" in rows["F2"]["messages"]
    assert rows["P1"]["status"] == "pass"  # blank: passenger, class 5 90 mph
    assert rows["X1"]["status"] == "error"
    assert (
        "column traffic: must be 'passenger' or 'freight', got 'coal'" in (rows["X1"]["messages"])
    )


def test_a_top_speed_above_the_last_band_is_refused():
    data = {
        "limits": {
            "name": "x",
            "units": "us",
            "source": "invented for the test",
            "cant_coefficient": 0.0007,
            "top_speed": {"freight": 35, "source": "invented"},
        },
        "bands": [
            {
                "speed_max": 30,
                "cant_recommended": 8,
                "cant_max": 8,
                "deficiency_recommended": 3,
                "deficiency_max": 3,
                "source": "invented",
            }
        ],
    }
    with pytest.raises(TableError, match="top_speed: 'freight' is above"):
        parse_rail_limits(data)
    data["limits"]["top_speed"] = {"coal": 20, "source": "invented"}
    with pytest.raises(TableError, match="unknown key 'coal'"):
        parse_rail_limits(data)

"""One bend from its inputs to its full record: the service every face calls.

Inputs come as a mapping of the project file's input names to numbers (or text, from the
command line) in the project's units; they are range-checked here with messages that name
the field the way the caller's user knows it (``--speed`` on the command line,
``bends[3].inputs.speed`` in a project file).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from typing import Any

from curvetui import CAUTION, bend_parts
from curvetui.core.rail import RailLimits, check_rail, rail_centres_for_gauge
from curvetui.core.rail_messages import rail_messages
from curvetui.core.road import check_road
from curvetui.core.road_messages import road_messages
from curvetui.core.road_table import RoadTable
from curvetui.core.units import FOOT, UnitSystem
from curvetui.inputs import InputError, parse_number
from curvetui.results import rail_record, road_record
from curvetui.stations import parse_station

ROAD_INPUTS = (
    "speed",
    "radius",
    "superelevation",
    "emax",
    "friction",
    "deflection",
    "pi_station",
    "spiral_in",
    "spiral_out",
    "obstruction_offset",
    "grade",
    "lane_width",
)
RAIL_INPUTS = (
    "speed",
    "radius",
    "cant",
    "low_speed",
    "gauge",
    "deflection",
    "pi_station",
    "spiral_in",
    "spiral_out",
)

# The order a designer thinks in: speed, then the bend's shape, then the cross-section
# and its limits, then transitions, then sight.
ROAD_FIELD_ORDER = (
    "speed",
    "radius",
    "deflection",
    "pi_station",
    "superelevation",
    "emax",
    "friction",
    "spiral_in",
    "spiral_out",
    "obstruction_offset",
    "grade",
    "lane_width",
)
RAIL_FIELD_ORDER = (
    "speed",
    "low_speed",
    "radius",
    "deflection",
    "pi_station",
    "cant",
    "gauge",
    "spiral_in",
    "spiral_out",
)
assert set(ROAD_FIELD_ORDER) == set(ROAD_INPUTS) and set(RAIL_FIELD_ORDER) == set(RAIL_INPUTS)

GEOMETRY_KEYS = (
    "deflection",
    "pi_station",
    "spiral_in",
    "spiral_out",
    "obstruction_offset",
    "grade",
    "lane_width",
)

# Allowed ranges (display units: metric, us)
ROAD_SPEED = {"metric": (1.0, 200.0), "us": (1.0, 125.0)}
RAIL_SPEED = {"metric": (1.0, 400.0), "us": (1.0, 250.0)}
RADIUS_M = (1.0, 100_000.0)
RAIL_RADIUS_M = (20.0, 100_000.0)
SUPERELEVATION_PCT = (-10.0, 20.0)
FRICTION = (0.01, 1.0)

Namer = Callable[[str], str]
CLI_NAMES = {"spiral_in": "--spiral", "emax": "--emax"}


def cli_name(key: str) -> str:
    """The command-line option for an input name."""
    return CLI_NAMES.get(key, "--" + key.replace("_", "-"))


def path_namer(prefix: str) -> Namer:
    """Names like ``bends[2].inputs.speed`` for messages about a project file."""
    return lambda key: f"{prefix}.{key}"


def _present(raw: Mapping[str, Any], key: str) -> bool:
    return raw.get(key) is not None and raw.get(key) != ""


def _length_range(units: UnitSystem, lo_m: float, hi_m: float) -> tuple[float, float]:
    return round(units.length_from_si(lo_m), 1), round(units.length_from_si(hi_m))


def parse_geometry(raw: Mapping[str, Any], units: UnitSystem, name: Namer) -> dict | None:
    """Deflection, PI station and spirals in SI, or None without a deflection."""
    if not _present(raw, "deflection"):
        for key in ("pi_station", "spiral_in", "spiral_out"):
            if _present(raw, key):
                raise InputError(f"{name(key)}: needs {name('deflection')} as well")
        return None
    deflection = parse_number(
        name("deflection"), raw["deflection"], 0.0, 179.0, "degrees", lo_open=True
    )
    station = 0.0
    if _present(raw, "pi_station"):
        text = raw["pi_station"]
        try:
            station = (
                text if isinstance(text, int | float) else parse_station(str(text), units.name)
            )
            station = float(station)
            if not math.isfinite(station):
                raise ValueError
        except ValueError:
            raise InputError(
                f"{name('pi_station')}: must be a station such as 2+710.5 or a number, got {text!r}"
            ) from None
    hi = round(units.length_from_si(5000.0))
    ls_in = ls_out = 0.0
    if _present(raw, "spiral_in"):
        ls_in = parse_number(name("spiral_in"), raw["spiral_in"], 0.0, hi, units.length_label)
        ls_out = ls_in
    if _present(raw, "spiral_out"):
        ls_out = parse_number(name("spiral_out"), raw["spiral_out"], 0.0, hi, units.length_label)
    return {
        "deflection": math.radians(deflection),
        "pi_station": units.length_to_si(station),
        "ls_in": units.length_to_si(ls_in),
        "ls_out": units.length_to_si(ls_out),
    }


def lane_width(raw: Mapping[str, Any], units: UnitSystem, name: Namer) -> float:
    """Lane width [m]: given, else 3.6 m (metric) or 12 ft (US), the Green Book's usual lane."""
    if not _present(raw, "lane_width"):
        return 3.6 if units.name == "metric" else units.length_to_si(12.0)
    lo = 2.0 if units.name == "metric" else 6.5
    hi = round(units.length_from_si(6.0), 1)
    return units.length_to_si(
        parse_number(name("lane_width"), raw["lane_width"], lo, hi, units.length_label)
    )


def parse_sight(raw: Mapping[str, Any], units: UnitSystem, name: Namer) -> dict | None:
    if not _present(raw, "obstruction_offset"):
        if _present(raw, "grade"):
            raise InputError(f"{name('grade')}: needs {name('obstruction_offset')} as well")
        return None
    hi = round(units.length_from_si(200.0))
    offset = parse_number(
        name("obstruction_offset"),
        raw["obstruction_offset"],
        0.0,
        hi,
        units.length_label,
        lo_open=True,
    )
    grade = 0.0
    if _present(raw, "grade"):
        grade = parse_number(name("grade"), raw["grade"], -15.0, 15.0, "%") / 100.0
    return {"offset": units.length_to_si(offset), "grade": grade}


def parse_road(
    raw: Mapping[str, Any], units: UnitSystem, table: RoadTable, name: Namer = cli_name
) -> dict:
    """Road inputs in SI for check_road (speed, radius, e_max, superelevation, friction)."""
    lo, hi = ROAD_SPEED[units.name]
    for key in ("speed", "radius"):
        if not _present(raw, key):
            raise InputError(f"{name(key)}: required")
    speed = parse_number(name("speed"), raw["speed"], lo, hi, units.speed_label)
    r_lo, r_hi = _length_range(units, *RADIUS_M)
    radius = parse_number(name("radius"), raw["radius"], r_lo, r_hi, units.length_label)
    out = {"speed": units.speed_to_si(speed), "radius": units.length_to_si(radius)}
    if _present(raw, "emax"):
        out["e_max"] = (
            parse_number(
                name("emax"),
                raw["emax"],
                100 * table.emax_min,
                100 * table.emax_max,
                f"% (table {table.name})",
            )
            / 100.0
        )
    if _present(raw, "superelevation"):
        out["superelevation"] = (
            parse_number(name("superelevation"), raw["superelevation"], *SUPERELEVATION_PCT, "%")
            / 100.0
        )
    if _present(raw, "friction"):
        out["friction"] = parse_number(name("friction"), raw["friction"], *FRICTION)
    return out


def evaluate_road(
    raw: Mapping[str, Any], units: UnitSystem, table: RoadTable, name: Namer = cli_name
) -> dict:
    """The full record of one road bend: check, transition, and geometry/sight when asked.

    A failed transition or sight check fails the bend: it is never left as a side note.
    """
    si = parse_road(raw, units, table, name)
    geometry = parse_geometry(raw, units, name)
    sight = parse_sight(raw, units, name)
    width = lane_width(raw, units, name)
    check = check_road(table, **si)
    record = road_record(check, (), units)
    record["messages"] = road_messages(check, (), table, units)
    record.update(
        kind="road",
        units=units.name,
        table=table.name,
        table_source=table.source,
        speed=float(units.speed_from_si(check.speed)),
        radius=float(units.length_from_si(check.radius)),
        e_max=round(100 * float(check.e_max), 6),
        caution=CAUTION,
    )
    v, r = float(check.speed), float(check.radius)
    record["transition"] = bend_parts.road_transition_json(
        table, v, r, float(check.superelevation), width, units
    )
    curve_length = None
    if geometry is not None:
        record["geometry"] = bend_parts.geometry_json(r, geometry, units, name("spiral_in"))
        g = record["geometry"]
        curve_length = units.length_to_si(g.get("length", g.get("total_length")))
        bend_parts.check_spiral_lengths(record["transition"], geometry, units)
    if sight is not None:
        record["sight"] = bend_parts.sight_json(v, r, sight, curve_length, width, units)
    _fold_parts(record, ("transition", "sight"))
    return record


def parse_rail(raw: Mapping[str, Any], units: UnitSystem, name: Namer = cli_name) -> dict:
    """Rail inputs in SI for check_rail."""
    for key in ("speed", "radius", "cant"):
        if not _present(raw, key):
            raise InputError(f"{name(key)}: required")
    lo, hi = RAIL_SPEED[units.name]
    speed = parse_number(name("speed"), raw["speed"], lo, hi, units.speed_label)
    r_lo, r_hi = _length_range(units, *RAIL_RADIUS_M)
    radius = parse_number(name("radius"), raw["radius"], round(r_lo), r_hi, units.length_label)
    cant_hi = 300.0 if units.name == "metric" else 12.0
    cant = parse_number(name("cant"), raw["cant"], 0.0, cant_hi, units.cant_label)
    out = {
        "speed": units.speed_to_si(speed),
        "radius": units.length_to_si(radius),
        "cant": cant * units.cant,
    }
    if _present(raw, "low_speed"):
        out["low_speed"] = units.speed_to_si(
            parse_number(name("low_speed"), raw["low_speed"], 0.0, speed, units.speed_label)
        )
    if _present(raw, "gauge"):
        gauge = parse_number(name("gauge"), raw["gauge"], 600.0, 1700.0, "mm")
        out["rail_centres"] = rail_centres_for_gauge(gauge)
    return out


def evaluate_rail(
    raw: Mapping[str, Any], units: UnitSystem, limits: RailLimits, name: Namer = cli_name
) -> dict:
    """The full record of one rail curve: check, transition, and geometry when asked."""
    si = parse_rail(raw, units, name)
    geometry = parse_geometry(raw, units, name)
    check = check_rail(limits, **si)
    record = rail_record(check, (), units)
    record["messages"] = rail_messages(check, (), limits, units)
    record.update(
        kind="rail",
        units=units.name,
        limits=limits.name,
        limits_source=limits.source,
        speed=float(units.speed_from_si(check.speed)),
        radius=float(units.length_from_si(check.radius)),
        cant=round(float(check.cant) / units.cant, 6),
        caution=CAUTION,
    )
    if units.name == "us":
        r_ft = float(check.radius) / FOOT
        record["degree_of_curve_arc"] = round(5729.5779513 / r_ft, 6)
        record["degree_of_curve_chord"] = round(2 * math.degrees(math.asin(50.0 / r_ft)), 6)
    t = bend_parts.rail_transition_json(
        limits, float(check.cant), float(check.cant_deficiency), float(check.speed), units
    )
    record["transition"] = t
    if geometry is not None:
        record["geometry"] = bend_parts.geometry_json(
            float(check.radius), geometry, units, name("spiral_in")
        )
        bend_parts.check_rail_spiral_lengths(t, geometry, units)
    _fold_parts(record, ("transition",))
    return record


def evaluate_bend(
    kind: str,
    raw: Mapping[str, Any],
    units: UnitSystem,
    table: RoadTable,
    limits: RailLimits,
    name: Namer = cli_name,
) -> dict:
    """Evaluate a road or rail bend."""
    if kind == "road":
        return evaluate_road(raw, units, table, name)
    if kind == "rail":
        return evaluate_rail(raw, units, limits, name)
    raise InputError(f"{name('kind')}: must be 'road' or 'rail', got {kind!r}")


def _fold_parts(record: dict, parts: tuple[str, ...]) -> None:
    for part in parts:
        if part in record and record[part]["status"] == "fail":
            record["status"] = "fail"
            record["messages"] += [
                f"{part}: {m}" for m in record[part]["messages"] if m.startswith("FAIL")
            ]

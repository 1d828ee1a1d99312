"""The glue between LandXML alignments and project files (JSON), in the agreed shape:

    "alignment": {"name": ..., "start_station": ...,
                  "points": [{"easting": E, "northing": N},
                             {"easting": E, "northing": N, "bend": "PI-01"}, ...,
                             {"easting": E, "northing": N}]}

in the project's units (m or ft), each interior point naming the road bend whose inputs
radius, spiral_in and spiral_out (blank: equal to spiral_in) apply. This module stands
alone so that it can later give way to the project layer's own conversion (chain_of,
alignment_from_chain).
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

from curvetui.core.alignment import Chain
from curvetui.core.units import unit_system
from curvetui.storage.landxml.reader import ImportedAlignment
from curvetui.storage.landxml.xmltree import LandXMLError

MAX_NAME = 200  # the project format's longest project name
MAX_VALUE = 1e9  # no coordinate, station, radius or spiral length is larger (m or ft)


def bend_id(index: int) -> str:
    """The id of the bend at PI ``index`` (1-based)."""
    return f"PI-{index:02d}"


def _round(value: float, digits: int = 6) -> float:
    return float(round(value, digits))


def project_from_alignment(
    imported: ImportedAlignment, speed: float, name: str | None = None
) -> dict[str, Any]:
    """A new project document (format 2 plus "alignment"): details with the file's units,
    one road bend per PI (speed, radius, spirals, deflection and PI station from the
    alignment laid out), and the alignment. Lengths rounded to 1e-6 of the unit, the
    deflection to 1e-9 degree."""
    chain = imported.chain
    units = unit_system(imported.units.system)
    to_unit = units.length_from_si
    laid = chain.lay_out()
    title = (name or imported.project_name or chain.name or "imported alignment").strip()
    bends = []
    for i, bend in enumerate(laid.bends):
        inputs: dict[str, Any] = {
            "speed": speed,
            "radius": _round(to_unit(chain.radii[i])),
            "deflection": _round(math.degrees(bend.deflection), 9),
            "pi_station": _round(to_unit(bend.pi_station)),
        }
        ls_in, ls_out = chain.spirals_in[i], chain.spirals_out[i]
        if ls_in > 0 or ls_out > 0:
            inputs["spiral_in"] = _round(to_unit(ls_in))
        if ls_out != ls_in:
            inputs["spiral_out"] = _round(to_unit(ls_out))
        bends.append(
            {
                "id": bend_id(i + 1),
                "kind": "road",
                "station": inputs["pi_station"],
                "inputs": inputs,
                "notes": f"turns {'right' if bend.direction > 0 else 'left'}; from LandXML",
            }
        )
    points = []
    for i, (e, n) in enumerate(chain.points):
        point: dict[str, Any] = {"easting": _round(to_unit(e)), "northing": _round(to_unit(n))}
        if 0 < i < len(chain.points) - 1:
            point["bend"] = bend_id(i)
        points.append(point)
    return {
        "curvetui_project_version": 2,
        "details": {
            "name": title[:MAX_NAME] or "imported alignment",
            "units": units.name,
            "notes": f"Alignment {chain.name!r} imported from LandXML.",
        },
        "bends": bends,
        "alignment": {
            "name": chain.name,
            "start_station": _round(to_unit(chain.start_station)),
            "points": points,
        },
    }


def _problem(path: str, text: str) -> LandXMLError:
    return LandXMLError(f"{path}: {text}")


def _number(value: Any, where: str, positive: bool = False, zero_ok: bool = True) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise _problem(where, f"must be a number, got {value!r}")
    value = float(value)
    if not math.isfinite(value) or abs(value) > MAX_VALUE:
        raise _problem(where, f"must be a number within +/-{MAX_VALUE:g}")
    if positive and not (value > 0 or (zero_ok and value == 0)):
        raise _problem(where, f"must be {'0 or more' if zero_ok else 'more than 0'}")
    return value


def chain_from_project(data: Any, source: str = "project") -> Chain:
    """The Chain (SI) of a project document's "alignment"; LandXMLError naming the JSON
    path of anything missing or wrong."""
    if not isinstance(data, dict):
        raise _problem(source, "not a project file (a JSON object)")
    details = data.get("details")
    units_name = details.get("units") if isinstance(details, dict) else None
    if units_name not in ("metric", "us"):
        raise _problem(f"{source}: $.details.units", "must be 'metric' or 'us'")
    units = unit_system(units_name)
    alignment = data.get("alignment")
    if not isinstance(alignment, dict):
        raise _problem(
            source,
            "the project has no alignment ($.alignment: a name, a start station and the "
            "points start, PI 1 .. PI n, end); only a project's alignment can be exported",
        )
    where = f"{source}: $.alignment"
    listed = data.get("bends")
    bends = {
        b["id"]: b
        for b in (listed if isinstance(listed, list) else [])
        if isinstance(b, dict)
        and isinstance(b.get("id"), str)
        and isinstance(b.get("inputs"), dict)
    }
    points_in = alignment.get("points")
    if not isinstance(points_in, list) or len(points_in) < 3:
        raise _problem(f"{where}.points", "must list a start point, at least one PI and an end")
    points, radii, ls_in, ls_out = [], [], [], []
    for i, p in enumerate(points_in):
        here = f"{where}.points[{i}]"
        if not isinstance(p, dict):
            raise _problem(here, "must be an object with easting and northing")
        e = units.length_to_si(_number(p.get("easting"), f"{here}.easting"))
        n = units.length_to_si(_number(p.get("northing"), f"{here}.northing"))
        points.append((e, n))
        if i in (0, len(points_in) - 1):
            continue
        bend = bends.get(p["bend"]) if isinstance(p.get("bend"), str) else None
        if bend is None:
            raise _problem(f"{here}.bend", f"names no bend of the project, got {p.get('bend')!r}")
        inputs = bend["inputs"]
        at = f"{source}: bend {bend['id']!r}"
        radius = _number(inputs.get("radius"), f"{at} radius", positive=True, zero_ok=False)
        s_in = inputs.get("spiral_in")
        s_in = 0.0 if s_in in (None, "") else _number(s_in, f"{at} spiral_in", positive=True)
        s_out = inputs.get("spiral_out")
        s_out = s_in if s_out in (None, "") else _number(s_out, f"{at} spiral_out", True)
        radii.append(units.length_to_si(radius))
        ls_in.append(units.length_to_si(s_in))
        ls_out.append(units.length_to_si(s_out))
    start = alignment.get("start_station", 0.0)
    name = alignment.get("name", "")
    return Chain(
        tuple(points),
        tuple(radii),
        tuple(ls_in),
        tuple(ls_out),
        units.length_to_si(_number(start, f"{where}.start_station")),
        name if isinstance(name, str) else "",
    )


def read_project_json(path: str | Path) -> dict[str, Any]:
    """A project file's JSON (a regular UTF-8 file of bounded size), not yet validated."""
    from curvetui.storage.project.files import MAX_PROJECT_BYTES
    from curvetui.storage.table_files import TableError, read_limited

    try:
        raw = read_limited(path, MAX_PROJECT_BYTES, "project file")
        return json.loads(raw.decode("utf-8"))
    except TableError as exc:
        raise LandXMLError(str(exc)) from None
    except UnicodeDecodeError:
        raise LandXMLError(f"{path}: not UTF-8 text") from None
    except json.JSONDecodeError as exc:
        raise LandXMLError(
            f"{path}: not valid JSON (line {exc.lineno}, column {exc.colno}: {exc.msg})"
        ) from None
    except (RecursionError, ValueError) as exc:
        raise LandXMLError(f"{path}: not a project file ({type(exc).__name__})") from None

"""What a centreline reader gives: line features, each with its id, properties, parts
(coordinate arrays) and coordinate reference system, plus what was skipped and why."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, field

import numpy as np

from curvetui.inputs import InputError

# The words --crs takes for plane coordinates with no named system (a local site grid):
# the unit's length in metres (international foot 0.3048 m exactly; US survey foot
# 1200/3937 m, NIST Handbook 44 appendix C).
PLANE_UNITS = {"plane-m": 1.0, "plane-ft": 0.3048, "plane-usft": 1200.0 / 3937.0}


class CentrelineError(InputError):
    """A centreline file that cannot be used: the message names the file and the problem."""


@dataclass(frozen=True)
class SourceCrs:
    """A file's coordinate reference system as read: ``text`` is what pyproj is given
    (an authority code, WKT or PROJ text) or a PLANE_UNITS word; ``origin`` says where it
    came from (e.g. "RFC 7946 (WGS 84 longitude/latitude)", "the .prj file", "--crs")."""

    text: str
    origin: str

    @property
    def plane_unit(self) -> float | None:
        """Metres per unit for a plane grid word, else None (a CRS pyproj resolves)."""
        return PLANE_UNITS.get(self.text.strip().lower())


WGS84_LONLAT = SourceCrs("OGC:CRS84", "RFC 7946 (WGS 84 longitude, latitude)")


@dataclass(frozen=True)
class LineFeature:
    """One line feature: ``fid`` the id as read (its index when it has none), ``properties``
    its attributes (text, numbers or None), ``parts`` one (n, 2) float array of x, y (east
    or longitude first) per part, ``crs`` its coordinate system, ``index`` its 1-based
    position in the file (for messages)."""

    fid: str
    properties: dict[str, object]
    parts: tuple[np.ndarray, ...]
    crs: SourceCrs
    index: int


@dataclass
class CentrelineFile:
    """The line features of a file, and what was passed over: ``skipped`` counts features
    by reason (a point, a polygon, no geometry), ``notes`` say what the reader assumed."""

    path: str
    features: list[LineFeature] = field(default_factory=list)
    skipped: Counter[str] = field(default_factory=Counter)
    notes: list[str] = field(default_factory=list)
    layer: str = ""


def as_xy(coords, what: str) -> np.ndarray:
    """A list of positions as an (n, 2) float array (a third or fourth value, Z or M,
    dropped); ValueError naming ``what`` when a position is not two numbers or more."""
    rows = []
    for i, pos in enumerate(coords):
        if not isinstance(pos, (list, tuple)) or len(pos) < 2:
            raise ValueError(f"{what}, position {i + 1}: not a pair of numbers")
        x, y = pos[0], pos[1]
        if isinstance(x, bool) or isinstance(y, bool):
            raise ValueError(f"{what}, position {i + 1}: not a pair of numbers")
        if not isinstance(x, (int, float)) or not isinstance(y, (int, float)):
            raise ValueError(f"{what}, position {i + 1}: not a pair of numbers")
        rows.append((float(x), float(y)))
    return np.array(rows, dtype=float).reshape(-1, 2)

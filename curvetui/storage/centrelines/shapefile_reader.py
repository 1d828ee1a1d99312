"""Shapefile centrelines (ESRI Shapefile Technical Description, 1998), read with pyshp.

The user names the ``.shp``; its ``.shx``, ``.dbf`` (attributes), ``.prj`` (coordinate
system as WKT) and ``.cpg`` (the attribute text's code page) are the same feature's other
files and are read beside it, each opened read-only here and handed to pyshp as an open
file (so pyshp never resolves a name itself). PolyLine shapes (types 3, 13, 23) are read,
Z and M dropped; a Null shape is skipped as "no geometry"; other shape types are skipped
and counted. Without a .prj, --crs is needed.
"""

from __future__ import annotations

import codecs
import contextlib
from pathlib import Path

import numpy as np

from curvetui.storage.centrelines.model import (
    CentrelineError,
    CentrelineFile,
    LineFeature,
    SourceCrs,
)
from curvetui.storage.centrelines.source import (
    MAX_PRJ_BYTES,
    decode_text,
    plain_value,
    read_bytes,
    require_file,
)

LINE_SHAPES = (3, 13, 23)  # PolyLine, PolyLineZ, PolyLineM


def _sibling(shp: Path, suffix: str) -> Path | None:
    for candidate in (shp.with_suffix(suffix), shp.with_suffix(suffix.upper())):
        if candidate.is_file():
            return candidate
    return None


def _encoding(cpg: Path | None, notes: list[str]) -> str:
    if cpg is None:
        return "utf-8"
    name = read_bytes(cpg, MAX_PRJ_BYTES, ".cpg file").decode("ascii", "replace").strip()
    try:
        return codecs.lookup(name).name
    except LookupError:
        notes.append(
            f"the .cpg names {name[:40]!r}, not a known code page: attributes read as UTF-8"
        )
        return "utf-8"


def read_shapefile(
    path: str, id_field: str | None = None, crs: str | None = None
) -> CentrelineFile:
    """The line features of a Shapefile; CentrelineError when unusable."""
    try:
        import shapefile
    except ImportError:
        raise CentrelineError(
            f"{path}: reading a Shapefile needs pyshp: pip install 'curvetui[gis]'"
        ) from None
    shp = Path(path)
    if shp.suffix.lower() != ".shp":
        raise CentrelineError(f"{path}: name the Shapefile's .shp file")
    require_file(shp, "Shapefile")
    out = CentrelineFile(path)
    prj, dbf, shx = (_sibling(shp, s) for s in (".prj", ".dbf", ".shx"))
    if crs:
        source = SourceCrs(crs, "--crs")
    elif prj is not None:
        source = SourceCrs(
            decode_text(read_bytes(prj, MAX_PRJ_BYTES, ".prj file"), prj), "the .prj file"
        )
    else:
        raise CentrelineError(
            f"{path}: has no .prj file saying its coordinate system; give it with --crs "
            "(e.g. EPSG:4326 for longitude/latitude, or plane-m for a local grid in metres)"
        )
    encoding = _encoding(_sibling(shp, ".cpg"), out.notes)
    with contextlib.ExitStack() as stack:
        files = {"shp": stack.enter_context(open(shp, "rb"))}
        if shx is not None:
            files["shx"] = stack.enter_context(open(shx, "rb"))
        if dbf is not None:
            files["dbf"] = stack.enter_context(open(dbf, "rb"))
        else:
            out.notes.append("no .dbf beside the .shp: the features have no attributes")
        try:
            reader = stack.enter_context(
                shapefile.Reader(**files, encoding=encoding, encodingErrors="replace")
            )
            names = [f[0] for f in reader.fields[1:]] if dbf is not None else []
            if id_field is not None and id_field not in names:
                raise CentrelineError(
                    f"{path}: no attribute {id_field!r} for --id-field; attributes: "
                    + (", ".join(names) or "none")
                )
            for index, shape in enumerate(reader.iterShapes(), start=1):
                record = reader.record(index - 1).as_dict() if dbf is not None else {}
                _read_shape(shape, record, index, id_field, source, out)
        except CentrelineError:
            raise
        except Exception as exc:  # noqa: BLE001 - pyshp raises several kinds on a bad file
            raise CentrelineError(f"{path}: not a readable Shapefile ({exc})") from None
    return out


def _read_shape(shape, record: dict, index, id_field, source, out: CentrelineFile) -> None:
    import shapefile

    kind = shape.shapeType
    if kind == 0:
        out.skipped["no geometry"] += 1
        return
    if kind not in LINE_SHAPES:
        name = shapefile.SHAPETYPE_LOOKUP.get(kind, str(kind)).lower()
        out.skipped[f"a {name} shape (not a line)"] += 1
        return
    points = np.asarray(shape.points, dtype=float).reshape(-1, 2)
    starts = [*list(shape.parts), len(points)]
    parts = tuple(points[a:b] for a, b in zip(starts[:-1], starts[1:], strict=True) if b > a)
    if not parts:
        out.skipped["an empty line"] += 1
        return
    ident = record.get(id_field) if id_field else None
    fid = str(index) if ident is None or ident == "" else str(ident)
    props = {k: plain_value(v) for k, v in record.items()}
    out.features.append(LineFeature(fid, props, parts, source, index))

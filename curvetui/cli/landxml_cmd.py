"""``curvetui landxml import FILE.xml -o PROJECT.json --speed V`` and
``curvetui landxml export PROJECT.json -o FILE.xml``: horizontal alignments in LandXML 1.2."""

from __future__ import annotations

import math
import os
from pathlib import Path

from curvetui.cli.common import console, print_caution
from curvetui.inputs import InputError
from curvetui.screen_text import clean


def add_parser(sub) -> None:
    p = sub.add_parser(
        "landxml",
        help="import or export a horizontal alignment as LandXML 1.2",
        description="Exchange horizontal alignments (lines, circular curves and clothoid "
        "spirals) with other software through LandXML 1.2 files. Local road or rail "
        "authority standards govern; a qualified engineer must check every result.",
    )
    kinds = p.add_subparsers(dest="landxml_command", parser_class=type(p))
    imp = kinds.add_parser(
        "import",
        help="make a new project from an alignment in a LandXML file",
        description="Read one alignment of a LandXML 1.2 file (Line, Curve and clothoid "
        "Spiral elements) and start a new project from it: its units, a road bend at each "
        "PI (radius, spirals, deflection, PI station) and the alignment's points. The "
        "project file is created, never overwritten; the LandXML file is only read. "
        "DOCTYPEs, entities and external references are refused.",
    )
    imp.add_argument("file", help="the LandXML file to read (FILE.xml)")
    imp.add_argument("-o", "--output", required=True, help="the project file to create (.json)")
    imp.add_argument(
        "--speed",
        required=True,
        type=float,
        help="design speed of every bend, in the file's units (km/h for metric files, mph "
        "for feet); LandXML alignments carry none",
    )
    imp.add_argument("--alignment", help="the alignment's name when the file holds several")
    imp.add_argument("--name", help="project name (default: the file's Project name)")
    imp.set_defaults(run=_run_import)
    exp = kinds.add_parser(
        "export",
        help="write a project's alignment as a LandXML file",
        description="Write the project's alignment (its points and each bend's radius and "
        "spirals) as LandXML 1.2 Line, Spiral (clothoid) and Curve elements, in the "
        "project's units. An existing file is replaced only with --overwrite (the old one "
        "kept as FILE.bak); the project file is never written.",
    )
    exp.add_argument("project", help="the project file (.json) holding an alignment")
    exp.add_argument("-o", "--output", required=True, help="the LandXML file to write (.xml)")
    exp.add_argument(
        "--overwrite", action="store_true", help="replace an existing file (keeps FILE.bak)"
    )
    exp.set_defaults(run=_run_export)
    p.set_defaults(run=lambda args: _no_command(p))


def _bends(n: int) -> str:
    return f"{n} bend" if n == 1 else f"{n} bends"


def _no_command(parser) -> int:
    parser.print_help()
    return 2


def _geometry_errors() -> tuple[type[Exception], ...]:
    from curvetui.core.alignment import AlignmentError
    from curvetui.core.circular import GeometryError
    from curvetui.core.plan_elements import ElementError

    return (AlignmentError, GeometryError, ElementError)


def _run_import(args) -> int:
    from curvetui.storage.landxml.project_glue import project_from_alignment
    from curvetui.storage.landxml.reader import read_landxml
    from curvetui.storage.project.files import save_project

    out_path = Path(args.output)
    if out_path.suffix.lower() != ".json":
        raise InputError(f"-o {out_path}: a project file's name must end in .json")
    if os.path.lexists(out_path):
        raise InputError(f"-o {out_path}: already exists; choose another name (never replaced)")
    if not (math.isfinite(args.speed) and args.speed > 0):
        raise InputError(f"--speed: must be a positive number, got {args.speed:g}")
    try:
        imported = read_landxml(args.file, args.alignment)
        project = project_from_alignment(imported, args.speed, args.name)
    except (*_geometry_errors(), InputError) as exc:
        raise InputError(f"{args.file}: {exc}") from None
    # refused before anything is written when a bend or the alignment would not load back
    save_project(project, out_path, exclusive=True)
    data = project.to_json()
    out = console()
    chain, units = imported.chain, data["details"]["units"]
    unit = "m" if units == "metric" else "ft"
    out.print(
        clean(
            f"Created {out_path} ({units} units) from alignment {chain.name!r} in {args.file}: "
            f"{_bends(len(chain.radii))}, start station "
            f"{data['alignment']['start_station']:.3f} {unit}."
        ),
        markup=False,
    )
    for bend in data["bends"]:
        i = bend["inputs"]
        spirals = (
            f", spirals {i.get('spiral_in', 0):g} / {i.get('spiral_out', i.get('spiral_in', 0)):g}"
            f" {unit}"
            if "spiral_in" in i
            else ""
        )
        out.print(
            clean(
                f"  {bend['id']}: R {i['radius']:g} {unit}, deflection "
                f"{i['deflection']:.6f} deg, PI station {i['pi_station']:.3f} {unit}{spirals}; "
                f"{bend['notes'].split(';')[0]}"
            ),
            markup=False,
        )
    for note in imported.notes:
        out.print(clean(f"  note: {note}"), markup=False)
    out.print(
        clean(f"  every bend's speed is {args.speed:g}; check each bend in the project"),
        markup=False,
    )
    print_caution(out)
    return 0


def _run_export(args) -> int:
    from curvetui.storage.files import atomic_write_text
    from curvetui.storage.landxml.project_glue import laid_out_chain
    from curvetui.storage.landxml.writer import landxml_text
    from curvetui.storage.project.files import load_project

    out_path = Path(args.output)
    if out_path.suffix.lower() != ".xml":
        raise InputError(f"-o {out_path}: a LandXML file's name must end in .xml")
    project = Path(args.project)
    if os.path.lexists(out_path):
        try:
            same = os.path.samefile(out_path, project)
        except OSError:
            same = False
        if same:
            raise InputError(f"-o {out_path}: is the project file itself; choose another name")
        if not args.overwrite:
            raise InputError(
                f"-o {out_path}: already exists; choose another name or give --overwrite "
                "(the old file is kept as .bak)"
            )
    loaded, _ = load_project(project)
    chain, built = laid_out_chain(loaded)
    data = loaded.to_json()
    units = data["details"]["units"]
    try:
        text = landxml_text(chain, units, str(data["details"].get("name", "")))
    except _geometry_errors() as exc:
        raise InputError(f"{project}: the alignment cannot be written: {exc}") from None
    atomic_write_text(out_path, text, backup=True, exclusive=not args.overwrite)
    out = console()
    counts = {tag: text.count(f"<{tag} ") for tag in ("Line", "Spiral", "Curve")}
    out.print(
        clean(
            f"Wrote {out_path}: alignment {chain.name!r}, {_bends(len(chain.radii))} as "
            f"{counts['Line']} Line, {counts['Spiral']} Spiral (clothoid) and "
            f"{counts['Curve']} Curve elements, {units} units, LandXML 1.2."
        ),
        markup=False,
    )
    for _, _, warning in built.warnings:  # overlaps; the engine's text, in metres
        out.print(clean(f"  alignment check (SI units): {warning}"), markup=False)
    out.print(
        clean(f"  the checks between bends: curvetui check --project {project}"), markup=False
    )
    print_caution(out)
    return 0

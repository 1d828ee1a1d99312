"""The glue between LandXML alignments and project files: an imported alignment becomes a
new project (one road bend per PI and the project's ``alignment``), and a project's
alignment becomes the chain a LandXML file is written from. The conversion itself is the
project layer's (``curvetui.storage.project.chain``: alignment_from_chain, chain_of), so a
project made here is laid out exactly as one typed by hand.
"""

from __future__ import annotations

from typing import Any

from curvetui.core.units import unit_system
from curvetui.storage.landxml.reader import ImportedAlignment
from curvetui.storage.project.chain import alignment_from_chain, lay_out_project
from curvetui.storage.project.files import parse_project
from curvetui.storage.project.model import FORMAT_VERSION, Project

MAX_NAME = 200  # the project format's longest project name


def bend_id(index: int) -> str:
    """The id of the bend at PI ``index`` (1-based)."""
    return f"PI-{index:02d}"


def project_from_alignment(
    imported: ImportedAlignment, speed: float, name: str | None = None
) -> Project:
    """A new project: details with the file's units, one road bend per PI (speed; radius,
    spirals, deflection and PI station as the alignment lays them out) and the alignment
    (points form). Lengths rounded to 1e-6 of the unit, deflections to 1e-9 degree.
    Raises AlignmentProblem (an InputError) when the chain cannot be laid out."""
    chain = imported.chain
    units = unit_system(imported.units.system)
    ids = [bend_id(i + 1) for i in range(len(chain.radii))]
    alignment, geometry = alignment_from_chain(chain, units, ids)
    laid = chain.lay_out(reverse_tangent_min=0.0, broken_back_tangent_min=0.0)
    title = (name or imported.project_name or chain.name or "imported alignment").strip()
    bends = []
    for bend, built in zip(ids, laid.bends, strict=True):
        inputs: dict[str, Any] = {"speed": speed, **geometry[bend]}
        bends.append(
            {
                "id": bend,
                "kind": "road",
                "station": inputs["pi_station"],
                "inputs": inputs,
                "notes": f"turns {'right' if built.direction > 0 else 'left'}; from LandXML",
            }
        )
    data = {
        "curvetui_project_version": FORMAT_VERSION,
        "details": {
            "name": title[:MAX_NAME] or "imported alignment",
            "units": units.name,
            "notes": f"Alignment {chain.name!r} imported from LandXML.",
        },
        "bends": bends,
        "alignment": alignment,
    }
    return parse_project(data)


def laid_out_chain(project: Project):
    """The project's alignment as a Chain (SI) and the built alignment; AlignmentProblem
    (naming the JSON path) when there is none or it cannot be laid out."""
    from curvetui.storage.project.chain import AlignmentProblem

    layout = lay_out_project(project)
    if layout is None:
        raise AlignmentProblem(
            "the project has no alignment ($.alignment: a name, a start station and the "
            "points start, PI 1 .. PI n, end); only a project's alignment can be exported"
        )
    if layout.error:
        raise AlignmentProblem(layout.error)
    return layout.chain, layout.built

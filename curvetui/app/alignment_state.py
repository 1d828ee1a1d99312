"""The session's view of the project's alignment (no Textual): the deflection and PI
station it gives a bend, as the form shows them, and the alignment checked as a whole from
the bends' last records."""

from __future__ import annotations

from curvetui.stations import format_station


def alignment_texts(session, bend, layout=None) -> dict[str, str]:
    """The deflection [deg] and PI station the alignment gives ``bend``, as text ({} for a
    bend not on a laid-out alignment)."""
    layout = layout if layout is not None else session.layout
    given = layout.overrides.get(bend.id) if layout else None
    if not given:
        return {}
    return {
        "deflection": f"{given['deflection']:.6f}".rstrip("0").rstrip("."),
        "pi_station": format_station(given["pi_station"], session.units.name, 3),
    }


def alignment_report(session):
    """storage.project.alignment_report.AlignmentReport from the bends' last good records
    (None without an alignment)."""
    from curvetui.storage.project.alignment_report import alignment_report as report

    records = {b.id: session.state(b).record for b in session.project.bends}
    return report(session.project, session.layout, records, session.units)

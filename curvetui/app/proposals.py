"""The proposal for a bend of the session (no Textual): the project's units and tables,
the bend's inputs as stored, fields named as the form names them."""

from __future__ import annotations

from curvetui.app.field_text import labelled
from curvetui.app.session import Session
from curvetui.inputs import InputError
from curvetui.storage.project.model import Bend


def propose_for(session: Session, bend: Bend):
    """(units, Proposal) for ``bend``; InputError with the form's field names."""
    from curvetui.bend.propose import propose
    from curvetui.storage.project.proposing import alignment_deflections, proposal_inputs

    ctx = session.context  # InputError when the project names an unknown table
    # on the alignment: proposed for the deflection it gives (the stored one is not used)
    inputs = proposal_inputs(bend, session.layout, alignment_deflections(session.project))
    try:
        p = propose(bend.kind, inputs, ctx.units, ctx.table, ctx.limits, name=lambda key: key)
    except InputError as exc:
        raise InputError(labelled(str(exc))) from None
    p.current = {k: bend.inputs.get(k) for k in p.proposed}
    return ctx.units, p


def propose_every(session: Session):
    """(units, proposals, report) for every bend of the session: each a
    storage.project.proposing.BendProposal (its error with the form's field names), and
    the alignment checked as a whole as it would be with them applied (None without one)."""
    import copy

    from curvetui.storage.project.alignment_report import alignment_report
    from curvetui.storage.project.chain import lay_out_project
    from curvetui.storage.project.checking import evaluate_project
    from curvetui.storage.project.proposing import apply_changes, propose_bends

    ctx = session.context
    items = propose_bends(session.project, ctx)
    for item in items:
        if item.error:
            item.error = labelled(item.error)
    after = copy.deepcopy(session.project)
    for item in items:
        if item.changes:
            apply_changes(after.bend(item.bend.id), item.changes)
    records = {o.bend.id: o.record for o in evaluate_project(after, ctx)}
    report = alignment_report(after, lay_out_project(after), records, ctx.units)
    return ctx.units, items, report

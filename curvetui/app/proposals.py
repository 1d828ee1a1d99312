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

    ctx = session.context  # InputError when the project names an unknown table
    try:
        return ctx.units, propose(
            bend.kind, bend.inputs, ctx.units, ctx.table, ctx.limits, name=lambda key: key
        )
    except InputError as exc:
        raise InputError(labelled(str(exc))) from None

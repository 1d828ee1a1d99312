"""Checking a CSV file of bends for the app, in a worker thread (no Textual here): the batch
engine runs over the file, progress and the outcome go back to the app's thread, and the
rows kept for the table (failures first, at most ``limit``) are gathered on the way."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from curvetui.app.batch_results import BatchSource, Held, RowKeeper
from curvetui.batch.header import BatchFileError
from curvetui.batch.stream import run_batch


class Stopped(Exception):
    """The screen went away while the file was being checked."""


@dataclass
class Outcome:
    """Where the check reports, each called on the app's thread."""

    progress: Callable[[int, int | None, int], None]  # bytes done, of total, rows so far
    problem: Callable[[str], None]  # the file cannot be used: why
    loaded: Callable[[Held], None]  # the rows kept and the summary


def check_source(
    source: BatchSource,
    limit: int,
    outcome: Outcome,
    on_app_thread: Callable[..., object],
    cancelled: Callable[[], bool],
) -> None:
    """Run the batch over ``source`` in this thread. ``on_app_thread(callback, *args)``
    calls back on the app's thread (RuntimeError once the app has closed); ``cancelled()``
    is true once the screen has gone, and the run then stops at the next block."""

    def tell(callback, *args) -> None:
        if cancelled():
            raise Stopped
        try:
            on_app_thread(callback, *args)
        except RuntimeError:  # the app closed meanwhile
            raise Stopped from None

    keeper = RowKeeper(source, limit)

    def take(table) -> None:
        if cancelled():
            raise Stopped
        keeper(table)

    s = source
    try:
        try:
            summary = run_batch(
                s.path,
                None,
                s.units,
                s.table,
                s.limits,
                progress=lambda done, total, rows: tell(outcome.progress, done, total, rows),
                on_table=take,
                workers=1,
            )
        except BatchFileError as exc:
            tell(outcome.problem, str(exc))
            return
        except OSError as exc:
            tell(outcome.problem, exc.strerror or str(exc))
            return
        tell(outcome.loaded, Held(keeper.rows(), summary, limit))
    except Stopped:
        return

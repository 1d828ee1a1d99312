"""When the app stops on an unexpected error: keep the unsaved edits, say so in one line.

An exception that no handler expected ends the app (Textual restores the terminal). If the
project had unsaved changes they are written, by the project's own serialiser, to a new file
beside it, ``NAME.recovered-YYYYMMDD-HHMMSS.json`` (created exclusively: never over an
existing file or through a symlink; the project file itself is not touched). The command
line then prints one line naming that file and the error, and exits with ``CRASH_EXIT``.
No Textual here: the app calls ``recover`` and the command line prints ``crash_line``.
"""

from __future__ import annotations

import json
import os
import tempfile
from dataclasses import dataclass
from datetime import datetime
from pathlib import Path

CRASH_EXIT = 3  # the app stopped on an unexpected error (0 pass, 1 fail, 2 unusable input)
REASON_CHARS = 160


@dataclass(frozen=True)
class Crash:
    """What happened: the error in short, the recovery copy written (if any) and why none
    could be written (if so)."""

    reason: str
    saved: Path | None = None
    problem: str | None = None  # why the copy could not be written
    unsaved: bool = True


def printable(text: str) -> str:
    """``text`` with every character that is not printable (escape sequences, line ends)
    shown as '?', so that a file name or an error quoting a file cannot drive the terminal."""
    return "".join(ch if ch.isprintable() else "?" for ch in text)


def short_reason(error: BaseException) -> str:
    """The error's class and the first line of its text, printable characters only, cut to
    ``REASON_CHARS`` (an error can quote text from a file)."""
    try:
        lines = str(error).splitlines()
    except Exception:  # noqa: BLE001 - an exception whose text itself fails
        lines = []
    text = printable(lines[0]) if lines else ""
    reason = f"{type(error).__name__}: {text}" if text else type(error).__name__
    return reason if len(reason) <= REASON_CHARS else reason[: REASON_CHARS - 3] + "..."


def recovery_path(project_path: Path, when: datetime, attempt: int = 0) -> Path:
    """``NAME.recovered-YYYYMMDD-HHMMSS.json`` beside the project (``-2``, ``-3``... added
    when that name is taken)."""
    stem = project_path.name.removesuffix(".json") or "project"
    tail = f"-{attempt + 1}" if attempt else ""
    return project_path.with_name(f"{stem}.recovered-{when:%Y%m%d-%H%M%S}{tail}.json")


def write_new(path: Path, text: str) -> None:
    """Create ``path`` with ``text`` (UTF-8); FileExistsError when the name is taken (a file
    or a symlink: nothing is written through it)."""
    data = text.encode("utf-8")
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
    try:
        view = memoryview(data)
        while view:
            view = view[os.write(fd, view) :]
        os.fsync(fd)
    except BaseException:
        os.close(fd)
        os.unlink(path)
        raise
    os.close(fd)


def project_copy_text(project) -> str:
    """The project as its file would hold it (storage.project.files.project_text). What a
    project file cannot hold is kept rather than lost: a number that is not finite as NaN or
    Infinity, a lone surrogate in a text as its JSON escape."""
    from curvetui.storage.project.files import project_text

    try:
        text = project_text(project)
        text.encode("utf-8")
        return text
    except (ValueError, UnicodeEncodeError):
        return json.dumps(project.to_json(), indent=2, ensure_ascii=True) + "\n"


def recover(session, error: BaseException, now: datetime | None = None) -> Crash:
    """Write the session's project to a recovery copy when it has unsaved changes (beside
    the project; in the system's temporary folder when that folder cannot be written)."""
    reason = short_reason(error)
    if not getattr(session, "dirty", False):
        return Crash(reason, unsaved=False)
    when = now or datetime.now()
    try:
        text = project_copy_text(session.project)
    except Exception as exc:  # noqa: BLE001 - the copy is best effort; say why it failed
        return Crash(reason, problem=short_reason(exc))
    project_path = Path(session.path) if session.path else Path("project.json")
    problem = None
    for folder in (project_path.parent, Path(tempfile.gettempdir())):
        for attempt in range(20):
            target = recovery_path(folder / project_path.name, when, attempt)
            try:
                write_new(target, text)
            except FileExistsError:
                continue
            except OSError as exc:
                problem = f"{target.parent}: {exc.strerror or exc}"
                break
            return Crash(reason, saved=target.absolute())
    return Crash(reason, problem=problem or "no free file name")


def crash_line(crash: Crash) -> str:
    """The one line the command line prints after the app stopped on ``crash``."""
    head = f"curvetui: error: the app stopped on an unexpected error ({crash.reason})"
    if crash.saved is not None:
        return f"{head}; unsaved changes saved to {printable(str(crash.saved))}"
    if not crash.unsaved:
        return f"{head}; there were no unsaved changes"
    return f"{head}; the unsaved changes could not be saved ({printable(str(crash.problem))})"


class StopsCleanly:
    """Mix into an App (before it): an exception no handler expected ends the app with exit
    code ``CRASH_EXIT``, a recovery copy of the session's unsaved changes (``recover``) and
    no traceback; ``crash`` then says what happened, for the command line's one line.

    Textual 8.2.8 (pinned) routes every unhandled exception of a handler, timer, worker or
    compose to ``App._handle_exception``, which records it (``run_test`` re-raises it, so
    tests still see it), exits and leaves a traceback in ``_exit_renderables`` to print once
    the terminal is restored; that list is emptied here."""

    crash: Crash | None = None

    def recovery_session(self):
        """The session whose unsaved changes a crash keeps (None: nothing to keep)."""
        return None

    def _handle_exception(self, error: Exception) -> None:
        if self.crash is None:
            try:
                self.crash = recover(self.recovery_session(), error)
            except Exception as exc:  # noqa: BLE001 - never fail while failing
                self.crash = Crash(short_reason(error), problem=short_reason(exc))
        super()._handle_exception(error)  # type: ignore[misc]
        self._exit_renderables.clear()  # type: ignore[attr-defined]
        self._return_code = CRASH_EXIT

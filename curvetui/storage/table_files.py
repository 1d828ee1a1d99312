"""Reading table files safely, and the user's table folders.

A table file is read only when it is a regular file (never a device, FIFO or folder: checked
with stat before opening, opened without blocking, checked again on the open file) of at most
MAX_TABLE_BYTES, and only as UTF-8 text (a byte-order mark is allowed; UTF-16 or Latin-1 text
is refused with "save it as UTF-8"). A file in a user folder that cannot be used is left out
and remembered with the reason (``skipped``), so one bad file never stops other commands.
"""

from __future__ import annotations

import os
import stat
import tomllib
from collections.abc import Callable
from pathlib import Path

MAX_TABLE_BYTES = 1_000_000  # 1 MB: the shipped tables are under 10 kB

# kind ("road" or "rail") -> {file: why it was left out}; refilled each time that kind loads
SKIPPED: dict[str, dict[str, str]] = {}


class TableError(ValueError):
    """A table file that cannot be used, or a table name that is not known."""


def _usable(path: str | Path, info: os.stat_result, limit: int, what: str) -> None:
    if stat.S_ISDIR(info.st_mode):
        raise TableError(f"{path}: cannot read: a folder, not a file")
    if not stat.S_ISREG(info.st_mode):
        raise TableError(f"{path}: not a regular file (a device or pipe), so it is not read")
    if info.st_size > limit:
        raise TableError(f"{path}: {info.st_size:,} bytes; a {what} may be at most {limit:,}")


def read_limited(path: str | Path, limit: int = MAX_TABLE_BYTES, what: str = "table file") -> bytes:
    """The bytes of a regular file of at most ``limit`` bytes; TableError otherwise."""
    try:
        # checked before opening, so a FIFO or device is never opened; again on the open
        # file, in case the name was swapped in between
        _usable(path, os.stat(path), limit, what)
        flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0)
        fd = os.open(path, flags)
        with os.fdopen(fd, "rb") as fh:
            _usable(path, os.fstat(fh.fileno()), limit, what)
            data = fh.read(limit + 1)
    except FileNotFoundError:
        raise TableError(f"{path}: no such file") from None
    except OSError as exc:
        raise TableError(f"{path}: cannot read ({exc.strerror or exc})") from None
    except ValueError as exc:  # e.g. a NUL in the name
        if isinstance(exc, TableError):
            raise
        raise TableError(f"{path!r}: not a usable file name ({exc})") from None
    if len(data) > limit:
        raise TableError(f"{path}: grew past {limit:,} bytes while being read")
    return data


def decode_utf8(data: bytes, path: str | Path) -> str:
    """UTF-8 text (an initial byte-order mark dropped); TableError naming the fix otherwise."""
    if data.startswith((b"\xff\xfe", b"\xfe\xff")) or b"\x00" in data[:4096]:
        raise TableError(f"{path}: UTF-16 text; save it as UTF-8")
    try:
        return data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError as exc:
        raise TableError(
            f"{path}: not UTF-8 text (byte {exc.start + 1} is {data[exc.start]:#04x}; "
            "Latin-1 or another code page?); save it as UTF-8"
        ) from None


def read_table_file(path: str | Path) -> dict:
    """Parse one TOML table file, turning any fault into a TableError."""
    text = decode_utf8(read_limited(path), path)
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise TableError(f"{path}: not valid TOML ({exc})") from None
    except RecursionError:
        raise TableError(f"{path}: not valid TOML (nested too deeply)") from None


def user_table_dirs() -> list[Path]:
    """Folders searched for the user's own table files."""
    env = os.environ.get("CURVETUI_TABLES")
    if env:
        return [Path(p) for p in env.split(os.pathsep) if p]
    return [Path.home() / ".config" / "curvetui" / "tables"]


def _why(exc: Exception, path: Path) -> str:
    text = str(exc).removeprefix(f"{path}: ").removeprefix(f"{path} ")
    return text if isinstance(exc, TableError) else f"{type(exc).__name__}: {text}"


def load_user_files(kind: str, section: str, parse: Callable[[dict, str], object]) -> list:
    """Parse every user file holding ``[section]`` with ``parse(data, path)``. A file that
    cannot be read, or parsed, or holds no table at all is left out and noted in
    SKIPPED[kind] with the reason."""
    skipped: dict[str, str] = {}
    SKIPPED[kind] = skipped
    found = []
    for folder in user_table_dirs():
        try:
            if not folder.is_dir():
                continue
            paths = sorted(folder.glob("*.toml"))
        except OSError as exc:
            skipped[str(folder)] = f"cannot list the folder ({exc.strerror or exc})"
            continue
        for path in paths:
            try:
                data = read_table_file(path)
                if not any(k in data for k in ("table", "limits", "signs")):
                    raise TableError(
                        f"{path}: none of [table], [limits], [signs]: not a table file"
                    )
                if section not in data:
                    continue  # the other kind's file
                head = data[section]
                if isinstance(head, dict) and head.get("kind", "road") not in (
                    "road",
                    "rail",
                    "signs",
                ):
                    raise TableError(f"{path}: 'kind' must be 'road' or 'rail'")
                if section == "table" and isinstance(head, dict) and head.get("kind") == "rail":
                    continue
                found.append(parse(data, str(path)))
            except Exception as exc:  # noqa: BLE001 - any fault in one user file: skip it, say why
                skipped[str(path)] = _why(exc, path)
    return found


def skipped_files() -> dict[str, str]:
    """Every user file left out so far (by the road or the rail loader), with why."""
    out: dict[str, str] = {}
    for kind in sorted(SKIPPED):
        out.update(SKIPPED[kind])
    return out

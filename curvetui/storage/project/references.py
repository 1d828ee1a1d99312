"""Which table files a project may name in ``details.road_table`` and ``details.rail_limits``.

A project file may come from anyone, so it may name a road table or rail limits only by
name (the package's, or one in a user-tables folder: ``curvetui tables`` lists them), or by a
path to a file inside the project's own folder or a user-tables folder; a relative path is
taken from the project's folder. Anything else (an absolute path elsewhere, a ``..`` or a
symlink leading out, /etc/passwd, /proc/..., /dev/zero, a FIFO) is refused with a message
naming the field, before anything is opened. The command line's own --table and --limits
options still take any path: the user typed it.
"""

from __future__ import annotations

import os
from pathlib import Path

from curvetui.inputs import InputError
from curvetui.storage.table_files import user_table_dirs


def is_path(ref: str) -> bool:
    """A reference written as a file path rather than a table's name."""
    return ref.lower().endswith(".toml") or any(sep in ref for sep in ("/", "\\", os.sep))


def allowed_reference(ref: str | None, field: str, folder: Path | None) -> str | None:
    """``ref`` itself when it is a name (or empty); for a path, the real path of the file
    when it lies inside ``folder`` (the project's) or a user-tables folder. InputError
    naming ``field`` otherwise."""
    if not ref or not is_path(ref):
        return ref
    advice = (
        "a project names a table by name (`curvetui tables` lists them) or a .toml file in "
        "its own folder or a user-tables folder"
    )
    path = Path(ref)
    if not path.is_absolute():
        if folder is None:
            raise InputError(
                f"{field}: {ref!r} is a path, and this project has no folder yet "
                f"(save it first); {advice}"
            )
        path = Path(folder) / path
    roots = ([Path(folder)] if folder is not None else []) + user_table_dirs()
    try:
        real = Path(os.path.realpath(path))
        inside = any(real.is_relative_to(os.path.realpath(root)) for root in roots)
    except (OSError, ValueError):
        inside = False
    if not inside:
        raise InputError(f"{field}: {ref!r} is outside the project's folder; {advice}")
    return str(real)

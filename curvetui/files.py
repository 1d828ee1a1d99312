"""Saving files safely: write a temporary file beside the target, flush, fsync, rename."""

from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path


def atomic_write_text(path: str | Path, text: str, backup: bool = False) -> None:
    """Replace ``path`` with ``text`` so that a crash leaves the old or the new file whole.

    With ``backup`` the previous file is kept as ``path + '.bak'`` (by a hard link or copy made
    before the rename, so the old contents are never missing).
    """
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        if backup and target.exists():
            bak = target.with_name(target.name + ".bak")
            bak_tmp = folder / f".{target.name}.bak.tmp"
            if bak_tmp.exists():
                bak_tmp.unlink()
            try:
                os.link(target, bak_tmp)  # the old file's contents, with no copy to tear
            except OSError:
                shutil.copy2(target, bak_tmp)
            os.replace(bak_tmp, bak)
        os.replace(tmp, target)
        try:
            dir_fd = os.open(folder, os.O_RDONLY)
            try:
                os.fsync(dir_fd)
            finally:
                os.close(dir_fd)
        except OSError:
            pass  # some file systems cannot fsync a folder; the rename is still atomic
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise

"""Saving files safely: write a temporary file beside the target, flush, fsync, rename."""

from __future__ import annotations

import contextlib
import os
import shutil
import tempfile
from collections.abc import Iterator
from pathlib import Path
from typing import BinaryIO


@contextlib.contextmanager
def atomic_binary(path: str | Path, backup: bool = False) -> Iterator[BinaryIO]:
    """A binary file to write that replaces ``path`` only when the block ends normally, so
    a crash or an error leaves the old file or the new one whole, never a part.

    With ``backup`` the previous file is kept as ``path + '.bak'`` (by a hard link or copy made
    before the rename, so the old contents are never missing).
    """
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    bak_tmp = folder / f".{target.name}.bak.tmp"
    try:
        # keep the old file's permissions (mkstemp makes 0600); a new file gets the usual
        # 0666 less the umask
        if target.exists():
            os.chmod(tmp, target.stat().st_mode & 0o7777)
        else:
            umask = os.umask(0)
            os.umask(umask)
            os.chmod(tmp, 0o666 & ~umask)
        with os.fdopen(fd, "wb") as fh:
            yield fh
            fh.flush()
            os.fsync(fh.fileno())
        if backup and target.exists():
            bak = target.with_name(target.name + ".bak")
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
        for leftover in (tmp, bak_tmp):
            if os.path.exists(leftover):
                os.unlink(leftover)
        raise


def atomic_write_text(path: str | Path, text: str, backup: bool = False) -> None:
    """Replace ``path`` with ``text`` (UTF-8) so that a crash leaves the old or the new file
    whole (see atomic_binary)."""
    with atomic_binary(path, backup) as fh:
        fh.write(text.encode("utf-8"))

"""Saving files safely: write a temporary file beside the target, flush, fsync, rename.

- The temporary file is created exclusively (``tempfile.mkstemp``: O_CREAT | O_EXCL, a random
  name in the target's folder, never through an existing name or a symlink) and removed on
  every failure, so a failed save leaves the old file and nothing else.
- The backup (FILE.bak) is a hard link to the old file (or, where a folder has no hard links,
  an exclusive copy) made under a random name and renamed over FILE.bak: a rename replaces a
  planted symlink, it never writes through it.
- Backup and rename run under a lock on the target's folder (``fcntl.flock``), so two saves of
  one file take turns and each one's backup is the file the other saved; a save that waits
  longer than LOCK_WAIT is told plainly and leaves the file as it was.
- A target that is not a regular file (a device such as /dev/null, a FIFO) is written
  directly: it is never renamed over.
"""

from __future__ import annotations

import contextlib
import errno
import os
import secrets
import shutil
import stat
import tempfile
import time
from collections.abc import Iterator
from pathlib import Path
from typing import BinaryIO

LOCK_WAIT = 30.0  # seconds a save waits for another save in the same folder


def _kind(target: Path) -> str:
    """'absent', 'regular' or 'special' (a device, a FIFO, a socket); a folder is refused."""
    try:
        st = os.stat(target)  # follows a symlink: the file it names is what gets written
    except FileNotFoundError:
        return "absent"
    if stat.S_ISDIR(st.st_mode):
        raise IsADirectoryError(errno.EISDIR, "is a folder, not a file", str(target))
    return "regular" if stat.S_ISREG(st.st_mode) else "special"


@contextlib.contextmanager
def _direct(target: Path) -> Iterator[BinaryIO]:
    """A device or FIFO, opened for writing as it is (never created, truncated or renamed)."""
    fd = os.open(target, os.O_WRONLY | getattr(os, "O_NOCTTY", 0))
    if stat.S_ISREG(os.fstat(fd).st_mode):  # replaced by a plain file since the check
        os.close(fd)
        raise OSError(errno.EAGAIN, "changed while saving; try again", str(target))
    with os.fdopen(fd, "wb") as fh:
        yield fh


def _new_file_mode(fd: int, target: Path, existed: bool) -> None:
    """Keep the old file's permissions (mkstemp makes 0600); a new file gets the usual 0666
    less the umask."""
    if existed:
        mode = os.stat(target).st_mode & 0o7777
    else:
        umask = os.umask(0)
        os.umask(umask)
        mode = 0o666 & ~umask
    with contextlib.suppress(OSError):  # e.g. a file system without modes
        os.fchmod(fd, mode)


@contextlib.contextmanager
def _folder_lock(folder: Path) -> Iterator[None]:
    """An exclusive flock on the folder for the short commit step; none where the platform or
    file system has no such locks."""
    try:
        import fcntl
    except ImportError:  # not POSIX
        yield
        return
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        yield
        return
    try:
        deadline = time.monotonic() + LOCK_WAIT
        locked = True
        while True:
            try:
                fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
                break
            except BlockingIOError:
                if time.monotonic() > deadline:
                    raise OSError(
                        errno.EBUSY,
                        "another save in this folder did not finish; nothing was written, "
                        "try again",
                        str(folder),
                    ) from None
                time.sleep(0.01)
            except OSError:  # a file system without flock: go on unlocked
                locked = False
                break
        yield
    finally:
        if locked:
            with contextlib.suppress(OSError):
                fcntl.flock(fd, fcntl.LOCK_UN)
        os.close(fd)


def _backup_copy(target: Path, folder: Path) -> str:
    """The old file under a fresh random name: a hard link, or an exclusive copy."""
    if not os.path.islink(target):
        for _ in range(100):
            name = str(folder / f".{target.name}.{secrets.token_hex(6)}.bak.tmp")
            try:
                os.link(target, name)  # a new name only: never follows an existing one
                return name
            except FileExistsError:
                continue
            except OSError:
                break  # no hard links here: copy instead
    fd, name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".bak.tmp", dir=folder)
    try:
        with os.fdopen(fd, "wb") as out, open(target, "rb") as src:
            shutil.copyfileobj(src, out)
            with contextlib.suppress(OSError):
                os.fchmod(out.fileno(), os.fstat(src.fileno()).st_mode & 0o7777)
            out.flush()
            os.fsync(out.fileno())
    except BaseException:
        os.unlink(name)
        raise
    return name


def _clear_legacy(folder: Path, target: Path) -> None:
    """Remove ``.NAME.bak.tmp``, the fixed name earlier versions used (a file or a link,
    left by a killed save); unlinking a name never follows it."""
    legacy = folder / f".{target.name}.bak.tmp"
    with contextlib.suppress(OSError):
        if not stat.S_ISDIR(os.lstat(legacy).st_mode):
            os.unlink(legacy)


def _create_new(tmp: str, target: Path) -> None:
    """Put ``tmp`` at ``target`` only if nothing is there (a hard link never replaces)."""
    try:
        os.link(tmp, target)
    except FileExistsError:
        raise FileExistsError(
            errno.EEXIST, "already exists; choose another name", str(target)
        ) from None
    except OSError:  # no hard links on this file system
        if os.path.lexists(target):
            raise FileExistsError(
                errno.EEXIST, "already exists; choose another name", str(target)
            ) from None
        os.replace(tmp, target)
        return
    os.unlink(tmp)


def _fsync_folder(folder: Path) -> None:
    try:
        dir_fd = os.open(folder, os.O_RDONLY)
        try:
            os.fsync(dir_fd)
        finally:
            os.close(dir_fd)
    except OSError:
        pass  # some file systems cannot fsync a folder; the rename is still atomic


@contextlib.contextmanager
def atomic_binary(
    path: str | Path, backup: bool = False, exclusive: bool = False
) -> Iterator[BinaryIO]:
    """A binary file to write that replaces ``path`` only when the block ends normally, so
    a crash or an error leaves the old file or the new one whole, never a part.

    With ``backup`` the previous file is kept as ``path + '.bak'`` (made before the rename, so
    the old contents are never missing). With ``exclusive`` an existing file is never
    replaced (FileExistsError). A device or FIFO is written directly (see the module text).
    """
    target = Path(path)
    kind = _kind(target)
    if kind == "special":
        with _direct(target) as fh:
            yield fh
        return
    folder = target.parent if str(target.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    bak_tmp: str | None = None
    try:
        _new_file_mode(fd, target, kind == "regular")
        with os.fdopen(fd, "wb") as fh:
            yield fh
            fh.flush()
            os.fsync(fh.fileno())
        with _folder_lock(folder):
            if exclusive:
                _create_new(tmp, target)
            else:
                now = _kind(target)
                if now == "special":  # a device or FIFO appeared since: never rename over it
                    raise OSError(errno.EAGAIN, "changed while saving; try again", str(target))
                if backup and now == "regular":
                    _clear_legacy(folder, target)
                    bak_tmp = _backup_copy(target, folder)
                    os.replace(bak_tmp, target.with_name(target.name + ".bak"))
                    bak_tmp = None
                os.replace(tmp, target)
        _fsync_folder(folder)
    except BaseException:
        for leftover in (tmp, bak_tmp):
            if leftover and os.path.lexists(leftover):
                os.unlink(leftover)
        raise


def atomic_write_text(
    path: str | Path, text: str, backup: bool = False, exclusive: bool = False
) -> None:
    """Replace ``path`` with ``text`` (UTF-8) so that a crash leaves the old or the new file
    whole (see atomic_binary)."""
    with atomic_binary(path, backup, exclusive) as fh:
        fh.write(text.encode("utf-8"))

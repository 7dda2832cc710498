"""Writing files so that a failure never leaves a half-written or truncated file behind."""

from __future__ import annotations

import contextlib
import os
import stat
import tempfile
from pathlib import Path

#: Temporary files are named ``.<name>.<random>.part`` in the folder of the file they become.
TEMP_SUFFIX = ".part"


def _final_mode(path: Path) -> int:
    """The permissions the written file should have: those of the file it replaces, or what a
    plain ``open()`` would give a new file (0o666 less the umask). ``mkstemp`` makes its file
    readable by the owner only, which would silently make a shared list or a published page
    unreadable to everyone else."""
    try:
        return stat.S_IMODE(os.stat(path).st_mode)
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def _sync_folder(folder: Path) -> None:
    """Make the rename itself durable (POSIX); a no-op where folders cannot be opened."""
    flags = getattr(os, "O_DIRECTORY", None)
    if flags is None:
        return
    with contextlib.suppress(OSError):
        fd = os.open(folder, os.O_RDONLY | flags)
        try:
            os.fsync(fd)
        finally:
            os.close(fd)


def write_bytes_atomically(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder, then rename.

    The data is flushed and fsynced before the rename, and the folder after it, so the old
    file, if any, stays whole until the new one is complete on disk; on any failure the
    temporary file is removed and the old file is left as it was.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    mode = _final_mode(path)
    try:
        fd, temp_name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=TEMP_SUFFIX, dir=folder)
    except OSError as exc:
        raise _naming(exc, path) from exc
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        with contextlib.suppress(OSError):
            os.chmod(temp_name, mode)
        os.replace(temp_name, path)
    except BaseException as exc:
        with contextlib.suppress(OSError):
            os.unlink(temp_name)
        if isinstance(exc, OSError) and exc.errno is not None:
            raise _naming(exc, path) from exc
        raise
    _sync_folder(folder)


def _naming(exc: OSError, path: Path) -> OSError:
    """The same error about the file the caller asked for, not our temporary one."""
    return type(exc)(exc.errno, exc.strerror, str(path))


def write_text_atomically(path: Path, text: str) -> None:
    write_bytes_atomically(path, text.encode("utf-8"))

"""Writing files so that a failure never leaves a half-written or truncated file behind."""

from __future__ import annotations

import contextlib
import os
import stat
import sys
import tempfile
from pathlib import Path

from curator.core.errors import CuratorError

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


def read_utf8_text(path: Path, error: type[CuratorError], hint: str) -> str:
    """The text of a UTF-8 file (a byte-order mark is dropped).

    Raises:
        ``error``: unreadable, or not UTF-8, naming the line and column of the first bad byte
        and ending with ``hint`` (what the curator can do about it).
    """
    try:
        data = Path(path).read_bytes()
    except OSError as exc:
        raise error(f"{path}: cannot be read ({exc.strerror or exc}).") from None
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        start = exc.start + (3 if data.startswith(b"\xef\xbb\xbf") else 0)
        line = data.count(b"\n", 0, start) + 1
        line_start = data.rfind(b"\n", 0, start) + 1
        column = len(data[line_start:start].decode("utf-8", errors="replace")) + 1
        raise error(
            f"{path}, line {line}, column {column}: not UTF-8 text "
            f"(byte 0x{data[start]:02x}); {hint}"
        ) from None


def user_folder(kind: str, override_variable: str) -> Path:
    """curator's folder of the given kind ("cache" or "state") in the platform's usual place;
    the environment variable ``override_variable`` names another folder instead."""
    override = os.environ.get(override_variable)
    if override:
        return Path(override)
    home = Path.home()
    if sys.platform.startswith("win"):
        base = Path(os.environ.get("LOCALAPPDATA", home / "AppData" / "Local"))
    elif sys.platform == "darwin":
        base = home / "Library" / ("Caches" if kind == "cache" else "Application Support")
    elif kind == "cache":
        base = Path(os.environ.get("XDG_CACHE_HOME", home / ".cache"))
    else:
        base = Path(os.environ.get("XDG_STATE_HOME", home / ".local" / "state"))
    return base / "curator"

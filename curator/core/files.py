"""Writing files so that a failure never leaves a half-written or truncated file behind."""

from __future__ import annotations

import contextlib
import os
import tempfile
from pathlib import Path


def write_bytes_atomically(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder, then rename.

    The old file, if any, stays whole until the new one is complete on disk.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    fd, temp_name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=folder)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(temp_name, path)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(temp_name)
        raise


def write_text_atomically(path: Path, text: str) -> None:
    write_bytes_atomically(path, text.encode("utf-8"))

"""Giving freed memory back to the system.

glibc keeps the pages a long-lived process has freed for its own later use, so a process that
let go of a large structure goes on looking as large as before, and the next large structure
adds to its peak instead of reusing them. Where glibc is there (Linux), ``malloc_trim`` hands
them back.
"""

from __future__ import annotations

import contextlib
import ctypes
import gc
import sys


def return_freed_memory(*, collect: bool = False) -> None:
    """Hand freed memory back to the system (Linux only; elsewhere nothing happens).

    ``collect`` first runs Python's cycle collector, so that unreachable cycles are freed too;
    leave it off in the middle of building an index, where it would walk millions of objects.
    """
    if not sys.platform.startswith("linux"):
        return
    if collect:
        gc.collect()
    with contextlib.suppress(OSError, AttributeError):
        ctypes.CDLL("libc.so.6").malloc_trim(0)

"""The curator window (PySide6). Only this package imports Qt; it talks to curator.services.

``run`` imports the window only when called, so the command line works without Qt.
(PySide6 6.12.0 drops references to None on Python 3.11 and aborts the interpreter; the project
pins an earlier release.)
"""

from __future__ import annotations


def run(
    paths: list[str] | None = None, *, endpoint: str | None = None, timeout: float = 30.0
) -> int:
    """Open the window on ``paths`` (the demo collection when None), or on a SPARQL endpoint's
    query URL, and run until it closes."""
    from curator.gui.app import run as _run

    return _run(paths, endpoint=endpoint, timeout=timeout)


__all__ = ["run"]

"""Helpers shared by the GUI tests (imported by name: pytest puts this folder on sys.path)."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from curator.gui.window import MainWindow
from curator.services.workspace import Workspace


def iri_of(workspace: Workspace, title: str) -> str:
    """The IRI of the work with exactly this title."""
    return next(r.iri for r in workspace.index.records if r.label == title)


MIRROR = "The Mirror of Gullstane"
HERON = "Thessaly's Heron"


def wait_refresh(qtbot: Any, window: MainWindow, action: Callable[[], object]) -> None:
    """Run ``action`` and wait until the suggestions it causes are on screen."""
    with qtbot.waitSignal(window.suggestions_shown, timeout=3000):
        action()

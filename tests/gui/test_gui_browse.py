"""Browsing: a work's properties, following a value to the works that share it, back/forward."""

from __future__ import annotations

from typing import Any

from gui_helpers import MIRROR, iri_of, wait_refresh
from PySide6.QtCore import QUrl

from curator.gui.history import BrowseHistory
from curator.gui.window import MainWindow
from curator.services.workspace import Workspace

DOUBLE_LIVES = "https://hollinmere.example/theme/double-lives"


def test_history_back_forward_and_branching() -> None:
    trail = BrowseHistory()
    assert trail.current is None and not trail.can_go_back
    for iri in ("a", "b", "c"):
        assert trail.visit(iri)
    assert not trail.visit("c")
    assert trail.back() == "b"
    assert trail.back() == "a"
    assert trail.back() == "a"
    assert trail.forward() == "b"
    trail.visit("d")
    assert trail.items == ["a", "b", "d"]
    assert not trail.can_go_forward


def _link(window: MainWindow, action: str, iri: str | None = None) -> QUrl:
    """The page's first link that does ``action`` (on ``iri``, if given)."""
    for number, link in enumerate(window.browse_panel._links):
        if link.action == action and iri in (None, link.iri):
            return QUrl(f"link:{number}")
    raise AssertionError(f"no {action} link for {iri}")


def test_selecting_a_work_shows_it_and_a_theme_opens_its_works(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    mirror = iri_of(demo_workspace, MIRROR)
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds([mirror]))
    window.seeds_panel.view.setCurrentIndex(window.seed_model.index(0))
    page = window.browse_panel.page
    assert MIRROR in page.toPlainText()
    assert "Double lives" in page.toPlainText()
    assert "Posy Haverleigh" in page.toPlainText()

    page.anchorClicked.emit(_link(window, "open", DOUBLE_LIVES))
    text = page.toPlainText()
    assert "works in the catalogue" in text
    assert MIRROR in text
    assert window.browse_panel.back_action.isEnabled()

    # A work listed under the theme can go straight onto the list.
    add = _link(window, "add")
    wait_refresh(qtbot, window, lambda: page.anchorClicked.emit(add))
    assert len(window.session.entries) == 1

    window.browse_panel.back_action.trigger()
    assert "Posy Haverleigh" in page.toPlainText()
    assert window.browse_panel.forward_action.isEnabled()
    window.browse_panel.forward_action.trigger()
    assert "works in the catalogue" in page.toPlainText()


def test_selecting_a_candidate_browses_it_and_shows_its_rationale(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds([iri_of(demo_workspace, MIRROR)]))
    panel = window.candidates_panel
    panel.view.setCurrentIndex(window.candidate_model.index(1))
    row = window.candidate_model.candidate_at(1)
    assert row is not None
    explanation = panel.explanation.toPlainText()
    assert row.rationale in explanation
    assert row.line.title in window.browse_panel.page.toPlainText()

"""Accepting, dropping, reordering, dismissing and editing: all through the undo stack."""

from __future__ import annotations

from typing import Any

from gui_helpers import HERON, MIRROR, iri_of, wait_refresh
from PySide6.QtCore import QModelIndex, Qt
from PySide6.QtTest import QTest

from curator.gui.window import MainWindow
from curator.services.workspace import Workspace


def _seeded(qtbot: Any, window: MainWindow, workspace: Workspace) -> None:
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds([iri_of(workspace, MIRROR)]))
    assert window.candidate_model.rowCount() > 5


def test_drop_candidate_lands_at_the_drop_row_and_leaves_the_candidates(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    candidates = window.candidate_model
    wait_refresh(qtbot, window, lambda: window.editor.accept(candidates.iris()[:2]))
    assert len(window.session.entries) == 2
    chosen = candidates.iris()[3]
    mime = candidates.mimeData([candidates.index(3)])
    wait_refresh(
        qtbot,
        window,
        lambda: window.entry_model.dropMimeData(
            mime, Qt.DropAction.CopyAction, 1, 0, QModelIndex()
        ),
    )
    assert window.session.entries[1].iri == chosen
    assert window.entry_model.index(1).data(Qt.ItemDataRole.DisplayRole) == (
        window.session.entries[1].label
    )
    assert window.session.entries[1].rationale  # prefilled from the suggestion
    assert chosen not in candidates.iris()

    wait_refresh(qtbot, window, window.undo_stack.undo)
    assert chosen not in window.session.entry_iris
    assert len(window.session.entries) == 2
    assert chosen in candidates.iris()
    wait_refresh(qtbot, window, window.undo_stack.redo)
    assert window.session.entries[1].iri == chosen


def test_drop_on_an_entry_inserts_before_it(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    candidates = window.candidate_model
    wait_refresh(qtbot, window, lambda: window.editor.accept(candidates.iris()[:3]))
    chosen = candidates.iris()[0]
    mime = candidates.mimeData([candidates.index(0)])
    window.entry_model.dropMimeData(
        mime, Qt.DropAction.CopyAction, -1, -1, window.entry_model.index(2)
    )
    assert window.session.entry_iris.index(chosen) == 2


def test_internal_drag_moves_an_entry(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:4]))
    before = list(window.session.entry_iris)
    mime = window.entry_model.mimeData([window.entry_model.index(0)])
    assert window.entry_model.dropMimeData(
        mime, Qt.DropAction.MoveAction, 3, 0, QModelIndex()
    )  # dropped between rows 2 and 3
    assert window.session.entry_iris == [before[1], before[2], before[0], before[3]]
    window.undo_stack.undo()
    assert window.session.entry_iris == before


def test_reorder_and_remove_by_keyboard(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:3]))
    before = list(window.session.entry_iris)
    view = window.list_panel.view
    view.setFocus()
    window.list_panel.select_row(0)
    QTest.keyClick(view, Qt.Key.Key_Down, Qt.KeyboardModifier.ControlModifier)
    assert window.session.entry_iris == [before[1], before[0], before[2]]
    assert window.list_panel.current_row() == 1  # the moved entry stays selected
    QTest.keyClick(view, Qt.Key.Key_Down, Qt.KeyboardModifier.ControlModifier)
    assert window.session.entry_iris == [before[1], before[2], before[0]]
    QTest.keyClick(view, Qt.Key.Key_Up, Qt.KeyboardModifier.ControlModifier)
    assert window.session.entry_iris == [before[1], before[0], before[2]]
    QTest.keyClick(view, Qt.Key.Key_Delete)
    assert window.session.entry_iris == [before[1], before[2]]
    QTest.keyClick(view, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    assert window.session.entry_iris == [before[1], before[0], before[2]]
    QTest.keyClick(
        view, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.ShiftModifier
    )
    assert window.session.entry_iris == [before[1], before[2]]


def test_enter_accepts_and_the_next_candidate_takes_its_place(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    view = window.candidates_panel.view
    view.setFocus()
    view.setCurrentIndex(window.candidate_model.index(0))
    first, second = window.candidate_model.iris()[:2]
    wait_refresh(qtbot, window, lambda: QTest.keyClick(view, Qt.Key.Key_Return))
    assert window.session.entry_iris == [first]
    assert window.candidates_panel.selected_iris() == [window.candidate_model.iris()[0]]
    assert second in window.candidate_model.iris()


def test_d_dismisses_and_s_makes_a_starting_title(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    view = window.candidates_panel.view
    view.setFocus()
    view.setCurrentIndex(window.candidate_model.index(0))
    dismissed = window.candidate_model.iris()[0]
    wait_refresh(qtbot, window, lambda: QTest.keyClick(view, Qt.Key.Key_D))
    assert window.session.dismissed == [dismissed]
    assert dismissed not in window.candidate_model.iris()
    view.setCurrentIndex(window.candidate_model.index(0))
    seeded = window.candidate_model.iris()[0]
    wait_refresh(qtbot, window, lambda: QTest.keyClick(view, Qt.Key.Key_S))
    assert window.session.seeds[-1] == seeded
    assert window.seed_model.rowCount() == 2
    window.undo_stack.undo()
    window.undo_stack.undo()
    assert window.session.dismissed == []
    assert len(window.session.seeds) == 1


def test_typing_a_note_is_one_undo_step(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:2]))
    panel = window.list_panel
    panel.select_row(1)
    assert panel.rationale.toPlainText() == window.session.entries[1].rationale
    QTest.keyClicks(panel.note, "Pair with the film")
    assert window.session.entries[1].note == "Pair with the film"
    assert window.isWindowModified()
    window.undo_stack.undo()
    assert window.session.entries[1].note == ""
    assert panel.note.toPlainText() == ""
    window.undo_stack.redo()
    assert panel.note.toPlainText() == "Pair with the film"


def test_seed_search_adds_and_the_cross_removes(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    panel = window.seeds_panel
    panel.search("thessalys heron")  # no apostrophe, lower case
    lines = [panel.results.index(r).data() for r in range(panel.results.rowCount())]
    assert lines[0].startswith(HERON)
    assert "Idony Greyhallow" in lines[0] and "1941" in lines[0]
    wait_refresh(qtbot, window, lambda: panel.choose_result(0))
    assert window.session.seeds == [iri_of(demo_workspace, HERON)]
    index = window.seed_model.index(0)
    wait_refresh(qtbot, window, lambda: panel.delegate.remove_clicked.emit(index))
    assert window.session.seeds == []
    assert window.candidate_model.rowCount() == 0


def test_ctrl_z_in_a_text_field_undoes_through_the_window(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:1]))
    panel = window.list_panel
    panel.select_row(0)
    panel.rationale.setFocus()
    original = window.session.entries[0].rationale
    QTest.keyClicks(panel.rationale, " Read aloud well.")
    assert window.session.entries[0].rationale == original + " Read aloud well."
    QTest.keyClick(panel.rationale, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    assert window.session.entries[0].rationale == original
    assert panel.rationale.toPlainText() == original


def test_typing_a_title_offers_matches_and_enter_adds_the_best(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    field = window.seeds_panel.field
    window.activateWindow()
    field.setFocus()
    QTest.keyClicks(field, "mirror of gull")
    popup = window.seeds_panel.completer.popup()
    qtbot.waitUntil(popup.isVisible, timeout=2000)
    assert MIRROR in popup.currentIndex().data()
    wait_refresh(qtbot, window, lambda: QTest.keyClick(popup, Qt.Key.Key_Return))
    assert window.session.seeds == [iri_of(demo_workspace, MIRROR)]
    qtbot.waitUntil(lambda: field.text() == "", timeout=1000)

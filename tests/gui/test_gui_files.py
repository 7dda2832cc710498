"""Saving, opening, recovery after a crash, and never losing unsaved work silently."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

from conftest import Dialogs
from gui_helpers import HERON, MIRROR, iri_of, wait_refresh
from PySide6.QtCore import QSettings
from PySide6.QtWidgets import QMessageBox

from curator.core.session import Session
from curator.gui.recent import recent_lists
from curator.gui.window import MainWindow, default_file_name
from curator.services.sessions import entry_for_work, recovery_path, write_recovery
from curator.services.workspace import Workspace

Button = QMessageBox.StandardButton


def _build_list(qtbot: Any, window: MainWindow, workspace: Workspace) -> None:
    iris = [iri_of(workspace, MIRROR), iri_of(workspace, HERON)]
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds(iris))
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:3]))
    window.editor.edit_entry(0, "note", "Start the display with this one")
    window.editor.set_title("Winter secrets")
    wait_refresh(qtbot, window, lambda: window.controls.slider.setValue(60))


def test_save_then_reopen_gives_the_same_list(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    _build_list(qtbot, window, demo_workspace)
    assert window.isWindowModified()
    assert window.windowTitle().startswith("Winter secrets")
    path = tmp_path / "winter.curator.json"
    assert window.save_to(path)
    assert not window.isWindowModified()
    assert json.loads(path.read_text(encoding="utf-8"))["format"] == "curator-session"
    saved = Session.load(path)
    assert saved.same_content(window.session)
    assert recent_lists()[0] == path.resolve()

    other = MainWindow(languages=("en",))
    qtbot.addWidget(other)
    other.set_workspace(demo_workspace, ())
    assert other.open_list(path)
    assert other.session.same_content(saved)
    assert other.list_panel.title.text() == "Winter secrets"
    assert other.controls.slider.value() == 60
    assert other.entry_model.index(0).data() == saved.entries[0].label
    assert not other.isWindowModified()


def test_save_as_asks_for_a_name_and_adds_the_extension(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path, dialogs: Dialogs
) -> None:
    _build_list(qtbot, window, demo_workspace)
    dialogs.save_paths.append(str(tmp_path / "winter"))
    assert window.save()
    assert (tmp_path / "winter.curator.json").exists()
    assert default_file_name("Winter: secrets & lies") == "winter-secrets-lies.curator.json"


def test_failed_save_says_why_and_keeps_unsaved_state(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path, dialogs: Dialogs
) -> None:
    _build_list(qtbot, window, demo_workspace)
    assert not window.save_to(tmp_path / "missing-folder" / "x.curator.json")
    assert dialogs.texts("warning")
    assert window.isWindowModified()


def test_opening_a_damaged_list_changes_nothing(
    qtbot: Any, window: MainWindow, tmp_path: Path, dialogs: Dialogs
) -> None:
    bad = tmp_path / "bad.curator.json"
    bad.write_text('{"format": "curator-session", "version": 1, "seeds": 3}', encoding="utf-8")
    before = window.session.to_json()
    assert not window.open_list(bad)
    assert "seeds" in dialogs.texts("warning")[0]
    assert window.session.to_json()["seeds"] == before["seeds"]


def test_new_asks_before_losing_work(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, dialogs: Dialogs
) -> None:
    _build_list(qtbot, window, demo_workspace)
    dialogs.answers.append(Button.Cancel)
    window.new_list()
    assert window.session.title == "Winter secrets"
    dialogs.answers.append(Button.Discard)
    window.new_list()
    assert window.session.title == "Untitled list"
    assert window.session.entries == []
    assert not window.isWindowModified()
    assert [kind for kind, _t, _x in dialogs.shown] == ["question", "question"]


def test_close_can_be_cancelled(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, dialogs: Dialogs
) -> None:
    _build_list(qtbot, window, demo_workspace)
    dialogs.answers.append(Button.Cancel)
    assert not window.close()
    assert window.isVisible()


def test_autosave_writes_the_recovery_file_and_a_clean_exit_removes_it(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    _build_list(qtbot, window, demo_workspace)
    window.autosaver.set_delay(20)
    assert window.autosaver.write_now()
    assert Session.load(recovery_path()).same_content(window.session)
    window.save_to(tmp_path / "saved.curator.json")
    assert not recovery_path().exists()  # saved: nothing to recover
    window.editor.set_title("Changed again")
    qtbot.waitUntil(recovery_path().exists, timeout=5000)
    window.undo_stack.setClean()
    window.close()
    assert not recovery_path().exists()


def test_recovery_is_offered_after_a_crash_and_restores_the_list(
    qtbot: Any, demo_workspace: Workspace, dialogs: Dialogs
) -> None:
    lost = Session(title="Lost in the crash", seeds=[iri_of(demo_workspace, MIRROR)])
    lost.insert_entry(0, demo_entry := _entry(demo_workspace, HERON))
    write_recovery(lost)
    QSettings().setValue("recovery/document", "")
    dialogs.answers.append(Button.Yes)

    window = MainWindow(languages=("en",))
    qtbot.addWidget(window)
    with qtbot.waitSignal(window.catalogue_ready, timeout=10_000):
        window.start()
    assert dialogs.shown[0][0] == "question"
    assert "Lost in the crash" in dialogs.shown[0][2]
    assert window.session.same_content(lost)
    assert window.session.entries == [demo_entry]
    assert window.isWindowModified()  # restored work is not saved work
    qtbot.waitUntil(lambda: window.candidate_model.rowCount() > 0, timeout=3000)
    window.undo_stack.setClean()


def test_declining_recovery_clears_it(qtbot: Any, dialogs: Dialogs) -> None:
    write_recovery(Session(title="Not wanted"))
    dialogs.answers.append(Button.No)
    window = MainWindow(languages=("en",))
    qtbot.addWidget(window)
    assert window.offer_recovery() is None
    assert not recovery_path().exists()
    assert window.session.title == "Untitled list"


def test_geometry_is_remembered(qtbot: Any, window: MainWindow) -> None:
    window.resize(800, 540)
    window.shutdown()
    again = MainWindow(languages=("en",))
    qtbot.addWidget(again)
    assert again.size().height() == 540


def _entry(workspace: Workspace, title: str):

    return entry_for_work(workspace, iri_of(workspace, title))

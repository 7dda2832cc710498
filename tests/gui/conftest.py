"""GUI test fixtures: an offscreen Qt, a private state folder and QSettings, no real dialogs.

Every dialog the window can open is replaced by a recorder, so a test can never hang on a modal
box, and can read what the curator would have been told.
"""

from __future__ import annotations

import os

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import pytest
from PySide6.QtCore import QSettings
from PySide6.QtWidgets import QApplication, QFileDialog, QMessageBox

import curator.gui  # noqa: F401  (guards None's refcount before Qt work starts)
from curator.gui.window import MainWindow
from curator.services.workspace import Workspace

StandardButton = QMessageBox.StandardButton


@pytest.fixture(scope="session", autouse=True)
def private_settings(tmp_path_factory: pytest.TempPathFactory, qapp: QApplication) -> Path:
    """QSettings in a temporary folder under a test organisation, never the user's."""
    folder = tmp_path_factory.mktemp("qsettings")
    QSettings.setDefaultFormat(QSettings.Format.IniFormat)
    QSettings.setPath(QSettings.Format.IniFormat, QSettings.Scope.UserScope, str(folder))
    qapp.setOrganizationName("curator-tests")
    qapp.setApplicationName("curator-gui-tests")
    return folder


@pytest.fixture(autouse=True)
def state_dir(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A fresh recovery folder per test (the sessions service reads CURATOR_STATE_DIR)."""
    folder = tmp_path / "state"
    monkeypatch.setenv("CURATOR_STATE_DIR", str(folder))
    QSettings().clear()
    return folder


@dataclass
class Dialogs:
    """What the window showed; ``answers`` are popped for questions (else the default)."""

    shown: list[tuple[str, str, str]] = field(default_factory=list)
    answers: list[StandardButton] = field(default_factory=list)
    save_paths: list[str] = field(default_factory=list)

    def texts(self, kind: str) -> list[str]:
        return [text for k, _title, text in self.shown if k == kind]


@pytest.fixture(autouse=True)
def dialogs(monkeypatch: pytest.MonkeyPatch) -> Dialogs:
    record = Dialogs()

    def message(kind: str) -> Callable[..., StandardButton]:
        def show(_parent: Any, title: str, text: str, *args: Any, **_kw: Any) -> StandardButton:
            record.shown.append((kind, title, text))
            if kind == "question":
                if record.answers:
                    return record.answers.pop(0)
                return StandardButton.Discard  # never block: closing a test window discards
            return StandardButton.Ok

        return show

    for kind in ("warning", "critical", "information", "question"):
        monkeypatch.setattr(QMessageBox, kind, staticmethod(message(kind)))
    monkeypatch.setattr(QMessageBox, "about", staticmethod(lambda *a, **k: None))

    def save_name(*_args: Any, **_kw: Any) -> tuple[str, str]:
        return (record.save_paths.pop(0) if record.save_paths else "", "")

    monkeypatch.setattr(QFileDialog, "getSaveFileName", staticmethod(save_name))
    monkeypatch.setattr(QFileDialog, "getOpenFileName", staticmethod(save_name))
    return record


@pytest.fixture
def window(qtbot: Any, demo_workspace: Workspace) -> Iterator[MainWindow]:
    """A window on the shared demo workspace (opened once for the whole test run)."""
    win = MainWindow(languages=("en",))
    qtbot.addWidget(win)
    win.resize(1400, 900)
    win.set_workspace(demo_workspace, ())
    win.show()
    qtbot.waitUntil(lambda: win._changed_at is None, timeout=2000)
    yield win
    win.undo_stack.setClean()

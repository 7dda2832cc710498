"""Opening catalogues in the background: progress, cancel, and errors that keep what was open."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from conftest import Dialogs

from curator.gui.window import MainWindow
from curator.gui.workers import CatalogueLoader
from curator.services.workspace import Workspace

FIXTURES = Path(__file__).resolve().parents[1] / "fixtures"


def test_loader_reports_progress_and_delivers_a_workspace(qtbot: Any) -> None:
    loader = CatalogueLoader()
    values: list[float] = []
    loader.progressed.connect(lambda _stage, fraction: values.append(fraction))
    with qtbot.waitSignal(loader.loaded, timeout=10_000) as blocker:
        assert loader.start([], ("en",))
    loader.stop()
    workspace, paths = blocker.args
    assert isinstance(workspace, Workspace)
    assert paths == ()
    assert len(set(values)) >= 3
    assert values == sorted(values)
    assert values[-1] <= 1.0


def test_cancel_right_away_keeps_the_open_catalogue(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    loaded: list[object] = []
    window.loader.loaded.connect(lambda *a: loaded.append(a))
    with qtbot.waitSignal(window.loader.cancelled, timeout=10_000):
        assert window.open_catalogue([FIXTURES / "dcterms_skos.ttl"])
        window.cancel_loading()
    qtbot.waitUntil(lambda: not window.loader.busy, timeout=5000)
    assert loaded == []
    assert window.workspace is demo_workspace
    assert not window.load_status.isVisible()


def test_broken_file_names_file_and_line_and_keeps_the_catalogue(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, dialogs: Dialogs
) -> None:
    broken = FIXTURES / "bad" / "truncated.ttl"
    with qtbot.waitSignal(window.loader.failed, timeout=10_000):
        window.open_catalogue([broken])
    qtbot.waitUntil(lambda: bool(dialogs.texts("warning")), timeout=2000)
    text = dialogs.texts("warning")[0]
    assert "truncated.ttl" in text
    assert "line 10" in text
    assert "column 21" in text
    assert "Traceback" not in text
    assert "still open" in text
    assert window.workspace is demo_workspace
    assert "405 works" in window.summary.text()


def test_a_new_catalogue_replaces_the_old_one_when_it_loads(qtbot: Any, window: MainWindow) -> None:
    with qtbot.waitSignal(window.catalogue_ready, timeout=10_000):
        window.open_catalogue([FIXTURES / "dcterms_skos.ttl"])
    assert window.catalogue_paths == (str(FIXTURES / "dcterms_skos.ttl"),)
    assert "dcterms_skos.ttl" in window.summary.text()
    assert window.controls.kind.count() >= 2


def test_the_status_bar_cancel_button_stops_a_load(qtbot: Any, window: MainWindow) -> None:
    with qtbot.waitSignal(window.loader.cancelled, timeout=10_000):
        window.open_catalogue([FIXTURES / "bibframe.ttl"])
        assert window.load_status.isVisible()
        assert window.stop_action.isEnabled()
        window.load_status.cancel.click()
    qtbot.waitUntil(lambda: not window.load_status.isVisible(), timeout=5000)
    assert "nothing was changed" in window.statusBar().currentMessage()
    assert window.catalogue_action.isEnabled()

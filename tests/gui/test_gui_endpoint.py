"""The window on a SPARQL endpoint: the Oxigraph server of tests/conftest.py holds the
demo collection, and the window opens it through the endpoint dialog. Candidates must be the
endpoint service's own suggestions, and (as tests/services/test_endpoint_mode.py shows for the
service) the embedded mode's top picks on the same files.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import pytest
from gui_helpers import MIRROR, iri_of
from PySide6.QtWidgets import QDialogButtonBox

import curator.gui
from curator.cli.main import main
from curator.core.session import Session
from curator.gui.endpoint_dialog import EndpointDialog, check_endpoint_url
from curator.gui.recent import recent_endpoints
from curator.gui.window import MainWindow
from curator.services.endpoint import EndpointWorkspace, open_endpoint
from curator.services.sessions import suggest_for_session
from curator.services.workspace import Workspace

OPEN_TIMEOUT_MS = 15000


def open_through_dialog(qtbot: Any, window: MainWindow, url: str) -> EndpointDialog:
    """File ▸ Open an endpoint…, type the URL, press Open."""
    dialog = window.open_endpoint_dialog()
    dialog.set_url(url)
    dialog.buttons.button(QDialogButtonBox.StandardButton.Open).click()
    return dialog


def open_endpoint_window(qtbot: Any, window: MainWindow, url: str) -> None:
    with qtbot.waitSignal(window.catalogue_ready, timeout=OPEN_TIMEOUT_MS):
        open_through_dialog(qtbot, window, url)
    assert isinstance(window.workspace, EndpointWorkspace)


def seed_by_search(qtbot: Any, window: MainWindow, typed: str, title: str) -> str:
    """Type part of a title, wait for the worker's results, pick the one with ``title``, wait
    for the candidates."""
    with qtbot.waitSignal(window.seeds_panel.searched, timeout=OPEN_TIMEOUT_MS):
        window.seeds_panel.search(typed)
    results = window.seeds_panel.results
    row = next(r for r in range(results.rowCount()) if results._rows[r].title == title)
    with qtbot.waitSignal(window.suggestions_shown, timeout=OPEN_TIMEOUT_MS):
        window.seeds_panel.choose_result(row)
    return window.session.seeds[-1]


@pytest.fixture
def endpoint_window(qtbot: Any, window: MainWindow, oxigraph_server: str) -> MainWindow:
    open_endpoint_window(qtbot, window, oxigraph_server)
    return window


def test_the_dialog_refuses_a_url_that_is_not_http(qtbot: Any, window: MainWindow) -> None:
    for bad in ("", "ftp://example.org/sparql", "localhost:7878/query", "http:///query"):
        assert check_endpoint_url(bad) is not None and "Endpoint URL" in str(
            check_endpoint_url(bad)
        )
    dialog = open_through_dialog(qtbot, window, "ftp://example.org/sparql")
    assert dialog.isVisible() and not dialog.error.isHidden()
    assert "Endpoint URL" in dialog.error.text() and "http://" in dialog.error.text()
    assert not window.loader.busy
    dialog.reject()


def test_open_search_suggest_as_the_service_does(
    qtbot: Any,
    endpoint_window: MainWindow,
    oxigraph_server: str,
    demo_workspace: Workspace,
) -> None:
    win = endpoint_window
    assert win.endpoint_mode and win.catalogue_paths == (oxigraph_server,)
    assert win.summary.text().startswith("SPARQL endpoint: 405 works")
    assert oxigraph_server in win.summary.text()
    assert recent_endpoints()[0] == oxigraph_server
    assert not win.import_action.isEnabled() and "whole catalogue" in win.import_action.toolTip()
    # kinds come from the endpoint, labelled as embedded mode labels them
    kinds = [win.controls.kind.itemText(i) for i in range(1, win.controls.kind.count())]
    assert kinds == sorted(["Audiobook", "Film", "Graphic novel", "Novel", "Story collection"])
    assert not win.controls.language.isEnabled() and "every work" in win.controls.language.toolTip()

    seed = seed_by_search(qtbot, win, "mirror of gull", MIRROR)
    assert seed == iri_of(demo_workspace, MIRROR)
    assert win.seed_model.data(win.seed_model.index(0)) == MIRROR
    shown = win.candidate_model.iris()
    assert len(shown) == 20

    # the endpoint service's own suggestions for the same session
    service = open_endpoint(oxigraph_server, languages=("en",))
    own = suggest_for_session(service, win.session.snapshot(), 20)
    assert own.result is not None
    assert shown == [s.iri for s in own.result.suggestions]
    # embedded mode on the same files (the reference the endpoint tests check against)
    embedded = suggest_for_session(demo_workspace, win.session.snapshot(), 20)
    assert embedded.result is not None and embedded.result.settings.mode == "blend"
    assert shown[:10] == [s.iri for s in embedded.result.suggestions][:10]
    rationales = [row.rationale for row in win.candidate_model.rows()]
    assert rationales[:10] == [s.rationale for s in embedded.result.suggestions][:10]


def test_add_save_and_reopen_from_the_endpoint(
    qtbot: Any,
    endpoint_window: MainWindow,
    oxigraph_server: str,
    demo_workspace: Workspace,
    tmp_path: Path,
) -> None:
    win = endpoint_window
    seed_by_search(qtbot, win, "Mirror of Gullstane", MIRROR)
    first = win.candidate_model.rows()[0]
    with qtbot.waitSignal(win.suggestions_shown, timeout=OPEN_TIMEOUT_MS):
        win.editor.accept([first.iri])
    entry = win.session.entries[0]
    assert entry.iri == first.iri and entry.rationale == first.rationale
    assert entry.rationale  # the Why-it-belongs sentence
    assert first.iri not in win.candidate_model.iris()
    path = tmp_path / "gullstane.curator.json"
    assert win.save_to(path)
    saved = json.loads(path.read_text(encoding="utf-8"))
    assert saved["catalogue"] == [oxigraph_server] and saved["version"] == 2

    other = MainWindow(languages=("en",))
    qtbot.addWidget(other)
    other.set_workspace(demo_workspace, ())
    with qtbot.waitSignal(other.catalogue_ready, timeout=OPEN_TIMEOUT_MS):
        assert other.open_list(path, confirm=False)
    assert other.endpoint_mode and other.catalogue_paths == (oxigraph_server,)
    qtbot.waitUntil(lambda: bool(other.candidate_model.iris()), timeout=OPEN_TIMEOUT_MS)
    assert other.session.same_content(Session.load(path))
    assert other.session.entries[0].rationale == first.rationale
    assert first.iri not in other.candidate_model.iris()
    line = other._describe(first.iri, "")
    assert line.title == first.line.title and line.byline == first.line.byline
    other.shutdown()


def test_browse_and_balance_work_through_the_endpoint(
    qtbot: Any, endpoint_window: MainWindow
) -> None:
    win = endpoint_window
    seed_by_search(qtbot, win, "Mirror of Gullstane", MIRROR)
    first = win.candidate_model.rows()[0]
    win.browse_panel.show_iri(first.iri)  # described by the suggestion: shown at once
    page = win.browse_panel.page.toPlainText()
    assert first.line.title in page and "Add to list" in page and "not links here" in page
    assert not win.browse_panel.asking
    with qtbot.waitSignal(win.suggestions_shown, timeout=OPEN_TIMEOUT_MS):
        win.editor.accept([first.iri])
    win.show_balance()
    qtbot.waitUntil(lambda: win.balance_panel.report is not None, timeout=OPEN_TIMEOUT_MS)
    assert win.balance_panel.report.publication.entries[0].iri == first.iri


def test_a_dead_endpoint_leaves_the_catalogue_open(
    qtbot: Any, window: MainWindow, dialogs: Any, demo_workspace: Workspace, unused_port: int
) -> None:
    dead = f"http://127.0.0.1:{unused_port}/query"
    with qtbot.waitSignal(window.loader.finished, timeout=OPEN_TIMEOUT_MS):
        open_through_dialog(qtbot, window, dead)
    assert window.workspace is demo_workspace and window.catalogue_paths == ()
    [text] = dialogs.texts("warning")
    assert dead in text and "Check the URL" in text and "still open" in text
    assert ("warning", "The endpoint could not be opened", text) in dialogs.shown
    assert window.endpoint_action.isEnabled()


def test_cancel_while_connecting(
    qtbot: Any, window: MainWindow, oxigraph_server: str, demo_workspace: Workspace
) -> None:
    with qtbot.waitSignal(window.loader.finished, timeout=OPEN_TIMEOUT_MS):
        open_through_dialog(qtbot, window, oxigraph_server)
        assert window.load_status.isVisible()
        assert window.load_status.stage.text() == "Asking the endpoint…"
        window.load_status.cancel.click()
    assert window.workspace is demo_workspace and not window.endpoint_mode
    assert "nothing was changed" in window.statusBar().currentMessage()


def test_works_among_asks_once_for_many(oxigraph_server: str, demo_workspace: Workspace) -> None:
    service = open_endpoint(oxigraph_server, languages=("en",))
    works = [r.iri for r in demo_workspace.index.records[:150]]
    index = demo_workspace.index
    theme = next(f.value for f in index.features if f.value not in index.position)
    assert theme.startswith("https://")
    before = service.endpoint.requests
    found = service.works_among([*works, theme, "https://nowhere.example/x", "not an iri"])
    # the embedded index (pyoxigraph over the same files) is the reference
    assert found == set(works) - {theme}
    assert service.endpoint.requests - before == 2  # 100 IRIs a query
    assert service.resolve(works[0]) == works[0] and service.endpoint.requests - before == 2


def test_curator_open_endpoint(monkeypatch: pytest.MonkeyPatch) -> None:
    calls: list[Any] = []
    monkeypatch.setattr(curator.gui, "run", lambda paths, **kw: calls.append((paths, kw)) or 0)
    assert main(["open", "--endpoint", "http://localhost:7878/query", "--timeout", "5"]) == 0
    assert calls == [(None, {"endpoint": "http://localhost:7878/query", "timeout": 5.0})]
    assert main(["open"]) == 2
    assert main(["open", "a.ttl", "--endpoint", "http://localhost:7878/query"]) == 2

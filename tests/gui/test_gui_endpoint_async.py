"""Endpoint mode never waits on the network in the GUI thread: title searches, Browse of a
work no suggestion described, and suggestions run in workers, say that they are under way,
and say plainly when the endpoint fails. A slow stand-in endpoint (a small HTTP server that
forwards to the Oxigraph server of tests/conftest.py after a delay, or fails on request)
makes the waits long enough to watch the event loop keep running.
"""

from __future__ import annotations

import threading
import time
import urllib.error
import urllib.request
from collections.abc import Iterator
from dataclasses import dataclass, field, replace
from http.server import BaseHTTPRequestHandler, ThreadingHTTPServer
from typing import Any

import pytest
from gui_helpers import HERON, MIRROR, iri_of
from PySide6.QtCore import QTimer

from curator.core.errors import Cancelled
from curator.core.progress import CancelToken, Progress
from curator.gui.browse_panel import ASKING
from curator.gui.seeds_panel import SEARCHING
from curator.gui.window import ASKING_FOR_CANDIDATES, SUGGESTION_STOPPED, MainWindow
from curator.gui.workers import SUGGESTION_STAGES
from curator.services.endpoint import EndpointWorkspace, open_endpoint
from curator.services.workspace import Workspace

WAIT_MS = 15000


@dataclass
class SlowEndpoint:
    """Forwards every query to ``upstream`` after ``delay`` seconds, or answers HTTP 500 while
    ``fail`` is set; counts the queries it was sent."""

    upstream: str
    delay: float = 0.0
    fail: bool = False
    queries: int = 0
    url: str = ""
    _server: ThreadingHTTPServer | None = field(default=None, repr=False)


def _handler(slow: SlowEndpoint) -> type[BaseHTTPRequestHandler]:
    root = slow.upstream.rsplit("/", 1)[0]

    class Forward(BaseHTTPRequestHandler):
        def log_message(self, *_args: Any) -> None:  # quiet
            pass

        def _forward(self, body: bytes | None) -> None:
            slow.queries += 1
            time.sleep(slow.delay)
            if slow.fail:
                message = b"the stand-in endpoint is down for maintenance"
                self.send_response(500, "Internal Server Error")
                self.send_header("Content-Length", str(len(message)))
                self.end_headers()
                self.wfile.write(message)
                return
            headers = {"Accept": self.headers.get("Accept", "*/*")}
            if body is not None:
                headers["Content-Type"] = self.headers.get("Content-Type", "")
            request = urllib.request.Request(root + self.path, data=body, headers=headers)
            try:
                with urllib.request.urlopen(request, timeout=30) as answer:
                    status, data = answer.status, answer.read()
                    kind = answer.headers["Content-Type"]
            except urllib.error.HTTPError as exc:
                status, kind, data = exc.code, "text/plain", exc.read()
            try:
                self.send_response(status)
                self.send_header("Content-Type", kind or "application/octet-stream")
                self.send_header("Content-Length", str(len(data)))
                self.end_headers()
                self.wfile.write(data)
            except OSError:
                pass  # the client gave up waiting (a timeout test)

        def do_GET(self) -> None:
            self._forward(None)

        def do_POST(self) -> None:
            self._forward(self.rfile.read(int(self.headers.get("Content-Length", 0))))

    return Forward


@pytest.fixture
def slow_endpoint(oxigraph_server: str) -> Iterator[SlowEndpoint]:
    slow = SlowEndpoint(oxigraph_server)
    server = ThreadingHTTPServer(("127.0.0.1", 0), _handler(slow))
    server.daemon_threads = True
    slow.url = f"http://127.0.0.1:{server.server_address[1]}/query"
    slow._server = server
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    yield slow
    server.shutdown()
    server.server_close()


@pytest.fixture
def slow_window(qtbot: Any, window: MainWindow, slow_endpoint: SlowEndpoint) -> MainWindow:
    """The window on the stand-in endpoint (opened at full speed; tests slow it down)."""
    with qtbot.waitSignal(window.catalogue_ready, timeout=WAIT_MS):
        assert window.open_endpoint(slow_endpoint.url, timeout=5.0)
    assert isinstance(window.workspace, EndpointWorkspace)
    return window


class Ticks:
    """A 10 ms timer in the GUI thread: if the thread blocks, the gaps between ticks show it."""

    def __init__(self) -> None:
        self.times: list[float] = []
        self.timer = QTimer()
        self.timer.setInterval(10)
        self.timer.timeout.connect(lambda: self.times.append(time.perf_counter()))
        self.timer.start()

    def stop(self) -> float:
        """Stop; the longest gap between two ticks, in seconds."""
        self.timer.stop()
        gaps = [b - a for a, b in zip(self.times, self.times[1:], strict=False)]
        return max(gaps, default=float("inf"))


def titles_shown(window: MainWindow) -> list[str]:
    results = window.seeds_panel.results
    return [results._rows[r].title for r in range(results.rowCount())]


def test_search_runs_in_a_worker_while_the_window_keeps_going(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint
) -> None:
    win, panel = slow_window, slow_window.seeds_panel
    slow_endpoint.delay = 0.25  # each query: a search is several, so well over a second
    ticks = Ticks()
    started = time.perf_counter()
    panel.search("mirror of gull")
    assert time.perf_counter() - started < 0.1  # typing returns at once
    assert panel.searching and panel.search_note.text() == SEARCHING
    with qtbot.waitSignal(panel.searched, timeout=WAIT_MS):
        pass
    took = time.perf_counter() - started
    longest_gap = ticks.stop()
    assert took > 0.5  # the stand-in really was slow
    assert longest_gap < 0.2, f"the GUI thread stalled for {longest_gap:.2f} s"
    assert len(ticks.times) > took / 0.01 / 3  # the timer kept firing all along
    assert not panel.searching and panel.search_note.text() == ""
    assert MIRROR in titles_shown(win)
    # what the endpoint said is remembered for the bylines, as before
    mirror = next(r.iri for r in panel.results._rows if r.title == MIRROR)
    assert win._lines[mirror].title == MIRROR and win._lines[mirror].byline


def test_newer_typing_overtakes_a_search_under_way(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint
) -> None:
    panel = slow_window.seeds_panel
    slow_endpoint.delay = 0.15
    panel.search("thessaly")
    assert panel.searching
    panel.search("mirror of gull")
    with qtbot.waitSignal(panel.searched, timeout=WAIT_MS):
        pass
    assert MIRROR in titles_shown(slow_window) and HERON not in titles_shown(slow_window)
    qtbot.wait(600)  # the first search's answer, if any, never replaces them
    assert MIRROR in titles_shown(slow_window) and HERON not in titles_shown(slow_window)
    # Enter before the answer takes the best match once it comes
    panel.search("thessaly's heron")
    with qtbot.waitSignal(slow_window.suggestions_shown, timeout=WAIT_MS):
        panel._enter()
    assert slow_window.session.seeds and slow_window._describe(
        slow_window.session.seeds[0], ""
    ).title == HERON


def test_a_failing_or_slow_endpoint_is_said_under_the_field(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint, dialogs: Any
) -> None:
    win, panel = slow_window, slow_window.seeds_panel
    slow_endpoint.fail = True
    with qtbot.waitSignal(panel.searched, timeout=WAIT_MS):
        panel.search("mirror")
    note = panel.search_note.text()
    assert "could not be searched" in note and "HTTP 500" in note
    assert "for maintenance. Type again to retry." in note
    assert titles_shown(win) == [] and not panel.searching and panel.field.isEnabled()
    assert dialogs.shown == []  # said in place, no box in the way of typing
    # a timeout: the endpoint answers after the window has stopped waiting
    slow_endpoint.fail = False
    slow_endpoint.delay = 1.5
    assert isinstance(win.workspace, EndpointWorkspace)
    endpoint = win.workspace.endpoint
    endpoint.settings = replace(endpoint.settings, timeout=0.4)
    ticks = Ticks()
    with qtbot.waitSignal(panel.searched, timeout=WAIT_MS):
        panel.search("mirror of")
    assert ticks.stop() < 0.2
    assert "no answer within 0.4 s" in panel.search_note.text()
    # back to normal: typing again searches again
    slow_endpoint.delay = 0.0
    with qtbot.waitSignal(panel.searched, timeout=WAIT_MS):
        panel.search("mirror of gull")
    assert MIRROR in titles_shown(win) and panel.search_note.text() == ""


def test_browse_asks_the_endpoint_in_a_worker(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint, demo_workspace: Workspace
) -> None:
    browse = slow_window.browse_panel
    heron = iri_of(demo_workspace, HERON)
    slow_endpoint.delay = 0.2
    ticks = Ticks()
    started = time.perf_counter()
    browse.show_iri(heron)
    assert time.perf_counter() - started < 0.1
    assert browse.asking and ASKING in browse.page.toPlainText()
    qtbot.waitUntil(lambda: not browse.asking, timeout=WAIT_MS)
    assert ticks.stop() < 0.2
    page = browse.page.toPlainText()
    assert HERON in page and "Add to list" in page and "not links here" in page
    # back and forth again needs no question
    queries = slow_endpoint.queries
    mirror = iri_of(demo_workspace, MIRROR)
    slow_endpoint.fail = True
    browse.show_iri(mirror)
    qtbot.waitUntil(lambda: not browse.asking, timeout=WAIT_MS)
    page = browse.page.toPlainText()
    assert "could not describe" in page and "HTTP 500" in page and "Ask again" in page
    browse.back()
    assert HERON in browse.page.toPlainText() and slow_endpoint.queries == queries + 1
    slow_endpoint.fail = False
    browse.forward()
    assert browse.asking  # the failure is not remembered: asking again
    qtbot.waitUntil(lambda: not browse.asking, timeout=WAIT_MS)
    assert MIRROR in browse.page.toPlainText()


def _seed(qtbot: Any, window: MainWindow, iri: str) -> None:
    with qtbot.waitSignal(window.suggestions_shown, timeout=WAIT_MS):
        window.editor.add_seeds([iri])


def test_suggestion_progress_names_its_stages(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint, demo_workspace: Workspace
) -> None:
    win = slow_window
    stages: list[str] = []
    win.runner.progressed.connect(
        lambda stage, _f: stages.append(stage) if stages[-1:] != [stage] else None
    )
    fractions: list[float] = []
    win.runner.progressed.connect(lambda _s, f: fractions.append(f))
    slow_endpoint.delay = 0.03
    seen: list[tuple[bool, str]] = []
    messages: set[str] = set()
    probe = QTimer()
    probe.timeout.connect(
        lambda: seen.append((win.suggest_status.isVisible(), win.suggest_status.stage.text()))
    )
    probe.timeout.connect(lambda: messages.add(win.candidates_panel._message))
    probe.start(10)
    _seed(qtbot, win, iri_of(demo_workspace, MIRROR))
    probe.stop()
    named = [s for s in stages if s in SUGGESTION_STAGES]
    assert named == [s for s in SUGGESTION_STAGES if s in named]  # in order
    for stage in ("Finding the seeds", "Asking the endpoint for candidates",
                  "Describing the candidates", "Suggesting"):
        assert stage in stages
    assert set(stages) <= set(SUGGESTION_STAGES)  # the finer steps only move the bar
    assert fractions == sorted(fractions) and fractions[-1] == pytest.approx(1.0)
    assert any(visible and text in SUGGESTION_STAGES for visible, text in seen)
    assert ASKING_FOR_CANDIDATES in messages  # not "add a starting title" while it works
    assert win.suggest_status.isHidden() and len(win.candidate_model.iris()) == 20
    assert win.candidates_panel.status.text() == "20 candidates"


def test_cancel_a_suggestion_keeps_the_candidates_shown(
    qtbot: Any, slow_window: MainWindow, slow_endpoint: SlowEndpoint, demo_workspace: Workspace
) -> None:
    win = slow_window
    _seed(qtbot, win, iri_of(demo_workspace, MIRROR))
    before = win.candidate_model.iris()
    assert len(before) == 20
    slow_endpoint.delay = 0.3
    shown: list[int] = []
    win.suggestions_shown.connect(lambda: shown.append(1))
    win.editor.add_seeds([iri_of(demo_workspace, HERON)])
    qtbot.waitUntil(lambda: win.suggest_status.isVisible(), timeout=WAIT_MS)
    assert win.candidates_panel.status.text() == "Suggesting…"
    assert win.suggest_status.stage.text() == "Finding the seeds"
    qtbot.waitUntil(
        lambda: win.suggest_status.stage.text() == "Reading the seeds", timeout=WAIT_MS
    )
    queries = slow_endpoint.queries
    win.suggest_status.cancel.click()
    assert win.suggest_status.isHidden()
    assert win.candidate_model.iris() == before
    assert win.candidates_panel._message == SUGGESTION_STOPPED
    assert win.candidates_panel.status.text() == "Stopped · 20 from before your last change"
    qtbot.wait(1200)  # the worker gives up at its next query; its answer is never shown
    assert win.candidate_model.iris() == before and shown == []
    assert slow_endpoint.queries - queries <= 2
    # a newer change suggests again, as before
    slow_endpoint.delay = 0.0
    with qtbot.waitSignal(win.suggestions_shown, timeout=WAIT_MS):
        win.editor.remove_seed(iri_of(demo_workspace, HERON))
    assert win.candidate_model.iris() == before
    assert win.candidates_panel._message != SUGGESTION_STOPPED
    assert win.candidates_panel.status.text() == "20 candidates"


def test_search_and_details_check_their_progress(slow_endpoint: SlowEndpoint) -> None:
    """The service side: a search reports its steps, and a cancelled one stops before asking
    anything more (what lets the window give up a search overtaken by typing)."""
    service = open_endpoint(slow_endpoint.url, languages=("en",))
    steps: list[str] = []
    found = service.search("mirror of gull", 5, Progress(callback=lambda s, _f: steps.append(s)))
    assert found[0][1].label == MIRROR
    assert steps[0] == "Searching the titles" and "Describing the matches" in steps
    token = CancelToken()
    token.cancel()
    queries = slow_endpoint.queries
    with pytest.raises(Cancelled):
        service.search("mirror of gull", 5, Progress(token=token))
    with pytest.raises(Cancelled):
        service.details(found[0][1].iri, Progress(token=token))
    assert slow_endpoint.queries - queries <= 1  # at most the details' first question

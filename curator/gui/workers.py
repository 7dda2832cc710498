"""Work that must not freeze the window: opening a catalogue, and computing suggestions.

Both run the services in a QThread and hand results back by queued signals. The loader copies
nothing back until it has a whole workspace, so a failed or cancelled load leaves the window on
the catalogue it had. The suggester numbers every request and drops any answer that is not the
latest, so a quick series of edits shows only the result of the last one.
"""

from __future__ import annotations

import contextlib
import logging
import time
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QObject, Qt, QThread, Signal, Slot

from curator.core.errors import Cancelled, CuratorError
from curator.core.progress import CancelToken, Progress
from curator.core.session import Session
from curator.gui.describe import CandidateRow, candidate_row
from curator.services.sessions import SessionSuggestions, suggest_for_session
from curator.services.workspace import Workspace, open_catalogue

log = logging.getLogger(__name__)

#: How many candidates the window asks for.
CANDIDATE_LIMIT = 20


def snapshot(session: Session) -> Session:
    """A copy of what suggestions depend on, safe to read in another thread (no watchers)."""
    return Session(
        title=session.title,
        seeds=list(session.seeds),
        entries=list(session.entries),
        dismissed=list(session.dismissed),
        settings=session.settings,
    )


@dataclass(frozen=True)
class LoadRequest:
    paths: tuple[str, ...]  # empty: the demo collection
    languages: tuple[str, ...] | None = None


def _warm_up(workspace: Workspace) -> None:
    """Suggest once for the first work, so the curator's first suggestion is not the slow one
    (numpy and scipy set up their kernels and caches on first use)."""
    if workspace.index.records:
        first = workspace.index.records[0].iri
        with contextlib.suppress(CuratorError):
            suggest_for_session(workspace, Session(seeds=[first]), CANDIDATE_LIMIT)


class _LoadJob(QObject):
    progressed = Signal(str, float)
    loaded = Signal(object, tuple)
    failed = Signal(str)
    cancelled = Signal()
    done = Signal()

    def __init__(self, request: LoadRequest, token: CancelToken) -> None:
        super().__init__()
        self._request = request
        self._token = token

    @Slot()
    def run(self) -> None:
        progress = Progress(callback=self.progressed.emit, token=self._token)
        try:
            workspace = open_catalogue(
                [Path(p) for p in self._request.paths] or None,
                languages=self._request.languages,
                progress=progress,
            )
        except Cancelled:
            self.cancelled.emit()
        except CuratorError as exc:
            self.failed.emit(str(exc))
        except Exception as exc:  # a bug, not bad input: say so plainly, log the details
            log.exception("opening a catalogue failed")
            self.failed.emit(f"curator could not open it because of an internal error ({exc}).")
        else:
            _warm_up(workspace)
            self.loaded.emit(workspace, self._request.paths)
        finally:
            self.done.emit()


class CatalogueLoader(QObject):
    """Opens one catalogue at a time in a worker thread; progress and cancel on the way."""

    started = Signal()
    progressed = Signal(str, float)
    loaded = Signal(object, tuple)  # Workspace, the paths asked for
    failed = Signal(str)
    cancelled = Signal()
    finished = Signal()

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._thread: QThread | None = None
        self._job: _LoadJob | None = None
        self._token: CancelToken | None = None

    @property
    def busy(self) -> bool:
        return self._thread is not None

    def start(self, paths: Sequence[str], languages: Sequence[str] | None = None) -> bool:
        """Begin loading; False if a load is already running (cancel it first)."""
        if self.busy:
            return False
        request = LoadRequest(tuple(str(p) for p in paths), tuple(languages) if languages else None)
        self._token = CancelToken()
        thread = QThread()
        thread.setObjectName("catalogue-loader")
        job = _LoadJob(request, self._token)
        job.moveToThread(thread)
        thread.started.connect(job.run)
        job.progressed.connect(self.progressed)
        job.loaded.connect(self.loaded)
        job.failed.connect(self.failed)
        job.cancelled.connect(self.cancelled)
        # Direct: quit from the worker itself, so stop() can wait without a queued event.
        job.done.connect(thread.quit, Qt.ConnectionType.DirectConnection)
        thread.finished.connect(self._cleanup)
        self._thread, self._job = thread, job
        self.started.emit()
        thread.start()
        return True

    def cancel(self) -> None:
        if self._token is not None:
            self._token.cancel()

    @Slot()
    def _cleanup(self) -> None:
        thread, job = self._thread, self._job
        self._thread = self._job = self._token = None
        if job is not None:
            job.deleteLater()
        if thread is not None:
            thread.deleteLater()
        self.finished.emit()

    def stop(self) -> None:
        """Cancel and wait: called on quit so no thread outlives the window."""
        if self._thread is not None:
            self.cancel()
            self._thread.wait()


@dataclass(frozen=True)
class SuggestionAnswer:
    generation: int
    suggestions: SessionSuggestions | None
    rows: tuple[CandidateRow, ...]
    error: str | None
    seconds: float


class _SuggestJob(QObject):
    answered = Signal(object)

    def __init__(self, owner: SuggestionRunner) -> None:
        super().__init__()
        self._owner = owner

    @Slot(int, object, object)
    def compute(self, generation: int, workspace: Workspace, session: Session) -> None:
        if generation != self._owner.latest:
            return  # a newer request is queued behind this one
        started = time.perf_counter()
        found: SessionSuggestions | None = None
        rows: tuple[CandidateRow, ...] = ()
        error: str | None = None
        try:
            found = suggest_for_session(workspace, session, CANDIDATE_LIMIT)
            suggestions = found.result.suggestions if found.result else ()
            rows = tuple(candidate_row(workspace, s) for s in suggestions)
        except CuratorError as exc:
            error = str(exc)
        except Exception as exc:
            log.exception("suggesting failed")
            error = f"Internal error while suggesting: {exc}"
        seconds = time.perf_counter() - started
        self.answered.emit(SuggestionAnswer(generation, found, rows, error, seconds))


class SuggestionRunner(QObject):
    """Computes suggestions in one long-lived thread; only the newest request is answered."""

    _request = Signal(int, object, object)
    ready = Signal(object)  # SuggestionAnswer

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.latest = 0
        self._thread = QThread()
        self._thread.setObjectName("suggestions")
        self._job = _SuggestJob(self)
        self._job.moveToThread(self._thread)
        self._request.connect(self._job.compute)
        self._job.answered.connect(self._on_answer)
        self._thread.finished.connect(self._job.deleteLater)
        self._thread.start()

    def request(self, workspace: Workspace, session: Session) -> int:
        """Ask for suggestions for a snapshot of ``session``; returns the request's number."""
        self.latest += 1
        self._request.emit(self.latest, workspace, snapshot(session))
        return self.latest

    def invalidate(self) -> None:
        """Forget requests in flight (the catalogue or session was replaced)."""
        self.latest += 1

    @Slot(object)
    def _on_answer(self, answer: SuggestionAnswer) -> None:
        if answer.generation == self.latest:
            self.ready.emit(answer)

    def stop(self) -> None:
        self.invalidate()
        self._thread.quit()
        self._thread.wait()

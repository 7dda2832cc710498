"""Work that must not freeze the window: opening a catalogue, suggestions, the balance, exports.

All run the services in a QThread and hand results back by queued signals. The loader copies
nothing back until it has a whole workspace, so a failed or cancelled load leaves the window on
the catalogue it had. The suggester, the balance and the endpoint's questions (title searches,
a work's description) number every request and drop any answer that is not the latest, so a
quick series of edits or keys shows only the result of the last one.
"""

from __future__ import annotations

import contextlib
import logging
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import cast

from PySide6.QtCore import QObject, Qt, QThread, Signal, Slot

from curator.core.errors import Cancelled, CuratorError
from curator.core.progress import CancelToken, Progress
from curator.core.session import Session
from curator.gui.balance import BalanceReport, ChartStyle, compute_balance
from curator.gui.describe import (
    CandidateRow,
    CatalogueChoices,
    WorkLine,
    candidate_row,
    endpoint_choices,
    lines_of,
    summary_in,
)
from curator.services.browse import WorkSummary
from curator.services.endpoint import EndpointWorkspace, open_endpoint
from curator.services.sessions import SessionSuggestions, catalogue_for_list, suggest_for_session
from curator.services.workspace import Workspace, open_catalogue

#: What the window can have open: catalogue files, or a SPARQL endpoint.
Opened = Workspace | EndpointWorkspace

log = logging.getLogger(__name__)

#: How many candidates the window asks for.
CANDIDATE_LIMIT = 20
#: The stages of a suggestion on an endpoint that the window names; the finer steps inside
#: them (describing, labelling, indexing) only move the bar.
SUGGESTION_STAGES = (
    "Finding the seeds",
    "Reading the seeds",
    "Asking the endpoint for candidates",
    "Describing the candidates",
    "Suggesting",
)


def snapshot(session: Session) -> Session:
    """A copy of the session, safe to read in another thread (no watchers)."""
    return session.snapshot()


@dataclass(frozen=True)
class LoadRequest:
    paths: tuple[str, ...]  # empty: the demo collection
    languages: tuple[str, ...] | None = None
    endpoint: str | None = None  # a SPARQL endpoint's query URL instead of the paths
    timeout: float = 30.0  # longest wait for one answer of the endpoint


@dataclass(frozen=True)
class EndpointOpened:
    """An endpoint ready for the window, with what its controls offer (asked in the worker:
    it takes queries)."""

    workspace: EndpointWorkspace
    choices: CatalogueChoices


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
        request = self._request
        opened: Workspace | EndpointOpened
        try:
            if request.endpoint is not None:
                remote = open_endpoint(
                    request.endpoint,
                    languages=request.languages,
                    timeout=request.timeout,
                    use_disk_cache=True,
                    progress=progress,
                )
                progress.check()
                opened = EndpointOpened(remote, endpoint_choices(remote))
                progress.check()
            else:
                opened = open_catalogue(
                    [Path(p) for p in request.paths] or None,
                    languages=request.languages,
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
            if isinstance(opened, Workspace):
                _warm_up(opened)
            where = (request.endpoint,) if request.endpoint is not None else request.paths
            self.loaded.emit(opened, where)
        finally:
            self.done.emit()


class CatalogueLoader(QObject):
    """Opens one catalogue at a time in a worker thread; progress and cancel on the way."""

    started = Signal()
    progressed = Signal(str, float)
    loaded = Signal(object, tuple)  # Workspace or EndpointOpened, the paths or URL asked for
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

    def start(
        self,
        paths: Sequence[str],
        languages: Sequence[str] | None = None,
        *,
        endpoint: str | None = None,
        timeout: float = 30.0,
    ) -> bool:
        """Begin loading ``paths``, or connecting to ``endpoint`` (a query URL); False if a
        load is already running (cancel it first)."""
        if self.busy:
            return False
        request = LoadRequest(
            tuple(str(p) for p in paths),
            tuple(languages) if languages else None,
            endpoint,
            timeout,
        )
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
    #: On an endpoint: what it said about the session's works (the window remembers them).
    lines: dict[str, WorkLine] | None = None


class _StaleToken(CancelToken):
    """Cancelled as soon as a newer request is waiting, so a slow endpoint question is given
    up rather than answered for nobody."""

    def __init__(self, stale: Stale) -> None:
        super().__init__()
        self._stale = stale

    @property
    def cancelled(self) -> bool:
        return self._stale()


@dataclass(frozen=True)
class BalanceAnswer:
    generation: int
    report: BalanceReport | None
    error: str | None


Stale = Callable[[], bool]


class _NewestJob(QObject):
    """Lives in the runner's thread; skips any request that a newer one has overtaken."""

    answered = Signal(object)

    def __init__(self, owner: NewestOnlyRunner) -> None:
        super().__init__()
        self._owner = owner

    @Slot(int, tuple)
    def compute(self, generation: int, args: tuple[object, ...]) -> None:
        if generation != self._owner.latest:
            return  # a newer request is queued behind this one
        answer = self._owner.work(generation, lambda: generation != self._owner.latest, *args)
        self.answered.emit(answer)


class NewestOnlyRunner(QObject):
    """Computes in one long-lived thread; only the answer to the newest request is passed on.

    Subclasses say what ``work`` does; it runs in the thread and is given a ``stale`` check so
    that long work (drawing charts) can give up early when a newer request is waiting.
    """

    _request = Signal(int, tuple)
    ready = Signal(object)

    def __init__(self, name: str, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.latest = 0
        self._thread = QThread()
        self._thread.setObjectName(name)
        self._job = _NewestJob(self)
        self._job.moveToThread(self._thread)
        self._request.connect(self._job.compute)
        self._job.answered.connect(self._on_answer)
        self._thread.finished.connect(self._job.deleteLater)
        self._thread.start()

    def work(self, generation: int, stale: Stale, *args: object) -> object:
        """Compute an answer in the worker thread; each kind of worker defines its own."""
        raise TypeError(f"{type(self).__name__} defines no work(); it cannot answer requests")

    def _ask(self, *args: object) -> int:
        self.latest += 1
        self._request.emit(self.latest, args)
        return self.latest

    def invalidate(self) -> None:
        """Forget requests in flight (the catalogue or session was replaced)."""
        self.latest += 1

    @Slot(object)
    def _on_answer(self, answer: SuggestionAnswer | BalanceAnswer | AskAnswer) -> None:
        if answer.generation == self.latest:
            self.ready.emit(answer)

    def stop(self) -> None:
        self.invalidate()
        self._thread.quit()
        self._thread.wait()


class SuggestionRunner(NewestOnlyRunner):
    """Suggestions for the session; ``ready`` carries a :class:`SuggestionAnswer`.

    ``progressed`` reports the stage and fraction of the newest request (on an endpoint a
    suggestion takes seconds; embedded ones report nothing worth showing).
    """

    progressed = Signal(str, float)
    #: From the worker thread: (request number, stage, fraction).
    _progress = Signal(int, str, float)

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__("suggestions", parent)
        self._progress.connect(self._on_progress)

    def request(self, workspace: Opened, session: Session) -> int:
        """Ask for suggestions for a snapshot of ``session``; returns the request's number."""
        return self._ask(workspace, snapshot(session))

    def cancel(self) -> None:
        """Stop the suggestion under way: its answer will be dropped, and the worker gives up
        at its next query (a query already sent is waited for in the background)."""
        self.invalidate()

    @Slot(int, str, float)
    def _on_progress(self, generation: int, stage: str, fraction: float) -> None:
        if generation == self.latest:
            self.progressed.emit(stage, fraction)

    def _reporter(self, generation: int, stale: Stale) -> Progress:
        """A reporter naming only the suggestion's own stages, cancelled once overtaken."""
        shown = [SUGGESTION_STAGES[0]]

        def report(stage: str, fraction: float) -> None:
            if stage in SUGGESTION_STAGES:
                shown[0] = stage
            self._progress.emit(generation, shown[0], fraction)

        return Progress(callback=report, token=_StaleToken(stale))

    def work(self, generation: int, stale: Stale, *args: object) -> SuggestionAnswer:
        workspace, session = args
        assert isinstance(workspace, Opened) and isinstance(session, Session)
        started = time.perf_counter()
        found: SessionSuggestions | None = None
        rows: tuple[CandidateRow, ...] = ()
        error: str | None = None
        lines: dict[str, WorkLine] | None = None
        try:
            progress = self._reporter(generation, stale)
            found = suggest_for_session(workspace, session, CANDIDATE_LIMIT, progress)
            suggestions = found.result.suggestions if found.result else ()
            rows = tuple(candidate_row(workspace, s) for s in suggestions)
            if isinstance(workspace, EndpointWorkspace):
                iris = [*session.seeds, *session.entry_iris, *session.dismissed]
                lines = lines_of(workspace.index, iris)
        except Cancelled:
            error = "Stopped: a newer question was asked."  # stale: never shown
        except CuratorError as exc:
            error = str(exc)
        except Exception as exc:
            log.exception("suggesting failed")
            error = f"Internal error while suggesting: {exc}"
        seconds = time.perf_counter() - started
        return SuggestionAnswer(generation, found, rows, error, seconds, lines)


class BalanceRunner(NewestOnlyRunner):
    """The list's audit, targets and charts; ``ready`` carries a :class:`BalanceAnswer`.

    Drawing the charts takes matplotlib about half a second (its constrained layout measures
    every label), far too long for the GUI thread, so the figure is drawn here and the window
    only copies the finished pixels to the screen.
    """

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__("balance", parent)

    def request(self, workspace: Opened, session: Session, style: ChartStyle | None) -> int:
        """Audit a snapshot of ``session``; draw charts in ``style`` (None: no charts)."""
        return self._ask(workspace, snapshot(session), style)

    def work(self, generation: int, stale: Stale, *args: object) -> BalanceAnswer:
        workspace, session, style = args
        assert isinstance(workspace, Opened) and isinstance(session, Session)
        assert style is None or isinstance(style, ChartStyle)
        try:
            # On an endpoint the list's own works are described for the audit (it reads
            # nothing else of the catalogue).
            catalogue = cast(Workspace, catalogue_for_list(workspace, session))
            report = compute_balance(catalogue, session, style, stale)
        except CuratorError as exc:
            return BalanceAnswer(generation, None, str(exc))
        except Exception as exc:
            log.exception("auditing the list failed")
            return BalanceAnswer(generation, None, f"Internal error while auditing: {exc}")
        return BalanceAnswer(generation, report, None)


@dataclass(frozen=True)
class AskAnswer:
    """What one question to the endpoint came back with: a value, or the error to say."""

    generation: int
    value: object
    error: str | None


Question = Callable[[Progress], object]


class AskRunner(NewestOnlyRunner):
    """Asks the endpoint one question at a time off the GUI thread (a title search, a work's
    description), so a slow endpoint never freezes the window; a question overtaken by a
    newer one is given up at its next query and its answer dropped. ``ready`` carries an
    :class:`AskAnswer`."""

    def __init__(self, name: str, parent: QObject | None = None) -> None:
        super().__init__(name, parent)
        self._name = name

    def request(self, question: Question) -> int:
        """Run ``question`` (given a reporter to check) in the worker; returns its number."""
        return self._ask(question)

    def work(self, generation: int, stale: Stale, *args: object) -> AskAnswer:
        (question,) = args
        assert callable(question)
        try:
            value = question(Progress(token=_StaleToken(stale)))
        except Cancelled:
            return AskAnswer(generation, None, "Stopped: a newer question was asked.")
        except CuratorError as exc:
            return AskAnswer(generation, None, str(exc))
        except Exception as exc:
            log.exception("%s failed", self._name)
            return AskAnswer(generation, None, f"Internal error: {exc}")
        return AskAnswer(generation, value, None)


@dataclass(frozen=True)
class SearchFound:
    """Titles an endpoint found for ``text``, with what it said about each (for bylines)."""

    text: str
    summaries: tuple[WorkSummary, ...]
    lines: dict[str, WorkLine]


def search_endpoint(
    workspace: EndpointWorkspace, text: str, limit: int, progress: Progress
) -> SearchFound:
    """Title search through the endpoint (a few queries: run it in an :class:`AskRunner`)."""
    found, index = workspace.search_labelled(text, limit, progress)
    if index is None:
        return SearchFound(text, (), {})
    summaries = tuple(summary_in(index, record) for _match, record in found)
    lines = {
        s.iri: WorkLine(
            s.iri,
            s.title,
            " · ".join(p for p in (s.creators, str(s.year or ""), s.kind) if p),
        )
        for s in summaries
    }
    return SearchFound(text, summaries, lines)


class _Task(QObject):
    done = Signal(object)
    failed = Signal(str)
    over = Signal()

    def __init__(self, work: Callable[[], object], what: str) -> None:
        super().__init__()
        self._work = work
        self._what = what

    @Slot()
    def run(self) -> None:
        try:
            result = self._work()
        except CuratorError as exc:
            self.failed.emit(str(exc))
        except Exception as exc:  # a bug, not bad input: say so plainly, log the details
            log.exception("%s failed", self._what)
            self.failed.emit(f"curator could not finish {self._what} (an internal error: {exc}).")
        else:
            self.done.emit(result)
        finally:
            self.over.emit()


class TaskRunner(QObject):
    """Runs one function at a time in its own thread (writing an export, reading a list).

    ``done`` carries the function's result; ``failed`` a CuratorError's message (or a plain
    sentence about an internal error), never a traceback. Both come after the thread has
    ended, so a handler may start the next task straight away.
    """

    done = Signal(object)
    failed = Signal(str)

    def __init__(self, what: str, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._what = what
        self._thread: QThread | None = None
        self._task: _Task | None = None
        self._outcome: tuple[bool, object] | None = None

    @property
    def busy(self) -> bool:
        return self._thread is not None

    def start(self, work: Callable[[], object]) -> bool:
        """Run ``work`` in the background; False while an earlier task is still running."""
        if self.busy:
            return False
        thread = QThread()
        thread.setObjectName(self._what)
        task = _Task(work, self._what)
        task.moveToThread(thread)
        thread.started.connect(task.run)
        task.done.connect(self._succeeded)
        task.failed.connect(self._failed)
        task.over.connect(thread.quit, Qt.ConnectionType.DirectConnection)
        thread.finished.connect(self._cleanup)
        self._thread, self._task, self._outcome = thread, task, None
        thread.start()
        return True

    # Queued to this object's thread, so they arrive before the thread's ``finished``.
    @Slot(object)
    def _succeeded(self, result: object) -> None:
        self._outcome = (True, result)

    @Slot(str)
    def _failed(self, message: str) -> None:
        self._outcome = (False, message)

    @Slot()
    def _cleanup(self) -> None:
        thread, task, outcome = self._thread, self._task, self._outcome
        self._thread = self._task = self._outcome = None
        if task is not None:
            task.deleteLater()
        if thread is not None:
            thread.deleteLater()
        if outcome is not None:
            ok, value = outcome
            if ok:
                self.done.emit(value)
            else:
                self.failed.emit(str(value))

    def stop(self) -> None:
        """Wait for the running task (tasks are short and cannot be cancelled halfway); its
        result is dropped."""
        thread, task = self._thread, self._task
        if thread is not None:
            thread.finished.disconnect(self._cleanup)
            if task is not None:
                task.done.disconnect(self._succeeded)
                task.failed.disconnect(self._failed)
            thread.wait()
            self._thread = self._task = self._outcome = None
            thread.deleteLater()

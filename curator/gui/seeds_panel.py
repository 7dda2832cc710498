"""The left column's top: find titles as you type and keep the starting titles.

Searching goes through the browse service (accent- and case-insensitive, near misses too), and
results pop up under the field with creator and year so that namesakes can be told apart. On an
endpoint a search is a few queries, so the panel only asks (``search_wanted``) and the window
answers from a worker; a quiet line under the field says a search is under way, or why it
failed.
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtCore import QModelIndex, Qt, QTimer, Signal
from PySide6.QtGui import QAction, QKeySequence, QPalette
from PySide6.QtWidgets import (
    QAbstractItemView,
    QCompleter,
    QLineEdit,
    QListView,
    QVBoxLayout,
    QWidget,
)

from curator.gui.delegates import SeedDelegate
from curator.gui.models import Role, SeedModel, WorkSearchModel
from curator.gui.style import heading, quiet
from curator.services.browse import WorkSummary

Search = Callable[[str, int], list[WorkSummary]]

#: How many matches the popup offers.
SEARCH_LIMIT = 12
#: Typing waits this long before searching (in the open catalogue's own index).
SEARCH_DELAY_MS = 30
SEARCHING = "Searching the endpoint…"


class StartingTitlesPanel(QWidget):
    """Emits ``seed_chosen`` for a picked search result, ``remove_requested`` for a ×.

    With an asked search, ``search_wanted`` carries the typed text ("" when the field was
    cleared: drop the search under way) and the window answers with :meth:`show_results` or
    :meth:`show_search_failed`. ``searched`` follows whenever results are in the popup.
    """

    seed_chosen = Signal(str)
    remove_requested = Signal(str)
    work_selected = Signal(str)
    search_wanted = Signal(str)
    searched = Signal()

    def __init__(self, model: SeedModel, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._search: Search | None = None
        self._asked = False
        #: The text of the asked search under way, and of the results in the popup.
        self._asking: str | None = None
        self._shown: str | None = None
        #: Enter was pressed before the results came: take the best one when they do.
        self._take_first = False
        self.results = WorkSearchModel(self)

        self.field = QLineEdit()
        self.field.setPlaceholderText("Type a title to add it…")
        self.field.setClearButtonEnabled(True)
        self.field.setToolTip(
            "Find a work by its title (accents and case do not matter); Enter adds it"
        )
        self.field.setAccessibleName("Find a starting title")
        title = heading("Starting &titles")
        title.setBuddy(self.field)

        self.completer = QCompleter(self.results, self)
        self.completer.setCompletionMode(QCompleter.CompletionMode.UnfilteredPopupCompletion)
        self.completer.setCaseSensitivity(Qt.CaseSensitivity.CaseInsensitive)
        self.completer.setMaxVisibleItems(SEARCH_LIMIT)
        self.completer.setWidget(self.field)
        self.completer.activated[QModelIndex].connect(self._picked)  # type: ignore[index]

        self.view = QListView()
        self.view.setModel(model)
        self.delegate = SeedDelegate(self.view)
        self.view.setItemDelegate(self.delegate)
        self.view.setMouseTracking(True)
        self.view.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.view.setDragDropMode(QAbstractItemView.DragDropMode.DropOnly)
        self.view.setAcceptDrops(True)
        self.view.setDropIndicatorShown(True)
        self.view.setAccessibleName("Starting titles")
        self.view.setToolTip("Drop a candidate or list entry here to start from it too")
        self.delegate.remove_clicked.connect(self._remove_index)
        self.view.selectionModel().currentChanged.connect(self._current)
        self.view.clicked.connect(self._current)

        self.remove_action = QAction("Remove starting title", self.view)
        self.remove_action.setShortcut(QKeySequence.StandardKey.Delete)
        self.remove_action.setShortcutContext(Qt.ShortcutContext.WidgetShortcut)
        self.remove_action.triggered.connect(self._remove_current)
        self.view.addAction(self.remove_action)

        self.hint = quiet()
        # Under the field while searching an endpoint: its line is kept, so the titles below
        # do not jump at every key.
        self.search_note = quiet()
        self.search_note.setAccessibleName("Title search")
        self.search_note.setMinimumHeight(self.search_note.fontMetrics().height())
        self.search_note.setVisible(False)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(title)
        layout.addWidget(self.field)
        layout.addWidget(self.search_note)
        layout.addWidget(self.view, 1)
        layout.addWidget(self.hint)

        self._debounce = QTimer(self)
        self._debounce.setSingleShot(True)
        self._debounce.setInterval(SEARCH_DELAY_MS)
        self._debounce.timeout.connect(self._run_search)
        self.field.textEdited.connect(lambda _t: self._debounce.start())
        self.field.returnPressed.connect(self._enter)
        model.modelReset.connect(self._update_hint)
        self._update_hint()

    def set_search(self, search: Search | None, *, delay_ms: int = SEARCH_DELAY_MS) -> None:
        """Search this catalogue from now on (None while none is open), ``delay_ms`` after the
        last key; ``search`` answers at once (the open catalogue's own index)."""
        self._search, self._asked = search, False
        self._reset(delay_ms, enabled=search is not None)
        self.search_note.setVisible(False)

    def set_asked_search(self, *, delay_ms: int) -> None:
        """Search by asking from now on (an endpoint: each search is a few queries, run in a
        worker by the window), ``delay_ms`` after the last key."""
        self._search, self._asked = None, True
        self._reset(delay_ms, enabled=True)
        self.search_note.setVisible(True)

    def _reset(self, delay_ms: int, *, enabled: bool) -> None:
        self._debounce.setInterval(delay_ms)
        self.field.setEnabled(enabled)
        self._asking = self._shown = None
        self._take_first = False
        self._note("")
        self.results.set_results([])

    @property
    def searching(self) -> bool:
        """An asked search is under way."""
        return self._asking is not None

    def search(self, text: str) -> None:
        """Search for ``text`` as if typed (also used by tests; an asked search answers
        later, with ``searched``)."""
        self.field.setText(text)
        self._run_search()

    def _run_search(self) -> None:
        self._debounce.stop()
        text = self.field.text().strip()
        if not text or (self._search is None and not self._asked):
            self._show("", [])
            self.completer.popup().hide()
            if self._asked:
                self._asking = None
                self._take_first = False
                self._note("")
                self.search_wanted.emit("")
            return
        if self._asked:
            if text in (self._asking, self._shown):
                return  # asked already, or its results are in the popup
            # The popup's matches are for older text: Enter must not pick one of them.
            self._show("", [])
            self.completer.popup().hide()
            self._asking = text
            self._note(SEARCHING)
            self.search_wanted.emit(text)
            return
        assert self._search is not None
        self._show(text, self._search(text, SEARCH_LIMIT))

    def show_results(self, text: str, results: list[WorkSummary]) -> None:
        """The answer to the asked search for ``text`` (ignored if the field has moved on)."""
        if not self._asked or text != self._asking:
            return
        self._asking = None
        self._note("" if results else f"No title at the endpoint matches “{text}”.")
        self._show(text, results)
        if self._take_first:
            self._take_first = False
            self.choose_result(0)

    def show_search_failed(self, text: str, message: str) -> None:
        """The asked search for ``text`` failed (the endpoint is down, slow or refused it)."""
        if not self._asked or text != self._asking:
            return
        self._asking = None
        self._take_first = False
        self._show("", [])
        self.completer.popup().hide()
        message = message.strip()
        if message and message[-1] not in ".!?":
            message += "."
        self._note(f"The endpoint could not be searched: {message} Type again to retry.", True)
        self.searched.emit()

    def _note(self, text: str, problem: bool = False) -> None:
        self.search_note.setText(text)
        self.search_note.setForegroundRole(
            QPalette.ColorRole.WindowText if problem else QPalette.ColorRole.PlaceholderText
        )

    def _show(self, text: str, results: list[WorkSummary]) -> None:
        self._shown = text or None
        self.results.set_results(results)
        if text:
            if self.results.rowCount() and self.field.hasFocus():
                self.completer.complete()
                self.completer.popup().setCurrentIndex(self.results.index(0))
            self.searched.emit()

    def _picked(self, index: QModelIndex) -> None:
        iri = self.results.iri_at(index.row())
        if iri:
            self._choose(iri)

    def _enter(self) -> None:
        """Enter with the popup closed takes the best match."""
        if self.completer.popup().isVisible():
            return
        if self._asked:
            text = self.field.text().strip()
            if text and text == self._shown:
                self.choose_result(0)
            elif text:
                self._take_first = True
                self._run_search()
            return
        self._run_search()
        iri = self.results.iri_at(0)
        if iri:
            self._choose(iri)

    def choose_result(self, row: int) -> None:
        iri = self.results.iri_at(row)
        if iri:
            self._choose(iri)

    def _choose(self, iri: str) -> None:
        self.completer.popup().hide()
        self.seed_chosen.emit(iri)
        # The completer writes the chosen line into the field after this returns; clear later.
        QTimer.singleShot(0, self.field.clear)
        self._show("", [])
        if self._asked:
            self._note("")

    def _remove_index(self, index: QModelIndex) -> None:
        iri = index.data(Role.Iri)
        if iri:
            self.remove_requested.emit(str(iri))

    def _remove_current(self) -> None:
        index = self.view.currentIndex()
        if index.isValid():
            self._remove_index(index)

    def _current(self, index: QModelIndex, _previous: QModelIndex | None = None) -> None:
        iri = index.data(Role.Iri) if index.isValid() else None
        if iri:
            self.work_selected.emit(str(iri))

    def _update_hint(self) -> None:
        count = self.view.model().rowCount()
        self.hint.setVisible(count < 2)
        self.hint.setText(
            "Add a title that sums up the theme; candidates appear as soon as there is one."
            if count == 0
            else "Add another title or two to sharpen the theme."
        )

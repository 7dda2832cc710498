"""The left column's top: find titles as you type and keep the starting titles.

Searching goes through the browse service (accent- and case-insensitive, near misses too), and
results pop up under the field with creator and year so that namesakes can be told apart.
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtCore import QModelIndex, Qt, QTimer, Signal
from PySide6.QtGui import QAction, QKeySequence
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


class StartingTitlesPanel(QWidget):
    """Emits ``seed_chosen`` for a picked search result, ``remove_requested`` for a ×."""

    seed_chosen = Signal(str)
    remove_requested = Signal(str)
    work_selected = Signal(str)

    def __init__(self, model: SeedModel, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._search: Search | None = None
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

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(title)
        layout.addWidget(self.field)
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
        last key (longer for an endpoint, where each search is a few queries)."""
        self._search = search
        self._debounce.setInterval(delay_ms)
        self.field.setEnabled(search is not None)
        self.results.set_results([])

    def search(self, text: str) -> None:
        """Fill the popup with the works matching ``text`` (also used by tests)."""
        self.field.setText(text)
        self._run_search()

    def _run_search(self) -> None:
        text = self.field.text().strip()
        if self._search is None or not text:
            self.results.set_results([])
            self.completer.popup().hide()
            return
        self.results.set_results(self._search(text, SEARCH_LIMIT))
        if self.results.rowCount() and self.field.hasFocus():
            self.completer.complete()
            self.completer.popup().setCurrentIndex(self.results.index(0))

    def _picked(self, index: QModelIndex) -> None:
        iri = self.results.iri_at(index.row())
        if iri:
            self._choose(iri)

    def _enter(self) -> None:
        """Enter with the popup closed takes the best match."""
        if self.completer.popup().isVisible():
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
        self.results.set_results([])

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

"""The centre column: the controls, the candidates, and why the chosen one is there.

The panel only shows and asks: accepting, dismissing and seeding are signals the window turns
into undoable edits. After each refresh it keeps the same work selected, or, when that work has
just gone onto the list, the one that took its place, so Enter can be pressed again and again.
"""

from __future__ import annotations

import html

from PySide6.QtCore import QItemSelectionModel, QModelIndex, Qt, Signal
from PySide6.QtGui import QAction, QKeySequence
from PySide6.QtWidgets import (
    QAbstractItemView,
    QHBoxLayout,
    QListView,
    QSizePolicy,
    QTextBrowser,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from curator.gui.controls import SuggestionControls
from curator.gui.delegates import CandidateDelegate
from curator.gui.describe import CandidateRow
from curator.gui.models import CandidateModel, Role
from curator.gui.style import QuietLine, heading, quiet

#: Lines of text the explanation area shows without scrolling.
EXPLANATION_LINES = 7


def explanation_html(row: CandidateRow) -> str:
    """The selected candidate, its one-sentence rationale, connection and shared themes."""
    parts = [
        f"<p style='margin:0'><b>{html.escape(row.line.title)}</b>"
        f" &nbsp;{html.escape(row.line.byline)}</p>",
        f"<p style='margin:4px 0 0 0'>{html.escape(row.rationale)}</p>",
    ]
    details = []
    if row.path:
        details.append(f"Connection: {html.escape(row.path)}.")
    if row.tags:
        by_property: dict[str, list[str]] = {}
        for tag in row.tags:
            name = tag.property_label + (", broader" if tag.broader else "")
            by_property.setdefault(name, []).append(html.escape(tag.label))
        shared = "; ".join(
            f"{', '.join(labels)} <i>({html.escape(name)})</i>"
            for name, labels in by_property.items()
        )
        details.append(f"Shares {shared}.")
    if details:
        parts.append("<p style='margin:4px 0 0 0'>" + " ".join(details) + "</p>")
    return "".join(parts)


def _button(action: QAction) -> QToolButton:
    button = QToolButton()
    button.setDefaultAction(action)
    button.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextOnly)
    button.setAutoRaise(False)
    return button


class CandidatesPanel(QWidget):
    """Emits lists of IRIs for accept, dismiss and seed; ``work_selected`` for browsing."""

    accept_requested = Signal(list)
    dismiss_requested = Signal(list)
    seed_requested = Signal(list)
    work_selected = Signal(str)

    def __init__(self, model: CandidateModel, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.model = model
        self._remembered: tuple[str | None, int] = (None, -1)
        self._message = ""

        self.controls = SuggestionControls()
        self.view = QListView()
        self.view.setModel(model)
        self.view.setSelectionMode(QAbstractItemView.SelectionMode.ExtendedSelection)
        self.view.setDragDropMode(QAbstractItemView.DragDropMode.DragOnly)
        self.view.setDefaultDropAction(Qt.DropAction.CopyAction)
        self.view.setMouseTracking(True)
        self.view.setVerticalScrollMode(QAbstractItemView.ScrollMode.ScrollPerPixel)
        self.view.setAccessibleName("Candidates")
        self.view.setItemDelegate(CandidateDelegate(self.view))
        title = heading("&Candidates")
        title.setBuddy(self.view)
        self.status = quiet()
        self.status.setWordWrap(False)
        self.status.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)

        # Which gaps "Fill the gaps" aims at: one quiet line under the controls while it is on.
        self.gaps_note = QuietLine()
        self.gaps_note.setAccessibleName("Gaps being filled")
        self.gaps_note.setVisible(False)

        self.explanation = QTextBrowser()
        self.explanation.setOpenLinks(False)
        self.explanation.setFocusPolicy(Qt.FocusPolicy.ClickFocus)
        self.explanation.setAccessibleName("Why this candidate")
        self.explanation.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Fixed)
        lines = self.fontMetrics().lineSpacing() * EXPLANATION_LINES
        self.explanation.setFixedHeight(lines + 2 * self.explanation.frameWidth() + 12)

        self.add_action = self._action(
            "&Add to list",
            "Put the selected candidates on your list (Enter, or drag them)",
            QKeySequence(Qt.Key.Key_Insert),
            self._accept,
        )
        self.dismiss_action = self._action(
            "&Not for this list",
            "Leave the selected candidates out of this list (D)",
            QKeySequence(Qt.Key.Key_D),
            self._dismiss,
        )
        self.seed_action = self._action(
            "Use as &starting title",
            "Start from the selected candidates too (S)",
            QKeySequence(Qt.Key.Key_S),
            self._seed,
        )

        header = QHBoxLayout()
        header.addWidget(title)
        header.addStretch(1)
        header.addWidget(self.status)
        buttons = QHBoxLayout()
        for action in (self.add_action, self.dismiss_action, self.seed_action):
            buttons.addWidget(_button(action))
        buttons.addStretch(1)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addLayout(header)
        layout.addWidget(self.controls)
        layout.addWidget(self.gaps_note)
        layout.addWidget(self.view, 1)
        layout.addWidget(self.explanation)
        layout.addLayout(buttons)

        self.view.activated.connect(lambda _i: self._accept())
        self.view.entered.connect(self._hovered)
        self.view.selectionModel().selectionChanged.connect(self._selection_changed)
        self.view.selectionModel().currentChanged.connect(self._current_changed)
        model.modelAboutToBeReset.connect(self._remember)
        model.modelReset.connect(self._restore)
        self._selection_changed()

    def _action(self, text: str, tip: str, key: QKeySequence, slot: object) -> QAction:
        action = QAction(text, self)
        action.setToolTip(tip)
        action.setShortcut(key)
        action.setShortcutContext(Qt.ShortcutContext.WidgetShortcut)
        action.triggered.connect(slot)
        self.view.addAction(action)
        return action

    # ----- what is selected ------------------------------------------------------------

    def selected_iris(self) -> list[str]:
        rows = sorted({i.row() for i in self.view.selectionModel().selectedRows()})
        if not rows and self.view.currentIndex().isValid():
            rows = [self.view.currentIndex().row()]
        return [self.model.iris()[r] for r in rows if r < self.model.rowCount()]

    def select_iri(self, iri: str) -> bool:
        row = self.model.row_of(iri)
        if row < 0:
            return False
        self.view.setCurrentIndex(self.model.index(row))
        return True

    def _accept(self) -> None:
        iris = self.selected_iris()
        if iris:
            self.accept_requested.emit(iris)

    def _dismiss(self) -> None:
        iris = self.selected_iris()
        if iris:
            self.dismiss_requested.emit(iris)

    def _seed(self) -> None:
        iris = self.selected_iris()
        if iris:
            self.seed_requested.emit(iris)

    def _remember(self) -> None:
        current = self.view.currentIndex()
        iri = str(current.data(Role.Iri)) if current.isValid() else None
        self._remembered = (iri, current.row() if current.isValid() else -1)

    def _restore(self) -> None:
        iri, row = self._remembered
        if iri is None:
            self._show_explanation()
            return
        found = self.model.row_of(iri)
        if found < 0:
            found = min(row, self.model.rowCount() - 1)
        if found >= 0:
            self.view.selectionModel().setCurrentIndex(
                self.model.index(found), QItemSelectionModel.SelectionFlag.ClearAndSelect
            )
        self._selection_changed()

    def _selection_changed(self, *_args: object) -> None:
        has = bool(self.selected_iris())
        for action in (self.add_action, self.dismiss_action, self.seed_action):
            action.setEnabled(has)
        self._show_explanation()

    def _current_changed(self, current: QModelIndex, _previous: QModelIndex) -> None:
        if current.isValid():
            self.work_selected.emit(str(current.data(Role.Iri)))
        self._show_explanation()

    def _hovered(self, index: QModelIndex) -> None:
        if not self.view.selectionModel().hasSelection():
            row = self.model.candidate_at(index.row())
            if row is not None:
                self.explanation.setHtml(explanation_html(row))

    # ----- messages ----------------------------------------------------------------------

    def set_message(self, text: str) -> None:
        """What to say when no candidate is selected (a hint, a note, or a problem)."""
        self._message = text
        self._show_explanation()

    def set_gaps_note(self, text: str) -> None:
        """The suggester's note on the gaps it favours ("" hides the line)."""
        self.gaps_note.set_line(text)
        self.gaps_note.setVisible(bool(text))

    def set_status(self, text: str) -> None:
        self.status.setText(text)

    def _show_explanation(self) -> None:
        current = self.view.currentIndex()
        row = self.model.candidate_at(current.row()) if current.isValid() else None
        if row is not None:
            self.explanation.setHtml(explanation_html(row))
        elif self._message:
            self.explanation.setHtml(f"<p>{html.escape(self._message)}</p>")
        else:
            self.explanation.setHtml(
                "<p>Select a candidate to see why it fits. Enter or a double click puts it on "
                "your list; you can also drag it there. D leaves it out.</p>"
            )

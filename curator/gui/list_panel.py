"""The right column: the list being built, and what the curator writes about each entry.

Edits are asked for by signal and come back through the model when the session has changed, so
undo and redo refresh the fields the same way typing does. A field is only rewritten when its
text differs from the session's, which keeps the cursor where the curator is typing.
"""

from __future__ import annotations

from PySide6.QtCore import QEvent, QModelIndex, Qt, Signal
from PySide6.QtGui import QAction, QKeyEvent, QKeySequence, QTextCursor
from PySide6.QtWidgets import (
    QAbstractItemView,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QListView,
    QPlainTextEdit,
    QSplitter,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from curator.gui.delegates import EntryDelegate
from curator.gui.models import EntryModel, Role
from curator.gui.style import heading, quiet

#: Lines each text field shows without scrolling.
FIELD_LINES = 2


class _Field(QPlainTextEdit):
    """A text field whose Ctrl+Z and Ctrl+Shift+Z go to the window's undo stack."""

    _KEYS = (QKeySequence.StandardKey.Undo, QKeySequence.StandardKey.Redo)

    def event(self, event: QEvent) -> bool:
        if (
            event.type() == QEvent.Type.ShortcutOverride
            and isinstance(event, QKeyEvent)
            and any(event.matches(key) for key in self._KEYS)
        ):
            event.ignore()  # not ours: let the window's Undo/Redo shortcut take it
            return True
        return super().event(event)


def _field(lines: int, placeholder: str, name: str) -> QPlainTextEdit:
    """A text field at least ``lines`` high that grows with the room it is given."""
    edit = _Field()
    edit.setPlaceholderText(placeholder)
    edit.setAccessibleName(name)
    edit.setTabChangesFocus(True)
    # One undo history for the whole window: Ctrl+Z reaches the window's stack, where typing
    # in a field is merged into one step.
    edit.setUndoRedoEnabled(False)
    margins = edit.contentsMargins()
    height = (
        edit.fontMetrics().lineSpacing() * lines
        + 2 * edit.frameWidth()
        + int(edit.document().documentMargin() * 2)
        + margins.top()
        + margins.bottom()
    )
    edit.setMinimumHeight(height)
    return edit


class ListPanel(QWidget):
    """Emits requests for moves, removals, seeding and edits; shows the selected entry."""

    move_requested = Signal(int, int)
    remove_requested = Signal(list)
    seed_requested = Signal(list)
    edit_requested = Signal(int, str, str)
    title_edited = Signal(str)
    work_selected = Signal(str)

    def __init__(self, model: EntryModel, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.model = model
        self._showing = False

        self.title = QLineEdit()
        self.title.setPlaceholderText("Title of the list")
        self.title.setAccessibleName("List title")
        self.title.setToolTip("The list's title, as it will be published")

        self.view = QListView()
        self.view.setModel(model)
        self.view.setItemDelegate(EntryDelegate(self.view))
        self.view.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.view.setDragDropMode(QAbstractItemView.DragDropMode.DragDrop)
        self.view.setDefaultDropAction(Qt.DropAction.MoveAction)
        self.view.setDragDropOverwriteMode(False)
        self.view.setDropIndicatorShown(True)
        self.view.setAcceptDrops(True)
        self.view.setVerticalScrollMode(QAbstractItemView.ScrollMode.ScrollPerPixel)
        self.view.setAccessibleName("Your list")
        heading_label = heading("Your &list")
        heading_label.setBuddy(self.view)
        self.empty = quiet("Nothing here yet. Drag candidates in, or select one and press Enter.")

        self.up_action = self._action(
            "Move &up",
            "Move the entry up (Ctrl+Up)",
            QKeySequence("Ctrl+Up"),
            lambda: self._move(-1),
        )
        self.down_action = self._action(
            "Move &down",
            "Move the entry down (Ctrl+Down)",
            QKeySequence("Ctrl+Down"),
            lambda: self._move(1),
        )
        self.remove_action = self._action(
            "&Remove from list",
            "Take the entry off the list (Delete)",
            QKeySequence(QKeySequence.StandardKey.Delete),
            self._remove,
        )
        self.seed_action = self._action(
            "Use entry as starting title",
            "Start from this entry too (S)",
            QKeySequence(Qt.Key.Key_S),
            self._seed,
        )

        self.rationale = _field(FIELD_LINES, "One sentence a reader will see", "Why it belongs")
        rationale_label = QLabel("Why it &belongs")
        rationale_label.setBuddy(self.rationale)
        self.note = _field(
            FIELD_LINES, "For you: a display idea, a caution, a copy to fetch", "Curator's note"
        )
        note_label = QLabel("Curator's n&ote")
        note_label.setBuddy(self.note)
        self.rationale.textChanged.connect(lambda: self._edited("rationale", self.rationale))
        self.note.textChanged.connect(lambda: self._edited("note", self.note))

        buttons = QHBoxLayout()
        for action, text in (
            (self.up_action, "Up"),
            (self.down_action, "Down"),
            (self.remove_action, "Remove"),
            (self.seed_action, "Start from it"),
        ):
            button = QToolButton()
            action.setIconText(text)  # what a button shows; menus keep the full text
            button.setDefaultAction(action)
            buttons.addWidget(button)
        buttons.addStretch(1)

        header = QHBoxLayout()
        header.addWidget(heading_label)
        header.addStretch(1)
        self.count = quiet()
        self.count.setWordWrap(False)
        header.addWidget(self.count)

        top = QWidget()
        top_layout = QVBoxLayout(top)
        top_layout.setContentsMargins(0, 0, 0, 0)
        top_layout.addLayout(header)
        top_layout.addWidget(self.title)
        top_layout.addWidget(self.view, 1)
        top_layout.addWidget(self.empty)
        top_layout.addLayout(buttons)
        bottom = QWidget()
        bottom_layout = QVBoxLayout(bottom)
        bottom_layout.setContentsMargins(0, 0, 0, 0)
        bottom_layout.addWidget(rationale_label)
        bottom_layout.addWidget(self.rationale, 1)
        bottom_layout.addWidget(note_label)
        bottom_layout.addWidget(self.note, 2)
        # The curator decides how much room the writing gets; the window remembers it.
        self.splitter = QSplitter(Qt.Orientation.Vertical)
        self.splitter.setChildrenCollapsible(False)
        self.splitter.addWidget(top)
        self.splitter.addWidget(bottom)
        self.splitter.setStretchFactor(0, 3)
        self.splitter.setStretchFactor(1, 2)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.splitter)

        self.title.editingFinished.connect(lambda: self.title_edited.emit(self.title.text()))
        self.view.selectionModel().currentChanged.connect(self._current_changed)
        for signal in (model.rowsInserted, model.rowsRemoved, model.rowsMoved, model.modelReset):
            signal.connect(self._rows_changed)
        model.dataChanged.connect(lambda *_a: self._show_entry())
        self._rows_changed()

    def _action(self, text: str, tip: str, key: QKeySequence, slot: object) -> QAction:
        action = QAction(text, self)
        action.setToolTip(tip)
        action.setShortcut(key)
        action.setShortcutContext(Qt.ShortcutContext.WidgetShortcut)
        action.triggered.connect(slot)
        self.view.addAction(action)
        return action

    # ----- requests ----------------------------------------------------------------------

    def current_row(self) -> int:
        index = self.view.currentIndex()
        return index.row() if index.isValid() else -1

    def select_row(self, row: int) -> None:
        if 0 <= row < self.model.rowCount():
            self.view.setCurrentIndex(self.model.index(row))

    def _move(self, step: int) -> None:
        row = self.current_row()
        if row >= 0 and 0 <= row + step < self.model.rowCount():
            self.move_requested.emit(row, row + step)

    def _remove(self) -> None:
        row = self.current_row()
        if row >= 0:
            self.remove_requested.emit([row])

    def _seed(self) -> None:
        entry = self.model.entry_at(self.current_row())
        if entry is not None:
            self.seed_requested.emit([entry.iri])

    def _edited(self, field: str, edit: QPlainTextEdit) -> None:
        row = self.current_row()
        if not self._showing and row >= 0:
            self.edit_requested.emit(row, field, edit.toPlainText())

    # ----- showing -----------------------------------------------------------------------

    def set_title(self, title: str) -> None:
        if self.title.text() != title:
            self.title.setText(title)

    def _rows_changed(self, *_args: object) -> None:
        count = self.model.rowCount()
        self.empty.setVisible(count == 0)
        self.count.setText(f"{count} entr{'ies' if count != 1 else 'y'}" if count else "")
        self._update_actions()
        self._show_entry()

    def _current_changed(self, current: QModelIndex, _previous: QModelIndex) -> None:
        if current.isValid():
            self.work_selected.emit(str(current.data(Role.Iri)))
        self._update_actions()
        self._show_entry()

    def _update_actions(self) -> None:
        row, count = self.current_row(), self.model.rowCount()
        self.up_action.setEnabled(row > 0)
        self.down_action.setEnabled(0 <= row < count - 1)
        self.remove_action.setEnabled(row >= 0)
        self.seed_action.setEnabled(row >= 0)

    def _show_entry(self) -> None:
        entry = self.model.entry_at(self.current_row())
        self._showing = True
        try:
            for edit, text in (
                (self.rationale, entry.rationale if entry else ""),
                (self.note, entry.note if entry else ""),
            ):
                edit.setEnabled(entry is not None)
                if edit.toPlainText() != text:
                    edit.setPlainText(text)
                    edit.moveCursor(QTextCursor.MoveOperation.End)
        finally:
            self._showing = False

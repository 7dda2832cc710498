"""Qt item models over the session and the suggestions; the views only ever see these.

The session models keep a mirror of the session's rows and change it between Qt's begin/end
calls when the session announces a change, because the session has already changed by the time
it tells us and Qt's contract (checked by QAbstractItemModelTester) wants the old row count
before ``begin*`` and the new one after ``end*``. Drops never change the session themselves: they
ask the :class:`~curator.gui.editor.SessionEditor`, so that every change lands on the undo stack.
"""

from __future__ import annotations

import json
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from enum import IntEnum
from typing import TYPE_CHECKING, Any

from PySide6.QtCore import (
    QAbstractListModel,
    QByteArray,
    QMimeData,
    QModelIndex,
    QPersistentModelIndex,
    Qt,
)

from curator.core.session import ListEntry, Session, SessionEvent
from curator.gui.describe import CandidateRow, WorkLine
from curator.services.browse import WorkSummary

if TYPE_CHECKING:
    from curator.gui.editor import SessionEditor

#: Our own MIME type for works dragged between the panes: JSON with the IRIs and where from.
WORK_MIME = "application/x-curator-works+json"

Index = QModelIndex | QPersistentModelIndex
Describer = Callable[[str, str], WorkLine]


class Role(IntEnum):
    """Data roles beyond Qt's own, shared by every model here."""

    Iri = Qt.ItemDataRole.UserRole + 1
    Byline = Qt.ItemDataRole.UserRole + 2
    Relevance = Qt.ItemDataRole.UserRole + 3
    Tags = Qt.ItemDataRole.UserRole + 4
    Rationale = Qt.ItemDataRole.UserRole + 5
    Path = Qt.ItemDataRole.UserRole + 6
    Note = Qt.ItemDataRole.UserRole + 7


@dataclass(frozen=True)
class WorkDrag:
    """What a drag carries: the works, the pane they came from, and their rows there."""

    source: str
    iris: tuple[str, ...]
    rows: tuple[int, ...] = ()

    def to_mime(self) -> QMimeData:
        mime = QMimeData()
        payload = {"source": self.source, "iris": list(self.iris), "rows": list(self.rows)}
        mime.setData(WORK_MIME, QByteArray(json.dumps(payload).encode("utf-8")))
        mime.setText("\n".join(self.iris))
        return mime

    @classmethod
    def from_mime(cls, mime: QMimeData | None) -> WorkDrag | None:
        """The drag in ``mime``, or None when it is not ours or is damaged."""
        if mime is None or not mime.hasFormat(WORK_MIME):
            return None
        try:
            data = json.loads(bytes(mime.data(WORK_MIME).data()).decode("utf-8"))
            iris = tuple(str(i) for i in data["iris"])
            rows = tuple(int(r) for r in data.get("rows", []))
            return cls(str(data["source"]), iris, rows)
        except (ValueError, KeyError, TypeError):
            return None


def _line_roles(line: WorkLine, role: int) -> Any:
    if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.AccessibleTextRole):
        return line.title
    if role == Role.Byline:
        return line.byline
    if role == Role.Iri:
        return line.iri
    if role == Qt.ItemDataRole.ToolTipRole:
        return f"{line.title}\n{line.byline}" if line.byline else line.title
    return None


def _drop_row(row: int, parent: Index, count: int) -> int:
    """Where a drop lands: between rows as given, on a row before it, else at the end."""
    if row >= 0:
        return min(row, count)
    if parent.isValid():
        return parent.row()
    return count


class WorkSearchModel(QAbstractListModel):
    """Title search results: one line per work, with creator and year to tell namesakes apart."""

    def __init__(self, parent: Any = None) -> None:
        super().__init__(parent)
        self._rows: list[WorkSummary] = []

    def set_results(self, rows: Sequence[WorkSummary]) -> None:
        self.beginResetModel()
        self._rows = list(rows)
        self.endResetModel()

    def iri_at(self, row: int) -> str | None:
        return self._rows[row].iri if 0 <= row < len(self._rows) else None

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._rows)

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid() or not 0 <= index.row() < len(self._rows):
            return None
        work = self._rows[index.row()]
        if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.EditRole):
            return work.line()
        if role == Role.Iri:
            return work.iri
        if role == Qt.ItemDataRole.ToolTipRole:
            return work.line()
        return None


class SeedModel(QAbstractListModel):
    """The session's starting titles; works dropped on it become starting titles."""

    def __init__(self, session: Session, describe: Describer, parent: Any = None) -> None:
        super().__init__(parent)
        self._session = session
        self._describe = describe
        self._editor: SessionEditor | None = None
        self._seeds: list[str] = list(session.seeds)
        session.subscribe(self._on_session)

    def set_editor(self, editor: SessionEditor) -> None:
        self._editor = editor

    def detach(self) -> None:
        self._session.unsubscribe(self._on_session)

    def _on_session(self, event: SessionEvent) -> None:
        if event.kind in ("seeds", "reset") and self._seeds != self._session.seeds:
            self.beginResetModel()
            self._seeds = list(self._session.seeds)
            self.endResetModel()

    def refresh_lines(self) -> None:
        """The catalogue changed: titles and bylines may read differently now."""
        if self._seeds:
            self.dataChanged.emit(self.index(0), self.index(len(self._seeds) - 1))

    def iri_at(self, row: int) -> str | None:
        return self._seeds[row] if 0 <= row < len(self._seeds) else None

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._seeds)

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid() or not 0 <= index.row() < len(self._seeds):
            return None
        return _line_roles(self._describe(self._seeds[index.row()], ""), role)

    def flags(self, index: Index) -> Qt.ItemFlag:
        base = Qt.ItemFlag.ItemIsDropEnabled
        if not index.isValid():
            return base
        return base | Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable

    def mimeTypes(self) -> list[str]:
        return [WORK_MIME]

    def supportedDropActions(self) -> Qt.DropAction:
        return Qt.DropAction.CopyAction | Qt.DropAction.MoveAction

    def canDropMimeData(
        self, data: QMimeData, action: Qt.DropAction, row: int, column: int, parent: Index
    ) -> bool:
        drag = WorkDrag.from_mime(data)
        return drag is not None and self._editor is not None and drag.source != "seeds"

    def dropMimeData(
        self, data: QMimeData, action: Qt.DropAction, row: int, column: int, parent: Index
    ) -> bool:
        drag = WorkDrag.from_mime(data)
        if drag is None or self._editor is None or drag.source == "seeds":
            return False
        return self._editor.add_seeds(drag.iris)


class CandidateModel(QAbstractListModel):
    """The current suggestions; replaced whole on every refresh."""

    def __init__(self, parent: Any = None) -> None:
        super().__init__(parent)
        self._rows: list[CandidateRow] = []

    def set_rows(self, rows: Sequence[CandidateRow]) -> None:
        self.beginResetModel()
        self._rows = list(rows)
        self.endResetModel()

    def rows(self) -> tuple[CandidateRow, ...]:
        return tuple(self._rows)

    def iris(self) -> list[str]:
        return [r.iri for r in self._rows]

    def row_for(self, iri: str) -> CandidateRow | None:
        return next((r for r in self._rows if r.iri == iri), None)

    def row_of(self, iri: str) -> int:
        return next((i for i, r in enumerate(self._rows) if r.iri == iri), -1)

    def candidate_at(self, row: int) -> CandidateRow | None:
        return self._rows[row] if 0 <= row < len(self._rows) else None

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._rows)

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid() or not 0 <= index.row() < len(self._rows):
            return None
        row = self._rows[index.row()]
        if role == Qt.ItemDataRole.ToolTipRole:
            parts = [row.line.title, row.line.byline, "", row.rationale]
            if row.path:
                parts.append(f"Connection: {row.path}")
            return "\n".join(parts)
        if role == Role.Relevance:
            return row.relevance
        if role == Role.Tags:
            return row.tags
        if role == Role.Rationale:
            return row.rationale
        if role == Role.Path:
            return row.path
        return _line_roles(row.line, role)

    def flags(self, index: Index) -> Qt.ItemFlag:
        if not index.isValid():
            return Qt.ItemFlag.NoItemFlags
        return (
            Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable | Qt.ItemFlag.ItemIsDragEnabled
        )

    def mimeTypes(self) -> list[str]:
        return [WORK_MIME]

    def supportedDragActions(self) -> Qt.DropAction:
        return Qt.DropAction.CopyAction

    def mimeData(self, indexes: Sequence[QModelIndex]) -> QMimeData:
        rows = sorted({i.row() for i in indexes if i.isValid()})
        iris = tuple(self._rows[r].iri for r in rows if 0 <= r < len(self._rows))
        return WorkDrag("candidates", iris, tuple(rows)).to_mime()


class EntryModel(QAbstractListModel):
    """The ordered list: entries are dropped in from anywhere and reordered by dragging."""

    def __init__(self, session: Session, describe: Describer, parent: Any = None) -> None:
        super().__init__(parent)
        self._session = session
        self._describe = describe
        self._editor: SessionEditor | None = None
        self._entries: list[ListEntry] = list(session.entries)
        session.subscribe(self._on_session)

    def set_editor(self, editor: SessionEditor) -> None:
        self._editor = editor

    def detach(self) -> None:
        self._session.unsubscribe(self._on_session)

    def refresh_lines(self) -> None:
        if self._entries:
            self.dataChanged.emit(self.index(0), self.index(len(self._entries) - 1))

    def entry_at(self, row: int) -> ListEntry | None:
        return self._entries[row] if 0 <= row < len(self._entries) else None

    def _on_session(self, event: SessionEvent) -> None:
        entries = self._session.entries
        if event.kind == "entry-inserted":
            self.beginInsertRows(QModelIndex(), event.row, event.row)
            self._entries.insert(event.row, entries[event.row])
            self.endInsertRows()
            self._renumber(event.row)
        elif event.kind == "entry-removed":
            self.beginRemoveRows(QModelIndex(), event.row, event.row)
            del self._entries[event.row]
            self.endRemoveRows()
            self._renumber(event.row)
        elif event.kind == "entry-moved":
            row, to = event.row, event.other_row
            destination = to + 1 if to > row else to
            if self.beginMoveRows(QModelIndex(), row, row, QModelIndex(), destination):
                self._entries.insert(to, self._entries.pop(row))
                self.endMoveRows()
            self._renumber(min(row, to))
        elif event.kind == "entry-changed":
            self._entries[event.row] = entries[event.row]
            index = self.index(event.row)
            self.dataChanged.emit(index, index)
        elif event.kind == "reset":
            self.beginResetModel()
            self._entries = list(entries)
            self.endResetModel()

    def _renumber(self, first: int) -> None:
        """Entries below a change have new numbers; let the views repaint them."""
        if first < len(self._entries):
            self.dataChanged.emit(
                self.index(first), self.index(len(self._entries) - 1), [Qt.ItemDataRole.DisplayRole]
            )

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._entries)

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid() or not 0 <= index.row() < len(self._entries):
            return None
        entry = self._entries[index.row()]
        if role == Role.Rationale:
            return entry.rationale
        if role == Role.Note:
            return entry.note
        line = self._describe(entry.iri, entry.label)
        if role == Qt.ItemDataRole.ToolTipRole:
            parts = [line.title, line.byline]
            if entry.rationale:
                parts += ["", entry.rationale]
            if entry.note:
                parts += ["", f"Note: {entry.note}"]
            return "\n".join(parts)
        return _line_roles(line, role)

    def flags(self, index: Index) -> Qt.ItemFlag:
        if not index.isValid():
            return Qt.ItemFlag.ItemIsDropEnabled
        return (
            Qt.ItemFlag.ItemIsEnabled
            | Qt.ItemFlag.ItemIsSelectable
            | Qt.ItemFlag.ItemIsDragEnabled
            | Qt.ItemFlag.ItemIsDropEnabled
        )

    def mimeTypes(self) -> list[str]:
        return [WORK_MIME]

    def supportedDragActions(self) -> Qt.DropAction:
        # No removeRows here: a move out of this view never deletes through the view.
        return Qt.DropAction.MoveAction | Qt.DropAction.CopyAction

    def supportedDropActions(self) -> Qt.DropAction:
        return Qt.DropAction.MoveAction | Qt.DropAction.CopyAction

    def mimeData(self, indexes: Sequence[QModelIndex]) -> QMimeData:
        rows = sorted({i.row() for i in indexes if i.isValid()})
        iris = tuple(self._entries[r].iri for r in rows if 0 <= r < len(self._entries))
        return WorkDrag("list", iris, tuple(rows)).to_mime()

    def canDropMimeData(
        self, data: QMimeData, action: Qt.DropAction, row: int, column: int, parent: Index
    ) -> bool:
        return WorkDrag.from_mime(data) is not None and self._editor is not None

    def dropMimeData(
        self, data: QMimeData, action: Qt.DropAction, row: int, column: int, parent: Index
    ) -> bool:
        """A drop from another pane adds the works at the drop row; one from here moves."""
        drag = WorkDrag.from_mime(data)
        if drag is None or self._editor is None:
            return False
        at = _drop_row(row, parent, len(self._entries))
        if drag.source == "list":
            if len(drag.rows) != 1:
                return False
            source = drag.rows[0]
            to = at - 1 if at > source else at
            return self._editor.move_entry(source, to)
        return self._editor.accept(drag.iris, at)

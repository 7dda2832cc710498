"""Undoable edits of a session: each QUndoCommand calls Session methods and nothing else.

Commands hold only IRIs, rows and values, never Qt indexes, so they stay valid whatever the
views show. Typing in a text field and dragging the variety slider merge into one step each.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace
from enum import IntEnum

from PySide6.QtGui import QUndoCommand

from curator.core.session import ListEntry, ListSettings, Session


class MergeId(IntEnum):
    """Ids of commands that merge with the one before them (Qt wants a distinct int each)."""

    EditEntry = 1001
    Settings = 1002
    Title = 1003


class AddSeeds(QUndoCommand):
    def __init__(self, session: Session, iris: Sequence[str]) -> None:
        super().__init__("Add starting title" if len(iris) == 1 else "Add starting titles")
        self._session = session
        self._iris = [i for i in dict.fromkeys(iris) if i not in session.seeds]

    @property
    def useful(self) -> bool:
        return bool(self._iris)

    def redo(self) -> None:
        for iri in self._iris:
            self._session.add_seed(iri)

    def undo(self) -> None:
        for iri in reversed(self._iris):
            self._session.remove_seed(iri)


class RemoveSeed(QUndoCommand):
    def __init__(self, session: Session, iri: str) -> None:
        super().__init__("Remove starting title")
        self._session = session
        self._iri = iri
        self._at = -1

    def redo(self) -> None:
        self._at = self._session.remove_seed(self._iri)

    def undo(self) -> None:
        if self._at >= 0:
            self._session.add_seed(self._iri, self._at)


class InsertEntries(QUndoCommand):
    """Accept works into the list at ``row``, in order; works already listed are skipped."""

    def __init__(self, session: Session, entries: Sequence[ListEntry], row: int) -> None:
        listed = set(session.entry_iris)
        fresh = [e for e in entries if e.iri not in listed]
        super().__init__(
            f"Add ‘{fresh[0].label}’ to the list" if len(fresh) == 1 else "Add to the list"
        )
        self._session = session
        self._entries = list({e.iri: e for e in fresh}.values())
        self._row = row
        self._rows: list[int] = []

    @property
    def useful(self) -> bool:
        return bool(self._entries)

    def redo(self) -> None:
        self._rows = []
        at = self._row
        for entry in self._entries:
            placed = self._session.insert_entry(at, entry)
            if placed >= 0:
                self._rows.append(placed)
                at = placed + 1

    def undo(self) -> None:
        for row in sorted(self._rows, reverse=True):
            self._session.remove_entry(row)


class RemoveEntries(QUndoCommand):
    def __init__(self, session: Session, rows: Sequence[int]) -> None:
        super().__init__("Remove from the list")
        self._session = session
        self._rows = sorted(set(rows))
        self._removed: list[tuple[int, ListEntry]] = []

    def redo(self) -> None:
        self._removed = [(r, self._session.remove_entry(r)) for r in reversed(self._rows)]

    def undo(self) -> None:
        for row, entry in reversed(self._removed):
            self._session.insert_entry(row, entry)


class MoveEntry(QUndoCommand):
    def __init__(self, session: Session, row: int, to: int) -> None:
        super().__init__("Move in the list")
        self._session = session
        self._row = row
        self._to = to

    def redo(self) -> None:
        self._session.move_entry(self._row, self._to)

    def undo(self) -> None:
        self._session.move_entry(self._to, self._row)


class EditEntry(QUndoCommand):
    """A change to an entry's rationale or note; consecutive typing in one field merges."""

    def __init__(self, session: Session, row: int, field: str, text: str) -> None:
        super().__init__("Edit why it belongs" if field == "rationale" else "Edit note")
        self._session = session
        self.row = row
        self.field = field
        entry = session.entries[row]
        self._old = entry.rationale if field == "rationale" else entry.note
        self._new = text

    def id(self) -> int:
        return int(MergeId.EditEntry)

    def mergeWith(self, other: QUndoCommand) -> bool:
        if not isinstance(other, EditEntry) or (other.row, other.field) != (self.row, self.field):
            return False
        self._new = other._new
        return True

    def _apply(self, text: str) -> None:
        if self.field == "rationale":
            self._session.update_entry(self.row, rationale=text)
        else:
            self._session.update_entry(self.row, note=text)

    def redo(self) -> None:
        self._apply(self._new)

    def undo(self) -> None:
        self._apply(self._old)


class Dismiss(QUndoCommand):
    def __init__(self, session: Session, iris: Sequence[str]) -> None:
        super().__init__("Not for this list")
        self._session = session
        self._iris = [i for i in dict.fromkeys(iris) if i not in session.dismissed]

    @property
    def useful(self) -> bool:
        return bool(self._iris)

    def redo(self) -> None:
        for iri in self._iris:
            self._session.dismiss(iri)

    def undo(self) -> None:
        for iri in reversed(self._iris):
            self._session.undismiss(iri)


class ChangeSettings(QUndoCommand):
    """A change of the suggestion controls; moving the same control again merges."""

    def __init__(self, session: Session, settings: ListSettings, control: str) -> None:
        super().__init__(f"Change {control}")
        self._session = session
        self._old = session.settings
        self._new = settings
        self.control = control

    def id(self) -> int:
        return int(MergeId.Settings)

    def mergeWith(self, other: QUndoCommand) -> bool:
        if not isinstance(other, ChangeSettings) or other.control != self.control:
            return False
        self._new = other._new
        # Back where it started (a switch turned on and off again): Qt drops the step.
        self.setObsolete(self._new == self._old)
        return True

    def redo(self) -> None:
        self._session.set_settings(self._new)

    def undo(self) -> None:
        self._session.set_settings(self._old)


class SetTargets(QUndoCommand):
    """New balance targets (TOML text, already checked); only that field of the settings."""

    def __init__(self, session: Session, text: str) -> None:
        super().__init__("Change the targets" if text.strip() else "Clear the targets")
        self._session = session
        self._old = session.settings.targets
        self._new = text

    def _apply(self, text: str) -> None:
        self._session.set_settings(replace(self._session.settings, targets=text))

    def redo(self) -> None:
        self._apply(self._new)

    def undo(self) -> None:
        self._apply(self._old)


class SetTitle(QUndoCommand):
    def __init__(self, session: Session, title: str) -> None:
        super().__init__("Rename the list")
        self._session = session
        self._old = session.title
        self._new = title

    def id(self) -> int:
        return int(MergeId.Title)

    def mergeWith(self, other: QUndoCommand) -> bool:
        if not isinstance(other, SetTitle):
            return False
        self._new = other._new
        return True

    def redo(self) -> None:
        self._session.set_title(self._new)

    def undo(self) -> None:
        self._session.set_title(self._old)

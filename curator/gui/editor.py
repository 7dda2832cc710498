"""The one door through which the window changes the session: every edit becomes an undo step.

Panels, drops and menu actions all call these methods, so no edit can bypass the undo stack and
the rules (no work listed twice, clamp rows) live in one place.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

from PySide6.QtGui import QUndoCommand, QUndoStack

from curator.core.session import ListEntry, ListSettings, Session
from curator.gui import commands

EntryFactory = Callable[[str], ListEntry]
#: What a list is called until the curator names it (the Session's own default).
UNTITLED = Session().title


class SessionEditor:
    """Pushes commands for the edits a curator makes; methods return whether anything changed."""

    def __init__(self, session: Session, stack: QUndoStack, make_entry: EntryFactory) -> None:
        self.session = session
        self.stack = stack
        self._make_entry = make_entry

    def _push(self, command: QUndoCommand, useful: bool = True) -> bool:
        if not useful:
            return False
        self.stack.push(command)
        return True

    def add_seeds(self, iris: Sequence[str]) -> bool:
        command = commands.AddSeeds(self.session, iris)
        return self._push(command, command.useful)

    def remove_seed(self, iri: str) -> bool:
        return self._push(commands.RemoveSeed(self.session, iri), iri in self.session.seeds)

    def accept(self, iris: Sequence[str], row: int | None = None) -> bool:
        """Put works on the list at ``row`` (default: the end), with their rationales."""
        at = len(self.session.entries) if row is None else row
        command = commands.InsertEntries(self.session, [self._make_entry(i) for i in iris], at)
        return self._push(command, command.useful)

    def remove_entries(self, rows: Sequence[int]) -> bool:
        valid = [r for r in rows if 0 <= r < len(self.session.entries)]
        return self._push(commands.RemoveEntries(self.session, valid), bool(valid))

    def move_entry(self, row: int, to: int) -> bool:
        count = len(self.session.entries)
        to = max(0, min(to, count - 1))
        if not 0 <= row < count or row == to:
            return False
        return self._push(commands.MoveEntry(self.session, row, to))

    def edit_entry(self, row: int, field: str, text: str) -> bool:
        if not 0 <= row < len(self.session.entries):
            return False
        entry = self.session.entries[row]
        old = entry.rationale if field == "rationale" else entry.note
        return self._push(commands.EditEntry(self.session, row, field, text), old != text)

    def dismiss(self, iris: Sequence[str]) -> bool:
        command = commands.Dismiss(self.session, iris)
        return self._push(command, command.useful)

    def change_settings(self, settings: ListSettings, control: str) -> bool:
        return self._push(
            commands.ChangeSettings(self.session, settings, control),
            settings != self.session.settings,
        )

    def set_targets(self, text: str) -> bool:
        """Store balance targets (the caller has checked that they read)."""
        return self._push(
            commands.SetTargets(self.session, text), text != self.session.settings.targets
        )

    def import_entries(self, entries: Sequence[ListEntry], source: str, title: str = "") -> bool:
        """Add works read from an outside list as one undo step; an empty, untitled list also
        takes the imported list's ``title``."""
        insert = commands.InsertEntries(self.session, entries, len(self.session.entries))
        if not insert.useful:
            return False
        rename = (
            bool(title)
            and not self.session.entries
            and self.session.title == UNTITLED
            and title != UNTITLED
        )
        self.stack.beginMacro(f"Import from {source}")
        self.stack.push(insert)
        if rename:
            self.stack.push(commands.SetTitle(self.session, title))
        self.stack.endMacro()
        return True

    def set_title(self, title: str) -> bool:
        title = title.strip() or UNTITLED
        return self._push(commands.SetTitle(self.session, title), title != self.session.title)

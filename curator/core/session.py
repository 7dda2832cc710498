"""A curator's working list: seeds, the ordered entries with rationales and notes, dismissals.

The session is plain data with change notifications, so the window can watch it and the command
line can read and write it. It is saved as versioned JSON of our own schema; a file from a newer
curator, or one that is damaged, is refused with a message naming the field, and never changed.
A file from an older curator is brought up to date on reading, one version at a time, through
:data:`MIGRATIONS`; saving then writes the current version.
"""

from __future__ import annotations

import json
import math
from collections.abc import Callable
from dataclasses import asdict, dataclass, field, fields, replace
from datetime import UTC, datetime
from pathlib import Path
from typing import Any, Literal

from curator.core.errors import CuratorError
from curator.core.files import read_utf8_text, write_text_atomically

SESSION_FORMAT = "curator-session"
#: The version this curator writes. History:
#:
#: 1. the first format (``settings`` without ``fill_gaps`` and ``targets``);
#: 2. ``settings`` always holds ``fill_gaps`` and ``targets`` (nothing else changed, so a
#:    version-1 file loses nothing in the move).
SESSION_VERSION = 2

EventKind = Literal[
    "seeds",
    "entry-inserted",
    "entry-removed",
    "entry-moved",
    "entry-changed",
    "dismissed",
    "settings",
    "title",
    "reset",
]


class SessionError(CuratorError):
    """A session file cannot be read (damaged, not a session, or from a newer curator)."""


def _migrate_1_to_2(data: dict[str, Any]) -> dict[str, Any]:
    """Version 1 settings lacked the gap-filling switch and the balance targets: defaults."""
    settings = data.get("settings", {})
    if isinstance(settings, dict):
        settings = {"fill_gaps": False, "targets": "", **settings}
    return {**data, "settings": settings, "version": 2}


#: ``MIGRATIONS[v]`` turns the JSON of a version-``v`` session into that of version ``v + 1``
#: (a new mapping; the one read is never changed). Every version below
#: :data:`SESSION_VERSION` has one, so any file a curator wrote so far can be read.
MIGRATIONS: dict[int, Callable[[dict[str, Any]], dict[str, Any]]] = {
    1: _migrate_1_to_2,
}


def migrate(data: dict[str, Any], *, source: str = "<session>") -> dict[str, Any]:
    """The session JSON ``data`` brought up to :data:`SESSION_VERSION`.

    Raises:
        SessionError: the version is not a whole number from 1 on, or is newer than ours.
    """
    version = data.get("version")
    if not isinstance(version, int) or isinstance(version, bool) or version < 1:
        raise SessionError(f"{source}: field version must be a whole number of 1 or more.")
    if version > SESSION_VERSION:
        raise SessionError(
            f"{source}: saved by a newer curator (session version {version}; this one "
            f"reads up to {SESSION_VERSION}). The file was left as it is."
        )
    while version < SESSION_VERSION:
        data = MIGRATIONS[version](data)
        if data.get("version") != version + 1:  # a migration must move exactly one step
            raise AssertionError(f"session migration from version {version} is broken")
        version += 1
    return data


@dataclass(frozen=True)
class SessionEvent:
    """What changed: the kind, and the rows involved where rows matter."""

    kind: EventKind
    row: int = -1
    other_row: int = -1


@dataclass(frozen=True)
class ListEntry:
    """One entry of the list: the work, why it is there, and the curator's own note."""

    iri: str
    label: str
    rationale: str = ""
    note: str = ""


@dataclass(frozen=True)
class ListSettings:
    """Suggestion controls kept with the list, so reopening it suggests the same way."""

    lam: float = 0.7
    mode: str = "blend"
    kinds: tuple[str, ...] = ()
    year_from: int | None = None
    year_to: int | None = None
    languages: tuple[str, ...] = ()
    #: Favour candidates that fill the list's gaps.
    fill_gaps: bool = False
    #: The curator's balance targets as TOML text (see :mod:`curator.core.targets`).
    targets: str = ""


Listener = Callable[[SessionEvent], None]


@dataclass
class Session:
    """The list being built. Change it through its methods so watchers hear of every change."""

    title: str = "Untitled list"
    seeds: list[str] = field(default_factory=list)
    entries: list[ListEntry] = field(default_factory=list)
    dismissed: list[str] = field(default_factory=list)
    settings: ListSettings = field(default_factory=ListSettings)
    catalogue: list[str] = field(default_factory=list)
    created: str = field(default_factory=lambda: _now())
    _listeners: list[Listener] = field(default_factory=list, repr=False, compare=False)

    # ----- watching ----------------------------------------------------------------------

    def subscribe(self, listener: Listener) -> None:
        self._listeners.append(listener)

    def unsubscribe(self, listener: Listener) -> None:
        if listener in self._listeners:
            self._listeners.remove(listener)

    def _emit(self, kind: EventKind, row: int = -1, other_row: int = -1) -> None:
        event = SessionEvent(kind, row, other_row)
        for listener in list(self._listeners):
            listener(event)

    # ----- seeds and dismissals ------------------------------------------------------------

    def add_seed(self, iri: str, at: int | None = None) -> bool:
        """Add a seed (at a position, default last); False if it was one already."""
        if iri in self.seeds:
            return False
        self.seeds.insert(len(self.seeds) if at is None else at, iri)
        self._emit("seeds")
        return True

    def remove_seed(self, iri: str) -> int:
        """Remove a seed; returns where it was, or -1 if it was not a seed."""
        if iri not in self.seeds:
            return -1
        at = self.seeds.index(iri)
        del self.seeds[at]
        self._emit("seeds")
        return at

    def dismiss(self, iri: str) -> bool:
        if iri in self.dismissed:
            return False
        self.dismissed.append(iri)
        self._emit("dismissed")
        return True

    def undismiss(self, iri: str) -> bool:
        if iri not in self.dismissed:
            return False
        self.dismissed.remove(iri)
        self._emit("dismissed")
        return True

    # ----- entries -----------------------------------------------------------------------

    def row_of(self, iri: str) -> int:
        return next((i for i, e in enumerate(self.entries) if e.iri == iri), -1)

    def insert_entry(self, row: int, entry: ListEntry) -> int:
        """Insert at ``row`` (clamped to the list); a work already listed is not added twice.

        Returns the row it went to, or -1 if it was on the list already.
        """
        if self.row_of(entry.iri) >= 0:
            return -1
        row = max(0, min(row, len(self.entries)))
        self.entries.insert(row, entry)
        self._emit("entry-inserted", row)
        return row

    def remove_entry(self, row: int) -> ListEntry:
        entry = self.entries.pop(row)
        self._emit("entry-removed", row)
        return entry

    def move_entry(self, row: int, to: int) -> None:
        """Move the entry at ``row`` so that it ends up at index ``to``."""
        if row == to:
            return
        entry = self.entries.pop(row)
        self.entries.insert(to, entry)
        self._emit("entry-moved", row, to)

    def update_entry(
        self, row: int, *, note: str | None = None, rationale: str | None = None
    ) -> None:
        old = self.entries[row]
        new = replace(
            old,
            note=old.note if note is None else note,
            rationale=old.rationale if rationale is None else rationale,
        )
        if new != old:
            self.entries[row] = new
            self._emit("entry-changed", row)

    def set_settings(self, settings: ListSettings) -> None:
        if settings != self.settings:
            self.settings = settings
            self._emit("settings")

    def set_title(self, title: str) -> None:
        if title != self.title:
            self.title = title
            self._emit("title")

    def replace_with(self, other: Session) -> None:
        """Take over another session's content (New, Open), keeping the watchers."""
        for f in fields(self):
            if f.name != "_listeners":
                setattr(self, f.name, getattr(other, f.name))
        self._emit("reset")

    def set_catalogue(self, paths: list[str]) -> None:
        """Remember which catalogue files the list was made from (saved with it)."""
        if paths != self.catalogue:
            self.catalogue = list(paths)
            self._emit("settings")

    def snapshot(self) -> Session:
        """An independent copy with no watchers, safe to hand to a worker thread."""
        return Session(
            title=self.title,
            seeds=list(self.seeds),
            entries=list(self.entries),
            dismissed=list(self.dismissed),
            settings=self.settings,
            catalogue=list(self.catalogue),
            created=self.created,
        )

    @property
    def entry_iris(self) -> list[str]:
        return [e.iri for e in self.entries]

    # ----- files -------------------------------------------------------------------------

    def to_json(self) -> dict[str, Any]:
        return {
            "format": SESSION_FORMAT,
            "version": SESSION_VERSION,
            "title": self.title,
            "created": self.created,
            "saved": _now(),
            "catalogue": list(self.catalogue),
            "seeds": list(self.seeds),
            "entries": [asdict(e) for e in self.entries],
            "dismissed": list(self.dismissed),
            "settings": {
                **asdict(self.settings),
                "kinds": list(self.settings.kinds),
                "languages": list(self.settings.languages),
            },
        }

    def dumps(self) -> str:
        return json.dumps(self.to_json(), ensure_ascii=False, indent=2) + "\n"

    def save(self, path: Path) -> None:
        """Write atomically: the old file stays whole until the new one is complete."""
        write_text_atomically(Path(path), self.dumps())

    @classmethod
    def loads(cls, text: str, *, source: str = "<session>") -> Session:
        """Read a session, naming the field at fault.

        Raises:
            SessionError: not JSON, not a curator session, from a newer curator, or malformed.
        """
        try:
            data = json.loads(text)
        except json.JSONDecodeError as exc:
            raise SessionError(
                f"{source}, line {exc.lineno}, column {exc.colno}: not valid JSON ({exc.msg})."
            ) from None
        except RecursionError:
            raise SessionError(
                f"{source}: not a curator session file (nested too deeply to read)."
            ) from None
        return cls.from_json(data, source=source)

    @classmethod
    def load(cls, path: Path) -> Session:
        """Read a session file; the file itself is only read, never changed.

        Raises:
            SessionError: unreadable, not UTF-8 (naming line and column), or see :meth:`loads`.
        """
        text = read_utf8_text(Path(path), SessionError, "not a curator session file.")
        return cls.loads(text, source=str(path))

    @classmethod
    def from_json(cls, data: Any, *, source: str = "<session>") -> Session:
        """A session from its JSON (any version up to ours), naming the field at fault.

        Raises:
            SessionError: not a curator session, from a newer curator, or a field is malformed.
        """
        if not isinstance(data, dict) or data.get("format") != SESSION_FORMAT:
            raise SessionError(
                f'{source}: not a curator session file (no "format": "{SESSION_FORMAT}").'
            )
        data = migrate(data, source=source)
        try:
            settings_data = data.get("settings", {})
            _require(isinstance(settings_data, dict), "settings must be an object")
            known = {f.name for f in fields(ListSettings)}
            unknown = sorted(set(settings_data) - known)
            _require(not unknown, f"settings has unknown field(s) {', '.join(unknown)}")
            settings = ListSettings(
                lam=_fraction(settings_data.get("lam", 0.7), "settings.lam"),
                mode=_text(settings_data.get("mode", "blend"), "settings.mode"),
                kinds=tuple(_strings(settings_data.get("kinds", []), "settings.kinds")),
                year_from=_optional_int(settings_data.get("year_from"), "settings.year_from"),
                year_to=_optional_int(settings_data.get("year_to"), "settings.year_to"),
                languages=tuple(_strings(settings_data.get("languages", []), "settings.languages")),
                fill_gaps=_flag(settings_data.get("fill_gaps", False), "settings.fill_gaps"),
                targets=_text(settings_data.get("targets", ""), "settings.targets"),
            )
            entries = []
            raw_entries = data.get("entries", [])
            _require(isinstance(raw_entries, list), "entries must be a list")
            for i, raw in enumerate(raw_entries):
                _require(isinstance(raw, dict), f"entries[{i}] must be an object")
                _require(
                    isinstance(raw.get("iri"), str) and raw["iri"], f"entries[{i}].iri is missing"
                )
                entries.append(
                    ListEntry(
                        iri=raw["iri"],
                        label=_text(raw.get("label", raw["iri"]), f"entries[{i}].label"),
                        rationale=_text(raw.get("rationale", ""), f"entries[{i}].rationale"),
                        note=_text(raw.get("note", ""), f"entries[{i}].note"),
                    )
                )
            return cls(
                title=_text(data.get("title", "Untitled list"), "title"),
                seeds=_strings(data.get("seeds", []), "seeds"),
                entries=entries,
                dismissed=_strings(data.get("dismissed", []), "dismissed"),
                settings=settings,
                catalogue=_strings(data.get("catalogue", []), "catalogue"),
                created=_text(data.get("created", _now()), "created"),
            )
        except _FieldError as exc:
            raise SessionError(f"{source}: field {exc}.") from None

    def same_content(self, other: Session) -> bool:
        """Equal in everything a curator made (timestamps aside)."""
        mine, theirs = self.to_json(), other.to_json()
        for key in ("saved", "created"):
            mine.pop(key)
            theirs.pop(key)
        return mine == theirs


class _FieldError(ValueError):
    pass


def _require(condition: bool, message: str) -> None:
    if not condition:
        raise _FieldError(message)


def _strings(value: Any, name: str) -> list[str]:
    _require(
        isinstance(value, list) and all(isinstance(v, str) for v in value),
        f"{name} must be a list of strings",
    )
    return list(value)


def _text(value: Any, name: str) -> str:
    _require(isinstance(value, str), f"{name} must be text")
    return str(value)


def _flag(value: Any, name: str) -> bool:
    _require(isinstance(value, bool), f"{name} must be true or false")
    return bool(value)


def _fraction(value: Any, name: str) -> float:
    _require(
        isinstance(value, int | float)
        and not isinstance(value, bool)
        and math.isfinite(value)
        and 0.0 <= value <= 1.0,
        f"{name} must be a number from 0 to 1",
    )
    return float(value)


def _optional_int(value: Any, name: str) -> int | None:
    if value is None:
        return None
    _require(isinstance(value, int) and not isinstance(value, bool), f"{name} must be a year")
    return int(value)


def _now() -> str:
    return datetime.now(UTC).isoformat(timespec="seconds")

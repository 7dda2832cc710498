"""Sessions as the front ends use them: suggestions for a session, entries from suggestions,
and the recovery file that autosave writes and a restart offers back."""

from __future__ import annotations

import contextlib
import os
import time
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from curator.core.files import TEMP_SUFFIX, user_folder
from curator.core.index import Index
from curator.core.progress import Progress
from curator.core.session import ListEntry, ListSettings, Session, SessionError
from curator.core.suggest import Suggestion, SuggestionResult, SuggestSettings
from curator.core.targets import Targets
from curator.services.suggestions import SuggestRequest
from curator.services.workspace import Workspace

if TYPE_CHECKING:
    from curator.services.endpoint import EndpointWorkspace


def targets_of(list_settings: ListSettings) -> Targets | None:
    """The session's targets, or None when it has none.

    Raises:
        TargetsError: the targets text is malformed (the message names the field).
    """
    if not list_settings.targets.strip():
        return None
    return Targets.from_toml(list_settings.targets, source="the list's targets")


def settings_for(list_settings: ListSettings, limit: int = 20) -> SuggestSettings:
    return SuggestSettings(
        fill_gaps=list_settings.fill_gaps,
        targets=targets_of(list_settings) if list_settings.fill_gaps else None,
        mode=list_settings.mode,  # type: ignore[arg-type]
        lam=list_settings.lam,
        limit=limit,
        kinds=list_settings.kinds,
        year_from=list_settings.year_from,
        year_to=list_settings.year_to,
        languages=list_settings.languages,
    )


@dataclass(frozen=True)
class SessionSuggestions:
    result: SuggestionResult | None
    #: IRIs of the session that this catalogue does not hold (kept in the session, skipped here)
    missing: tuple[str, ...]


def suggest_for_session(
    workspace: Workspace | EndpointWorkspace,
    session: Session,
    limit: int = 20,
    progress: Progress | None = None,
) -> SessionSuggestions:
    """Suggestions for the session's seeds, list and dismissals in this catalogue.

    ``progress`` is checked on an endpoint only (embedded suggestions take milliseconds).

    Raises:
        SettingsError: the session's settings are out of range.
        EndpointError: the endpoint failed.
        Cancelled: cancelled through ``progress``.
    """
    if not isinstance(workspace, Workspace):
        return _suggest_on_endpoint(workspace, session, limit, progress)
    position = workspace.index.position
    missing = tuple(
        iri
        for iri in [*session.seeds, *session.entry_iris, *session.dismissed]
        if iri not in position
    )
    seeds = [position[i] for i in session.seeds if i in position]
    if not seeds:
        return SessionSuggestions(None, missing)
    result = workspace.suggester.suggest(
        seeds,
        settings_for(session.settings, limit),
        list_items=[position[i] for i in session.entry_iris if i in position],
        dismissed=[position[i] for i in session.dismissed if i in position],
    )
    return SessionSuggestions(result, missing)


def _suggest_on_endpoint(
    workspace: EndpointWorkspace, session: Session, limit: int, progress: Progress | None
) -> SessionSuggestions:
    """As :func:`suggest_for_session`, through the endpoint; works of the list that the
    endpoint lacks are left out and reported, as in embedded mode."""
    iris = [*session.seeds, *session.entry_iris, *session.dismissed]
    present = workspace.works_among(iris)
    missing = tuple(iri for iri in iris if iri not in present)
    seeds = tuple(i for i in session.seeds if i in present)
    if not seeds:
        return SessionSuggestions(None, missing)
    request = SuggestRequest(
        seeds=seeds,
        settings=settings_for(session.settings, limit),
        list_items=tuple(i for i in session.entry_iris if i in present),
        dismissed=tuple(i for i in session.dismissed if i in present),
    )
    return SessionSuggestions(workspace.suggest(request, progress), missing)


@dataclass(frozen=True)
class ListCatalogue:
    """The works of one list as an endpoint describes them: the ``index`` that audits and
    exports read, without the whole catalogue."""

    index: Index


def catalogue_for_list(
    workspace: Workspace | EndpointWorkspace, session: Session
) -> Workspace | ListCatalogue:
    """What to audit or export ``session`` against: the open catalogue itself, or (on an
    endpoint) an index of the list's entries and seeds fetched for the purpose.

    Raises:
        EndpointError: the endpoint failed.
    """
    if isinstance(workspace, Workspace):
        return workspace
    iris = list(dict.fromkeys([*session.entry_iris, *session.seeds]))
    present = workspace.works_among(iris)
    return ListCatalogue(workspace.describe_works([i for i in iris if i in present]))


def entry_from(suggestion: Suggestion) -> ListEntry:
    """A list entry for an accepted suggestion, its rationale taken from the explanation."""
    return ListEntry(
        iri=suggestion.iri, label=suggestion.record.label, rationale=suggestion.rationale
    )


def entry_for_work(workspace: Workspace, iri: str) -> ListEntry:
    """A list entry for a work added by hand (from browsing or search)."""
    record = workspace.index.record(iri)
    return ListEntry(iri=iri, label=record.label)


def state_folder() -> Path:
    """Where curator keeps recovery files (``CURATOR_STATE_DIR`` overrides it)."""
    return user_folder("state", "CURATOR_STATE_DIR")

def recovery_path() -> Path:
    return state_folder() / "recovery.curator.json"


def write_recovery(session: Session) -> Path:
    """Autosave: write the session to the recovery file (atomically)."""
    path = recovery_path()
    path.parent.mkdir(parents=True, exist_ok=True)
    session.save(path)
    return path


#: A temporary file of an autosave older than this was left by a run that was killed mid-write.
STALE_TEMP_SECONDS = 60.0


def unreadable_recovery_path() -> Path:
    """Where a recovery file that cannot be read is set aside (never overwritten by autosave)."""
    return state_folder() / "recovery.curator.json.unreadable"


def _remove_stale_temp_files() -> None:
    """Temporary files of autosaves that a killed run never finished (they hold nothing the
    recovery file does not: the rename is what makes a write count)."""
    folder = state_folder()
    prefix = f".{recovery_path().name}."
    now = time.time()
    with contextlib.suppress(OSError):
        for entry in folder.iterdir():
            if entry.name.startswith(prefix) and entry.name.endswith(TEMP_SUFFIX):
                with contextlib.suppress(OSError):
                    if now - entry.stat().st_mtime > STALE_TEMP_SECONDS:
                        entry.unlink()


def read_recovery() -> Session | None:
    """The session left by a run that did not end cleanly, if there is a readable one.

    A recovery file that cannot be read (damaged, or written by a newer curator) is moved to
    :func:`unreadable_recovery_path`, byte for byte, so that the next autosave does not
    overwrite the only copy of that work.
    """
    _remove_stale_temp_files()
    path = recovery_path()
    if not path.exists():
        return None
    try:
        return Session.load(path)
    except SessionError:
        with contextlib.suppress(OSError):
            os.replace(path, unreadable_recovery_path())
        return None


def clear_recovery() -> None:
    """Called on a clean exit or after the curator has decided about a recovered session."""
    with contextlib.suppress(FileNotFoundError):
        recovery_path().unlink()

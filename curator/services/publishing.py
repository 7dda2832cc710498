"""Auditing and publishing a list: a saved session or a list made elsewhere, against a catalogue."""

from __future__ import annotations

import json
from dataclasses import dataclass
from pathlib import Path

from curator.core.errors import CuratorError
from curator.core.explain import Explainer
from curator.core.export import EXPORT_FORMATS, write_export
from curator.core.outside_list import MatchReport, match_lines, read_outside_list
from curator.core.publication import Publication, build_publication
from curator.core.session import SESSION_FORMAT, Session
from curator.core.targets import Targets
from curator.services.workspace import Workspace


@dataclass(frozen=True)
class LoadedList:
    """A list to audit or publish: title, entries as (IRI, rationale, note), seeds."""

    title: str
    entries: tuple[tuple[str, str, str], ...]
    seeds: tuple[str, ...]
    labels: dict[str, str]
    report: MatchReport | None = None


def is_session_file(path: Path) -> bool:
    if path.suffix.lower() != ".json":
        return False
    try:
        head = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, json.JSONDecodeError):
        return path.name.endswith(".curator.json")
    return isinstance(head, dict) and head.get("format") == SESSION_FORMAT


def from_session(workspace: Workspace, session: Session) -> LoadedList:
    entries = fill_rationales(
        workspace, [(e.iri, e.rationale, e.note) for e in session.entries], session.seeds
    )
    return LoadedList(
        title=session.title,
        entries=tuple(entries),
        seeds=tuple(session.seeds),
        labels={e.iri: e.label for e in session.entries},
    )


def load_list(workspace: Workspace, path: Path) -> LoadedList:
    """A session file, or an outside list (CSV or plain text) matched to the catalogue.

    Raises:
        SessionError, OutsideListError: the file cannot be read.
    """
    path = Path(path)
    if is_session_file(path):
        return from_session(workspace, Session.load(path))
    report = match_lines(workspace.index, read_outside_list(path))
    iris = [workspace.index.works[p] for p in report.matched]
    entries = fill_rationales(workspace, [(iri, "", "") for iri in iris], ())
    title = path.stem.replace("_", " ").replace("-", " ").strip().capitalize() or "List"
    return LoadedList(title, tuple(entries), (), {}, report)


def fill_rationales(
    workspace: Workspace, entries: list[tuple[str, str, str]], seeds: tuple[str, ...] | list[str]
) -> list[tuple[str, str, str]]:
    """Entries with an empty rationale get one: what they share with the seeds and the rest."""
    index = workspace.index
    positions = [index.position[i] for i, _r, _n in entries if i in index.position]
    seed_positions = [index.position[s] for s in seeds if s in index.position]
    filled = []
    for iri, rationale, note in entries:
        if not rationale and iri in index.position:
            me = index.position[iri]
            others = [p for p in positions if p != me]
            explainer = Explainer(index, [s for s in seed_positions if s != me], others)
            themes = explainer.shared_themes(me)
            rationale = explainer.rationale(me, themes, explainer.path(me))
        filled.append((iri, rationale, note))
    return filled


def publication_for(
    workspace: Workspace, loaded: LoadedList, targets: Targets | None = None
) -> Publication:
    return build_publication(
        workspace.index,
        loaded.title,
        loaded.entries,
        seeds=loaded.seeds,
        targets=targets,
        labels=loaded.labels,
    )


def chart_svg(publication: Publication, targets: Targets | None = None) -> str | None:
    if publication.audit is None:
        return None
    from curator.core.charts import balance_figure, figure_svg  # matplotlib loads slowly

    requirements = targets.requirements if targets else ()
    return figure_svg(balance_figure(publication.audit, requirements))


def export_publication(
    publication: Publication, fmt: str, out: Path, targets: Targets | None = None
) -> None:
    """Write the publication in ``fmt`` to ``out`` (atomically).

    Raises:
        CuratorError: an unknown format, or the folder cannot be written.
    """
    if fmt not in EXPORT_FORMATS:
        raise CuratorError(
            f"Unknown export format {fmt!r}; use one of {', '.join(EXPORT_FORMATS)}."
        )
    out = Path(out)
    if not out.parent.exists():
        raise CuratorError(f"{out.parent}: no such folder to write {out.name} in.")
    try:
        if fmt == "pdf":
            from curator.publish.pdf import write_pdf

            write_pdf(publication, out, targets)
        else:
            svg = chart_svg(publication, targets) if fmt == "html" else None
            write_export(publication, fmt, out, chart_svg=svg)
    except OSError as exc:
        raise CuratorError(f"{out}: cannot be written ({exc.strerror or exc}).") from None

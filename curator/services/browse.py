"""Browsing the catalogue: searching titles, a work's details, the works that share a value."""

from __future__ import annotations

from dataclasses import dataclass

import pyoxigraph as ox

from curator.core.index import LITERAL_PREFIX, WorkRecord
from curator.core.labels import iri_tail
from curator.core.reading import node_key, sparql_iri
from curator.services.workspace import Workspace

#: Properties left out of the detail pane (they are shown elsewhere or say nothing to a person).
_HIDDEN = {"http://www.w3.org/1999/02/22-rdf-syntax-ns#type"}


@dataclass(frozen=True)
class WorkSummary:
    """A work as a line in a list: enough to tell it from others with the same title."""

    iri: str
    title: str
    creators: str
    year: int | None
    kind: str

    def line(self) -> str:
        parts = [p for p in (self.creators, str(self.year) if self.year else "", self.kind) if p]
        return f"{self.title} — {', '.join(parts)}" if parts else self.title


@dataclass(frozen=True)
class DetailValue:
    """One value in the detail pane; ``iri`` is set when it can be followed."""

    label: str
    iri: str | None
    works_sharing: int


@dataclass(frozen=True)
class DetailRow:
    property_label: str
    property_iri: str
    values: tuple[DetailValue, ...]


@dataclass(frozen=True)
class WorkDetails:
    summary: WorkSummary
    rows: tuple[DetailRow, ...]


@dataclass(frozen=True)
class EntityDetails:
    """A theme, creator, place or other linked thing, and the works that share it."""

    iri: str
    label: str
    kinds: tuple[str, ...]
    works: tuple[WorkSummary, ...]
    broader: tuple[DetailValue, ...]


def summarize(workspace: Workspace, record: WorkRecord) -> WorkSummary:
    index = workspace.index
    return WorkSummary(
        iri=record.iri,
        title=record.label,
        creators=", ".join(index.label(c) for c in record.creators[:2]),
        year=record.year,
        kind=index.label(record.kinds[0]) if record.kinds else "",
    )


def search_works(workspace: Workspace, text: str, limit: int = 20) -> list[WorkSummary]:
    """Works whose titles match ``text`` (accent- and case-insensitive, then near misses)."""
    index = workspace.index
    return [
        summarize(workspace, index.records[m.position])
        for m in workspace.finder.search(text, limit)
    ]


def _works_with_value(workspace: Workspace, value: str) -> list[int]:
    """Positions of works that have ``value`` directly under any theme or link path."""
    index = workspace.index
    columns = [j for j, f in enumerate(index.features) if f.value == value]
    found: set[int] = set()
    if columns:
        found.update(int(r) for r in index.direct[:, columns].nonzero()[0])
    for work, _path in index.creator_works.get(value, ()):
        found.add(index.position[work])
    for edge in index.work_links.get(value, ()):
        other = edge.target if edge.source == value else edge.source
        if other in index.position:
            found.add(index.position[other])
    return sorted(found, key=lambda i: (index.records[i].year or 0, index.records[i].label))


def work_details(workspace: Workspace, iri: str) -> WorkDetails:
    """Every statement about a work, labelled, with followable values marked."""
    index = workspace.index
    record = index.record(iri)
    grouped: dict[str, list[DetailValue]] = {}
    rows = workspace.catalogue.select(f"SELECT ?p ?o WHERE {{ <{sparql_iri(iri)}> ?p ?o }}")
    for prop, obj in rows:
        if prop is None or obj is None or prop.value in _HIDDEN:
            continue
        if isinstance(obj, ox.Literal):
            tag = f" [{obj.language}]" if obj.language else ""
            value = DetailValue(obj.value + tag, None, 0)
        elif isinstance(obj, ox.BlankNode):
            continue
        else:
            key = node_key(obj)
            shared = len(_works_with_value(workspace, key))
            value = DetailValue(index.label(key), key, shared)
        grouped.setdefault(prop.value, []).append(value)
    for column in index.direct[index.position[iri]].indices:
        feature = index.features[column]
        if " " in feature.path and not feature.value.startswith(LITERAL_PREFIX):
            shared = len(_works_with_value(workspace, feature.value))
            grouped.setdefault(feature.path, []).append(
                DetailValue(index.label(feature.value), feature.value, shared)
            )
    detail_rows = tuple(
        DetailRow(index.path_label(p), p, tuple(sorted(v, key=lambda d: d.label)))
        for p, v in sorted(grouped.items(), key=lambda kv: index.path_label(kv[0]))
    )
    return WorkDetails(summarize(workspace, record), detail_rows)


def entity_details(workspace: Workspace, iri: str, limit: int = 200) -> EntityDetails:
    """A linked thing, its broader things, and the works that have it."""
    index = workspace.index
    works = [summarize(workspace, index.records[i]) for i in _works_with_value(workspace, iri)]
    broader = tuple(
        DetailValue(index.label(p), p, len(_works_with_value(workspace, p)))
        for p in sorted(index.parents.get(iri, ()))
    )
    kinds = tuple(sorted(index.label(t) for t in index.types.get(iri, ())))
    return EntityDetails(
        iri, index.labels.get(iri) or iri_tail(iri), kinds, tuple(works[:limit]), broader
    )

"""What the window shows of a work, a suggestion or a catalogue, as plain records (no Qt).

Kept apart from the Qt models so that the wording (creator · year · kind) is decided in one place
and can be built in a worker thread, where Qt objects must not be touched.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Protocol

from curator.core.index import Index, WorkRecord
from curator.core.suggest import Suggestion
from curator.services.browse import WorkSummary
from curator.services.endpoint import EndpointWorkspace, profile_view
from curator.services.workspace import Workspace

#: How many creators a byline names before it stops.
CREATORS_SHOWN = 2


@dataclass(frozen=True)
class WorkLine:
    """A work as two lines of a list: its title and what tells it from namesakes."""

    iri: str
    title: str
    byline: str


@dataclass(frozen=True)
class Tag:
    """A shared theme drawn as a small rounded tag; ``broader`` when reached via the hierarchy."""

    label: str
    property_label: str
    broader: bool


@dataclass(frozen=True)
class CandidateRow:
    """One suggestion as the candidates list shows it, with the suggestion kept for accepting."""

    suggestion: Suggestion
    line: WorkLine
    relevance: float
    tags: tuple[Tag, ...]
    rationale: str
    path: str | None

    @property
    def iri(self) -> str:
        return self.line.iri


@dataclass(frozen=True)
class CatalogueChoices:
    """What the suggestion controls can offer for this catalogue."""

    kinds: tuple[tuple[str, str], ...]  # (IRI, label), sorted by label
    languages: tuple[str, ...]  # codes as the data gives them
    years: tuple[int, int] | None  # earliest and latest year, None if no work has one


class Indexed(Protocol):
    """A catalogue as this module reads it: an embedded workspace, or an endpoint workspace
    whose index is that of its latest suggestion (None before the first)."""

    @property
    def index(self) -> Index | None: ...


def byline(workspace: Indexed, record: WorkRecord) -> str:
    """Creator · year · kind, leaving out what the catalogue does not say."""
    assert workspace.index is not None
    return byline_in(workspace.index, record)


def byline_in(index: Index, record: WorkRecord) -> str:
    """:func:`byline` with the labels of ``index``."""
    label = index.label
    creators = ", ".join(label(c) for c in record.creators[:CREATORS_SHOWN])
    if len(record.creators) > CREATORS_SHOWN:
        creators += " and others"
    parts = [
        creators,
        str(record.year) if record.year is not None else "",
        label(record.kinds[0]) if record.kinds else "",
    ]
    return " · ".join(p for p in parts if p)


def work_line(workspace: Indexed | None, iri: str, fallback: str = "") -> WorkLine:
    """The two lines for ``iri``; a work this catalogue lacks keeps its saved label."""
    index = workspace.index if workspace is not None else None
    if index is not None and iri in index.position:
        record = index.record(iri)
        return WorkLine(iri, record.label, byline_in(index, record))
    return WorkLine(iri, fallback or iri, "not in the open catalogue")


def lines_of(index: Index | None, iris: list[str]) -> dict[str, WorkLine]:
    """The two lines of each of ``iris`` that ``index`` describes (for remembering what an
    endpoint said about the works of a list)."""
    if index is None:
        return {}
    return {
        iri: WorkLine(iri, index.record(iri).label, byline_in(index, index.record(iri)))
        for iri in iris
        if iri in index.position
    }


def summary_in(index: Index, record: WorkRecord) -> WorkSummary:
    """A search result's line, labelled by the small index the endpoint search built."""
    return WorkSummary(
        iri=record.iri,
        title=record.label,
        creators=", ".join(index.label(c) for c in record.creators[:CREATORS_SHOWN]),
        year=record.year,
        kind=index.label(record.kinds[0]) if record.kinds else "",
    )


def candidate_row(workspace: Indexed, suggestion: Suggestion) -> CandidateRow:
    record = suggestion.record
    tags = tuple(Tag(t.label, t.property_label, t.broader) for t in suggestion.shared_themes)
    return CandidateRow(
        suggestion=suggestion,
        line=WorkLine(record.iri, record.label, byline(workspace, record)),
        relevance=max(0.0, min(1.0, suggestion.relevance)),
        tags=tags,
        rationale=suggestion.rationale,
        path=suggestion.path.text if suggestion.path else None,
    )


def catalogue_choices(workspace: Workspace) -> CatalogueChoices:
    records = workspace.index.records
    label = workspace.index.label
    kind_iris = {k for r in records for k in r.kinds}
    kinds = tuple(sorted(((k, label(k)) for k in kind_iris), key=lambda kv: kv[1].casefold()))
    languages = tuple(sorted({lang for r in records for lang in r.languages}))
    years = [r.year for r in records if r.year is not None]
    return CatalogueChoices(kinds, languages, (min(years), max(years)) if years else None)


def endpoint_choices(workspace: EndpointWorkspace) -> CatalogueChoices:
    """The kinds an endpoint holds, labelled (a few queries: run it off the GUI thread).

    Languages and years would take a scan of every work, so the controls offer all of them.
    """
    counts = workspace.class_counts()
    labels = profile_view(workspace).index
    kinds = tuple(
        sorted(
            ((c, labels.label(c)) for c in workspace.profile.work_classes if counts.get(c)),
            key=lambda kv: kv[1].casefold(),
        )
    )
    return CatalogueChoices(kinds, (), None)

"""A list ready to publish: its entries with everything a reader needs, and its balance.

Built once from a session and an index, then written in any export format, so that every
format says the same thing.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass

from curator.core.audit import ListAudit, audit_list
from curator.core.index import Index
from curator.core.targets import (
    SUITABILITY_NOTE,
    TargetResult,
    Targets,
    audience_flags,
    check_targets,
    default_warnings,
)


@dataclass(frozen=True)
class PublishedEntry:
    position: int
    iri: str
    title: str
    creators: tuple[str, ...]
    year: int | None
    kind: str
    rationale: str
    note: str
    audience_flag: str = ""


@dataclass(frozen=True)
class Publication:
    title: str
    entries: tuple[PublishedEntry, ...]
    threads: tuple[str, ...]
    audit: ListAudit | None
    targets: tuple[TargetResult, ...]
    warnings: tuple[str, ...]
    suitability_note: str = ""

    @property
    def introduction(self) -> str:
        """A sentence naming what the list has in common, for the top of a handout."""
        count = len(self.entries)
        noun = "title" if count == 1 else "titles"
        if not self.threads:
            return f"{count} {noun}."
        threads = self.threads
        joined = (
            threads[0] if len(threads) == 1 else ", ".join(threads[:-1]) + " and " + threads[-1]
        )
        return f"{count} {noun} joined by {joined}."


def build_publication(
    index: Index,
    title: str,
    entries: Sequence[tuple[str, str, str]],
    *,
    seeds: Sequence[str] = (),
    targets: Targets | None = None,
    labels: dict[str, str] | None = None,
) -> Publication:
    """``entries`` are (IRI, rationale, note) in list order; works missing from the catalogue
    are published with the label given in ``labels`` and no facet data."""
    labels = labels or {}
    positions = [index.position[iri] for iri, _r, _n in entries if iri in index.position]
    seed_positions = [index.position[s] for s in seeds if s in index.position]
    audit = audit_list(index, positions, seed_positions) if positions else None
    allowed = targets.allowed_audiences if targets else ()
    flags = {f.iri: f.reason for f in audience_flags(index, positions, allowed)}
    published = []
    for number, (iri, rationale, note) in enumerate(entries, start=1):
        if iri in index.position:
            record = index.record(iri)
            published.append(
                PublishedEntry(
                    position=number,
                    iri=iri,
                    title=record.label,
                    creators=tuple(index.label(c) for c in record.creators),
                    year=record.year,
                    kind=index.label(record.kinds[0]) if record.kinds else "",
                    rationale=rationale,
                    note=note,
                    audience_flag=flags.get(iri, ""),
                )
            )
        else:
            published.append(
                PublishedEntry(number, iri, labels.get(iri, iri), (), None, "", rationale, note)
            )
    results = tuple(check_targets(index, audit, positions, targets)) if targets and audit else ()
    warnings = tuple(default_warnings(audit)) if audit else ()
    return Publication(
        title=title,
        entries=tuple(published),
        threads=tuple(common_threads(index, positions)),
        audit=audit,
        targets=results,
        warnings=warnings,
        suitability_note=SUITABILITY_NOTE if allowed else "",
    )


def common_threads(index: Index, positions: Sequence[int], limit: int = 3) -> list[str]:
    """The subject themes (direct or broader) held by the most entries, at least two each."""
    subject_paths = {t.path for t in index.profile.themes_with_role("subject", "genre")}
    counts: Counter[str] = Counter()
    for position in positions:
        row = index.raw[position]
        values = {
            index.features[c].value for c in row.indices if index.features[c].path in subject_paths
        }
        counts.update(values)
    shared = [(n, index.label(v)) for v, n in counts.items() if n >= 2]
    shared.sort(key=lambda nv: (-nv[0], nv[1]))
    return [
        label.lower() if label[:1].isupper() and label[1:2].islower() else label
        for _n, label in shared[:limit]
    ]

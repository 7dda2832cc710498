"""Checking a list for balance before it goes out.

For each facet a curator balances (kind, decade, language, creator, top- and second-level
themes, audience, place) the audit gives the distribution over the list's entries, its diversity
indices (:mod:`curator.core.diversity`), and who holds the largest share. Entries that lack a
facet's data are counted under "unknown", never dropped. It also gives the intra-list diversity
(mean pairwise dissimilarity; Ziegler et al. 2005) and how many of the seeds' themes the list
covers.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from curator.core.diversity import Diversity, diversity
from curator.core.index import Index, ancestors

UNKNOWN = "unknown"

#: Facets in the order a curator reads them, with their display names.
FACETS: dict[str, str] = {
    "kind": "Kind",
    "decade": "Decade",
    "language": "Language",
    "creator": "Creator",
    "theme": "Theme (broad)",
    "subtheme": "Theme (narrower)",
    "audience": "Audience",
    "place": "Place",
}


@dataclass(frozen=True)
class ValueShare:
    key: str
    label: str
    count: int
    share: float


@dataclass(frozen=True)
class FacetAudit:
    facet: str
    name: str
    values: tuple[ValueShare, ...]
    unknown: int
    diversity: Diversity

    @property
    def largest(self) -> ValueShare | None:
        known = [v for v in self.values if v.key != UNKNOWN]
        return max(known, key=lambda v: (v.count, v.label)) if known else None


@dataclass(frozen=True)
class ListAudit:
    entries: int
    facets: tuple[FacetAudit, ...]
    intra_list_diversity: float | None
    seed_themes: tuple[str, ...]
    covered_seed_themes: tuple[str, ...]

    def facet(self, name: str) -> FacetAudit:
        return next(f for f in self.facets if f.facet == name)

    @property
    def seed_theme_coverage(self) -> float | None:
        if not self.seed_themes:
            return None
        return len(self.covered_seed_themes) / len(self.seed_themes)


class FacetReader:
    """The facet values of works in one index (computed once per index)."""

    def __init__(self, index: Index) -> None:
        self.index = index
        profile = index.profile
        self._subject_paths = {t.path for t in profile.themes_with_role("subject")}
        self._place_paths = {t.path for t in profile.themes_with_role("place")}
        self._levels: dict[str, tuple[str | None, str | None]] = {}

    def _theme_levels(self, value: str) -> tuple[str | None, str | None]:
        """(top-level ancestor, second-level ancestor) of a theme value; itself when it is one."""
        found = self._levels.get(value)
        if found is not None:
            return found
        parents = self.index.parents
        chain = {value: 0, **ancestors(value, parents)}
        roots = [a for a in chain if not parents.get(a)]
        top = min(roots, key=lambda a: (-chain[a], a)) if roots else None
        second = None
        if top is not None and top != value:
            below = [a for a in chain if top in parents.get(a, ())]
            second = min(below, key=lambda a: (chain[a], a)) if below else None
        self._levels[value] = (top, second)
        return top, second

    def values(self, position: int, facet: str) -> list[str]:
        index = self.index
        record = index.records[position]
        if facet == "kind":
            return list(record.kinds[:1])
        if facet == "decade":
            return [f"{record.decade}s"] if record.decade is not None else []
        if facet == "language":
            return list(record.languages)
        if facet == "creator":
            return list(record.creators)
        if facet == "audience":
            return list(record.audiences)
        row = index.direct[position]
        direct = [index.features[c] for c in row.indices]
        if facet == "place":
            return sorted({f.value for f in direct if f.path in self._place_paths})
        if facet in ("theme", "subtheme"):
            found: set[str] = set()
            for feature in direct:
                if feature.path not in self._subject_paths:
                    continue
                top, second = self._theme_levels(feature.value)
                pick = top if facet == "theme" else second
                if pick is not None:
                    found.add(pick)
            return sorted(found)
        raise ValueError(f"unknown facet {facet!r}")

    def label(self, key: str) -> str:
        if key == UNKNOWN or (key.endswith("0s") and key[:-1].lstrip("-").isdigit()):
            return key
        return self.index.label(key)


def audit_list(
    index: Index,
    entries: Sequence[int],
    seeds: Sequence[int] = (),
    *,
    reader: FacetReader | None = None,
) -> ListAudit:
    """The balance of the works at ``entries`` (index positions), seeds used for coverage."""
    reader = reader or FacetReader(index)
    facets = []
    for facet, name in FACETS.items():
        counts: Counter[str] = Counter()
        unknown = 0
        for position in entries:
            values = reader.values(position, facet)
            if values:
                counts.update(values)
            else:
                unknown += 1
        if unknown:
            counts[UNKNOWN] += unknown
        total = sum(counts.values())
        ordered = sorted(counts.items(), key=lambda kv: (-kv[1], reader.label(kv[0])))
        values = tuple(
            ValueShare(key, reader.label(key), n, n / total if total else 0.0) for key, n in ordered
        )
        facets.append(FacetAudit(facet, name, values, unknown, diversity(list(counts.values()))))
    seed_themes = sorted({t for s in seeds for t in reader.values(s, "subtheme")})
    listed = {t for e in entries for t in reader.values(e, "subtheme")}
    return ListAudit(
        entries=len(entries),
        facets=tuple(facets),
        intra_list_diversity=intra_list_diversity(index, entries),
        seed_themes=tuple(seed_themes),
        covered_seed_themes=tuple(t for t in seed_themes if t in listed),
    )


def intra_list_diversity(index: Index, entries: Sequence[int]) -> float | None:
    """Mean of ``1 - cosine`` over all pairs of entries (Ziegler et al. 2005); None below two."""
    if len(entries) < 2:
        return None
    rows = index.vectors[list(entries)]
    sims = np.clip(np.asarray((rows @ rows.T).todense()), 0.0, 1.0)
    n = len(entries)
    upper = sims[np.triu_indices(n, k=1)]
    return float(np.mean(1.0 - upper))

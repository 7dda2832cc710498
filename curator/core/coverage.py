"""Suggestions that fill a list's gaps: coverage-aware re-ranking in the spirit of xQuAD.

xQuAD (Santos, Macdonald & Ounis 2010) picks, one at a time, the document that adds most
relevance plus coverage of the query's aspects not yet covered by what was picked. Our aspects
are the list's gaps: facet values a target asks for (films, a missing decade, a theme of a
branch with no work yet) or, without targets, kinds, decades and languages the candidates offer
but the list lacks. Each aspect has a need (how many more works it wants); a pick that has the
aspect lowers the need, and an aspect whose need is met stops counting, as xQuAD's product of
``1 - P(d|a)`` over the picks does for a binary ``P(d|a)``. Combined with maximal marginal
relevance, one greedy loop: ``lam * rel - (1 - lam) * redundancy + beta * sum of met needs``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from curator.core.audit import UNKNOWN, FacetReader
from curator.core.index import Index
from curator.core.labels import fold
from curator.core.targets import Targets

#: How much filling a gap counts against relevance when the switch is on.
DEFAULT_GAP_WEIGHT = 0.35


@dataclass
class Aspect:
    """A gap: works with this facet value are wanted, ``need`` more of them."""

    facet: str
    value: str
    label: str
    need: int
    weight: float = 1.0
    members: set[int] = field(default_factory=set)


def list_gaps(
    index: Index,
    entries: Sequence[int],
    pool: Sequence[int],
    targets: Targets | None = None,
    reader: FacetReader | None = None,
) -> list[Aspect]:
    """The aspects the list lacks, with their members among ``pool`` (index positions)."""
    reader = reader or FacetReader(index)
    aspects: list[Aspect] = []
    n = len(entries)

    def count(facet: str, keys: set[str]) -> int:
        return sum(1 for e in entries if keys & set(reader.values(e, facet)))

    def values_in_pool(facet: str) -> dict[str, set[int]]:
        found: dict[str, set[int]] = {}
        for p in pool:
            for v in reader.values(p, facet):
                found.setdefault(v, set()).add(p)
        return found

    if targets is not None:
        for req in targets.requirements:
            offered = values_in_pool(req.facet)
            if req.value is not None and (req.min_share is not None or req.min_count is not None):
                keys = {
                    k for k in offered if k == req.value or fold(reader.label(k)) == fold(req.value)
                }
                have = count(req.facet, keys) if keys else 0
                need = 0
                if req.min_count is not None:
                    need = max(need, req.min_count - have)
                if req.min_share is not None and req.min_share < 1:
                    need = max(need, int(np.ceil((req.min_share * n - have) / (1 - req.min_share))))
                if need > 0 and keys:
                    members = set().union(*(offered[k] for k in keys))
                    aspects.append(Aspect(req.facet, req.value, req.value, need, 1.0, members))
            if req.min_distinct is not None:
                present = {v for e in entries for v in reader.values(e, req.facet)}
                missing = max(0, req.min_distinct - len(present - {UNKNOWN}))
                if missing:
                    for key, members in offered.items():
                        if key not in present:
                            aspects.append(
                                Aspect(
                                    req.facet,
                                    key,
                                    reader.label(key),
                                    1,
                                    missing / max(1, len(offered)),
                                    members,
                                )
                            )
            if req.min_each is not None and req.branch:
                present = {v for e in entries for v in reader.values(e, "subtheme")}
                for key, members in values_in_pool("subtheme").items():
                    parents = index.parents.get(key, set())
                    if key not in present and any(
                        fold(index.label(p)) == fold(req.branch) for p in parents
                    ):
                        aspects.append(
                            Aspect("subtheme", key, reader.label(key), req.min_each, 1.0, members)
                        )
        return [a for a in aspects if a.members]
    for facet in ("kind", "decade", "language"):
        present = {v for e in entries for v in reader.values(e, facet)}
        offered = values_in_pool(facet)
        missing = {k: m for k, m in offered.items() if k not in present and k != UNKNOWN}
        for key, members in missing.items():
            aspects.append(Aspect(facet, key, reader.label(key), 1, 1.0 / len(missing), members))
    return aspects


def diversify_with_coverage(
    relevance: np.ndarray,
    similarity: np.ndarray,
    k: int,
    lam: float,
    *,
    already: np.ndarray | None = None,
    aspects: Sequence[Aspect] = (),
    members: Sequence[Sequence[int]] = (),
    beta: float = DEFAULT_GAP_WEIGHT,
) -> list[int]:
    """MMR with a coverage term. ``members[j]`` lists the candidate indices (rows of
    ``relevance``) that have aspect ``j``. With ``beta = 0`` or no aspects this is exactly
    :func:`curator.core.mmr.maximal_marginal_relevance`."""
    m = len(relevance)
    k = min(k, m)
    need = np.array([a.need for a in aspects], dtype=float)
    weight = np.array([a.weight for a in aspects], dtype=float)
    has = np.zeros((m, len(aspects)), dtype=bool)
    for j, rows in enumerate(members):
        has[list(rows), j] = True
    redundancy = already.max(axis=1) if already is not None and already.size else np.zeros(m)
    counted = already is not None and already.size > 0
    available = np.ones(m, dtype=bool)
    chosen: list[int] = []
    for _ in range(k):
        score = lam * relevance - ((1.0 - lam) * redundancy if counted else 0.0)
        if len(aspects):
            score = score + beta * (has & (need > 0)) @ weight
        score = np.where(available, score, -np.inf)
        pick = int(np.argmax(score))
        chosen.append(pick)
        available[pick] = False
        need = need - has[pick]
        redundancy = np.maximum(redundancy, similarity[:, pick])
        counted = True
    return chosen

"""From seeds to a short, varied, explained list of suggestions.

Pipeline: relevance of every work to the seeds (content, graph, their blend, or the shared-count
baseline) -> filters and exclusions -> a pool of the most relevant -> maximal marginal relevance
against the seeds, the list so far and the picks so far -> an explanation for each pick.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from typing import Literal, get_args

import numpy as np
import scipy.sparse as sp

from curator.core.audit import FacetReader
from curator.core.coverage import DEFAULT_GAP_WEIGHT, diversify_with_coverage, list_gaps
from curator.core.errors import SettingsError
from curator.core.explain import ConnectingPath, Explainer, SharedTheme
from curator.core.index import Index, WorkRecord
from curator.core.labels import fold, iri_tail
from curator.core.mmr import maximal_marginal_relevance
from curator.core.similarity import (
    PAGERANK_ALPHA,
    personalized_pagerank,
    personalized_pagerank_push,
)
from curator.core.targets import Targets

Mode = Literal["blend", "content", "graph", "shared-count"]
MODES: tuple[str, ...] = get_args(Mode)

#: Default trade-off between relevance and variety. Chosen on the demo collection so that a
#: top 10 spans several creators and decades while staying on theme.
DEFAULT_LAMBDA = 0.7
#: Share of the content score in the blend; the rest is the graph score. Content carries the
#: themes a curator names; the graph adds what is two or three links away.
DEFAULT_CONTENT_SHARE = 0.6


@dataclass(frozen=True)
class SuggestSettings:
    """What to suggest and how; every field has a sensible default."""

    mode: Mode = "blend"
    lam: float = DEFAULT_LAMBDA
    limit: int = 10
    content_share: float = DEFAULT_CONTENT_SHARE
    kinds: tuple[str, ...] = ()
    year_from: int | None = None
    year_to: int | None = None
    languages: tuple[str, ...] = ()
    #: Property of the shared-count mode (default: the first subject-like theme property).
    shared_property: str | None = None
    #: How many of the most relevant candidates MMR chooses from.
    pool_size: int = 300
    #: Share of the best relevance a candidate needs to enter the pool at all.
    relevance_floor: float = 0.1
    #: How much resemblance to a seed counts as redundancy (1 = like a list entry).
    seed_redundancy: float = 0.5
    #: How strongly resemblance to a dismissed work lowers relevance.
    dismissed_penalty: float = 0.5
    #: Exact power iteration for the graph part instead of forward push (slower).
    exact_graph: bool = False
    #: Favour candidates that fill the list's gaps (unmet targets, or missing kinds, decades
    #: and languages when there are no targets); see :mod:`curator.core.coverage`.
    fill_gaps: bool = False
    gap_weight: float = DEFAULT_GAP_WEIGHT
    targets: Targets | None = None

    def checked(self) -> SuggestSettings:
        """The same settings, or a :class:`SettingsError` naming the field that is off."""
        if self.mode not in MODES:
            raise SettingsError(f"mode {self.mode!r} is unknown; use one of {', '.join(MODES)}.")
        if not 0.0 <= self.lam <= 1.0:
            raise SettingsError(f"lambda must be between 0 and 1, not {self.lam}.")
        if self.limit < 1:
            raise SettingsError(f"limit must be at least 1, not {self.limit}.")
        if not 0.0 <= self.content_share <= 1.0:
            raise SettingsError("content_share must be between 0 and 1.")
        if (
            self.year_from is not None
            and self.year_to is not None
            and self.year_from > self.year_to
        ):
            raise SettingsError(f"the year range {self.year_from}-{self.year_to} is empty.")
        return self


@dataclass(frozen=True)
class Suggestion:
    """One suggested work, its scores and why it is there."""

    position: int
    record: WorkRecord
    score: float
    relevance: float
    content: float
    graph: float
    shared_themes: tuple[SharedTheme, ...]
    path: ConnectingPath | None
    rationale: str

    @property
    def iri(self) -> str:
        return self.record.iri


@dataclass(frozen=True)
class SuggestionResult:
    seeds: tuple[WorkRecord, ...]
    suggestions: tuple[Suggestion, ...]
    settings: SuggestSettings
    notes: tuple[str, ...] = field(default=())


class Suggester:
    """Suggests from one index; cheap to call many times (the index is read, never changed)."""

    def __init__(self, index: Index) -> None:
        self.index = index
        self._incidence: dict[str, sp.csr_matrix] = {}
        self._degree = np.asarray(index.graph.sum(axis=1)).ravel()
        self._reader: FacetReader | None = None
        #: Labels of the gaps the last gap-filling suggestion aimed at.
        self.last_gaps: tuple[str, ...] = ()

    def _facet_reader(self) -> FacetReader:
        if self._reader is None:
            self._reader = FacetReader(self.index)
        return self._reader

    # ----- relevance -------------------------------------------------------------------

    def content_scores(self, seeds: Sequence[int]) -> np.ndarray:
        """Mean cosine similarity of every work to the seeds (TF-IDF vectors)."""
        vectors = self.index.vectors
        centroid = np.asarray(vectors[list(seeds)].mean(axis=0)).ravel()
        return np.clip(vectors @ centroid, 0.0, 1.0)

    def graph_scores(self, seeds: Sequence[int], *, exact: bool = False) -> np.ndarray:
        """Personalized PageRank mass of every work, restarting uniformly at the seeds."""
        graph = self.index.graph
        personalization = np.zeros(graph.shape[0])
        personalization[list(seeds)] = 1.0
        if graph.nnz == 0:
            return np.zeros(self.index.size)
        if exact:
            ranks = personalized_pagerank(graph, personalization, alpha=PAGERANK_ALPHA)
        else:
            ranks = personalized_pagerank_push(
                graph, personalization, alpha=PAGERANK_ALPHA, degree=self._degree
            )
        return ranks[: self.index.size]

    def set_incidence(self, prop: str, incidence: sp.csr_matrix) -> None:
        """Give the shared-count mode the work x value matrix of a property outside the themes."""
        self._incidence[prop] = incidence

    def incidence(self, prop: str) -> sp.csr_matrix:
        found = self._incidence.get(prop)
        if found is not None:
            return found
        index = self.index
        columns = [j for j, f in enumerate(index.features) if f.path == prop]
        if not columns:
            raise SettingsError(
                f"<{prop}> is not a theme property of this catalogue's profile; name one of: "
                + ", ".join(f"<{t.path}>" for t in index.profile.themes)
            )
        found = sp.csr_matrix(index.direct[:, columns])
        self._incidence[prop] = found
        return found

    def default_shared_property(self) -> str:
        for role in ("subject", "genre", "other", "creator"):
            themes = self.index.profile.themes_with_role(role)
            if themes:
                return themes[0].path
        raise SettingsError("This catalogue has no theme property to count shared values of.")

    # ----- filters -----------------------------------------------------------------------

    def allowed(self, settings: SuggestSettings) -> np.ndarray:
        """Mask of works that pass the kind, year and language filters."""
        index = self.index
        mask = np.ones(index.size, dtype=bool)
        if settings.kinds:
            wanted = resolve_kinds(index, settings.kinds)
            mask &= np.array([bool(set(r.kinds) & wanted) for r in index.records])
        if settings.year_from is not None or settings.year_to is not None:
            low = settings.year_from if settings.year_from is not None else -10**6
            high = settings.year_to if settings.year_to is not None else 10**6
            mask &= np.array(
                [r.year is not None and low <= r.year <= high for r in index.records]
            )
        if settings.languages:
            wanted_langs = {fold(lang) for lang in settings.languages}
            mask &= np.array(
                [
                    any(
                        fold(lang) in wanted_langs or fold(lang).split(" ")[0] in wanted_langs
                        for lang in r.languages
                    )
                    for r in index.records
                ]
            )
        return mask

    # ----- the whole job ---------------------------------------------------------------

    def suggest(
        self,
        seeds: Sequence[int],
        settings: SuggestSettings | None = None,
        *,
        list_items: Sequence[int] = (),
        dismissed: Sequence[int] = (),
    ) -> SuggestionResult:
        """Suggestions for ``seeds`` (positions in the index), given the list and dismissals.

        Raises:
            SettingsError: no seeds, or settings out of range.
        """
        settings = (settings or SuggestSettings()).checked()
        seeds = list(dict.fromkeys(seeds))
        if not seeds:
            raise SettingsError("Give at least one seed work.")
        index = self.index
        n = index.size
        list_items = [i for i in dict.fromkeys(list_items) if i not in seeds]
        dismissed = list(dict.fromkeys(dismissed))
        excluded = np.zeros(n, dtype=bool)
        excluded[seeds] = True
        excluded[list_items] = True
        excluded[dismissed] = True
        allowed = self.allowed(settings) & ~excluded
        notes: list[str] = []

        if settings.mode == "shared-count":
            prop = settings.shared_property or self.default_shared_property()
            counts = shared_counts_for(self.incidence(prop), seeds)
            candidates = np.flatnonzero(allowed & (counts > 0))
            order = sorted(candidates, key=lambda i: (-counts[i], index.works[i]))
            chosen = order[: settings.limit]
            content = self.content_scores(seeds)
            scores = {i: float(counts[i]) for i in chosen}
            relevance = {i: float(counts[i]) for i in chosen}
            graph = np.zeros(n)
            notes.append(
                f"Ranked by values of <{prop}> shared with the seeds (no diversification)."
            )
        else:
            content = self.content_scores(seeds)
            graph = (
                self.graph_scores(seeds, exact=settings.exact_graph)
                if settings.mode != "content"
                else np.zeros(n)
            )
            rel = _combine(settings, content, graph, allowed)
            if dismissed:
                penalty = index.vectors @ index.vectors[dismissed].T
                rel = rel - settings.dismissed_penalty * np.asarray(
                    penalty.max(axis=1).todense()
                ).ravel()
            floor = settings.relevance_floor * float(rel[allowed].max()) if allowed.any() else 0.0
            candidates = np.flatnonzero(allowed & (rel > max(floor, 0.0)))
            if candidates.size > settings.pool_size:
                top = np.argpartition(-rel[candidates], settings.pool_size)[: settings.pool_size]
                candidates = candidates[top]
            candidates = np.array(
                sorted(candidates, key=lambda i: (-rel[i], index.works[i])), dtype=np.int64
            )
            chosen, scores, relevance = self._diversify(
                candidates, rel, settings, seeds, list_items
            )

        if settings.fill_gaps and settings.mode != "shared-count":
            gaps = ", ".join(self.last_gaps[:6]) or "none found"
            notes.append(f"Favouring works that fill the list's gaps: {gaps}.")
        explainer = Explainer(index, seeds, list_items)
        suggestions = []
        for position in chosen:
            themes = explainer.shared_themes(position)
            path = explainer.path(position)
            suggestions.append(
                Suggestion(
                    position=int(position),
                    record=index.records[position],
                    score=scores[position],
                    relevance=relevance[position],
                    content=float(content[position]),
                    graph=float(graph[position]),
                    shared_themes=tuple(themes),
                    path=path,
                    rationale=explainer.rationale(position, themes, path),
                )
            )
        if not suggestions:
            notes.append("Nothing in the catalogue fits these seeds and filters.")
        return SuggestionResult(
            seeds=tuple(index.records[s] for s in seeds),
            suggestions=tuple(suggestions),
            settings=settings,
            notes=tuple(notes),
        )

    def _diversify(
        self,
        candidates: np.ndarray,
        rel: np.ndarray,
        settings: SuggestSettings,
        seeds: Sequence[int],
        list_items: Sequence[int],
    ) -> tuple[list[int], dict[int, float], dict[int, float]]:
        if candidates.size == 0:
            return [], {}, {}
        vectors = self.index.vectors
        pool = vectors[candidates]
        top = float(rel[candidates].max())
        relevance = rel[candidates] / top if top > 0 else rel[candidates]
        similarity = np.clip(np.asarray((pool @ pool.T).todense()), 0.0, 1.0)
        context = [*seeds, *list_items]
        already = np.clip(np.asarray((pool @ vectors[context].T).todense()), 0.0, 1.0)
        # Relevance already measures closeness to the seeds; counting it again in full as
        # redundancy would make every lambda below 0.5 prefer the least relevant works.
        already[:, : len(seeds)] *= settings.seed_redundancy
        if settings.fill_gaps:
            row_of = {int(c): r for r, c in enumerate(candidates)}
            aspects = list_gaps(
                self.index, list_items, [int(c) for c in candidates], settings.targets,
                self._facet_reader(),
            )
            self.last_gaps = tuple(a.label for a in aspects)
            picks = diversify_with_coverage(
                relevance,
                similarity,
                settings.limit,
                settings.lam,
                already=already,
                aspects=aspects,
                members=[[row_of[m] for m in a.members if m in row_of] for a in aspects],
                beta=settings.gap_weight,
            )
        else:
            picks = maximal_marginal_relevance(
                relevance, similarity, settings.limit, settings.lam, already=already
            )
        chosen = [int(candidates[p]) for p in picks]
        scores: dict[int, float] = {}
        redundancy = already.max(axis=1) if already.size else np.zeros(len(candidates))
        for p in picks:
            scores[int(candidates[p])] = float(
                settings.lam * relevance[p] - (1 - settings.lam) * redundancy[p]
            )
            redundancy = np.maximum(redundancy, similarity[:, p])
        return chosen, scores, {int(candidates[p]): float(relevance[p]) for p in picks}


def shared_counts_for(incidence: sp.csr_matrix, seeds: Sequence[int]) -> np.ndarray:
    from curator.core.baseline import shared_counts

    return shared_counts(incidence, seeds)


def _combine(
    settings: SuggestSettings, content: np.ndarray, graph: np.ndarray, allowed: np.ndarray
) -> np.ndarray:
    """Relevance by mode; in the blend each part is scaled to its best allowed value first."""
    if settings.mode == "content":
        return content
    if settings.mode == "graph":
        return graph

    def scaled(values: np.ndarray) -> np.ndarray:
        peak = values[allowed].max() if allowed.any() else 0.0
        return values / peak if peak > 0 else values

    share = settings.content_share
    return share * scaled(content) + (1.0 - share) * scaled(graph)


def resolve_kinds(index: Index, names: Sequence[str]) -> set[str]:
    """Work classes meant by ``names`` (IRIs, ``prefix:Local`` names or labels), with subclasses.

    Raises:
        SettingsError: a name matches no kind of work in the catalogue.
    """
    known = sorted({k for r in index.records for k in r.kinds})
    children: dict[str, set[str]] = {}
    for child, parents in index.class_parents.items():
        for parent in parents:
            children.setdefault(parent, set()).add(child)
    wanted: set[str] = set()
    for name in names:
        local = fold(name.rsplit("/", 1)[-1].rsplit("#", 1)[-1].split(":")[-1]).replace(" ", "")
        hits = {
            k
            for k in {*known, *children}
            if k == name
            or fold(index.label(k)) == fold(name)
            or fold(iri_tail(k)).replace(" ", "") == local
        }
        if not hits:
            labels = ", ".join(sorted({index.label(k) for k in known}))
            raise SettingsError(f"No kind of work is called {name!r}; the catalogue has: {labels}.")
        stack = list(hits)
        while stack:
            current = stack.pop()
            if current in wanted:
                continue
            wanted.add(current)
            stack.extend(children.get(current, ()))
    return wanted


def with_limit(settings: SuggestSettings, limit: int) -> SuggestSettings:
    return replace(settings, limit=limit)

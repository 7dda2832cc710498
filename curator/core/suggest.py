"""From seeds to a short, varied, explained list of suggestions.

Pipeline: relevance of every work to the seeds (content, graph, their blend, or the shared-count
baseline) -> filters and exclusions -> a pool of the most relevant -> maximal marginal relevance
against the seeds, the list so far and the picks so far -> an explanation for each pick.
"""

from __future__ import annotations

import itertools
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
from curator.core.reading import sparql_iri
from curator.core.similarity import (
    PAGERANK_ALPHA,
    PushOperator,
    personalized_pagerank,
    personalized_pagerank_push,
    push_operator,
)
from curator.core.targets import Targets
from curator.core.versions import other_versions

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
    #: Suggest other versions of the seeds and list entries too (a reading or edition of the
    #: same title by the same creator, see :mod:`curator.core.versions`); when off they are
    #: left out, and the notes name them.
    other_versions: bool = False

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
        if self.shared_property is not None:
            try:
                sparql_iri(self.shared_property)
            except ValueError:
                raise SettingsError(
                    f"property {self.shared_property!r} is not an IRI (it holds a space, a "
                    "quote, a bracket or a control character); give the property's full IRI."
                ) from None
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
        # Built on first use: what the graph and content scores and the orderings read.
        self._push: PushOperator | None = None
        self._by_column: tuple[sp.csc_matrix, bool] | None = None
        self._by_column_known = False
        self._rank: np.ndarray | None = None
        self._incidence_columns: dict[str, tuple[sp.csr_matrix, sp.csc_matrix]] = {}
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
        centroid = self._centroid(seeds)
        by_column = self._columns()
        if by_column is None:
            return np.clip(vectors @ centroid, 0.0, 1.0)
        # Only the works that share a feature with the seeds can score: add up the columns of
        # the seeds' features rather than multiply every row. Each row's terms are added in the
        # order the row keeps them, as the full product does, so the sums are the same to the
        # last bit.
        csc, descending = by_column
        columns = np.flatnonzero(centroid)
        indptr, indices, data = csc.indptr, csc.indices, csc.data
        if 6 * int((indptr[columns + 1] - indptr[columns]).sum()) > vectors.nnz:
            return np.clip(vectors @ centroid, 0.0, 1.0)  # the full product is quicker
        scores = np.zeros(vectors.shape[0])
        for j in (columns[::-1] if descending else columns).tolist():
            start, end = indptr[j], indptr[j + 1]
            scores[indices[start:end]] += data[start:end] * centroid[j]
        return np.clip(scores, 0.0, 1.0, out=scores)

    def _centroid(self, seeds: Sequence[int]) -> np.ndarray:
        """The mean of the seeds' vectors, as a dense row."""
        vectors = self.index.vectors
        if len(seeds) != 1:
            return np.asarray(vectors[list(seeds)].mean(axis=0)).ravel()
        # One seed: its own row (the mean of one row is that row, to the last bit).
        start, end = vectors.indptr[seeds[0]], vectors.indptr[seeds[0] + 1]
        centroid = np.zeros(vectors.shape[1])
        centroid[vectors.indices[start:end]] = vectors.data[start:end]
        return centroid

    def _columns(self) -> tuple[sp.csc_matrix, bool] | None:
        """The vectors by column, and whether each row keeps its features in falling column
        order (else rising); None when the rows keep no one order."""
        if not self._by_column_known:
            self._by_column_known = True
            vectors = self.index.vectors
            steps = np.diff(vectors.indices)
            inside = np.ones(len(steps), dtype=bool)
            ends = vectors.indptr[1:-1] - 1
            inside[ends[(ends >= 0) & (ends < len(steps))]] = False
            steps = steps[inside]
            if (steps < 0).all():
                self._by_column = (vectors.tocsc(), True)
            elif (steps > 0).all():
                self._by_column = (vectors.tocsc(), False)
        return self._by_column

    def graph_scores(self, seeds: Sequence[int], *, exact: bool = False) -> np.ndarray:
        """Personalized PageRank mass of every work, restarting uniformly at the seeds."""
        graph = self.index.graph
        personalization = dict.fromkeys((int(s) for s in seeds), 1.0)
        if graph.nnz == 0:
            return np.zeros(self.index.size)
        if exact:
            ranks = personalized_pagerank(graph, personalization, alpha=PAGERANK_ALPHA)
        else:
            if self._push is None:
                self._push = push_operator(graph, self._degree, PAGERANK_ALPHA)
            ranks = personalized_pagerank_push(
                graph, personalization, alpha=PAGERANK_ALPHA, operator=self._push
            )
        return ranks[: self.index.size]

    def _work_rank(self) -> np.ndarray:
        """Each work's place among the works sorted by IRI (ties in relevance go by IRI)."""
        if self._rank is None:
            works = self.index.works
            if all(a < b for a, b in itertools.pairwise(works)):
                self._rank = np.arange(len(works))
            else:
                order = sorted(range(len(works)), key=works.__getitem__)
                self._rank = np.empty(len(works), dtype=np.int64)
                self._rank[order] = np.arange(len(works))
        return self._rank

    def _by_relevance(self, candidates: np.ndarray, values: np.ndarray) -> np.ndarray:
        """``candidates`` by falling value, ties by IRI."""
        return candidates[np.lexsort((self._work_rank()[candidates], -values[candidates]))]

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
        if not settings.other_versions and settings.mode != "shared-count":
            # (shared-count ranks as the SPARQL baseline does: every work but the seeds)
            versions = [v for v in other_versions(index, [*seeds, *list_items]) if allowed[v]]
            if versions:
                allowed[versions] = False
                names = ", ".join(f"‘{index.records[v].label}’" for v in sorted(versions)[:4])
                more = f" and {len(versions) - 4} more" if len(versions) > 4 else ""
                notes.append(
                    f"Left out other versions of the starting titles and list: {names}{more}."
                )

        if settings.mode == "shared-count":
            prop = settings.shared_property or self.default_shared_property()
            counts = self._shared_counts(prop, seeds)
            candidates = np.flatnonzero(allowed & (counts > 0))
            chosen = [int(i) for i in self._top(candidates, counts, settings.limit)]
            content = np.zeros(n)
            if chosen:
                content[chosen] = self._content_of(seeds, chosen)
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
            floor = settings.relevance_floor * _peak(rel, allowed)
            candidates = np.flatnonzero(allowed & (rel > max(floor, 0.0)))
            if candidates.size > settings.pool_size:
                top = np.argpartition(-rel[candidates], settings.pool_size)[: settings.pool_size]
                candidates = candidates[top]
            candidates = self._by_relevance(candidates.astype(np.int64), rel)
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

    def _shared_counts(self, prop: str, seeds: Sequence[int]) -> np.ndarray:
        """As :func:`shared_counts_for`, column by column (counts are whole numbers, so adding
        them in another order gives the same)."""
        incidence = self.incidence(prop)
        if not sp.isspmatrix_csr(incidence) or len(incidence.data) == 0:
            return shared_counts_for(incidence, seeds)
        by_column = self._incidence_columns.get(prop)
        if by_column is None or by_column[0] is not incidence:
            by_column = self._incidence_columns[prop] = (incidence, incidence.tocsc())
        csc = by_column[1]
        if len(seeds) == 1:
            start, end = incidence.indptr[seeds[0]], incidence.indptr[seeds[0] + 1]
            weights = np.zeros(incidence.shape[1])
            np.add.at(weights, incidence.indices[start:end], incidence.data[start:end])
        else:
            weights = np.asarray(incidence[list(seeds)].sum(axis=0)).ravel()
        counts = np.zeros(incidence.shape[0])
        for j in np.flatnonzero(weights).tolist():
            start, end = csc.indptr[j], csc.indptr[j + 1]
            counts[csc.indices[start:end]] += csc.data[start:end] * weights[j]
        return counts

    def _top(self, candidates: np.ndarray, values: np.ndarray, k: int) -> np.ndarray:
        """The first ``k`` of ``candidates`` by falling value, ties by IRI, without sorting
        them all."""
        if candidates.size > 4 * k:
            kth = np.partition(-values[candidates], k - 1)[k - 1]
            above = candidates[-values[candidates] < kth]
            level = candidates[-values[candidates] == kth]
            level = level[np.argsort(self._work_rank()[level], kind="stable")[: k - above.size]]
            candidates = np.concatenate([above, level])
        return self._by_relevance(candidates.astype(np.int64), values)[:k]

    def _content_of(self, seeds: Sequence[int], rows: Sequence[int]) -> np.ndarray:
        """:meth:`content_scores` of some works only: each row's products added one after
        the other in the row's order, as the full product adds them."""
        vectors = self.index.vectors
        centroid = self._centroid(seeds)
        indptr, indices, data = vectors.indptr, vectors.indices, vectors.data
        scores = np.zeros(len(rows))
        for k, row in enumerate(rows):
            start, end = indptr[row], indptr[row + 1]
            if end > start:
                scores[k] = np.cumsum(data[start:end] * centroid[indices[start:end]])[-1]
        return np.clip(scores, 0.0, 1.0)

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
        top = float(rel[candidates].max())
        relevance = rel[candidates] / top if top > 0 else rel[candidates]
        context = [*seeds, *list_items]
        pool = _Pool(vectors, candidates)
        similarity: np.ndarray | _Pool
        if settings.fill_gaps:
            rows = vectors[candidates]
            similarity = np.clip(np.asarray((rows @ rows.T).todense()), 0.0, 1.0)
        else:
            similarity = pool
        already = pool.against(context)
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
            column = similarity(p) if isinstance(similarity, _Pool) else similarity[:, p]
            redundancy = np.maximum(redundancy, column)
        return chosen, scores, {int(candidates[p]): float(relevance[p]) for p in picks}


class _Pool:
    """Cosine similarities of a pool of candidates (rows of the unit TF-IDF vectors), worked
    out a column at a time: ``pool(j)`` is column ``j`` of ``clip(P @ P.T, 0, 1)``, and
    ``against(rows)`` the similarities to other works. MMR reads only the columns of its picks,
    a few out of hundreds.

    Each similarity is the row's products added one after the other in the order the row keeps
    its features, as the sparse product adds them, so the values are the same to the last bit.
    """

    def __init__(self, vectors: sp.csr_matrix, rows: np.ndarray) -> None:
        self.vectors = vectors
        indptr = vectors.indptr
        starts = indptr[rows].astype(np.int64)
        lengths = (indptr[rows + 1] - indptr[rows]).astype(np.int64)
        width = int(lengths.max()) if len(lengths) else 0
        # Each row's features left-aligned in a table, padded with a column of zeros.
        offsets = np.arange(width)
        inside = offsets[None, :] < lengths[:, None]
        slots = (starts[:, None] + offsets[None, :])[inside]
        self.columns = np.full((len(rows), width), vectors.shape[1], dtype=np.int64)
        self.values = np.zeros((len(rows), width))
        self.columns[inside] = vectors.indices[slots]
        self.values[inside] = vectors.data[slots]
        self.rows = rows
        self._dense = np.zeros(vectors.shape[1] + 1)
        self._found: dict[int, np.ndarray] = {}

    def _similarity_to(self, row: int) -> np.ndarray:
        vectors = self.vectors
        start, end = vectors.indptr[row], vectors.indptr[row + 1]
        features = vectors.indices[start:end]
        self._dense[features] = vectors.data[start:end]
        products = self.values * self._dense[self.columns]
        self._dense[features] = 0.0
        if products.shape[1] == 0:
            return np.zeros(len(self.rows))
        # A running sum along each row adds its terms one after the other, left to right.
        total = np.cumsum(products, axis=1)[:, -1]
        return np.clip(total, 0.0, 1.0, out=total)

    def __call__(self, j: int) -> np.ndarray:
        found = self._found.get(j)
        if found is None:
            found = self._found[j] = self._similarity_to(int(self.rows[j]))
        return found

    def against(self, rows: Sequence[int]) -> np.ndarray:
        """Similarities of the pool (rows) to other works (columns)."""
        table = np.zeros((len(self.rows), len(rows)))
        for k, row in enumerate(rows):
            table[:, k] = self._similarity_to(int(row))
        return table


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
        peak = _peak(values, allowed)
        return values / peak if peak > 0 else values

    share = settings.content_share
    return share * scaled(content) + (1.0 - share) * scaled(graph)


def _peak(values: np.ndarray, allowed: np.ndarray) -> float:
    """The largest of the allowed values (0 when none is allowed), without copying them out."""
    if not allowed.any():
        return 0.0
    return float(np.max(values, where=allowed, initial=-np.inf))


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

"""The index: every work as a weighted feature vector and as a node of an item-entity graph.

Built once per catalogue and profile, then read by the suggester many times. Features are
(property path, value) pairs; a value's hierarchy ancestors are added with a decay per level so
that a work about *lighthouses* and one about *harbours* meet under *the sea*. The graph joins
works to their values, values to their broader values, works to linked works and creators to
the creators they are linked with; a random walk over it finds works two or three steps away.
"""

from __future__ import annotations

import re
from collections import defaultdict
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
import scipy.sparse as sp

from curator.core.catalogue import Catalogue
from curator.core.labels import LabelCandidate, best_label, fold, iri_tail
from curator.core.profile import PROPERTY_WORDS, Profile, ThemeProperty
from curator.core.progress import Progress, silent
from curator.core.reading import (
    LABEL_PROPERTIES,
    WorkStatements,
    read_edges,
    read_labels,
    read_outgoing,
    read_types,
    read_works,
    subclass_pairs,
)
from curator.core.similarity import tfidf_vectors
from curator.core.vocab import BF, SCHEMA, SCHEMA_HTTP

_YEAR = re.compile(r"(-?\d{4})")
#: Deepest hierarchy level followed upwards; deeper chains are cut (and cycles are harmless).
MAX_ANCESTOR_LEVELS = 8
LITERAL_PREFIX = '"'
#: Classes too general to name a work's kind when the data gives a narrower one as well.
GENERIC_WORK_CLASSES = frozenset(
    {SCHEMA.CreativeWork, SCHEMA_HTTP.CreativeWork, BF.Work, "http://purl.org/vocab/frbr/core#Work"}
)


@dataclass(frozen=True)
class Feature:
    """One column: a value (node key, or ``"text`` for a literal) reached through a path."""

    path: str
    value: str


@dataclass(frozen=True)
class WorkRecord:
    """What a curator sees of a work in a list: title, kind, creators, year, language."""

    iri: str
    label: str
    titles: tuple[str, ...]
    kinds: tuple[str, ...]
    creators: tuple[str, ...]
    year: int | None
    languages: tuple[str, ...]
    audiences: tuple[str, ...]

    @property
    def decade(self) -> int | None:
        return None if self.year is None else self.year - self.year % 10


@dataclass(frozen=True)
class Edge:
    """A typed link used to explain a suggestion: ``source --path--> target``."""

    source: str
    path: str
    target: str


@dataclass
class Index:
    """Everything the suggester needs, in memory, with no reference back to the store."""

    profile: Profile
    works: list[str]
    position: dict[str, int]
    records: list[WorkRecord]
    features: list[Feature]
    raw: sp.csr_matrix
    direct: sp.csr_matrix
    idf: np.ndarray
    column_weights: np.ndarray
    vectors: sp.csr_matrix
    graph: sp.csr_matrix
    graph_nodes: list[str]
    labels: dict[str, str]
    types: dict[str, set[str]]
    #: work -> typed links to other works, both directions
    work_links: dict[str, list[Edge]] = field(default_factory=dict)
    #: work -> (creator, path) pairs and creator -> (work, path) pairs
    work_creators: dict[str, list[tuple[str, str]]] = field(default_factory=dict)
    creator_works: dict[str, list[tuple[str, str]]] = field(default_factory=dict)
    creator_links: dict[str, list[Edge]] = field(default_factory=dict)
    parents: dict[str, set[str]] = field(default_factory=dict)
    #: class -> its superclasses (rdfs:subClassOf), for filters that name a broad kind
    class_parents: dict[str, set[str]] = field(default_factory=dict)
    triple_count: int = 0

    @property
    def size(self) -> int:
        return len(self.works)

    def label(self, key: str) -> str:
        """The best label of a node, property or literal feature value."""
        if key.startswith(LITERAL_PREFIX):
            return key[1:]
        found = self.labels.get(key)
        if found:
            return found
        return PROPERTY_WORDS.get(key) or iri_tail(key)

    def path_label(self, path: str) -> str:
        """Words for a property path: the data's label, our word for it, or its IRI's tail."""
        if path in PROPERTY_WORDS:
            return PROPERTY_WORDS[path]
        last = path.rsplit(" ", 1)[-1]
        return self.labels.get(path) or self.labels.get(last) or iri_tail(last)

    def record(self, iri: str) -> WorkRecord:
        return self.records[self.position[iri]]

    def theme_for(self, path: str) -> ThemeProperty | None:
        return self.profile.theme(path)


def build_index(
    catalogue: Catalogue,
    profile: Profile,
    *,
    statements: WorkStatements | None = None,
    types: dict[str, set[str]] | None = None,
    progress: Progress | None = None,
) -> Index:
    """Read the catalogue through ``profile`` and build the matrices and the graph.

    Raises:
        Cancelled: the progress token was cancelled.
    """
    progress = progress or silent()
    if statements is None:
        statements = read_works(
            catalogue, profile.work_classes, profile.instance_links, progress.part(0.0, 0.4)
        )
    progress.report("Reading labels", 0.4)
    label_props = tuple(dict.fromkeys((*profile.label_properties, *LABEL_PROPERTIES)))
    candidates = read_labels(catalogue, label_props)
    types = types if types is not None else read_types(catalogue)
    progress.report("Reading hierarchy", 0.5)
    parents = _read_parents(catalogue, profile.hierarchy)
    progress.report("Building features", 0.6)
    works = statements.works
    position = {w: i for i, w in enumerate(works)}
    labels = {key: best_label(c, profile.languages) or "" for key, c in candidates.items()}
    records = _records(statements, profile, works, candidates, labels, types)
    progress.report("Building features", 0.7)
    features, raw, direct, weights = _feature_matrix(statements, profile, position, parents)
    vectors, idf = tfidf_vectors(raw, weights)
    progress.report("Building graph", 0.8)
    creators = {c for r in records for c in r.creators}
    creator_edges = _creator_edges(catalogue, profile, creators)
    graph, nodes = _graph(statements, profile, works, parents, creator_edges)
    index = Index(
        profile=profile,
        works=works,
        position=position,
        records=records,
        features=features,
        raw=raw,
        direct=direct,
        idf=idf,
        column_weights=weights,
        vectors=vectors,
        graph=graph,
        graph_nodes=nodes,
        labels=labels,
        types=types,
        parents=parents,
        class_parents=_class_parents(catalogue),
        triple_count=catalogue.triple_count,
    )
    _explanation_tables(index, statements, creator_edges)
    progress.report("Index ready", 1.0)
    return index


def _read_parents(catalogue: Catalogue, hierarchy: Sequence[str]) -> dict[str, set[str]]:
    parents: dict[str, set[str]] = defaultdict(set)
    for prop in hierarchy:
        inverse = prop.startswith("^")
        for a, _p, b in read_edges(catalogue, [prop.lstrip("^")]):
            child, parent = (b, a) if inverse else (a, b)
            if child != parent:
                parents[child].add(parent)
    return dict(parents)


def _class_parents(catalogue: Catalogue) -> dict[str, set[str]]:
    found: dict[str, set[str]] = defaultdict(set)
    for child, parent in subclass_pairs(catalogue):
        found[child].add(parent)
    return dict(found)


def ancestors(value: str, parents: Mapping[str, set[str]]) -> dict[str, int]:
    """Every broader value of ``value`` with its smallest distance in levels (cycles are safe)."""
    found: dict[str, int] = {}
    frontier = [value]
    for level in range(1, MAX_ANCESTOR_LEVELS + 1):
        following = []
        for node in frontier:
            for parent in parents.get(node, ()):
                if parent != value and parent not in found:
                    found[parent] = level
                    following.append(parent)
        if not following:
            break
        frontier = following
    return found


def _literal_key(lexical: str) -> str:
    return LITERAL_PREFIX + " ".join(lexical.split()).lower()


def _theme_values(
    statements: WorkStatements, themes: Mapping[str, ThemeProperty]
) -> Iterable[tuple[str, str, str]]:
    """(work, path, value key) for every theme statement, literals given a text key."""
    for work, path, obj in statements.links:
        if path in themes:
            yield work, path, obj
    for work, path, lexical, _lang in statements.literals:
        if path in themes and lexical.strip():
            yield work, path, _literal_key(lexical)


def _feature_matrix(
    statements: WorkStatements,
    profile: Profile,
    position: Mapping[str, int],
    parents: Mapping[str, set[str]],
) -> tuple[list[Feature], sp.csr_matrix, sp.csr_matrix, np.ndarray]:
    themes = {t.path: t for t in profile.themes}
    column: dict[Feature, int] = {}
    cells: dict[tuple[int, int], float] = {}
    direct_cells: set[tuple[int, int]] = set()
    ancestor_cache: dict[str, dict[str, int]] = {}
    decay = profile.hierarchy_decay

    def col(feature: Feature) -> int:
        found = column.get(feature)
        if found is None:
            found = column[feature] = len(column)
        return found

    for work, path, value in _theme_values(statements, themes):
        row = position[work]
        key = (row, col(Feature(path, value)))
        cells[key] = 1.0
        direct_cells.add(key)
        if value.startswith(LITERAL_PREFIX) or decay <= 0:
            continue
        ups = ancestor_cache.get(value)
        if ups is None:
            ups = ancestor_cache[value] = ancestors(value, parents)
        for ancestor, level in ups.items():
            akey = (row, col(Feature(path, ancestor)))
            cells[akey] = max(cells.get(akey, 0.0), decay**level)
    features = list(column)
    shape = (len(position), len(features))
    raw = _sparse(cells, shape)
    direct = _sparse(dict.fromkeys(direct_cells, 1.0), shape)
    weights = np.array([themes[f.path].weight for f in features], dtype=np.float64)
    return features, raw, direct, weights


def _sparse(cells: Mapping[tuple[int, int], float], shape: tuple[int, int]) -> sp.csr_matrix:
    if not cells:
        return sp.csr_matrix(shape, dtype=np.float64)
    keys = np.fromiter((k for pair in cells for k in pair), dtype=np.int64).reshape(-1, 2)
    values = np.fromiter(cells.values(), dtype=np.float64, count=len(cells))
    return sp.csr_matrix((values, (keys[:, 0], keys[:, 1])), shape=shape)


def _records(
    statements: WorkStatements,
    profile: Profile,
    works: Sequence[str],
    candidates: Mapping[str, list[LabelCandidate]],
    labels: Mapping[str, str],
    types: Mapping[str, set[str]],
) -> list[WorkRecord]:
    creator_paths = [t.path for t in profile.themes_with_role("creator")]
    creator_rank = {p: i for i, p in enumerate(creator_paths)}
    creators: dict[str, list[tuple[int, str]]] = defaultdict(list)
    audiences: dict[str, list[str]] = defaultdict(list)
    languages: dict[str, list[str]] = defaultdict(list)
    years: dict[str, list[tuple[int, int]]] = defaultdict(list)
    year_rank = {p: i for i, p in enumerate(profile.year_properties)}
    audience_paths = set(profile.audience_properties)
    language_paths = set(profile.language_properties)
    for work, path, obj in statements.links:
        if path in creator_rank:
            creators[work].append((creator_rank[path], obj))
        if path in audience_paths:
            audiences[work].append(obj)
        if path in language_paths:
            languages[work].append(labels.get(obj) or iri_tail(obj))
    for work, path, lexical, _lang in statements.literals:
        if path in year_rank:
            match = _YEAR.search(lexical)
            if match:
                years[work].append((year_rank[path], int(match.group(1))))
        if path in language_paths:
            languages[work].append(lexical.strip().lower())
        if path in audience_paths:
            audiences[work].append(_literal_key(lexical))
    work_classes = set(profile.work_classes)
    records = []
    for work in works:
        kinds = sorted(types.get(work, set()) & work_classes)
        if len(kinds) > 1:
            kinds = [k for k in kinds if k not in GENERIC_WORK_CLASSES] or kinds
        titles = tuple(dict.fromkeys(c.text for c in candidates.get(work, ()) if c.text.strip()))
        label = labels.get(work) or (titles[0] if titles else iri_tail(work))
        year_values = sorted(years.get(work, []))
        records.append(
            WorkRecord(
                iri=work,
                label=label,
                titles=titles or (label,),
                kinds=tuple(kinds),
                creators=tuple(dict.fromkeys(c for _r, c in sorted(creators.get(work, [])))),
                year=min(y for r, y in year_values if r == year_values[0][0])
                if year_values
                else None,
                languages=tuple(dict.fromkeys(languages.get(work, []))),
                audiences=tuple(dict.fromkeys(audiences.get(work, []))),
            )
        )
    return records


def _creator_edges(
    catalogue: Catalogue, profile: Profile, creators: set[str]
) -> list[tuple[str, str, str, float]]:
    weights = {link.path: link.weight for link in profile.creator_links}
    if not weights or not creators:
        return []
    return [
        (a, p, b, weights[p])
        for a, p, b in read_outgoing(catalogue, sorted(creators))
        if p in weights and b in creators and a != b
    ]


def _graph(
    statements: WorkStatements,
    profile: Profile,
    works: Sequence[str],
    parents: Mapping[str, set[str]],
    creator_edges: Sequence[tuple[str, str, str, float]],
) -> tuple[sp.csr_matrix, list[str]]:
    """The undirected item-entity graph; works are the first ``len(works)`` nodes."""
    node: dict[str, int] = {w: i for i, w in enumerate(works)}
    rows: list[int] = []
    cols: list[int] = []
    vals: list[float] = []

    def add(a: str, b: str, weight: float) -> None:
        if weight <= 0 or a == b:
            return
        ia = node.setdefault(a, len(node))
        ib = node.setdefault(b, len(node))
        rows.append(ia)
        cols.append(ib)
        vals.append(weight)

    themes = {t.path: t for t in profile.themes}
    values_seen: set[str] = set()
    for work, path, value in _theme_values(statements, themes):
        add(work, value, themes[path].weight)
        values_seen.add(value)
    decay = profile.hierarchy_decay
    frontier = set(values_seen)
    linked: set[str] = set()
    while frontier:
        following = set()
        for child in frontier:
            for parent in parents.get(child, ()):
                add(child, parent, decay)
                if parent not in linked and parent not in values_seen:
                    following.add(parent)
            linked.add(child)
        frontier = following - linked
    links = {link.path: link.weight for link in profile.work_links}
    work_set = set(node[w] for w in works)
    for work, path, obj in statements.links:
        if path in links and obj in node and node[obj] in work_set:
            add(work, obj, links[path])
    for a, _p, b, weight in creator_edges:
        add(a, b, weight)
    n = len(node)
    matrix = sp.coo_matrix((vals, (rows, cols)), shape=(n, n)).tocsr()
    symmetric = (matrix + matrix.T).tocsr()
    symmetric.sum_duplicates()
    names = [""] * n
    for key, i in node.items():
        names[i] = key
    return symmetric, names


def _explanation_tables(
    index: Index,
    statements: WorkStatements,
    creator_edges: Sequence[tuple[str, str, str, float]],
) -> None:
    links = {link.path for link in index.profile.work_links}
    creator_paths = {t.path for t in index.profile.themes_with_role("creator")}
    work_links: dict[str, list[Edge]] = defaultdict(list)
    work_creators: dict[str, list[tuple[str, str]]] = defaultdict(list)
    creator_works: dict[str, list[tuple[str, str]]] = defaultdict(list)
    for work, path, obj in statements.links:
        if path in links and obj in index.position:
            edge = Edge(work, path, obj)
            work_links[work].append(edge)
            work_links[obj].append(edge)
        elif path in creator_paths:
            work_creators[work].append((obj, path))
            creator_works[obj].append((work, path))
    creator_links: dict[str, list[Edge]] = defaultdict(list)
    for a, p, b, _w in creator_edges:
        edge = Edge(a, p, b)
        creator_links[a].append(edge)
        creator_links[b].append(edge)
    index.work_links = dict(work_links)
    index.work_creators = dict(work_creators)
    index.creator_works = dict(creator_works)
    index.creator_links = dict(creator_links)


def folded_titles(index: Index) -> list[tuple[str, int]]:
    """(folded title, work position) for every title variant, for matching typed titles."""
    return [(fold(t), i) for i, r in enumerate(index.records) for t in r.titles]

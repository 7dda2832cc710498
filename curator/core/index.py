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
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
import scipy.sparse as sp

from curator.core.catalogue import Catalogue
from curator.core.labels import LabelCandidate, best_label, fold, iri_tail
from curator.core.memory import return_freed_memory
from curator.core.profile import PROPERTY_WORDS, Profile, ThemeProperty
from curator.core.progress import Progress, silent
from curator.core.reading import (
    LABEL_PROPERTIES,
    CatalogueReader,
    StatementColumns,
    WorkStatements,
)
from curator.core.similarity import document_frequency, tfidf_vectors
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


#: Given the feature columns and their document frequencies among the works indexed, the
#: frequencies in the whole collection and its number of works (endpoint mode indexes a
#: neighbourhood of the seeds but weighs themes by the whole catalogue).
FrequencySource = Callable[[Sequence[Feature], np.ndarray], tuple[np.ndarray, int]]


def build_index(
    catalogue: Catalogue,
    profile: Profile,
    *,
    statements: WorkStatements | None = None,
    types: dict[str, set[str]] | None = None,
    progress: Progress | None = None,
    reader: CatalogueReader | None = None,
    frequencies: FrequencySource | None = None,
) -> Index:
    """Read the catalogue through ``profile`` and build the matrices and the graph.

    ``statements``, ``types`` and a ``reader`` that read them may be passed in when the caller
    has them already (profile detection reads the same). ``frequencies``, when given, says how
    many works of the whole collection have each feature (see :data:`FrequencySource`): the
    idf then comes from there rather than from the works at hand.

    Raises:
        Cancelled: the progress token was cancelled.
    """
    progress = progress or silent()
    reader = reader or CatalogueReader(catalogue)
    if statements is None:
        statements = reader.work_statements(
            profile.work_classes, profile.instance_links, progress.part(0.0, 0.4)
        )
    progress.report("Reading labels", 0.4)
    label_props = tuple(dict.fromkeys((*profile.label_properties, *LABEL_PROPERTIES)))
    candidates = reader.labels(label_props)
    types = types if types is not None else reader.types()
    progress.report("Reading hierarchy", 0.5)
    parents = _read_parents(reader, profile.hierarchy)
    progress.report("Building features", 0.6)
    works = statements.works
    position = {w: i for i, w in enumerate(works)}
    labels = _best_labels(candidates, profile.languages)
    columns = statements.columns()
    records = _records(columns, profile, works, candidates, labels, types)
    del candidates
    reader.forget_labels()
    return_freed_memory()
    progress.report("Building features", 0.7)
    features, raw, direct, weights = _feature_matrix(columns, profile, parents)
    if frequencies is None:
        vectors, idf = tfidf_vectors(raw, weights)
    else:
        df, n_documents = frequencies(features, document_frequency(raw))
        vectors, idf = tfidf_vectors(raw, weights, frequencies=df, n_documents=n_documents)
    progress.report("Building graph", 0.8)
    creators = {c for r in records for c in r.creators}
    creator_edges = _creator_edges(reader, profile, creators)
    graph, nodes = _graph(columns, profile, parents, creator_edges)
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
        class_parents=_class_parents(reader),
        triple_count=catalogue.triple_count,
    )
    _explanation_tables(index, columns, creator_edges)
    progress.report("Index ready", 1.0)
    return index


def _best_labels(
    candidates: Mapping[str, list[LabelCandidate]], languages: Sequence[str]
) -> dict[str, str]:
    """The label to show for every node (one candidate needs no choosing)."""
    return {
        key: (c[0].text if len(c) == 1 else best_label(c, languages)) or ""
        for key, c in candidates.items()
    }


def _read_parents(reader: CatalogueReader, hierarchy: Sequence[str]) -> dict[str, set[str]]:
    parents: dict[str, set[str]] = defaultdict(set)
    for prop in hierarchy:
        inverse = prop.startswith("^")
        for a, _p, b in reader.edges([prop.lstrip("^")]):
            child, parent = (b, a) if inverse else (a, b)
            if child != parent:
                parents[child].add(parent)
    return dict(parents)


def _class_parents(reader: CatalogueReader) -> dict[str, set[str]]:
    found: dict[str, set[str]] = defaultdict(set)
    for child, parent in reader.subclass_pairs():
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


@dataclass
class _ThemeRows:
    """Every theme statement as (work, path, value) numbers: first the links, then the literals
    (given a text key), in statement order. Values number ``keys``: the statements' node values
    first, then literal keys and anything added later (ancestors)."""

    work: np.ndarray
    path: np.ndarray
    value: np.ndarray
    keys: list[str]
    lookup: dict[str, int] | None = None

    def number(self, key: str) -> int:
        """The number of a value key, adding it when new."""
        if self.lookup is None:
            self.lookup = {k: i for i, k in enumerate(self.keys)}
        found = self.lookup.get(key)
        if found is None:
            found = self.lookup[key] = len(self.keys)
            self.keys.append(key)
        return found


def _theme_rows(columns: StatementColumns, themes: Mapping[str, ThemeProperty]) -> _ThemeRows:
    is_theme = columns.path_ids(themes)
    links = is_theme[columns.link_path]
    literals = np.flatnonzero(is_theme[columns.literal_path])
    keys = list(columns.values)
    literal_keys: dict[int, int] = {}
    lookup: dict[str, int] = {}
    lexicals = columns.lexicals
    for x in np.unique(columns.literal_lexical[literals]).tolist():
        lexical = lexicals[x]
        if lexical.strip():
            key = _literal_key(lexical)
            found = lookup.get(key)
            if found is None:
                found = lookup[key] = len(keys)
                keys.append(key)
            literal_keys[x] = found
    literal_values = np.array(
        [literal_keys.get(x, -1) for x in columns.literal_lexical[literals].tolist()],
        dtype=np.int64,
    )
    kept = literals[literal_values >= 0]
    return _ThemeRows(
        work=np.concatenate([columns.link_work[links], columns.literal_work[kept]]),
        path=np.concatenate([columns.link_path[links], columns.literal_path[kept]]),
        value=np.concatenate([columns.link_value[links], literal_values[literal_values >= 0]]),
        keys=keys,
    )


def _first_appearance(keys: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The distinct keys in order of first appearance, and each entry's number among them."""
    distinct, first, inverse = np.unique(keys, return_index=True, return_inverse=True)
    order = np.argsort(first, kind="stable")
    number = np.empty(len(distinct), dtype=np.int64)
    number[order] = np.arange(len(distinct))
    return distinct[order], number[inverse.ravel()]


def _feature_matrix(
    columns: StatementColumns,
    profile: Profile,
    parents: Mapping[str, set[str]],
) -> tuple[list[Feature], sp.csr_matrix, sp.csr_matrix, np.ndarray]:
    """Works x features: 1 for a value a work has, ``decay ** level`` for an ancestor of one
    (the larger when both), columns in order of first appearance (a value, then its
    ancestors, statement by statement).

    Worked out on the distinct (path, value) pairs, a few tens of thousands however large the
    catalogue; only the cells themselves are as many as the statements and their ancestors.
    """
    themes = {t.path: t for t in profile.themes}
    rows = _theme_rows(columns, themes)
    n_works = columns.n_works
    if len(rows.work) and int(rows.work.max()) >= n_works:
        missing = columns.keys[int(rows.work.max())]
        raise KeyError(missing)
    decay = profile.hierarchy_decay
    n_keys = max(1, len(rows.keys))
    # The distinct (path, value) pairs, each with the first statement that has it.
    pair_keys, first_row, pair_of_row = np.unique(
        rows.path.astype(np.int64) * n_keys + rows.value, return_index=True, return_inverse=True
    )
    pair_of_row = pair_of_row.ravel().astype(np.int32)
    pair_path = (pair_keys // n_keys).tolist()
    pair_value = (pair_keys % n_keys).tolist()
    # Each pair's cells in the order a statement reaches them: the value, then its ancestors
    # (as features of the same path), with their levels. Keys are numbered as features below.
    n_node_values = len(columns.values)
    ups_of: dict[int, dict[str, int]] = {}
    entry_path: list[int] = []
    entry_value: list[int] = []
    entry_level: list[int] = []
    entry_start = [0]
    for path, value in zip(pair_path, pair_value, strict=True):
        entry_path.append(path)
        entry_value.append(value)
        entry_level.append(0)
        if decay > 0 and parents and value < n_node_values:
            ups = ups_of.get(value)
            if ups is None:
                ups = ups_of[value] = ancestors(rows.keys[value], parents)
            for ancestor, level in ups.items():
                entry_path.append(path)
                entry_value.append(rows.number(ancestor))
                entry_level.append(level)
        entry_start.append(len(entry_path))
    n_keys = max(1, len(rows.keys))  # ancestors may have added keys
    keys = np.array(entry_path, dtype=np.int64) * n_keys + np.array(entry_value, dtype=np.int64)
    levels = np.array(entry_level, dtype=np.int8)
    starts = np.array(entry_start, dtype=np.int64)
    sizes = np.diff(starts)
    # Where each feature first appears: (first statement of the pair, place in its cells).
    place = np.arange(len(keys)) - np.repeat(starts[:-1], sizes)
    appears = np.repeat(first_row.astype(np.int64), sizes) * (MAX_ANCESTOR_LEVELS + 2) + place
    order = np.lexsort((appears, keys))  # by key, then where it appears
    is_first = np.ones(len(order), dtype=bool)
    is_first[1:] = keys[order][1:] != keys[order][:-1]
    distinct = keys[order][is_first]  # sorted
    by_appearance = np.argsort(appears[order][is_first], kind="stable")
    feature_keys = distinct[by_appearance]
    column_of_distinct = np.empty(len(distinct), dtype=np.int32)
    column_of_distinct[by_appearance] = np.arange(len(distinct), dtype=np.int32)
    entry_column = column_of_distinct[np.searchsorted(distinct, keys)]
    paths = columns.paths
    features = [
        Feature(paths[k // n_keys], rows.keys[k % n_keys]) for k in feature_keys.tolist()
    ]
    strength = np.array(
        [1.0, *(decay**level for level in range(1, MAX_ANCESTOR_LEVELS + 1))], dtype=np.float64
    )
    shape = (n_works, len(features))
    # Every cell of every statement: the work, the column, the level (0 for the value itself).
    per_row = sizes[pair_of_row]
    slot = np.repeat(starts[:-1][pair_of_row], per_row)
    slot += np.arange(len(slot)) - np.repeat(np.cumsum(per_row) - per_row, per_row)
    cells = np.repeat(rows.work.astype(np.int64), per_row) * max(1, len(features))
    cells += entry_column[slot]
    cell_level = levels[slot]
    del slot, per_row
    raw, direct = _cells(cells, cell_level, strength, shape)
    path_weight = np.array([themes[p].weight if p in themes else 0.0 for p in paths])
    weights = (
        path_weight[feature_keys // n_keys].astype(np.float64)
        if len(feature_keys)
        else np.zeros(0)
    )
    return features, raw, direct, weights


def _cells(
    cells: np.ndarray, levels: np.ndarray, strength: np.ndarray, shape: tuple[int, int]
) -> tuple[sp.csr_matrix, sp.csr_matrix]:
    """The matrix of the cells (``row * columns + column``), each holding the strength of its
    lowest level, and the matrix of the cells reached at level 0, holding 1."""
    if len(cells) == 0:
        empty = sp.csr_matrix(shape, dtype=np.float64)
        return empty, empty.copy()
    # Cell and level in one number, sorted in place: each cell's lowest level comes first.
    tagged = cells * 16 + levels
    tagged.sort()
    cell = tagged >> 4
    first = np.empty(len(tagged), dtype=bool)
    first[0] = True
    np.not_equal(cell[1:], cell[:-1], out=first[1:])
    cell = cell[first]
    lowest = (tagged[first] & 15).astype(np.int8)
    del tagged, first
    width = max(1, shape[1])
    row = cell // width
    column = (cell % width).astype(np.int32)
    raw = _csr(row, column, strength[lowest], shape)
    at_zero = lowest == 0
    direct = _csr(row[at_zero], column[at_zero], np.ones(int(at_zero.sum())), shape)
    return raw, direct


def _csr(
    row: np.ndarray, column: np.ndarray, data: np.ndarray, shape: tuple[int, int]
) -> sp.csr_matrix:
    """A CSR matrix of entries already sorted by row and column, none twice."""
    index_type = np.int32 if len(data) < 2**31 and shape[1] < 2**31 else np.int64
    indptr = np.zeros(shape[0] + 1, dtype=index_type)
    np.cumsum(np.bincount(row, minlength=shape[0]), out=indptr[1:])
    matrix = sp.csr_matrix((data, column.astype(index_type, copy=False), indptr), shape=shape)
    matrix.has_sorted_indices = True
    return matrix


def _records(
    columns: StatementColumns,
    profile: Profile,
    works: Sequence[str],
    candidates: Mapping[str, list[LabelCandidate]],
    labels: Mapping[str, str],
    types: Mapping[str, set[str]],
) -> list[WorkRecord]:
    creator_paths = [t.path for t in profile.themes_with_role("creator")]
    creator_rank = {p: i for i, p in enumerate(creator_paths)}
    year_rank = {p: i for i, p in enumerate(profile.year_properties)}
    audience_paths = set(profile.audience_properties)
    language_paths = set(profile.language_properties)
    paths, values, lexicals = columns.paths, columns.values, columns.lexicals
    creators: dict[int, list[tuple[int, str]]] = defaultdict(list)
    audiences: dict[int, list[str]] = defaultdict(list)
    languages: dict[int, list[str]] = defaultdict(list)
    years: dict[int, list[tuple[int, int]]] = defaultdict(list)

    def link_rows(wanted: Mapping[str, object] | set[str]) -> zip[tuple[int, int, int]]:
        keep = columns.path_ids(wanted)[columns.link_path]
        return zip(
            columns.link_work[keep].tolist(),
            columns.link_path[keep].tolist(),
            columns.link_value[keep].tolist(),
            strict=True,
        )

    def literal_rows(wanted: Mapping[str, object] | set[str]) -> zip[tuple[int, int, int]]:
        keep = columns.path_ids(wanted)[columns.literal_path]
        return zip(
            columns.literal_work[keep].tolist(),
            columns.literal_path[keep].tolist(),
            columns.literal_lexical[keep].tolist(),
            strict=True,
        )

    # Each kind of row in statement order, links before literals, as the lists were read.
    if creator_rank:
        rank_of = [creator_rank.get(p, -1) for p in paths]
        for w, p, v in link_rows(creator_rank):
            creators[w].append((rank_of[p], values[v]))
    if audience_paths:
        for w, _p, v in link_rows(audience_paths):
            audiences[w].append(values[v])
    if language_paths:
        language_names: dict[int, str] = {}
        for w, _p, v in link_rows(language_paths):
            name = language_names.get(v)
            if name is None:
                name = language_names[v] = labels.get(values[v]) or iri_tail(values[v])
            languages[w].append(name)
    if year_rank:
        year_of: dict[int, int | None] = {}
        rank_of = [year_rank.get(p, -1) for p in paths]
        for w, p, x in literal_rows(year_rank):
            if x in year_of:
                year = year_of[x]
            else:
                match = _YEAR.search(lexicals[x])
                year = year_of[x] = int(match.group(1)) if match else None
            if year is not None:
                years[w].append((rank_of[p], year))
    if language_paths:
        for w, _p, x in literal_rows(language_paths):
            languages[w].append(lexicals[x].strip().lower())
    if audience_paths:
        for w, _p, x in literal_rows(audience_paths):
            audiences[w].append(_literal_key(lexicals[x]))
    work_classes = set(profile.work_classes)
    records = []
    no_types: set[str] = set()
    for i, work in enumerate(works):
        classes = types.get(work, no_types)
        if len(classes) == 1:
            kinds = [c for c in classes if c in work_classes]
        else:
            kinds = sorted(classes & work_classes)
            if len(kinds) > 1:
                kinds = [k for k in kinds if k not in GENERIC_WORK_CLASSES] or kinds
        found = candidates.get(work, ())
        if len(found) == 1:
            text = found[0].text
            titles: tuple[str, ...] = (text,) if text.strip() else ()
        else:
            titles = tuple(dict.fromkeys(c.text for c in found if c.text.strip()))
        label = labels.get(work) or (titles[0] if titles else iri_tail(work))
        year_values = years.get(i)
        if year_values is None:
            year = None
        elif len(year_values) == 1:
            year = year_values[0][1]
        else:
            year_values.sort()
            year = min(y for r, y in year_values if r == year_values[0][0])
        found_creators = creators.get(i)
        if found_creators is None:
            creator_keys: tuple[str, ...] = ()
        elif len(found_creators) == 1:
            creator_keys = (found_creators[0][1],)
        else:
            creator_keys = tuple(dict.fromkeys(c for _r, c in sorted(found_creators)))
        records.append(
            WorkRecord(
                iri=work,
                label=label,
                titles=titles or (label,),
                kinds=tuple(kinds),
                creators=creator_keys,
                year=year,
                languages=_distinct(languages.get(i)),
                audiences=_distinct(audiences.get(i)),
            )
        )
    return records


def _distinct(items: list[str] | None) -> tuple[str, ...]:
    """The items in order, each once."""
    if not items:
        return ()
    if len(items) == 1:
        return (items[0],)
    return tuple(dict.fromkeys(items))


def _creator_edges(
    reader: CatalogueReader, profile: Profile, creators: set[str]
) -> list[tuple[str, str, str, float]]:
    weights = {link.path: link.weight for link in profile.creator_links}
    if not weights or not creators:
        return []
    return [
        (a, p, b, weights[p])
        for a, p, b in reader.outgoing(sorted(creators))
        if p in weights and b in creators and a != b
    ]


def _graph(
    columns: StatementColumns,
    profile: Profile,
    parents: Mapping[str, set[str]],
    creator_edges: Sequence[tuple[str, str, str, float]],
) -> tuple[sp.csr_matrix, list[str]]:
    """The undirected item-entity graph; works are the first ``len(works)`` nodes, then the
    values of the themes in order of first appearance, then what the hierarchy and the links
    between creators add."""
    themes = {t.path: t for t in profile.themes}
    rows = _theme_rows(columns, themes)
    n_works = columns.n_works
    works = columns.keys[:n_works]
    path_weight = np.array([themes[p].weight if p in themes else 0.0 for p in columns.paths])
    # A value that is itself a work keeps the work's node.
    value_work = np.full(len(rows.keys), -1, dtype=np.int64)
    position = {w: i for i, w in enumerate(works)}
    for v, key in enumerate(rows.keys):
        found = position.get(key)
        if found is not None:
            value_work[v] = found
    weight = path_weight[rows.path]
    kept = (weight > 0) & (value_work[rows.value] != rows.work)
    edge_work, edge_value, edge_weight = rows.work[kept], rows.value[kept], weight[kept]
    # Node numbers of the values, in order of first appearance (works keep their own).
    is_value = value_work[edge_value] < 0
    distinct = _first_appearance(edge_value[is_value])[0]
    value_node = np.full(len(rows.keys), -1, dtype=np.int64)
    value_node[distinct] = n_works + np.arange(len(distinct))
    value_node[value_work >= 0] = value_work[value_work >= 0]
    node: dict[str, int] = {w: i for i, w in enumerate(works)}
    for v in distinct.tolist():
        node[rows.keys[v]] = len(node)
    source: list[np.ndarray] = [edge_work]
    target: list[np.ndarray] = [value_node[edge_value]]
    strength: list[np.ndarray] = [edge_weight]

    extra_a: list[int] = []
    extra_b: list[int] = []
    extra_w: list[float] = []

    def add(a: str, b: str, w: float) -> None:
        if w <= 0 or a == b:
            return
        ia = node.setdefault(a, len(node))
        ib = node.setdefault(b, len(node))
        extra_a.append(ia)
        extra_b.append(ib)
        extra_w.append(w)

    decay = profile.hierarchy_decay
    seen_values = [rows.keys[v] for v in _first_appearance(rows.value)[0].tolist()]
    values_seen = set(seen_values)
    linked: set[str] = set()
    frontier = seen_values
    while frontier:
        following: dict[str, None] = {}
        for child in frontier:
            for parent in sorted(parents.get(child, ())):
                add(child, parent, decay)
                if parent not in linked and parent not in values_seen:
                    following[parent] = None
            linked.add(child)
        frontier = [f for f in following if f not in linked]
    links = {link.path: link.weight for link in profile.work_links}
    if links:
        keep = columns.path_ids(links)[columns.link_path]
        for w, p, v in zip(
            columns.link_work[keep].tolist(),
            columns.link_path[keep].tolist(),
            columns.link_value[keep].tolist(),
            strict=True,
        ):
            target_work = position.get(columns.values[v])
            if target_work is not None:
                add(columns.keys[w], works[target_work], links[columns.paths[p]])
    for a, _p, b, w in creator_edges:
        add(a, b, w)
    source.append(np.array(extra_a, dtype=np.int64))
    target.append(np.array(extra_b, dtype=np.int64))
    strength.append(np.array(extra_w, dtype=np.float64))
    n = len(node)
    # Both directions of every edge in one go (the graph is undirected): converting sums the
    # duplicates, as adding the matrix to its transpose would, without holding both.
    ends_a = np.concatenate(source).astype(np.int32)
    ends_b = np.concatenate(target).astype(np.int32)
    weights = np.concatenate(strength)
    del source, target, strength
    symmetric = sp.coo_matrix(
        (np.concatenate((weights, weights)), (np.concatenate((ends_a, ends_b)),
                                              np.concatenate((ends_b, ends_a)))),
        shape=(n, n),
    ).tocsr()
    del ends_a, ends_b, weights
    symmetric.sum_duplicates()
    names = [""] * n
    for key, i in node.items():
        names[i] = key
    return symmetric, names


def _explanation_tables(
    index: Index,
    columns: StatementColumns,
    creator_edges: Sequence[tuple[str, str, str, float]],
) -> None:
    links = {link.path for link in index.profile.work_links}
    creator_paths = {t.path for t in index.profile.themes_with_role("creator")}
    work_links: dict[str, list[Edge]] = defaultdict(list)
    work_creators: dict[str, list[tuple[str, str]]] = defaultdict(list)
    creator_works: dict[str, list[tuple[str, str]]] = defaultdict(list)
    keys, paths, values = columns.keys, columns.paths, columns.values
    is_link = [p in links for p in paths]
    is_creator = [p in creator_paths for p in paths]
    keep = columns.path_ids(links | creator_paths)[columns.link_path]
    position = index.position
    for w, p, v in zip(
        columns.link_work[keep].tolist(),
        columns.link_path[keep].tolist(),
        columns.link_value[keep].tolist(),
        strict=True,
    ):
        work, path, obj = keys[w], paths[p], values[v]
        if is_link[p] and obj in position:
            edge = Edge(work, path, obj)
            work_links[work].append(edge)
            work_links[obj].append(edge)
        elif is_creator[p]:
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

"""Endpoint mode: the catalogue stays on a SPARQL endpoint; only a neighbourhood of the seeds
travels.

What the whole catalogue must say is asked for in aggregates: the profile (class counts,
per-property counts over works, value types, the hierarchy and link properties in use), and
once per endpoint and profile the *frequencies* (how many works carry each theme value or a
narrower one, how many statements point at each value, the broader chains above the values in
use, the links between creators). Candidates are chosen by the endpoint: a weighted
shared-feature query (``VALUES (?f ?weight)`` + ``GROUP BY ?w ORDER BY DESC(SUM(?weight))
LIMIT k``) plus the works a few links away from the seeds. Only those works are described (their
statements, their values' labels, types and broader chains) into a small embedded store, indexed
by the ordinary :func:`~curator.core.index.build_index` with idf from the global frequencies, and
suggested from by the ordinary :class:`~curator.core.suggest.Suggester`: scoring, MMR and
explanations are the same code as in embedded mode.

How close the result is (see ``tests/services/test_endpoint_mode.py``):

- *Content*: a work's TF-IDF row in the neighbourhood equals its row in the full index (all of its
  statements and broader chains are fetched, idf is global), so cosines agree to rounding; only a
  work the candidate query leaves out can be missed.
- *Graph*: the random walk runs on the subgraph, but every node keeps its weighted degree in the
  *full* graph (worked out from the frequencies), so each step has the full graph's transition
  probabilities and the mass that would leave for a work outside the neighbourhood is lost rather
  than spread over the works inside. Every graph score is therefore at most its full-graph value
  (plus the push tolerance); what is missing is the mass of walks that leave the neighbourhood
  and come back, which needs at least two more steps (a factor ``alpha ** 2`` and the shares of
  the works left out).
- *Shared-count*: the counts are pushed into the endpoint and exact.

Every seed, label and value reaches a query through :func:`sparql_iri` or :func:`sparql_string`.
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import time
from collections import defaultdict
from collections.abc import Iterable, Iterator, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import pyoxigraph as ox

from curator.core.catalogue import Catalogue, Term
from curator.core.endpoint import EndpointCatalogue, SparqlEndpoint, sparql_string
from curator.core.errors import NoWorksError
from curator.core.files import write_text_atomically
from curator.core.index import LITERAL_PREFIX, Feature, Index, build_index
from curator.core.profile import (
    _AUDIENCE_PROPS,
    _LANGUAGE_PROPS,
    _SUBJECT_PROPS,
    _YEAR_PROPS,
    HIERARCHY_PROPERTIES,
    LinkProperty,
    PathUse,
    Profile,
    ThemeProperty,
    _role_of,
    classify_paths,
    detect_instance_links,
    detect_work_classes,
)
from curator.core.progress import Progress, silent
from curator.core.reading import LABEL_PROPERTIES, instance_sources, iri_list, sparql_iri
from curator.core.similarity import (
    PAGERANK_ALPHA,
    PUSH_EPSILON,
    PushOperator,
    personalized_pagerank_push,
    push_operator,
)
from curator.core.suggest import Suggester
from curator.core.vocab import RDF, RDFS

#: How many candidates the endpoint returns by default: a few hundred is enough for a top 10
#: of a few dozen after MMR, and small enough to describe in a handful of queries.
DEFAULT_CANDIDATES = 300
#: Works described per query (their IRIs go in a VALUES block, so the query is POSTed).
BATCH = 150
#: Frequencies kept on disk are asked again after this long (a catalogue changes slowly).
FREQUENCIES_MAX_AGE = 24 * 3600.0
FREQUENCIES_VERSION = 1
#: Push tolerance when the caller asks for the exact walk: the subgraph is small.
EXACT_EPSILON = 1e-10


# ----- query text -------------------------------------------------------------------------


def _iri(iri: str) -> str:
    return f"<{sparql_iri(iri)}>"




def one_of(var: str, iris: Iterable[str]) -> str:
    """``FILTER(?var IN (...))``. A second VALUES block beside a first one makes some engines
    (Oxigraph among them) join their cross product with a scan of every statement: a
    hundred times slower than the filter on a 10k-work catalogue, and it grows with it."""
    return f"FILTER({var} IN ({iri_list(iris, ', ')}))"


def _term(term: Term) -> str:
    """A term as SPARQL text (an IRI checked, a literal escaped)."""
    if isinstance(term, ox.NamedNode):
        return _iri(term.value)
    if isinstance(term, ox.Literal):
        text = sparql_string(term.value)
        if term.language:
            return f"{text}@{term.language}"
        return f"{text}^^{_iri(term.datatype.value)}"
    raise ValueError(f"no query text for {term!r}")


def _number(value: float) -> str:
    return repr(float(value))


def _works_block(classes: Sequence[str], limit: int | None = None) -> str:
    """The works as a subquery; with ``limit``, only the first ``limit`` the endpoint gives."""
    cut = f" LIMIT {int(limit)}" if limit else ""
    kinds = iri_list(classes)
    return f"{{ SELECT DISTINCT ?w WHERE {{ VALUES ?wc {{ {kinds} }} ?w a ?wc }}{cut} }}"


def _is_work(var: str, classes: Sequence[str]) -> str:
    return f"EXISTS {{ VALUES ?wc {{ {iri_list(classes)} }} {var} a ?wc }}"


def _sources(
    classes: Sequence[str], instance_links: Sequence[str], limit: int | None = None
) -> list[str]:
    """Patterns binding a work ``?w`` and a subject ``?s`` whose statements count for it: the
    work itself, and its instances through each instance link (of the first ``limit`` works
    only, when given)."""
    return instance_sources(_works_block(classes, limit), instance_links)


def _all_rows(
    classes: Sequence[str], instance_links: Sequence[str], limit: int | None = None
) -> str:
    """Every (work, path, object) the reader would read, as a subquery (paths as strings), of
    the first ``limit`` works when given."""
    skipped = [RDF.type, *(link.lstrip("^") for link in instance_links)]
    parts = []
    for number, source in enumerate(_sources(classes, instance_links, limit)):
        skip = f"FILTER(?p NOT IN ({iri_list(skipped, ', ')}))" if number else ""
        parts.append(
            f"{{ {source} ?s ?p ?o . FILTER(!isBlank(?o)) {skip} BIND(STR(?p) AS ?path) }}"
        )
        parts.append(
            f"{{ {source} ?s ?p ?b . FILTER(isBlank(?b)) ?b ?q ?o . "
            f"FILTER(?q != {_iri(RDF.type)} && !isBlank(?o)) "
            'BIND(CONCAT(STR(?p), " ", STR(?q)) AS ?path) }'
        )
    return "{ SELECT DISTINCT ?w ?path ?o WHERE { " + " UNION ".join(parts) + " } }"


def _step(subject: str, path: str, value: str, n: int) -> str:
    parts = path.split(" ")
    if len(parts) == 1:
        return f"{subject} {_iri(parts[0])} {value} ."
    return (
        f"{subject} {_iri(parts[0])} ?mid{n} . FILTER(isBlank(?mid{n})) "
        f"?mid{n} {_iri(parts[1])} {value} ."
    )


def _path_rows(
    classes: Sequence[str], instance_links: Sequence[str], paths: Sequence[str], value: str = "?o"
) -> str:
    """(work, path, value) rows of some paths only, as a subquery."""
    parts = []
    for source in _sources(classes, instance_links):
        for n, path in enumerate(paths):
            parts.append(
                f"{{ {source} {_step('?s', path, value, n)} BIND({sparql_string(path)} AS ?path) }}"
            )
    if not parts:
        parts = ["{ FILTER(false) }"]
    return f"{{ SELECT DISTINCT ?w ?path {value} WHERE {{ " + " UNION ".join(parts) + " } }"


def _hierarchy_path(hierarchy: Sequence[str]) -> str:
    """The profile's hierarchy properties as one SPARQL property path, child to parent."""
    steps = (f"^{_iri(h[1:])}" if h.startswith("^") else _iri(h) for h in hierarchy)
    return "(" + "|".join(steps) + ")"


def _link_path(paths: Sequence[str]) -> str:
    """Both directions of some properties, as one property path."""
    return "(" + "|".join(f"{_iri(p)}|^{_iri(p)}" for p in paths) + ")"


def _rows(endpoint: SparqlEndpoint, query: str) -> list[tuple[Term | None, ...]]:
    return endpoint.select(query)[1]


def _int(term: Term | None) -> int:
    return int(term.value) if term is not None else 0


def _batches(items: Sequence[str], size: int = BATCH) -> Iterator[Sequence[str]]:
    for start in range(0, len(items), size):
        yield items[start : start + size]


def literal_key(lexical: str) -> str:
    """The feature key of a literal theme value, as the index makes it."""
    return LITERAL_PREFIX + " ".join(lexical.split()).lower()


# ----- the profile, by aggregates ------------------------------------------------------------


class _AggregateReader:
    """What :func:`detect_work_classes` and :func:`detect_instance_links` ask a reader, answered
    by aggregate queries instead of reading every typing."""

    def __init__(self, endpoint: SparqlEndpoint) -> None:
        self.endpoint = endpoint

    def class_counts(self) -> dict[str, int]:
        rows = _rows(
            self.endpoint,
            "SELECT ?c (COUNT(DISTINCT ?s) AS ?n) WHERE { ?s a ?c . FILTER(isIRI(?c)) } "
            "GROUP BY ?c",
        )
        return {c.value: _int(n) for c, n in rows if c is not None}

    def subclass_pairs(self) -> list[tuple[str, str]]:
        rows = _rows(
            self.endpoint,
            f"SELECT ?a ?b WHERE {{ ?a {_iri(RDFS.subClassOf)} ?b . "
            "FILTER(isIRI(?a) && isIRI(?b)) }",
        )
        return [(a.value, b.value) for a, b in rows if a is not None and b is not None]

    def uses(self, predicate: str) -> bool:
        return bool(
            _rows(self.endpoint, f"SELECT ?s WHERE {{ ?s {_iri(predicate)} ?o }} LIMIT 1")
        )

    def has_edge(self, predicate: str) -> bool:
        return bool(
            _rows(
                self.endpoint,
                f"SELECT ?a WHERE {{ ?a {_iri(predicate)} ?b . "
                "FILTER(isIRI(?a) && isIRI(?b)) } LIMIT 1",
            )
        )


@dataclass(frozen=True)
class _PathCounts:
    uses: int = 0
    literals: int = 0
    to_works: int = 0
    shared: int = 0
    values: int = 0


#: Works whose statements the profile is detected from. Which properties are labels, themes,
#: links or facets shows in a few thousand works as well as in all of them, and each aggregate
#: query then costs the same on a catalogue of any size.
PROFILE_SAMPLE = 5000


def detect_profile_remote(
    endpoint: SparqlEndpoint,
    *,
    languages: Sequence[str] = ("en",),
    progress: Progress | None = None,
    sample: int | None = PROFILE_SAMPLE,
) -> Profile:
    """The profile :func:`~curator.core.profile.detect_profile` would find, from about a dozen
    aggregate queries rather than a read of every work.

    The statements are those of the first ``sample`` works the endpoint gives (all works when
    ``sample`` is None or the catalogue is smaller): a property used by only a handful of works,
    or whose values are shared only across the whole catalogue, may be missed on a larger one.

    Literal samples (used to tell a year from other text) are the endpoint's first 200, not the
    store's, which can only matter for a property that is a year in some 80 % of works.

    Raises:
        NoWorksError: nothing in the catalogue is a work.
        EndpointError: the endpoint failed.
    """
    progress = progress or silent()
    catalogue = EndpointCatalogue(endpoint)
    reader = _AggregateReader(endpoint)
    progress.report("Finding the works", 0.0)
    work_classes, notes = detect_work_classes(catalogue, reader=reader)  # type: ignore[arg-type]
    instance_links = detect_instance_links(catalogue, reader=reader)  # type: ignore[arg-type]
    rows = _all_rows(work_classes, instance_links, sample)
    progress.report("Counting statements", 0.2)
    counts: dict[str, dict[str, int]] = defaultdict(dict)
    for path, uses, literals, to_works in _rows(
        endpoint,
        "SELECT ?path (COUNT(*) AS ?uses) (SUM(IF(isLiteral(?o), 1, 0)) AS ?literals) "
        f"(SUM(IF(isIRI(?o) && {_is_work('?o', work_classes)}, 1, 0)) AS ?toWorks) "
        f"WHERE {{ {rows} }} GROUP BY ?path",
    ):
        if path is not None:
            counts[path.value].update(
                uses=_int(uses), literals=_int(literals), to_works=_int(to_works)
            )
    if not counts:
        raise NoWorksError("The work classes found have no members.")
    progress.report("Counting shared values", 0.4)
    for path, shared in _rows(
        endpoint,
        f"SELECT ?path (COUNT(*) AS ?shared) WHERE {{ SELECT ?path ?o WHERE {{ {rows} "
        "FILTER(!isLiteral(?o)) } GROUP BY ?path ?o HAVING (COUNT(*) >= 2) } GROUP BY ?path",
    ):
        if path is not None:
            counts[path.value]["shared"] = _int(shared)
    for path, n in _rows(
        endpoint,
        f"SELECT ?path (COUNT(DISTINCT ?o) AS ?n) WHERE {{ {rows} FILTER(!isLiteral(?o)) }} "
        "GROUP BY ?path",
    ):
        if path is not None:
            counts[path.value]["values"] = _int(n)
    progress.report("Reading value types", 0.6)
    value_types: dict[str, list[tuple[str, int]]] = defaultdict(list)
    for path, cls, n in _rows(
        endpoint,
        f"SELECT ?path ?t (COUNT(DISTINCT ?o) AS ?n) WHERE {{ {rows} FILTER(isIRI(?o)) "
        "?o a ?t . FILTER(isIRI(?t)) } GROUP BY ?path ?t",
    ):
        if path is not None and cls is not None:
            value_types[path.value].append((cls.value, _int(n)))
    stats = {p: _PathCounts(**c) for p, c in counts.items()}

    known_literal_paths = _YEAR_PROPS | _LANGUAGE_PROPS | _AUDIENCE_PROPS | _SUBJECT_PROPS
    shape = classify_paths(
        [
            PathUse(path, s.uses, literal_uses=s.literals, to_works=s.to_works, shared=s.shared)
            for path, s in stats.items()
        ],
        instance_links=instance_links,
        # Known literal properties are told by name: no need to ask for samples.
        literal_samples=lambda path: []
        if path in known_literal_paths
        else _literal_samples(endpoint, work_classes, instance_links, path),
        role_of=lambda path: _role_of(
            path, _Values(stats[path].values, value_types.get(path, [])), _Values.TYPES
        ),
    )

    progress.report("Looking for hierarchies and links", 0.8)
    hierarchy = [h for h in HIERARCHY_PROPERTIES if reader.has_edge(h.lstrip("^"))]
    creator_links = _detect_creator_links(
        endpoint, work_classes, instance_links, list(shape.themes)
    )
    progress.report("Profile ready", 1.0)
    return shape.profile(
        work_classes=work_classes,
        languages=languages,
        instance_links=instance_links,
        hierarchy=hierarchy,
        creator_links=creator_links,
        notes=notes,
    )


class _Values:
    """Stands for a path's distinct values in :func:`_role_of`, which only counts them and
    looks up their types: ``len`` is the number of values, iterating yields one stand-in per
    (value, type) pair, and :attr:`TYPES` gives each stand-in its type."""

    TYPES: Mapping[Any, set[str]]

    def __init__(self, count: int, types: Sequence[tuple[str, int]]) -> None:
        self.count = count
        self.types = types

    def __len__(self) -> int:
        return self.count

    def __iter__(self) -> Iterator[Any]:
        for cls, n in self.types:
            for _ in range(n):
                yield cls

    def __contains__(self, item: object) -> bool:
        return False


class _TypeOfStandIn(dict):
    def get(self, key: Any, default: Any = None) -> Any:  # the stand-in is its own type
        return (key,)


_Values.TYPES = _TypeOfStandIn()


def _literal_samples(
    endpoint: SparqlEndpoint, classes: Sequence[str], links: Sequence[str], path: str
) -> list[str]:
    rows = _rows(
        endpoint,
        f"SELECT ?o WHERE {{ {_path_rows(classes, links, [path])} FILTER(isLiteral(?o)) }} "
        "LIMIT 200",
    )
    return [o.value for (o,) in rows if o is not None]


def _detect_creator_links(
    endpoint: SparqlEndpoint,
    classes: Sequence[str],
    links: Sequence[str],
    themes: Sequence[ThemeProperty],
) -> list[LinkProperty]:
    paths = [t.path for t in themes if t.role == "creator"]
    if not paths:
        return []
    creators_a = _path_rows(classes, links, paths, "?a")
    creators_b = _path_rows(classes, links, paths, "?b")
    rows = _rows(
        endpoint,
        f"SELECT DISTINCT ?p WHERE {{ {{ SELECT DISTINCT ?a WHERE {{ {creators_a} }} }} "
        f"?a ?p ?b . FILTER(isIRI(?b) && ?a != ?b && ?p != {_iri(RDF.type)}) "
        f"{{ SELECT DISTINCT ?b WHERE {{ {creators_b} }} }} "
        f"FILTER(!{_is_work('?b', classes)}) }}",
    )
    return [LinkProperty(p, 0.8) for p in sorted(p.value for (p,) in rows if p is not None)]


# ----- frequencies ---------------------------------------------------------------------------


@dataclass
class Frequencies:
    """What the whole catalogue says that a neighbourhood cannot: fetched once per endpoint and
    profile, kept in memory and (optionally) as JSON in the user's cache folder."""

    n_works: int
    triples: int
    #: (path, value key) -> works that have the value or a narrower one (the idf's df)
    works_with: dict[tuple[str, str], int]
    #: (path, value key) -> works that state the value itself (edges in the graph)
    statements: dict[tuple[str, str], int]
    #: (child, hierarchy entry of the profile, parent), above every value in use
    hierarchy: list[tuple[str, str, str]]
    #: (creator, link property, creator) between creators of works
    creator_edges: list[tuple[str, str, str]]
    #: N-Triples: class and property labels, rdfs:subClassOf
    vocabulary: str
    fetched: float = field(default_factory=time.time)

    def parents(self) -> dict[str, set[str]]:
        found: dict[str, set[str]] = defaultdict(set)
        for child, _h, parent in self.hierarchy:
            found[child].add(parent)
        return dict(found)

    def to_json(self) -> str:
        return json.dumps(
            {
                "version": FREQUENCIES_VERSION,
                "n_works": self.n_works,
                "triples": self.triples,
                "works_with": [[p, v, n] for (p, v), n in self.works_with.items()],
                "statements": [[p, v, n] for (p, v), n in self.statements.items()],
                "hierarchy": self.hierarchy,
                "creator_edges": self.creator_edges,
                "vocabulary": self.vocabulary,
                "fetched": self.fetched,
            }
        )

    @classmethod
    def from_json(cls, text: str) -> Frequencies | None:
        try:
            data = json.loads(text)
            if data.get("version") != FREQUENCIES_VERSION:
                return None
            return cls(
                n_works=int(data["n_works"]),
                triples=int(data["triples"]),
                works_with={(p, v): int(n) for p, v, n in data["works_with"]},
                statements={(p, v): int(n) for p, v, n in data["statements"]},
                hierarchy=[tuple(e) for e in data["hierarchy"]],  # type: ignore[misc]
                creator_edges=[tuple(e) for e in data["creator_edges"]],  # type: ignore[misc]
                vocabulary=str(data["vocabulary"]),
                fetched=float(data["fetched"]),
            )
        except (ValueError, KeyError, TypeError):
            return None


_FREQUENCIES: dict[str, Frequencies] = {}


def frequencies_key(url: str, profile: Profile) -> str:
    """What the frequencies depend on: the endpoint and the profile (not its languages)."""
    text = url + "\n" + profile.to_toml().split("languages", 1)[0] + str(profile.themes)
    text += str((profile.hierarchy, profile.work_links, profile.creator_links))
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:32]


def frequencies_for(
    endpoint: SparqlEndpoint,
    profile: Profile,
    *,
    cache_folder: Path | None = None,
    progress: Progress | None = None,
) -> Frequencies:
    """The frequencies, from memory, the cache folder (when given and fresh), or the endpoint."""
    key = frequencies_key(endpoint.settings.url, profile)
    found = _FREQUENCIES.get(key)
    if found is not None:
        return found
    file = cache_folder / f"endpoint-{key}.json" if cache_folder is not None else None
    if file is not None and file.is_file():
        try:
            found = Frequencies.from_json(file.read_text(encoding="utf-8"))
        except OSError:
            found = None
        if found is not None and time.time() - found.fetched < FREQUENCIES_MAX_AGE:
            _FREQUENCIES[key] = found
            return found
    found = fetch_frequencies(endpoint, profile, progress=progress)
    _FREQUENCIES[key] = found
    if file is not None:
        # A cache that cannot be written is only slower next time.
        with contextlib.suppress(OSError):
            write_text_atomically(file, found.to_json())
    return found


def fetch_frequencies(
    endpoint: SparqlEndpoint, profile: Profile, *, progress: Progress | None = None
) -> Frequencies:
    """Ask the endpoint for the frequencies (a handful of GROUP BY queries).

    Chains of broader values are followed to any depth (``HIER*``), where the index stops at
    :data:`~curator.core.index.MAX_ANCESTOR_LEVELS`; only a hierarchy deeper than that differs.
    """
    progress = progress or silent()
    classes, links = profile.work_classes, profile.instance_links
    paths = [t.path for t in profile.themes]
    rows = _path_rows(classes, links, paths)
    progress.report("Counting works", 0.0)
    (n_works,) = _rows(endpoint, f"SELECT (COUNT(*) AS ?n) WHERE {{ {_works_block(classes)} }}")[0]
    (triples,) = _rows(endpoint, "SELECT (COUNT(*) AS ?n) WHERE { ?s ?p ?o }")[0]
    progress.report("Counting theme values", 0.2)
    statements: dict[tuple[str, str], int] = defaultdict(int)
    works_with: dict[tuple[str, str], int] = defaultdict(int)
    for path, value, n in _rows(
        endpoint, f"SELECT ?path ?o (COUNT(*) AS ?n) WHERE {{ {rows} }} GROUP BY ?path ?o"
    ):
        if path is None or value is None:
            continue
        if isinstance(value, ox.Literal):
            if value.value.strip():
                statements[(path.value, literal_key(value.value))] += _int(n)
                works_with[(path.value, literal_key(value.value))] += _int(n)
        else:
            statements[(path.value, value.value)] += _int(n)
    hierarchy: list[tuple[str, str, str]] = []
    if profile.hierarchy and profile.hierarchy_decay > 0:
        up = _hierarchy_path(profile.hierarchy)
        progress.report("Counting broader themes", 0.4)
        for path, value, n in _rows(
            endpoint,
            f"SELECT ?path ?f (COUNT(DISTINCT ?w) AS ?n) WHERE {{ {rows} FILTER(isIRI(?o)) "
            f"?o {up}* ?f . }} GROUP BY ?path ?f",
        ):
            if path is not None and value is not None:
                works_with[(path.value, value.value)] = _int(n)
        used = f"{{ SELECT DISTINCT ?o WHERE {{ {rows} FILTER(isIRI(?o)) }} }}"
        for h in profile.hierarchy:
            step = f"^{_iri(h[1:])}" if h.startswith("^") else _iri(h)
            for child, parent in _rows(
                endpoint,
                f"SELECT DISTINCT ?c ?b WHERE {{ {used} ?o {up}* ?c . ?c {step} ?b . "
                "FILTER(isIRI(?b) && ?c != ?b) }",
            ):
                if child is not None and parent is not None:
                    hierarchy.append((child.value, h, parent.value))
    else:
        for key, n in statements.items():
            works_with.setdefault(key, n)
    for key, n in statements.items():
        works_with.setdefault(key, n)
    progress.report("Reading links between creators", 0.7)
    creator_edges: list[tuple[str, str, str]] = []
    creator_paths = [t.path for t in profile.themes_with_role("creator")]
    if profile.creator_links and creator_paths:
        makers_a = _path_rows(classes, links, creator_paths, "?a")
        makers_b = _path_rows(classes, links, creator_paths, "?b")
        for a, p, b in _rows(
            endpoint,
            f"SELECT DISTINCT ?a ?p ?b WHERE {{ "
            f"{{ SELECT DISTINCT ?a WHERE {{ {makers_a} }} }} "
            f"VALUES ?p {{ {iri_list(link.path for link in profile.creator_links)} }} ?a ?p ?b . "
            f"FILTER(isIRI(?b) && ?a != ?b) "
            f"{{ SELECT DISTINCT ?b WHERE {{ {makers_b} }} }} }}",
        ):
            if a is not None and p is not None and b is not None:
                creator_edges.append((a.value, p.value, b.value))
    progress.report("Reading the vocabulary", 0.85)
    vocabulary = _vocabulary(endpoint, profile)
    progress.report("Frequencies ready", 1.0)
    return Frequencies(
        n_works=_int(n_works),
        triples=_int(triples),
        works_with=dict(works_with),
        statements=dict(statements),
        hierarchy=sorted(set(hierarchy)),
        creator_edges=sorted(set(creator_edges)),
        vocabulary=vocabulary,
    )


def _direct_labels(profile: Profile) -> list[str]:
    every = dict.fromkeys((*profile.label_properties, *LABEL_PROPERTIES))
    return [p for p in every if " " not in p]


def _vocabulary(endpoint: SparqlEndpoint, profile: Profile) -> str:
    """Labels of the classes in use and of the profile's properties, and rdfs:subClassOf."""
    properties = {
        part
        for path in (
            *(t.path for t in profile.themes),
            *(link.path for link in (*profile.work_links, *profile.creator_links)),
            *(h.lstrip("^") for h in profile.hierarchy),
            *profile.year_properties,
            *profile.language_properties,
            *profile.audience_properties,
        )
        for part in path.split(" ")
    }
    labels = one_of("?p", _direct_labels(profile))
    queries = [
        f"SELECT ?s ?p ?o WHERE {{ ?s {_iri(RDFS.subClassOf)} ?o . "
        "FILTER(isIRI(?s) && isIRI(?o)) "
        f"BIND({_iri(RDFS.subClassOf)} AS ?p) }}",
        "SELECT ?s ?p ?o WHERE { { SELECT DISTINCT ?s WHERE { ?x a ?s . FILTER(isIRI(?s)) } } "
        f"?s ?p ?o . {labels} FILTER(isLiteral(?o)) }}",
    ]
    if properties:
        queries.append(
            f"SELECT ?s ?p ?o WHERE {{ VALUES ?s {{ {iri_list(sorted(properties))} }} "
            f"?s ?p ?o . {labels} FILTER(isLiteral(?o)) }}"
        )
    lines: dict[str, None] = {}
    for query in queries:
        for s, p, o in _rows(endpoint, query):
            if s is not None and p is not None and o is not None:
                lines[str(ox.Triple(s, p, o)) + " ."] = None  # type: ignore[arg-type]
    return "\n".join(lines)


# ----- candidates ----------------------------------------------------------------------------


#: The lightest features whose weights add up to at most this share of the total are left out
#: of the candidate query. Measured on the 100k-work synthetic catalogue against a local
#: Oxigraph server (8 seeds, top 20 compared with embedded mode): 0.05 kept 18-20 of the 20
#: at a median 4.9 s a suggestion, 0.15 kept 19-20 at 1.5 s, 0.3 kept 16-20 at 0.9 s.
LIGHT_SHARE = 0.15


def lightest_dropped(
    weighted: Mapping[Feature, float], share: float = LIGHT_SHARE
) -> dict[Feature, float]:
    """The features worth asking the endpoint about: all with a positive weight but the
    lightest, whose weights together make at most ``share`` of the total.

    The lightest are the most common values (a "Fiction" form heading, a broad heading that
    the hierarchy adds): each one matches a good part of the catalogue and makes the query cost
    about what the whole shared-subject count costs, while a work that shares only those can
    score no more than ``share`` of the seeds' own total and so never reaches the top few
    hundred while better ones exist. Candidates are scored in full afterwards, light features
    included."""
    positive = sorted(
        ((w, f) for f, w in weighted.items() if w > 0), key=lambda item: (item[0], str(item[1]))
    )
    budget = share * sum(w for w, _f in positive)
    dropped = 0
    spent = 0.0
    while dropped < len(positive) - 1 and spent + positive[dropped][0] <= budget:
        spent += positive[dropped][0]
        dropped += 1
    return {f: w for w, f in positive[dropped:]}


def candidate_query(
    profile: Profile, weighted: Mapping[Feature, float], limit: int, *, hierarchy: bool = True
) -> str:
    """Works by the summed weight of the features they share with the seeds, best first.

    A feature ``(path, f)`` is shared by a work with a value ``v`` through ``path`` that is
    ``f`` or, when ``hierarchy``, lies under ``f``; each (work, feature) counts once.
    """
    up = _hierarchy_path(profile.hierarchy) + "*" if hierarchy and profile.hierarchy else None
    by_path: dict[str, list[tuple[str, float]]] = defaultdict(list)
    literal: dict[str, list[tuple[str, float]]] = defaultdict(list)
    for feature, weight in lightest_dropped(weighted).items():
        if feature.value.startswith(LITERAL_PREFIX):
            literal[feature.path].append((feature.value[1:], weight))
        else:
            by_path[feature.path].append((feature.value, weight))
    blocks = []
    instance = [link for link in profile.instance_links]
    for n, (path, items) in enumerate(sorted(by_path.items())):
        values = " ".join(f"({_iri(v)} {_number(w)})" for v, w in items)
        match = f"?v{n} {up} ?f ." if up else f"BIND(?f AS ?v{n})"
        for subject in _subjects(instance):
            blocks.append(
                f"{{ VALUES (?f ?weight) {{ {values} }} {match} "
                f"{_step(subject[0], path, f'?v{n}', n)} {subject[1]} "
                f"BIND({sparql_string(path)} AS ?path) }}"
            )
    for n, (path, items) in enumerate(sorted(literal.items()), start=len(by_path)):
        values = " ".join(f"({sparql_string(k)} {_number(w)})" for k, w in items)
        for subject in _subjects(instance):
            blocks.append(
                f"{{ VALUES (?key ?weight) {{ {values} }} {_step(subject[0], path, f'?v{n}', n)} "
                f"FILTER(isLiteral(?v{n}) && LCASE(STR(?v{n})) = ?key) {subject[1]} "
                f"BIND(?key AS ?f) BIND({sparql_string(path)} AS ?path) }}"
            )
    if not blocks:
        blocks = ["{ FILTER(false) }"]
    return (
        "SELECT ?w (SUM(?weight) AS ?score) WHERE { "
        "{ SELECT DISTINCT ?w ?path ?f ?weight WHERE { " + " UNION ".join(blocks) + " } } "
        f"FILTER({_is_work('?w', profile.work_classes)}) }} "
        f"GROUP BY ?w ORDER BY DESC(?score) ?w LIMIT {int(limit)}"
    )


def _subjects(instance_links: Sequence[str]) -> list[tuple[str, str]]:
    """(subject variable, pattern tying it to ?w): the work itself, then its instances."""
    found = [("?w", "")]
    for n, link in enumerate(instance_links):
        if link.startswith("^"):
            found.append((f"?i{n}", f"?w {_iri(link[1:])} ?i{n} ."))
        else:
            found.append((f"?i{n}", f"?i{n} {_iri(link)} ?w ."))
    return found


def shared_count_query(profile: Profile, prop: str, counts: Mapping[Term, int], limit: int) -> str:
    """The shared-count baseline pushed into the endpoint: works by how many of the seeds'
    values of ``prop`` they have, each counted once per seed that has it."""
    values = " ".join(f"({_term(v)} {int(n)})" for v, n in counts.items())
    return (
        f"SELECT ?w (SUM(?n) AS ?score) WHERE {{ VALUES (?v ?n) {{ {values} }} "
        f"?w {_iri(prop)} ?v . FILTER({_is_work('?w', profile.work_classes)}) }} "
        f"GROUP BY ?w ORDER BY DESC(?score) ?w LIMIT {int(limit)}"
    )


def neighbour_query(profile: Profile, seeds: Sequence[str], limit: int) -> str | None:
    """Works one or two work links from the seeds, and works of creators linked to the seeds'
    creators: what the graph reaches in two or three steps without a shared theme."""
    branches = []
    if profile.work_links:
        step = _link_path([link.path for link in profile.work_links])
        branches.append(f"{{ ?seed {step}/{step}? ?w . }}")
    creator_paths = [t.path for t in profile.themes_with_role("creator") if " " not in t.path]
    if profile.creator_links and creator_paths:
        step = _link_path([link.path for link in profile.creator_links])
        branches.append(
            f"{{ ?seed ?cp ?c . {one_of('?cp', creator_paths)} ?c {step} ?c2 . "
            f"?w ?cq ?c2 . {one_of('?cq', creator_paths)} }}"
        )
    if not branches or not seeds:
        return None
    return (
        f"SELECT DISTINCT ?w WHERE {{ VALUES ?seed {{ {iri_list(seeds)} }} "
        + " UNION ".join(branches)
        + f" FILTER(?w != ?seed && {_is_work('?w', profile.work_classes)}) }} LIMIT {int(limit)}"
    )


def run_candidates(endpoint: SparqlEndpoint, query: str) -> list[tuple[str, float]]:
    return [
        (w.value, float(s.value))
        for w, s in _rows(endpoint, query)
        if isinstance(w, ox.NamedNode) and s is not None
    ]


# ----- describing a neighbourhood ------------------------------------------------------------


@dataclass
class Neighbourhood:
    """The works described locally, their store, index and the full-graph degrees."""

    works: list[str]
    catalogue: Catalogue
    index: Index
    degree: np.ndarray
    queries: int


def describe(
    endpoint: SparqlEndpoint,
    profile: Profile,
    frequencies: Frequencies,
    works: Sequence[str],
    *,
    progress: Progress | None = None,
) -> Catalogue:
    """A small embedded catalogue with what the index reads about ``works``: their statements
    (and their instances' and blank nodes'), the labels and types of what they point at, the
    broader chains above their values, the links between their creators and the vocabulary."""
    progress = progress or silent()
    store = ox.Store()
    quads: list[ox.Quad] = []
    works = list(dict.fromkeys(works))
    values: dict[str, None] = {}

    def add(s: ox.NamedNode | ox.BlankNode, p: ox.NamedNode, o: Term) -> None:
        quads.append(ox.Quad(s, p, o))
        if isinstance(o, ox.NamedNode):
            values.setdefault(o.value)

    for number, batch in enumerate(_batches(works)):
        progress.report("Describing works", number * BATCH / max(1, len(works)))
        subjects = iri_list(batch)
        for s, p, o in _rows(
            endpoint, f"SELECT ?s ?p ?o WHERE {{ VALUES ?s {{ {subjects} }} ?s ?p ?o }}"
        ):
            named = isinstance(s, ox.NamedNode) and isinstance(p, ox.NamedNode)
            if named and o is not None and not isinstance(o, ox.BlankNode):
                add(s, p, o)  # type: ignore[arg-type]
        blanks: dict[str, ox.BlankNode] = {}
        for s, p, b, q, o in _rows(
            endpoint,
            f"SELECT ?s ?p ?b ?q ?o WHERE {{ VALUES ?s {{ {subjects} }} ?s ?p ?b . "
            "FILTER(isBlank(?b)) ?b ?q ?o . FILTER(!isBlank(?o)) }",
        ):
            if s is None or p is None or b is None or q is None or o is None:
                continue
            node = blanks.get(b.value)
            if node is None:
                node = blanks[b.value] = ox.BlankNode()
                add(s, p, node)  # type: ignore[arg-type]
            add(node, q, o)  # type: ignore[arg-type]
        for link in profile.instance_links:
            pattern = (
                f"?w {_iri(link[1:])} ?i ." if link.startswith("^") else f"?i {_iri(link)} ?w ."
            )
            instances: dict[str, ox.NamedNode | ox.BlankNode] = {}
            for w, i, p, o in _rows(
                endpoint,
                f"SELECT ?w ?i ?p ?o WHERE {{ VALUES ?w {{ {subjects} }} {pattern} ?i ?p ?o . "
                "FILTER(!isBlank(?o)) }",
            ):
                if w is None or i is None or p is None or o is None:
                    continue
                node = instances.get(i.value)
                if node is None:
                    node = instances[i.value] = (
                        ox.BlankNode() if isinstance(i, ox.BlankNode) else i  # type: ignore[assignment]
                    )
                add(node, p, o)  # type: ignore[arg-type]
    described = set(works)
    # Broader chains above every value, from the frequencies.
    parents = frequencies.parents()
    by_child: dict[str, list[tuple[str, str]]] = defaultdict(list)
    for child, h, parent in frequencies.hierarchy:
        by_child[child].append((h, parent))
    frontier = list(values)
    seen = set(frontier)
    while frontier:
        following = []
        for child in frontier:
            for h, parent in by_child.get(child, ()):
                a, b = (parent, child) if h.startswith("^") else (child, parent)
                quads.append(ox.Quad(ox.NamedNode(a), ox.NamedNode(h.lstrip("^")), ox.NamedNode(b)))
            for parent in parents.get(child, ()):
                if parent not in seen:
                    seen.add(parent)
                    following.append(parent)
        frontier = following
    entities = [v for v in seen if v not in described]
    # Links between creators (only those among the described works' creators count).
    for a, p, b in frequencies.creator_edges:
        if a in seen or b in seen:
            quads.append(ox.Quad(ox.NamedNode(a), ox.NamedNode(p), ox.NamedNode(b)))
    wanted = [*_direct_labels(profile), RDF.type]
    # A work outside the neighbourhood (a link's far end) keeps its label but not its kind:
    # typed as a work, it would enter the index with none of its statements.
    work_classes = set(profile.work_classes)
    for number, batch in enumerate(_batches(sorted(entities), 4 * BATCH)):
        progress.report("Reading labels", 0.5 + 0.4 * number * 4 * BATCH / max(1, len(entities)))
        for s, p, o in _rows(
            endpoint,
            f"SELECT ?s ?p ?o WHERE {{ VALUES ?s {{ {iri_list(batch)} }} ?s ?p ?o . "
            f"{one_of('?p', wanted)} FILTER(!isBlank(?o)) }}",
        ):
            if not (isinstance(s, ox.NamedNode) and isinstance(p, ox.NamedNode) and o):
                continue
            if p.value == RDF.type and o.value in work_classes:
                continue
            quads.append(ox.Quad(s, p, o))
    store.extend(quads)
    if frequencies.vocabulary:
        store.load(frequencies.vocabulary.encode("utf-8"), format=ox.RdfFormat.N_TRIPLES)
    progress.report("Described", 1.0)
    catalogue = Catalogue(store)
    catalogue._triple_count = frequencies.triples
    return catalogue


def neighbourhood(
    endpoint: SparqlEndpoint,
    profile: Profile,
    frequencies: Frequencies,
    works: Sequence[str],
    *,
    progress: Progress | None = None,
) -> Neighbourhood:
    """Describe ``works``, index them with the global idf, and work out full-graph degrees."""
    progress = progress or silent()
    before = endpoint.requests
    catalogue = describe(endpoint, profile, frequencies, works, progress=progress.part(0.0, 0.7))

    def global_frequencies(
        features: Sequence[Feature], local: np.ndarray
    ) -> tuple[np.ndarray, int]:
        table = frequencies.works_with
        df = np.array(
            [table.get((f.path, f.value), -1) for f in features], dtype=np.float64
        )
        unknown = df < 0
        df[unknown] = local[unknown]
        return np.maximum(df, local), max(frequencies.n_works, len(works))

    index = build_index(
        catalogue, profile, progress=progress.part(0.7, 0.9), frequencies=global_frequencies
    )
    index.triple_count = frequencies.triples
    degree = full_degrees(endpoint, profile, frequencies, index)
    progress.report("Neighbourhood ready", 1.0)
    return Neighbourhood(
        works=list(index.works),
        catalogue=catalogue,
        index=index,
        degree=degree,
        queries=endpoint.requests - before,
    )


def full_degrees(
    endpoint: SparqlEndpoint, profile: Profile, frequencies: Frequencies, index: Index
) -> np.ndarray:
    """Each node's weighted degree in the item-entity graph of the *whole* catalogue.

    A work's degree is its local one with its links to works outside the neighbourhood added
    (asked of the endpoint); a value's is the weight of every statement pointing at it, plus
    its hierarchy edges and the links between creators, all from the frequencies. Literal
    values and anything unknown keep their local degree.
    """
    graph = index.graph
    local = np.asarray(graph.sum(axis=1)).ravel()
    degree = local.copy()
    weights = {t.path: t.weight for t in profile.themes}
    n_works = index.size
    # Works: add the link weight of links to and from works outside the neighbourhood.
    link_weight = {link.path: link.weight for link in profile.work_links}
    if link_weight:
        inside = index.position
        missing = np.zeros(n_works)
        for batch in _batches(index.works):
            for a, p, b in _rows(
                endpoint,
                f"SELECT DISTINCT ?a ?p ?b WHERE {{ VALUES ?x {{ {iri_list(batch)} }} "
                "{ ?x ?p ?b . BIND(?x AS ?a) } UNION { ?a ?p ?x . BIND(?x AS ?b) } "
                f"{one_of('?p', link_weight)} "
                f"FILTER(?a != ?b && {_is_work('?a', profile.work_classes)} && "
                f"{_is_work('?b', profile.work_classes)}) }}",
            ):
                if a is None or p is None or b is None:
                    continue
                if a.value in inside and b.value in inside:
                    continue  # already in the local graph
                w = link_weight.get(p.value, 0.0)
                for end in (a.value, b.value):
                    if end in inside:
                        missing[inside[end]] += w
        degree[:n_works] += missing
    # Values: every statement pointing at them, hierarchy edges, links between creators.
    per_value: dict[str, float] = defaultdict(float)
    for (path, value), n in frequencies.statements.items():
        per_value[value] += weights.get(path, 0.0) * n
    decay = profile.hierarchy_decay
    if decay > 0:
        pairs = {(c, b) for c, _h, b in frequencies.hierarchy}
        for child, parent in pairs:
            per_value[child] += decay
            per_value[parent] += decay
    creator_weight = {link.path: link.weight for link in profile.creator_links}
    for a, p, b in frequencies.creator_edges:
        per_value[a] += creator_weight.get(p, 0.0)
        per_value[b] += creator_weight.get(p, 0.0)
    for node in range(n_works, len(index.graph_nodes)):
        key = index.graph_nodes[node]
        if key in per_value:
            degree[node] = max(local[node], per_value[key])
    return degree


class NeighbourhoodSuggester(Suggester):
    """The ordinary suggester over a neighbourhood, its random walk taking each step with the
    full graph's probabilities (see the module's docstring)."""

    def __init__(self, index: Index, degree: np.ndarray) -> None:
        super().__init__(index)
        self.full_degree = degree
        self._walk: PushOperator | None = None

    def graph_scores(self, seeds: Sequence[int], *, exact: bool = False) -> np.ndarray:
        graph = self.index.graph
        if graph.nnz == 0:
            return np.zeros(self.index.size)
        personalization = np.zeros(graph.shape[0])
        personalization[list(seeds)] = 1.0
        if self._walk is None:
            self._walk = push_operator(graph, self.full_degree, PAGERANK_ALPHA)
        ranks = personalized_pagerank_push(
            graph,
            personalization,
            alpha=PAGERANK_ALPHA,
            epsilon=EXACT_EPSILON if exact else PUSH_EPSILON,
            operator=self._walk,
        )
        return ranks[: self.index.size]


def seed_weights(index: Index, seeds: Sequence[int]) -> dict[Feature, float]:
    """Weight of each feature for the candidate query: the seeds' mean unit TF-IDF vector times
    the feature's idf and property weight, i.e. the cosine's numerator for a work that has the
    feature once (its own length is left out: the endpoint cannot know it cheaply)."""
    if not seeds:
        return {}
    centroid = np.asarray(index.vectors[list(seeds)].mean(axis=0)).ravel()
    factors = index.idf * index.column_weights
    return {
        index.features[j]: float(centroid[j] * factors[j])
        for j in np.flatnonzero(centroid).tolist()
    }

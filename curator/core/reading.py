"""Pulling out of the store what the profile and the index need, each kind of data read once.

Plain patterns (every statement of a work, every ``rdf:type``, every label) are read with
:meth:`Catalogue.triples`, which walks the store's indexes directly and is several times faster
than the same pattern as a SPARQL SELECT; the statements come in the order the store keeps them,
which is the order the SPARQL queries used before gave, so everything built from them is the
same. A :class:`CatalogueReader` remembers what it has read, so that profile detection and the
index, which need the same statements, types, links and labels, share one read of each.

A *path* is one property IRI, or two joined by a space when the first leads to a blank node
(``bf:contribution bf:agent``): IRIs cannot contain spaces, so the join is unambiguous, and a
blank node in the middle is how BIBFRAME and others attach titles and agents.

Work statements are held in columns (:class:`StatementColumns`: numpy arrays of numbers standing
for works, paths and interned values), which is what keeps a catalogue of a few million
statements in a few tens of megabytes; :class:`WorkStatements` turns them into the lists of
tuples of old on demand.
"""

from __future__ import annotations

import contextlib
import gc
import re
from array import array
from collections import defaultdict
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import pyoxigraph as ox

from curator.core.catalogue import Catalogue, Term
from curator.core.labels import LabelCandidate
from curator.core.progress import Progress, silent
from curator.core.vocab import BF, DC, DCTERMS, FOAF, RDF, RDFS, SCHEMA, SCHEMA_HTTP, SKOS

#: Properties that name a thing, most preferred first.
LABEL_PROPERTIES: tuple[str, ...] = (
    SKOS.prefLabel,
    SCHEMA.name,
    SCHEMA_HTTP.name,
    SCHEMA.headline,
    SCHEMA_HTTP.headline,
    DCTERMS.title,
    DC.title,
    FOAF.name,
    RDFS.label,
    f"{BF.title} {BF.mainTitle}",
    SKOS.altLabel,
    SCHEMA.alternateName,
    SCHEMA_HTTP.alternateName,
)

_NAMED = ox.NamedNode
_BLANK = ox.BlankNode
_LITERAL = ox.Literal
_TYPE = _NAMED(RDF.type)
#: Works between two progress reports (and cancel checks) while reading statements.
_REPORT_EVERY = 4096


def path_parts(path: str) -> list[str]:
    """The property IRIs of a path, in order."""
    return path.split(" ")


def join_path(*iris: str) -> str:
    return " ".join(iris)


def iri_list(iris: Iterable[str], separator: str = " ") -> str:
    """IRIs as ``<...>`` terms for a query (each checked by :func:`sparql_iri`)."""
    return separator.join(f"<{sparql_iri(i)}>" for i in iris)


def instance_sources(works: str, instance_links: Sequence[str]) -> list[str]:
    """Patterns binding a work ``?w`` (from the subquery ``works``) and a subject ``?s`` whose
    statements count for it: the work itself, then its instances through each instance link
    (``^p`` when the work points at its instances, ``p`` when they point at it)."""
    found = [f"{works} BIND(?w AS ?s)"]
    for link in instance_links:
        if link.startswith("^"):
            found.append(f"{works} ?w <{sparql_iri(link[1:])}> ?s .")
        else:
            found.append(f"{works} ?s <{sparql_iri(link)}> ?w .")
    return found


def sparql_iri(iri: str) -> str:
    """An IRI made safe to place between ``<`` and ``>`` in a query.

    Raises:
        ValueError: the IRI holds characters SPARQL forbids in an IRI reference.
    """
    if _NOT_IN_IRI.search(iri) is not None:
        raise ValueError(f"not a usable IRI: {iri!r}")
    return iri


#: What SPARQL forbids in an IRI reference: ``<>"{}|^`\``, space and the control characters.
_NOT_IN_IRI = re.compile(r'[<>"{}|^`\\\x00-\x20]')


def node_key(term: ox.NamedNode | ox.BlankNode) -> str:
    """A string naming a node: the IRI itself, or ``_:id`` for a blank node."""
    if isinstance(term, ox.BlankNode):
        return "_:" + term.value
    return term.value


def _usable_iri(key: str) -> str | None:
    """The IRI of a node key, or None for a blank node or what no query could name."""
    if key.startswith("_:"):
        return None
    try:
        return sparql_iri(key)
    except ValueError:
        return None


def _named(iri: str) -> ox.NamedNode:
    """The store's node for an IRI we were given (checked as a query would check it)."""
    return _NAMED(sparql_iri(iri))


# ----- work statements ----------------------------------------------------------------------


@dataclass
class StatementColumns:
    """Work statements as parallel arrays: row ``i`` of the links is
    ``(keys[link_work[i]], paths[link_path[i]], values[link_value[i]])``, and of the literals
    ``(keys[literal_work[i]], paths[literal_path[i]], lexicals[literal_lexical[i]],
    languages[literal_language[i]])``.

    ``keys`` starts with the works (so a work's number is its position in the sorted list of
    works); a row about anything else, which only hand-made statements have, numbers it after
    them. Rows keep the order of the lists they stand for.
    """

    keys: list[str]
    n_works: int
    paths: list[str]
    values: list[str]
    lexicals: list[str]
    languages: list[str]
    link_work: np.ndarray
    link_path: np.ndarray
    link_value: np.ndarray
    literal_work: np.ndarray
    literal_path: np.ndarray
    literal_lexical: np.ndarray
    literal_language: np.ndarray

    def path_ids(self, paths: Iterable[str]) -> np.ndarray:
        """Mask over path numbers: True for the paths named."""
        wanted = set(paths)
        return np.array([p in wanted for p in self.paths], dtype=bool)

    @classmethod
    def from_lists(
        cls,
        works: Sequence[str],
        links: Sequence[tuple[str, str, str]],
        literals: Sequence[tuple[str, str, str, str]],
    ) -> StatementColumns:
        keys = list(works)
        key_ids = {k: i for i, k in enumerate(keys)}
        interned: list[dict[str, int]] = [key_ids, {}, {}, {}, {}]
        tables: list[list[str]] = [keys, [], [], [], []]

        def ids(strings: Iterable[str], which: int) -> np.ndarray:
            table, index = tables[which], interned[which]
            out = []
            for s in strings:
                found = index.get(s)
                if found is None:
                    found = index[s] = len(table)
                    table.append(s)
                out.append(found)
            return _numbers(out)

        link_work = ids((r[0] for r in links), 0)
        link_path = ids((r[1] for r in links), 1)
        link_value = ids((r[2] for r in links), 2)
        literal_work = ids((r[0] for r in literals), 0)
        literal_path = ids((r[1] for r in literals), 1)
        literal_lexical = ids((r[2] for r in literals), 3)
        literal_language = ids((r[3] for r in literals), 4)
        return cls(
            keys=keys,
            n_works=len(works),
            paths=tables[1],
            values=tables[2],
            lexicals=tables[3],
            languages=tables[4],
            link_work=link_work,
            link_path=link_path,
            link_value=link_value,
            literal_work=literal_work,
            literal_path=literal_path,
            literal_lexical=literal_lexical,
            literal_language=literal_language,
        )


class WorkStatements:
    """What the catalogue says about its works, instances folded in and blank nodes followed.

    ``works`` are the keys of the works, sorted; ``links`` are ``(work, path, object node)`` and
    ``literals`` ``(work, path, lexical form, language tag or '')``, in the order the store
    keeps them. Made by :func:`read_works` (in columns, the lists built when first asked for) or
    by hand from lists.
    """

    def __init__(
        self,
        works: list[str],
        links: list[tuple[str, str, str]] | None = None,
        literals: list[tuple[str, str, str, str]] | None = None,
        *,
        columns: StatementColumns | None = None,
    ) -> None:
        self.works = works
        self._columns = columns
        self._links = links if links is not None or columns is not None else []
        self._literals = literals if literals is not None or columns is not None else []

    @property
    def links(self) -> list[tuple[str, str, str]]:
        if self._links is None:
            c = self._columns
            assert c is not None
            keys, paths, values = c.keys, c.paths, c.values
            self._links = [
                (keys[w], paths[p], values[v])
                for w, p, v in zip(
                    c.link_work.tolist(), c.link_path.tolist(), c.link_value.tolist(), strict=True
                )
            ]
        return self._links

    @links.setter
    def links(self, rows: list[tuple[str, str, str]]) -> None:
        self._links = rows

    @property
    def literals(self) -> list[tuple[str, str, str, str]]:
        if self._literals is None:
            c = self._columns
            assert c is not None
            keys, paths, lexicals, languages = c.keys, c.paths, c.lexicals, c.languages
            self._literals = [
                (keys[w], paths[p], lexicals[x], languages[g])
                for w, p, x, g in zip(
                    c.literal_work.tolist(),
                    c.literal_path.tolist(),
                    c.literal_lexical.tolist(),
                    c.literal_language.tolist(),
                    strict=True,
                )
            ]
        return self._literals

    @literals.setter
    def literals(self, rows: list[tuple[str, str, str, str]]) -> None:
        self._literals = rows

    def columns(self) -> StatementColumns:
        """The statements in columns (built from the lists when they were made or handed out,
        so that changes to the lists count)."""
        if self._columns is not None and self._links is None and self._literals is None:
            return self._columns
        return StatementColumns.from_lists(self.works, self.links, self.literals)

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, WorkStatements):
            return NotImplemented
        return (self.works, self.links, self.literals) == (other.works, other.links, other.literals)

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return (
            f"WorkStatements(works={len(self.works)} works, links={len(self.links)} rows, "
            f"literals={len(self.literals)} rows)"
        )


def _numbers(items: list[int]) -> np.ndarray:
    """A column of row numbers, as compact as the largest allows."""
    column = np.array(items, dtype=np.int64)
    if len(column) and int(column.max()) < 2**31:
        return column.astype(np.int32)
    return column


class _Interner:
    """Strings to small numbers and back."""

    __slots__ = ("index", "table")

    def __init__(self) -> None:
        self.index: dict[str, int] = {}
        self.table: list[str] = []

    def __call__(self, s: str) -> int:
        found = self.index.get(s)
        if found is None:
            found = self.index[s] = len(self.table)
            self.table.append(s)
        return found


def _first_occurrences(*columns: np.ndarray) -> np.ndarray | None:
    """Mask keeping the first of each set of equal rows, or None when all rows differ."""
    n = len(columns[0])
    if n < 2:
        return None
    sizes = [int(c.max()) + 1 for c in columns]
    if float(np.prod([float(size) for size in sizes])) < 2.0**62:
        # Rows as single numbers: one sort, and only a quick look when nothing repeats.
        key = columns[0].astype(np.int64)
        for column, size in zip(columns[1:], sizes[1:], strict=True):
            key = key * size + column
        ordered = np.sort(key)
        if not (ordered[1:] == ordered[:-1]).any():
            return None
        order = np.argsort(key, kind="stable")
        ordered = key[order]
        same = ordered[1:] == ordered[:-1]
    else:
        order = np.lexsort(columns[::-1])  # stable: equal rows stay in their order
        same = np.ones(n - 1, dtype=bool)
        for column in columns:
            ordered = column[order]
            same &= ordered[1:] == ordered[:-1]
        if not same.any():
            return None
    keep = np.ones(n, dtype=bool)
    keep[order[1:][same]] = False
    return keep


class CatalogueReader:
    """Reads what the profile and the index need from one catalogue, each kind once.

    The store must not change while a reader is in use (it remembers what it read).
    """

    def __init__(self, catalogue: Catalogue) -> None:
        self.catalogue = catalogue
        #: An embedded store is walked directly; anything else (an endpoint) is asked in SPARQL.
        self._direct = getattr(catalogue, "store", None) is not None
        self._types: dict[str, set[str]] | None = None
        self._members: dict[str, list[ox.NamedNode | ox.BlankNode]] = {}
        self._subclass: list[tuple[str, str]] | None = None
        self._statements: dict[tuple[tuple[str, ...], tuple[str, ...]], WorkStatements] = {}
        self._edges: dict[str, list[tuple[str, str, str]]] = {}
        self._outgoing: dict[str, list[tuple[str, str, str]]] = {}
        self._labels: dict[tuple[str, ...], dict[str, list[LabelCandidate]]] = {}

    # ----- types ------------------------------------------------------------------------

    def _read_types(self) -> dict[str, set[str]]:
        if self._types is None:
            types: dict[str, set[str]] = defaultdict(set)
            members: dict[str, dict[ox.NamedNode | ox.BlankNode, None]] = defaultdict(dict)
            for subject, cls in self._typings():
                key = "_:" + subject.value if type(subject) is _BLANK else subject.value
                types[key].add(cls)
                members[cls][subject] = None  # a typing stated in two graphs counts once
            self._types = dict(types)
            self._members = {cls: list(nodes) for cls, nodes in members.items()}
        return self._types

    def _typings(self) -> Iterator[tuple[Any, str]]:
        """(node, class IRI) of every ``rdf:type`` statement with an IRI class."""
        if self._direct:
            for quad in self.catalogue.triples(None, _TYPE, None):
                cls = quad.object
                if type(cls) is _NAMED:
                    yield quad.subject, cls.value
        else:
            for s, c in self.catalogue.select(
                "SELECT ?s ?c WHERE { ?s a ?c . FILTER(isIRI(?c)) }"
            ):
                if s is not None and c is not None:
                    yield s, c.value  # type: ignore[misc]

    def types(self) -> dict[str, set[str]]:
        """The classes of every typed node (a fresh copy the caller may keep)."""
        return {key: set(classes) for key, classes in self._read_types().items()}

    def shared_types(self) -> dict[str, set[str]]:
        """The classes of every typed node, the reader's own copy: do not change it."""
        return self._read_types()

    def class_counts(self) -> dict[str, int]:
        """How many distinct things are typed with each class."""
        self._read_types()
        return {cls: len(members) for cls, members in self._members.items()}

    def subclass_pairs(self) -> list[tuple[str, str]]:
        if self._subclass is None:
            self._subclass = [(a, b) for a, _p, b in self.edges([RDFS.subClassOf])]
        return list(self._subclass)

    def uses(self, predicate: str) -> bool:
        """Whether any statement has ``predicate``."""
        if self._direct:
            return next(self.catalogue.triples(None, _named(predicate), None), None) is not None
        rows = self.catalogue.select(f"SELECT ?s WHERE {{ ?s <{predicate}> ?o }} LIMIT 1")
        return any(True for _ in rows)

    # ----- works ------------------------------------------------------------------------

    def _work_nodes(self, work_classes: Sequence[str]) -> list[Any]:
        """Members of the work classes, each once, classes in the order given."""
        for cls in work_classes:
            sparql_iri(cls)
        self._read_types()
        seen: set[Any] = set()
        nodes = []
        for cls in work_classes:
            for node in self._members.get(cls, ()):
                if node not in seen:
                    seen.add(node)
                    nodes.append(node)
        return nodes

    def work_statements(
        self,
        work_classes: Sequence[str],
        instance_links: Sequence[str] = (),
        progress: Progress | None = None,
    ) -> WorkStatements:
        """Every statement about every work, including those made about its instances
        (see :func:`read_works`)."""
        key = (tuple(work_classes), tuple(instance_links))
        found = self._statements.get(key)
        if found is None:
            read = self._read_work_statements if self._direct else self._select_work_statements
            found = self._statements[key] = read(
                work_classes, instance_links, progress or silent()
            )
        return found

    def _read_work_statements(
        self, work_classes: Sequence[str], instance_links: Sequence[str], progress: Progress
    ) -> WorkStatements:
        nodes = self._work_nodes(work_classes)
        node_keys = [node_key(n) for n in nodes]
        works = sorted(node_keys)
        if not works:
            return WorkStatements(works=works)
        position = {w: i for i, w in enumerate(works)}
        numbers = [position[k] for k in node_keys]
        link_preds = {link.lstrip("^") for link in instance_links}
        sources: list[tuple[list[int], list[ox.NamedNode | ox.BlankNode]]] = [(numbers, nodes)]
        for link in instance_links:
            numbered: list[int] = []
            subjects: list[ox.NamedNode | ox.BlankNode] = []
            if link.startswith("^"):
                predicate = _named(link[1:])
                for number, node in zip(numbers, nodes, strict=True):
                    for quad in self.catalogue.triples(node, predicate, None):
                        if type(quad.object) is not _LITERAL:
                            numbered.append(number)
                            subjects.append(quad.object)
            else:
                predicate = _named(link)
                for number, node in zip(numbers, nodes, strict=True):
                    for quad in self.catalogue.triples(None, predicate, node):
                        numbered.append(number)
                        subjects.append(quad.subject)
            sources.append((numbered, subjects))

        paths, values, lexicals, languages = _Interner(), _Interner(), _Interner(), _Interner()
        # Row numbers as 32-bit integers: half the memory of lists, and numpy reads them as they
        # are.
        links: tuple[array[int], ...] = tuple(array("i") for _ in range(3))
        literals: tuple[array[int], ...] = tuple(array("i") for _ in range(4))
        total = sum(len(s[0]) for s in sources)
        done = 0
        for number, (numbered, subjects) in enumerate(sources):
            skipped = frozenset({RDF.type, *link_preds}) if number > 0 else frozenset()
            blanks = self._direct_rows(
                numbered, subjects, skipped, paths, values, lexicals, languages,
                links, literals, progress, done, total,
            )
            done += len(numbered)
            self._nested_rows(blanks, paths, values, lexicals, languages, links, literals)
        progress.report("Reading works", 1.0)

        columns = StatementColumns(
            keys=works,
            n_works=len(works),
            paths=paths.table,
            values=values.table,
            lexicals=lexicals.table,
            languages=languages.table,
            link_work=np.frombuffer(links[0], dtype=np.int32),
            link_path=np.frombuffer(links[1], dtype=np.int32),
            link_value=np.frombuffer(links[2], dtype=np.int32),
            literal_work=np.frombuffer(literals[0], dtype=np.int32),
            literal_path=np.frombuffer(literals[1], dtype=np.int32),
            literal_lexical=np.frombuffer(literals[2], dtype=np.int32),
            literal_language=np.frombuffer(literals[3], dtype=np.int32),
        )
        del links, literals
        _drop_repeats(columns)
        return WorkStatements(works=works, columns=columns)

    def _direct_rows(
        self,
        numbered: list[int],
        subjects: list[ox.NamedNode | ox.BlankNode],
        skipped: frozenset[str],
        paths: _Interner,
        values: _Interner,
        lexicals: _Interner,
        languages: _Interner,
        links: tuple[array[int], ...],
        literals: tuple[array[int], ...],
        progress: Progress,
        done: int,
        total: int,
    ) -> list[tuple[int, str, ox.BlankNode]]:
        """Rows of the statements made about ``subjects`` (the hot loop of opening a catalogue:
        it touches every statement of every work once). Returns the blank objects met."""
        quads = self.catalogue.store.quads_for_pattern  # as Catalogue.triples: every graph
        graph = None
        path_index, path_of = paths.index, paths
        value_index, value_of = values.index, values
        lexical_index, lexical_of = lexicals.index, lexicals
        language_of = languages
        link_work, link_path, link_value = (column.append for column in links)
        literal_work, literal_path, literal_lexical, literal_language = (
            column.append for column in literals
        )
        blanks: list[tuple[int, str, ox.BlankNode]] = []
        named, literal, blank = _NAMED, _LITERAL, _BLANK
        for count, (number, subject) in enumerate(zip(numbered, subjects, strict=True)):
            if count % _REPORT_EVERY == 0:
                progress.report("Reading works", (done + count) / max(1, total))
            for quad in quads(subject, None, None, graph):
                obj = quad.object
                kind = type(obj)
                predicate = quad.predicate.value
                if kind is blank:
                    blanks.append((number, predicate, obj))
                    continue
                if predicate in skipped:
                    continue
                path = path_index.get(predicate)
                if path is None:
                    path = path_of(predicate)
                if kind is literal:
                    text = obj.value
                    lexical = lexical_index.get(text)
                    if lexical is None:
                        lexical = lexical_of(text)
                    literal_work(number)
                    literal_path(path)
                    literal_lexical(lexical)
                    literal_language(language_of(obj.language or ""))
                else:
                    key = obj.value if kind is named else node_key(obj)
                    value = value_index.get(key)
                    if value is None:
                        value = value_of(key)
                    link_work(number)
                    link_path(path)
                    link_value(value)
        return blanks

    def _nested_rows(
        self,
        blanks: list[tuple[int, str, ox.BlankNode]],
        paths: _Interner,
        values: _Interner,
        lexicals: _Interner,
        languages: _Interner,
        links: tuple[array[int], ...],
        literals: tuple[array[int], ...],
    ) -> None:
        """Rows of the statements made about blank nodes the works point at (``p q`` paths)."""
        for number, first, node in blanks:
            for quad in self.catalogue.triples(node, None, None):
                second = quad.predicate.value
                obj = quad.object
                if second == RDF.type or type(obj) is _BLANK:
                    continue
                path = paths(f"{first} {second}")
                if type(obj) is _LITERAL:
                    literals[0].append(number)
                    literals[1].append(path)
                    literals[2].append(lexicals(obj.value))
                    literals[3].append(languages(obj.language or ""))
                else:
                    links[0].append(number)
                    links[1].append(path)
                    links[2].append(values(node_key(obj)))

    # ----- labels, links, hierarchy -------------------------------------------------------

    def forget_labels(self) -> None:
        """Drop the reader's copies of the labels read (every label of every node in every
        language: a good part of what indexing holds at its peak) once they are used."""
        self._labels.clear()

    def labels(
        self, label_properties: Sequence[str] = LABEL_PROPERTIES
    ) -> dict[str, list[LabelCandidate]]:
        """Every label of every node (see :func:`read_labels`); the reader's own copy."""
        key = tuple(label_properties)
        found = self._labels.get(key)
        if found is None:
            read = self._read_labels if self._direct else self._select_labels
            found = self._labels[key] = read(label_properties)
        return found

    def _read_labels(self, label_properties: Sequence[str]) -> dict[str, list[LabelCandidate]]:
        direct = [p for p in label_properties if " " not in p]
        rank = {p: i for i, p in enumerate(label_properties)}
        labels: dict[str, list[LabelCandidate]] = defaultdict(list)
        nodes = [_named(p) for p in direct]
        for prop, node in zip(direct, nodes, strict=True):
            prop_rank = rank[prop]
            for quad in self.catalogue.triples(None, node, None):
                lit = quad.object
                if type(lit) is not _LITERAL:
                    continue
                subject = quad.subject
                key = "_:" + subject.value if type(subject) is _BLANK else subject.value
                labels[key].append(LabelCandidate(lit.value, lit.language or "", prop_rank))
        for path in label_properties:
            if " " not in path:
                continue
            first, second = (_named(p) for p in path_parts(path)[:2])
            for quad in self.catalogue.triples(None, first, None):
                middle = quad.object
                if type(middle) is not _BLANK:
                    continue
                key = node_key(quad.subject)
                for inner in self.catalogue.triples(middle, second, None):
                    lit = inner.object
                    if type(lit) is _LITERAL:
                        labels[key].append(
                            LabelCandidate(lit.value, lit.language or "", rank[path])
                        )
        return dict(labels)

    def edges(self, predicates: Sequence[str]) -> list[tuple[str, str, str]]:
        """All (subject, predicate, object) with one of ``predicates`` between two IRIs."""
        found: list[tuple[str, str, str]] = []
        for predicate in predicates:
            cached = self._edges.get(predicate)
            if cached is None:
                if self._direct:
                    cached = [
                        (q.subject.value, predicate, q.object.value)
                        for q in self.catalogue.triples(None, _named(predicate), None)
                        if type(q.subject) is _NAMED and type(q.object) is _NAMED
                    ]
                else:
                    rows = self.catalogue.select(
                        f"SELECT ?a ?b WHERE {{ ?a <{sparql_iri(predicate)}> ?b . "
                        "FILTER(isIRI(?a) && isIRI(?b)) }"
                    )
                    cached = [(a.value, predicate, b.value) for a, b in rows if a and b]
                self._edges[predicate] = cached
            found.extend(cached)
        return found

    def has_edge(self, predicate: str) -> bool:
        """Whether any statement with ``predicate`` joins two IRIs."""
        if predicate in self._edges or not self._direct:
            return bool(self.edges([predicate]))
        return any(
            type(q.subject) is _NAMED and type(q.object) is _NAMED
            for q in self.catalogue.triples(None, _named(predicate), None)
        )

    def outgoing(self, subjects: Iterable[str]) -> list[tuple[str, str, str]]:
        """IRI-valued statements made about the given nodes, ``rdf:type`` left out (blank nodes
        and what is not a usable IRI have none)."""
        subjects = list(subjects)
        cache = self._outgoing
        missing = [s for s in dict.fromkeys(subjects) if s not in cache]
        if self._direct:
            for subject in missing:
                cache[subject] = self._outgoing_of(subject)
        else:
            self._select_outgoing(missing)
        found: list[tuple[str, str, str]] = []
        for subject in subjects:
            found.extend(cache[subject])
        return found

    def _outgoing_of(self, subject: str) -> list[tuple[str, str, str]]:
        iri = _usable_iri(subject)
        if iri is None:
            return []
        try:
            node = _NAMED(iri)
        except ValueError:
            return []
        return [
            (subject, q.predicate.value, q.object.value)
            for q in self.catalogue.triples(node, None, None)
            if type(q.object) is _NAMED and q.predicate.value != RDF.type
        ]

    # ----- the same in SPARQL, for a catalogue without an embedded store ------------------

    def _select_outgoing(self, subjects: Sequence[str]) -> None:
        cache = self._outgoing
        usable = []
        for subject in subjects:
            cache[subject] = []
            if _usable_iri(subject) is not None:
                usable.append(subject)
        for start in range(0, len(usable), 2000):
            batch = usable[start : start + 2000]
            rows = self.catalogue.select(
                f"SELECT ?a ?p ?b WHERE {{ VALUES ?a {{ {iri_list(batch)} }} ?a ?p ?b . "
                f"FILTER(isIRI(?b) && ?p != <{RDF.type}>) }}"
            )
            for a, p, b in rows:
                if a and p and b:
                    cache.setdefault(a.value, []).append((a.value, p.value, b.value))

    def _select_labels(self, label_properties: Sequence[str]) -> dict[str, list[LabelCandidate]]:
        direct = [p for p in label_properties if " " not in p]
        rank = {p: i for i, p in enumerate(label_properties)}
        labels: dict[str, list[LabelCandidate]] = defaultdict(list)
        rows = self.catalogue.select(
            f"SELECT ?s ?p ?l WHERE {{ VALUES ?p {{ {iri_list(direct)} }} ?s ?p ?l . "
            "FILTER(isLiteral(?l)) }"
        )
        for s, p, lit in rows:
            if s is None or p is None or lit is None:
                continue
            labels[node_key(s)].append(  # type: ignore[arg-type]
                LabelCandidate(lit.value, lit.language or "", rank[p.value])  # type: ignore[union-attr]
            )
        for path in label_properties:
            if " " not in path:
                continue
            first, second = path_parts(path)[:2]
            rows = self.catalogue.select(
                f"SELECT ?s ?l WHERE {{ ?s <{sparql_iri(first)}> ?b . FILTER(isBlank(?b)) "
                f"?b <{sparql_iri(second)}> ?l . FILTER(isLiteral(?l)) }}"
            )
            for s, lit in rows:
                if s is not None and lit is not None:
                    labels[node_key(s)].append(  # type: ignore[arg-type]
                        LabelCandidate(lit.value, lit.language or "", rank[path])  # type: ignore[union-attr]
                    )
        return dict(labels)

    def _select_work_statements(
        self, work_classes: Sequence[str], instance_links: Sequence[str], progress: Progress
    ) -> WorkStatements:
        works_q = (
            f"{{ SELECT DISTINCT ?w WHERE {{ VALUES ?c {{ {iri_list(work_classes)} }} "
            "?w a ?c } }"
        )
        catalogue = self.catalogue
        works = sorted(
            node_key(w)  # type: ignore[arg-type]
            for (w,) in catalogue.select(f"SELECT ?w WHERE {works_q}")
            if w is not None
        )
        if not works:
            return WorkStatements(works=works)
        sources = instance_sources(works_q, instance_links)
        link_preds = {link.lstrip("^") for link in instance_links}
        links: dict[tuple[str, str, str], None] = {}
        literals: dict[tuple[str, str, str, str], None] = {}

        def add(work: str, path: str, obj: Term) -> None:
            if isinstance(obj, ox.Literal):
                literals.setdefault((work, path, obj.value, obj.language or ""))
            else:
                links.setdefault((work, path, node_key(obj)))  # type: ignore[arg-type]

        for number, source in enumerate(sources):
            progress.report("Reading works", number / len(sources))
            is_instance = number > 0
            direct = f"SELECT ?w ?p ?o WHERE {{ {source} ?s ?p ?o . }}"
            nested = (
                f"SELECT ?w ?p ?q ?o WHERE {{ {source} ?s ?p ?b . FILTER(isBlank(?b)) "
                f"?b ?q ?o . FILTER(?q != <{RDF.type}>) }}"
            )
            for w, p, o in catalogue.select(direct):
                if w is None or p is None or o is None or isinstance(o, ox.BlankNode):
                    continue
                if is_instance and (p.value == RDF.type or p.value in link_preds):
                    continue
                add(node_key(w), p.value, o)  # type: ignore[arg-type]
            for w, p, q, o in catalogue.select(nested):
                if w is None or p is None or q is None or o is None or isinstance(o, ox.BlankNode):
                    continue
                add(node_key(w), join_path(p.value, q.value), o)  # type: ignore[arg-type]
        progress.report("Reading works", 1.0)
        return WorkStatements(works=works, links=list(links), literals=list(literals))


def _drop_repeats(columns: StatementColumns) -> None:
    """Keep the first of rows that say the same (two literals differing only in datatype,
    a statement made of a work and of its instance, two blank nodes with the same value)."""
    keep = _first_occurrences(columns.link_work, columns.link_path, columns.link_value)
    if keep is not None:
        columns.link_work = columns.link_work[keep]
        columns.link_path = columns.link_path[keep]
        columns.link_value = columns.link_value[keep]
    keep = _first_occurrences(
        columns.literal_work,
        columns.literal_path,
        columns.literal_lexical,
        columns.literal_language,
    )
    if keep is not None:
        columns.literal_work = columns.literal_work[keep]
        columns.literal_path = columns.literal_path[keep]
        columns.literal_lexical = columns.literal_lexical[keep]
        columns.literal_language = columns.literal_language[keep]


# ----- the functions of old, each a fresh read -------------------------------------------------


def class_counts(catalogue: Catalogue) -> dict[str, int]:
    """How many distinct things are typed with each class."""
    return CatalogueReader(catalogue).class_counts()


def subclass_pairs(catalogue: Catalogue) -> list[tuple[str, str]]:
    return CatalogueReader(catalogue).subclass_pairs()


def read_works(
    catalogue: Catalogue,
    work_classes: Sequence[str],
    instance_links: Sequence[str] = (),
    progress: Progress | None = None,
) -> WorkStatements:
    """Every statement about every work, including those made about its instances.

    ``instance_links`` are paths from an instance to its work (``bf:instanceOf``), or, written
    ``^P``, from a work to its instances (``schema:workExample``). Statements of an instance are
    attributed to its work, so a date on a BIBFRAME instance dates the work.
    """
    return CatalogueReader(catalogue).work_statements(work_classes, instance_links, progress)


def read_labels(
    catalogue: Catalogue, label_properties: Sequence[str] = LABEL_PROPERTIES
) -> dict[str, list[LabelCandidate]]:
    """Every label of every node, keyed by node, ranked by the order of ``label_properties``."""
    return CatalogueReader(catalogue).labels(label_properties)


def read_types(catalogue: Catalogue) -> dict[str, set[str]]:
    """The classes of every typed node."""
    return CatalogueReader(catalogue).shared_types()


def read_edges(catalogue: Catalogue, predicates: Sequence[str]) -> list[tuple[str, str, str]]:
    """All (subject, predicate, object) with one of ``predicates`` between two IRIs."""
    return CatalogueReader(catalogue).edges(predicates)


def read_outgoing(catalogue: Catalogue, subjects: Iterable[str]) -> list[tuple[str, str, str]]:
    """IRI-valued statements made about the given nodes (used for links between creators)."""
    return CatalogueReader(catalogue).outgoing(subjects)


@contextlib.contextmanager
def paused_gc() -> Iterator[None]:
    """Pause Python's cycle collector while a catalogue is read and indexed.

    Reading builds millions of small objects that all live on (tuples, labels, records); the
    collector would walk all of them again and again as they pile up, for nothing, since none
    of them is garbage. Reference counting still frees what is dropped. Once the work is done,
    what it built is frozen out of later collections (``gc.freeze``), so that a suggestion made
    just after opening does not pay for one full walk over the whole index.
    """
    was_enabled = gc.isenabled()
    gc.disable()
    done = False
    try:
        yield
        done = True
    finally:
        if done:
            gc.freeze()
        if was_enabled:
            gc.enable()

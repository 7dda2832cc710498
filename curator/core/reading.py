"""Pulling out of the store what the profile and the index need, in a few bulk queries.

Everything is read through SPARQL SELECT so that the same code serves the embedded store and,
later, a remote endpoint. A *path* is one property IRI, or two joined by a space when the first
leads to a blank node (``bf:contribution bf:agent``): IRIs cannot contain spaces, so the join is
unambiguous, and a blank node in the middle is how BIBFRAME and others attach titles and agents.
"""

from __future__ import annotations

from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field

import pyoxigraph as ox

from curator.core.catalogue import Catalogue
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


def path_parts(path: str) -> list[str]:
    """The property IRIs of a path, in order."""
    return path.split(" ")


def join_path(*iris: str) -> str:
    return " ".join(iris)


def _iri_list(iris: Iterable[str]) -> str:
    return " ".join(f"<{sparql_iri(i)}>" for i in iris)


def sparql_iri(iri: str) -> str:
    """An IRI made safe to place between ``<`` and ``>`` in a query.

    Raises:
        ValueError: the IRI holds characters SPARQL forbids in an IRI reference.
    """
    if any(ch in iri for ch in '<>"{}|^`\\ \n\r\t') or any(ord(ch) < 0x20 for ch in iri):
        raise ValueError(f"not a usable IRI: {iri!r}")
    return iri


def node_key(term: ox.NamedNode | ox.BlankNode) -> str:
    """A string naming a node: the IRI itself, or ``_:id`` for a blank node."""
    if isinstance(term, ox.BlankNode):
        return "_:" + term.value
    return term.value


@dataclass
class WorkStatements:
    """What the catalogue says about its works, instances folded in and blank nodes followed."""

    works: list[str]
    #: (work, path, object node)
    links: list[tuple[str, str, str]] = field(default_factory=list)
    #: (work, path, lexical form, language tag or '')
    literals: list[tuple[str, str, str, str]] = field(default_factory=list)


def class_counts(catalogue: Catalogue) -> dict[str, int]:
    """How many distinct things are typed with each class."""
    rows = catalogue.select(
        "SELECT ?c (COUNT(DISTINCT ?s) AS ?n) WHERE { ?s a ?c . FILTER(isIRI(?c)) } GROUP BY ?c"
    )
    return {c.value: int(n.value) for c, n in rows if c is not None and n is not None}


def subclass_pairs(catalogue: Catalogue) -> list[tuple[str, str]]:
    rows = catalogue.select(
        f"SELECT ?c ?d WHERE {{ ?c <{RDFS.subClassOf}> ?d . FILTER(isIRI(?c) && isIRI(?d)) }}"
    )
    return [(c.value, d.value) for c, d in rows if c is not None and d is not None]


def _work_pattern(work_classes: Sequence[str]) -> str:
    return f"{{ SELECT DISTINCT ?w WHERE {{ VALUES ?c {{ {_iri_list(work_classes)} }} ?w a ?c }} }}"


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
    progress = progress or silent()
    works_q = _work_pattern(work_classes)
    works = sorted(
        node_key(w)
        for (w,) in catalogue.select(f"SELECT ?w WHERE {works_q}")
        if w is not None
    )
    result = WorkStatements(works=works)
    if not works:
        return result
    sources = [f"{works_q} BIND(?w AS ?s)"]
    for link in instance_links:
        if link.startswith("^"):
            sources.append(f"{works_q} ?w <{sparql_iri(link[1:])}> ?s .")
        else:
            sources.append(f"{works_q} ?s <{sparql_iri(link)}> ?w .")
    link_preds = {link.lstrip("^") for link in instance_links}
    seen_links: set[tuple[str, str, str]] = set()
    seen_literals: set[tuple[str, str, str, str]] = set()
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
            _add(result, seen_links, seen_literals, node_key(w), p.value, o)
        for w, p, q, o in catalogue.select(nested):
            if w is None or p is None or q is None or o is None or isinstance(o, ox.BlankNode):
                continue
            _add(result, seen_links, seen_literals, node_key(w), join_path(p.value, q.value), o)
    progress.report("Reading works", 1.0)
    return result


def _add(
    result: WorkStatements,
    seen_links: set[tuple[str, str, str]],
    seen_literals: set[tuple[str, str, str, str]],
    work: str,
    path: str,
    obj: ox.NamedNode | ox.Literal | ox.BlankNode,
) -> None:
    if isinstance(obj, ox.Literal):
        row = (work, path, obj.value, obj.language or "")
        if row not in seen_literals:
            seen_literals.add(row)
            result.literals.append(row)
    else:
        link = (work, path, node_key(obj))
        if link not in seen_links:
            seen_links.add(link)
            result.links.append(link)


def read_labels(
    catalogue: Catalogue, label_properties: Sequence[str] = LABEL_PROPERTIES
) -> dict[str, list[LabelCandidate]]:
    """Every label of every node, keyed by node, ranked by the order of ``label_properties``."""
    direct = [p for p in label_properties if " " not in p]
    rank = {p: i for i, p in enumerate(label_properties)}
    labels: dict[str, list[LabelCandidate]] = defaultdict(list)
    rows = catalogue.select(
        f"SELECT ?s ?p ?l WHERE {{ VALUES ?p {{ {_iri_list(direct)} }} ?s ?p ?l . "
        "FILTER(isLiteral(?l)) }"
    )
    for s, p, lit in rows:
        if s is None or p is None or lit is None:
            continue
        labels[node_key(s)].append(LabelCandidate(lit.value, lit.language or "", rank[p.value]))
    for path in label_properties:
        if " " not in path:
            continue
        first, second = path_parts(path)[:2]
        rows = catalogue.select(
            f"SELECT ?s ?l WHERE {{ ?s <{sparql_iri(first)}> ?b . FILTER(isBlank(?b)) "
            f"?b <{sparql_iri(second)}> ?l . FILTER(isLiteral(?l)) }}"
        )
        for s, lit in rows:
            if s is not None and lit is not None:
                labels[node_key(s)].append(
                    LabelCandidate(lit.value, lit.language or "", rank[path])
                )
    return dict(labels)


def read_types(catalogue: Catalogue) -> dict[str, set[str]]:
    """The classes of every typed node."""
    types: dict[str, set[str]] = defaultdict(set)
    for s, c in catalogue.select("SELECT ?s ?c WHERE { ?s a ?c . FILTER(isIRI(?c)) }"):
        if s is not None and c is not None:
            types[node_key(s)].add(c.value)
    return dict(types)


def read_edges(catalogue: Catalogue, predicates: Sequence[str]) -> list[tuple[str, str, str]]:
    """All (subject, predicate, object) with one of ``predicates`` between two IRIs."""
    if not predicates:
        return []
    rows = catalogue.select(
        f"SELECT ?a ?p ?b WHERE {{ VALUES ?p {{ {_iri_list(predicates)} }} ?a ?p ?b . "
        "FILTER(isIRI(?a) && isIRI(?b)) }"
    )
    return [(a.value, p.value, b.value) for a, p, b in rows if a and p and b]


def read_outgoing(catalogue: Catalogue, subjects: Iterable[str]) -> list[tuple[str, str, str]]:
    """IRI-valued statements made about the given nodes (used for links between creators)."""
    found: list[tuple[str, str, str]] = []
    batch: list[str] = []

    def flush() -> None:
        if not batch:
            return
        rows = catalogue.select(
            f"SELECT ?a ?p ?b WHERE {{ VALUES ?a {{ {_iri_list(batch)} }} ?a ?p ?b . "
            f"FILTER(isIRI(?b) && ?p != <{RDF.type}>) }}"
        )
        found.extend((a.value, p.value, b.value) for a, p, b in rows if a and p and b)
        batch.clear()

    for subject in subjects:
        if subject.startswith("_:"):
            continue
        try:
            batch.append(sparql_iri(subject))
        except ValueError:
            continue
        if len(batch) >= 2000:
            flush()
    flush()
    return found


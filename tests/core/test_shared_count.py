"""The shared-count baseline: the index's counts against SPARQL run by two independent engines."""

from __future__ import annotations

from collections import Counter

import pytest
import rdflib
from rdflib.namespace import RDF

from curator.core.baseline import (
    property_incidence,
    run_shared_count_query,
    shared_count_query,
    shared_counts,
)
from curator.core.suggest import SuggestSettings
from curator.services.suggestions import SuggestRequest, suggest

SCHEMA_ABOUT = "https://schema.org/about"
DC_SUBJECT = "http://purl.org/dc/terms/subject"


def spread(n: int, k: int = 6) -> list[int]:
    """k positions spread evenly over n works (first, last and between), not picked by hand."""
    return sorted({round(i * (n - 1) / (k - 1)) for i in range(k)})


def counts_by_suggester(workspace, seed: int, prop: str, kinds: tuple[str, ...] = ()):
    settings = SuggestSettings(mode="shared-count", limit=1000, shared_property=prop, kinds=kinds)
    result = workspace.suggester.suggest([seed], settings)
    return result, {s.iri: int(s.score) for s in result.suggestions}


def counts_by_rdflib_sparql(graph: rdflib.Graph, seed: str, prop: str, type_iri=None):
    # reference: rdflib's SPARQL 1.1 engine running the same query text
    rows = graph.query(shared_count_query(seed, prop, type_iri))
    return {str(rec): int(n) for rec, n in rows}


def counts_by_hand(graph: rdflib.Graph, seed: str, prop: str, type_iri=None) -> dict[str, int]:
    """The definition itself: |values(seed) ∩ values(rec)|, counted over rdflib's triples."""
    p = rdflib.URIRef(prop)
    mine = set(graph.objects(rdflib.URIRef(seed), p))
    counts: Counter[str] = Counter()
    for rec, _p, value in graph.triples((None, p, None)):
        if value not in mine or str(rec) == seed:
            continue
        if type_iri is None or (rec, RDF.type, rdflib.URIRef(type_iri)) in graph:
            counts[str(rec)] += 1
    return dict(counts)


def assert_non_increasing(result) -> None:
    scores = [s.score for s in result.suggestions]
    assert scores == sorted(scores, reverse=True)


def test_demo_shared_counts_equal_sparql_in_both_engines(demo_workspace, demo_rdflib):
    index = demo_workspace.index
    for seed in spread(len(index.works)):
        iri = index.works[seed]
        result, got = counts_by_suggester(demo_workspace, seed, SCHEMA_ABOUT)
        expected = counts_by_hand(demo_rdflib, iri, SCHEMA_ABOUT)
        assert expected, f"{iri} shares no theme with anything; pick other seeds"
        assert got == expected
        # reference: pyoxigraph's SPARQL engine
        assert run_shared_count_query(demo_workspace.catalogue, iri, SCHEMA_ABOUT) == expected
        assert counts_by_rdflib_sparql(demo_rdflib, iri, SCHEMA_ABOUT) == expected
        assert_non_increasing(result)


def test_demo_default_shared_property_is_the_subject_theme(demo_workspace, demo_rdflib):
    index = demo_workspace.index
    seed = len(index.works) // 3
    result = demo_workspace.suggester.suggest([seed], SuggestSettings(mode="shared-count"))
    expected = counts_by_hand(demo_rdflib, index.works[seed], SCHEMA_ABOUT)
    top = sorted(expected.values(), reverse=True)[:10]
    assert [int(s.score) for s in result.suggestions] == top


def test_demo_shared_counts_with_a_type_restriction(demo_workspace, demo_rdflib):
    index = demo_workspace.index
    film = next(
        str(c)
        for c in demo_rdflib.subjects(rdflib.RDFS.label, rdflib.Literal("Film", lang="en"))
    )
    # the SPARQL restriction ?rec a <T> does not follow subclasses, so check there are none
    assert not set(demo_rdflib.subjects(rdflib.RDFS.subClassOf, rdflib.URIRef(film)))
    for seed in spread(len(index.works), 5):
        iri = index.works[seed]
        result, got = counts_by_suggester(demo_workspace, seed, SCHEMA_ABOUT, kinds=(film,))
        expected = counts_by_hand(demo_rdflib, iri, SCHEMA_ABOUT, film)
        assert got == expected
        assert run_shared_count_query(demo_workspace.catalogue, iri, SCHEMA_ABOUT, film) == expected
        assert counts_by_rdflib_sparql(demo_rdflib, iri, SCHEMA_ABOUT, film) == expected
        assert_non_increasing(result)


def test_dc_fixture_shared_subject_counts(dc_workspace, dc_rdflib):
    index = dc_workspace.index
    for seed, iri in enumerate(index.works):
        result, got = counts_by_suggester(dc_workspace, seed, DC_SUBJECT)
        expected = counts_by_hand(dc_rdflib, iri, DC_SUBJECT)
        assert got == expected, iri
        assert run_shared_count_query(dc_workspace.catalogue, iri, DC_SUBJECT) == expected
        assert counts_by_rdflib_sparql(dc_rdflib, iri, DC_SUBJECT) == expected
        assert_non_increasing(result)


def test_dc_fixture_shared_counts_restricted_to_moving_images(dc_workspace, dc_rdflib):
    moving = "http://purl.org/dc/dcmitype/MovingImage"
    index = dc_workspace.index
    for seed, iri in enumerate(index.works):
        _, got = counts_by_suggester(dc_workspace, seed, DC_SUBJECT, kinds=(moving,))
        expected = counts_by_hand(dc_rdflib, iri, DC_SUBJECT, moving)
        assert got == expected, iri
        assert counts_by_rdflib_sparql(dc_rdflib, iri, DC_SUBJECT, moving) == expected


def test_dc_fixture_counts_read_off_the_file(dc_workspace):
    # reference: tests/fixtures/dcterms_skos.ttl read by eye: w01 is about lighthouses and
    # siblings; the film f01 has both, w03 and w23 have lighthouses, w09, w15, w24, f04 siblings.
    base = "https://catalogue.example/dc/work/"
    expected = {"f01": 2, "w03": 1, "w23": 1, "w09": 1, "w15": 1, "w24": 1, "f04": 1}
    seed = dc_workspace.index.position[base + "w01"]
    result, got = counts_by_suggester(dc_workspace, seed, DC_SUBJECT)
    assert got == {base + k: v for k, v in expected.items()}
    assert result.suggestions[0].iri == base + "f01"


@pytest.mark.parametrize("prop", ["https://schema.org/inLanguage", "https://schema.org/genre"])
def test_shared_count_on_a_property_outside_the_themes(demo_workspace, demo_rdflib, prop):
    index = demo_workspace.index
    seed = len(index.works) // 2
    iri = index.works[seed]
    settings = SuggestSettings(mode="shared-count", limit=1000, shared_property=prop)
    result = suggest(demo_workspace, SuggestRequest(seeds=(iri,), settings=settings))
    got = {s.iri: int(s.score) for s in result.suggestions}
    assert got == counts_by_hand(demo_rdflib, iri, prop)


def test_incidence_product_sums_over_seeds(demo_workspace, demo_rdflib):
    index = demo_workspace.index
    incidence = property_incidence(demo_workspace.catalogue, index, SCHEMA_ABOUT)
    seeds = spread(len(index.works), 3)
    got = shared_counts(incidence, seeds)
    expected: Counter[str] = Counter()
    for seed in seeds:
        expected.update(counts_by_hand(demo_rdflib, index.works[seed], SCHEMA_ABOUT))
    for position, iri in enumerate(index.works):
        if position in seeds:
            continue
        assert got[position] == expected.get(iri, 0), iri

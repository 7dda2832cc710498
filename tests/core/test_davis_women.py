"""Shared counts on the Davis Southern Women data (Davis, Gardner & Gardner 1941).

The women are typed with an invented class made a subclass of schema:CreativeWork, so the profile
takes them for works, and the events they attended are the values of ex:attended. The shared
count of two women is then the number of events both attended: the co-attendance matrix of
Breiger (1974), which networkx's bipartite weighted projection also computes.
"""

from __future__ import annotations

import re

import networkx as nx
import pytest
from networkx.algorithms import bipartite

from curator.core.baseline import run_shared_count_query
from curator.core.catalogue import Catalogue
from curator.core.index import build_index
from curator.core.profile import detect_profile
from curator.core.suggest import Suggester, SuggestSettings

EX = "https://davis.example/"
ATTENDED = EX + "attended"


def slug(name: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-")


@pytest.fixture(scope="module")
def davis():
    graph = nx.davis_southern_women_graph()
    women, events = graph.graph["top"], graph.graph["bottom"]
    lines = [
        "@prefix schema: <https://schema.org/> .",
        "@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .",
        f"@prefix ex: <{EX}> .",
        "ex:Woman rdfs:subClassOf schema:CreativeWork .",
        "ex:Event rdfs:label \"Social event\" .",
    ]
    for event in events:
        lines.append(f'ex:event-{slug(event)} a ex:Event ; rdfs:label "{event}" .')
    for woman in women:
        attended = " , ".join(f"ex:event-{slug(e)}" for e in sorted(graph[woman]))
        lines.append(
            f'ex:{slug(woman)} a ex:Woman ; schema:name "{woman}" ; ex:attended {attended} .'
        )
    catalogue = Catalogue.from_text("\n".join(lines), "turtle")
    profile = detect_profile(catalogue)
    index = build_index(catalogue, profile)
    return graph, catalogue, profile, index


def evelyn_counts(davis) -> dict[str, int]:
    _graph, _catalogue, _profile, index = davis
    seed = index.position[EX + "evelyn-jefferson"]
    settings = SuggestSettings(mode="shared-count", limit=100, shared_property=ATTENDED)
    result = Suggester(index).suggest([seed], settings)
    return {s.record.label: int(s.score) for s in result.suggestions}


def test_profile_reads_women_as_works_and_events_as_themes(davis):
    graph, _catalogue, profile, index = davis
    assert profile.work_classes == (EX + "Woman",)
    assert len(index.works) == len(graph.graph["top"]) == 18
    assert profile.theme(ATTENDED) is not None


def test_evelyn_co_attendance_matches_breiger_1974(davis):
    counts = evelyn_counts(davis)
    # reference: Breiger (1974), "The Duality of Persons and Groups", women x women matrix
    assert counts["Theresa Anderson"] == 7
    assert counts["Laura Mandeville"] == 6
    assert counts["Brenda Rogers"] == 6
    assert counts["Charlotte McDowd"] == 3


def test_evelyn_row_matches_networkx_bipartite_projection(davis):
    graph = davis[0]
    projection = bipartite.weighted_projected_graph(graph, graph.graph["top"])
    # reference: networkx.algorithms.bipartite.weighted_projected_graph (shared neighbours)
    expected = {
        other: data["weight"] for other, data in projection["Evelyn Jefferson"].items()
    }
    assert evelyn_counts(davis) == expected


def test_every_woman_matches_projection_and_sparql(davis):
    graph, catalogue, _profile, index = davis
    projection = bipartite.weighted_projected_graph(graph, graph.graph["top"])
    suggester = Suggester(index)
    settings = SuggestSettings(mode="shared-count", limit=100, shared_property=ATTENDED)
    for woman in graph.graph["top"]:
        iri = EX + slug(woman)
        result = suggester.suggest([index.position[iri]], settings)
        got = {s.iri: int(s.score) for s in result.suggestions}
        expected = {EX + slug(o): d["weight"] for o, d in projection[woman].items()}
        assert got == expected, woman
        assert run_shared_count_query(catalogue, iri, ATTENDED) == expected

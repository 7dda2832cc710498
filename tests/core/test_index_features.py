"""The index's feature matrices and graph, rebuilt from rdflib's reading of the DC fixture."""

from __future__ import annotations

import networkx as nx
import numpy as np
import rdflib
from rdflib.namespace import SKOS

DCT = rdflib.Namespace("http://purl.org/dc/terms/")


def broader_map(graph: rdflib.Graph) -> dict[str, set[str]]:
    # reference: W3C SKOS Reference (2009) §8: skos:narrower is the inverse of skos:broader
    parents: dict[str, set[str]] = {}
    for child, parent in graph.subject_objects(SKOS.broader):
        parents.setdefault(str(child), set()).add(str(parent))
    for parent, child in graph.subject_objects(SKOS.narrower):
        parents.setdefault(str(child), set()).add(str(parent))
    return parents


def levels_up(value: str, parents: dict[str, set[str]]) -> dict[str, int]:
    """Shortest number of broader steps from ``value`` to each ancestor (breadth first)."""
    found: dict[str, int] = {}
    frontier, level = [value], 0
    while frontier:
        level += 1
        nxt = []
        for node in frontier:
            for parent in parents.get(node, ()):
                if parent not in found and parent != value:
                    found[parent] = level
                    nxt.append(parent)
        frontier = nxt
    return found


def test_dc_subject_columns_hold_one_or_decay_to_the_level(dc_workspace, dc_rdflib):
    index = dc_workspace.index
    decay = index.profile.hierarchy_decay
    assert 0 < decay < 1
    parents = broader_map(dc_rdflib)
    subject = str(DCT.subject)
    for row, work in enumerate(index.works):
        expected: dict[str, float] = {}
        direct = {str(v) for v in dc_rdflib.objects(rdflib.URIRef(work), DCT.subject)}
        for value in direct:
            expected[value] = 1.0
            for ancestor, level in levels_up(value, parents).items():
                expected[ancestor] = max(expected.get(ancestor, 0.0), decay**level)
        cells = index.raw[row]
        got = {
            index.features[j].value: value
            for j, value in zip(cells.indices, cells.data, strict=True)
            if index.features[j].path == subject
        }
        # reference: rdflib's reading of dcterms:subject and the SKOS hierarchy: 1 for a value
        # the work has, decay ** (levels up) for each broader concept of one
        assert got == expected, work
        direct_got = {
            index.features[j].value
            for j in index.direct[row].indices
            if index.features[j].path == subject
        }
        assert direct_got == direct, work


def test_direct_matrix_is_binary(dc_workspace, demo_workspace):
    for workspace in (dc_workspace, demo_workspace):
        assert set(np.unique(workspace.index.direct.data)) == {1.0}


def test_vectors_are_unit_rows(demo_workspace):
    vectors = demo_workspace.index.vectors
    norms = np.sqrt(np.asarray(vectors.multiply(vectors).sum(axis=1)).ravel())
    has_features = np.diff(vectors.indptr) > 0
    np.testing.assert_allclose(norms[has_features], 1.0)


def test_graph_is_symmetric_and_joins_works_to_their_subjects(dc_workspace, dc_rdflib):
    index = dc_workspace.index
    graph = index.graph
    # an undirected graph: its adjacency matrix equals its transpose
    assert (graph != graph.T).nnz == 0
    assert index.graph_nodes[: len(index.works)] == index.works
    node = {key: i for i, key in enumerate(index.graph_nodes)}
    # reference: dcterms:subject triples as rdflib reads the fixture
    for work in index.works:
        for value in dc_rdflib.objects(rdflib.URIRef(work), DCT.subject):
            assert graph[node[work], node[str(value)]] > 0
    # a film is one step from its source text (dcterms:isVersionOf)
    for film, text in dc_rdflib.subject_objects(DCT.isVersionOf):
        assert graph[node[str(film)], node[str(text)]] > 0
    # reference: networkx.is_connected: every work reaches every other through shared
    # themes, creators and the hierarchy
    assert nx.is_connected(nx.from_scipy_sparse_array(graph))

"""Personalized PageRank checked against networkx, and the forward-push approximation's error."""

from __future__ import annotations

import networkx as nx
import numpy as np
import pytest
import scipy.sparse as sp

from curator.core.similarity import (
    PUSH_EPSILON,
    personalized_pagerank,
    personalized_pagerank_push,
)


def networkx_ppr(graph: nx.Graph, personalization: dict, nodes: list) -> np.ndarray:
    # reference: networkx.pagerank (power iteration, dangling nodes restart at personalization)
    ranks = nx.pagerank(
        graph, alpha=0.85, personalization=personalization, weight="weight",
        tol=1e-12, max_iter=10_000,
    )
    return np.array([ranks[v] for v in nodes])


def random_weighted_digraph(seed: int) -> nx.DiGraph:
    """Directed, weighted, with isolated nodes and nodes without out-edges."""
    rng = np.random.default_rng(seed)
    graph = nx.gnp_random_graph(60, 0.06, seed=seed, directed=True)
    for u, v in graph.edges:
        graph[u][v]["weight"] = float(rng.uniform(0.1, 3.0))
    graph.add_nodes_from(range(60, 65))  # isolated
    for node in (3, 11, 17):  # dangling: edges in, none out
        graph.remove_edges_from(list(graph.out_edges(node)))
        graph.add_edge(node + 1, node, weight=1.5)
    return graph


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_ppr_equals_networkx_on_random_graph_with_dangling_nodes(seed):
    graph = random_weighted_digraph(seed)
    nodes = sorted(graph.nodes)
    assert any(graph.out_degree(v) == 0 and graph.in_degree(v) > 0 for v in nodes)
    assert any(graph.degree(v) == 0 for v in nodes)
    adjacency = nx.to_scipy_sparse_array(graph, nodelist=nodes, weight="weight", format="csr")
    personalization = {0: 1.0, 3: 2.0, 61: 0.5}  # a dangling and an isolated seed too
    expected = networkx_ppr(graph, personalization, nodes)
    got = personalized_pagerank(sp.csr_matrix(adjacency), personalization, alpha=0.85, tol=1e-13)
    np.testing.assert_allclose(got, expected, atol=1e-6)
    assert got.sum() == pytest.approx(1.0)


def test_ppr_equals_networkx_on_karate_club():
    graph = nx.karate_club_graph()  # Zachary (1977), edge weights = interaction counts
    nodes = sorted(graph.nodes)
    adjacency = nx.to_scipy_sparse_array(graph, nodelist=nodes, weight="weight", format="csr")
    for personalization in ({0: 1.0}, {33: 1.0}, {5: 1.0, 24: 1.0}):
        expected = networkx_ppr(graph, personalization, nodes)
        got = personalized_pagerank(sp.csr_matrix(adjacency), personalization)
        np.testing.assert_allclose(got, expected, atol=1e-6)


def test_ppr_accepts_a_dense_restart_vector():
    graph = nx.karate_club_graph()
    adjacency = sp.csr_matrix(nx.to_scipy_sparse_array(graph, nodelist=sorted(graph.nodes)))
    restart = np.zeros(34)
    restart[[2, 8]] = 1.0
    expected = networkx_ppr(graph, {2: 1.0, 8: 1.0}, sorted(graph.nodes))
    np.testing.assert_allclose(personalized_pagerank(adjacency, restart), expected, atol=1e-6)


def demo_seeds(index) -> list[int]:
    """Two works spread through the collection (first and middle by IRI)."""
    return [0, len(index.works) // 2]


def test_ppr_equals_networkx_on_demo_graph(demo_workspace):
    index = demo_workspace.index
    adjacency = index.graph
    assert (adjacency != adjacency.T).nnz == 0
    graph = nx.from_scipy_sparse_array(adjacency)
    personalization = dict.fromkeys(demo_seeds(index), 1.0)
    expected = networkx_ppr(graph, personalization, list(range(adjacency.shape[0])))
    got = personalized_pagerank(adjacency, personalization)
    np.testing.assert_allclose(got, expected, atol=1e-6)


def assert_push_within_bounds(
    adjacency: sp.csr_matrix, seeds: list[int], epsilon: float | None, *, small: int | None = None
) -> None:
    """``epsilon=None`` runs the push with its default threshold. The error must also be small
    (< 1e-4) at the first ``small`` nodes (all nodes when None): a hub's bound grows with its
    degree, and only the works' values are ranked."""
    graph = nx.from_scipy_sparse_array(adjacency)
    personalization = dict.fromkeys(seeds, 1.0)
    exact = networkx_ppr(graph, personalization, list(range(adjacency.shape[0])))
    if epsilon is None:
        approx = personalized_pagerank_push(adjacency, personalization)
        epsilon = PUSH_EPSILON
    else:
        approx = personalized_pagerank_push(adjacency, personalization, epsilon=epsilon)
    degree = np.asarray(adjacency.sum(axis=1)).ravel()
    error = exact - approx
    # Andersen, Chung & Lang (2006): p = x + pr(r) with r >= 0, so the estimate never exceeds
    # the exact value, the missing L1 mass equals the residual left (1 - sum x), and on an
    # undirected graph the error at v is below epsilon * d(v) once no residual exceeds
    # epsilon * d(u).
    assert error.min() > -1e-9
    assert error.sum() == pytest.approx(1.0 - approx.sum(), abs=1e-8)
    assert np.all(error <= epsilon * degree + 1e-9)
    assert np.abs(error[:small]).max() < 1e-4


@pytest.mark.parametrize("seed", [7, 8])
def test_push_error_bound_on_random_undirected_graph(seed):
    graph = nx.connected_watts_strogatz_graph(300, 6, 0.3, seed=seed)
    rng = np.random.default_rng(seed)
    for u, v in graph.edges:
        graph[u][v]["weight"] = float(rng.uniform(0.2, 2.0))
    adjacency = sp.csr_matrix(nx.to_scipy_sparse_array(graph, nodelist=sorted(graph.nodes)))
    assert_push_within_bounds(adjacency, [0, 150], epsilon=1e-7)


def test_push_error_bound_on_karate_club():
    graph = nx.karate_club_graph()
    adjacency = sp.csr_matrix(nx.to_scipy_sparse_array(graph, nodelist=sorted(graph.nodes)))
    assert_push_within_bounds(adjacency, [0], epsilon=1e-7)


@pytest.mark.parametrize("epsilon", [1e-7, None])
def test_push_close_to_exact_on_demo_graph(demo_workspace, epsilon):
    index = demo_workspace.index
    seeds = demo_seeds(index)
    assert_push_within_bounds(index.graph, seeds, epsilon=epsilon)
    graph = nx.from_scipy_sparse_array(index.graph)
    exact = networkx_ppr(graph, dict.fromkeys(seeds, 1.0), list(range(index.graph.shape[0])))
    approx = personalized_pagerank_push(index.graph, dict.fromkeys(seeds, 1.0))
    n = len(index.works)
    top_exact = np.argsort(-exact[:n], kind="stable")[:10]
    top_approx = np.argsort(-approx[:n], kind="stable")[:10]
    np.testing.assert_array_equal(top_approx, top_exact)


def test_push_error_bound_with_a_hub_on_a_large_sparse_graph():
    # Works and themes as in a catalogue: a sparse bipartite graph, plus one hub (a form heading
    # such as "Fiction") on 30 % of the works. Large and sparse enough that rounds push node by
    # node rather than over the whole graph, and the hub's round takes the one-pass count.
    rng = np.random.default_rng(3)
    works, themes = 20000, 2000
    hub = works + themes
    edges = {(w, works + int(t)) for w in range(works) for t in rng.integers(0, themes, 8)}
    edges |= {(w, hub) for w in rng.choice(works, int(0.3 * works), replace=False).tolist()}
    graph = nx.Graph()
    graph.add_nodes_from(range(hub + 1))
    graph.add_edges_from(edges)
    adjacency = sp.csr_matrix(nx.to_scipy_sparse_array(graph, nodelist=range(hub + 1)))
    seed = next(w for w, h in sorted(edges) if h == hub)
    assert_push_within_bounds(adjacency, [seed], epsilon=None, small=works)
    assert_push_within_bounds(adjacency, [seed, seed + 1], epsilon=1e-6, small=works)

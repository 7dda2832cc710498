"""The classic shared-category ranking, kept as a mode and as a test oracle.

Rank other works by how many values of one property they share with the seed: the SPARQL query
``SELECT ?rec (COUNT(?cat) AS ?n) WHERE { <seed> P ?cat . ?rec P ?cat . FILTER(?rec != <seed>) }
GROUP BY ?rec ORDER BY DESC(?n)``. We compute the same counts as one sparse product of the
work x value incidence matrix with the seed's row, which is what makes it fast on a large store.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import pyoxigraph as ox
import scipy.sparse as sp

from curator.core.catalogue import Catalogue
from curator.core.index import Index
from curator.core.reading import node_key, sparql_iri


def shared_count_query(seed: str, prop: str, type_iri: str | None = None) -> str:
    """The SPARQL text of the baseline for one seed, optionally restricted to one type."""
    restriction = f"?rec a <{sparql_iri(type_iri)}> ." if type_iri else ""
    return (
        "SELECT ?rec (COUNT(?cat) AS ?n) WHERE { "
        f"<{sparql_iri(seed)}> <{sparql_iri(prop)}> ?cat . ?rec <{sparql_iri(prop)}> ?cat . "
        f"{restriction} FILTER(?rec != <{sparql_iri(seed)}>) }} GROUP BY ?rec ORDER BY DESC(?n)"
    )


def run_shared_count_query(
    catalogue: Catalogue, seed: str, prop: str, type_iri: str | None = None
) -> dict[str, int]:
    """The baseline's counts as the store computes them (the oracle the index is checked by)."""
    rows = catalogue.select(shared_count_query(seed, prop, type_iri))
    return {node_key(rec): int(n.value) for rec, n in rows if rec is not None and n is not None}


def property_incidence(catalogue: Catalogue, index: Index, prop: str) -> sp.csr_matrix:
    """Works x distinct values of ``prop`` (1 where a work has the value), read from the store.

    Only direct statements of works count, as in the query; the hierarchy plays no part.
    """
    rows = catalogue.select(f"SELECT DISTINCT ?w ?v WHERE {{ ?w <{sparql_iri(prop)}> ?v }}")
    values: dict[str, int] = {}
    r: list[int] = []
    c: list[int] = []
    for w, v in rows:
        if w is None or v is None:
            continue
        position = index.position.get(node_key(w))
        if position is None:
            continue
        key = f'"{v.value}"@{v.language or ""}^^{v.datatype.value}' if isinstance(
            v, ox.Literal
        ) else node_key(v)
        r.append(position)
        c.append(values.setdefault(key, len(values)))
    data = np.ones(len(r), dtype=np.float64)
    return sp.csr_matrix((data, (r, c)), shape=(index.size, len(values)))


def shared_counts(incidence: sp.csr_matrix, seeds: Sequence[int]) -> np.ndarray:
    """For each work, the number of values it shares with the seeds (summed over seeds)."""
    if not seeds:
        return np.zeros(incidence.shape[0])
    seed_rows = sp.csr_matrix(incidence[list(seeds)].sum(axis=0))
    return np.asarray((incidence @ seed_rows.T).todense()).ravel()

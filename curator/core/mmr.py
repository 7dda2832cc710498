"""Maximal marginal relevance: relevant, but not more of the same.

Carbonell & Goldstein (1998) pick, one at a time, the candidate that maximises
``lambda * relevance - (1 - lambda) * max similarity to what is already chosen``. With
``lambda = 1`` that is the relevance order; lower values trade relevance for variety. Here "what
is already chosen" also holds the seeds and the curator's list so far, so a suggestion that
merely repeats an item already on the list is pushed down.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import numpy as np


def maximal_marginal_relevance(
    relevance: np.ndarray,
    similarity: np.ndarray | Callable[[int], np.ndarray],
    k: int,
    lam: float,
    *,
    already: np.ndarray | None = None,
) -> list[int]:
    """Indices of up to ``k`` candidates in MMR order.

    Args:
        relevance: shape ``(m,)``, the relevance of each candidate.
        similarity: shape ``(m, m)``, similarity between candidates (symmetric); or a function
            giving its column ``j``, since only the columns of the picks are ever read.
        k: how many to pick.
        lam: the trade-off in [0, 1]; 1 is pure relevance.
        already: shape ``(m, a)``, similarity of each candidate to items chosen before this
            call (seeds, the list); counts as redundancy from the first pick on.

    Ties go to the lower index, so callers pass candidates in relevance order for a stable result.
    """
    if not 0.0 <= lam <= 1.0:
        raise ValueError(f"lambda must be between 0 and 1, not {lam}")
    m = len(relevance)
    k = min(k, m)
    redundancy = np.zeros(m)
    if already is not None and already.size:
        redundancy = already.max(axis=1)
    chosen: list[int] = []
    available = np.ones(m, dtype=bool)
    has_redundancy = already is not None and already.size > 0
    columns = similarity if callable(similarity) else _columns_of(similarity)
    for _ in range(k):
        score = lam * relevance - (1.0 - lam) * redundancy if has_redundancy else lam * relevance
        score = np.where(available, score, -np.inf)
        pick = int(np.argmax(score))
        chosen.append(pick)
        available[pick] = False
        redundancy = np.maximum(redundancy, columns(pick))
        has_redundancy = True
    return chosen


def _columns_of(similarity: np.ndarray) -> Callable[[int], np.ndarray]:
    return lambda j: similarity[:, j]


def order_by_relevance(relevance: Sequence[float]) -> list[int]:
    """Indices by falling relevance, ties by index (what MMR gives at lambda = 1)."""
    return sorted(range(len(relevance)), key=lambda i: (-relevance[i], i))

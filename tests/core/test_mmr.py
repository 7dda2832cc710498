"""Maximal marginal relevance (Carbonell & Goldstein 1998): a worked example and properties."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from curator.core.mmr import maximal_marginal_relevance


def unit(degrees: float) -> np.ndarray:
    radians = math.radians(degrees)
    return np.array([math.cos(radians), math.sin(radians)])


def worked_example() -> tuple[np.ndarray, np.ndarray]:
    """Query [1, 0]; candidates at 30, 45 and 75 degrees; cosine for relevance and similarity."""
    query = np.array([1.0, 0.0])
    candidates = np.array([unit(30), unit(45), unit(75)])
    relevance = candidates @ query
    similarity = candidates @ candidates.T
    return relevance, similarity


# Carbonell & Goldstein (1998), MMR = argmax lambda*rel(d) - (1-lambda)*max sim(d, chosen).
# First pick: the 30-degree candidate (most relevant; nothing chosen yet). Second pick, with the
# 30-degree one chosen: the 45-degree candidate scores lambda*cos45 - (1-lambda)*cos15, the
# 75-degree one lambda*cos75 - (1-lambda)*cos45. The 75-degree one wins when
#   lambda * (cos45 - cos75) < (1 - lambda) * (cos15 - cos45)
#   lambda < (cos15 - cos45) / (cos15 - cos75) = sin15 / sin45 = (sqrt(3) - 1) / 2 ≈ 0.3660,
# so 25/71 ≈ 0.352 picks [0, 2] and 27/71 ≈ 0.380 picks [0, 1].
BOUNDARY = (math.sqrt(3) - 1) / 2


def test_boundary_derivation_is_consistent():
    cos = lambda d: math.cos(math.radians(d))  # noqa: E731
    assert (cos(15) - cos(45)) / (cos(15) - cos(75)) == pytest.approx(BOUNDARY)
    assert 25 / 71 < BOUNDARY < 27 / 71


def test_worked_example_below_the_boundary_prefers_variety():
    relevance, similarity = worked_example()
    assert maximal_marginal_relevance(relevance, similarity, 2, 25 / 71) == [0, 2]


def test_worked_example_above_the_boundary_prefers_relevance():
    relevance, similarity = worked_example()
    assert maximal_marginal_relevance(relevance, similarity, 2, 27 / 71) == [0, 1]


def test_worked_example_lambda_one_is_relevance_order():
    relevance, similarity = worked_example()
    assert maximal_marginal_relevance(relevance, similarity, 3, 1.0) == [0, 1, 2]


def test_already_chosen_items_count_from_the_first_pick():
    relevance, similarity = worked_example()
    # An item already on the list at 30 degrees: similarity of each candidate to it.
    already = np.array([[1.0], [math.cos(math.radians(15))], [math.cos(math.radians(45))]])
    # With lambda = 0 only redundancy counts: the 75-degree candidate is farthest from it.
    assert maximal_marginal_relevance(relevance, similarity, 1, 0.0, already=already) == [2]


def test_lambda_out_of_range_is_refused():
    relevance, similarity = worked_example()
    with pytest.raises(ValueError):
        maximal_marginal_relevance(relevance, similarity, 2, 1.5)


@st.composite
def mmr_inputs(draw):
    m = draw(st.integers(min_value=1, max_value=12))
    dims = draw(st.integers(min_value=1, max_value=4))
    points = draw(
        arrays(np.float64, (m, dims), elements=st.floats(0.0, 1.0, allow_subnormal=False))
    )
    norms = np.linalg.norm(points, axis=1, keepdims=True)
    norms[norms == 0] = 1.0
    points = points / norms
    similarity = np.clip(points @ points.T, 0.0, 1.0)
    # relevance drawn from a few values so that ties happen often
    relevance = np.array(
        draw(st.lists(st.sampled_from([0.0, 0.25, 0.5, 1.0]), min_size=m, max_size=m))
    )
    k = draw(st.integers(min_value=0, max_value=m + 3))
    lam = draw(st.floats(0.0, 1.0))
    return relevance, similarity, k, lam


@settings(max_examples=200, deadline=None)
@given(mmr_inputs())
def test_mmr_returns_distinct_indices_and_at_most_k(inputs):
    relevance, similarity, k, lam = inputs
    picks = maximal_marginal_relevance(relevance, similarity, k, lam)
    assert len(picks) == min(k, len(relevance))
    assert len(set(picks)) == len(picks)
    assert all(0 <= p < len(relevance) for p in picks)


@settings(max_examples=200, deadline=None)
@given(mmr_inputs())
def test_mmr_at_lambda_one_is_argsort_of_relevance(inputs):
    relevance, similarity, k, _lam = inputs
    picks = maximal_marginal_relevance(relevance, similarity, k, 1.0)
    # reference: numpy stable argsort of -relevance (ties keep index order)
    expected = list(np.argsort(-relevance, kind="stable")[: min(k, len(relevance))])
    assert picks == expected

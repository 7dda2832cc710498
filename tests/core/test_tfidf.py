"""TF-IDF vectors checked against scikit-learn's TfidfTransformer."""

from __future__ import annotations

import numpy as np
import pytest
import scipy.sparse as sp
from sklearn.feature_extraction.text import TfidfTransformer
from sklearn.preprocessing import normalize

from curator.core.similarity import document_frequency, smooth_idf, tfidf_vectors


def random_counts(seed: int, shape: tuple[int, int], density: float) -> sp.csr_matrix:
    rng = np.random.default_rng(seed)
    matrix = sp.random(
        *shape, density=density, format="csr", random_state=rng,
        data_rvs=lambda k: rng.integers(1, 5, size=k).astype(float),
    )
    return sp.csr_matrix(matrix)


def sklearn_tfidf(raw: sp.csr_matrix, norm: str | None = "l2") -> tuple[sp.csr_matrix, np.ndarray]:
    transformer = TfidfTransformer(norm=norm, smooth_idf=True, use_idf=True, sublinear_tf=False)
    result = transformer.fit_transform(raw)
    return sp.csr_matrix(result), transformer.idf_


CASES = [
    (0, (40, 25), 0.1),
    (1, (200, 80), 0.03),
    (2, (7, 300), 0.2),
    # an all-zero row and rows sharing every feature
    (3, (30, 4), 0.9),
]


@pytest.mark.parametrize(("seed", "shape", "density"), CASES)
def test_tfidf_equals_sklearn_on_random_counts(seed, shape, density):
    raw = random_counts(seed, shape, density)
    rows = raw.tolil()
    rows[0, :] = 0  # an empty row must stay empty (sklearn leaves it zero too)
    raw = sp.csr_matrix(rows)
    raw.eliminate_zeros()
    vectors, idf = tfidf_vectors(raw)
    expected, expected_idf = sklearn_tfidf(raw)
    # reference: scikit-learn TfidfTransformer(norm="l2", smooth_idf=True)
    np.testing.assert_allclose(vectors.toarray(), expected.toarray(), rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(idf, expected_idf, rtol=1e-12)


@pytest.mark.parametrize(("seed", "shape", "density"), CASES)
def test_smooth_idf_equals_sklearn_idf(seed, shape, density):
    raw = random_counts(seed, shape, density)
    _, expected_idf = sklearn_tfidf(raw)
    df = np.asarray((raw > 0).sum(axis=0)).ravel()
    # reference: scikit-learn TfidfTransformer.idf_ with smooth_idf=True
    np.testing.assert_allclose(smooth_idf(df, raw.shape[0]), expected_idf, rtol=1e-12)
    np.testing.assert_array_equal(document_frequency(raw), df)


def test_smooth_idf_closed_form():
    # reference: scikit-learn user guide 6.2.3.4, idf(t) = ln((1 + n) / (1 + df(t))) + 1
    n = 9
    df = np.array([0, 1, 4, 9])
    expected = np.log((1 + n) / (1 + df)) + 1
    np.testing.assert_allclose(smooth_idf(df, n), expected)
    assert smooth_idf(np.array([n]), n)[0] == pytest.approx(1.0)


@pytest.mark.parametrize("seed", [4, 5, 6])
def test_column_weights_scale_before_normalising(seed):
    raw = random_counts(seed, (60, 30), 0.15)
    weights = np.random.default_rng(seed).uniform(0.1, 2.0, size=raw.shape[1])
    vectors, _ = tfidf_vectors(raw, weights)
    unnormalised, _ = sklearn_tfidf(raw, norm=None)
    # reference: sklearn.preprocessing.normalize of the un-normalised tf-idf times the weights
    expected = normalize(unnormalised @ sp.diags(weights), norm="l2")
    np.testing.assert_allclose(vectors.toarray(), expected.toarray(), rtol=1e-12, atol=1e-12)


def test_demo_index_vectors_equal_sklearn(demo_workspace):
    index = demo_workspace.index
    raw = index.raw
    assert raw.shape == (len(index.works), len(index.features))
    vectors, idf = tfidf_vectors(raw)
    expected, expected_idf = sklearn_tfidf(raw)
    # reference: scikit-learn TfidfTransformer(norm="l2", smooth_idf=True)
    np.testing.assert_allclose(vectors.toarray(), expected.toarray(), rtol=1e-10, atol=1e-12)
    np.testing.assert_allclose(idf, expected_idf, rtol=1e-12)
    np.testing.assert_allclose(index.idf, expected_idf, rtol=1e-12)
    # the index's own vectors carry the profile's column weights
    unnormalised, _ = sklearn_tfidf(raw, norm=None)
    weighted = normalize(unnormalised @ sp.diags(index.column_weights), norm="l2")
    np.testing.assert_allclose(index.vectors.toarray(), weighted.toarray(), atol=1e-12)

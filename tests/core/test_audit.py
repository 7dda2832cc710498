"""Balance audit: diversity indices against published worked examples and scipy."""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.stats
from hypothesis import given
from hypothesis import strategies as st

from curator.core.audit import FACETS, UNKNOWN, audit_list, intra_list_diversity
from curator.core.diversity import diversity, shannon


def test_shannon_worked_example():
    # Worked example of a Shannon-index tutorial (counts 60, 10, 25, 1, 4), recomputed exactly:
    # H = 1.058134, J = 0.657456, Gini-Simpson 0.5658, exp H = 2.880991.
    d = diversity([60, 10, 25, 1, 4])
    assert d.shannon == pytest.approx(1.058134, abs=1e-6)
    assert d.pielou == pytest.approx(0.657456, abs=1e-6)
    assert d.gini_simpson == pytest.approx(0.5658, abs=1e-4)
    assert d.hill1 == pytest.approx(2.880991, abs=1e-6)


def test_heip_evenness_ludwig_reynolds():
    # Ludwig & Reynolds, Statistical Ecology (1988), table 8.1: counts 500, 300, 200 -> Heip 0.90
    assert diversity([500, 300, 200]).heip == pytest.approx(0.90, abs=0.005)


@given(st.lists(st.integers(min_value=0, max_value=500), min_size=1, max_size=12))
def test_shannon_equals_scipy_entropy(counts):
    # reference: scipy.stats.entropy (natural log) on the same counts
    if sum(counts) == 0:
        assert shannon(counts) == 0
        return
    assert shannon(counts) == pytest.approx(scipy.stats.entropy(counts), abs=1e-9)


@given(st.lists(st.integers(min_value=1, max_value=50), min_size=2, max_size=10))
def test_indices_bounds(counts):
    # Hill (1973): 1 <= exp H <= S; Pielou J in [0, 1]; Gini-Simpson in [0, 1 - 1/S]
    d = diversity(counts)
    s = len(counts)
    assert 1 - 1e-9 <= d.hill1 <= s + 1e-9
    assert d.pielou is not None and -1e-9 <= d.pielou <= 1 + 1e-9
    assert -1e-9 <= d.gini_simpson <= 1 - 1 / s + 1e-9


def _entries(ws, n=12):
    seed = ws.index.position["https://hollinmere.example/work/the-mirror-of-gullstane"]
    from curator.core.suggest import SuggestSettings

    result = ws.suggester.suggest([seed], SuggestSettings(limit=n))
    return seed, [s.position for s in result.suggestions]


def test_audit_shares_sum_to_one_and_unknown_is_counted(demo_workspace):
    seed, entries = _entries(demo_workspace)
    audit = audit_list(demo_workspace.index, entries, [seed])
    assert [f.facet for f in audit.facets] == list(FACETS)
    for facet in audit.facets:
        total = sum(v.share for v in facet.values)
        assert total == pytest.approx(1.0)
        # every entry is represented: counts cover at least the number of entries
        assert sum(v.count for v in facet.values) >= len(entries)
        if facet.unknown:
            assert any(v.key == UNKNOWN and v.count == facet.unknown for v in facet.values)


def test_missing_facet_data_counts_as_unknown(demo_workspace):
    index = demo_workspace.index
    no_place = [i for i, r in enumerate(index.records)
                if not any(index.features[c].path == "https://schema.org/contentLocation"
                           for c in index.direct[i].indices)]
    assert no_place, "the demo collection has works without a place"
    audit = audit_list(index, no_place[:2])
    place = audit.facet("place")
    assert place.unknown == 2
    assert place.values[0].key == UNKNOWN


def test_audit_facet_counts_against_the_records(demo_workspace):
    # reference: counting the kinds of the entries by hand from the records
    index = demo_workspace.index
    _seed, entries = _entries(demo_workspace)
    audit = audit_list(index, entries)
    expected: dict[str, int] = {}
    for e in entries:
        kind = index.records[e].kinds[0]
        expected[kind] = expected.get(kind, 0) + 1
    assert {v.key: v.count for v in audit.facet("kind").values} == expected
    d = audit.facet("kind").diversity
    assert d.shannon == pytest.approx(scipy.stats.entropy(list(expected.values())))


def test_intra_list_diversity_is_mean_pairwise_dissimilarity(demo_workspace):
    # Ziegler et al. (2005): ILD = mean over pairs of (1 - sim); computed here with numpy directly
    index = demo_workspace.index
    _seed, entries = _entries(demo_workspace, 8)
    dense = index.vectors[entries].toarray()
    sims = dense @ dense.T
    pairs = [(i, j) for i in range(len(entries)) for j in range(i + 1, len(entries))]
    expected = np.mean([1 - sims[i, j] for i, j in pairs])
    assert intra_list_diversity(index, entries) == pytest.approx(expected)
    assert intra_list_diversity(index, entries[:1]) is None


def test_seed_theme_coverage(demo_workspace):
    index = demo_workspace.index
    seed, entries = _entries(demo_workspace)
    audit = audit_list(index, entries, [seed])
    assert audit.seed_themes
    assert set(audit.covered_seed_themes) <= set(audit.seed_themes)
    assert audit.seed_theme_coverage == pytest.approx(
        len(audit.covered_seed_themes) / len(audit.seed_themes)
    )
    empty = audit_list(index, [], [seed])
    assert empty.seed_theme_coverage == 0.0
    assert math.isclose(sum(v.share for v in audit.facet("decade").values), 1.0)

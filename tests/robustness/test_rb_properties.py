"""Property tests through the demo workspace and the session format, and a bounded loader fuzz."""

from __future__ import annotations

import contextlib
import tempfile
from itertools import pairwise
from pathlib import Path

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from curator.core.audit import audit_list
from curator.core.catalogue import Catalogue
from curator.core.errors import CuratorError
from curator.core.session import ListEntry, Session
from curator.core.suggest import SuggestSettings

SETTINGS = settings(
    max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)


@st.composite
def picks(draw, n: int):
    rows = draw(st.lists(st.integers(0, n - 1), min_size=1, max_size=12, unique=True))
    cut1 = draw(st.integers(1, len(rows)))
    cut2 = draw(st.integers(cut1, len(rows)))
    return rows[:cut1], rows[cut1:cut2], rows[cut2:]


@SETTINGS
@given(data=st.data(), lam=st.floats(0.0, 1.0))
def test_suggestions_are_new_and_distinct(demo_workspace, data, lam):
    seeds, on_list, dismissed = data.draw(picks(demo_workspace.index.size))
    result = demo_workspace.suggester.suggest(
        seeds, SuggestSettings(lam=lam, limit=15), list_items=on_list, dismissed=dismissed
    )
    got = [s.position for s in result.suggestions]
    assert len(got) == len(set(got))
    assert not set(got) & set(seeds + on_list + dismissed)


@SETTINGS
@given(data=st.data())
def test_lambda_one_is_ordered_by_relevance(demo_workspace, data):
    seeds, on_list, dismissed = data.draw(picks(demo_workspace.index.size))
    result = demo_workspace.suggester.suggest(
        seeds, SuggestSettings(lam=1.0, limit=15), list_items=on_list, dismissed=dismissed
    )
    relevance = [s.relevance for s in result.suggestions]
    assert all(a >= b - 1e-12 for a, b in pairwise(relevance))


@SETTINGS
@given(data=st.data())
def test_similarity_is_symmetric_and_bounded(demo_workspace, data):
    vectors = demo_workspace.index.vectors
    n = vectors.shape[0]
    i = data.draw(st.integers(0, n - 1))
    j = data.draw(st.integers(0, n - 1))
    ij = float(vectors[i].multiply(vectors[j]).sum())
    ji = float(vectors[j].multiply(vectors[i]).sum())
    assert abs(ij - ji) < 1e-12
    assert -1e-9 <= ij <= 1 + 1e-9
    if vectors[i].nnz:
        assert abs(float(vectors[i].multiply(vectors[i]).sum()) - 1.0) < 1e-9


@SETTINGS
@given(data=st.data())
def test_audit_shares_sum_to_one(demo_workspace, data):
    n = demo_workspace.index.size
    entries = data.draw(st.lists(st.integers(0, n - 1), min_size=1, max_size=20, unique=True))
    audit = audit_list(demo_workspace.index, entries)
    assert audit.entries == len(entries)
    for facet in audit.facets:
        total = sum(v.share for v in facet.values)
        assert np.isclose(total, 1.0), (facet.facet, total)


@settings(max_examples=60, deadline=None)
@given(
    title=st.text(),
    notes=st.lists(st.tuples(st.text(), st.text()), max_size=5),
)
def test_session_save_load_identity(title, notes):
    session = Session(title=title, seeds=["https://e/seed"])
    for row, (label, note) in enumerate(notes):
        session.insert_entry(row, ListEntry(f"https://e/w{row}", label, note[::-1], note))
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "s.curator.json"
        session.save(path)
        loaded = Session.load(path)
    assert loaded.same_content(session)
    assert loaded.title == title
    assert [(e.label, e.note) for e in loaded.entries] == [
        (e.label, e.note) for e in session.entries
    ]


def fuzz_load(suffix: str, blob: bytes) -> None:
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / f"fuzz{suffix}"
        path.write_bytes(blob)
        with contextlib.suppress(CuratorError):  # anything else fails the test
            Catalogue.load([path])


FUZZ = settings(max_examples=100, deadline=None)
SEEDS_OF = {
    ".ttl": b'@prefix s: <https://schema.org/> . <http://e/w> a s:Book ; s:name "W" .\n',
    ".nt": b'<http://e/w> <https://schema.org/name> "W" .\n',
    ".rdf": b'<?xml version="1.0"?><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">'
    b'<rdf:Description rdf:about="http://e/w"/></rdf:RDF>',
    ".jsonld": b'{"@id": "http://e/w", "http://schema.org/name": "W"}',
}


def blobs(suffix: str):
    seed = SEEDS_OF[suffix]
    mutated = st.tuples(st.integers(0, len(seed)), st.binary(max_size=40)).map(
        lambda t: seed[: t[0]] + t[1] + seed[t[0] :]
    )
    return st.one_of(st.binary(max_size=2000), mutated)


@FUZZ
@given(blob=blobs(".ttl"))
def test_fuzz_turtle(blob):
    fuzz_load(".ttl", blob)


@FUZZ
@given(blob=blobs(".nt"))
def test_fuzz_ntriples(blob):
    fuzz_load(".nt", blob)


@FUZZ
@given(blob=blobs(".rdf"))
def test_fuzz_rdfxml(blob):
    fuzz_load(".rdf", blob)


@FUZZ
@given(blob=blobs(".jsonld"))
def test_fuzz_jsonld(blob):
    fuzz_load(".jsonld", blob)

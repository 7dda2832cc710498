"""Catalogues that are valid RDF but odd in shape: blank-node works, missing labels, shared
titles, cycles in hierarchies, a theme on every work, a theme given as a seed, and many seeds."""

from __future__ import annotations

import sys
import time
from pathlib import Path

import pytest

from curator.core.catalogue import Catalogue
from curator.core.errors import CatalogueSyntaxError, CuratorError, SeedError
from curator.core.suggest import SuggestSettings
from curator.services.suggestions import SuggestRequest, suggest
from curator.services.workspace import open_catalogue

REPO = Path(__file__).resolve().parents[2]
PREFIXES = """@prefix schema: <https://schema.org/> .
@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .
@prefix skos: <http://www.w3.org/2004/02/skos/core#> .
@prefix ex: <https://odd.example/> .
"""


def write(tmp_path: Path, name: str, text: str) -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def open_text(tmp_path: Path, text: str, name: str = "odd.ttl"):
    return open_catalogue([write(tmp_path, name, PREFIXES + text)], languages=("en",))


# ----- bad IRIs in N-Triples ----------------------------------------------------------------

BAD_IRIS = {
    "space": "https://e/tidal flats",
    "tab": "https://e/tidal\tflats",
    "bell": "https://e/tidal\x07flats",
    "newline-escape": "https://e/a\\u000Ab",
}


@pytest.mark.parametrize("kind", sorted(BAD_IRIS))
def test_bad_iri_in_ntriples_is_an_error_with_its_line(tmp_path, kind):
    good = '<https://e/w> <https://schema.org/name> "W" .\n'
    bad = f"<https://e/w> <https://schema.org/about> <{BAD_IRIS[kind]}> .\n"
    path = tmp_path / f"{kind}.nt"
    path.write_text(good + good + bad, encoding="utf-8")
    with pytest.raises(CatalogueSyntaxError) as info:
        Catalogue.load([path])
    assert info.value.lineno == 3  # reference: the bad IRI is on the third line we wrote
    assert path.name in str(info.value)


# ----- blank-node works, unlabelled works, shared titles ------------------------------------


def test_blank_node_works_open_and_suggest(tmp_path):
    text = "".join(
        f'[] a schema:Book ; schema:name "Blank {i}"@en ; '
        f"schema:about ex:t{i % 3} , ex:t{i % 2} .\n"
        for i in range(6)
    ) + "".join(f'ex:t{i} a skos:Concept ; skos:prefLabel "T{i}"@en .\n' for i in range(3))
    workspace = open_text(tmp_path, text)
    assert workspace.index.size == 6  # reference: six blank-node books written
    result = workspace.suggester.suggest([0], SuggestSettings(limit=5))
    assert result.suggestions
    assert all(s.position != 0 for s in result.suggestions)


def test_unlabelled_work_gets_a_readable_iri_tail(tmp_path):
    workspace = open_text(
        tmp_path,
        "ex:the-salt-road a schema:Book ; schema:about ex:t .\n"
        'ex:other a schema:Book ; schema:name "Other" ; schema:about ex:t .\n',
    )
    assert workspace.index.record("https://odd.example/the-salt-road").label == "the salt road"


def test_two_works_with_one_title_are_both_listed(tmp_path):
    workspace = open_text(
        tmp_path,
        'ex:a a schema:Book ; schema:name "Harbour Lights" ; schema:datePublished "1931" .\n'
        'ex:b a schema:Book ; schema:name "Harbour Lights" ; schema:datePublished "1990" .\n',
    )
    with pytest.raises(SeedError) as info:
        workspace.finder.resolve("Harbour Lights")
    message = str(info.value)
    assert "https://odd.example/a" in message and "https://odd.example/b" in message
    assert {c.iri for c in info.value.candidates} == {
        "https://odd.example/a",
        "https://odd.example/b",
    }


# ----- cycles, a theme everywhere, a theme as seed ------------------------------------------


def test_cycles_in_broader_and_subclassof_terminate(tmp_path):
    text = (
        "ex:A skos:broader ex:B . ex:B skos:broader ex:C . ex:C skos:broader ex:A .\n"
        'ex:A a skos:Concept ; skos:prefLabel "A"@en .\n'
        "ex:B a skos:Concept . ex:C a skos:Concept .\n"
        "ex:K1 rdfs:subClassOf ex:K2 . ex:K2 rdfs:subClassOf ex:K1 .\n"
        "ex:K1 rdfs:subClassOf schema:Book .\n"
        + "".join(
            f'ex:w{i} a ex:K{1 + i % 2} , schema:Book ; schema:name "Work {i}" ; '
            f"schema:about ex:{'ABC'[i % 3]} .\n"
            for i in range(9)
        )
    )
    start = time.perf_counter()
    workspace = open_text(tmp_path, text)
    result = workspace.suggester.suggest([0], SuggestSettings(limit=5))
    assert time.perf_counter() - start < 30
    assert workspace.index.size == 9
    assert result.suggestions


def test_a_theme_on_every_work_still_suggests(tmp_path):
    text = 'ex:all a skos:Concept ; skos:prefLabel "Everything"@en .\n' + "".join(
        f'ex:w{i} a schema:Book ; schema:name "Work {i}" ; schema:about ex:all , ex:t{i % 4} .\n'
        for i in range(12)
    )
    workspace = open_text(tmp_path, text)
    result = workspace.suggester.suggest([0], SuggestSettings(limit=5))
    assert len(result.suggestions) == 5


def test_a_theme_iri_as_seed_is_not_a_work(demo_workspace):
    theme = next(
        f.value
        for f in demo_workspace.index.features
        if f.value.startswith("http") and f.value not in demo_workspace.index.position
    )
    with pytest.raises(SeedError, match="not a work"):
        demo_workspace.finder.resolve(theme)


# ----- many seeds on a synthetic catalogue --------------------------------------------------


def test_two_thousand_seeds_on_five_thousand_works(tmp_path):
    if str(REPO) not in sys.path:
        sys.path.insert(0, str(REPO))
    from benchmarks.synthetic import write_synthetic

    path = tmp_path / "synthetic.nt"
    write_synthetic(path, 5000)
    workspace = open_catalogue([path], languages=("en",))
    assert workspace.index.size == 5000  # reference: write_synthetic(works=5000)
    seeds = list(range(0, 4000, 2))
    start = time.perf_counter()
    result = workspace.suggester.suggest(seeds, SuggestSettings(limit=20))
    assert time.perf_counter() - start < 30
    chosen = {s.position for s in result.suggestions}
    assert len(chosen) == 20 and not chosen & set(seeds)


# ----- a failed load leaves the open workspace alone ----------------------------------------


def test_good_workspace_survives_a_bad_load(tmp_path):
    workspace = open_text(
        tmp_path,
        "".join(
            f'ex:w{i} a schema:Book ; schema:name "Work {i}" ; schema:about ex:t{i % 3} .\n'
            for i in range(6)
        ),
        name="good.ttl",
    )
    before = (
        workspace.catalogue.triple_count,
        workspace.index.size,
        len(workspace.catalogue.store),
    )
    bad = write(tmp_path, "bad.ttl", PREFIXES + 'ex:w99 a schema:Book ; schema:name "cut')
    with pytest.raises(CuratorError):
        open_catalogue([tmp_path / "good.ttl", bad], languages=("en",))
    after = (workspace.catalogue.triple_count, workspace.index.size, len(workspace.catalogue.store))
    assert after == before
    request = SuggestRequest(seeds=("Work 1",), settings=SuggestSettings(limit=3))
    # reference: Work 1 shares theme t1 with Work 4 only (i % 3 == 1 for i in 0..5)
    assert [s.iri for s in suggest(workspace, request).suggestions] == ["https://odd.example/w4"]

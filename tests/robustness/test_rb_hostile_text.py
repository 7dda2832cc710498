"""Hostile text in notes and rationales reaches exports inert; a seed title cannot inject SPARQL."""

from __future__ import annotations

import csv
import io

import html5lib
import pyoxigraph as ox
import pytest

from curator.cli.main import main
from curator.core.errors import SeedError
from curator.core.session import ListEntry, Session
from curator.core.suggest import SuggestSettings
from curator.services.publishing import export_publication, from_session, publication_for
from curator.services.suggestions import SuggestRequest, suggest

SCRIPT = "<script>alert(1)</script>"
FORMULA = "=cmd|' /C calc'!A0"
LINK = "[x](javascript:alert(1))"
HOSTILE = (SCRIPT, FORMULA, LINK)


@pytest.fixture(scope="module")
def exports(demo_workspace, tmp_path_factory):
    works = demo_workspace.index.works
    session = Session(title=f"List {SCRIPT}", seeds=[works[0]])
    for row, text in enumerate(HOSTILE):
        iri = works[row + 1]
        session.insert_entry(
            row, ListEntry(iri, demo_workspace.index.record(iri).label, f"{text} r", f"{text} n")
        )
    publication = publication_for(demo_workspace, from_session(demo_workspace, session))
    folder = tmp_path_factory.mktemp("exports")
    out = {}
    for fmt in ("html", "md", "csv", "jsonld", "ttl"):
        path = folder / f"list.{fmt}"
        export_publication(publication, fmt, path)
        out[fmt] = path.read_text(encoding="utf-8")
    return out


def test_html_has_no_script_element_and_keeps_the_text(exports):
    tree = html5lib.parse(exports["html"], namespaceHTMLElements=False)
    assert tree.findall(".//script") == []
    text = "".join(tree.itertext())
    for hostile in HOSTILE:
        assert f"{hostile} n" in text
    hrefs = [a.get("href", "") for a in tree.iter("a")]
    assert not any(h.strip().lower().startswith("javascript:") for h in hrefs)


def test_html5lib_would_find_a_raw_script():
    # The check above can fail: a raw script element is found.
    tree = html5lib.parse(f"<p>{SCRIPT}</p>", namespaceHTMLElements=False)
    assert tree.findall(".//script")


def test_markdown_has_no_raw_script(exports):
    assert "<script" not in exports["md"].lower()
    assert "](javascript" not in exports["md"]  # no live Markdown link
    assert "alert" in exports["md"]  # the text itself is kept (escaped)


def test_csv_cells_never_start_a_formula(exports):
    rows = list(csv.reader(io.StringIO(exports["csv"])))
    cells = [cell for row in rows for cell in row]
    assert any("cmd|" in cell for cell in cells)  # the note is there, just inert
    assert [c for c in cells if c[:1] in ("=", "+", "-", "@")] == []


@pytest.mark.parametrize("fmt", ["jsonld", "ttl"])
def test_rdf_exports_parse_back_with_the_notes(exports, fmt):
    store = ox.Store()
    rdf_format = ox.RdfFormat.JSON_LD if fmt == "jsonld" else ox.RdfFormat.TURTLE
    store.load(exports[fmt].encode("utf-8"), format=rdf_format, base_iri="http://base.example/")
    literals = {q.object.value for q in store if isinstance(q.object, ox.Literal)}
    for hostile in HOSTILE:
        assert any(f"{hostile} n" in value for value in literals), hostile


INJECTION = 'x" } ; DROP ALL ; SELECT * { "'


def test_sparql_injection_through_the_cli(capsys):
    code = main(["suggest", "--seed", INJECTION])
    err = capsys.readouterr().err
    assert code == 2
    assert "No work is titled" in err and "Traceback" not in err


def test_sparql_injection_leaves_the_store_alone(demo_workspace):
    before = len(demo_workspace.catalogue.store)
    count = demo_workspace.catalogue.triple_count
    with pytest.raises(SeedError, match="No work is titled"):
        suggest(demo_workspace, SuggestRequest(seeds=(INJECTION,), settings=SuggestSettings()))
    assert len(demo_workspace.catalogue.store) == before == count

"""Exports: linked data parses back (pyoxigraph and rdflib), HTML is valid and escaped, CSV is
safe in a spreadsheet, Markdown keeps hostile text literal, writes are atomic."""

from __future__ import annotations

import csv
import io

import html5lib
import pyoxigraph as ox
import pytest
import rdflib

from curator.core.export import (
    neutralise_cell,
    to_csv,
    to_html,
    to_jsonld,
    to_markdown,
    to_turtle,
    write_export,
)
from curator.core.publication import Publication, PublishedEntry, build_publication

HOSTILE = '<script>alert("x")</script>'
FORMULA = "=HYPERLINK(\"http://evil.example\",\"click\")"
SCHEMA = "https://schema.org/"


def hostile_publication() -> Publication:
    entries = (
        PublishedEntry(1, "https://ex.example/w/1", HOSTILE, ("Ann <b>Bold</b>",), 1901, "Novel",
                       "Shares *stars* & [links](http://x.example).", FORMULA),
        PublishedEntry(2, "https://ex.example/w/2", "+SUM(A1:A9)", ("@mention",), None, "Film",
                       "-1 is negative", "\tTabbed"),
        PublishedEntry(3, "https://ex.example/w/3", "Plain title", (), 2001, "", "", ""),
    )
    return Publication(HOSTILE + " list", entries, ("stars",), None, (), ())


QUERY = f"""
SELECT ?pos ?work ?desc WHERE {{
  ?list a <{SCHEMA}ItemList> ; <{SCHEMA}itemListElement> ?li .
  ?li a <{SCHEMA}ListItem> ; <{SCHEMA}position> ?pos ; <{SCHEMA}item> ?work .
  OPTIONAL {{ ?li <{SCHEMA}description> ?desc }}
}}"""


def _pyoxigraph_rows(text: str, fmt: ox.RdfFormat) -> list[tuple[int, str, str]]:
    store = ox.Store()
    store.load(text.encode(), format=fmt)
    return sorted(
        (int(pos.value), work.value, desc.value if desc else "")
        for pos, work, desc in store.query(QUERY)
    )


def _rdflib_rows(text: str, fmt: str) -> list[tuple[int, str, str]]:
    graph = rdflib.Graph().parse(data=text, format=fmt)
    rows = graph.query(QUERY)
    return sorted((int(pos), str(work), str(desc) if desc else "") for pos, work, desc in rows)


def test_linked_data_exports_parse_back_to_the_same_item_list():
    publication = hostile_publication()
    turtle, jsonld = to_turtle(publication), to_jsonld(publication)
    # reference: two independent RDF parsers (pyoxigraph and rdflib) read both serialisations
    rows = _pyoxigraph_rows(turtle, ox.RdfFormat.TURTLE)
    assert rows == _pyoxigraph_rows(jsonld, ox.RdfFormat.JSON_LD)
    assert rows == _rdflib_rows(turtle, "turtle")
    assert rows == _rdflib_rows(jsonld, "json-ld")
    assert [r[0] for r in rows] == [1, 2, 3]
    assert [r[1] for r in rows] == [e.iri for e in publication.entries]
    assert rows[0][2].startswith("Shares *stars*") and FORMULA in rows[0][2]


def test_html_is_valid_html5_and_hostile_titles_print_as_text():
    page = to_html(hostile_publication())
    # reference: html5lib, an implementation of the WHATWG HTML5 parsing algorithm
    parser = html5lib.HTMLParser(strict=True, namespaceHTMLElements=False)
    document = parser.parse(page)
    assert document.findall(".//script") == []
    texts = "".join(document.itertext())
    assert HOSTILE in texts
    assert "Ann <b>Bold</b>" in texts
    assert len(document.findall(".//ol/li")) == 3


def test_csv_neutralises_formula_cells():
    text = to_csv(hostile_publication())
    rows = list(csv.reader(io.StringIO(text)))
    assert rows[0][:3] == ["position", "title", "creators"]
    cells = [cell for row in rows[1:] for cell in row]
    # OWASP CSV injection guidance: = + - @ tab and CR must not start a cell
    for cell in cells:
        if cell and not cell[0].isdigit():
            assert cell[0] not in "=+-@\t\r", cell
    assert "'" + FORMULA in cells
    assert "'+SUM(A1:A9)" in cells
    assert neutralise_cell("plain") == "plain"


def test_markdown_keeps_hostile_text_literal():
    text = to_markdown(hostile_publication())
    assert "<script>" not in text
    assert "&lt;script\\>" in text
    assert "\\*stars\\*" in text and "\\[links\\]" in text


def test_publication_from_the_demo(demo_workspace):
    index = demo_workspace.index
    seed = "https://hollinmere.example/work/thessalys-heron"
    result = demo_workspace.suggester.suggest([index.position[seed]])
    entries = [(s.iri, s.rationale, "") for s in result.suggestions]
    publication = build_publication(index, "Winter tales", entries, seeds=[seed])
    assert [e.position for e in publication.entries] == list(range(1, len(entries) + 1))
    assert all(e.rationale for e in publication.entries)
    assert publication.audit is not None and publication.audit.entries == len(entries)
    assert publication.introduction.startswith(f"{len(entries)} titles joined by ")


def test_a_failed_export_leaves_the_old_file(tmp_path, monkeypatch):
    target = tmp_path / "list.md"
    target.write_text("old list\n")
    publication = hostile_publication()

    def broken(*_args, **_kwargs):
        raise OSError("disk full")

    monkeypatch.setattr("curator.core.files.os.fsync", broken)
    with pytest.raises(OSError):
        write_export(publication, "md", target)
    assert target.read_text() == "old list\n"
    assert [p.name for p in tmp_path.iterdir()] == ["list.md"]

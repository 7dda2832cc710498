"""Loading catalogues: syntax errors with positions, all-or-nothing folders, formats, cancel."""

from __future__ import annotations

import shutil
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
import rdflib
from rdflib.compare import isomorphic

from curator.core.catalogue import Catalogue
from curator.core.errors import (
    Cancelled,
    CatalogueError,
    CatalogueSyntaxError,
    CuratorError,
)
from curator.core.profile import detect_profile
from curator.core.progress import CancelToken, Progress

BAD = Path(__file__).resolve().parents[1] / "fixtures" / "bad"
GOOD = Path(__file__).resolve().parents[1] / "fixtures" / "dcterms_skos.ttl"


# ----- bad files ------------------------------------------------------------------------------

# reference: tests/fixtures/bad/README.md, positions recorded with pyoxigraph 0.5.13
README_POSITIONS = [
    ("truncated.ttl", 10, 21, 10, 61),
    ("bad_iri.nt", 3, 77, 3, 126),
    ("broken.jsonld", 12, 7, 12, 22),
    ("not_rdf.ttl", 1, 1, 1, 5),
]


@pytest.mark.parametrize(("name", "line", "column", "end_line", "end_column"), README_POSITIONS)
def test_syntax_error_positions(name, line, column, end_line, end_column):
    path = BAD / name
    with pytest.raises(CatalogueSyntaxError) as caught:
        Catalogue.load([path])
    error = caught.value
    assert isinstance(error, SyntaxError)
    assert isinstance(error, CuratorError)
    assert error.filename == str(path)
    assert (error.lineno, error.offset) == (line, column)
    assert (error.end_lineno, error.end_offset) == (end_line, end_column)
    text = str(error)
    assert name in text
    assert f"line {line}" in text


def test_rdf_xml_error_gets_the_xml_parsers_position():
    path = BAD / "unclosed.rdf"
    # reference: Python's xml.etree.ElementTree (expat); position is (line, 0-based column)
    with pytest.raises(ET.ParseError) as xml_error:
        ET.parse(path)
    xml_line, xml_column = xml_error.value.position
    with pytest.raises(CatalogueSyntaxError) as caught:
        Catalogue.load([path])
    error = caught.value
    assert error.filename == str(path)
    # README: the parser notices the unclosed element at </rdf:Description> on line 9
    assert error.lineno == xml_line == 9
    assert error.offset == xml_column + 1
    line_text = path.read_text(encoding="utf-8").splitlines()[8]
    start = line_text.index("</rdf:Description>") + 1
    assert start <= error.offset <= start + len("</rdf:Description>")


def test_empty_file_is_a_catalogue_error_not_a_syntax_error():
    # README: empty.ttl is valid Turtle with 0 triples; "nothing loaded" is the loader's check
    with pytest.raises(CatalogueError) as caught:
        Catalogue.load([BAD / "empty.ttl"])
    assert not isinstance(caught.value, CatalogueSyntaxError)
    assert "empty.ttl" in str(caught.value)


def test_bytes_that_are_not_utf8_give_their_position(tmp_path):
    data = b'@prefix ex: <https://example.org/> .\nex:a ex:b "caf\xe9 noir" .\n'
    path = tmp_path / "latin1.ttl"
    path.write_bytes(data)
    # reference: Python's UTF-8 codec; the position of the first undecodable byte
    with pytest.raises(UnicodeDecodeError) as codec:
        data.decode("utf-8")
    start = codec.value.start
    line = data.count(b"\n", 0, start) + 1
    column = start - (data.rfind(b"\n", 0, start) + 1) + 1
    with pytest.raises(CatalogueSyntaxError) as caught:
        Catalogue.load([path])
    assert (caught.value.lineno, caught.value.offset) == (line, column) == (2, 15)


def test_folder_with_one_bad_file_loads_nothing(tmp_path):
    folder = tmp_path / "catalogue"
    folder.mkdir()
    shutil.copy(GOOD, folder / "a_good.ttl")
    shutil.copy(BAD / "truncated.ttl", folder / "b_cut.ttl")
    shutil.copy(GOOD, folder / "c_good.ttl")
    reports: list[tuple[str, float]] = []
    result = None
    with pytest.raises(CatalogueSyntaxError) as caught:
        result = Catalogue.load([folder], progress=Progress(lambda s, f: reports.append((s, f))))
    assert result is None
    assert caught.value.filename.endswith("b_cut.ttl")
    assert caught.value.lineno == 10
    assert all(fraction < 1.0 for _stage, fraction in reports)


def test_unknown_extension_is_refused(tmp_path):
    path = tmp_path / "catalogue.txt"
    shutil.copy(GOOD, path)
    with pytest.raises(CatalogueError, match=r"\.txt"):
        Catalogue.load([path])


@pytest.mark.parametrize("name", ["turtle", "Turtle", "ttl"])
def test_explicit_format_name(tmp_path, name):
    path = tmp_path / "catalogue.txt"
    shutil.copy(GOOD, path)
    catalogue = Catalogue.load([path], format_name=name)
    # reference: rdflib's Turtle parser on the same file
    assert len(catalogue) == len(rdflib.Graph().parse(GOOD, format="turtle"))


def test_unknown_format_name_is_refused(tmp_path):
    path = tmp_path / "catalogue.txt"
    shutil.copy(GOOD, path)
    with pytest.raises(CatalogueError, match="klingon"):
        Catalogue.load([path], format_name="klingon")


def test_missing_file_is_a_catalogue_error(tmp_path):
    with pytest.raises(CatalogueError, match=r"nowhere\.ttl"):
        Catalogue.load([tmp_path / "nowhere.ttl"])


def test_cancelled_load_raises_cancelled():
    token = CancelToken()
    token.cancel()
    with pytest.raises(Cancelled):
        Catalogue.load([GOOD], progress=Progress(token=token))


def test_progress_reports_rise_to_one():
    reports: list[float] = []
    Catalogue.load([GOOD], progress=Progress(lambda stage, fraction: reports.append(fraction)))
    assert reports == sorted(reports)
    assert reports[-1] == 1.0
    assert all(0.0 <= f <= 1.0 for f in reports)


# ----- one tiny catalogue in every syntax ------------------------------------------------------

EX = "https://tiny.example/"
S = "https://schema.org/"
RDF_TYPE = "http://www.w3.org/1999/02/22-rdf-syntax-ns#type"

TRIPLES = [
    (f"<{EX}w1>", f"<{RDF_TYPE}>", f"<{S}Book>"),
    (f"<{EX}w1>", f"<{S}name>", '"Tide Ledger"@en'),
    (f"<{EX}w1>", f"<{S}about>", f"<{EX}t1>"),
    (f"<{EX}w1>", f"<{S}author>", f"<{EX}p1>"),
    (f"<{EX}w2>", f"<{RDF_TYPE}>", f"<{S}Movie>"),
    (f"<{EX}w2>", f"<{S}name>", '"Ledger of Tides"'),
    (f"<{EX}w2>", f"<{S}about>", f"<{EX}t1>"),
    (f"<{EX}w2>", f"<{S}isBasedOn>", f"<{EX}w1>"),
    (f"<{EX}t1>", f"<{S}name>", '"Tides"'),
    (f"<{EX}p1>", f"<{RDF_TYPE}>", f"<{S}Person>"),
    (f"<{EX}p1>", f"<{S}name>", '"Orla Vennick"'),
]

TURTLE = f"""@prefix schema: <{S}> .
@prefix ex: <{EX}> .
ex:w1 a schema:Book ; schema:name "Tide Ledger"@en ; schema:about ex:t1 ; schema:author ex:p1 .
ex:w2 a schema:Movie ; schema:name "Ledger of Tides" ; schema:about ex:t1 ;
    schema:isBasedOn ex:w1 .
ex:t1 schema:name "Tides" .
ex:p1 a schema:Person ; schema:name "Orla Vennick" .
"""

NTRIPLES = "".join(f"{s} {p} {o} .\n" for s, p, o in TRIPLES)

TRIG = f"""@prefix schema: <{S}> .
@prefix ex: <{EX}> .
{{
ex:w1 a schema:Book ; schema:name "Tide Ledger"@en ; schema:about ex:t1 ; schema:author ex:p1 .
ex:w2 a schema:Movie ; schema:name "Ledger of Tides" ; schema:about ex:t1 ;
    schema:isBasedOn ex:w1 .
ex:t1 schema:name "Tides" .
ex:p1 a schema:Person ; schema:name "Orla Vennick" .
}}
"""

RDFXML = f"""<?xml version="1.0" encoding="UTF-8"?>
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#" xmlns:schema="{S}">
  <schema:Book rdf:about="{EX}w1">
    <schema:name xml:lang="en">Tide Ledger</schema:name>
    <schema:about rdf:resource="{EX}t1"/>
    <schema:author rdf:resource="{EX}p1"/>
  </schema:Book>
  <schema:Movie rdf:about="{EX}w2">
    <schema:name>Ledger of Tides</schema:name>
    <schema:about rdf:resource="{EX}t1"/>
    <schema:isBasedOn rdf:resource="{EX}w1"/>
  </schema:Movie>
  <rdf:Description rdf:about="{EX}t1"><schema:name>Tides</schema:name></rdf:Description>
  <schema:Person rdf:about="{EX}p1"><schema:name>Orla Vennick</schema:name></schema:Person>
</rdf:RDF>
"""

JSONLD = f"""{{
  "@context": {{"schema": "{S}", "ex": "{EX}"}},
  "@graph": [
    {{"@id": "ex:w1", "@type": "schema:Book",
      "schema:name": {{"@value": "Tide Ledger", "@language": "en"}},
      "schema:about": {{"@id": "ex:t1"}}, "schema:author": {{"@id": "ex:p1"}}}},
    {{"@id": "ex:w2", "@type": "schema:Movie", "schema:name": "Ledger of Tides",
      "schema:about": {{"@id": "ex:t1"}}, "schema:isBasedOn": {{"@id": "ex:w1"}}}},
    {{"@id": "ex:t1", "schema:name": "Tides"}},
    {{"@id": "ex:p1", "@type": "schema:Person", "schema:name": "Orla Vennick"}}
  ]
}}
"""

SYNTAXES = {
    "tiny.ttl": (TURTLE, "turtle"),
    "tiny.nt": (NTRIPLES, "nt"),
    "tiny.nq": (NTRIPLES, "nquads"),  # N-Quads without a graph term: the default graph
    "tiny.trig": (TRIG, "trig"),
    "tiny.rdf": (RDFXML, "xml"),
    "tiny.jsonld": (JSONLD, "json-ld"),
}


def rdflib_triples(path: Path, rdflib_format: str) -> rdflib.Graph:
    dataset = rdflib.Dataset()
    dataset.parse(path, format=rdflib_format)
    graph = rdflib.Graph()
    for s, p, o, _g in dataset.quads((None, None, None, None)):
        graph.add((s, p, o))
    return graph


@pytest.mark.filterwarnings("ignore:.*(ConjunctiveGraph|default_context).*:DeprecationWarning")
@pytest.mark.parametrize("filename", list(SYNTAXES))
def test_same_catalogue_in_every_syntax(tmp_path, filename):
    text, rdflib_format = SYNTAXES[filename]
    path = tmp_path / filename
    path.write_text(text, encoding="utf-8")
    reference = tmp_path / "reference.ttl"
    reference.write_text(TURTLE, encoding="utf-8")
    # reference: rdflib parses the file we wrote to the same graph as the Turtle version
    assert isomorphic(rdflib_triples(path, rdflib_format), rdflib_triples(reference, "turtle"))
    catalogue = Catalogue.load([path])
    assert len(catalogue) == len(TRIPLES)
    profile = detect_profile(catalogue)
    assert set(profile.work_classes) == {S + "Book", S + "Movie"}


NAMED_GRAPH_TRIG = TRIG.replace("\n{\n", f"\n<{EX}graph/1> {{\n")
NAMED_GRAPH_NQUADS = "".join(f"{s} {p} {o} <{EX}graph/1> .\n" for s, p, o in TRIPLES)


@pytest.mark.parametrize(
    ("filename", "text"), [("named.trig", NAMED_GRAPH_TRIG), ("named.nq", NAMED_GRAPH_NQUADS)]
)
def test_named_graph_catalogues_are_read(tmp_path, filename, text):
    path = tmp_path / filename
    path.write_text(text, encoding="utf-8")
    catalogue = Catalogue.load([path])
    assert len(catalogue) == len(TRIPLES)
    profile = detect_profile(catalogue)
    assert set(profile.work_classes) == {S + "Book", S + "Movie"}


def test_from_text_syntax_error_has_a_position():
    with pytest.raises(CatalogueSyntaxError) as caught:
        Catalogue.from_text("@prefix ex: <https://e.example/> .\nex:a ex:b .\n", "turtle")
    assert caught.value.lineno == 2

"""The ``curator`` command run as a curator would run it: a separate process, real files.

The main paths run ``python -m curator.cli`` in a subprocess; the rest call the same ``main``
in this process, which is quicker and sees the same arguments, output and exit code.
"""

from __future__ import annotations

import json
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest
import rdflib
from rdflib.namespace import RDF

from curator.cli.main import main
from curator.core.profile import Profile

FIXTURES = Path(__file__).resolve().parents[1] / "fixtures"
REPO = Path(__file__).resolve().parents[2]
SCHEMA = rdflib.Namespace("https://schema.org/")
WIDTH = 100

# reference: the documented JSON shape of `curator suggest --json`
SUGGESTION_KEYS = {
    "iri", "label", "types", "creators", "year", "score", "relevance",
    "shared_themes", "path", "rationale",
}


def curator(*args: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "curator.cli", *args],
        capture_output=True, text=True, timeout=120, cwd=REPO, check=False,
        env={**_environment(), "PYTHONIOENCODING": "utf-8"},
    )


def _environment() -> dict[str, str]:
    import os

    return {k: v for k, v in os.environ.items() if not k.startswith(("LANG", "LC_"))}


def in_process(capsys, *args: str) -> subprocess.CompletedProcess[str]:
    """The same command through ``curator.cli.main.main`` in this process (faster)."""
    try:
        code = main(list(args))
    except SystemExit as exit_:
        code = exit_.code
    out, err = capsys.readouterr()
    return subprocess.CompletedProcess(list(args), code, out, err)


def assert_bad_input(done: subprocess.CompletedProcess[str]) -> None:
    # reference: the documented exit codes: 2 for bad input, with a message and no traceback
    assert done.returncode == 2, done.stderr
    assert "Traceback" not in done.stderr
    assert "Traceback" not in done.stdout
    assert done.stderr.strip()


@pytest.fixture(scope="module")
def demo_seed(demo_rdflib) -> tuple[str, str]:
    """(IRI, title) of the first work of the demo by IRI, read with rdflib."""
    works = sorted(
        (str(w), str(name))
        for w in demo_rdflib.subjects(SCHEMA.datePublished, None)
        for name in demo_rdflib.objects(w, SCHEMA.name)
        if getattr(name, "language", None) in (None, "en")
    )
    return works[0]


@pytest.fixture(scope="module")
def suggest_json(demo_seed):
    done = curator("suggest", "--seed", demo_seed[1], "--json", "--language", "en")
    assert done.returncode == 0, done.stderr
    return json.loads(done.stdout)


def test_suggest_json_has_the_documented_shape(suggest_json, demo_seed):
    data = suggest_json
    assert {"seeds", "suggestions"} <= set(data)
    assert [s["iri"] for s in data["seeds"]] == [demo_seed[0]]
    assert len(data["suggestions"]) == 10
    for item in data["suggestions"]:
        assert set(item) >= SUGGESTION_KEYS, SUGGESTION_KEYS - set(item)
        assert isinstance(item["rationale"], str) and item["rationale"]
        assert isinstance(item["shared_themes"], list)
        assert item["path"] is None or isinstance(item["path"], str)
        assert isinstance(item["score"], float | int)


def test_suggest_json_agrees_with_the_data(suggest_json, demo_rdflib):
    # reference: rdf:type, schema:datePublished and schema:author as rdflib reads the files
    for item in suggest_json["suggestions"]:
        work = rdflib.URIRef(item["iri"])
        assert (work, RDF.type, None) in demo_rdflib
        types = {str(t) for t in demo_rdflib.objects(work, RDF.type)}
        assert {t["iri"] for t in item["types"]} <= types
        dates = [str(d) for d in demo_rdflib.objects(work, SCHEMA.datePublished)]
        assert item["year"] == min(int(d[:4]) for d in dates)
        authors = {str(a) for a in demo_rdflib.objects(work, SCHEMA.author)}
        assert authors <= {c["iri"] for c in item["creators"]}


def test_suggest_table_fits_100_columns(demo_seed):
    done = curator("suggest", "--seed", demo_seed[1], "--language", "en")
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert len(lines) > 10
    # reference: the documented table width of the command line, 100 columns
    too_wide = [line for line in lines if len(line) > WIDTH]
    assert not too_wide


def test_suggest_by_iri_with_type_limit_and_lambda(capsys, demo_seed, demo_rdflib):
    done = in_process(capsys,
        "suggest", "--seed", demo_seed[0], "--type", "Film", "--limit", "4",
        "--lambda", "0.5", "--json", "--language", "en",
    )
    assert done.returncode == 0, done.stderr
    data = json.loads(done.stdout)
    assert len(data["suggestions"]) == 4
    film = next(iter(demo_rdflib.subjects(rdflib.RDFS.label, rdflib.Literal("Film", lang="en"))))
    for item in data["suggestions"]:
        assert (rdflib.URIRef(item["iri"]), RDF.type, film) in demo_rdflib


def test_shared_count_mode_from_the_command_line(capsys, dc_rdflib):
    subject = "http://purl.org/dc/terms/subject"
    seed = "https://catalogue.example/dc/work/w01"
    done = in_process(capsys,
        "suggest", "--catalogue", str(FIXTURES / "dcterms_skos.ttl"), "--seed", seed,
        "--mode", "shared-count", "--property", subject, "--limit", "50", "--json",
    )
    assert done.returncode == 0, done.stderr
    got = {s["iri"]: s["score"] for s in json.loads(done.stdout)["suggestions"]}
    # reference: rdflib's SPARQL engine counting shared dcterms:subject values
    rows = dc_rdflib.query(
        f"""SELECT ?rec (COUNT(?cat) AS ?n) WHERE {{
            <{seed}> <{subject}> ?cat . ?rec <{subject}> ?cat . FILTER(?rec != <{seed}>)
        }} GROUP BY ?rec"""
    )
    assert got == {str(rec): int(n) for rec, n in rows}


def test_profile_json(dc_rdflib):
    done = curator("profile", "--catalogue", str(FIXTURES / "dcterms_skos.ttl"), "--json")
    assert done.returncode == 0, done.stderr
    data = json.loads(done.stdout)
    # reference: the fixture's header: 24 dcterms:BibliographicResource, 6 dcmitype:MovingImage
    classes = {c["iri"]: c["works"] for c in data["work_classes"]}
    assert classes == {
        "http://purl.org/dc/terms/BibliographicResource": 24,
        "http://purl.org/dc/dcmitype/MovingImage": 6,
    }
    assert data["works"] == 30
    assert data["triples"] == len(dc_rdflib)


def test_profile_text_fits_and_save_writes_toml(capsys, tmp_path):
    target = tmp_path / "profile.toml"
    done = in_process(capsys,
        "profile", "--catalogue", str(FIXTURES / "bibframe.ttl"), "--save", str(target),
    )
    assert done.returncode == 0, done.stderr
    assert all(len(line) <= WIDTH for line in done.stdout.splitlines())
    data = tomllib.loads(target.read_text(encoding="utf-8"))  # reference: Python's tomllib
    assert "http://id.loc.gov/ontologies/bibframe/Work" in data["work_classes"]
    profile = Profile.load(target)
    again = in_process(capsys,
        "suggest", "--catalogue", str(FIXTURES / "bibframe.ttl"), "--profile", str(target),
        "--seed", "Towpath", "--json",
    )
    assert again.returncode == 0, again.stderr
    assert json.loads(again.stdout)["seeds"][0]["iri"].endswith("/w02")
    assert profile.work_classes == tuple(data["work_classes"])


def test_bad_file_exits_2_naming_file_and_line():
    bad = FIXTURES / "bad" / "truncated.ttl"
    done = curator("suggest", "--catalogue", str(bad), "--seed", "anything")
    assert_bad_input(done)
    # reference: tests/fixtures/bad/README.md: the error is on line 10
    assert "truncated.ttl" in done.stderr
    assert "line 10" in done.stderr


def test_rdf_xml_error_exits_2_with_a_line(capsys):
    done = in_process(capsys, "profile", "--catalogue", str(FIXTURES / "bad" / "unclosed.rdf"))
    assert_bad_input(done)
    assert "unclosed.rdf" in done.stderr
    assert "line 9" in done.stderr


def test_unknown_seed_exits_2():
    done = curator(
        "suggest", "--catalogue", str(FIXTURES / "dcterms_skos.ttl"),
        "--seed", "Xqzzv Plumbrack Wendigoat",
    )
    assert_bad_input(done)
    assert "Xqzzv Plumbrack Wendigoat" in done.stderr


def test_out_of_range_lambda_exits_2(capsys):
    done = in_process(capsys,
        "suggest", "--catalogue", str(FIXTURES / "dcterms_skos.ttl"),
        "--seed", "Windfalls", "--lambda", "1.5",
    )
    assert_bad_input(done)
    assert "lambda" in done.stderr


def test_missing_seed_option_is_a_usage_error(capsys):
    assert_bad_input(in_process(capsys, "suggest"))


def test_unknown_extension_exits_2(capsys, tmp_path):
    path = tmp_path / "catalogue.txt"
    path.write_text((FIXTURES / "dcterms_skos.ttl").read_text(encoding="utf-8"), "utf-8")
    done = in_process(capsys, "profile", "--catalogue", str(path))
    assert_bad_input(done)
    assert ".txt" in done.stderr
    ok = in_process(capsys, "profile", "--catalogue", str(path), "--format", "turtle", "--json")
    assert ok.returncode == 0, ok.stderr


LONG = """@prefix schema: <https://schema.org/> .
@prefix ex: <https://long.example/> .
ex:t a ex:Theme .
ex:a1 a schema:Person ; schema:name "Bartholomew Quennell-Ashcombe" .
ex:a2 a schema:Person ; schema:name "Philippa Wetherington-Stroud" .
ex:w1 a schema:Audiobook ;
    schema:name "The Exceedingly Long and Winding Chronicle of the Seven Lantern Keepers" ;
    schema:author ex:a1 ; schema:readBy ex:a2 ; schema:about ex:t ;
    schema:datePublished "1999" .
ex:w2 a schema:Audiobook ; schema:name "Lantern Keepers Abridged" ;
    schema:author ex:a1 ; schema:readBy ex:a2 ; schema:about ex:t ;
    schema:datePublished "2001" .
ex:w3 a schema:Book ; schema:name "The Keepers" ; schema:author ex:a1 ; schema:about ex:t ;
    schema:datePublished "1990" .
"""


def test_table_fits_100_columns_with_a_long_seed_title(capsys, tmp_path):
    path = tmp_path / "long.ttl"
    path.write_text(LONG, encoding="utf-8")
    done = in_process(capsys,
        "suggest", "--catalogue", str(path), "--seed", "https://long.example/w1",
    )
    assert done.returncode == 0, done.stderr
    assert all(len(line) <= WIDTH for line in done.stdout.splitlines()), done.stdout

"""Profile detection on three vocabularies, the TOML round trip, and errors naming the field."""

from __future__ import annotations

import tomllib
from dataclasses import replace

import pytest
import rdflib
from rdflib.namespace import RDF, RDFS

from curator.core.errors import ProfileError
from curator.core.profile import Profile, ThemeProperty

SCHEMA = "https://schema.org/"
DCT = "http://purl.org/dc/terms/"
DCMITYPE = "http://purl.org/dc/dcmitype/"
BF = "http://id.loc.gov/ontologies/bibframe/"
SKOS_BROADER = "http://www.w3.org/2004/02/skos/core#broader"

# reference: schema.org type hierarchy (https://schema.org/CreativeWork): Book, Movie and
# Audiobook are subtypes of CreativeWork.
SCHEMA_WORK_TYPES = {SCHEMA + t for t in ("CreativeWork", "Book", "Movie", "Audiobook")}


def roles(profile: Profile) -> dict[str, str]:
    return {t.path: t.role for t in profile.themes}


def link_paths(profile: Profile) -> set[str]:
    return {link.path for link in profile.work_links}


# ----- the demo collection (schema.org) -----------------------------------------------------


def demo_work_classes(graph: rdflib.Graph) -> set[str]:
    """Classes with members whose stated rdfs:subClassOf chain reaches a schema.org work type."""
    found = set()
    for cls in set(graph.objects(None, RDF.type)):
        supers = {str(c) for c in graph.transitive_objects(cls, RDFS.subClassOf)}
        if supers & SCHEMA_WORK_TYPES:
            found.add(str(cls))
    return found


def test_demo_profile(demo_workspace, demo_rdflib):
    profile = demo_workspace.profile
    expected = demo_work_classes(demo_rdflib)
    assert expected
    assert set(profile.work_classes) == expected
    members = {
        str(s) for c in expected for s in demo_rdflib.subjects(RDF.type, rdflib.URIRef(c))
    }
    assert set(demo_workspace.index.works) == members
    found = roles(profile)
    assert found[SCHEMA + "about"] == "subject"
    assert found[SCHEMA + "author"] == "creator"
    assert SKOS_BROADER in profile.hierarchy
    assert SCHEMA + "datePublished" in profile.year_properties
    assert SCHEMA + "inLanguage" in profile.language_properties
    assert SCHEMA + "isBasedOn" in link_paths(profile)


def test_demo_records_years_and_languages_match_the_data(demo_workspace, demo_rdflib):
    index = demo_workspace.index
    for record in index.records:
        work = rdflib.URIRef(record.iri)
        dates = [str(d) for d in demo_rdflib.objects(work, rdflib.URIRef(SCHEMA + "datePublished"))]
        expected_year = min(int(d[:4]) for d in dates) if dates else None
        assert record.year == expected_year, record.iri
        langs = {str(v) for v in demo_rdflib.objects(work, rdflib.URIRef(SCHEMA + "inLanguage"))}
        assert set(record.languages) == langs, record.iri


# ----- Dublin Core + SKOS ------------------------------------------------------------------


def test_dc_profile(dc_workspace):
    profile = dc_workspace.profile
    # reference: the fixture's header: 24 dcterms:BibliographicResource, 6 dcmitype:MovingImage
    assert set(profile.work_classes) == {DCT + "BibliographicResource", DCMITYPE + "MovingImage"}
    assert len(dc_workspace.index.works) == 30
    found = roles(profile)
    assert found[DCT + "subject"] == "subject"
    assert found[DCT + "creator"] == "creator"
    assert SKOS_BROADER in profile.hierarchy
    assert DCT + "date" in profile.year_properties
    assert DCT + "language" in profile.language_properties
    assert DCT + "isVersionOf" in link_paths(profile)


def test_dc_years_from_plain_and_typed_dates(dc_workspace, dc_rdflib):
    # reference: the fixture mixes "1954" and "1954-03-01"^^xsd:date; the year is the first 4
    # digits (ISO 8601 / XML Schema date lexical form)
    for record in dc_workspace.index.records:
        dates = list(dc_rdflib.objects(rdflib.URIRef(record.iri), rdflib.URIRef(DCT + "date")))
        assert len(dates) == 1
        assert record.year == int(str(dates[0])[:4]), record.iri


# ----- BIBFRAME ----------------------------------------------------------------------------


def test_bf_profile(bf_workspace, bf_rdflib):
    profile = bf_workspace.profile
    assert BF + "Work" in profile.work_classes
    assert BF + "Instance" not in profile.work_classes
    # reference: the fixture's header: 20 bf:Work, 26 bf:Instance (instances are not works)
    works = {str(s) for s in bf_rdflib.subjects(RDF.type, rdflib.URIRef(BF + "Work"))}
    assert len(works) == 20
    assert set(bf_workspace.index.works) == works
    assert BF + "instanceOf" in profile.instance_links
    found = roles(profile)
    assert found[BF + "subject"] == "subject"
    assert found[f"{BF}contribution {BF}agent"] == "creator"
    assert SKOS_BROADER in profile.hierarchy
    assert f"{BF}provisionActivity {BF}date" in profile.year_properties
    assert BF + "language" in profile.language_properties
    assert BF + "translationOf" in link_paths(profile)


def test_bf_instance_years_fold_into_works(bf_workspace, bf_rdflib):
    # reference: BIBFRAME 2.0 model: dates of publication sit on Instances (bf:provisionActivity
    # / bf:date) linked to their Work by bf:instanceOf; a work's year is its earliest instance's.
    rows = bf_rdflib.query(
        """PREFIX bf: <http://id.loc.gov/ontologies/bibframe/>
        SELECT ?work (MIN(xsd:integer(SUBSTR(STR(?date), 1, 4))) AS ?year) WHERE {
            ?instance bf:instanceOf ?work ; bf:provisionActivity/bf:date ?date .
        } GROUP BY ?work""",
        initNs={"xsd": rdflib.XSD},
    )
    expected = {str(work): int(year) for work, year in rows}
    assert len(expected) == 20
    assert {r.iri: r.year for r in bf_workspace.index.records} == expected


def test_bf_creators_through_contribution_blank_nodes(bf_workspace, bf_rdflib):
    rows = bf_rdflib.query(
        """PREFIX bf: <http://id.loc.gov/ontologies/bibframe/>
        SELECT ?work ?agent WHERE { ?work a bf:Work ; bf:contribution/bf:agent ?agent }"""
    )
    expected: dict[str, set[str]] = {}
    for work, agent in rows:
        expected.setdefault(str(work), set()).add(str(agent))
    assert {r.iri: set(r.creators) for r in bf_workspace.index.records} == expected


def test_bf_titles_through_title_blank_nodes(bf_workspace, bf_rdflib):
    rows = bf_rdflib.query(
        """PREFIX bf: <http://id.loc.gov/ontologies/bibframe/>
        SELECT ?work ?title WHERE { ?work a bf:Work ; bf:title/bf:mainTitle ?title }"""
    )
    expected = {str(w): str(t) for w, t in rows}
    assert {r.iri: r.label for r in bf_workspace.index.records} == expected


# ----- TOML ------------------------------------------------------------------------------------


@pytest.mark.parametrize("name", ["demo_workspace", "dc_workspace", "bf_workspace"])
def test_toml_round_trip(name, request, tmp_path):
    profile = request.getfixturevalue(name).profile
    text = profile.to_toml()
    parsed = tomllib.loads(text)  # reference: Python's tomllib (TOML 1.0)
    assert parsed["work_classes"] == list(profile.work_classes)
    assert Profile.from_toml(text) == profile
    path = tmp_path / "profile.toml"
    profile.save(path)
    assert Profile.load(path) == profile


def test_toml_round_trip_of_an_edited_profile(dc_workspace):
    edited = replace(
        dc_workspace.profile,
        hierarchy_decay=0.25,
        themes=(*dc_workspace.profile.themes, ThemeProperty(DCT + "relation", "other", 0.0)),
    )
    assert Profile.from_toml(edited.to_toml()) == edited
    assert Profile.from_toml(edited.to_toml()) != dc_workspace.profile


MINIMAL = 'work_classes = ["https://example.org/Book"]\n'


@pytest.mark.parametrize(
    ("text", "field"),
    [
        (MINIMAL + "colour = 'blue'\n", "colour"),
        (MINIMAL + '[[themes]]\npath = "https://example.org/p"\nrole = "mood"\n', "role"),
        (MINIMAL + '[[themes]]\npath = "https://example.org/p"\nweight = -1\n', "weight"),
        (MINIMAL + '[[themes]]\npath = "https://example.org/p"\nshade = 1\n', "shade"),
        (MINIMAL + '[[work_links]]\npath = "https://example.org/p"\nweight = -0.5\n', "weight"),
        (MINIMAL + "hierarchy_decay = 2.0\n", "hierarchy_decay"),
        (MINIMAL + 'languages = "en"\n', "languages"),
        ("work_classes = []\n", "work_classes"),
        (MINIMAL + "version = 7\n", "version"),
    ],
)
def test_bad_profile_names_the_field(text, field):
    with pytest.raises(ProfileError, match=field):
        Profile.from_toml(text)


def test_bad_role_error_points_at_the_entry():
    text = MINIMAL + '[[themes]]\npath = "https://example.org/a"\n' + (
        '[[themes]]\npath = "https://example.org/b"\nrole = "mood"\n'
    )
    with pytest.raises(ProfileError, match=r"themes\[1\]\.role"):
        Profile.from_toml(text)


def test_not_toml_is_a_profile_error(tmp_path):
    path = tmp_path / "broken.toml"
    path.write_text("work_classes = [\n", encoding="utf-8")
    with pytest.raises(ProfileError, match=r"broken\.toml"):
        Profile.load(path)

"""Shared fixtures: the demo collection and the two vocabulary fixtures, opened once per session.

Every workspace is opened with English labels so that the tests do not depend on the locale of
the machine they run on.
"""

from __future__ import annotations

import os

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from pathlib import Path

import pytest
import rdflib

from curator.services.workspace import Workspace, demo_collection_path, open_catalogue

TESTS = Path(__file__).resolve().parent
FIXTURES = TESTS / "fixtures"
REPO = TESTS.parent
LANGUAGES = ("en",)


def rdflib_graph(paths: list[Path]) -> rdflib.Graph:
    """The same files parsed by rdflib, an RDF library independent of pyoxigraph."""
    graph = rdflib.Graph()
    for path in paths:
        graph.parse(str(path), format="turtle")
    return graph


def demo_files() -> list[Path]:
    return sorted(demo_collection_path().glob("*.ttl"))


@pytest.fixture(scope="session")
def demo_workspace() -> Workspace:
    return open_catalogue(languages=LANGUAGES)


@pytest.fixture(scope="session")
def dc_workspace() -> Workspace:
    return open_catalogue([FIXTURES / "dcterms_skos.ttl"], languages=LANGUAGES)


@pytest.fixture(scope="session")
def bf_workspace() -> Workspace:
    return open_catalogue([FIXTURES / "bibframe.ttl"], languages=LANGUAGES)


@pytest.fixture(scope="session")
def demo_rdflib() -> rdflib.Graph:
    return rdflib_graph(demo_files())


@pytest.fixture(scope="session")
def dc_rdflib() -> rdflib.Graph:
    return rdflib_graph([FIXTURES / "dcterms_skos.ttl"])


@pytest.fixture(scope="session")
def bf_rdflib() -> rdflib.Graph:
    return rdflib_graph([FIXTURES / "bibframe.ttl"])

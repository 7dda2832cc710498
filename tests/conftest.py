"""Shared fixtures: the demo collection and the two vocabulary fixtures, opened once per session.

Every workspace is opened with English labels so that the tests do not depend on the locale of
the machine they run on.
"""

from __future__ import annotations

import atexit
import os
import shutil
import tempfile

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from pathlib import Path

import pytest
import rdflib

from curator.services.workspace import Workspace, demo_collection_path, open_catalogue

TESTS = Path(__file__).resolve().parent
FIXTURES = TESTS / "fixtures"
REPO = TESTS.parent
LANGUAGES = ("en",)

# The cache of opened catalogues goes to a folder of this run, never the user's own cache
# (removed at exit, after any copy still being written has finished).
_CACHE_DIR = tempfile.mkdtemp(prefix="curator-test-cache-")
os.environ["CURATOR_CACHE_DIR"] = _CACHE_DIR
os.environ.pop("CURATOR_NO_CACHE", None)
atexit.register(shutil.rmtree, _CACHE_DIR, True)


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

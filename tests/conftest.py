"""Shared fixtures: the demo collection and the two vocabulary fixtures, opened once per session.

Every workspace is opened with English labels so that the tests do not depend on the locale of
the machine they run on.
"""

from __future__ import annotations

import atexit
import json
import os
import shutil
import socket
import subprocess
import tempfile
import time
import urllib.parse
import urllib.request
from collections.abc import Callable

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


# ----- a real SPARQL 1.1 server for the endpoint tests --------------------------------------
# The Oxigraph server (PyPI package ``oxigraph``, a test extra) on 127.0.0.1 with a free port,
# the demo collection loaded: a second SPARQL engine beside the embedded pyoxigraph store.

SERVER = shutil.which("oxigraph") or str(Path(__file__).resolve().parents[1] / ".venv/bin/oxigraph")


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def triple_count(url: str) -> int:
    """How many statements the server holds, asked the server itself."""
    query = urllib.parse.urlencode({"query": "SELECT (COUNT(*) AS ?n) WHERE { ?s ?p ?o }"})
    request = urllib.request.Request(
        f"{url}?{query}", headers={"Accept": "application/sparql-results+json"}
    )
    with urllib.request.urlopen(request, timeout=30) as answer:
        document = json.loads(answer.read())
    return int(document["results"]["bindings"][0]["n"]["value"])


@pytest.fixture
def unused_port() -> int:
    """A port nothing listens on (free a moment ago)."""
    return free_port()


@pytest.fixture
def server_triples() -> Callable[[str], int]:
    """:func:`triple_count`, for tests (a conftest is not importable as a module)."""
    return triple_count


@pytest.fixture(scope="session")
def oxigraph_server(tmp_path_factory):
    """The query URL of an Oxigraph server holding the demo collection."""
    if not Path(SERVER).exists():
        pytest.skip("the oxigraph server is not installed (pip install oxigraph)")
    port = free_port()
    folder = tmp_path_factory.mktemp("oxigraph")
    process = subprocess.Popen(
        [SERVER, "serve", "--location", str(folder / "db"), "--bind", f"127.0.0.1:{port}"],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )
    base = f"http://127.0.0.1:{port}"
    try:
        for _ in range(100):
            try:
                urllib.request.urlopen(f"{base}/query?query=ASK%7B%7D", timeout=1).read()
                break
            except OSError:
                time.sleep(0.1)
        for path in sorted(demo_collection_path().glob("*.ttl")):
            request = urllib.request.Request(
                f"{base}/store?default",
                data=path.read_bytes(),
                headers={"Content-Type": "text/turtle"},
                method="POST",
            )
            urllib.request.urlopen(request, timeout=30).read()
        yield f"{base}/query"
    finally:
        process.terminate()
        process.wait(timeout=10)

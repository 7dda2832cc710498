"""A real SPARQL 1.1 server for the endpoint tests: the Oxigraph server (PyPI package
``oxigraph``, a test extra) on 127.0.0.1 with a free port, the demo collection loaded."""

from __future__ import annotations

import shutil
import socket
import subprocess
import time
import urllib.parse
import urllib.request
from collections.abc import Callable
from pathlib import Path

import pytest

from curator.services.workspace import demo_collection_path

SERVER = shutil.which("oxigraph") or str(Path(__file__).resolve().parents[2] / ".venv/bin/oxigraph")


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
    import json

    with urllib.request.urlopen(request, timeout=30) as answer:
        document = json.loads(answer.read())
    return int(document["results"]["bindings"][0]["n"]["value"])


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

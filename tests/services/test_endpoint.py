"""A SPARQL 1.1 endpoint as the catalogue: a real Oxigraph server (tests/conftest.py), and
a misbehaving test server.

The Oxigraph server (PyPI package ``oxigraph``) is a second SPARQL engine: endpoint mode must give
the same suggestions and explanations as the embedded store.
"""

from __future__ import annotations

import http.server
import json
import threading
import time
import urllib.parse
from typing import ClassVar

import pytest

from curator.core.endpoint import EndpointCatalogue, EndpointError, EndpointSettings, SparqlEndpoint
from curator.core.index import build_index
from curator.core.profile import detect_profile
from curator.core.reading import sparql_iri
from curator.core.suggest import Suggester, SuggestSettings


def test_endpoint_mode_gives_the_same_suggestions(oxigraph_server, demo_workspace):
    endpoint = SparqlEndpoint(EndpointSettings(oxigraph_server, timeout=30))
    catalogue = EndpointCatalogue(endpoint)
    profile = detect_profile(catalogue, languages=("en",))
    assert profile == demo_workspace.profile
    index = build_index(catalogue, profile)
    assert index.works == demo_workspace.index.works
    remote = Suggester(index)
    local = demo_workspace.suggester
    for iri in (
        "https://hollinmere.example/work/the-mirror-of-gullstane",
        "https://hollinmere.example/work/thessalys-heron",
    ):
        seed = index.position[iri]
        a = remote.suggest([seed], SuggestSettings(limit=10))
        b = local.suggest([seed], SuggestSettings(limit=10))
        assert [s.iri for s in a.suggestions] == [s.iri for s in b.suggestions]
        assert [s.rationale for s in a.suggestions] == [s.rationale for s in b.suggestions]
        assert [s.score for s in a.suggestions] == pytest.approx([s.score for s in b.suggestions])


class _Scripted(http.server.BaseHTTPRequestHandler):
    """Answers from a script: a list of (status, headers, body, delay) consumed per request."""

    script: ClassVar[list[tuple[int, dict[str, str], bytes, float]]] = []
    methods: ClassVar[list[str]] = []

    def _answer(self) -> None:
        type(self).methods.append(self.command)
        status, headers, body, delay = type(self).script.pop(0)
        time.sleep(delay)
        self.send_response(status)
        for key, value in headers.items():
            self.send_header(key, value)
        self.send_header("Content-Length", str(len(body)))
        self.end_headers()
        self.wfile.write(body)

    do_GET = _answer
    do_POST = _answer

    def log_message(self, *_args) -> None:
        pass


GOOD = json.dumps(
    {"head": {"vars": ["s"]}, "results": {"bindings": [{"s": {"type": "uri", "value": "http://e/x"}}]}}
).encode()


@pytest.fixture
def scripted_server():
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), _Scripted)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    _Scripted.script = []
    _Scripted.methods = []
    yield f"http://127.0.0.1:{server.server_address[1]}/sparql"
    server.shutdown()
    server.server_close()


def test_retries_503_and_429_honouring_retry_after(scripted_server):
    _Scripted.script = [
        (503, {"Retry-After": "2"}, b"busy", 0.0),
        (429, {"Retry-After": "1"}, b"slow down", 0.0),
        (200, {"Content-Type": "application/sparql-results+json"}, GOOD, 0.0),
    ]
    waits: list[float] = []
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server), sleep=waits.append)
    _vars, rows = endpoint.select("SELECT ?s WHERE { ?s ?p ?o }")
    assert rows[0][0].value == "http://e/x"
    assert waits == [2.0, 1.0]
    assert endpoint.requests == 3


def test_gives_up_after_the_last_retry(scripted_server):
    _Scripted.script = [(503, {}, b"down", 0.0)] * 3
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server, retries=2), sleep=lambda _s: None)
    with pytest.raises(EndpointError, match="503"):
        endpoint.select("SELECT * WHERE { ?s ?p ?o }")


def test_malformed_json_and_client_errors_are_clear(scripted_server):
    _Scripted.script = [(200, {}, b"{not json", 0.0), (400, {}, b"Parse error at line 1", 0.0)]
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server), sleep=lambda _s: None)
    with pytest.raises(EndpointError, match="not SPARQL JSON results"):
        endpoint.select("SELECT * WHERE { ?s ?p ?o }")
    with pytest.raises(EndpointError, match=r"refused the query.*400.*Parse error"):
        endpoint.select("SELECT * WHERE { ?s ?p ?o }")


def test_a_slow_endpoint_times_out(scripted_server):
    _Scripted.script = [(200, {}, GOOD, 1.5)]
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server, timeout=0.3, retries=0))
    started = time.monotonic()
    with pytest.raises(EndpointError, match=r"no answer within 0\.3 s"):
        endpoint.select("SELECT * WHERE { ?s ?p ?o }")
    assert time.monotonic() - started < 1.4


def test_long_queries_are_posted(scripted_server):
    _Scripted.script = [(200, {}, GOOD, 0.0), (200, {}, GOOD, 0.0)]
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server, max_get_length=200))
    endpoint.select("SELECT ?s WHERE { ?s ?p ?o }")
    endpoint.select("SELECT ?s WHERE { ?s ?p ?o } # " + "x" * 500)
    assert _Scripted.methods == ["GET", "POST"]


def test_not_an_http_url():
    with pytest.raises(EndpointError, match="not an http"):
        SparqlEndpoint(EndpointSettings("file:///etc/passwd"))


@pytest.mark.parametrize("iri", ["http://e/x> } DROP ALL { <y", 'http://e/"x', "http://e/x y"])
def test_iris_that_would_break_out_of_a_query_are_refused(iri):
    # SPARQL 1.1 grammar, IRIREF: no <>"{}|^`\ or spaces inside an IRI reference
    with pytest.raises(ValueError):
        sparql_iri(iri)


def test_url_encoding_of_get_queries(scripted_server):
    _Scripted.script = [(200, {}, GOOD, 0.0)]
    endpoint = SparqlEndpoint(EndpointSettings(scripted_server))
    request = endpoint._request('SELECT * WHERE { ?s ?p "a&b" }')
    query = urllib.parse.parse_qs(urllib.parse.urlparse(request.full_url).query)["query"][0]
    assert query == 'SELECT * WHERE { ?s ?p "a&b" }'

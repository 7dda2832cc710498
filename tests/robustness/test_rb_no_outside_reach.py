"""Loading a catalogue reads nothing but the file: no XML external entities, no remote
JSON-LD contexts."""

from __future__ import annotations

import socket
import threading

import pytest

from curator.core.catalogue import Catalogue
from curator.core.errors import CuratorError

SECRET = "TOP-SECRET-7f3a9c"


def test_rdfxml_external_entity_is_never_read(tmp_path):
    secret = tmp_path / "secret.txt"
    secret.write_text(SECRET, encoding="utf-8")
    path = tmp_path / "xxe.rdf"
    path.write_text(
        f"""<?xml version="1.0"?>
<!DOCTYPE rdf:RDF [<!ENTITY secret SYSTEM "{secret.as_uri()}">]>
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"
         xmlns:schema="https://schema.org/">
  <schema:Book rdf:about="http://e/w">
    <schema:name>Leak &secret; here</schema:name>
  </schema:Book>
</rdf:RDF>
""",
        encoding="utf-8",
    )
    try:
        catalogue = Catalogue.load([path])
    except CuratorError as exc:
        assert SECRET not in str(exc)
        return
    texts = [
        term.value
        for quad in catalogue.triples()
        for term in (quad.subject, quad.predicate, quad.object)
    ]
    assert texts  # something was loaded, so the check below looked at real triples
    assert not any(SECRET in t for t in texts)


class Recorder:
    """A TCP server on 127.0.0.1 that records every connection made to it."""

    def __init__(self) -> None:
        self.sock = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
        self.sock.bind(("127.0.0.1", 0))
        self.sock.listen(8)
        self.sock.settimeout(0.2)
        self.port = self.sock.getsockname()[1]
        self.connections: list[tuple[str, int]] = []
        self._stop = threading.Event()
        self.thread = threading.Thread(target=self._serve, daemon=True)
        self.thread.start()

    def _serve(self) -> None:
        while not self._stop.is_set():
            try:
                conn, addr = self.sock.accept()
            except OSError:
                continue
            self.connections.append(addr)
            conn.close()

    def close(self) -> None:
        self._stop.set()
        self.thread.join(2)
        self.sock.close()


@pytest.fixture
def recorder():
    server = Recorder()
    yield server
    server.close()


def test_recorder_sees_a_real_connection(recorder):
    # The check below must be able to fail: a plain connect is recorded.
    with socket.create_connection(("127.0.0.1", recorder.port), timeout=2):
        pass
    recorder.thread.join(0.5)
    assert recorder.connections


def test_jsonld_remote_context_is_never_fetched(tmp_path, recorder):
    path = tmp_path / "remote.jsonld"
    path.write_text(
        f'{{"@context": "http://127.0.0.1:{recorder.port}/context.jsonld",\n'
        ' "@id": "http://e/w", "@type": "Book", "name": "Remote"}\n',
        encoding="utf-8",
    )
    with pytest.raises(CuratorError):
        Catalogue.load([path])
    recorder.thread.join(0.5)
    assert recorder.connections == []

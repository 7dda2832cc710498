"""A SPARQL 1.1 endpoint as the catalogue, for collections no laptop holds.

Queries go out by the SPARQL 1.1 Protocol: GET with the query in the URL when it is short, a
URL-encoded POST when it is long; answers are asked for as ``application/sparql-results+json``.
Every request has a timeout; 429 and 503 answers are retried with exponential backoff,
honouring ``Retry-After``; other failures become an :class:`EndpointError` that says what the
server said. Rows come back as pyoxigraph terms, so the rest of the engine reads an endpoint
exactly as it reads the embedded store.
"""

from __future__ import annotations

import email.utils
import json
import time
import urllib.error
import urllib.parse
import urllib.request
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from typing import Any

import pyoxigraph as ox

from curator.core.catalogue import Catalogue, Term
from curator.core.errors import CatalogueError

RESULTS_JSON = "application/sparql-results+json"


class EndpointError(CatalogueError):
    """The endpoint could not be asked, or did not answer usefully."""


@dataclass(frozen=True)
class EndpointSettings:
    url: str
    timeout: float = 30.0
    retries: int = 4
    backoff: float = 0.5
    #: Longest URL sent by GET; longer queries are POSTed.
    max_get_length: int = 1800
    #: Longest wait honoured from a Retry-After header.
    max_retry_after: float = 30.0


_STRING_ESCAPES = {
    "\\": "\\\\",
    '"': '\\"',
    "\n": "\\n",
    "\r": "\\r",
    "\t": "\\t",
    "\b": "\\b",
    "\f": "\\f",
}


def sparql_string(text: str) -> str:
    """``text`` as a quoted SPARQL string literal, every character that could end it or
    break the line escaped (SPARQL 1.1 grammar, STRING_LITERAL_QUOTE and ECHAR); other
    control characters become four-digit ``\\u`` escapes (a bell is ``\\u0007``). What a
    curator types goes into a query only through here."""
    out = []
    for char in text:
        escaped = _STRING_ESCAPES.get(char)
        if escaped is not None:
            out.append(escaped)
        elif ord(char) < 0x20 or char in "\u2028\u2029":
            out.append(f"\\u{ord(char):04X}")
        else:
            out.append(char)
    return '"' + "".join(out) + '"'


def _term(binding: dict[str, Any]) -> Term:
    kind = binding.get("type")
    value = binding.get("value", "")
    if kind == "uri":
        return ox.NamedNode(value)
    if kind == "bnode":
        return ox.BlankNode(value)
    if kind in ("literal", "typed-literal"):
        language = binding.get("xml:lang")
        if language:
            return ox.Literal(value, language=language)
        datatype = binding.get("datatype")
        if datatype:
            return ox.Literal(value, datatype=ox.NamedNode(datatype))
        return ox.Literal(value)
    raise ValueError(f"unknown term type {kind!r}")


def parse_results(body: bytes, *, url: str) -> tuple[list[str], list[tuple[Term | None, ...]]]:
    """Variables and rows of a SPARQL JSON results document.

    Raises:
        EndpointError: the body is not a SPARQL JSON results document.
    """
    try:
        document = json.loads(body.decode("utf-8"))
        variables = list(document["head"]["vars"])
        rows = [
            tuple(_term(b[v]) if v in b else None for v in variables)
            for b in document["results"]["bindings"]
        ]
    except (UnicodeDecodeError, json.JSONDecodeError, KeyError, TypeError, ValueError) as exc:
        raise EndpointError(f"{url}: the answer is not SPARQL JSON results ({exc}).") from None
    return variables, rows


def _retry_after(header: str | None, fallback: float, cap: float) -> float:
    if not header:
        return fallback
    header = header.strip()
    if header.isdigit():
        return min(cap, float(header))
    when = email.utils.parsedate_to_datetime(header) if header else None
    if when is None:
        return fallback
    return min(cap, max(0.0, when.timestamp() - time.time()))


class SparqlEndpoint:
    """A client for one endpoint; ``sleep`` is injectable so tests need not wait."""

    def __init__(self, settings: EndpointSettings, *, sleep: Callable[[float], None] = time.sleep):
        parsed = urllib.parse.urlparse(settings.url)
        if parsed.scheme not in ("http", "https") or not parsed.netloc:
            raise EndpointError(f"{settings.url!r} is not an http(s) URL of a SPARQL endpoint.")
        self.settings = settings
        self._sleep = sleep
        self.requests = 0

    def _request(self, query: str) -> urllib.request.Request:
        url = self.settings.url
        headers = {"Accept": RESULTS_JSON, "User-Agent": "curator"}
        encoded = urllib.parse.urlencode({"query": query})
        if len(url) + len(encoded) + 1 <= self.settings.max_get_length:
            separator = "&" if "?" in url else "?"
            return urllib.request.Request(f"{url}{separator}{encoded}", headers=headers)
        headers["Content-Type"] = "application/x-www-form-urlencoded"
        return urllib.request.Request(url, data=encoded.encode("utf-8"), headers=headers)

    def select(self, query: str) -> tuple[list[str], list[tuple[Term | None, ...]]]:
        """Run a SELECT query; retries 429/503 and dropped connections with backoff.

        Raises:
            EndpointError: after the last retry, or at once for other 4xx/5xx answers.
        """
        url = self.settings.url
        delay = self.settings.backoff
        for attempt in range(self.settings.retries + 1):
            self.requests += 1
            try:
                with urllib.request.urlopen(
                    self._request(query), timeout=self.settings.timeout
                ) as answer:
                    body = answer.read()
                return parse_results(body, url=url)
            except urllib.error.HTTPError as exc:
                text = exc.read()[:300].decode("utf-8", errors="replace").strip()
                if exc.code in (429, 503) and attempt < self.settings.retries:
                    wait = _retry_after(
                        exc.headers.get("Retry-After"), delay, self.settings.max_retry_after
                    )
                    self._sleep(wait)
                    delay *= 2
                    continue
                what = "refused the query" if 400 <= exc.code < 500 else "failed"
                raise EndpointError(
                    f"{url}: the endpoint {what} (HTTP {exc.code} {exc.reason})"
                    + (f": {text}" if text else ".")
                ) from None
            except TimeoutError:
                raise EndpointError(
                    f"{url}: no answer within {self.settings.timeout:g} s; the endpoint may be "
                    "overloaded, or the query too heavy for it."
                ) from None
            except urllib.error.URLError as exc:
                if attempt < self.settings.retries and isinstance(exc.reason, ConnectionError):
                    self._sleep(delay)
                    delay *= 2
                    continue
                raise EndpointError(f"{url}: cannot reach the endpoint ({exc.reason}).") from None
            except ConnectionError as exc:
                if attempt < self.settings.retries:
                    self._sleep(delay)
                    delay *= 2
                    continue
                raise EndpointError(f"{url}: the connection broke ({exc}).") from None
        raise EndpointError(f"{url}: still busy after {self.settings.retries} retries.")


class EndpointCatalogue(Catalogue):
    """A catalogue read through a SPARQL endpoint instead of an embedded store."""

    def __init__(self, endpoint: SparqlEndpoint) -> None:
        super().__init__(store=None, sources=())  # type: ignore[arg-type]
        self.endpoint = endpoint
        self._count: int | None = None

    def select(self, query: str) -> Iterator[tuple[Term | None, ...]]:
        _variables, rows = self.endpoint.select(query)
        return iter(rows)

    @property
    def triple_count(self) -> int:
        if self._count is None:
            rows = list(self.select("SELECT (COUNT(*) AS ?n) WHERE { ?s ?p ?o }"))
            self._count = int(rows[0][0].value) if rows and rows[0][0] is not None else 0
        return self._count

    def __len__(self) -> int:
        return self.triple_count

"""Reading RDF files into an embedded store, all or nothing.

A curator's catalogue arrives as exported files in whatever RDF syntax their system writes. We
load every file into a fresh pyoxigraph store and only hand the store over once all of them have
parsed, so a broken file never replaces a good catalogue.
"""

from __future__ import annotations

import re
import xml.parsers.expat
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path

import pyoxigraph as ox

from curator.core.errors import CatalogueError, CatalogueSyntaxError
from curator.core.progress import Progress, silent

#: File endings we read, and the syntax each one means.
FORMATS_BY_SUFFIX: dict[str, ox.RdfFormat] = {
    ".ttl": ox.RdfFormat.TURTLE,
    ".turtle": ox.RdfFormat.TURTLE,
    ".nt": ox.RdfFormat.N_TRIPLES,
    ".ntriples": ox.RdfFormat.N_TRIPLES,
    ".nq": ox.RdfFormat.N_QUADS,
    ".nquads": ox.RdfFormat.N_QUADS,
    ".trig": ox.RdfFormat.TRIG,
    ".n3": ox.RdfFormat.N3,
    ".rdf": ox.RdfFormat.RDF_XML,
    ".owl": ox.RdfFormat.RDF_XML,
    ".xml": ox.RdfFormat.RDF_XML,
    ".jsonld": ox.RdfFormat.JSON_LD,
    ".json": ox.RdfFormat.JSON_LD,
}

#: Names a curator may give with ``--format``.
FORMATS_BY_NAME: dict[str, ox.RdfFormat] = {
    "turtle": ox.RdfFormat.TURTLE,
    "ttl": ox.RdfFormat.TURTLE,
    "ntriples": ox.RdfFormat.N_TRIPLES,
    "nt": ox.RdfFormat.N_TRIPLES,
    "nquads": ox.RdfFormat.N_QUADS,
    "nq": ox.RdfFormat.N_QUADS,
    "trig": ox.RdfFormat.TRIG,
    "n3": ox.RdfFormat.N3,
    "rdfxml": ox.RdfFormat.RDF_XML,
    "xml": ox.RdfFormat.RDF_XML,
    "jsonld": ox.RdfFormat.JSON_LD,
}

Term = ox.NamedNode | ox.BlankNode | ox.Literal

_BOM = b"\xef\xbb\xbf"


@dataclass(frozen=True)
class SourceFile:
    """One file that went into a catalogue, for the status bar and for cache keys."""

    path: Path
    format_name: str
    size: int
    triples: int


def format_for(path: Path, explicit: str | None = None) -> ox.RdfFormat:
    """The syntax of ``path``: the explicit name if given, else its file ending.

    Raises:
        CatalogueError: the name or the ending is not one we read.
    """
    if explicit is not None:
        key = explicit.lower().replace("-", "").replace("_", "").replace("/", "")
        if key not in FORMATS_BY_NAME:
            known = ", ".join(sorted(FORMATS_BY_NAME))
            raise CatalogueError(f"Unknown format {explicit!r}; use one of: {known}.")
        return FORMATS_BY_NAME[key]
    fmt = FORMATS_BY_SUFFIX.get(path.suffix.lower())
    if fmt is None:
        known = ", ".join(sorted(FORMATS_BY_SUFFIX))
        raise CatalogueError(
            f"{path}: cannot tell the RDF syntax from the ending {path.suffix!r}; "
            f"rename it to one of {known} or give the format explicitly."
        )
    return fmt


def expand_paths(paths: Sequence[Path]) -> list[Path]:
    """Files named directly, plus every RDF file below each named folder, in a stable order.

    Raises:
        CatalogueError: a path does not exist, or a folder holds no RDF file.
    """
    files: list[Path] = []
    for path in paths:
        if path.is_dir():
            found = sorted(
                p for p in path.rglob("*") if p.is_file() and p.suffix.lower() in FORMATS_BY_SUFFIX
            )
            if not found:
                raise CatalogueError(f"{path}: the folder holds no RDF file.")
            files.extend(found)
        elif path.is_file():
            files.append(path)
        else:
            raise CatalogueError(f"{path}: no such file or folder.")
    return files


def _position_of(data: bytes, index: int) -> tuple[int, int]:
    """1-based line and column of byte ``index`` (the column counts characters)."""
    line_start = data.rfind(b"\n", 0, index) + 1
    line = data.count(b"\n", 0, index) + 1
    column = len(data[line_start:index].decode("utf-8", errors="replace")) + 1
    return line, column


def _read_text_bytes(path: Path) -> bytes:
    """The file's bytes as UTF-8 without a byte-order mark.

    Raises:
        CatalogueSyntaxError: the bytes are not UTF-8, naming where the first bad byte sits.
    """
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise CatalogueError(f"{path}: cannot be read ({exc.strerror or exc}).") from exc
    if data.startswith(_BOM):
        data = data[len(_BOM):]
    bad = _first_non_utf8(data)
    if bad is not None:
        line, column = _position_of(data, bad)
        raise CatalogueSyntaxError(
            f"the file is not UTF-8 text (byte 0x{data[bad]:02x}); "
            "save it as UTF-8 and load it again",
            filename=str(path),
            lineno=line,
            offset=column,
        ) from None
    return data


_UTF8_CHUNK = 1 << 24


def _first_non_utf8(data: bytes) -> int | None:
    """Where the first byte that is not UTF-8 sits, or None when all of it is UTF-8.

    Checked a few megabytes at a time (cut between characters), so a large file is never
    held twice, once as bytes and once as text.
    """
    if data.isascii():
        return None
    view = memoryview(data)
    start = 0
    while start < len(data):
        end = min(len(data), start + _UTF8_CHUNK)
        cut = end
        while cut > start and cut < len(data) and 0x80 <= data[cut] < 0xC0:
            cut -= 1  # do not split a character
        end = cut if cut > start else end
        try:
            str(view[start:end], "utf-8")
        except UnicodeDecodeError as exc:
            return start + exc.start
        start = end
    return None


class Catalogue:
    """An RDF dataset held in an embedded pyoxigraph store, with the files it came from.

    Build one with :meth:`load` (files) or :meth:`from_text` (a string, for tests and tools).
    """

    def __init__(self, store: ox.Store, sources: Sequence[SourceFile] = ()) -> None:
        self.store = store
        self.sources: tuple[SourceFile, ...] = tuple(sources)
        self._triple_count: int | None = None

    @classmethod
    def load(
        cls,
        paths: Sequence[Path | str],
        *,
        format_name: str | None = None,
        progress: Progress | None = None,
    ) -> Catalogue:
        """Read every file (folders are searched) into one new store.

        Raises:
            CatalogueSyntaxError: a file is not valid in its syntax (with file, line and column).
            CatalogueError: a file is missing, unreadable, of an unknown kind, or all are empty.
            Cancelled: the progress token was cancelled; nothing is kept.
        """
        progress = progress or silent()
        files = expand_paths([Path(p) for p in paths])
        if not files:
            raise CatalogueError("No catalogue file was given.")
        total_bytes = sum(max(1, f.stat().st_size) for f in files)
        done_bytes = 0
        store = ox.Store()
        sources: list[SourceFile] = []
        count = 0  # the store's size, kept as we go: counting a large store takes a while
        for path in files:
            progress.report(f"Reading {path.name}", done_bytes / total_bytes)
            fmt = format_for(path, format_name)
            data = _read_text_bytes(path)
            before = count
            try:
                store.load(data, format=fmt, base_iri=path.resolve().as_uri())
            except SyntaxError as exc:
                error = _syntax_error(path, exc)
                if error.lineno is None and fmt == ox.RdfFormat.RDF_XML:
                    error = _xml_position(path, data, error)
                raise error from None
            except MemoryError as exc:
                raise CatalogueError(
                    f"{path}: too large for the parser to read in one piece ({exc}); a single "
                    "value over 16 MiB is the usual cause. Nothing was loaded."
                ) from None
            except (ValueError, OSError) as exc:
                raise CatalogueError(f"{path}: {exc}") from None
            count = len(store)
            sources.append(SourceFile(path, fmt.name, len(data), count - before))
            done_bytes += max(1, path.stat().st_size)
            del data
        progress.report("Catalogue read", 1.0)
        if count == 0:
            names = ", ".join(str(f) for f in files)
            raise CatalogueError(f"{names}: no statements found; the catalogue is empty.")
        catalogue = cls(store, sources)
        catalogue._triple_count = count
        return catalogue

    @classmethod
    def from_text(cls, text: str, format_name: str = "turtle") -> Catalogue:
        """A catalogue from RDF text, mainly for tests and small tools."""
        store = ox.Store()
        fmt = format_for(Path("inline"), format_name)
        try:
            store.load(text.encode("utf-8"), format=fmt, base_iri="urn:curator:inline:")
        except SyntaxError as exc:
            raise _syntax_error(Path("<text>"), exc) from None
        catalogue = cls(store, [SourceFile(Path("<text>"), fmt.name, len(text), len(store))])
        catalogue._triple_count = catalogue.sources[0].triples
        return catalogue

    @classmethod
    def from_store(
        cls, store: ox.Store, sources: Sequence[SourceFile], triple_count: int
    ) -> Catalogue:
        """A catalogue over a store read earlier (a cached copy), whose size is known."""
        catalogue = cls(store, sources)
        catalogue._triple_count = triple_count
        return catalogue

    def __len__(self) -> int:
        return self.triple_count

    @property
    def triple_count(self) -> int:
        """How many statements the store holds (counted once: a catalogue is not changed after
        it is read, and counting a large store takes a while)."""
        if self._triple_count is None:
            self._triple_count = len(self.store)
        return self._triple_count

    def triples(
        self,
        subject: ox.NamedNode | ox.BlankNode | None = None,
        predicate: ox.NamedNode | None = None,
        obj: Term | None = None,
    ) -> Iterator[ox.Quad]:
        """Statements matching a pattern (``None`` matches anything), in every graph, as
        :meth:`select` sees them: named graphs count as part of the catalogue, and a statement
        made in two graphs comes twice. They come in the order the store keeps them, which is
        the order a SPARQL query walks them in.

        Much faster than the same pattern as a SPARQL SELECT: no query to plan, no solution
        objects.
        """
        return self.store.quads_for_pattern(subject, predicate, obj, None)

    def select(self, query: str) -> Iterator[tuple[Term | None, ...]]:
        """Rows of a SPARQL SELECT as tuples of pyoxigraph terms (``None`` where unbound)."""
        # Named graphs (TriG, N-Quads) count as part of the catalogue, like the default graph.
        solutions = self.store.query(query, use_default_graph_as_union=True)
        variables = [v.value for v in solutions.variables]
        for solution in solutions:
            yield tuple(solution[v] for v in variables)


_POSITION_PREFIX = re.compile(r"^Parser error (?:at|between) line [\d\w ]*?: ")


def _xml_position(path: Path, data: bytes, error: CatalogueSyntaxError) -> CatalogueSyntaxError:
    """Where an RDF/XML file stops being well-formed XML, since the RDF parser does not say.

    expat is used without external entity loading, so this reads nothing but ``data``.
    """
    parser = xml.parsers.expat.ParserCreate()
    try:
        parser.Parse(data, True)
    except xml.parsers.expat.ExpatError as exc:
        return CatalogueSyntaxError(
            error.detail,
            filename=str(path),
            lineno=exc.lineno,
            offset=exc.offset + 1,
        )
    return error


def _syntax_error(path: Path, exc: SyntaxError) -> CatalogueSyntaxError:
    """Our error type from the parser's, keeping its position (said once, not twice)."""
    message = _POSITION_PREFIX.sub("", str(exc.msg or exc))
    return CatalogueSyntaxError(
        message,
        filename=str(path),
        lineno=exc.lineno,
        offset=exc.offset,
        end_lineno=getattr(exc, "end_lineno", None),
        end_offset=getattr(exc, "end_offset", None),
    )


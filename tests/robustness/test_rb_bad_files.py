"""Bad catalogue files through Catalogue.load and ``curator profile`` (exit 2, no traceback).

Reference for positions: pyoxigraph's own SyntaxError (tests/fixtures/bad/README.md) and, for
non-UTF-8 bytes, the byte offset we wrote ourselves.
"""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from curator.cli.main import main
from curator.core.catalogue import Catalogue
from curator.core.errors import CatalogueError, CatalogueSyntaxError, NoWorksError
from curator.services.workspace import open_catalogue

SCHEMA = "https://schema.org/"
GOOD_WORK = (
    "@prefix schema: <https://schema.org/> .\n"
    '<http://e/w> a schema:Book ; schema:name "Salt"@en .\n'
)


def run_cli(argv, capsys):
    code = main(argv)
    out = capsys.readouterr()
    return code, out.out, out.err


def assert_cli_refuses(path: Path, capsys) -> str:
    code, _out, err = run_cli(["profile", "--catalogue", str(path)], capsys)
    assert code == 2, err
    assert path.name in err
    assert "Traceback" not in err
    return err


# ----- Latin-1 -----------------------------------------------------------------------------


def latin1_file(tmp_path: Path) -> Path:
    path = tmp_path / "latin1.ttl"
    text = GOOD_WORK + '<http://e/w2> a schema:Book ; schema:name "Caf'
    data = text.encode("ascii") + b"\xe9" + b'"@fr .\n'
    path.write_bytes(data)
    return path


def test_latin1_bytes_give_the_line_and_column_of_the_bad_byte(tmp_path):
    path = latin1_file(tmp_path)
    with pytest.raises(CatalogueSyntaxError) as info:
        Catalogue.load([path])
    # Reference: the bad byte is on line 3, after the 60 ASCII characters we wrote before it.
    prefix = '<http://e/w2> a schema:Book ; schema:name "Caf'
    assert info.value.lineno == 3
    assert info.value.offset == len(prefix) + 1
    assert "0xe9" in str(info.value)


def test_latin1_bytes_through_the_cli(tmp_path, capsys):
    err = assert_cli_refuses(latin1_file(tmp_path), capsys)
    assert "line 3" in err


# ----- BOM, empty, big literal -----------------------------------------------------------


def test_utf8_bom_loads(tmp_path):
    path = tmp_path / "bom.ttl"
    path.write_bytes(b"\xef\xbb\xbf" + GOOD_WORK.encode())
    catalogue = Catalogue.load([path])
    assert catalogue.triple_count == 2  # reference: the two statements written


def test_empty_file_is_a_catalogue_error(tmp_path, capsys):
    path = tmp_path / "nothing.ttl"
    path.write_bytes(b"")
    with pytest.raises(CatalogueError, match="empty"):
        Catalogue.load([path])
    assert_cli_refuses(path, capsys)


def test_fifty_megabyte_literal_loads_or_errors_clearly(tmp_path):
    path = tmp_path / "huge.nt"
    size = 50 * 1024 * 1024
    with path.open("w", encoding="ascii") as handle:
        handle.write(
            f"<http://e/w> <http://www.w3.org/1999/02/22-rdf-syntax-ns#type> <{SCHEMA}Book> .\n"
        )
        handle.write(f'<http://e/w> <{SCHEMA}name> "Big" .\n')
        handle.write(f'<http://e/w> <{SCHEMA}description> "')
        chunk = "x" * (1 << 20)
        for _ in range(50):
            handle.write(chunk)
        handle.write('" .\n')
    start = time.perf_counter()
    try:
        catalogue = Catalogue.load([path])
    except CatalogueError as exc:
        assert path.name in str(exc)
    else:
        assert catalogue.triple_count == 3  # reference: the three lines written
        descriptions = [
            q.object.value
            for q in catalogue.triples(None, None, None)
            if q.predicate.value == SCHEMA + "description"
        ]
        assert len(descriptions) == 1 and len(descriptions[0]) == size
    assert time.perf_counter() - start < 60


# ----- a million triples and no works -------------------------------------------------------

NO_WORK_TRIPLES = 1_000_000


def test_a_million_triples_without_works_is_no_works_error(tmp_path):
    path = tmp_path / "noworks.nt"
    with path.open("w", encoding="ascii") as handle:
        for block in range(0, NO_WORK_TRIPLES, 100_000):
            handle.write(
                "".join(
                    f'<http://e/t{i % 1000}> <http://e/p{i % 7}> "v{i}" .\n'
                    for i in range(block, block + 100_000)
                )
            )
    start = time.perf_counter()
    with pytest.raises(NoWorksError):
        open_catalogue([path], languages=("en",))
    assert time.perf_counter() - start < 90

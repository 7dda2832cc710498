"""``curator cache info`` and ``curator cache clear`` end to end, in a separate process, on a
cache folder of the test's own (``CURATOR_CACHE_DIR``)."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from curator.cli.cache_commands import size_text
from curator.cli.main import main
from curator.core.cache import CatalogueCache

FIXTURES = Path(__file__).resolve().parents[1] / "fixtures"
REPO = Path(__file__).resolve().parents[2]


def curator(folder: Path, *args: str, no_cache: bool = False) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "CURATOR_CACHE_DIR": str(folder), "PYTHONIOENCODING": "utf-8"}
    env.pop("CURATOR_NO_CACHE", None)
    if no_cache:
        env["CURATOR_NO_CACHE"] = "1"
    return subprocess.run(
        [sys.executable, "-m", "curator.cli", *args],
        capture_output=True, text=True, timeout=120, cwd=REPO, check=False, env=env,
    )


def test_info_and_clear_end_to_end(tmp_path: Path) -> None:
    folder = tmp_path / "cache"
    empty = curator(folder, "cache", "info")
    assert empty.returncode == 0, empty.stderr
    assert str(folder) in empty.stdout
    assert "No saved catalogues." in empty.stdout

    catalogue = ["--catalogue", str(FIXTURES / "bibframe.ttl"), "--language", "en"]
    profile = curator(folder, "profile", *catalogue)
    assert profile.returncode == 0, profile.stderr  # the process waits for its copy to be saved

    info = curator(folder, "cache", "info")
    assert info.returncode == 0, info.stderr
    entries = CatalogueCache(folder).entries()
    assert len(entries) == 1
    assert entries[0].key[:12] in info.stdout
    assert "bibframe.ttl" in info.stdout  # the description says what it is
    assert size_text(entries[0].size) in info.stdout
    assert "Total: 1 of at most 6 entries" in info.stdout
    assert "last used 20" in info.stdout

    again = curator(folder, "profile", *catalogue)
    assert again.stdout == profile.stdout  # read back from the cache, the same profile

    cleared = curator(folder, "cache", "clear")
    assert cleared.returncode == 0, cleared.stderr
    assert "Removed 1 saved catalogue " in cleared.stdout
    assert f"freeing {size_text(entries[0].size)}" in cleared.stdout
    assert CatalogueCache(folder).entries() == []
    assert "No saved catalogues." in curator(folder, "cache", "info").stdout


def test_no_cache_variable_leaves_the_cache_alone(tmp_path: Path) -> None:
    folder = tmp_path / "cache"
    run = curator(
        folder, "profile", "--catalogue", str(FIXTURES / "bibframe.ttl"), no_cache=True
    )
    assert run.returncode == 0, run.stderr
    assert not folder.exists()


def test_cache_needs_an_action(capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit) as stopped:
        main(["cache"])
    assert stopped.value.code == 2
    assert "info" in capsys.readouterr().err


def test_clear_in_process_reports_what_was_kept(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    from curator.services.workspace import open_catalogue

    monkeypatch.setenv("CURATOR_CACHE_DIR", str(tmp_path / "cache"))
    workspace = open_catalogue([FIXTURES / "dcterms_skos.ttl"], languages=("en",))
    assert workspace.wait_for_cache()
    assert main(["cache", "clear"]) == 0
    out = capsys.readouterr().out
    assert "Removed 0 saved catalogues" in out
    assert "Kept 1 in use by an open window" in out


def test_endpoint_files_are_listed_cleared_and_pruned(tmp_path: Path, capsys) -> None:
    folder = tmp_path / "cache"
    folder.mkdir()
    profile = folder / "endpoint-profile-0123.toml"
    frequencies = folder / "endpoint-4567.json"
    profile.write_text("work_classes = []\n", encoding="utf-8")
    frequencies.write_text("{}", encoding="utf-8")
    cache = CatalogueCache(folder)
    assert cache.endpoint_files() == [frequencies, profile]
    # A week unused: pruned; a day old: kept.
    week = 8 * 24 * 3600
    os.utime(profile, (profile.stat().st_atime - week, profile.stat().st_mtime - week))
    cache.prune()
    assert cache.endpoint_files() == [frequencies]
    os.environ["CURATOR_CACHE_DIR"], saved = str(folder), os.environ["CURATOR_CACHE_DIR"]
    try:
        assert main(["cache", "info"]) == 0
        assert "1 endpoint file " in capsys.readouterr().out
        assert main(["cache", "clear"]) == 0
        assert "and 1 endpoint file," in capsys.readouterr().out
    finally:
        os.environ["CURATOR_CACHE_DIR"] = saved
    assert cache.endpoint_files() == []

"""The cache of opened catalogues: a reopened catalogue is the same workspace, a changed file is
not mistaken for the old one, damage is repaired, the limits hold and a cancelled open leaves
nothing behind."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import time
from pathlib import Path

import pytest

from curator.core.cache import CatalogueCache, source_key
from curator.core.errors import Cancelled
from curator.core.progress import Progress
from curator.core.suggest import SuggestSettings
from curator.services.browse import entity_details, work_details
from curator.services.suggestions import SuggestRequest, suggest
from curator.services.workspace import Workspace, demo_collection_path, open_catalogue

# The same as tests/conftest.py (a conftest is not importable as a module on every run).
TESTS = Path(__file__).resolve().parents[1]
FIXTURES = TESTS / "fixtures"
REPO = TESTS.parent
LANGUAGES = ("en",)


def demo_files() -> list[Path]:
    return sorted(demo_collection_path().glob("*.ttl"))


@pytest.fixture()
def cache(tmp_path: Path) -> CatalogueCache:
    return CatalogueCache(tmp_path / "cache", background=False)


def small_copy(tmp_path: Path, name: str = "dcterms_skos.ttl") -> Path:
    folder = tmp_path / "catalogue"
    folder.mkdir(exist_ok=True)
    return Path(shutil.copy(FIXTURES / name, folder / name))


def opened(paths: list[Path] | None, cache: CatalogueCache, **options: object) -> Workspace:
    workspace = open_catalogue(paths, languages=LANGUAGES, cache=cache, **options)  # type: ignore[arg-type]
    workspace.wait_for_cache()
    return workspace


def suggestions_of(workspace: Workspace, seed: str, mode: str) -> list[tuple[str, str, float]]:
    settings = SuggestSettings(mode=mode, limit=10)  # type: ignore[arg-type]
    result = suggest(workspace, SuggestRequest(seeds=(seed,), settings=settings))
    return [(s.iri, s.rationale, s.score) for s in result.suggestions]


def test_a_reopened_demo_is_the_same_workspace(cache: CatalogueCache) -> None:
    first = opened(None, cache)
    assert not first.from_cache
    assert cache.has(first.cache_key or "")
    again = opened(None, cache)
    assert again.from_cache
    assert again.cache_key == first.cache_key
    assert again.summary() == first.summary()
    assert again.profile == first.profile
    seeds = [first.index.records[i].iri for i in (0, 7, 42)]
    for mode in ("blend", "content", "graph", "shared-count"):
        for seed in seeds:
            assert suggestions_of(again, seed, mode) == suggestions_of(first, seed, mode)
    # What reads the store: a work's statements and a theme's works.
    work = first.index.works[3]
    assert work_details(again, work) == work_details(first, work)
    theme = next(f.value for f in first.index.features if not f.value.startswith('"'))
    assert entity_details(again, theme) == entity_details(first, theme)
    title = first.index.records[5].titles[0]
    assert again.finder.resolve(title) == first.finder.resolve(title)


def test_the_first_workspace_moves_onto_the_saved_store(cache: CatalogueCache) -> None:
    workspace = opened(None, cache)
    assert workspace.saver is not None and workspace.saver.published
    assert workspace.saver.hold is not None  # reads the entry's store now, and holds it
    assert len(workspace.catalogue.store) == workspace.catalogue.triple_count
    seed = workspace.index.records[1].iri
    assert suggestions_of(workspace, seed, "blend")


def test_changed_bytes_miss_and_a_touched_file_hits(tmp_path: Path, cache: CatalogueCache) -> None:
    path = small_copy(tmp_path)
    first = opened([path], cache)
    key = first.cache_key
    later = time.time() + 100
    os.utime(path, (later, later))
    touched = opened([path], cache)
    assert touched.from_cache and touched.cache_key == key
    path.write_bytes(path.read_bytes() + b"\n# one more comment\n")
    changed = opened([path], cache)
    assert not changed.from_cache
    assert changed.cache_key != key
    assert len(cache.entries()) == 2


def test_languages_format_and_profile_are_part_of_the_key(tmp_path: Path) -> None:
    path = small_copy(tmp_path)
    profile = tmp_path / "profile.toml"
    profile.write_text("version = 1\n", encoding="utf-8")
    keys = {
        source_key([path], format_name=None, profile_text=None, languages=("en",)),
        source_key([path], format_name=None, profile_text=None, languages=("fr", "en")),
        source_key([path], format_name="turtle", profile_text=None, languages=("en",)),
        source_key([path], format_name=None, profile_text="version = 1\n", languages=("en",)),
    }
    assert len(keys) == 4
    # The same bytes elsewhere resolve relative IRIs against another base: another key.
    other = tmp_path / "elsewhere" / path.name
    other.parent.mkdir()
    shutil.copy(path, other)
    assert source_key([other], format_name=None, profile_text=None) != source_key(
        [path], format_name=None, profile_text=None
    )


def test_a_corrupt_index_is_dropped_and_rebuilt(tmp_path: Path, cache: CatalogueCache) -> None:
    path = small_copy(tmp_path)
    first = opened([path], cache)
    key = first.cache_key or ""
    first.saver.hold.release()  # type: ignore[union-attr]
    pickled = cache.entry_folder(key) / "index.pickle"
    data = pickled.read_bytes()
    pickled.write_bytes(data[: len(data) // 2] + b"\x00garbage" * 10)
    rebuilt = opened([path], cache)
    assert not rebuilt.from_cache
    assert rebuilt.summary() == first.summary()
    assert cache.has(key)
    assert opened([path], cache).from_cache


def test_a_damaged_store_is_dropped_and_rebuilt(tmp_path: Path, cache: CatalogueCache) -> None:
    path = small_copy(tmp_path)
    first = opened([path], cache)
    key = first.cache_key or ""
    first.saver.hold.release()  # type: ignore[union-attr]
    shutil.rmtree(cache.store_path(key))
    (cache.store_path(key)).write_text("not a database", encoding="utf-8")
    rebuilt = opened([path], cache)
    assert not rebuilt.from_cache
    assert opened([path], cache).from_cache


def test_prune_keeps_the_newest_within_the_limits(tmp_path: Path) -> None:
    cache = CatalogueCache(tmp_path / "cache", max_entries=2, background=False)
    paths = [small_copy(tmp_path, name) for name in ("dcterms_skos.ttl", "bibframe.ttl")]
    third = tmp_path / "catalogue" / "third.ttl"
    third.write_bytes(paths[0].read_bytes() + b"\n# another catalogue\n")
    keys = []
    for path in [*paths, third]:
        workspace = opened([path], cache)
        workspace.saver.hold.release()  # type: ignore[union-attr]
        keys.append(workspace.cache_key)
        time.sleep(0.02)  # distinct last-use times
    assert [e.key for e in cache.entries()] == [keys[2], keys[1]]
    # A byte limit below two entries keeps only the newest.
    cache.max_bytes = cache.entries()[0].size + 1
    cache.prune()
    assert [e.key for e in cache.entries()] == [keys[2]]


def test_an_entry_in_use_is_not_pruned_or_cleared(tmp_path: Path) -> None:
    cache = CatalogueCache(tmp_path / "cache", max_entries=1, background=False)
    first = opened([small_copy(tmp_path, "dcterms_skos.ttl")], cache)
    second = opened([small_copy(tmp_path, "bibframe.ttl")], cache)
    assert {e.key for e in cache.entries()} == {first.cache_key, second.cache_key}
    freed, kept = cache.clear()
    assert {e.key for e in kept} == {first.cache_key, second.cache_key}
    assert freed == 0
    first.saver.hold.release()  # type: ignore[union-attr]
    second.saver.hold.release()  # type: ignore[union-attr]
    freed, kept = cache.clear()
    assert freed > 0 and kept == []
    assert cache.entries() == [] and cache.leftovers() == []


@pytest.mark.parametrize("stage", ["Reading", "Building features", "Building graph"])
def test_cancel_during_a_miss_leaves_no_entry(
    tmp_path: Path, cache: CatalogueCache, stage: str
) -> None:
    progress = Progress()
    progress.callback = lambda text, _f: progress.token.cancel() if text.startswith(stage) else None
    with pytest.raises(Cancelled):
        open_catalogue([small_copy(tmp_path)], languages=LANGUAGES, cache=cache, progress=progress)
    assert cache.entries() == []
    assert cache.leftovers() == []


def test_cancel_during_a_hit_keeps_the_entry(tmp_path: Path, cache: CatalogueCache) -> None:
    path = small_copy(tmp_path)
    opened([path], cache).saver.hold.release()  # type: ignore[union-attr]
    progress = Progress()
    progress.callback = lambda text, _f: progress.token.cancel() if "index" in text else None
    with pytest.raises(Cancelled):
        open_catalogue([path], languages=LANGUAGES, cache=cache, progress=progress)
    assert len(cache.entries()) == 1
    assert opened([path], cache).from_cache


def test_a_stopped_save_leaves_no_half_entry(tmp_path: Path) -> None:
    cache = CatalogueCache(tmp_path / "cache", background=True)
    workspace = open_catalogue(demo_files(), languages=LANGUAGES, cache=cache)
    assert workspace.saver is not None
    workspace.saver.stop()
    published = workspace.wait_for_cache(timeout=60)
    entries = cache.entries()
    assert len(entries) == (1 if published else 0)  # it may have finished before the stop
    assert cache.leftovers() == []


def test_no_cache_when_asked(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    folder = tmp_path / "default-cache"
    monkeypatch.setenv("CURATOR_CACHE_DIR", str(folder))
    path = small_copy(tmp_path)
    workspace = open_catalogue([path], languages=LANGUAGES, cache=False)
    assert workspace.cache_key is None and not workspace.wait_for_cache()
    monkeypatch.setenv("CURATOR_NO_CACHE", "1")
    open_catalogue([path], languages=LANGUAGES)
    assert not folder.exists()
    monkeypatch.delenv("CURATOR_NO_CACHE")
    opened([path], CatalogueCache(background=False))
    assert len(CatalogueCache().entries()) == 1  # the default cache follows the variable


def test_another_process_publishing_first_wins(tmp_path: Path, cache: CatalogueCache) -> None:
    building = cache.new_entry()
    (building / "store").mkdir()
    cache.commit(building, "k" * 32, "one")
    (cache.entry_folder("k" * 32) / "index.pickle").write_bytes(b"x")
    second = cache.new_entry()
    assert not cache.commit(second, "k" * 32, "two")
    assert not second.exists()
    assert [e.description for e in cache.entries()] == ["one"]


_OPEN_TWICE = """
import sys
from pathlib import Path
from curator.services.workspace import open_catalogue
workspace = open_catalogue([Path(sys.argv[1])], languages=("en",))
workspace.wait_for_cache()
print(workspace.from_cache, workspace.summary().works)
"""


def test_two_processes_opening_at_once_share_one_good_entry(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    folder = tmp_path / "shared-cache"
    monkeypatch.setenv("CURATOR_CACHE_DIR", str(folder))
    path = small_copy(tmp_path, "bibframe.ttl")
    env = {**os.environ, "PYTHONPATH": str(REPO)}
    runs = [
        subprocess.Popen(
            [sys.executable, "-c", _OPEN_TWICE, str(path)],
            env=env,
            stdout=subprocess.PIPE,
            text=True,
        )
        for _ in range(3)
    ]
    outputs = [run.communicate(timeout=120)[0].split() for run in runs]
    assert all(run.returncode == 0 for run in runs)
    assert len({works for _hit, works in outputs}) == 1
    cache = CatalogueCache(folder)
    assert len(cache.entries()) == 1
    assert cache.leftovers() == []
    # Two readers of the published entry at once, both read-only.
    both = [open_catalogue([path], languages=LANGUAGES) for _ in range(2)]
    assert all(w.from_cache for w in both)
    assert both[0].summary() == both[1].summary()

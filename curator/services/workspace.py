"""Opening a catalogue: files in, a ready index out, with progress and cancel.

This is the one place that strings the engine's steps together (read, profile, index), so the
window and the command line open catalogues the same way.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path

from curator.core.cache import (
    CachedOpening,
    CacheSaver,
    CatalogueCache,
    EntryHold,
    cache_disabled_by_environment,
    source_key,
)
from curator.core.catalogue import Catalogue, SourceFile, expand_paths
from curator.core.errors import CatalogueError
from curator.core.index import Index, build_index
from curator.core.profile import (
    Profile,
    detect_instance_links,
    detect_profile,
    detect_work_classes,
)
from curator.core.progress import Progress, silent
from curator.core.reading import CatalogueReader, paused_gc
from curator.core.suggest import Suggester
from curator.core.titles import TitleFinder

_DEMO_ENV = "CURATOR_DEMO_COLLECTION"


def demo_collection_path() -> Path:
    """The bundled demo collection (a folder of Turtle files).

    Raises:
        CatalogueError: the folder cannot be found (set CURATOR_DEMO_COLLECTION to it).
    """
    override = os.environ.get(_DEMO_ENV)
    candidates = [Path(override)] if override else []
    candidates.append(Path(__file__).resolve().parents[2] / "demo_collection")
    for candidate in candidates:
        if candidate.is_dir():
            return candidate
    raise CatalogueError(
        "The demo collection was not found; set CURATOR_DEMO_COLLECTION to its folder."
    )


def preferred_languages() -> tuple[str, ...]:
    """The curator's languages from the environment (LANGUAGE, LC_ALL, LANG), then English."""
    found: list[str] = []
    for variable in ("LANGUAGE", "LC_ALL", "LC_MESSAGES", "LANG"):
        for part in os.environ.get(variable, "").split(":"):
            code = part.split(".")[0].split("_")[0].lower()
            if code and code not in ("c", "posix") and code not in found:
                found.append(code)
    if "en" not in found:
        found.append("en")
    return tuple(found)


@dataclass(frozen=True)
class CatalogueSummary:
    """What the status bar says: how much is loaded and from where."""

    works: int
    triples: int
    files: tuple[str, ...]
    features: int
    graph_nodes: int

    def text(self) -> str:
        where = self.files[0] if len(self.files) == 1 else f"{len(self.files)} files"
        return (
            f"{self.works:,} works, {self.triples:,} triples from {where}; "
            f"index of {self.features:,} themes and {self.graph_nodes:,} linked things ready"
        )


@dataclass
class Workspace:
    """An open catalogue with its profile, index, suggester and title finder."""

    catalogue: Catalogue
    profile: Profile
    index: Index
    suggester: Suggester
    finder: TitleFinder
    #: The cache entry this workspace came from or is being saved as (None: not cached).
    cache_key: str | None = None
    #: Whether it was read back from the cache rather than from the files.
    from_cache: bool = False
    saver: CacheSaver | None = field(default=None, repr=False, compare=False)
    #: Keeps other processes from removing the cache entry whose store this one reads.
    cache_hold: EntryHold | None = field(default=None, repr=False, compare=False)

    def wait_for_cache(self, timeout: float | None = None) -> bool:
        """Wait for the copy for next time to be written; True when the cache now holds it."""
        if self.from_cache:
            return True
        return self.saver.wait(timeout) if self.saver is not None else False

    @property
    def sources(self) -> tuple[SourceFile, ...]:
        return self.catalogue.sources

    def summary(self) -> CatalogueSummary:
        return CatalogueSummary(
            works=self.index.size,
            triples=self.catalogue.triple_count,
            files=tuple(str(s.path) for s in self.sources),
            features=len(self.index.features),
            graph_nodes=self.index.graph.shape[0],
        )


def open_catalogue(
    paths: Sequence[Path | str] | None = None,
    *,
    profile_path: Path | None = None,
    languages: Sequence[str] | None = None,
    format_name: str | None = None,
    progress: Progress | None = None,
    cache: CatalogueCache | bool | None = None,
) -> Workspace:
    """Load files (the demo collection when ``paths`` is empty), profile them, index them.

    With a cache (the default, unless ``cache=False`` or ``CURATOR_NO_CACHE=1``), files whose
    content was opened before with the same profile and languages are read back from the
    cache instead; otherwise, once the workspace is ready, a copy is written for next time
    (in a thread when the cache says so; :meth:`Workspace.wait_for_cache` waits for it).

    Raises:
        CatalogueError, CatalogueSyntaxError: a file cannot be read.
        ProfileError, NoWorksError: the profile is bad, or nothing is a work.
        Cancelled: cancelled through ``progress``; nothing is kept, nothing is cached.
    """
    progress = progress or silent()
    chosen = list(paths) if paths else [demo_collection_path()]
    langs = tuple(languages) if languages else None
    chosen_cache = _chosen_cache(cache)
    key = None
    if chosen_cache is not None:
        progress.report("Looking for a saved copy", 0.0)
        key = _key_of(chosen, profile_path, langs or preferred_languages(), format_name)
    with paused_gc():
        if chosen_cache is not None and key is not None:
            cached = _open_cached(chosen_cache, key, chosen, progress)
            if cached is not None:
                return cached
        workspace = _open(chosen, profile_path, langs, format_name, progress)
    if chosen_cache is not None and key is not None:
        workspace.cache_key = key
        workspace.saver = CacheSaver(
            chosen_cache,
            key,
            workspace.catalogue,
            CachedOpening(workspace.index, workspace.sources, workspace.catalogue.triple_count),
            workspace.summary().text(),
        ).start()
    return workspace


def _chosen_cache(cache: CatalogueCache | bool | None) -> CatalogueCache | None:
    if isinstance(cache, CatalogueCache):
        return cache
    if cache is False or (cache is None and cache_disabled_by_environment()):
        return None
    return CatalogueCache()


def _key_of(
    chosen: Sequence[Path | str],
    profile_path: Path | None,
    languages: Sequence[str],
    format_name: str | None,
) -> str | None:
    """The cache key of what is asked for, or None when it cannot be told (then the files
    are read as usual, and reading them reports what is wrong)."""
    try:
        files = expand_paths([Path(p) for p in chosen])
        profile_text = Path(profile_path).read_text("utf-8") if profile_path else None
        return source_key(
            files, format_name=format_name, profile_text=profile_text, languages=languages
        )
    except (CatalogueError, OSError, UnicodeDecodeError):
        return None


def _open_cached(
    cache: CatalogueCache, key: str, chosen: Sequence[Path | str], progress: Progress
) -> Workspace | None:
    """The workspace saved under ``key``, or None when there is none or it is damaged."""
    if not cache.has(key):
        return None
    hold = cache.hold(key)
    if hold is None:
        return None
    store = payload = None
    ready = False
    try:
        progress.report("Opening the saved copy", 0.2)
        store = cache.open_store(key)
        if store is not None:
            progress.report("Reading the saved index", 0.4)
            payload = cache.load_index(key)
        if payload is not None:
            progress.report("Preparing suggestions", 0.8)
            ready = True
    finally:
        if not ready:  # missing, damaged, or cancelled: the entry is not ours to hold
            hold.release()
    if store is None or payload is None:
        return None
    files = expand_paths([Path(p) for p in chosen])
    sources = payload.sources
    if len(files) == len(sources):  # the same content may sit under another name now
        sources = tuple(replace(s, path=f) for s, f in zip(sources, files, strict=True))
    catalogue = Catalogue.from_store(store, sources, payload.triple_count)
    index = payload.index
    workspace = Workspace(
        catalogue,
        index.profile,
        index,
        Suggester(index),
        TitleFinder(index),
        cache_key=key,
        from_cache=True,
        cache_hold=hold,
    )
    progress.report("Catalogue ready", 1.0)
    return workspace


def _open(
    chosen: Sequence[Path | str],
    profile_path: Path | None,
    languages: Sequence[str] | None,
    format_name: str | None,
    progress: Progress,
) -> Workspace:
    catalogue = Catalogue.load(chosen, format_name=format_name, progress=progress.part(0.0, 0.4))
    langs = tuple(languages) if languages else preferred_languages()
    progress.report("Profiling the catalogue", 0.4)
    # One reader for profile and index: each kind of statement is read from the store once.
    reader = CatalogueReader(catalogue)
    types = reader.shared_types()
    if profile_path is not None:
        profile = Profile.load(profile_path)
        profile = replace(profile, languages=langs) if languages else profile
        statements = reader.work_statements(profile.work_classes, profile.instance_links)
    else:
        work_classes, notes = detect_work_classes(catalogue, reader=reader)
        links = detect_instance_links(catalogue, reader=reader)
        statements = reader.work_statements(work_classes, links, progress.part(0.4, 0.6))
        profile = detect_profile(
            catalogue,
            languages=langs,
            work_classes=work_classes,
            instance_links=links,
            statements=statements,
            types=types,
            reader=reader,
        )
        profile = replace(profile, notes=tuple(notes))
    index = build_index(
        catalogue,
        profile,
        statements=statements,
        types=types,
        progress=progress.part(0.6, 1.0),
        reader=reader,
    )
    return Workspace(catalogue, profile, index, Suggester(index), TitleFinder(index))

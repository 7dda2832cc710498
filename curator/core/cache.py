"""A cache of opened catalogues, so that reopening an unchanged one is quick.

An entry holds what opening produced: an on-disk pyoxigraph store of the triples and the pickled
index (matrix, graph, labels, profile). It is keyed by the *content* of the source files (a
SHA-256 of each file's bytes, with its syntax and the base IRI it is read with), the profile and
languages in force and the code that builds the index, so a changed file, profile or curator
opens afresh and nothing stale is used. Entries live in the platform's user cache folder; the
least recently used are removed when the cache grows past its limits, and ``curator cache
clear`` empties it.

Several processes may share the folder. An entry is built in a private ``.building-*`` folder
and published with one rename, which fails rather than overwrite an entry another process
published first; a published entry is never written again, so readers open its store read-only
and any number of them can have it open at once. Removing an entry renames it out of the way
first, so no process ever sees half of one.
"""

from __future__ import annotations

import contextlib
import hashlib
import itertools
import json
import os
import pickle
import shutil
import tempfile
import threading
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, fields
from pathlib import Path
from typing import IO

import pyoxigraph as ox

try:  # POSIX: entries in use are held with a shared lock that removal respects
    import fcntl
except ImportError:  # Windows, where open files cannot be removed anyway
    fcntl = None  # type: ignore[assignment]

from curator import __version__
from curator.core.catalogue import Catalogue, SourceFile
from curator.core.files import user_folder
from curator.core.index import Index
from curator.core.memory import return_freed_memory
from curator.core.profile import Profile

#: Bumped whenever the pickled payload changes shape.
INDEX_FORMAT = 3
DEFAULT_MAX_BYTES = 4 * 1024**3
DEFAULT_MAX_ENTRIES = 6
#: A ``.building-*`` folder this old belongs to a process that died while building.
STALE_BUILD_SECONDS = 6 * 3600
#: Files of endpoint mode (remote.py, services/endpoint.py) start so; removed when a week old.
ENDPOINT_FILE_PREFIX = "endpoint-"
ENDPOINT_FILE_SECONDS = 7 * 24 * 3600
#: Statements copied into the disk store per call: small enough that the copy, which holds
#: the interpreter lock, lets the window's thread in several times a second.
COPY_BATCH = 20_000
NO_CACHE_ENV = "CURATOR_NO_CACHE"
_CHUNK = 1 << 20
#: The modules whose code decides what an index holds; a change to any of them is a new key.
_ENGINE_MODULES = (
    "catalogue",
    "reading",
    "profile",
    "labels",
    "index",
    "similarity",
    "vocab",
    "cache",
)


def cache_folder() -> Path:
    """The user cache folder of curator (``CURATOR_CACHE_DIR`` overrides it)."""
    return user_folder("cache", "CURATOR_CACHE_DIR")


def cache_disabled_by_environment() -> bool:
    """``CURATOR_NO_CACHE`` set to anything but empty or 0 turns the cache off."""
    return os.environ.get(NO_CACHE_ENV, "").strip() not in ("", "0")


def file_digest(path: Path) -> str:
    digest = hashlib.sha256()
    with open(path, "rb") as handle:
        while chunk := handle.read(_CHUNK):
            digest.update(chunk)
    return digest.hexdigest()


_engine_digest: str | None = None


def engine_digest() -> str:
    """A digest of the engine's source, so an entry made by other code is never read back."""
    global _engine_digest
    if _engine_digest is None:
        digest = hashlib.sha256()
        core = Path(__file__).resolve().parent
        for name in _ENGINE_MODULES:
            with contextlib.suppress(OSError):
                digest.update((core / f"{name}.py").read_bytes())
        digest.update(" ".join(f.name for f in fields(Index)).encode())
        _engine_digest = digest.hexdigest()
    return _engine_digest


def source_key(
    files: Sequence[Path],
    *,
    format_name: str | None,
    profile_text: str | None,
    languages: Sequence[str] = (),
) -> str:
    """The cache key of a set of source files read with a given syntax, profile and languages.

    Each file counts with its bytes and the IRI relative references in it resolve against
    (its location), not its modification time: touching a file changes nothing.
    """
    digest = hashlib.sha256()
    digest.update(f"curator {__version__} index {INDEX_FORMAT} {engine_digest()}\n".encode())
    digest.update(f"format {format_name or 'by-extension'}\n".encode())
    digest.update(b"profile " + (profile_text or "detected").encode("utf-8") + b"\n")
    digest.update(f"languages {' '.join(languages)}\n".encode())
    for path in files:  # in the order they are loaded
        base = Path(path).resolve().as_uri()
        digest.update(f"{base} {path.suffix.lower()} {file_digest(path)}\n".encode())
    return digest.hexdigest()[:32]


@dataclass(frozen=True)
class CachedOpening:
    """What an entry gives back besides its store: the index, profile and source facts."""

    index: Index
    sources: tuple[SourceFile, ...]
    triple_count: int


@dataclass(frozen=True)
class CacheEntry:
    key: str
    folder: Path
    size: int
    last_used: float
    description: str


class CatalogueCache:
    """Entries in ``folder``: ``<key>/store/``, ``<key>/index.pickle`` and ``<key>/meta.json``.

    ``background`` says whether :func:`save_in_background` writes entries in a thread (the
    default: the catalogue is usable while its copy is written) or before returning.
    """

    def __init__(
        self,
        folder: Path | None = None,
        *,
        max_bytes: int = DEFAULT_MAX_BYTES,
        max_entries: int = DEFAULT_MAX_ENTRIES,
        background: bool = True,
    ) -> None:
        self.folder = Path(folder) if folder is not None else cache_folder()
        self.max_bytes = max_bytes
        self.max_entries = max_entries
        self.background = background

    def entry_folder(self, key: str) -> Path:
        return self.folder / key

    def has(self, key: str) -> bool:
        folder = self.entry_folder(key)
        return (folder / "meta.json").exists() and (folder / "index.pickle").exists()

    def hold(self, key: str) -> EntryHold | None:
        """A shared hold on an entry, kept while its store is open so that no other process
        removes it meanwhile; None when the entry is missing or being removed."""
        try:
            handle = open(self.entry_folder(key) / "meta.json", "rb")  # noqa: SIM115
        except OSError:
            return None
        if not _lock(handle, exclusive=False):
            handle.close()
            return None
        return EntryHold(handle)

    def load_index(self, key: str) -> CachedOpening | None:
        """The pickled payload of an entry, or None when missing or unreadable (then dropped)."""
        folder = self.entry_folder(key)
        if not self.has(key):
            return None
        try:
            with open(folder / "index.pickle", "rb") as handle:
                payload = _read_payload(handle)
        except Exception:  # any damage means the same: drop it and rebuild
            self.remove(key, force=True)
            return None
        self._touch(folder)
        return payload

    def open_store(self, key: str) -> ox.Store | None:
        """The entry's store, read-only (shared with other readers), or None (then dropped)."""
        try:
            return ox.Store.read_only(str(self.store_path(key)))
        except Exception:  # a store that does not open is as good as none
            self.remove(key, force=True)
            return None

    def store_path(self, key: str) -> Path:
        return self.entry_folder(key) / "store"

    def new_entry(self) -> Path:
        """A private folder to build an entry in; :meth:`commit` moves it into place."""
        self.folder.mkdir(parents=True, exist_ok=True)
        return Path(tempfile.mkdtemp(prefix=".building-", dir=self.folder))

    def write_index(self, building: Path, payload: CachedOpening) -> None:
        """Put the pickled index into an entry being built."""
        with open(building / "index.pickle", "wb") as handle:
            _write_payload(handle, payload)
            handle.flush()
            os.fsync(handle.fileno())

    def commit(self, building: Path, key: str, description: str) -> bool:
        """Publish an entry whose store and index are written, with one atomic rename.

        Returns False (and drops the build) when another process published the key first.
        """
        meta = {"key": key, "description": description, "created": time.time()}
        (building / "meta.json").write_text(json.dumps(meta), encoding="utf-8")
        target = self.entry_folder(key)
        if target.exists() and not self.has(key):
            self.remove(key, force=True)  # a broken leftover
        try:
            os.replace(building, target)  # fails if a whole entry is there already
        except OSError:
            self.abandon(building)
            return False
        self._touch(target)
        self.prune(keep=key)
        return True

    def abandon(self, building: Path) -> None:
        shutil.rmtree(building, ignore_errors=True)

    def remove(self, key: str, *, force: bool = False) -> bool:
        """Take an entry away: first out of sight with one rename, then off the disk.

        An entry some process holds (see :meth:`hold`) is left alone unless ``force`` (a
        damaged one, which nobody can be reading usefully). Returns whether it went.
        """
        folder = self.entry_folder(key)
        if not folder.exists():
            return True
        try:
            guard: IO[bytes] | None = open(folder / "meta.json", "rb")  # noqa: SIM115
        except OSError:
            guard = None
        try:
            if guard is not None and not _lock(guard, exclusive=True) and not force:
                return False
            doomed = self.folder / f".removing-{key}-{os.getpid()}-{time.monotonic_ns()}"
            try:
                os.replace(folder, doomed)
            except OSError:
                doomed = folder
            shutil.rmtree(doomed, ignore_errors=True)
            return True
        finally:
            if guard is not None:
                guard.close()

    def entries(self) -> list[CacheEntry]:
        """The published entries, most recently used first."""
        if not self.folder.is_dir():
            return []
        found = []
        for folder in self.folder.iterdir():
            meta_path = folder / "meta.json"
            if folder.name.startswith("."):
                continue
            try:
                meta = json.loads(meta_path.read_text(encoding="utf-8"))
                last_used = meta_path.stat().st_mtime
            except (OSError, json.JSONDecodeError):
                continue
            found.append(
                CacheEntry(
                    key=folder.name,
                    folder=folder,
                    size=_folder_size(folder),
                    last_used=last_used,
                    description=str(meta.get("description", "")),
                )
            )
        return sorted(found, key=lambda e: -e.last_used)

    def leftovers(self) -> list[Path]:
        """Folders that are not published entries: builds in progress or abandoned, removals."""
        if not self.folder.is_dir():
            return []
        return [
            p for p in self.folder.iterdir()
            if p.is_dir() and (p.name.startswith(".") or not (p / "meta.json").exists())
        ]

    def endpoint_files(self) -> list[Path]:
        """What endpoint mode keeps here: each endpoint's detected profile and frequencies
        (small files, renewed after a day)."""
        if not self.folder.is_dir():
            return []
        return sorted(
            p for p in self.folder.iterdir()
            if p.is_file() and p.name.startswith(ENDPOINT_FILE_PREFIX)
        )

    def prune(self, keep: str | None = None) -> list[str]:
        """Remove least recently used entries beyond the limits (never ``keep``), builds
        left behind by processes that died, and endpoint files not renewed for a week."""
        removed = []
        entries = self.entries()
        total = sum(e.size for e in entries)
        remaining = len(entries)
        for entry in reversed(entries):  # least recently used first
            if remaining <= self.max_entries and total <= self.max_bytes:
                break
            if entry.key == keep or not self.remove(entry.key):
                continue  # the newest, or in use by a window: the next prune will see
            total -= entry.size
            remaining -= 1
            removed.append(entry.key)
        now = time.time()
        for stale in self.leftovers():
            with contextlib.suppress(OSError):
                if stale.name.startswith(".removing-") or (
                    now - stale.stat().st_mtime > STALE_BUILD_SECONDS
                ):
                    shutil.rmtree(stale, ignore_errors=True)
        for old in self.endpoint_files():
            with contextlib.suppress(OSError):
                if now - old.stat().st_mtime > ENDPOINT_FILE_SECONDS:
                    old.unlink()
        return removed

    def clear(self) -> tuple[int, list[CacheEntry]]:
        """Remove every entry not in use and every leftover no process is building.

        Returns the bytes freed and the entries kept because a process has them open.
        """
        freed = 0
        kept = []
        for entry in self.entries():
            if self.remove(entry.key):
                freed += entry.size
            else:
                kept.append(entry)
        now = time.time()
        for stale in self.leftovers():
            with contextlib.suppress(OSError):
                if stale.name.startswith(".building-") and (
                    now - stale.stat().st_mtime < STALE_BUILD_SECONDS
                ):
                    continue  # another process may be writing it right now
                size = _folder_size(stale)
                shutil.rmtree(stale, ignore_errors=True)
                freed += size
        for file in self.endpoint_files():
            with contextlib.suppress(OSError):
                size = file.stat().st_size
                file.unlink()
                freed += size
        return freed, kept

    @staticmethod
    def _touch(folder: Path) -> None:
        with contextlib.suppress(OSError):
            os.utime(folder / "meta.json")


@dataclass
class EntryHold:
    """A shared lock on an entry's ``meta.json``, released with :meth:`release` or on exit."""

    handle: IO[bytes] | None

    def release(self) -> None:
        if self.handle is not None:
            self.handle.close()
            self.handle = None


def _lock(handle: IO[bytes], *, exclusive: bool) -> bool:
    """Take a lock on an open file without waiting; True when taken (always, without fcntl)."""
    if fcntl is None:
        return True
    try:
        mode = fcntl.LOCK_EX if exclusive else fcntl.LOCK_SH
        fcntl.flock(handle.fileno(), mode | fcntl.LOCK_NB)
    except OSError:
        return False
    return True


#: Items of a list or dict field per pickle (see :func:`_write_payload`).
PIECE = 10_000


def _write_payload(handle: IO[bytes], payload: CachedOpening) -> None:
    """A header, then each of the index's declared fields, a large list or dict in pieces.

    Each pickle has its own memo (an entry for every object written): in pieces it stays a few
    megabytes where one pickle of 100,000 records would need tens, and this runs while the
    catalogue's store is still in memory, in a thread whose allocations cannot reuse the
    main thread's free memory. Only declared fields are written, so a table that explanations
    add to the index later is neither saved nor read half-built.
    """
    index = payload.index
    names = [f.name for f in fields(Index)]
    header = {
        "format": INDEX_FORMAT,
        "fields": names,
        "sources": payload.sources,
        "triple_count": payload.triple_count,
    }
    pickle.dump(header, handle, protocol=5)
    for name in names:
        value = getattr(index, name)
        if isinstance(value, list | dict) and len(value) > PIECE:
            items = value if isinstance(value, list) else list(value.items())
            starts = range(0, len(items), PIECE)
            pickle.dump((type(value).__name__, len(starts)), handle, protocol=5)
            for start in starts:
                pickle.dump(items[start : start + PIECE], handle, protocol=5)
        else:
            pickle.dump(("whole", 1), handle, protocol=5)
            pickle.dump(value, handle, protocol=5)


def _read_field(handle: IO[bytes]) -> object:
    kind, pieces = pickle.load(handle)
    if kind == "whole":
        return pickle.load(handle)
    items: list = []
    for _ in range(pieces):
        items.extend(pickle.load(handle))
    if kind == "list":
        return items
    if kind == "dict":
        return dict(items)
    raise ValueError(f"unknown piece kind {kind!r}")


def _read_payload(handle: IO[bytes]) -> CachedOpening:
    header = pickle.load(handle)
    if not isinstance(header, dict) or header.get("format") != INDEX_FORMAT:
        raise ValueError("not a cache payload of this version")
    names = header["fields"]
    if names != [f.name for f in fields(Index)]:
        raise ValueError("the index has other fields now")
    values = {name: _read_field(handle) for name in names}
    if handle.read(1):
        raise ValueError("trailing bytes")
    sources = tuple(header["sources"])
    if not all(isinstance(s, SourceFile) for s in sources):
        raise ValueError("bad sources")
    index = Index(**values)
    if not isinstance(index.profile, Profile) or len(index.records) != len(index.works):
        raise ValueError("inconsistent index")
    return CachedOpening(index=index, sources=sources, triple_count=int(header["triple_count"]))


def copy_store(source: ox.Store, target: Path, stop: Callable[[], bool]) -> None:
    """Copy every quad of ``source`` into a new on-disk store at ``target``, then compact it.

    Batched bulk loads keep memory flat (one batch of quads at a time, where one bulk load of
    everything doubles the process's peak) and compaction makes later scans several times
    quicker. Stops with :class:`InterruptedError` when ``stop()`` says so.
    """
    store = ox.Store(str(target))
    try:
        quads = iter(source.quads_for_pattern(None, None, None, None))
        while batch := list(itertools.islice(quads, COPY_BATCH)):
            if stop():
                raise InterruptedError("stopped")
            store.bulk_extend(batch)
        if stop():
            raise InterruptedError("stopped")
        store.flush()
        store.optimize()
    finally:
        del store  # closes the database before its folder is renamed


class CacheSaver:
    """Writes one entry, in a thread or at once; ``wait`` says whether it was published.

    Once the entry is published the catalogue is moved onto the entry's store on disk, which
    frees the copy in memory (about half a kilobyte a statement): the same statements, a
    little slower to scan, and the process is as lean as one that opened from the cache.
    """

    def __init__(
        self,
        cache: CatalogueCache,
        key: str,
        catalogue: Catalogue,
        payload: CachedOpening,
        description: str,
    ) -> None:
        self.cache = cache
        self.key = key
        self.error: BaseException | None = None
        self.published = False
        #: The shared hold on the published entry while the catalogue reads its store.
        self.hold: EntryHold | None = None
        self._stop = threading.Event()
        self._thread: threading.Thread | None = None
        self._job: tuple[Catalogue, CachedOpening, str] | None = (catalogue, payload, description)

    def start(self) -> CacheSaver:
        if self.cache.background:
            # Not a daemon: a command that finishes first waits for the entry at exit.
            self._thread = threading.Thread(target=self._run, name="curator-cache", daemon=False)
            self._thread.start()
        else:
            self._run()
        return self

    def stop(self) -> None:
        """Give up writing (the half-written build is removed)."""
        self._stop.set()

    def wait(self, timeout: float | None = None) -> bool:
        if self._thread is not None:
            self._thread.join(timeout)
        return self.published

    @property
    def running(self) -> bool:
        return self._thread is not None and self._thread.is_alive()

    def _run(self) -> None:
        assert self._job is not None
        catalogue, payload, description = self._job
        self._job = None
        building: Path | None = None
        try:
            # Hand back what indexing freed (glibc keeps it) before this thread, with an arena
            # of its own that cannot reuse it, asks for more.
            return_freed_memory(collect=True)
            building = self.cache.new_entry()
            self.cache.write_index(building, payload)
            del payload
            copy_store(catalogue.store, building / "store", self._stop.is_set)
            self.published = self.cache.commit(building, self.key, description)
            building = None
            if self.published or self.cache.has(self.key):
                self._move_onto_disk(catalogue)
        except BaseException as exc:  # a failed copy only costs the next open its speed
            self.error = exc
            if building is not None:
                self.cache.abandon(building)

    def _move_onto_disk(self, catalogue: Catalogue) -> None:
        hold = self.cache.hold(self.key)
        if hold is None:
            return
        store = self.cache.open_store(self.key)
        if store is None:
            hold.release()
            return
        self.hold = hold
        catalogue.store = store  # readers in flight keep the store they started with
        return_freed_memory(collect=True)


def _folder_size(folder: Path) -> int:
    total = 0
    for root, _dirs, files in os.walk(folder):
        for name in files:
            with contextlib.suppress(OSError):
                total += os.path.getsize(os.path.join(root, name))
    return total

"""A cache of opened catalogues, so that reopening an unchanged one is quick.

An entry holds what opening produced: an on-disk pyoxigraph store of the triples and the pickled
index (matrix, graph, labels, profile). It is keyed by the *content* of the source files (a
SHA-256 of each file's bytes, with its syntax), the profile in force and the versions of curator
and its index format, so a changed file, profile or curator opens afresh and nothing stale is
used. Entries live in the platform's user cache folder; the least recently used are removed when
the cache grows past its limits, and ``curator cache clear`` empties it.
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
import pickle
import shutil
import tempfile
import time
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from curator import __version__
from curator.core.files import user_folder

#: Bumped whenever the pickled index changes shape.
INDEX_FORMAT = 1
DEFAULT_MAX_BYTES = 4 * 1024**3
DEFAULT_MAX_ENTRIES = 6
_CHUNK = 1 << 20


def cache_folder() -> Path:
    """The user cache folder of curator (``CURATOR_CACHE_DIR`` overrides it)."""
    return user_folder("cache", "CURATOR_CACHE_DIR")

def file_digest(path: Path) -> str:
    digest = hashlib.sha256()
    with open(path, "rb") as handle:
        while chunk := handle.read(_CHUNK):
            digest.update(chunk)
    return digest.hexdigest()


def source_key(files: Sequence[Path], *, format_name: str | None, profile_text: str | None) -> str:
    """The cache key of a set of source files read with a given syntax and profile."""
    digest = hashlib.sha256()
    digest.update(f"curator {__version__} index {INDEX_FORMAT}\n".encode())
    digest.update(f"format {format_name or 'by-extension'}\n".encode())
    digest.update(b"profile " + (profile_text or "detected").encode("utf-8") + b"\n")
    for path in sorted(files, key=lambda p: str(p)):
        digest.update(f"{path.suffix.lower()} {file_digest(path)}\n".encode())
    return digest.hexdigest()[:32]


@dataclass(frozen=True)
class CacheEntry:
    key: str
    folder: Path
    size: int
    last_used: float
    description: str


class CatalogueCache:
    """Entries in ``folder``: ``<key>/store/``, ``<key>/index.pickle`` and ``<key>/meta.json``."""

    def __init__(
        self,
        folder: Path | None = None,
        *,
        max_bytes: int = DEFAULT_MAX_BYTES,
        max_entries: int = DEFAULT_MAX_ENTRIES,
    ) -> None:
        self.folder = Path(folder) if folder is not None else cache_folder()
        self.max_bytes = max_bytes
        self.max_entries = max_entries

    def entry_folder(self, key: str) -> Path:
        return self.folder / key

    def has(self, key: str) -> bool:
        folder = self.entry_folder(key)
        return (folder / "meta.json").exists() and (folder / "index.pickle").exists()

    def load_index(self, key: str) -> object | None:
        """The pickled index of an entry, or None when missing or unreadable (then dropped)."""
        folder = self.entry_folder(key)
        try:
            with open(folder / "index.pickle", "rb") as handle:
                index = pickle.load(handle)
        except (OSError, pickle.UnpicklingError, EOFError, AttributeError, ImportError):
            self.remove(key)
            return None
        self._touch(folder)
        return index

    def store_path(self, key: str) -> Path:
        return self.entry_folder(key) / "store"

    def new_entry(self) -> Path:
        """A private folder to build an entry in; :meth:`commit` moves it into place."""
        self.folder.mkdir(parents=True, exist_ok=True)
        return Path(tempfile.mkdtemp(prefix=".building-", dir=self.folder))

    def commit(self, building: Path, key: str, index: object, description: str) -> None:
        """Write the index next to the store being built and publish the entry atomically."""
        with open(building / "index.pickle", "wb") as handle:
            pickle.dump(index, handle, protocol=pickle.HIGHEST_PROTOCOL)
        meta = {"key": key, "description": description, "created": time.time()}
        (building / "meta.json").write_text(json.dumps(meta), encoding="utf-8")
        target = self.entry_folder(key)
        if target.exists():
            shutil.rmtree(target, ignore_errors=True)
        os.replace(building, target)
        self._touch(target)
        self.prune(keep=key)

    def abandon(self, building: Path) -> None:
        shutil.rmtree(building, ignore_errors=True)

    def remove(self, key: str) -> None:
        shutil.rmtree(self.entry_folder(key), ignore_errors=True)

    def entries(self) -> list[CacheEntry]:
        if not self.folder.is_dir():
            return []
        found = []
        for folder in self.folder.iterdir():
            meta_path = folder / "meta.json"
            if folder.name.startswith(".") or not meta_path.exists():
                continue
            try:
                meta = json.loads(meta_path.read_text(encoding="utf-8"))
            except (OSError, json.JSONDecodeError):
                meta = {}
            found.append(
                CacheEntry(
                    key=folder.name,
                    folder=folder,
                    size=_folder_size(folder),
                    last_used=meta_path.stat().st_mtime,
                    description=str(meta.get("description", "")),
                )
            )
        return sorted(found, key=lambda e: -e.last_used)

    def prune(self, keep: str | None = None) -> list[str]:
        """Remove least recently used entries beyond the limits (never ``keep``)."""
        removed = []
        entries = self.entries()
        total = sum(e.size for e in entries)
        for position, entry in enumerate(reversed(entries)):
            remaining = len(entries) - position
            if entry.key == keep:
                continue
            if remaining <= self.max_entries and total <= self.max_bytes:
                break
            self.remove(entry.key)
            total -= entry.size
            removed.append(entry.key)
        for stale in self.folder.glob(".building-*") if self.folder.is_dir() else ():
            if time.time() - stale.stat().st_mtime > 24 * 3600:
                shutil.rmtree(stale, ignore_errors=True)
        return removed

    def clear(self) -> int:
        """Remove every entry; returns the bytes freed."""
        freed = 0
        for entry in self.entries():
            freed += entry.size
            self.remove(entry.key)
        return freed

    @staticmethod
    def _touch(folder: Path) -> None:
        with contextlib.suppress(OSError):
            os.utime(folder / "meta.json")


def _folder_size(folder: Path) -> int:
    total = 0
    for root, _dirs, files in os.walk(folder):
        for name in files:
            with contextlib.suppress(OSError):
                total += os.path.getsize(os.path.join(root, name))
    return total

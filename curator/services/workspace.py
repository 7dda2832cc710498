"""Opening a catalogue: files in, a ready index out, with progress and cancel.

This is the one place that strings the engine's steps together (read, profile, index), so the
window and the command line open catalogues the same way.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass, replace
from pathlib import Path

from curator.core.catalogue import Catalogue, SourceFile
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
) -> Workspace:
    """Load files (the demo collection when ``paths`` is empty), profile them, index them.

    Raises:
        CatalogueError, CatalogueSyntaxError: a file cannot be read.
        ProfileError, NoWorksError: the profile is bad, or nothing is a work.
        Cancelled: cancelled through ``progress``; nothing is kept.
    """
    progress = progress or silent()
    chosen = list(paths) if paths else [demo_collection_path()]
    with paused_gc():
        return _open(chosen, profile_path, languages, format_name, progress)


def _open(
    chosen: list[Path | str],
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

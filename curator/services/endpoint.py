"""A SPARQL endpoint as the catalogue, for the command line and the window.

:func:`open_endpoint` detects the profile by aggregate queries and fetches the frequencies once;
:class:`EndpointWorkspace` then resolves titles, searches and suggests through SPARQL, each
suggestion over a neighbourhood of the seeds indexed locally (see :mod:`curator.core.remote`).
"""

from __future__ import annotations

import contextlib
import hashlib
import itertools
import re
import time
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path

import pyoxigraph as ox

from curator.core.endpoint import EndpointError, EndpointSettings, SparqlEndpoint, sparql_string
from curator.core.errors import CuratorError, SeedError, SettingsError
from curator.core.files import user_folder, write_text_atomically
from curator.core.index import Index, WorkRecord
from curator.core.labels import fold
from curator.core.profile import Profile
from curator.core.progress import Progress, silent
from curator.core.reading import iri_list, sparql_iri
from curator.core.remote import (
    DEFAULT_CANDIDATES,
    FREQUENCIES_MAX_AGE,
    Frequencies,
    NeighbourhoodSuggester,
    candidate_query,
    detect_profile_remote,
    frequencies_for,
    neighbour_query,
    neighbourhood,
    one_of,
    run_candidates,
    seed_weights,
    shared_count_query,
)
from curator.core.suggest import SuggestionResult
from curator.core.titles import TitleFinder, TitleMatch
from curator.services.suggestions import SuggestRequest
from curator.services.workspace import preferred_languages

#: Works whose titles contain a typed word, fetched to resolve or search a title among.
TITLE_CANDIDATES = 60
_IRI_LIKE = re.compile(r"^<?[A-Za-z][A-Za-z0-9+.-]*:[^\s<>]+>?$")


@dataclass
class SuggestionStats:
    """What one suggestion cost: queries, works described, seconds."""

    queries: int
    works: int
    seconds: float


@dataclass
class EndpointWorkspace:
    """An endpoint with its profile and frequencies.

    ``index`` and ``finder`` are those of the neighbourhood of the latest suggestion (records and
    labels of what it returned), so a front end can show a result the way it shows an embedded
    one.
    """

    endpoint: SparqlEndpoint
    profile: Profile
    frequencies: Frequencies
    candidates: int = DEFAULT_CANDIDATES
    index: Index | None = None
    finder: TitleFinder | None = None
    last: SuggestionStats | None = None
    _resolved: dict[str, str] = field(default_factory=dict)
    _class_counts: dict[str, int] | None = None

    @property
    def url(self) -> str:
        return self.endpoint.settings.url

    def summary_text(self) -> str:
        return (
            f"{self.frequencies.n_works:,} works, {self.frequencies.triples:,} triples at "
            f"{self.url} (endpoint mode: {self.candidates} candidates per suggestion)"
        )

    def class_counts(self) -> dict[str, int]:
        """Works of each work class (asked once)."""
        if self._class_counts is None:
            classes = iri_list(self.profile.work_classes)
            rows = self.endpoint.select(
                f"SELECT ?c (COUNT(DISTINCT ?w) AS ?n) WHERE {{ VALUES ?c {{ {classes} }} "
                "?w a ?c } GROUP BY ?c"
            )[1]
            self._class_counts = {
                c.value: int(n.value) for c, n in rows if c is not None and n is not None
            }
        return self._class_counts

    # ----- titles ----------------------------------------------------------------------

    def _title_works(self, text: str) -> list[str]:
        """Works with a label containing one of the typed words (case-insensitive; accents as
        typed and folded), for resolving the title among them."""
        words = sorted(
            {w for w in (*text.lower().split(), *fold(text).split()) if len(w) >= 3},
            key=lambda w: (-len(w), w),
        )[:4] or [text.strip().lower()]
        # Works by the length of the typed words their label contains: the longest words are
        # the telling ones ("gullstane" rather than "the").
        hits = " + ".join(
            f"IF(CONTAINS(LCASE(STR(?l)), {sparql_string(w)}), {len(w)}, 0)" for w in words
        )
        labels = iri_list(p for p in self.profile.label_properties if " " not in p)
        classes = iri_list(self.profile.work_classes)
        rows = self.endpoint.select(
            f"SELECT ?w (MAX(?hits) AS ?best) WHERE {{ VALUES ?lp {{ {labels} }} ?w ?lp ?l . "
            f"FILTER(isLiteral(?l)) BIND(({hits}) AS ?hits) FILTER(?hits > 0) "
            f"FILTER EXISTS {{ VALUES ?wc {{ {classes} }} ?w a ?wc }} }} "
            f"GROUP BY ?w ORDER BY DESC(?best) ?w LIMIT {TITLE_CANDIDATES}"
        )[1]
        return [w.value for (w, _best) in rows if isinstance(w, ox.NamedNode)]

    def _finder(self, works: Sequence[str], progress: Progress | None = None) -> TitleFinder:
        found = neighbourhood(
            self.endpoint, self.profile, self.frequencies, works, progress=progress
        )
        return TitleFinder(found.index)

    def _kind_of(self, iri: str) -> str | None:
        """'work', 'other' (in the catalogue, not a work) or None (unknown)."""
        rows = self.endpoint.select(
            f"SELECT ?c WHERE {{ {{ <{iri}> a ?c }} UNION "
            f"{{ <{iri}> ?p ?o BIND(<urn:x> AS ?c) }} }} LIMIT 50"
        )[1]
        classes = {c.value for (c,) in rows if c is not None}
        if not classes:
            return None
        return "work" if classes & set(self.profile.work_classes) else "other"

    def resolve(self, text: str) -> str:
        """The IRI of the one work ``text`` names (an IRI or a title), as in embedded mode.

        Raises:
            SeedError: nothing matches, several works match equally, or the IRI is not a work.
        """
        stripped = text.strip()
        if stripped in self._resolved:
            return self._resolved[stripped]
        if not stripped:
            raise SeedError("A seed is empty; give a title or an IRI.")
        iri = stripped[1:-1] if stripped.startswith("<") and stripped.endswith(">") else stripped
        if _IRI_LIKE.match(stripped) and ("://" in iri or iri.startswith("urn:")):
            try:
                kind = self._kind_of(_checked(iri))
            except ValueError:
                kind = None
            if kind == "work":
                self._resolved[stripped] = iri
                return iri
            if kind == "other":
                raise SeedError(
                    f"<{iri}> is in the catalogue but is not a work; seeds must be works. "
                    "To start from a theme or a creator, pick one of its works."
                )
            raise SeedError(f"<{iri}> is not in this catalogue.")
        finder = self._finder(self._title_works(stripped))
        position = finder.resolve(stripped)
        found = finder.index.works[position]
        self._resolved[stripped] = found
        return found

    def search(
        self, text: str, limit: int = 20, progress: Progress | None = None
    ) -> list[tuple[TitleMatch, WorkRecord]]:
        """Works whose titles start with, contain or resemble ``text``, best first, with their
        records (positions are those of a small index of the matches)."""
        return self.search_labelled(text, limit, progress)[0]

    def search_labelled(
        self, text: str, limit: int = 20, progress: Progress | None = None
    ) -> tuple[list[tuple[TitleMatch, WorkRecord]], Index | None]:
        """As :meth:`search`, with the small index of the matches, which labels their creators
        and kinds (so a search popup can tell namesakes apart).

        ``progress`` is checked between the queries, so a search overtaken by newer typing
        stops early (raising :class:`~curator.core.errors.Cancelled`).
        """
        if not fold(text):
            return [], None
        progress = progress or silent()
        progress.report("Searching the titles", 0.0)
        works = self._title_works(text)
        progress.report("Describing the matches", 0.3)
        finder = self._finder(works, progress.part(0.3, 1.0))
        found = [(m, finder.index.records[m.position]) for m in finder.search(text, limit)]
        return found, finder.index

    def works_among(self, iris: Sequence[str]) -> set[str]:
        """Which of ``iris`` are works of the endpoint, asked in a few queries rather than one
        per IRI (a saved list may hold works the endpoint lacks). Found ones are remembered, so
        :meth:`resolve` does not ask again."""
        found = {i for i in iris if self._resolved.get(i) == i}
        usable: list[str] = []
        for iri in dict.fromkeys(iris):
            if iri in found:
                continue
            try:
                usable.append(_checked(iri))
            except SeedError:
                continue  # not an IRI at all: certainly not a work here
        kinds = one_of("?c", self.profile.work_classes)
        for start in range(0, len(usable), 100):
            values = iri_list(usable[start : start + 100])
            rows = self.endpoint.select(
                f"SELECT DISTINCT ?w WHERE {{ VALUES ?w {{ {values} }} ?w a ?c . {kinds} }}"
            )[1]
            for (work,) in rows:
                if isinstance(work, ox.NamedNode):
                    found.add(work.value)
                    self._resolved[work.value] = work.value
        return found

    def describe_works(self, iris: Sequence[str]) -> Index:
        """An index of just these works (their records, themes and labels), with the
        endpoint's global frequencies: enough to audit or export a list."""
        return neighbourhood(self.endpoint, self.profile, self.frequencies, list(iris)).index

    def details(self, iri: str, progress: Progress | None = None) -> tuple[WorkRecord, Index]:
        """A work's record and an index that labels what it points at (``progress`` is checked
        between the queries).

        Raises:
            SeedError: ``iri`` is not a work of the catalogue.
            Cancelled: cancelled through ``progress``.
        """
        found = neighbourhood(
            self.endpoint, self.profile, self.frequencies, [_checked(iri)], progress=progress
        )
        if iri not in found.index.position:
            raise SeedError(f"<{iri}> is not a work of this catalogue.")
        return found.index.record(iri), found.index

    # ----- suggestions -----------------------------------------------------------------

    def suggest(
        self, request: SuggestRequest, progress: Progress | None = None
    ) -> SuggestionResult:
        """Resolve every name, let the endpoint pick candidates, suggest among them.

        Raises:
            SeedError, SettingsError: as :func:`curator.services.suggestions.suggest`.
            EndpointError: the endpoint failed.
            Cancelled: cancelled through ``progress``.
        """
        progress = progress or silent()
        started, before = time.monotonic(), self.endpoint.requests
        settings = request.settings.checked()
        progress.report("Finding the seeds", 0.0)
        seeds = list(dict.fromkeys(self.resolve(s) for s in request.seeds))
        if not seeds:
            raise SettingsError("Give at least one seed work.")
        list_items = [self.resolve(s) for s in request.list_items]
        dismissed = [self.resolve(s) for s in request.dismissed]
        context = list(dict.fromkeys([*seeds, *list_items, *dismissed]))
        progress.report("Reading the seeds", 0.1)
        known = neighbourhood(
            self.endpoint, self.profile, self.frequencies, context, progress=progress.part(0.1, 0.3)
        )
        positions = [known.index.position[s] for s in seeds]
        wanted = self.candidates + len(context)
        progress.report("Asking the endpoint for candidates", 0.3)
        if settings.mode == "shared-count":
            prop = settings.shared_property or NeighbourhoodSuggester(
                known.index, known.degree
            ).default_shared_property()
            counts: dict[ox.NamedNode | ox.Literal, int] = {}
            for seed in seeds:
                for quad in known.catalogue.triples(ox.NamedNode(seed), ox.NamedNode(prop), None):
                    if not isinstance(quad.object, ox.BlankNode):
                        counts[quad.object] = counts.get(quad.object, 0) + 1  # type: ignore[index]
            query = shared_count_query(self.profile, prop, counts, wanted) if counts else None
        else:
            weights = seed_weights(known.index, positions)
            query = candidate_query(self.profile, weights, wanted) if weights else None
        found = run_candidates(self.endpoint, query) if query else []
        excluded = set(context)
        chosen = [w for w, _score in found if w not in excluded][: self.candidates]
        if settings.mode != "shared-count":
            near = neighbour_query(self.profile, seeds, self.candidates)
            if near:
                rows = self.endpoint.select(near)[1]
                chosen += [w.value for (w,) in rows if isinstance(w, ox.NamedNode)]
        progress.report("Describing the candidates", 0.4)
        works = list(dict.fromkeys([*context, *chosen]))
        around = neighbourhood(
            self.endpoint, self.profile, self.frequencies, works, progress=progress.part(0.4, 0.9)
        )
        index = around.index
        suggester = NeighbourhoodSuggester(index, around.degree)
        if settings.mode == "shared-count" and settings.shared_property:
            prop = settings.shared_property
            if not any(f.path == prop for f in index.features):
                from curator.core.baseline import property_incidence

                suggester.set_incidence(prop, property_incidence(around.catalogue, index, prop))
        progress.report("Suggesting", 0.9)
        result = suggester.suggest(
            [index.position[s] for s in seeds],
            settings,
            list_items=[index.position[i] for i in list_items if i in index.position],
            dismissed=[index.position[i] for i in dismissed if i in index.position],
        )
        self.index, self.finder = index, TitleFinder(index)
        self.last = SuggestionStats(
            queries=self.endpoint.requests - before,
            works=index.size,
            seconds=time.monotonic() - started,
        )
        progress.report("Suggestions ready", 1.0)
        return result


def _checked(iri: str) -> str:
    try:
        return sparql_iri(iri)
    except ValueError:
        raise SeedError(f"{iri!r} is not a usable IRI.") from None


#: Longest wait for one of the aggregate queries made when opening an endpoint.
SURVEY_TIMEOUT = 600.0


def open_endpoint(
    url: str,
    *,
    languages: Sequence[str] | None = None,
    profile_path: Path | None = None,
    timeout: float = 30.0,
    survey_timeout: float = SURVEY_TIMEOUT,
    candidates: int = DEFAULT_CANDIDATES,
    cache_folder: Path | None = None,
    use_disk_cache: bool = False,
    progress: Progress | None = None,
) -> EndpointWorkspace:
    """Connect to an endpoint: detect (or load) the profile, fetch the frequencies.

    ``timeout`` bounds every request made while suggesting; the aggregate queries made once when
    opening (profile, frequencies) each read a good part of the catalogue and get
    ``survey_timeout`` (at least ``timeout``).

    With ``use_disk_cache`` the frequencies are kept as JSON in ``cache_folder`` (default: the
    user's cache folder, or ``CURATOR_CACHE_DIR``) for a day.

    Raises:
        EndpointError: the endpoint cannot be reached or fails.
        ProfileError, NoWorksError: the profile is bad, or nothing is a work.
        Cancelled: cancelled through ``progress``.
    """
    progress = progress or silent()
    endpoint = SparqlEndpoint(EndpointSettings(url, timeout=timeout))
    # One quick look first, so a wrong URL fails in a second rather than after every retry.
    probe = SparqlEndpoint(replace(endpoint.settings, retries=1, backoff=0.2))
    try:
        probe.select("SELECT ?s WHERE { ?s ?p ?o } LIMIT 1")
    except EndpointError as exc:
        raise EndpointError(
            f"{exc} Check the URL (it is the endpoint's query URL, often ending in /sparql or "
            "/query), that the server is running, and that this machine may reach it."
        ) from None
    langs = tuple(languages) if languages else preferred_languages()
    survey = SparqlEndpoint(replace(endpoint.settings, timeout=max(timeout, survey_timeout)))
    progress.report("Profiling the endpoint", 0.0)
    folder = None
    if use_disk_cache:
        folder = cache_folder or user_folder("cache", "CURATOR_CACHE_DIR")
    if profile_path is not None:
        profile = Profile.load(profile_path)
        profile = replace(profile, languages=langs) if languages else profile
    else:
        profile = _detected_profile(survey, langs, folder, progress.part(0, 0.5))
    frequencies = frequencies_for(
        survey, profile, cache_folder=folder, progress=progress.part(0.5, 1.0)
    )
    return EndpointWorkspace(endpoint, profile, frequencies, candidates=candidates)


def _detected_profile(
    endpoint: SparqlEndpoint,
    languages: tuple[str, ...],
    folder: Path | None,
    progress: Progress,
) -> Profile:
    """The endpoint's detected profile, kept in ``folder`` for as long as its frequencies are:
    detecting it takes a few full passes over a large catalogue."""
    file = None
    if folder is not None:
        key = hashlib.sha256(f"{endpoint.settings.url}\n{' '.join(languages)}".encode())
        file = folder / f"endpoint-profile-{key.hexdigest()[:24]}.toml"
        with contextlib.suppress(OSError, CuratorError):
            if time.time() - file.stat().st_mtime < FREQUENCIES_MAX_AGE:
                return Profile.load(file)
    profile = detect_profile_remote(endpoint, languages=languages, progress=progress)
    if file is not None:
        with contextlib.suppress(OSError):
            write_text_atomically(file, profile.to_toml())
    return profile


class _Counted:
    """Stands for ``count`` records of one kind, or ``count`` features of one path, in
    :func:`curator.services.profiles.profile_to_json` (which only counts them)."""

    def __init__(self, kind: str, count: int) -> None:
        self.kind, self.count, self.path = kind, count, kind

    @property
    def kinds(self) -> Iterator[str]:
        return itertools.repeat(self.kind, self.count)


class _SummaryIndex:
    """What the profile view reads of an index, from the endpoint's counts and labels."""

    def __init__(self, workspace: EndpointWorkspace, labels: Index) -> None:
        frequencies = workspace.frequencies
        self.size = frequencies.n_works
        self._labels = labels
        counts = workspace.class_counts()
        self.records = [_Counted(c, counts.get(c, 0)) for c in workspace.profile.work_classes]
        per_path: dict[str, int] = {}
        for path, _value in frequencies.works_with:
            per_path[path] = per_path.get(path, 0) + 1
        self.features = [
            feature
            for path, n in per_path.items()
            for feature in itertools.repeat(_Counted(path, 0), n)
        ]

    def label(self, key: str) -> str:
        return self._labels.label(key)

    def path_label(self, path: str) -> str:
        return self._labels.path_label(path)


@dataclass
class _Triples:
    triple_count: int


@dataclass
class ProfileView:
    """An endpoint workspace as :mod:`curator.services.profiles` reads a workspace."""

    profile: Profile
    index: _SummaryIndex
    catalogue: _Triples


def profile_view(workspace: EndpointWorkspace) -> ProfileView:
    """The endpoint's profile with its counts, for ``profile_to_json`` and ``profile_lines``."""
    labels = neighbourhood(workspace.endpoint, workspace.profile, workspace.frequencies, []).index
    return ProfileView(
        workspace.profile,
        _SummaryIndex(workspace, labels),
        _Triples(workspace.frequencies.triples),
    )

"""Which parts of a catalogue mean what: works, labels, themes, links and balance facets.

Catalogues differ in vocabulary (schema.org, Dublin Core with SKOS, BIBFRAME's work/instance
split), so the profile is *detected from the data* rather than written per vocabulary: work classes
are those of the creative-work families or their subclasses (or, failing that, the classes whose
members point at things their peers share); a theme property is an IRI-valued property whose
values several works share; a link is a property from one work to another. The curator sees the
result, may edit it, and may keep it as a small TOML file.
"""

from __future__ import annotations

import re
import tomllib
from collections import Counter, defaultdict
from collections.abc import Callable, Collection, Iterable, Mapping, Sequence
from dataclasses import asdict, dataclass, field, replace
from pathlib import Path
from typing import Any, Literal, get_args

import numpy as np
import tomli_w

from curator.core.catalogue import Catalogue
from curator.core.errors import NoWorksError, ProfileError
from curator.core.reading import (
    LABEL_PROPERTIES,
    CatalogueReader,
    StatementColumns,
    WorkStatements,
    join_path,
)
from curator.core.vocab import (
    BF,
    DC,
    DCMITYPE,
    DCTERMS,
    FOAF,
    OWL,
    RDF,
    RDFS,
    SCHEMA,
    SCHEMA_HTTP,
    SKOS,
)

Role = Literal["subject", "genre", "creator", "place", "series", "audience", "other"]
ROLES: tuple[str, ...] = get_args(Role)

#: Default weight of each role in similarity: what a shared value of it says about two works.
#: The values are a starting point chosen by us for readers' advisory (subject matter first,
#: then who made it and the series); curators change them in the profile file.
ROLE_WEIGHTS: dict[str, float] = {
    "subject": 1.0,
    "genre": 0.6,
    "creator": 0.8,
    "place": 0.5,
    "series": 0.8,
    "audience": 0.3,
    "other": 0.25,
}

PROFILE_VERSION = 1


def _both_schemas(*names: str) -> set[str]:
    return {SCHEMA[n] for n in names} | {SCHEMA_HTTP[n] for n in names}


#: Classes whose members are works of some kind, from the open vocabularies.
WORK_CLASS_ROOTS: frozenset[str] = frozenset(
    _both_schemas("CreativeWork", "Book", "Movie", "Audiobook")
    | {DCTERMS.BibliographicResource, DCMITYPE.Text, DCMITYPE.MovingImage, DCMITYPE.Sound}
    | {BF.Work, BF.Text, BF.MovingImage, BF.Audio, BF.NotatedMusic}
    | {
        "http://purl.org/vocab/frbr/core#Work",
        "http://purl.org/ontology/bibo/Book",
        "http://purl.org/ontology/bibo/Film",
        "http://purl.org/ontology/bibo/Document",
    }
)

#: Classes that are never works even if a vocabulary files them under creative work.
NOT_WORK_CLASSES: frozenset[str] = frozenset(
    _both_schemas("Person", "Organization", "Place", "Audience", "ItemList", "ListItem")
    | _both_schemas("CreativeWorkSeries", "BookSeries", "MovieSeries", "Collection")
    | {SKOS.Concept, SKOS.ConceptScheme, FOAF.Person, FOAF.Agent, FOAF.Organization}
    | {BF.Instance, BF.Item, BF.Person, BF.Organization, BF.Agent, BF.Title, BF.Contribution}
    | {RDFS.Class, OWL.Class, OWL.ObjectProperty, RDF.Property, OWL.Thing}
)

#: Properties from a work's instance to the work (``^`` marks work -> instance).
INSTANCE_LINKS: tuple[str, ...] = (
    BF.instanceOf,
    SCHEMA.exampleOfWork,
    SCHEMA_HTTP.exampleOfWork,
    "^" + BF.hasInstance,
    "^" + SCHEMA.workExample,
    "^" + SCHEMA_HTTP.workExample,
)

#: Properties whose values form a hierarchy (child -> broader); ``^`` marks the inverse form.
HIERARCHY_PROPERTIES: tuple[str, ...] = (
    SKOS.broader,
    "^" + SKOS.narrower,
    RDFS.subClassOf,
    SCHEMA.containedInPlace,
    SCHEMA_HTTP.containedInPlace,
)

_CREATOR_PROPS = _both_schemas(
    "author", "creator", "director", "illustrator", "readBy", "contributor", "actor"
) | {DCTERMS.creator, DCTERMS.contributor, DC.creator, DC.contributor,
     join_path(BF.contribution, BF.agent)}
_PLACE_PROPS = _both_schemas("contentLocation", "locationCreated", "spatialCoverage") | {
    DCTERMS.spatial
}
_GENRE_PROPS = _both_schemas("genre") | {BF.genreForm}
_SUBJECT_PROPS = _both_schemas("about", "keywords") | {DCTERMS.subject, DC.subject, BF.subject}
_SERIES_PROPS = _both_schemas("isPartOf") | {DCTERMS.isPartOf}
_AUDIENCE_PROPS = _both_schemas("audience", "typicalAgeRange") | {
    DCTERMS.audience,
    BF.intendedAudience,
}
_LANGUAGE_PROPS = _both_schemas("inLanguage") | {DCTERMS.language, DC.language, BF.language}
_YEAR_PROPS = _both_schemas("datePublished", "dateCreated", "copyrightYear") | {
    DCTERMS.date,
    DCTERMS.issued,
    DCTERMS.created,
    DC.date,
    BF.originDate,
    join_path(BF.provisionActivity, BF.date),
}
_PERSON_CLASSES = _both_schemas("Person", "Organization") | {
    FOAF.Person,
    FOAF.Agent,
    FOAF.Organization,
    BF.Person,
    BF.Organization,
    BF.Agent,
}
_PLACE_CLASSES = _both_schemas("Place")
_SERIES_CLASSES = _both_schemas("CreativeWorkSeries", "BookSeries", "MovieSeries")
_AUDIENCE_CLASSES = _both_schemas("Audience")
_SKIPPED_PATHS = {RDF.type} | _both_schemas("description", "sameAs", "url", "identifier")

#: Words a curator would use for well-known properties, where the data has no label for them.
PROPERTY_WORDS: dict[str, str] = {
    **dict.fromkeys(_both_schemas("about"), "theme"),
    **dict.fromkeys(_both_schemas("author"), "author"),
    **dict.fromkeys(_both_schemas("director"), "director"),
    **dict.fromkeys(_both_schemas("readBy"), "narrator"),
    **dict.fromkeys(_both_schemas("illustrator"), "illustrator"),
    **dict.fromkeys(_both_schemas("creator"), "creator"),
    **dict.fromkeys(_both_schemas("genre"), "genre"),
    **dict.fromkeys(_both_schemas("contentLocation"), "setting"),
    **dict.fromkeys(_both_schemas("isPartOf"), "series"),
    **dict.fromkeys(_both_schemas("audience"), "audience"),
    **dict.fromkeys(_both_schemas("isBasedOn"), "based on"),
    **dict.fromkeys(_both_schemas("keywords"), "keyword"),
    DCTERMS.subject: "subject",
    DCTERMS.creator: "creator",
    DCTERMS.spatial: "place",
    DCTERMS.isVersionOf: "version of",
    DCTERMS.relation: "related to",
    DCTERMS.audience: "audience",
    BF.subject: "subject",
    BF.genreForm: "genre/form",
    join_path(BF.contribution, BF.agent): "contributor",
    BF.relatedTo: "related to",
    BF.translationOf: "translation of",
}

_YEAR = re.compile(r"^\s*(-?\d{4})(?:\b|-)")
_LANGUAGE_CODE = re.compile(r"^[A-Za-z]{2,3}(?:-[A-Za-z0-9]{1,8})*$")


@dataclass(frozen=True)
class ThemeProperty:
    """A property whose shared values make works alike, with its role and weight."""

    path: str
    role: Role
    weight: float


@dataclass(frozen=True)
class LinkProperty:
    """A property joining two works (sequel, adaptation) or two creators (influence)."""

    path: str
    weight: float = 1.0


@dataclass(frozen=True)
class Profile:
    """How to read one catalogue. Detected by :func:`detect_profile`, editable, saved as TOML."""

    work_classes: tuple[str, ...]
    label_properties: tuple[str, ...] = LABEL_PROPERTIES
    languages: tuple[str, ...] = ("en",)
    instance_links: tuple[str, ...] = ()
    themes: tuple[ThemeProperty, ...] = ()
    hierarchy: tuple[str, ...] = ()
    hierarchy_decay: float = 0.5
    work_links: tuple[LinkProperty, ...] = ()
    creator_links: tuple[LinkProperty, ...] = ()
    year_properties: tuple[str, ...] = ()
    language_properties: tuple[str, ...] = ()
    audience_properties: tuple[str, ...] = ()
    notes: tuple[str, ...] = field(default=(), compare=False)

    def themes_with_role(self, *roles: str) -> tuple[ThemeProperty, ...]:
        return tuple(t for t in self.themes if t.role in roles)

    def theme(self, path: str) -> ThemeProperty | None:
        return next((t for t in self.themes if t.path == path), None)

    # ----- TOML -------------------------------------------------------------------------

    def to_toml(self) -> str:
        """The profile as TOML a curator can read and edit."""
        data: dict[str, Any] = {
            "version": PROFILE_VERSION,
            "work_classes": list(self.work_classes),
            "label_properties": list(self.label_properties),
            "languages": list(self.languages),
            "instance_links": list(self.instance_links),
            "hierarchy": list(self.hierarchy),
            "hierarchy_decay": self.hierarchy_decay,
            "year_properties": list(self.year_properties),
            "language_properties": list(self.language_properties),
            "audience_properties": list(self.audience_properties),
            "themes": [asdict(t) for t in self.themes],
            "work_links": [asdict(link) for link in self.work_links],
            "creator_links": [asdict(link) for link in self.creator_links],
        }
        header = (
            "# curator catalogue profile. Paths are property IRIs; two IRIs separated by a space\n"
            "# step through a blank node; a leading ^ reads the property backwards.\n"
            f"# Theme roles: {', '.join(ROLES)}.\n"
        )
        return header + tomli_w.dumps(data)

    def save(self, path: Path) -> None:
        from curator.core.files import write_text_atomically

        write_text_atomically(path, self.to_toml())

    @classmethod
    def from_toml(cls, text: str, *, source: str = "<profile>") -> Profile:
        """Read a profile, naming the field at fault when something is off.

        Raises:
            ProfileError: not TOML, unknown keys, wrong types, unknown roles, bad weights.
        """
        try:
            data = tomllib.loads(text)
        except tomllib.TOMLDecodeError as exc:
            raise ProfileError(f"{source}: not valid TOML ({exc}).") from None
        return _profile_from_mapping(data, source)

    @classmethod
    def load(cls, path: Path) -> Profile:
        try:
            text = path.read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError) as exc:
            raise ProfileError(f"{path}: cannot be read ({exc}).") from None
        return cls.from_toml(text, source=str(path))


_LIST_FIELDS = (
    "work_classes",
    "label_properties",
    "languages",
    "instance_links",
    "hierarchy",
    "year_properties",
    "language_properties",
    "audience_properties",
)


def _profile_from_mapping(data: Mapping[str, Any], source: str) -> Profile:
    known = {*_LIST_FIELDS, "version", "hierarchy_decay", "themes", "work_links", "creator_links"}
    unknown = sorted(set(data) - known)
    if unknown:
        raise ProfileError(f"{source}: unknown field(s) {', '.join(unknown)}.")
    version = data.get("version", PROFILE_VERSION)
    if version != PROFILE_VERSION:
        raise ProfileError(f"{source}: profile version {version!r}; this curator reads version 1.")
    values: dict[str, Any] = {}
    for name in _LIST_FIELDS:
        if name in data:
            items = data[name]
            if not isinstance(items, list) or not all(isinstance(i, str) for i in items):
                raise ProfileError(f"{source}: field {name} must be a list of strings.")
            values[name] = tuple(items)
    if not values.get("work_classes"):
        raise ProfileError(f"{source}: field work_classes must name at least one class.")
    if "hierarchy_decay" in data:
        decay = data["hierarchy_decay"]
        if not isinstance(decay, int | float) or not 0.0 <= decay <= 1.0:
            raise ProfileError(f"{source}: field hierarchy_decay must be a number from 0 to 1.")
        values["hierarchy_decay"] = float(decay)
    themes = []
    for i, entry in enumerate(data.get("themes", [])):
        where = f"{source}: themes[{i}]"
        path, weight = _path_and_weight(entry, where, {"path", "role", "weight"})
        role = entry.get("role", "other")
        if role not in ROLES:
            raise ProfileError(f"{where}.role is {role!r}; use one of {', '.join(ROLES)}.")
        themes.append(ThemeProperty(path, role, weight))
    values["themes"] = tuple(themes)
    for name in ("work_links", "creator_links"):
        links = []
        for i, entry in enumerate(data.get(name, [])):
            path, weight = _path_and_weight(entry, f"{source}: {name}[{i}]", {"path", "weight"})
            links.append(LinkProperty(path, weight))
        values[name] = tuple(links)
    return Profile(**values)


def _path_and_weight(entry: Any, where: str, allowed: set[str]) -> tuple[str, float]:
    if not isinstance(entry, dict):
        raise ProfileError(f"{where} must be a table.")
    unknown = sorted(set(entry) - allowed)
    if unknown:
        raise ProfileError(f"{where}: unknown field(s) {', '.join(unknown)}.")
    path = entry.get("path")
    if not isinstance(path, str) or not path.strip():
        raise ProfileError(f"{where}.path must be a property IRI.")
    weight = entry.get("weight", 1.0)
    if not isinstance(weight, int | float) or weight < 0:
        raise ProfileError(f"{where}.weight must be a number of 0 or more.")
    return path.strip(), float(weight)


# ----- detection --------------------------------------------------------------------------


def detect_work_classes(
    catalogue: Catalogue, *, reader: CatalogueReader | None = None
) -> tuple[list[str], list[str]]:
    """The classes whose members are works, and notes on how they were found.

    Raises:
        NoWorksError: nothing in the catalogue looks like a work.
    """
    reader = reader or CatalogueReader(catalogue)
    counts = reader.class_counts()
    parents: dict[str, set[str]] = defaultdict(set)
    for child, parent in reader.subclass_pairs():
        parents[child].add(parent)

    def is_work_class(cls: str) -> bool:
        seen: set[str] = set()
        stack = [cls]
        while stack:
            current = stack.pop()
            if current in NOT_WORK_CLASSES:
                return False
            if current in WORK_CLASS_ROOTS:
                return True
            seen.add(current)
            stack.extend(p for p in parents.get(current, ()) if p not in seen)
        return False

    found = sorted(c for c, n in counts.items() if n > 0 and is_work_class(c))
    if found:
        return found, []
    fallback = _classes_that_point_at_shared_things(catalogue, counts)
    if not fallback:
        raise NoWorksError(
            "No works found: no class of the catalogue is a known kind of creative work "
            "(schema:CreativeWork and its kinds, dcterms:BibliographicResource, bf:Work, ...) "
            "and no class's members share subjects or creators. Name the work classes in a "
            "profile file (work_classes = [...])."
        )
    notes = [
        "Work classes guessed from the data (their members point at things they share): "
        + ", ".join(fallback)
    ]
    return fallback, notes


def _classes_that_point_at_shared_things(
    catalogue: Catalogue, counts: Mapping[str, int]
) -> list[str]:
    """Classes whose members have IRI-valued properties whose values other members share."""
    rows = catalogue.select(
        f"""SELECT ?c (COUNT(DISTINCT ?s) AS ?n) WHERE {{
            ?s a ?c . ?s ?p ?o . ?other ?p ?o . ?other a ?c .
            FILTER(isIRI(?o) && ?p != <{RDF.type}> && ?s != ?other)
        }} GROUP BY ?c"""
    )
    scores = {}
    for cls, n in rows:
        if cls is None or n is None or cls.value in NOT_WORK_CLASSES:
            continue
        total = counts.get(cls.value, 0)
        if total >= 2 and int(n.value) / total >= 0.5:
            scores[cls.value] = int(n.value)
    return sorted(scores)


class _PathStats:
    """What the works' statements of one path are like, read off the statement columns."""

    def __init__(self, columns: StatementColumns, works: Collection[str]) -> None:
        self.columns = columns
        n_paths = len(columns.paths)
        self.link_uses = np.bincount(columns.link_path, minlength=n_paths)
        self.literal_uses = np.bincount(columns.literal_path, minlength=n_paths)
        self.uses = self.link_uses + self.literal_uses
        value_is_work = np.fromiter(
            (v in works for v in columns.values), dtype=bool, count=len(columns.values)
        )
        self.to_works = np.bincount(
            columns.link_path[value_is_work[columns.link_value]], minlength=n_paths
        )
        # Distinct (path, value) pairs and how often each occurs.
        n_values = max(1, len(columns.values))
        pairs, counts = np.unique(
            columns.link_path.astype(np.int64) * n_values + columns.link_value,
            return_counts=True,
        )
        self._pair_path = pairs // n_values
        self._pair_value = pairs % n_values
        self.shared = np.bincount(self._pair_path[counts >= 2], minlength=n_paths)

    def paths(self) -> list[str]:
        """Every path some work statement has."""
        return [p for i, p in enumerate(self.columns.paths) if self.uses[i] > 0]

    def values(self, path: int) -> list[str]:
        """The distinct values of a path's links."""
        values = self.columns.values
        return [values[v] for v in self._pair_value[self._pair_path == path].tolist()]

    def literal_samples(self, path: int, limit: int = 200) -> list[str]:
        """The first lexical forms of a path's literals."""
        columns = self.columns
        rows = np.flatnonzero(columns.literal_path == path)[:limit]
        lexicals = columns.lexicals
        return [lexicals[x] for x in columns.literal_lexical[rows].tolist()]


def detect_profile(
    catalogue: Catalogue,
    *,
    languages: Sequence[str] = ("en",),
    work_classes: Sequence[str] | None = None,
    instance_links: Sequence[str] | None = None,
    statements: WorkStatements | None = None,
    types: Mapping[str, set[str]] | None = None,
    hierarchy_present: Sequence[str] | None = None,
    reader: CatalogueReader | None = None,
) -> Profile:
    """Read the catalogue's shape and say which properties play which part.

    ``work_classes``, ``instance_links``, ``statements`` and ``types`` may be passed in when the
    caller has found or read them already; so may a ``reader`` that has read some of it.

    Raises:
        NoWorksError: the catalogue holds no works.
    """
    reader = reader or CatalogueReader(catalogue)
    notes: list[str] = []
    if work_classes is None:
        work_classes, notes = detect_work_classes(catalogue, reader=reader)
    if instance_links is None:
        instance_links = detect_instance_links(catalogue, reader=reader)
    if statements is None:
        statements = reader.work_statements(work_classes, instance_links)
    if not statements.works:
        raise NoWorksError("The work classes found have no members.")
    if types is None:
        types = reader.shared_types()
    works = set(statements.works)
    columns = statements.columns()
    stats = _PathStats(columns, works)
    number = {p: i for i, p in enumerate(columns.paths)}
    used = stats.paths()

    shape = classify_paths(
        [
            PathUse(
                path,
                uses=int(stats.uses[number[path]]),
                literal_uses=int(stats.literal_uses[number[path]]),
                to_works=int(stats.to_works[number[path]]),
                shared=int(stats.shared[number[path]]),
            )
            for path in used
        ],
        instance_links=instance_links,
        literal_samples=lambda path: stats.literal_samples(number[path]),
        role_of=lambda path: _role_of(path, stats.values(number[path]), types),
    )
    if hierarchy_present is None:
        hierarchy_present = [h for h in HIERARCHY_PROPERTIES if reader.has_edge(h.lstrip("^"))]
    creator_links = _detect_creator_links(
        catalogue, statements, list(shape.themes), works, reader=reader
    )
    return shape.profile(
        work_classes=work_classes,
        languages=languages,
        instance_links=instance_links,
        hierarchy=hierarchy_present,
        creator_links=creator_links,
        notes=notes,
    )


@dataclass(frozen=True)
class PathUse:
    """How the works use one property path: how often, how often with a literal, how often
    pointing at another work, and how many of its values two or more works share."""

    path: str
    uses: int = 0
    literal_uses: int = 0
    to_works: int = 0
    shared: int = 0


@dataclass(frozen=True)
class PathShape:
    """The part each property plays, as :func:`classify_paths` decides it."""

    label_paths: tuple[str, ...]
    themes: tuple[ThemeProperty, ...]
    work_links: tuple[LinkProperty, ...]
    years: tuple[str, ...]
    languages: tuple[str, ...]
    audiences: tuple[str, ...]

    def profile(
        self,
        *,
        work_classes: Sequence[str],
        languages: Sequence[str],
        instance_links: Sequence[str],
        hierarchy: Sequence[str],
        creator_links: Sequence[LinkProperty],
        notes: Sequence[str],
    ) -> Profile:
        return Profile(
            work_classes=tuple(work_classes),
            label_properties=self.label_paths or LABEL_PROPERTIES,
            languages=tuple(languages),
            instance_links=tuple(instance_links),
            themes=self.themes,
            hierarchy=tuple(hierarchy),
            work_links=self.work_links,
            creator_links=tuple(creator_links),
            year_properties=tuple(_ordered(list(self.years), _YEAR_PROPS)),
            language_properties=self.languages,
            audience_properties=self.audiences,
            notes=tuple(notes),
        )


def classify_paths(
    uses: Iterable[PathUse],
    *,
    instance_links: Sequence[str],
    literal_samples: Callable[[str], Sequence[str]],
    role_of: Callable[[str], str],
) -> PathShape:
    """Say which part each property path plays, from how the works use it. The one rule for
    catalogues read in full and for endpoints asked by aggregate queries: labels first; then a
    path mostly with literals is a year, language, audience or literal subject by its samples;
    one mostly pointing at works is a link; one with shared values is a theme of the role its
    values' types give (``role_of``)."""
    found = {u.path: u for u in uses if u.uses > 0}
    label_paths = tuple(p for p in LABEL_PROPERTIES if p in found)
    instance_preds = {link.lstrip("^") for link in instance_links}
    themes: list[ThemeProperty] = []
    work_links: list[LinkProperty] = []
    years: list[str] = []
    langs: list[str] = []
    audiences: list[str] = []
    for path in sorted(found):
        use = found[path]
        if path in _SKIPPED_PATHS or path in label_paths or path.lstrip("^") in instance_preds:
            continue
        if use.literal_uses * 2 >= use.uses:
            kind = _literal_kind(path, literal_samples(path))
            if kind == "year":
                years.append(path)
            elif kind == "language":
                langs.append(path)
            elif kind == "audience":
                audiences.append(path)
            elif kind == "theme":
                themes.append(ThemeProperty(path, "subject", ROLE_WEIGHTS["subject"]))
            continue
        if use.to_works * 2 >= use.uses - use.literal_uses:
            work_links.append(LinkProperty(path, 1.0))
            continue
        if path in _LANGUAGE_PROPS:
            langs.append(path)
            continue
        if path in _AUDIENCE_PROPS:
            audiences.append(path)
        if use.shared == 0:
            continue
        role = role_of(path)
        themes.append(ThemeProperty(path, role, ROLE_WEIGHTS[role]))
    return PathShape(
        label_paths,
        tuple(themes),
        tuple(work_links),
        tuple(years),
        tuple(langs),
        tuple(audiences),
    )


def _ordered(paths: list[str], preferred: set[str]) -> list[str]:
    """Known properties first (they are the more reliable), then the rest as found."""
    return sorted(paths, key=lambda p: (p not in preferred, p))


def detect_instance_links(
    catalogue: Catalogue, *, reader: CatalogueReader | None = None
) -> list[str]:
    """The instance-to-work properties the catalogue uses (a BIBFRAME-style split)."""
    reader = reader or CatalogueReader(catalogue)
    return [link for link in INSTANCE_LINKS if reader.uses(link.lstrip("^"))]


def _literal_kind(path: str, samples: Sequence[str]) -> str | None:
    if path in _YEAR_PROPS:
        return "year"
    if path in _LANGUAGE_PROPS:
        return "language"
    if path in _AUDIENCE_PROPS:
        return "audience"
    if path in _SUBJECT_PROPS:
        return "theme"
    if samples and sum(1 for v in samples if _YEAR.match(v)) >= 0.8 * len(samples):
        tail = path.rsplit(" ", 1)[-1].lower()
        if "date" in tail or "year" in tail or "issued" in tail or "created" in tail:
            return "year"
    return None


def _role_of(path: str, values: Collection[str], types: Mapping[str, set[str]]) -> Role:
    if path in _CREATOR_PROPS:
        return "creator"
    if path in _PLACE_PROPS:
        return "place"
    if path in _GENRE_PROPS:
        return "genre"
    if path in _AUDIENCE_PROPS:
        return "audience"
    if path in _SUBJECT_PROPS:
        return "subject"
    value_types: Counter[str] = Counter()
    for value in values:
        for t in types.get(value, ()):
            value_types[t] += 1
    total = max(1, len(values))

    def share(classes: set[str]) -> float:
        return sum(value_types[c] for c in classes) / total

    if share(_PERSON_CLASSES) >= 0.5:
        return "creator"
    if share(_PLACE_CLASSES) >= 0.5:
        return "place"
    if share(_SERIES_CLASSES) >= 0.5 or (path in _SERIES_PROPS):
        return "series"
    if share(_AUDIENCE_CLASSES) >= 0.5:
        return "audience"
    if share({SKOS.Concept}) >= 0.5:
        return "subject"
    return "other"


def _detect_creator_links(
    catalogue: Catalogue,
    statements: WorkStatements,
    themes: Sequence[ThemeProperty],
    works: set[str],
    *,
    reader: CatalogueReader | None = None,
) -> list[LinkProperty]:
    """Properties between two creators (influence, collaboration), found in the data."""
    reader = reader or CatalogueReader(catalogue)
    creator_paths = {t.path for t in themes if t.role == "creator"}
    columns = statements.columns()
    rows = columns.path_ids(creator_paths)[columns.link_path]
    creators = {columns.values[v] for v in np.unique(columns.link_value[rows]).tolist()}
    if not creators:
        return []
    counts: Counter[str] = Counter()
    for a, p, b in reader.outgoing(sorted(creators)):
        if b in creators and a != b and b not in works:
            counts[p] += 1
    return [LinkProperty(p, 0.8) for p in sorted(counts)]


def with_languages(profile: Profile, languages: Sequence[str]) -> Profile:
    """The same profile read in other languages (most wanted first)."""
    return replace(profile, languages=tuple(languages))

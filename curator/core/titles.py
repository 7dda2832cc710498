"""Finding works by what a curator types: an IRI, an exact title, or a near miss.

Titles are compared folded (accents, case and punctuation ignored). An exact title shared by
several works, or a near miss with no clear winner, is an error that lists the closest works
with creator and year, so the curator can choose; we never guess silently.
"""

from __future__ import annotations

import difflib
import re
from dataclasses import dataclass

from curator.core.errors import Candidate, SeedError
from curator.core.index import Index
from curator.core.labels import fold

#: Least similarity (difflib ratio on folded text) for a near miss to count as a match.
FUZZY_ACCEPT = 0.84
#: How far ahead of the runner-up a near miss must be to be taken without asking.
FUZZY_MARGIN = 0.06
_YEAR_HINT = re.compile(r"^(.*?)\s*[\(\[]\s*(\d{4})\s*[\)\]]\s*$")
#: What a theme value of each role is called when a curator types one in place of a work.
_ROLE_WORDS = {
    "subject": "theme",
    "genre": "genre",
    "creator": "creator",
    "place": "place",
    "series": "series",
    "audience": "audience",
    "other": "value",
}


@dataclass(frozen=True)
class TitleMatch:
    """A work found for a typed text, how well it matched, and the title variant that did."""

    position: int
    iri: str
    score: float
    matched_title: str


class TitleFinder:
    """Title look-up over one index (built once; folding every title is the costly part)."""

    def __init__(self, index: Index) -> None:
        self.index = index
        self._variants: list[tuple[str, int, str]] = [
            (fold(t), i, t) for i, r in enumerate(index.records) for t in r.titles
        ]
        self._exact: dict[str, list[int]] = {}
        for folded, i, _t in self._variants:
            bucket = self._exact.setdefault(folded, [])
            if i not in bucket:
                bucket.append(i)
        #: folded label -> theme values (subjects, creators, places...) with that label; built
        #: when first needed
        self._values: dict[str, list[tuple[str, str]]] | None = None

    def describe(self, position: int) -> str:
        """'creator, year, kind' for telling works with the same title apart."""
        record = self.index.records[position]
        parts = [", ".join(self.index.label(c) for c in record.creators[:2]) or "creator unknown"]
        parts.append(str(record.year) if record.year is not None else "year unknown")
        if record.kinds:
            parts.append(self.index.label(record.kinds[0]))
        return ", ".join(parts)

    def candidate(self, position: int) -> Candidate:
        record = self.index.records[position]
        return Candidate(record.iri, record.label, self.describe(position))

    def search(self, text: str, limit: int = 20) -> list[TitleMatch]:
        """Works whose titles start with, contain, or resemble ``text``, best first."""
        query = fold(text)
        if not query:
            return []
        best: dict[int, tuple[float, str]] = {}
        for folded, i, title in self._variants:
            if folded == query:
                score = 3.0
            elif folded.startswith(query):
                score = 2.0 + len(query) / max(1, len(folded))
            elif f" {query}" in f" {folded}":
                score = 1.5 + len(query) / max(1, len(folded))
            elif query in folded:
                score = 1.2
            else:
                continue
            if score > best.get(i, (0.0, ""))[0]:
                best[i] = (score, title)
        if len(best) < limit:
            for folded, i, title in self._variants:
                if i in best:
                    continue
                ratio = _ratio(query, folded)
                if ratio >= 0.6 and ratio > best.get(i, (0.0, ""))[0]:
                    best[i] = (ratio, title)
        ranked = sorted(best.items(), key=lambda kv: (-kv[1][0], self.index.records[kv[0]].label))
        return [
            TitleMatch(i, self.index.works[i], score, title) for i, (score, title) in ranked[:limit]
        ]

    def resolve(self, text: str) -> int:
        """The position of the one work ``text`` names (an IRI, or a title with an optional
        year in brackets: ``The Salt Road (1911)``).

        Raises:
            SeedError: nothing matches, several works match equally, or the IRI is not a work.
        """
        stripped = text.strip()
        if not stripped:
            raise SeedError("A seed is empty; give a title or an IRI.")
        iri = stripped[1:-1] if stripped.startswith("<") and stripped.endswith(">") else stripped
        if iri in self.index.position:
            return self.index.position[iri]
        if re.match(r"^[A-Za-z][A-Za-z0-9+.-]*:\S+$", iri) and " " not in iri:
            if iri in self.index.types or iri in self.index.labels:
                kinds = sorted(self.index.label(t) for t in self.index.types.get(iri, ()))
                what = f" (it is a {', '.join(kinds)})" if kinds else ""
                raise SeedError(
                    f"<{iri}> is in the catalogue but is not a work{what}; seeds must be works. "
                    "To start from a theme or a creator, pick one of its works."
                )
            if "://" in iri or iri.startswith("urn:"):
                raise SeedError(f"<{iri}> is not in this catalogue.")
        year = None
        match = _YEAR_HINT.match(stripped)
        if match:
            stripped, year = match.group(1), int(match.group(2))
        query = fold(stripped)
        exact = list(self._exact.get(query, []))
        if year is not None and exact:
            exact = [i for i in exact if self.index.records[i].year == year] or exact
        if len(exact) == 1:
            return exact[0]
        if len(exact) > 1:
            raise SeedError(
                f"{len(exact)} works are titled {text.strip()!r}; give the IRI, or the year "
                "in brackets, to choose one.",
                [self.candidate(i) for i in exact[:8]],
            )
        self._refuse_theme(text.strip(), query)
        scored = self._fuzzy(query, year)
        if scored and scored[0][0] >= FUZZY_ACCEPT:
            runner_up = scored[1][0] if len(scored) > 1 else 0.0
            if scored[0][0] - runner_up >= FUZZY_MARGIN:
                return scored[0][1]
            raise SeedError(
                f"{text.strip()!r} could mean several works; give the exact title or the IRI.",
                [self.candidate(i) for _s, i in scored[:5]],
            )
        found = self.search(stripped, 6)
        contained = [m.position for m in found if m.score >= 1.2]
        if len(contained) == 1 and len(found) == 1:
            return contained[0]
        partial = [m.position for m in found]
        close = list(dict.fromkeys([*partial, *(i for s, i in scored[:5] if s >= 0.45)]))
        raise SeedError(
            f"No work is titled {text.strip()!r}.", [self.candidate(i) for i in close[:6]]
        )

    def _theme_values(self) -> dict[str, list[tuple[str, str]]]:
        """Folded label -> (value key, role word) of every theme value that is not a work."""
        if self._values is None:
            index = self.index
            values: dict[str, list[tuple[str, str]]] = {}
            seen: set[str] = set()
            for feature in index.features:
                key = feature.value
                if key in seen or key in index.position or key.startswith('"'):
                    continue
                seen.add(key)
                theme = index.profile.theme(feature.path)
                role = _ROLE_WORDS.get(theme.role if theme else "other", "value")
                label = index.labels.get(key)
                if label:
                    values.setdefault(fold(label), []).append((key, role))
            self._values = values
        return self._values

    def _refuse_theme(self, text: str, query: str) -> None:
        """A typed text that names a theme, creator or place rather than a work is an error
        saying so, with some of its works to choose from."""
        found = self._theme_values().get(query)
        if not found:
            return
        key, role = found[0]
        index = self.index
        columns = [j for j, f in enumerate(index.features) if f.value == key]
        strength = index.raw[:, columns].max(axis=1).toarray().ravel()
        works = sorted(
            (int(i) for i in strength.nonzero()[0]),
            key=lambda i: (-strength[i], index.records[i].label),
        )
        raise SeedError(
            f"{text!r} is a {role} in this catalogue, not a work; seeds must be works. "
            f"To start from this {role}, pick one of its works.",
            [self.candidate(i) for i in works[:6]],
        )

    def _fuzzy(self, query: str, year: int | None) -> list[tuple[float, int]]:
        best: dict[int, float] = {}
        for folded, i, _t in self._variants:
            ratio = _ratio(query, folded)
            if year is not None and self.index.records[i].year == year:
                ratio += 0.02
            if ratio > best.get(i, 0.0):
                best[i] = ratio
        return sorted(((s, i) for i, s in best.items()), key=lambda si: (-si[0], si[1]))


def _ratio(a: str, b: str) -> float:
    matcher = difflib.SequenceMatcher(None, a, b, autojunk=False)
    if matcher.real_quick_ratio() < 0.45 or matcher.quick_ratio() < 0.45:
        return 0.0
    return matcher.ratio()

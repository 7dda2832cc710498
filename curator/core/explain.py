"""Why a suggestion belongs: the themes it shares, the path that joins it, one printable sentence.

Shared themes are read off the cosine itself: the contribution of a feature is the product of
the two weights, so the contributions of all shared features add up to the similarity. The
connecting path is looked for among the typed links a curator recognises (an adaptation, the
same creator, one creator's influence on another, a chain of two work links), strongest first.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import scipy.sparse as sp

from curator.core.index import LITERAL_PREFIX, Edge, Index
from curator.core.labels import join_words
from curator.core.profile import PROPERTY_WORDS
from curator.core.vocab import SCHEMA, SCHEMA_HTTP

#: How many shared themes a suggestion reports.
SHARED_THEMES_SHOWN = 5

#: Roles whose shared values the sentence names (creators are told by the path instead).
_THEME_ROLES_NAMED = frozenset({"subject", "genre", "place", "series"})

#: Words for well-known links between works, read "A <word> B".
_LINK_WORDS: dict[str, str] = {
    SCHEMA.isBasedOn: "adapted from",
    SCHEMA_HTTP.isBasedOn: "adapted from",
    SCHEMA.sequel: "followed by",
    SCHEMA_HTTP.sequel: "followed by",
}


@dataclass(frozen=True)
class SharedTheme:
    """A theme value a suggestion shares with the seeds or the list, and how much it counts."""

    iri: str
    label: str
    property: str
    property_label: str
    weight: float
    #: labels of the seeds and list entries that have it too
    shared_with: tuple[str, ...]
    #: True when reached through the hierarchy (a broader theme of what the works have)
    broader: bool


@dataclass(frozen=True)
class ConnectingPath:
    """A chain of typed links from the suggestion to a seed or list entry, and its wording."""

    steps: tuple[Edge, ...]
    text: str
    target: str


def quote(title: str) -> str:
    return f"‘{title}’"


class Explainer:
    """Builds explanations against one context (the seeds and the list so far)."""

    def __init__(self, index: Index, seeds: Sequence[int], list_items: Sequence[int]) -> None:
        self.index = index
        self.context = list(dict.fromkeys([*seeds, *list_items]))
        self.seeds = list(seeds)
        # Rows as dictionaries: explanations touch a handful of columns of a few rows, where
        # dictionary look-ups beat sparse indexing by far.
        self._weights = [_row_dict(index.vectors, i) for i in self.context]
        self._direct = [set(_row_dict(index.direct, i)) for i in self.context]
        self._shared = set().union(*self._weights) if self._weights else set()
        self._words = _feature_words(index)
        self._context_labels = [index.records[i].label for i in self.context]
        self._roles: dict[str, str] = {}

    # ----- shared themes ---------------------------------------------------------------

    def shared_themes(self, position: int) -> list[SharedTheme]:
        if not self.context:
            return []
        index = self.index
        vectors = index.vectors
        start, end = vectors.indptr[position], vectors.indptr[position + 1]
        row = zip(
            vectors.indices[start:end].tolist(), vectors.data[start:end].tolist(), strict=True
        )
        direct_row = set(_row_dict(index.direct, position))
        shared, words, weights, direct = self._shared, self._words, self._weights, self._direct
        single = len(weights) == 1
        # (-weight, label, place in the row, ...): the order a stable sort by (-weight, label)
        # of the themes in row order gives; a SharedTheme is made only for those shown.
        found: list[tuple] = []
        for place, (column, value) in enumerate(row):
            if column not in shared:
                continue
            if single:
                holders: tuple[int, ...] | list[int] = (0,)
                peak = weights[0][column]
                has_direct = column in direct[0]
            else:
                holders = [h for h, w in enumerate(weights) if column in w]
                peak = max(weights[h][column] for h in holders)
                has_direct = any(column in direct[h] for h in holders)
            text = words.get(column)
            if text is None:
                feature = index.features[column]
                text = words[column] = (
                    feature.value if not feature.value.startswith(LITERAL_PREFIX) else "",
                    index.label(feature.value),
                    feature.path,
                    index.path_label(feature.path),
                )
            weight = float(value * peak)
            broader = column not in direct_row or not has_direct
            found.append((-weight, text[1], place, weight, broader, holders, text))
        found.sort()
        # A broader theme is kept only when no narrower shared theme already says as much: the
        # direct themes, then broader ones to fill the list.
        narrower = [t for t in found if not t[4]]
        wider = [t for t in found if t[4]]
        kept = sorted(
            narrower + wider[: max(0, SHARED_THEMES_SHOWN - len(narrower))],
            key=lambda t: (t[0], t[1]),
        )[:SHARED_THEMES_SHOWN]
        labels = self._context_labels
        return [
            SharedTheme(
                iri=text[0],
                label=text[1],
                property=text[2],
                property_label=text[3],
                weight=weight,
                shared_with=tuple(labels[h] for h in holders),
                broader=broader,
            )
            for _w, _label, _place, weight, broader, holders, text in kept
        ]

    # ----- connecting paths ------------------------------------------------------------

    def path(self, position: int) -> ConnectingPath | None:
        """The strongest recognisable chain to a seed (preferred) or a list entry."""
        work = self.index.works[position]
        targets = [self.index.works[i] for i in self.context]
        for finder in (self._direct_link, self._same_creator, self._creator_link, self._two_links):
            for target in targets:
                found = finder(work, target)
                if found is not None:
                    return found
        return None

    def _direct_link(self, work: str, target: str) -> ConnectingPath | None:
        for edge in self.index.work_links.get(work, ()):
            if {edge.source, edge.target} == {work, target}:
                return ConnectingPath((edge,), self._link_phrase(edge, work), target)
        return None

    def _same_creator(self, work: str, target: str) -> ConnectingPath | None:
        index = self.index
        theirs = dict(index.work_creators.get(target, ()))
        for creator, path in index.work_creators.get(work, ()):
            if creator in theirs:
                other_path = theirs[creator]
                name = index.label(creator)
                mine, its = self._role(path), self._role(other_path)
                if mine == its:
                    text = f"same {mine} as {quote(index.label(target))} ({name})"
                else:
                    text = f"its {mine}, {name}, is also the {its} of {quote(index.label(target))}"
                steps = (Edge(work, path, creator), Edge(target, other_path, creator))
                return ConnectingPath(steps, text, target)
        return None

    def _creator_link(self, work: str, target: str) -> ConnectingPath | None:
        index = self.index
        theirs = dict(index.work_creators.get(target, ()))
        for creator, path in index.work_creators.get(work, ()):
            for edge in index.creator_links.get(creator, ()):
                other = edge.target if edge.source == creator else edge.source
                if other not in theirs:
                    continue
                link = index.path_label(edge.path)
                mine = f"its {self._role(path)} {index.label(creator)}"
                other_text = (
                    f"{index.label(other)}, {self._role(theirs[other])} of "
                    f"{quote(index.label(target))}"
                )
                if edge.source == creator:
                    text = f"{mine} {_verb(link)} {other_text}"
                else:
                    text = f"{other_text}, {_verb(link)} {mine}"
                steps = (Edge(work, path, creator), edge, Edge(target, theirs[other], other))
                return ConnectingPath(steps, text, target)
        return None

    def _two_links(self, work: str, target: str) -> ConnectingPath | None:
        index = self.index
        for first in index.work_links.get(work, ()):
            middle = first.target if first.source == work else first.source
            if middle == target:
                continue
            for second in index.work_links.get(middle, ()):
                if {second.source, second.target} != {middle, target}:
                    continue
                opening = self._link_phrase(first, work)
                same_way = first.path == second.path and first.target == second.target == middle
                if same_way:
                    text = f"{opening}, as is {quote(index.label(target))}"
                else:
                    text = f"{opening}, which {self._relative_phrase(second, middle)}"
                return ConnectingPath((first, second), text, target)
        return None

    def _role_of(self, path: str) -> str:
        role = self._roles.get(path)
        if role is None:
            theme = self.index.profile.theme(path)
            role = self._roles[path] = theme.role if theme is not None else "other"
        return role

    def _role(self, path: str) -> str:
        return PROPERTY_WORDS.get(path) or self.index.path_label(path)

    def _link_word(self, path: str) -> str:
        return _LINK_WORDS.get(path) or self.index.path_label(path)

    def _link_phrase(self, edge: Edge, subject: str) -> str:
        """The link seen from ``subject``: "adapted from ‘X’" or "‘X’ is adapted from it"."""
        forward = edge.source == subject
        other = edge.target if forward else edge.source
        title = quote(self.index.label(other))
        word = self._link_word(edge.path)
        return f"{word} {title}" if forward else f"{title} is {word} it"

    def _relative_phrase(self, edge: Edge, subject: str) -> str:
        """The link as a relative clause about ``subject``: "is adapted from ‘X’" or
        "‘X’ is adapted from"."""
        forward = edge.source == subject
        other = edge.target if forward else edge.source
        title = quote(self.index.label(other))
        word = self._link_word(edge.path)
        return f"is {word} {title}" if forward else f"{title} is {word}"

    # ----- the sentence ----------------------------------------------------------------

    def rationale(
        self, position: int, themes: Sequence[SharedTheme], path: ConnectingPath | None
    ) -> str:
        """One sentence a curator could print under the entry."""
        clauses: list[str] = []
        if path is not None:
            clauses.append(path.text)
        named = [t for t in themes if self._role_of(t.property) in _THEME_ROLES_NAMED]
        subject_like = [t for t in named if not t.broader] or named
        if subject_like:
            names = join_words([t.label for t in subject_like[:3]])
            holders: list[str] = []
            for theme in subject_like[:3]:
                for holder in theme.shared_with:
                    if holder not in holders:
                        holders.append(holder)
            target = self.index.label(path.target) if path is not None else None
            if holders == [target]:
                with_whom = "it"
            else:
                with_whom = join_words([quote(h) for h in holders[:2]])
                if len(holders) > 2:
                    with_whom += f" and {len(holders) - 2} more"
            clauses.append(f"shares {names} with {with_whom}")
        if not clauses:
            return "Close to the seeds through a longer chain of shared themes and creators."
        sentence = ", and ".join(clauses) if len(clauses) == 2 else clauses[0]
        return sentence[0].upper() + sentence[1:] + "."


def _feature_words(index: Index) -> dict[int, tuple[str, str, str, str]]:
    """Per feature column, what a shared theme says of it (IRI, label, property and its
    label), worked out once per index: the same few features come back in every explanation.
    Kept on the index, which is never changed once built."""
    words = index.__dict__.get("_feature_words")
    if words is None:
        words = index.__dict__["_feature_words"] = {}
    return words


def _row_dict(matrix: sp.csr_matrix, row: int) -> dict[int, float]:
    start, end = matrix.indptr[row], matrix.indptr[row + 1]
    columns = matrix.indices[start:end].tolist()
    return dict(zip(columns, matrix.data[start:end].tolist(), strict=True))


def _verb(link_label: str) -> str:
    """A link's label as a verb: 'influenced by' is passive ('was influenced by'), 'collaborated
    with' is already active, and a bare noun ('teacher') becomes 'was teacher of'."""
    if link_label.endswith(" by"):
        return f"was {link_label}"
    if link_label.endswith((" with", " to", " of")):
        return link_label
    return f"was {link_label} of"

"""Choosing one readable label per thing, in the curator's language when the data allows.

Catalogues often carry a title in several languages, or none at all. We keep every candidate
and pick by the curator's language preference, then an untagged label, then any; a thing with no
label at all is shown by the readable tail of its IRI rather than the whole IRI.
"""

from __future__ import annotations

import re
import unicodedata
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from urllib.parse import unquote

_CAMEL = re.compile(r"(?<=[a-z0-9])(?=[A-Z])")
_APOSTROPHES = re.compile(r"['’ʼ`]")
_NOT_WORD = re.compile(r"[^\w]+")


@dataclass(frozen=True)
class LabelCandidate:
    """A label as found in the data: its text, language tag ('' if none) and rank of property."""

    text: str
    language: str
    property_rank: int


def iri_tail(iri: str) -> str:
    """A readable name from an IRI: its last segment, unescaped, with word breaks restored.

    >>> iri_tail("https://example.org/work/the-salt-road")
    'the salt road'
    >>> iri_tail("http://schema.org/contentLocation")
    'content location'
    """
    tail = re.split(r"[#/:]", iri.rstrip("/#"))[-1] or iri
    tail = unquote(tail)
    tail = _CAMEL.sub(" ", tail)
    tail = re.sub(r"[-_]+", " ", tail).strip()
    return tail.lower() if tail and not tail.isupper() else (tail or iri)


def language_matches(tag: str, wanted: str) -> bool:
    """True when ``tag`` is ``wanted`` or a regional form of it (``en-GB`` matches ``en``)."""
    tag, wanted = tag.lower(), wanted.lower()
    return tag == wanted or tag.startswith(wanted + "-")


def best_label(candidates: Sequence[LabelCandidate], languages: Sequence[str]) -> str | None:
    """The label a curator reading ``languages`` (most wanted first) would want to see.

    Order: the preferred property first; within it, the first wanted language, then an
    untagged label, then any language (alphabetically, so the choice is stable).
    """
    if not candidates:
        return None

    def key(c: LabelCandidate) -> tuple[int, int, str, str]:
        lang_rank = len(languages) + 1
        for i, wanted in enumerate(languages):
            if language_matches(c.language, wanted):
                lang_rank = i
                break
        else:
            if c.language == "":
                lang_rank = len(languages)
        return (c.property_rank, lang_rank, c.language, c.text)

    return min(candidates, key=key).text


def fold(text: str) -> str:
    """Text folded for matching: accents removed, case folded, punctuation as spaces.

    >>> fold("  L'Été  des Âmes! ")
    'lete des ames'
    """
    if text.isascii():
        # Nothing to decompose and no accents in ASCII, where case folding is lowering.
        stripped = text.lower()
    else:
        decomposed = unicodedata.normalize("NFKD", text)
        stripped = "".join(ch for ch in decomposed if not unicodedata.combining(ch))
        stripped = stripped.casefold()
    stripped = _APOSTROPHES.sub("", stripped)
    stripped = _NOT_WORD.sub(" ", stripped)
    return " ".join(stripped.split())


def join_words(words: Iterable[str], conjunction: str = "and") -> str:
    """'a', 'a and b', 'a, b and c' — for sentences a curator can print."""
    items = [w for w in words if w]
    if not items:
        return ""
    if len(items) == 1:
        return items[0]
    return ", ".join(items[:-1]) + f" {conjunction} " + items[-1]

"""Other versions of a work: a reading, an abridgement, a new edition of the same title.

Many catalogues describe an audiobook reading or a new edition as a work of its own, linked to
the original (``schema:isBasedOn``, ``bf:hasExpression``, ...). Suggested beside its original,
it is the same text in another format: a curator building a list of titles wants "Thessaly's
Heron" once, not three times. A linked work counts as another version when it shares a creator
with the work and one title begins with the other (common practice in cataloguing is to keep
the original title and add the version in brackets or after it); an adaptation by someone else
(a film of the novel) or a sequel with a title of its own stays a work of its own.
"""

from __future__ import annotations

from collections.abc import Sequence

from curator.core.index import Index, WorkRecord
from curator.core.labels import fold

#: Shortest folded title that may stand for a work's title in another version's.
MIN_TITLE_LENGTH = 3


def _titles(record: WorkRecord) -> set[str]:
    return {t for t in (fold(x).strip() for x in (record.label, *record.titles)) if t}


def _same_title(a: WorkRecord, b: WorkRecord) -> bool:
    for x in _titles(a):
        for y in _titles(b):
            shorter, longer = (x, y) if len(x) <= len(y) else (y, x)
            if len(shorter) >= MIN_TITLE_LENGTH and (
                longer == shorter or longer.startswith(shorter + " ")
            ):
                return True
    return False


def other_versions(index: Index, works: Sequence[int]) -> dict[int, int]:
    """Works (positions) that are other versions of one of ``works``, each with the one it is
    a version of; ``works`` themselves are left out."""
    anchors = set(works)
    found: dict[int, int] = {}
    for anchor in works:
        iri = index.works[anchor]
        record = index.records[anchor]
        creators = set(record.creators)
        if not creators:
            continue
        for edge in index.work_links.get(iri, ()):
            other = edge.target if edge.source == iri else edge.source
            position = index.position.get(other)
            if position is None or position in anchors or position in found:
                continue
            candidate = index.records[position]
            if creators & set(candidate.creators) and _same_title(record, candidate):
                found[position] = anchor
    return found

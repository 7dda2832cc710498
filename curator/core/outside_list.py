"""Matching a list made elsewhere (a spreadsheet, a typed list) to the works of the catalogue.

Each line names a work by IRI or title, optionally with creator and year. We match by IRI, then
by folded title (creator and year break ties), then by a near miss of the title (creator and
year again break ties). A line that matches nothing, or several works equally, is reported with
its line number instead of being guessed; no line is ever matched to two works.
"""

from __future__ import annotations

import csv
import difflib
import io
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

from curator.core.errors import CuratorError
from curator.core.files import read_utf8_text
from curator.core.index import Index
from curator.core.labels import fold

Outcome = Literal["matched", "unmatched", "ambiguous", "duplicate"]

#: Least title similarity (difflib ratio of folded titles) for a near miss.
NEAR_MISS = 0.8


class OutsideListError(CuratorError):
    """The file cannot be read as a list."""


@dataclass(frozen=True)
class ListLine:
    """One line of the outside list as written."""

    number: int
    title: str
    creator: str = ""
    year: int | None = None


@dataclass(frozen=True)
class LineMatch:
    line: ListLine
    outcome: Outcome
    position: int | None = None
    how: str = ""
    candidates: tuple[int, ...] = ()


@dataclass(frozen=True)
class MatchReport:
    lines: tuple[LineMatch, ...]

    @property
    def matched(self) -> list[int]:
        return [m.position for m in self.lines if m.outcome == "matched" and m.position is not None]

    @property
    def problems(self) -> list[LineMatch]:
        return [m for m in self.lines if m.outcome != "matched"]


def read_outside_list(path: Path) -> list[ListLine]:
    """Lines of a CSV (a header naming title or iri, and optionally creator and year) or of
    plain text (one title or IRI a line; ``#`` starts a comment).

    Raises:
        OutsideListError: unreadable, not UTF-8, or a CSV without a title or iri column.
    """
    text = read_utf8_text(
        Path(path), OutsideListError, "save the list as UTF-8 and import it again."
    )
    return parse_outside_list(
        text, csv_format=Path(path).suffix.lower() in (".csv", ".tsv"), source=str(path)
    )


def parse_outside_list(text: str, *, csv_format: bool, source: str = "<list>") -> list[ListLine]:
    if not csv_format:
        lines = []
        for number, raw in enumerate(text.splitlines(), start=1):
            title = raw.strip()
            if title and not title.startswith("#"):
                lines.append(ListLine(number, title))
        return lines
    first_line = text.splitlines()[0] if text.strip() else ""
    dialect = csv.excel_tab if "\t" in first_line else csv.excel
    reader = csv.reader(io.StringIO(text), dialect)
    try:
        rows = list(reader)
    except csv.Error as exc:  # a cell longer than the csv module allows, mainly
        raise OutsideListError(
            f"{source}, line {reader.line_num}: cannot be read as CSV ({exc})."
        ) from None
    if not rows:
        return []
    header = [fold(h) for h in rows[0]]

    def column(*names: str) -> int | None:
        return next((header.index(n) for n in names if n in header), None)

    title_col = column("title", "iri", "work", "name")
    if title_col is None:
        raise OutsideListError(f"{source}, line 1: the header needs a 'title' or 'iri' column.")
    creator_col = column("creator", "author", "director", "by")
    year_col = column("year", "date")
    lines = []
    for number, row in enumerate(rows[1:], start=2):
        if not row or title_col >= len(row) or not row[title_col].strip():
            continue
        year = None
        if year_col is not None and year_col < len(row):
            digits = "".join(ch for ch in row[year_col] if ch.isdigit())[:4]
            year = int(digits) if len(digits) == 4 else None
        has_creator = creator_col is not None and creator_col < len(row)
        creator = row[creator_col].strip() if has_creator else ""  # type: ignore[index]
        lines.append(ListLine(number, row[title_col].strip(), creator, year))
    return lines


def match_lines(index: Index, lines: Sequence[ListLine]) -> MatchReport:
    """Match every line; see the module docstring for the order of attempts."""
    titles: dict[str, list[int]] = {}
    variants: list[tuple[str, int]] = []
    for i, record in enumerate(index.records):
        for title in record.titles:
            folded = fold(title)
            titles.setdefault(folded, [])
            if i not in titles[folded]:
                titles[folded].append(i)
            variants.append((folded, i))
    used: dict[int, int] = {}
    results = []
    for line in lines:
        result = _match_one(index, line, titles, variants)
        if result.outcome == "matched" and result.position is not None:
            if result.position in used:
                result = LineMatch(
                    line, "duplicate", result.position, f"same work as line {used[result.position]}"
                )
            else:
                used[result.position] = line.number
        results.append(result)
    return MatchReport(tuple(results))


def _agreement(index: Index, position: int, line: ListLine) -> int:
    """How many of the line's creator and year agree with the work (0, 1 or 2)."""
    record = index.records[position]
    score = 0
    if line.year is not None and record.year == line.year:
        score += 1
    if line.creator:
        wanted = fold(line.creator)
        names = [fold(index.label(c)) for c in record.creators]
        if any(wanted == n or wanted in n or n.endswith(wanted) for n in names):
            score += 1
    return score


def _pick(index: Index, line: ListLine, positions: Sequence[int], how: str) -> LineMatch:
    if len(positions) == 1:
        return LineMatch(line, "matched", positions[0], how)
    scored = sorted(((_agreement(index, p, line), p) for p in positions), reverse=True)
    if scored[0][0] > scored[1][0]:
        return LineMatch(line, "matched", scored[0][1], how + ", told apart by creator/year")
    return LineMatch(line, "ambiguous", None, how, tuple(p for s, p in scored if s == scored[0][0]))


def _match_one(
    index: Index,
    line: ListLine,
    titles: dict[str, list[int]],
    variants: Sequence[tuple[str, int]],
) -> LineMatch:
    text = line.title.strip().strip("<>")
    if text in index.position:
        return LineMatch(line, "matched", index.position[text], "IRI")
    folded = fold(line.title)
    exact = titles.get(folded, [])
    if exact:
        return _pick(index, line, exact, "title")
    best: dict[int, float] = {}
    for variant, position in variants:
        matcher = difflib.SequenceMatcher(None, folded, variant, autojunk=False)
        if matcher.real_quick_ratio() < NEAR_MISS or matcher.quick_ratio() < NEAR_MISS:
            continue
        ratio = matcher.ratio()
        if ratio >= NEAR_MISS and ratio > best.get(position, 0.0):
            best[position] = ratio
    if not best:
        return LineMatch(line, "unmatched", None, "no title close enough")
    top = max(best.values())
    close = [p for p, r in best.items() if r >= top - 0.03]
    return _pick(index, line, close, f"near miss of the title ({top:.0%} alike)")

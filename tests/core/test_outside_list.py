"""Matching a list made elsewhere: misspelt titles find their works, the rest is reported."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from curator.core.outside_list import (
    ListLine,
    OutsideListError,
    match_lines,
    parse_outside_list,
    read_outside_list,
)

MIRROR = "https://hollinmere.example/work/the-mirror-of-gullstane"
HERON = "https://hollinmere.example/work/thessalys-heron"


def test_misspelt_titles_match_and_the_rest_is_reported(demo_workspace, tmp_path):
    index = demo_workspace.index
    path = tmp_path / "shelf.csv"
    path.write_text(
        "title,creator,year\n"
        "The Mirror of Gulstane,Haverleigh,1935\n"      # one letter dropped
        "thessalys heron,,\n"                           # no apostrophe, lower case
        "A Title Nobody Wrote,,\n"
        f"{HERON},,\n",                                 # the same work again, by IRI
        encoding="utf-8",
    )
    report = match_lines(index, read_outside_list(path))
    outcomes = [(m.line.number, m.outcome) for m in report.lines]
    assert outcomes == [(2, "matched"), (3, "matched"), (4, "unmatched"), (5, "duplicate")]
    assert [index.works[p] for p in report.matched] == [MIRROR, HERON]
    assert [m.line.number for m in report.problems] == [4, 5]


def test_creator_and_year_break_a_tie(dc_workspace):
    # the DC fixture has a book and a film both titled "The Lamp at Lanthe Bay"
    index = dc_workspace.index
    tie = parse_outside_list("The Lamp at Lanthe Bay\n", csv_format=False)
    [line] = match_lines(index, tie).lines
    assert line.outcome == "ambiguous" and len(line.candidates) == 2
    [by_year] = match_lines(index, [ListLine(1, "The Lamp at Lanthe Bay", year=1954)]).lines
    assert by_year.outcome == "matched"
    assert index.records[by_year.position].year == 1954


def test_plain_text_skips_comments_and_blank_lines():
    lines = parse_outside_list("# my shelf\n\nFirst\n  Second  \n", csv_format=False)
    assert [(line.number, line.title) for line in lines] == [(3, "First"), (4, "Second")]


def test_csv_without_a_title_column_is_refused():
    with pytest.raises(OutsideListError, match="line 1"):
        parse_outside_list("author,year\nX,1900\n", csv_format=True, source="x.csv")


@settings(max_examples=40, deadline=None)
@given(st.lists(st.text(min_size=1, max_size=30), min_size=1, max_size=8))
def test_no_line_is_matched_to_two_works(demo_workspace, titles):
    index = demo_workspace.index
    lines = [ListLine(i + 1, t) for i, t in enumerate(titles)]
    report = match_lines(index, lines)
    assert len(report.lines) == len(lines)
    for m in report.lines:
        assert (m.position is not None) == (m.outcome in ("matched", "duplicate"))
    assert len(report.matched) == len(set(report.matched))

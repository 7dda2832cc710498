"""Targets: met or not, and the gap in plain words; bad files name the field."""

from __future__ import annotations

import math

import pytest

from curator.core.audit import FacetReader, audit_list
from curator.core.targets import (
    Targets,
    TargetsError,
    audience_flags,
    check_targets,
    default_warnings,
)

FILMS = "https://hollinmere.example/vocab#Film"


def _films_and_books(index, films: int, others: int) -> list[int]:
    film_rows = [i for i, r in enumerate(index.records) if FILMS in r.kinds][:films]
    other_rows = [i for i, r in enumerate(index.records) if FILMS not in r.kinds][:others]
    return film_rows + other_rows


def test_min_share_gap_is_the_smallest_number_that_meets_it(demo_workspace):
    index = demo_workspace.index
    entries = _films_and_books(index, 2, 8)
    audit = audit_list(index, entries)
    targets = Targets.from_toml('[[require]]\nfacet = "kind"\nvalue = "Film"\nmin_share = 0.3\n')
    [result] = check_targets(index, audit, entries, targets)
    assert not result.met
    # by arithmetic: (2 + k) / (10 + k) >= 0.3  <=>  k >= 1/0.7 = 1.43, so k = 2
    assert result.gap == "2 more films needed"
    k = 2
    assert (2 + k) / (10 + k) >= 0.3 > (2 + k - 1) / (10 + k - 1)
    met = _films_and_books(index, 3, 7)
    [ok] = check_targets(index, audit_list(index, met), met, targets)
    assert ok.met and ok.gap == ""


def test_distinct_and_max_share_and_size(demo_workspace):
    index = demo_workspace.index
    entries = _films_and_books(index, 3, 3)
    audit = audit_list(index, entries)
    decades = len([v for v in audit.facet("decade").values if v.key != "unknown"])
    text = (
        "max_entries = 4\n"
        f"[[require]]\nfacet = \"decade\"\nmin_distinct = {decades + 2}\n"
        "[[require]]\nfacet = \"kind\"\nmax_share = 0.4\n"
    )
    results = check_targets(index, audit, entries, Targets.from_toml(text))
    by_description = {r.description: r for r in results}
    assert by_description["at most 4 entries"].gap == "2 entries over the limit"
    assert by_description[f"at least {decades + 2} different decades"].gap.startswith(
        "2 more decades needed"
    )
    kinds = audit.facet("kind")
    over = [v for v in kinds.values if v.count / 6 > 0.4]
    share_result = by_description["no one kind above 40% of entries"]
    assert share_result.met == (not over)
    for value in over:
        # by arithmetic: (c - r) / (6 - r) <= 0.4  <=>  r >= (c - 2.4) / 0.6
        remove = math.ceil((value.count - 0.4 * 6) / 0.6)
        assert f"remove {remove}" in share_result.gap


def test_branch_target_names_missing_themes(demo_workspace):
    index = demo_workspace.index
    entries = _films_and_books(index, 1, 1)
    audit = audit_list(index, entries)
    text = '[[require]]\nfacet = "subtheme"\nbranch = "Inner Life"\nmin_each = 1\n'
    [result] = check_targets(index, audit, entries, Targets.from_toml(text))
    children = {c for c, parents in index.parents.items()
                if any(index.label(p) == "Inner Life" for p in parents)}
    reader = FacetReader(index)
    covered = {t for e in entries for t in reader.values(e, "subtheme")}
    missing = children - covered
    assert result.met == (not missing)
    for child in missing:
        assert index.label(child) in result.gap


@pytest.mark.parametrize(
    ("text", "field"),
    [
        ("colour = 1\n", "colour"),
        ('[[require]]\nfacet = "mood"\nmin_distinct = 2\n', "facet"),
        ('[[require]]\nfacet = "kind"\nvalue = "Film"\nmin_share = 1.5\n', "min_share"),
        ('[[require]]\nfacet = "kind"\nvalue = "Film"\n', "sets no limit"),
        ('[[require]]\nfacet = "subtheme"\nmin_each = 1\n', "branch"),
        ("max_entries = 0\n", "max_entries"),
        ("[audience]\nallowed = 3\n", "audience.allowed"),
        ("not toml [", "not valid TOML"),
    ],
)
def test_bad_targets_name_the_field(text, field):
    with pytest.raises(TargetsError, match=field):
        Targets.from_toml(text, source="t.toml")


def test_default_warnings(demo_workspace):
    index = demo_workspace.index
    creator = index.records[0].creators[0]
    same = [i for i, r in enumerate(index.records) if creator in r.creators][:3]
    other = [i for i, r in enumerate(index.records) if creator not in r.creators][:3]
    warnings = default_warnings(audit_list(index, same + other))
    assert any(index.label(creator) in w for w in warnings)
    assert default_warnings(audit_list(index, same[:2])) == []


def test_audience_flags_missing_and_above(demo_workspace):
    index = demo_workspace.index
    missing = next(i for i, r in enumerate(index.records) if not r.audiences)
    adult = next(i for i, r in enumerate(index.records)
                 if any(index.label(a) == "Adults" for a in r.audiences))
    child = next(i for i, r in enumerate(index.records)
                 if any(index.label(a) == "Children" for a in r.audiences))
    flags = {f.iri: f.reason for f in audience_flags(index, [missing, adult, child], ["Children"])}
    assert flags[index.works[missing]] == "no audience recorded"
    assert "Adults" in flags[index.works[adult]]
    assert index.works[child] not in flags

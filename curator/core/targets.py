"""A curator's balance targets, read from a small TOML file, and whether a list meets them.

Example::

    max_entries = 20

    [[require]]
    facet = "kind"          # kind, decade, language, creator, theme, subtheme, audience, place
    value = "Film"          # a label or an IRI
    min_share = 0.3

    [[require]]
    facet = "decade"
    min_distinct = 4

    [[require]]
    facet = "creator"
    max_share = 0.15        # no single creator above 15 % of entries

    [[require]]
    facet = "subtheme"
    branch = "Nature and Landscape"   # every narrower theme of this broad theme ...
    min_each = 1                      # ... has at least one work

    [audience]
    allowed = ["Children"]  # entries with another audience, or none recorded, are flagged

Without a file, :func:`default_warnings` gives the checks a curator makes by habit (common
practice, not a published standard): no creator with a third of the list, not all one decade.
"""

from __future__ import annotations

import math
import tomllib
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from curator.core.audit import FACETS, UNKNOWN, FacetReader, ListAudit
from curator.core.errors import CuratorError
from curator.core.index import Index
from curator.core.labels import fold

SUITABILITY_NOTE = (
    "Audience data only helps: whether a work suits this audience is the curator's judgement "
    "under their institution's policy."
)


_PLURALS = {
    "kind": "kinds",
    "decade": "decades",
    "language": "languages",
    "creator": "creators",
    "theme": "broad themes",
    "subtheme": "themes",
    "audience": "audiences",
    "place": "places",
}


class TargetsError(CuratorError):
    """A targets file is malformed; the message names the field."""


@dataclass(frozen=True)
class Requirement:
    facet: str
    value: str | None = None
    min_share: float | None = None
    max_share: float | None = None
    min_count: int | None = None
    min_distinct: int | None = None
    branch: str | None = None
    min_each: int | None = None


@dataclass(frozen=True)
class Targets:
    requirements: tuple[Requirement, ...] = ()
    max_entries: int | None = None
    allowed_audiences: tuple[str, ...] = ()

    @classmethod
    def from_toml(cls, text: str, *, source: str = "<targets>") -> Targets:
        try:
            data = tomllib.loads(text)
        except tomllib.TOMLDecodeError as exc:
            raise TargetsError(f"{source}: not valid TOML ({exc}).") from None
        except RecursionError:
            raise TargetsError(f"{source}: not valid targets (nested too deeply).") from None
        return _targets_from(data, source)

    @classmethod
    def load(cls, path: Path) -> Targets:
        try:
            text = Path(path).read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError) as exc:
            raise TargetsError(f"{path}: cannot be read ({exc}).") from None
        return cls.from_toml(text, source=str(path))


@dataclass(frozen=True)
class TargetResult:
    """One target, met or not, with the gap in plain words."""

    description: str
    met: bool
    gap: str = ""


@dataclass(frozen=True)
class AudienceFlag:
    iri: str
    label: str
    reason: str


def _targets_from(data: Mapping[str, Any], source: str) -> Targets:
    unknown = sorted(set(data) - {"max_entries", "require", "audience"})
    if unknown:
        raise TargetsError(f"{source}: unknown field(s) {', '.join(unknown)}.")
    max_entries = data.get("max_entries")
    if max_entries is not None and (not isinstance(max_entries, int) or max_entries < 1):
        raise TargetsError(f"{source}: max_entries must be a whole number of 1 or more.")
    requirements = []
    allowed_keys = {f.name for f in Requirement.__dataclass_fields__.values()}
    for i, raw in enumerate(data.get("require", [])):
        where = f"{source}: require[{i}]"
        if not isinstance(raw, dict):
            raise TargetsError(f"{where} must be a table.")
        extra = sorted(set(raw) - allowed_keys)
        if extra:
            raise TargetsError(f"{where}: unknown field(s) {', '.join(extra)}.")
        facet = raw.get("facet")
        if facet not in FACETS:
            raise TargetsError(f"{where}.facet is {facet!r}; use one of {', '.join(FACETS)}.")
        for share in ("min_share", "max_share"):
            value = raw.get(share)
            if value is not None and (not isinstance(value, int | float) or not 0 <= value <= 1):
                raise TargetsError(f"{where}.{share} must be a share between 0 and 1.")
        for count in ("min_count", "min_distinct", "min_each"):
            value = raw.get(count)
            if value is not None and (not isinstance(value, int) or value < 0):
                raise TargetsError(f"{where}.{count} must be a whole number.")
        requirement = Requirement(**raw)
        if not any(
            getattr(requirement, k) is not None
            for k in ("min_share", "max_share", "min_count", "min_distinct", "min_each")
        ):
            raise TargetsError(f"{where} sets no limit (min_share, max_share, min_count, ...).")
        if (requirement.min_share is not None or requirement.min_count is not None) and not (
            requirement.value
        ):
            raise TargetsError(f"{where}: min_share and min_count need a value.")
        if requirement.min_each is not None and not requirement.branch:
            raise TargetsError(f"{where}: min_each needs a branch (a broad theme).")
        requirements.append(requirement)
    audience = data.get("audience", {})
    if not isinstance(audience, dict) or set(audience) - {"allowed"}:
        raise TargetsError(f"{source}: audience must be a table with an 'allowed' list.")
    allowed = audience.get("allowed", [])
    if not isinstance(allowed, list) or not all(isinstance(a, str) for a in allowed):
        raise TargetsError(f"{source}: audience.allowed must be a list of audience names.")
    return Targets(tuple(requirements), max_entries, tuple(allowed))


def _matches(index: Index, reader: FacetReader, key: str, wanted: str) -> bool:
    return key == wanted or fold(reader.label(key)) == fold(wanted)


def _noun(facet: str, value: str, n: int) -> str:
    """'film' / 'films', 'work by X', 'work about X' for gap sentences."""
    if facet == "kind":
        word = value.lower()
        return word if n == 1 else (word + "s" if not word.endswith("s") else word)
    preposition = {"creator": "by", "place": "set in", "language": "in", "decade": "from"}.get(
        facet, "on"
    )
    return f"{'work' if n == 1 else 'works'} {preposition} {value}"


def check_targets(
    index: Index, audit: ListAudit, entries: Sequence[int], targets: Targets
) -> list[TargetResult]:
    """Each target as met or not, with what would close the gap."""
    reader = FacetReader(index)
    results: list[TargetResult] = []
    n = audit.entries
    if targets.max_entries is not None:
        over = n - targets.max_entries
        results.append(
            TargetResult(
                f"at most {targets.max_entries} entries",
                over <= 0,
                f"{over} {'entry' if over == 1 else 'entries'} over the limit" if over > 0 else "",
            )
        )
    for req in targets.requirements:
        facet = audit.facet(req.facet)
        known = [v for v in facet.values if v.key != UNKNOWN]
        if req.value is not None:
            count = sum(v.count for v in known if _matches(index, reader, v.key, req.value))
            label = req.value
            if req.min_share is not None:
                need = (
                    max(0, math.ceil((req.min_share * n - count) / (1 - req.min_share) - 1e-9))
                    if req.min_share < 1
                    else (n - count)
                )
                results.append(
                    TargetResult(
                        f"at least {req.min_share:.0%} {_noun(req.facet, label, 2)}",
                        need == 0 and n > 0,
                        f"{need} more {_noun(req.facet, label, need)} needed" if need else "",
                    )
                )
            if req.min_count is not None:
                need = max(0, req.min_count - count)
                results.append(
                    TargetResult(
                        f"at least {req.min_count} {_noun(req.facet, label, req.min_count)}",
                        need == 0,
                        f"{need} more {_noun(req.facet, label, need)} needed" if need else "",
                    )
                )
            if req.max_share is not None and n:
                results.append(_max_share_result(req, label, count, n))
        elif req.max_share is not None:
            worst = [v for v in known if n and v.count / n > req.max_share + 1e-12]
            if worst:
                gaps = [_max_share_result(req, v.label, v.count, n).gap for v in worst]
                results.append(
                    TargetResult(
                        f"no one {req.facet} above {req.max_share:.0%} of entries",
                        False,
                        "; ".join(gaps),
                    )
                )
            else:
                results.append(
                    TargetResult(
                        f"no one {req.facet} above {req.max_share:.0%} of entries", True
                    )
                )
        if req.min_distinct is not None:
            have = len(known)
            need = max(0, req.min_distinct - have)
            results.append(
                TargetResult(
                    f"at least {req.min_distinct} different {_PLURALS[req.facet]}",
                    need == 0,
                    f"{need} more {_PLURALS[req.facet] if need > 1 else req.facet} needed "
                    f"(has {have})"
                    if need
                    else "",
                )
            )
        if req.min_each is not None and req.branch is not None:
            results.append(_branch_result(index, reader, entries, req))
    return results


def _max_share_result(req: Requirement, label: str, count: int, n: int) -> TargetResult:
    limit = req.max_share or 0.0
    description = f"at most {limit:.0%} {_noun(req.facet, label, 2)}"
    if count <= limit * n + 1e-9:
        return TargetResult(description, True)
    remove = math.ceil((count - limit * n) / (1 - limit) - 1e-9) if limit < 1 else 0
    add = math.ceil(count / limit - n - 1e-9) if limit > 0 else 0
    gap = f"{label} holds {count} of {n}: remove {remove} or add {add} by others"
    return TargetResult(description, False, gap)


def _branch_result(
    index: Index, reader: FacetReader, entries: Sequence[int], req: Requirement
) -> TargetResult:
    """Every narrower theme under the named broad theme has ``min_each`` works on the list."""
    branch = req.branch or ""
    tops = {
        key
        for key in {p for parents in index.parents.values() for p in parents} | set(index.parents)
        if fold(index.label(key)) == fold(branch) or key == branch
    }
    if not tops:
        return TargetResult(f"every theme under {branch}", False, f"no theme called {branch!r}")
    children = sorted(
        {child for child, parents in index.parents.items() if parents & tops},
        key=index.label,
    )
    counts = {c: 0 for c in children}
    for position in entries:
        for value in reader.values(position, "subtheme"):
            if value in counts:
                counts[value] += 1
    need = [c for c in children if counts[c] < (req.min_each or 0)]
    gap = "nothing yet on " + ", ".join(f"‘{index.label(c)}’" for c in need) if need else ""
    return TargetResult(f"at least {req.min_each} per theme under {branch}", not need, gap)


def default_warnings(audit: ListAudit) -> list[str]:
    """Warnings worth a look on any list of three or more entries."""
    warnings = []
    if audit.entries < 3:
        return warnings
    creator = audit.facet("creator").largest
    if creator is not None and creator.count * 3 >= audit.entries:
        warnings.append(
            f"{creator.label} holds {creator.count} of {audit.entries} entries (a third or more)."
        )
    decades = [v for v in audit.facet("decade").values if v.key != UNKNOWN]
    if len(decades) == 1:
        warnings.append(f"Every dated entry is from the {decades[0].label}.")
    kinds = [v for v in audit.facet("kind").values if v.key != UNKNOWN]
    if len(kinds) == 1 and audit.entries >= 5:
        warnings.append(f"Every entry is a {kinds[0].label.lower()}.")
    return warnings


def audience_flags(
    index: Index, entries: Sequence[int], allowed: Sequence[str]
) -> list[AudienceFlag]:
    """Entries whose audience is not among ``allowed`` or is not recorded at all."""
    if not allowed:
        return []
    wanted = {fold(a) for a in allowed}
    flags = []
    for position in entries:
        record = index.records[position]
        names = [index.label(a) for a in record.audiences]
        if not names:
            flags.append(AudienceFlag(record.iri, record.label, "no audience recorded"))
        elif not any(
            fold(n) in wanted or a in allowed for n, a in zip(names, record.audiences, strict=True)
        ):
            flags.append(AudienceFlag(record.iri, record.label, "audience: " + ", ".join(names)))
    return flags

"""The profile as a curator reads it: what counts as a work, a label, a theme, a link."""

from __future__ import annotations

from collections import Counter
from typing import Any

from curator.services.workspace import Workspace


def profile_to_json(workspace: Workspace) -> dict[str, Any]:
    index = workspace.index
    profile = workspace.profile
    kinds = Counter(k for r in index.records for k in r.kinds)
    values_per_path = Counter(f.path for f in index.features)

    def named(path: str) -> dict[str, str]:
        return {"path": path, "label": index.path_label(path.lstrip("^"))}

    return {
        "works": index.size,
        "triples": workspace.catalogue.triple_count,
        "work_classes": [
            {"iri": c, "label": index.label(c), "works": kinds.get(c, 0)}
            for c in profile.work_classes
        ],
        "label_properties": [named(p) for p in profile.label_properties],
        "languages": list(profile.languages),
        "instance_links": [named(p) for p in profile.instance_links],
        "themes": [
            {**named(t.path), "role": t.role, "weight": t.weight, "values": values_per_path[t.path]}
            for t in profile.themes
        ],
        "hierarchy": [named(p) for p in profile.hierarchy],
        "hierarchy_decay": profile.hierarchy_decay,
        "work_links": [{**named(link.path), "weight": link.weight} for link in profile.work_links],
        "creator_links": [
            {**named(link.path), "weight": link.weight} for link in profile.creator_links
        ],
        "facets": {
            "year": [named(p) for p in profile.year_properties],
            "language": [named(p) for p in profile.language_properties],
            "audience": [named(p) for p in profile.audience_properties],
            "kind": [named(c) for c in profile.work_classes],
            "creator": [named(t.path) for t in profile.themes_with_role("creator")],
            "place": [named(t.path) for t in profile.themes_with_role("place")],
        },
        "notes": list(profile.notes),
    }


def profile_lines(workspace: Workspace, width: int = 100) -> list[str]:
    """The profile as lines of text no wider than ``width``."""
    data = profile_to_json(workspace)
    lines = [f"{data['works']:,} works in {data['triples']:,} triples", ""]
    lines.append("Works are members of:")
    for c in data["work_classes"]:
        lines.append(f"  {c['label']:<28} {c['works']:>6} works  <{c['iri']}>")
    lines.append("Labels from: " + ", ".join(p["label"] for p in data["label_properties"]))
    lines.append("Label languages, most wanted first: " + ", ".join(data["languages"]))
    if data["instance_links"]:
        lines.append(
            "Instances folded into their works through: "
            + ", ".join(p["label"] for p in data["instance_links"])
        )
    lines += ["", f"{'Theme property':<24} {'role':<9} {'weight':>6} {'values':>7}  IRI"]
    for t in data["themes"]:
        lines.append(
            f"{t['label'][:24]:<24} {t['role']:<9} {t['weight']:>6.2f} {t['values']:>7}  "
            + " / ".join(f"<{p}>" for p in t["path"].split(" "))
        )
    lines.append("")
    hierarchy = ", ".join(p["label"] for p in data["hierarchy"]) or "none found"
    lines.append(f"Hierarchy: {hierarchy} (decay {data['hierarchy_decay']} per level)")
    lines.append(
        "Links between works: "
        + (", ".join(p["label"] for p in data["work_links"]) or "none found")
    )
    lines.append(
        "Links between creators: "
        + (", ".join(p["label"] for p in data["creator_links"]) or "none found")
    )
    facets = data["facets"]
    lines.append("Balance facets:")
    for name in ("kind", "year", "language", "creator", "audience", "place"):
        found = ", ".join(p["label"] for p in facets[name]) or "not in the data"
        lines.append(f"  {name:<9} {found}")
    lines += [f"Note: {n}" for n in data["notes"]]
    return [_clip(line, width) for line in lines]


def _clip(line: str, width: int) -> str:
    return line if len(line) <= width else line[: width - 1] + "…"

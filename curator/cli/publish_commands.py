"""``curator audit`` and ``curator export``: check a list's balance, publish it."""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path
from typing import Any

from curator.core.audit import ListAudit
from curator.core.export import EXPORT_FORMATS
from curator.core.publication import Publication
from curator.core.targets import Targets
from curator.services.publishing import export_publication, load_list, publication_for
from curator.services.workspace import Workspace


def add_parsers(commands: Any, catalogue_options: Any) -> None:
    a = commands.add_parser("audit", help="check a list's balance (a session or an outside list)")
    a.add_argument("list", type=Path, metavar="LIST", help="a .curator.json session, CSV or text")
    catalogue_options(a)
    a.add_argument("--targets", type=Path, metavar="FILE", help="balance targets (TOML)")
    a.add_argument("--json", action="store_true", help="print JSON instead of text")

    e = commands.add_parser("export", help="publish a list as HTML, Markdown, CSV, JSON-LD, ...")
    e.add_argument("list", type=Path, metavar="LIST", help="a .curator.json session, CSV or text")
    catalogue_options(e)
    e.add_argument("--to", required=True, choices=EXPORT_FORMATS, dest="fmt", help="format")
    e.add_argument("-o", "--output", required=True, type=Path, metavar="OUT", help="file to write")
    e.add_argument("--targets", type=Path, metavar="FILE", help="balance targets (TOML)")


def _prepare(
    workspace: Workspace, args: argparse.Namespace
) -> tuple[Publication, Any, Targets | None]:
    targets = Targets.load(args.targets) if args.targets else None
    loaded = load_list(workspace, args.list)
    return publication_for(workspace, loaded, targets), loaded, targets


def _problems(loaded: Any) -> list[str]:
    if loaded.report is None:
        return []
    lines = []
    for m in loaded.report.problems:
        detail = m.how
        if m.outcome == "ambiguous":
            detail = "could be several works"
        lines.append(f"line {m.line.number}: {m.outcome}: {m.line.title!r} ({detail})")
    return lines


def audit_to_json(publication: Publication, loaded: Any) -> dict[str, Any]:
    audit: ListAudit | None = publication.audit
    return {
        "title": publication.title,
        "entries": len(publication.entries),
        "facets": [
            {
                "facet": f.facet,
                "name": f.name,
                "values": [
                    {"key": v.key, "label": v.label, "count": v.count, "share": v.share}
                    for v in f.values
                ],
                "unknown": f.unknown,
                "shannon": f.diversity.shannon,
                "pielou": f.diversity.pielou,
                "effective_number": f.diversity.hill1,
                "gini_simpson": f.diversity.gini_simpson,
                "largest": None
                if f.largest is None
                else {"label": f.largest.label, "share": f.largest.share},
            }
            for f in (audit.facets if audit else ())
        ],
        "intra_list_diversity": audit.intra_list_diversity if audit else None,
        "seed_theme_coverage": audit.seed_theme_coverage if audit else None,
        "targets": [
            {"target": t.description, "met": t.met, "gap": t.gap} for t in publication.targets
        ],
        "warnings": list(publication.warnings),
        "audience_flags": [
            {"iri": e.iri, "title": e.title, "reason": e.audience_flag}
            for e in publication.entries
            if e.audience_flag
        ],
        "suitability_note": publication.suitability_note or None,
        "unmatched_lines": _problems(loaded),
    }


def audit_lines(publication: Publication, loaded: Any) -> list[str]:
    audit = publication.audit
    lines = [
        f"{publication.title}: {len(publication.entries)} entries",
        publication.introduction,
        "",
    ]
    if audit is not None:
        lines.append(
            f"{'Facet':<18} {'values':>6} {'H':>6} {'J':>5} {'exp H':>6} {'G-S':>5}  largest"
        )
        for f in audit.facets:
            d = f.diversity
            j = f"{d.pielou:.2f}" if d.pielou is not None else "  —"
            largest = f"{f.largest.label} {f.largest.share:.0%}" if f.largest else "—"
            unknown = f" (+{f.unknown} unknown)" if f.unknown else ""
            lines.append(
                f"{f.name:<18} {d.values:>6} {d.shannon:>6.3f} {j:>5} {d.hill1:>6.2f} "
                f"{d.gini_simpson:>5.2f}  {largest[:40]}{unknown}"
            )
        if audit.intra_list_diversity is not None:
            lines.append(
                f"Variety between entries (mean 1 - similarity): {audit.intra_list_diversity:.2f}"
            )
        if audit.seed_theme_coverage is not None:
            lines.append(
                f"Seed themes covered: {len(audit.covered_seed_themes)} of {len(audit.seed_themes)}"
            )
    for t in publication.targets:
        lines.append(
            f"[{'met' if t.met else 'NOT MET'}] {t.description}" + (f": {t.gap}" if t.gap else "")
        )
    lines += [f"Warning: {w}" for w in publication.warnings]
    lines += [
        f"Check suitability: {e.title} ({e.audience_flag})"
        for e in publication.entries
        if e.audience_flag
    ]
    if publication.suitability_note:
        lines.append(publication.suitability_note)
    lines += [f"Not matched: {p}" for p in _problems(loaded)]
    return lines


def run_audit(workspace: Workspace, args: argparse.Namespace) -> int:
    publication, loaded, _targets = _prepare(workspace, args)
    if args.json:
        json.dump(audit_to_json(publication, loaded), sys.stdout, ensure_ascii=False, indent=2)
        sys.stdout.write("\n")
    else:
        sys.stdout.write("\n".join(audit_lines(publication, loaded)) + "\n")
    return 0


def run_export(workspace: Workspace, args: argparse.Namespace) -> int:
    publication, loaded, targets = _prepare(workspace, args)
    export_publication(publication, args.fmt, args.output, targets)
    for problem in _problems(loaded):
        sys.stderr.write(f"curator: {args.list}: {problem}\n")
    sys.stdout.write(f"Wrote {args.output} ({len(publication.entries)} entries)\n")
    return 0

"""Suggesting by what a curator names (titles or IRIs), and the suggestions as plain data."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from curator.core.index import Index, WorkRecord
from curator.core.suggest import SuggestionResult, SuggestSettings
from curator.services.workspace import Workspace

if TYPE_CHECKING:
    from curator.services.endpoint import EndpointWorkspace


@dataclass(frozen=True)
class SuggestRequest:
    """Seeds, list and dismissals as the curator names them: titles or IRIs."""

    seeds: tuple[str, ...]
    settings: SuggestSettings = field(default_factory=SuggestSettings)
    list_items: tuple[str, ...] = ()
    dismissed: tuple[str, ...] = ()


def suggest(
    workspace: Workspace | EndpointWorkspace, request: SuggestRequest
) -> SuggestionResult:
    """Resolve every name, then suggest (on an endpoint, over the neighbourhood the endpoint
    picks; see :mod:`curator.services.endpoint`).

    Raises:
        SeedError: a name matches no work, or several equally.
        SettingsError: settings out of range, or a kind or property the catalogue lacks.
        EndpointError: the endpoint failed.
    """
    if not isinstance(workspace, Workspace):
        return workspace.suggest(request)
    finder = workspace.finder
    seeds = [finder.resolve(s) for s in request.seeds]
    list_items = [finder.resolve(s) for s in request.list_items]
    dismissed = [finder.resolve(s) for s in request.dismissed]
    settings = request.settings
    if settings.mode == "shared-count" and settings.shared_property:
        prop = settings.shared_property
        if not any(f.path == prop for f in workspace.index.features):
            from curator.core.baseline import property_incidence

            workspace.suggester.set_incidence(
                prop, property_incidence(workspace.catalogue, workspace.index, prop)
            )
    return workspace.suggester.suggest(
        seeds, settings, list_items=list_items, dismissed=dismissed
    )


def record_to_json(index: Index, record: WorkRecord) -> dict[str, Any]:
    return {
        "iri": record.iri,
        "label": record.label,
        "types": [{"iri": k, "label": index.label(k)} for k in record.kinds],
        "creators": [{"iri": c, "label": index.label(c)} for c in record.creators],
        "year": record.year,
        "languages": list(record.languages),
    }


def result_to_json(index: Index, result: SuggestionResult) -> dict[str, Any]:
    """The documented JSON shape of ``curator suggest --json``."""
    suggestions = []
    for s in result.suggestions:
        item = record_to_json(index, s.record)
        item.update(
            {
                "score": s.score,
                "relevance": s.relevance,
                "content": s.content,
                "graph": s.graph,
                "shared_themes": [
                    {
                        "iri": t.iri,
                        "label": t.label,
                        "property": t.property,
                        "property_label": t.property_label,
                        "weight": t.weight,
                        "shared_with": list(t.shared_with),
                        "broader": t.broader,
                    }
                    for t in s.shared_themes
                ],
                "path": s.path.text if s.path else None,
                "path_steps": [
                    {"from": e.source, "property": e.path, "to": e.target} for e in s.path.steps
                ]
                if s.path
                else [],
                "rationale": s.rationale,
            }
        )
        suggestions.append(item)
    return {
        "seeds": [record_to_json(index, r) for r in result.seeds],
        "settings": {
            "mode": result.settings.mode,
            "lambda": result.settings.lam,
            "limit": result.settings.limit,
        },
        "suggestions": suggestions,
        "notes": list(result.notes),
    }


def names_of(index: Index, positions: Sequence[int]) -> list[str]:
    return [index.records[p].label for p in positions]

"""Bar charts of a list's balance, drawn with matplotlib.

The same figure goes on a Qt canvas in the window and, as SVG, into the HTML export. Only
matplotlib's Figure API is used (no pyplot state), so it is safe off the GUI thread.
"""

from __future__ import annotations

import io
from collections.abc import Sequence

from matplotlib.figure import Figure

from curator.core.audit import ListAudit
from curator.core.targets import Requirement

#: Facets charted, in order; creators and themes show their most frequent values only.
CHARTED = ("kind", "decade", "language", "creator", "theme", "audience")
MOST_BARS = 8


def balance_figure(
    audit: ListAudit,
    requirements: Sequence[Requirement] = (),
    *,
    facets: Sequence[str] = CHARTED,
    width: float = 7.0,
) -> Figure:
    """One horizontal bar chart per facet (share of entries), dashed lines at share targets."""
    shown = [audit.facet(f) for f in facets if audit.facet(f).values]
    rows = max(1, (len(shown) + 1) // 2)
    figure = Figure(figsize=(width, 1.9 * rows), layout="constrained")
    for i, facet in enumerate(shown):
        axes = figure.add_subplot(rows, 2, i + 1)
        values = list(facet.values[:MOST_BARS])
        if facet.facet == "decade":
            values.sort(key=lambda v: (v.key == "unknown", v.label))
        labels = [_short(v.label) for v in values][::-1]
        shares = [v.share for v in values][::-1]
        bars = axes.barh(labels, shares, color="#6b8fb3")
        for bar, value in zip(bars, values[::-1], strict=True):
            if value.key == "unknown":
                bar.set_color("#b9b9b9")
        axes.set_xlim(0, 1)
        axes.set_title(facet.name, fontsize=9, loc="left")
        axes.tick_params(labelsize=7)
        axes.xaxis.set_major_formatter(lambda x, _pos: f"{x:.0%}")
        for requirement in requirements:
            if requirement.facet != facet.facet:
                continue
            for share in (requirement.min_share, requirement.max_share):
                if share is not None:
                    axes.axvline(share, color="#c0504d", linestyle="--", linewidth=1)
        for side in ("top", "right"):
            axes.spines[side].set_visible(False)
    return figure


def figure_svg(figure: Figure) -> str:
    """The figure as an SVG document (for inlining in HTML)."""
    buffer = io.StringIO()
    figure.savefig(buffer, format="svg")
    text = buffer.getvalue()
    start = text.find("<svg")
    return text[start:] if start >= 0 else text


def _short(label: str, width: int = 22) -> str:
    return label if len(label) <= width else label[: width - 1] + "…"

"""The list's balance as the Balance tab shows it: computed in a worker, and put into words.

Nothing here touches a Qt widget, because :func:`compute_balance` runs in the balance worker:
the audit itself is quick, but matplotlib needs about half a second to lay out and draw the
charts, which must not freeze the window. The charts are drawn here with matplotlib's Agg
renderer, in the palette's colours and at the panel's width, so the GUI thread only copies
finished pixels. The wording functions are plain too, so tests can read them without a window.
"""

from __future__ import annotations

import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from curator.core.audit import UNKNOWN, FacetAudit, ListAudit
from curator.core.publication import Publication
from curator.core.session import Session
from curator.core.targets import Requirement, TargetResult, Targets, TargetsError
from curator.services.publishing import from_session, publication_for
from curator.services.sessions import targets_of
from curator.services.workspace import Workspace

if TYPE_CHECKING:
    from matplotlib.figure import Figure

#: How many entries flagged for their audience are named before "and N more".
FLAGS_NAMED = 6
#: How many values tied for the largest share are named.
TIED_NAMED = 3


@dataclass(frozen=True)
class ChartStyle:
    """Size and colours for the charts, read from the panel on the GUI thread.

    ``dpi`` is the logical dots per inch at which matplotlib's point sizes should come out as
    large as the window's own text; ``pixel_ratio`` is the screen's device pixel ratio.
    """

    width: int
    pixel_ratio: float
    dpi: float
    background: str
    text: str
    quiet: str


@dataclass(frozen=True)
class DrawnChart:
    """A figure already drawn by the Agg renderer; ``key`` is (width, height, dpi) it was
    drawn at, so a canvas can tell when its pixels no longer fit."""

    figure: Figure
    renderer: Any
    key: tuple[float, float, float]
    style: ChartStyle

    @property
    def logical_size(self) -> tuple[int, int]:
        width, height, _dpi = self.key
        ratio = self.style.pixel_ratio or 1.0
        return round(width / ratio), round(height / ratio)


@dataclass(frozen=True)
class BalanceReport:
    """Everything the Balance tab shows for one state of the list."""

    publication: Publication
    targets: Targets | None
    #: Why the session's targets could not be read ("" when they could, or there are none).
    targets_error: str
    chart: DrawnChart | None
    seconds: float


def compute_balance(
    workspace: Workspace,
    session: Session,
    style: ChartStyle | None,
    stale: Callable[[], bool] = lambda: False,
) -> BalanceReport:
    """Audit ``session`` against its targets and draw the charts (skipped when ``stale()``
    says a newer request is waiting, or ``style`` is None).

    Bad targets do not stop the audit: it is made without them and the error is reported.
    """
    started = time.perf_counter()
    targets: Targets | None = None
    error = ""
    try:
        targets = targets_of(session.settings)
    except TargetsError as exc:
        error = str(exc)
    publication = publication_for(workspace, from_session(workspace, session), targets)
    chart = None
    if style is not None and publication.audit is not None and not stale():
        chart = draw_chart(publication.audit, targets.requirements if targets else (), style)
    return BalanceReport(publication, targets, error, chart, time.perf_counter() - started)


def draw_chart(
    audit: ListAudit, requirements: Sequence[Requirement], style: ChartStyle
) -> DrawnChart:
    """The engine's balance figure, recoloured from the palette and drawn at ``style``'s size."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    from curator.core.charts import balance_figure  # matplotlib loads slowly: only when needed

    figure = balance_figure(audit, requirements, width=max(style.width, 120) / style.dpi)
    figure.set_dpi(style.dpi * (style.pixel_ratio or 1.0))
    _recolour(figure, style)
    canvas = FigureCanvasAgg(figure)
    canvas.draw()
    width, height = figure.bbox.size
    return DrawnChart(figure, canvas.get_renderer(), (width, height, figure.dpi), style)


def _recolour(figure: Figure, style: ChartStyle) -> None:
    """Background and text from the palette; the bars keep the engine's colours."""
    from matplotlib.text import Text

    figure.set_facecolor(style.background)
    for axes in figure.axes:
        axes.set_facecolor(style.background)
        axes.tick_params(colors=style.quiet, labelcolor=style.text)
        for spine in axes.spines.values():
            spine.set_color(style.quiet)
    for text in figure.findobj(Text):  # the facet titles (left-aligned axes titles) among them
        text.set_color(style.text)


# ----- words ---------------------------------------------------------------------------------


def percent(share: float) -> str:
    return f"{share:.0%}"


def plural(count: int, one: str, many: str | None = None) -> str:
    return f"{count} {one if count == 1 else (many or one + 's')}"


def summary_line(publication: Publication) -> str:
    """How many entries, how different they are from each other, and seed theme coverage."""
    audit = publication.audit
    if audit is None:
        return ""
    parts = [plural(audit.entries, "entry", "entries")]
    if audit.intra_list_diversity is not None:
        parts.append(f"variety {audit.intra_list_diversity:.2f}")
    if audit.seed_themes:
        parts.append(
            f"{len(audit.covered_seed_themes)} of {len(audit.seed_themes)} starting themes covered"
        )
    return " · ".join(parts)


SUMMARY_TIP = (
    "Variety: how different the entries are from each other, the mean of 1 − cosine "
    "similarity over all pairs (Ziegler et al. 2005); 0 = all alike, 1 = nothing shared.\n"
    "Starting themes: the narrower themes of the starting titles that some entry shares."
)


def targets_verdict(results: Sequence[TargetResult]) -> str:
    """'3 of 5 met', 'all 4 met'."""
    met = sum(1 for r in results if r.met)
    if met == len(results):
        return f"all {len(results)} met" if len(results) > 1 else "met"
    return f"{met} of {len(results)} met"


@dataclass(frozen=True)
class FacetLine:
    """One facet in a line: its name and a sentence of figures."""

    facet: str
    name: str
    text: str


def facet_line(facet: FacetAudit) -> FacetLine:
    """Values, evenness (Pielou's J), the largest share and who holds it, and unknowns."""
    known = [v for v in facet.values if v.key != UNKNOWN]
    if not known:
        return FacetLine(facet.facet, facet.name, "not recorded for any entry")
    parts = [plural(len(known), "value")]
    evenness = facet.diversity.pielou
    if evenness is not None:
        parts.append(f"evenness {evenness:.2f}")
    largest = facet.largest
    text = ", ".join(parts)
    if largest is not None:
        holders = [v.label for v in known if v.count == largest.count]
        share = f"{largest.count} ({percent(largest.share)})"
        if len(known) == 1:
            text += f"; all {largest.label} ({largest.count})"
        elif len(holders) == 1:
            text += f"; largest {largest.label}, {share}"
        else:
            text += f"; largest {share} each, shared by {_names(holders)}"
    if facet.unknown:
        text += f"; unknown for {facet.unknown}"
    return FacetLine(facet.facet, facet.name, text)


def _names(labels: Sequence[str], named: int = TIED_NAMED) -> str:
    """'A, B and C', or 'A, B, C and 4 others'."""
    if len(labels) <= named:
        return labels[0] if len(labels) == 1 else ", ".join(labels[:-1]) + " and " + labels[-1]
    return ", ".join(labels[:named]) + f" and {len(labels) - named} others"


def audience_line(publication: Publication) -> str:
    """The entries flagged for their audience, named up to :data:`FLAGS_NAMED`."""
    flagged = [e for e in publication.entries if e.audience_flag]
    if not flagged:
        return ""
    named = "; ".join(f"‘{e.title}’ ({e.audience_flag})" for e in flagged[:FLAGS_NAMED])
    more = len(flagged) - FLAGS_NAMED
    tail = f"; and {more} more" if more > 0 else ""
    return f"Check for this audience: {named}{tail}."


def chart_png(audit: ListAudit, requirements: Sequence[Requirement], dpi: float) -> bytes:
    """The engine's balance figure in its own colours as PNG (for the export preview, which
    shows the page as it will print)."""
    import io

    from curator.core.charts import balance_figure

    buffer = io.BytesIO()
    balance_figure(audit, requirements).savefig(buffer, format="png", dpi=dpi)
    return buffer.getvalue()

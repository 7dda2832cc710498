"""The browse pane: what the catalogue says about a work, and the works that share a value.

It is how a curator checks a suggestion ("which other works are set in Gullstane?") and finds
more by hand. Pages are built from the browse service as HTML with numbered links, so IRIs never
have to survive URL parsing; colours come from the palette when the page is built. On an
endpoint, a work no suggestion has described is asked for (``details_wanted``) and shown when
the window hands the answer back (:meth:`BrowsePanel.show_details`), so the page never waits
on the network.
"""

from __future__ import annotations

import html
from dataclasses import dataclass

from PySide6.QtCore import Qt, QUrl, Signal
from PySide6.QtGui import QAction, QKeySequence, QPalette
from PySide6.QtWidgets import QHBoxLayout, QTextBrowser, QToolButton, QVBoxLayout, QWidget

from curator.core.errors import CuratorError
from curator.core.index import Index
from curator.gui.delegates import mix
from curator.gui.history import BrowseHistory
from curator.gui.style import heading
from curator.services.browse import (
    DetailRow,
    DetailValue,
    EntityDetails,
    WorkDetails,
    WorkSummary,
    entity_details,
    work_details,
)
from curator.services.endpoint import EndpointWorkspace
from curator.services.workspace import Workspace

#: How many works sharing a value the page lists.
WORKS_SHOWN = 60
#: How many works the endpoint described for Browse are kept for going back and forth.
DESCRIBED_KEPT = 40
ASKING = "Asking the endpoint about this work…"
ENDPOINT_NOTE = (
    "On an endpoint, Browse shows works; following a theme or a creator to every work that "
    "has it would read the whole catalogue, so values are not links here. The number after a "
    "value is how many works of the endpoint have it."
)


def endpoint_work_details(index: Index, iri: str, works_with: dict[tuple[str, str], int]) -> (
    WorkDetails
):
    """A work's page from what an endpoint described of it: every theme and link the index
    holds (creators among them, under their own property), with the endpoint-wide count of
    works sharing each."""
    record = index.record(iri)
    grouped: dict[str, list[DetailValue]] = {}
    for column in index.direct[index.position[iri]].indices:
        feature = index.features[column]
        shared = works_with.get((feature.path, feature.value), 0)
        label = index.label(feature.value) + (f" ({shared})" if shared > 1 else "")
        grouped.setdefault(index.path_label(feature.path), []).append(DetailValue(label, None, 0))
    rows = tuple(
        DetailRow(name, "", tuple(sorted(values, key=lambda d: d.label.casefold())))
        for name, values in sorted(grouped.items(), key=lambda kv: kv[0].casefold())
    )
    summary = WorkSummary(
        iri=iri,
        title=record.label,
        creators=", ".join(index.label(c) for c in record.creators[:2]),
        year=record.year,
        kind=index.label(record.kinds[0]) if record.kinds else "",
    )
    return WorkDetails(summary, rows)


@dataclass(frozen=True)
class Link:
    """What a numbered link in the page does: open a page, or add a work somewhere."""

    action: str  # "open", "add", "seed", "retry" (ask the endpoint again)
    iri: str


class BrowsePanel(QWidget):
    """Shows one work or entity; emits ``add_requested`` and ``seed_requested`` with an IRI."""

    add_requested = Signal(str)
    seed_requested = Signal(str)
    #: On an endpoint: describe this work (answer with :meth:`show_details`).
    details_wanted = Signal(str)

    def __init__(self, parent: QWidget | None = None, *, in_tab: bool = False) -> None:
        """``in_tab``: no heading of its own (the tab carries the name)."""
        super().__init__(parent)
        self._workspace: Workspace | EndpointWorkspace | None = None
        self.history = BrowseHistory()
        self._links: list[Link] = []
        #: On an endpoint: works it described for this pane, the one being asked about, and
        #: the last failure (shown once, with a link that asks again).
        self._described: dict[str, Index] = {}
        self._asking: str | None = None
        self._failure: tuple[str, str] | None = None

        self.page = QTextBrowser()
        self.page.setOpenLinks(False)
        self.page.setAccessibleName("Browse the catalogue")
        self.page.anchorClicked.connect(self._clicked)

        self.back_action = QAction("&Back", self)
        self.back_action.setShortcut(QKeySequence("Alt+Left"))
        self.back_action.setToolTip("Back to what you looked at before (Alt+Left)")
        self.back_action.triggered.connect(self.back)
        self.forward_action = QAction("&Forward", self)
        self.forward_action.setShortcut(QKeySequence("Alt+Right"))
        self.forward_action.setToolTip("Forward again (Alt+Right)")
        self.forward_action.triggered.connect(self.forward)
        for action in (self.back_action, self.forward_action):
            action.setShortcutContext(Qt.ShortcutContext.WindowShortcut)
            self.addAction(action)

        self.navigation = QWidget()
        buttons = QHBoxLayout(self.navigation)
        buttons.setContentsMargins(0, 0, 0, 0)
        for action, text in ((self.back_action, "‹ Back"), (self.forward_action, "Forward ›")):
            button = QToolButton()
            action.setIconText(text)  # what a button shows; menus keep the full text
            button.setDefaultAction(action)
            button.setAutoRaise(True)
            buttons.addWidget(button)
        header = QHBoxLayout()
        if not in_tab:
            title = heading("B&rowse")
            title.setBuddy(self.page)
            header.addWidget(title)
        header.addStretch(1)
        header.addWidget(self.navigation)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addLayout(header)
        layout.addWidget(self.page, 1)
        self._render()

    # ----- navigation ------------------------------------------------------------------

    def set_workspace(self, workspace: Workspace | EndpointWorkspace | None) -> None:
        self._workspace = workspace
        self.history.clear()
        self._described, self._asking, self._failure = {}, None, None
        self._render()

    @property
    def asking(self) -> bool:
        """The endpoint is being asked about the work on the page."""
        return self._asking is not None

    def show_details(self, iri: str, index: Index | None, error: str | None = None) -> None:
        """The endpoint's description of ``iri`` (an index holding it), or why there is none."""
        if iri != self._asking:
            return
        self._asking = None
        if index is not None and iri in index.position:
            self._described[iri] = index
            while len(self._described) > DESCRIBED_KEPT:
                del self._described[next(iter(self._described))]
        else:
            self._failure = (iri, error or f"<{iri}> is not a work of this catalogue.")
        if self.history.current == iri:
            self._render()

    def show_iri(self, iri: str) -> None:
        """Open ``iri`` (a work or any linked thing) as a new step in the trail."""
        if self.history.visit(iri):
            self._render()

    def back(self) -> None:
        self.history.back()
        self._render()

    def forward(self) -> None:
        self.history.forward()
        self._render()

    def _clicked(self, url: QUrl) -> None:
        text = url.toString()
        if not text.startswith("link:"):
            return
        number = int(text.removeprefix("link:"))
        if not 0 <= number < len(self._links):
            return
        link = self._links[number]
        if link.action == "add":
            self.add_requested.emit(link.iri)
        elif link.action == "seed":
            self.seed_requested.emit(link.iri)
        elif link.action == "retry":
            self._render()
        else:
            self.show_iri(link.iri)

    # ----- pages ---------------------------------------------------------------------------

    def _link(self, action: str, iri: str, text: str) -> str:
        self._links.append(Link(action, iri))
        return f"<a href='link:{len(self._links) - 1}'>{html.escape(text)}</a>"

    def _quiet(self) -> str:
        palette = self.page.palette()
        text = palette.color(QPalette.ColorRole.Text)
        base = palette.color(QPalette.ColorRole.Base)
        return mix(text, base, 0.62).name()

    def _render(self) -> None:
        self.back_action.setEnabled(self.history.can_go_back)
        self.forward_action.setEnabled(self.history.can_go_forward)
        self._links = []
        iri = self.history.current
        workspace = self._workspace
        if workspace is None or iri is None:
            self.page.setHtml(
                "<p>Select a candidate, a starting title or a list entry to see what the "
                "catalogue says about it. Themes, creators and places are links: follow one "
                "to see every work that shares it.</p>"
            )
            return
        if isinstance(workspace, EndpointWorkspace):
            self.page.setHtml(self._endpoint_page(workspace, iri))
            return
        try:
            if iri in workspace.index.position:
                self.page.setHtml(self._work_page(work_details(workspace, iri)))
            else:
                self.page.setHtml(self._entity_page(entity_details(workspace, iri)))
        except CuratorError as exc:
            self.page.setHtml(f"<p>{html.escape(str(exc))}</p>")

    def _endpoint_page(self, workspace: EndpointWorkspace, iri: str) -> str:
        """A work as the latest suggestion described it, or as the endpoint described it for
        this pane; otherwise the endpoint is asked (in the window's worker) and the page says
        so until the answer comes."""
        note = f"<p style='color:{self._quiet()}'>{html.escape(ENDPOINT_NOTE)}</p>"
        index = workspace.index
        if index is None or iri not in index.position:
            index = self._described.get(iri)
        if index is None:
            if self._failure is not None and self._failure[0] == iri:
                message = self._failure[1]
                self._failure = None
                return (
                    "<p>The endpoint could not describe this work:</p>"
                    f"<p>{html.escape(message)}</p>"
                    f"<p>{self._link('retry', iri, 'Ask again')}</p>"
                )
            if self._asking != iri:
                self._asking = iri
                self.details_wanted.emit(iri)
            return f"<p style='color:{self._quiet()}'>{html.escape(ASKING)}</p>"
        details = endpoint_work_details(index, iri, workspace.frequencies.works_with)
        return self._work_page(details) + note

    def _actions(self, iri: str) -> str:
        return (
            self._link("add", iri, "Add to list")
            + " &nbsp;·&nbsp; "
            + self._link("seed", iri, "Use as starting title")
        )

    def _value(self, value: DetailValue) -> str:
        if value.iri is None:
            return html.escape(value.label)
        link = self._link("open", value.iri, value.label)
        if value.works_sharing > 1:
            return f"{link} <span style='color:{self._quiet()}'>({value.works_sharing})</span>"
        return link

    def _work_page(self, details: WorkDetails) -> str:
        summary = details.summary
        quiet = self._quiet()
        byline = " · ".join(
            p for p in (summary.creators, str(summary.year or ""), summary.kind) if p
        )
        # Flowing lines rather than a table: they stay readable in a narrow column.
        rows = "".join(
            f"<p style='margin:3px 0 0 0'><span style='color:{quiet}'>"
            f"{html.escape(row.property_label)}</span>&nbsp;&nbsp;"
            f"{', '.join(self._value(v) for v in row.values)}</p>"
            for row in details.rows
        )
        return (
            f"<p style='margin:0'><b>{html.escape(summary.title)}</b></p>"
            f"<p style='margin:0; color:{quiet}'>{html.escape(byline)}</p>"
            f"<p style='margin:4px 0'>{self._actions(summary.iri)}</p>"
            f"{rows}"
        )

    def _work_line(self, work: WorkSummary) -> str:
        quiet = self._quiet()
        byline = " · ".join(p for p in (work.creators, str(work.year or "")) if p)
        return (
            f"<li>{self._link('open', work.iri, work.title)}"
            f" <span style='color:{quiet}'>{html.escape(byline)}</span><br>"
            f"{self._link('add', work.iri, 'add')} · {self._link('seed', work.iri, 'start from')}"
            "</li>"
        )

    def _entity_page(self, details: EntityDetails) -> str:
        quiet = self._quiet()
        kinds = ", ".join(details.kinds)
        parts = [f"<p style='margin:0'><b>{html.escape(details.label)}</b></p>"]
        if kinds:
            parts.append(f"<p style='margin:0; color:{quiet}'>{html.escape(kinds)}</p>")
        if details.broader:
            parts.append(
                "<p style='margin:4px 0'>Broader: "
                + ", ".join(self._value(v) for v in details.broader)
                + "</p>"
            )
        count = len(details.works)
        parts.append(
            f"<p style='margin:4px 0'>{count} work{'s' if count != 1 else ''} in the catalogue:</p>"
        )
        parts.append(
            "<ul style='margin-left:0; -qt-list-indent:1'>"
            + "".join(self._work_line(w) for w in details.works[:WORKS_SHOWN])
            + "</ul>"
        )
        if count > WORKS_SHOWN:
            parts.append(f"<p style='color:{quiet}'>and {count - WORKS_SHOWN} more.</p>")
        return "".join(parts)

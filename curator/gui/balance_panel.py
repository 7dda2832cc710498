"""The Balance tab: whether the list meets its targets, what is worth a look, charts per facet.

It only shows :class:`~curator.gui.balance.BalanceReport`s and asks for new ones: the window
computes them in the balance worker after the list changes (debounced) and while the tab is
visible. The panel asks again when it is shown or its width changes, since the charts are drawn
at the width they are shown at. Every text from the data is escaped before it goes into rich text.
"""

from __future__ import annotations

import html
from typing import TYPE_CHECKING

from PySide6.QtCore import Qt, QTimer, Signal
from PySide6.QtGui import QPalette, QResizeEvent, QShowEvent
from PySide6.QtWidgets import (
    QFrame,
    QHBoxLayout,
    QLabel,
    QScrollArea,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from curator.gui.balance import (
    SUMMARY_TIP,
    BalanceReport,
    ChartStyle,
    audience_line,
    facet_line,
    summary_line,
    targets_verdict,
)
from curator.gui.delegates import mix
from curator.gui.style import quiet

if TYPE_CHECKING:
    from curator.gui.chart_canvas import ChartCanvas

#: The charts' axis labels are drawn at this many points (curator.core.charts); the panel
#: scales the chart's dpi so that they come out a little smaller than the window's own text
#: (by LABEL_SCALE), which keeps them readable at any font size and scaling.
CHART_LABEL_POINTS = 7.0
LABEL_SCALE = 0.92
#: A redrawn chart is asked for once the width has settled this long.
RESIZE_SETTLE_MS = 200
#: "Updating…" shows only when an answer takes longer than this.
PENDING_SHOWN_AFTER_MS = 300
#: Width changes smaller than this many pixels keep the chart as it is.
WIDTH_SLACK = 6

MARK_MET = "✓"
MARK_UNMET = "✗"

NO_CATALOGUE = "Open a catalogue to see how the list is balanced."
EMPTY_LIST = (
    "Nothing on the list yet. As works go on it, this shows how they spread over kinds, "
    "decades, languages, creators and themes, and which of your targets are met."
)
NO_TARGETS = (
    "None set. Targets say what the list should hold (a share of films, several decades, no "
    "creator above a limit) and are checked here as the list grows."
)
EVENNESS_TIP = (
    "Evenness is Pielou's J (Pielou 1966): 1 when the entries spread equally over the values, "
    "near 0 when one value holds nearly all. “Unknown” counts entries the catalogue says "
    "nothing about for that facet."
)


def _label(tip: str = "") -> QLabel:
    label = QLabel()
    label.setTextFormat(Qt.TextFormat.RichText)
    label.setWordWrap(True)
    label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
    label.setAlignment(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignTop)
    if tip:
        label.setToolTip(tip)
    return label


class BalancePanel(QWidget):
    """Emits ``refresh_wanted`` when shown or resized, ``edit_targets_requested`` for the editor."""

    refresh_wanted = Signal()
    edit_targets_requested = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.report: BalanceReport | None = None
        self._canvas: ChartCanvas | None = None  # made when the first chart arrives

        self.summary = quiet()
        self.summary.setAccessibleName("Balance summary")
        self.summary.setToolTip(SUMMARY_TIP)
        self.targets_button = QToolButton()
        self.targets_button.setText("Targets…")
        self.targets_button.setAutoRaise(True)
        self.targets_button.setToolTip("Say what balance this list should have (Ctrl+T)")
        self.targets_button.clicked.connect(self.edit_targets_requested)

        self.intro = _label()
        self.targets = _label()
        self.targets.setAccessibleName("Targets")
        self.notes = _label()
        self.notes.setAccessibleName("Worth a look")
        self.facets = _label(EVENNESS_TIP)
        self.facets.setAccessibleName("Facet by facet")

        self.content = QWidget()
        self.content.setBackgroundRole(QPalette.ColorRole.Base)
        self._column = QVBoxLayout(self.content)
        spacing = self.fontMetrics().lineSpacing() // 2
        self._column.setSpacing(spacing)
        margin = self.fontMetrics().averageCharWidth()
        self._column.setContentsMargins(margin, margin, margin, margin)
        for widget in (self.intro, self.targets, self.notes, self.facets):
            self._column.addWidget(widget)
        self._column.addStretch(1)

        self.scroll = QScrollArea()
        self.scroll.setWidget(self.content)
        self.scroll.setWidgetResizable(True)
        self.scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)
        self.scroll.setBackgroundRole(QPalette.ColorRole.Base)
        self.scroll.setFrameShape(QFrame.Shape.StyledPanel)
        self.scroll.setAccessibleName("The list's balance")

        header = QHBoxLayout()
        header.addWidget(self.summary, 1)
        header.addWidget(self.targets_button, 0, Qt.AlignmentFlag.AlignTop)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addLayout(header)
        layout.addWidget(self.scroll, 1)

        self._settle = QTimer(self)
        self._settle.setSingleShot(True)
        self._settle.setInterval(RESIZE_SETTLE_MS)
        self._settle.timeout.connect(self._resized)
        self._pending = QTimer(self)
        self._pending.setSingleShot(True)
        self._pending.setInterval(PENDING_SHOWN_AFTER_MS)
        self._pending.timeout.connect(lambda: self.summary.setText("Updating…"))
        self.show_nothing(NO_CATALOGUE)

    # ----- what the window asks for ---------------------------------------------------------

    def chart_style(self) -> ChartStyle:
        """The size and colours for charts that fill the panel's width in its palette."""
        palette = self.content.palette()
        margins = self._column.contentsMargins()
        reserve = self.scroll.verticalScrollBar().sizeHint().width() + 2 * self.scroll.frameWidth()
        width = self.scroll.width() - reserve - margins.left() - margins.right()
        screen = self.screen()
        dpi = screen.logicalDotsPerInch() if screen is not None else 96.0
        points = self.font().pointSizeF()
        if points > 0:
            dpi *= max(1.0, points * LABEL_SCALE / CHART_LABEL_POINTS)
        text = palette.color(QPalette.ColorRole.Text)
        base = palette.color(QPalette.ColorRole.Base)
        return ChartStyle(
            width=max(width, 120),
            pixel_ratio=self.devicePixelRatioF() or 1.0,
            dpi=dpi,
            background=base.name(),
            text=text.name(),
            quiet=mix(text, base, 0.55).name(),
        )

    def needs_chart(self) -> bool:
        """True when no chart is shown for a non-empty list, or it was drawn for another width."""
        report = self.report
        if report is None or report.publication.audit is None:
            return False
        if report.chart is None:
            return True
        return abs(report.chart.style.width - self.chart_style().width) > WIDTH_SLACK

    def set_pending(self) -> None:
        """A new report is being computed: say so if it takes a while."""
        self._pending.start()

    # ----- showing -------------------------------------------------------------------------------

    def _quiet_colour(self) -> str:
        palette = self.content.palette()
        return mix(
            palette.color(QPalette.ColorRole.Text), palette.color(QPalette.ColorRole.Base), 0.6
        ).name()

    def show_nothing(self, message: str) -> None:
        """No catalogue, or an error: one sentence and nothing else."""
        self._pending.stop()
        self.report = None
        self.summary.setText("")
        self.intro.setText(f"<p>{html.escape(message)}</p>")
        for label in (self.targets, self.notes, self.facets):
            label.clear()
            label.setVisible(False)
        self._show_chart(None)

    def show_report(self, report: BalanceReport) -> None:
        self._pending.stop()
        self.report = report
        publication = report.publication
        e = html.escape
        quiet_colour = self._quiet_colour()
        self.summary.setText(summary_line(publication))
        if publication.audit is None:
            self.intro.setText(f"<p>{e(EMPTY_LIST)}</p>")
        else:
            self.intro.setText(f"<p style='margin:0'><i>{e(publication.introduction)}</i></p>")
        self.targets.setText(self._targets_html(report, quiet_colour))
        self.targets.setVisible(True)
        notes = self._notes_html(report, quiet_colour)
        self.notes.setText(notes)
        self.notes.setVisible(bool(notes))
        facets = self._facets_html(report, quiet_colour)
        self.facets.setText(facets)
        self.facets.setVisible(bool(facets))
        self._show_chart(report)

    def _targets_html(self, report: BalanceReport, quiet_colour: str) -> str:
        e = html.escape
        results = report.publication.targets
        head = "<p style='margin:0 0 2px 0'><b>Targets</b>"
        if report.targets_error:
            return (
                f"{head}</p><p style='margin:0'>These targets could not be read, so none are "
                f"checked: {e(report.targets_error)}</p>"
            )
        if report.targets is None:
            return f"{head}</p><p style='margin:0; color:{quiet_colour}'>{e(NO_TARGETS)}</p>"
        if report.publication.audit is None:
            return (
                f"{head}</p><p style='margin:0; color:{quiet_colour}'>They are checked once the "
                "list has entries.</p>"
            )
        rows = []
        for result in results:
            mark = MARK_MET if result.met else MARK_UNMET
            text = e(result.description) if result.met else f"<b>{e(result.description)}</b>"
            gap = (
                f"<br><span style='color:{quiet_colour}'>{e(result.gap)}</span>"
                if result.gap
                else ""
            )
            rows.append(
                f"<tr><td valign='top' style='padding-right:6px'>{mark}</td>"
                f"<td valign='top'>{text}{gap}</td></tr>"
            )
        verdict = f" &nbsp;<span style='color:{quiet_colour}'>{e(targets_verdict(results))}</span>"
        return f"{head}{verdict if results else ''}</p><table cellspacing='0' cellpadding='1'>" + (
            "".join(rows) + "</table>"
        )

    def _notes_html(self, report: BalanceReport, quiet_colour: str) -> str:
        e = html.escape
        publication = report.publication
        lines = [e(w) for w in publication.warnings]
        flags = audience_line(publication)
        if flags:
            lines.append(e(flags))
        if not lines:
            return ""
        items = "".join(f"<li>{line}</li>" for line in lines)
        note = (
            f"<p style='margin:2px 0 0 0; color:{quiet_colour}'><i>"
            f"{e(publication.suitability_note)}</i></p>"
            if publication.suitability_note and flags
            else ""
        )
        return (
            "<p style='margin:0 0 2px 0'><b>Worth a look</b></p>"
            f"<ul style='margin:0; -qt-list-indent:1'>{items}</ul>{note}"
        )

    def _facets_html(self, report: BalanceReport, quiet_colour: str) -> str:
        audit = report.publication.audit
        if audit is None:
            return ""
        e = html.escape
        rows = "".join(
            f"<tr><td valign='top' style='padding-right:8px; color:{quiet_colour}'>"
            f"{e(line.name)}</td><td valign='top'>{e(line.text)}</td></tr>"
            for line in (facet_line(f) for f in audit.facets)
        )
        return (
            "<p style='margin:0 0 2px 0'><b>Facet by facet</b></p>"
            f"<table cellspacing='0' cellpadding='1'>{rows}</table>"
        )

    def _show_chart(self, report: BalanceReport | None) -> None:
        chart = report.chart if report is not None else None
        if chart is None:
            if self._canvas is not None and (report is None or report.publication.audit is None):
                self._canvas.setVisible(False)
            return
        if self._canvas is None:
            from curator.gui.chart_canvas import ChartCanvas  # imports matplotlib's Qt backend

            canvas = ChartCanvas(self.content)
            canvas.redraw_wanted.connect(self._settle.start)
            self._column.insertWidget(self._column.indexOf(self.facets), canvas)
            self._canvas = canvas
        self._canvas.adopt(chart)

    @property
    def canvas(self) -> ChartCanvas | None:
        """The chart canvas, or None before the first chart."""
        return self._canvas

    # ----- asking again ----------------------------------------------------------------------

    def showEvent(self, event: QShowEvent) -> None:
        super().showEvent(event)
        self.refresh_wanted.emit()

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        if event.oldSize().width() != event.size().width():
            self._settle.start()

    def _resized(self) -> None:
        if self.isVisible() and self.needs_chart():
            self.refresh_wanted.emit()

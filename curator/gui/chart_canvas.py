"""A matplotlib Qt canvas that shows charts drawn in the balance worker, never drawing itself.

``FigureCanvasQTAgg`` normally renders its figure in ``paintEvent`` and again on every resize;
for the balance charts that costs about half a second of the GUI thread each time. Here the
worker draws the figure with the Agg renderer (:func:`curator.gui.balance.draw_chart`) and the
canvas adopts the figure with its finished renderer, so painting is a copy of pixels. When the
canvas would need a new drawing (a resize, another screen) it emits ``redraw_wanted`` instead.
This module imports matplotlib, so it is imported only when the first chart arrives.
"""

from __future__ import annotations

from typing import Any

from matplotlib.backends.backend_qtagg import FigureCanvasQTAgg
from matplotlib.figure import Figure
from PySide6.QtCore import Signal
from PySide6.QtGui import QResizeEvent
from PySide6.QtWidgets import QSizePolicy, QWidget

from curator.gui.balance import DrawnChart


class ChartCanvas(FigureCanvasQTAgg):
    """Shows one :class:`DrawnChart` at its own size; asks for a new one rather than drawing."""

    redraw_wanted = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(Figure(figsize=(1, 1)))
        if parent is not None:
            self.setParent(parent)
        self.drawn: DrawnChart | None = None
        self.setSizePolicy(QSizePolicy.Policy.Fixed, QSizePolicy.Policy.Fixed)
        self.setAccessibleName("Balance charts")
        self.setVisible(False)

    def adopt(self, chart: DrawnChart) -> None:
        """Show ``chart``: take over its figure and the renderer that holds its pixels."""
        self.drawn = chart
        self.figure = chart.figure
        chart.figure.set_canvas(self)
        self.renderer = chart.renderer
        width, height = chart.logical_size
        self.setFixedSize(width, height)
        self.setVisible(True)
        self.update()

    def _fits(self) -> bool:
        if self.drawn is None:
            return False
        width, height = self.figure.bbox.size
        return (width, height, self.figure.dpi) == self.drawn.key

    def get_renderer(self) -> Any:
        """The worker's renderer while it fits the figure; else a blank one until a new
        drawing arrives (matplotlib changes the dpi itself when the window changes screen)."""
        if self._fits():
            return self.renderer
        return super().get_renderer()

    def draw(self) -> None:
        """Drawing happens in the worker: ask for it."""
        self.redraw_wanted.emit()

    def draw_idle(self) -> None:
        self.redraw_wanted.emit()

    def resizeEvent(self, event: QResizeEvent) -> None:
        # Not FigureCanvasQT's: it resizes the figure and redraws on the GUI thread.
        QWidget.resizeEvent(self, event)
        if self.drawn is not None and not self._fits():
            self.redraw_wanted.emit()

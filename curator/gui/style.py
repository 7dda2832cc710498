"""Small shared pieces of the window's look: headings and quiet text, from the palette and font.

Nothing here sets a colour or a pixel size: headings are the system font made a little larger
and bold, so they follow the user's font, scaling and theme.
"""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QPalette, QResizeEvent
from PySide6.QtWidgets import QLabel, QSizePolicy, QWidget

from curator.gui.delegates import scaled_font


def heading(text: str, parent: QWidget | None = None) -> QLabel:
    """A column heading (may carry a mnemonic; set its buddy)."""
    label = QLabel(text, parent)
    label.setFont(scaled_font(label.font(), 1.15, bold=True))
    return label


def quiet(text: str = "", parent: QWidget | None = None) -> QLabel:
    """Secondary text: wraps, and is drawn in the palette's placeholder colour."""
    label = QLabel(text, parent)
    label.setWordWrap(True)
    label.setForegroundRole(QPalette.ColorRole.PlaceholderText)
    return label


class QuietLine(QLabel):
    """One line of secondary text, cut with an ellipsis when narrow; the whole text is its
    tooltip. For notes that should never push the content below them down."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._full = ""
        self.setForegroundRole(QPalette.ColorRole.PlaceholderText)
        self.setSizePolicy(QSizePolicy.Policy.Ignored, QSizePolicy.Policy.Preferred)

    def set_line(self, text: str) -> None:
        self._full = text
        self.setToolTip(text)
        self._elide()

    def line(self) -> str:
        return self._full

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        self._elide()

    def _elide(self) -> None:
        width = max(0, self.contentsRect().width())
        self.setText(self.fontMetrics().elidedText(self._full, Qt.TextElideMode.ElideRight, width))

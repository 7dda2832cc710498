"""Small shared pieces of the window's look: headings and quiet text, from the palette and font.

Nothing here sets a colour or a pixel size: headings are the system font made a little larger
and bold, so they follow the user's font, scaling and theme.
"""

from __future__ import annotations

from PySide6.QtGui import QPalette
from PySide6.QtWidgets import QLabel, QWidget

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

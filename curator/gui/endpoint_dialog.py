"""Choosing a SPARQL endpoint to use as the catalogue: its query URL and how long to wait.

The URL is checked before the dialog closes, so a typo is named at once rather than after a
connection attempt; the endpoints opened before are offered in the drop-down.
"""

from __future__ import annotations

from urllib.parse import urlsplit

from PySide6.QtCore import Signal
from PySide6.QtWidgets import (
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QLabel,
    QSpinBox,
    QVBoxLayout,
    QWidget,
)

from curator.gui.recent import recent_endpoints
from curator.gui.style import quiet

#: Seconds the curator may choose to wait for one answer.
TIMEOUT_RANGE = (1, 600)
DEFAULT_TIMEOUT = 30
EXAMPLE_URL = "http://localhost:7878/query"


def check_endpoint_url(text: str) -> str | None:
    """Why ``text`` is not an endpoint URL the window can open, or None when it is one."""
    url = text.strip()
    if not url:
        return f"Endpoint URL: give the endpoint's query URL, for example {EXAMPLE_URL}."
    parts = urlsplit(url)
    if parts.scheme.lower() not in ("http", "https"):
        return (
            "Endpoint URL: it must start with http:// or https:// "
            f"(for example {EXAMPLE_URL}); “{url}” does not."
        )
    if not parts.hostname or any(c.isspace() for c in url):
        return f"Endpoint URL: “{url}” has no host name (or has spaces); check it."
    return None


class EndpointDialog(QDialog):
    """Emits ``chosen(url, timeout_seconds)`` when OK is pressed with a usable URL."""

    chosen = Signal(str, float)

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Open a SPARQL endpoint")
        self.url = QComboBox()
        self.url.setEditable(True)
        self.url.addItems(recent_endpoints())
        self.url.setCurrentIndex(0 if self.url.count() else -1)
        line = self.url.lineEdit()
        assert line is not None
        line.setPlaceholderText(EXAMPLE_URL)
        self.url.setAccessibleName("Endpoint URL")
        self.url.setToolTip(
            "The endpoint's query URL (often ending in /sparql or /query); "
            "endpoints opened before are in the list"
        )
        self.url.setMinimumContentsLength(40)
        self.timeout = QSpinBox()
        self.timeout.setRange(*TIMEOUT_RANGE)
        self.timeout.setValue(DEFAULT_TIMEOUT)
        self.timeout.setSuffix(" s")
        self.timeout.setAccessibleName("Timeout")
        self.timeout.setToolTip("The longest wait for one answer of the endpoint")
        self.error = QLabel()
        self.error.setWordWrap(True)
        bold = self.error.font()
        bold.setBold(True)
        self.error.setFont(bold)
        self.error.setAccessibleName("What is wrong")
        self.error.setVisible(False)
        note = quiet(
            "Titles are searched and candidates chosen by asking the endpoint; nothing is "
            "copied in advance. Browse, balance and export read only the works you meet."
        )
        note.setWordWrap(True)

        form = QFormLayout()
        form.addRow("Endpoint &URL", self.url)
        form.addRow("&Timeout", self.timeout)
        self.buttons = QDialogButtonBox(
            QDialogButtonBox.StandardButton.Open | QDialogButtonBox.StandardButton.Cancel
        )
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addLayout(form)
        layout.addWidget(self.error)
        layout.addWidget(note)
        layout.addWidget(self.buttons)
        line.textEdited.connect(lambda _t: self._show_error(""))
        # Wide enough for a URL, so the wrapped lines below it keep their height.
        self.setMinimumWidth(self.fontMetrics().averageCharWidth() * 72)

    def _show_error(self, text: str) -> None:
        self.error.setText(text)
        self.error.setVisible(bool(text))
        self.adjustSize()  # a wrapped message needs room; Qt does not grow the dialog itself

    def set_url(self, url: str) -> None:
        self.url.setEditText(url)

    def accept(self) -> None:
        """Close only on a usable URL; otherwise say what is wrong and keep what was typed."""
        problem = check_endpoint_url(self.url.currentText())
        if problem is not None:
            self._show_error(problem)
            self.url.setFocus()
            return
        url = self.url.currentText().strip()
        super().accept()
        self.chosen.emit(url, float(self.timeout.value()))

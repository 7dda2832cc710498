"""The status bar's progress strips (opening a catalogue; a suggestion on an endpoint): what is
under way, how far, and a Cancel that works."""

from __future__ import annotations

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QProgressBar, QPushButton, QWidget

#: The progress bar counts in thousandths so that small steps still move it.
STEPS = 1000


class LoadStatus(QWidget):
    """Hidden until a load starts; ``cancel_requested`` when the curator presses Cancel."""

    cancel_requested = Signal()

    def __init__(
        self,
        parent: QWidget | None = None,
        *,
        name: str = "Loading progress",
        cancel_tip: str = "Stop loading; the catalogue open now stays open (Esc)",
    ) -> None:
        super().__init__(parent)
        self.stage = QLabel()
        self.bar = QProgressBar()
        self.bar.setRange(0, STEPS)
        self.bar.setTextVisible(False)
        self.bar.setMaximumWidth(self.fontMetrics().averageCharWidth() * 24)
        self.bar.setAccessibleName(name)
        self.cancel = QPushButton("Cancel")
        self.cancel.setToolTip(cancel_tip)
        self.cancel.clicked.connect(self.cancel_requested)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.stage)
        layout.addWidget(self.bar)
        layout.addWidget(self.cancel)
        self.setVisible(False)

    def begin(self, what: str) -> None:
        self.stage.setText(what)
        self.bar.setValue(0)
        self.cancel.setEnabled(True)
        self.setVisible(True)

    def report(self, stage: str, fraction: float) -> None:
        self.stage.setText(stage)
        self.bar.setValue(round(max(0.0, min(1.0, fraction)) * STEPS))

    def cancelling(self) -> None:
        self.stage.setText("Stopping…")
        self.cancel.setEnabled(False)

    def end(self) -> None:
        self.setVisible(False)

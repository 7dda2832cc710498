"""Starting the window: the application object, its names (for QSettings), and the event loop."""

from __future__ import annotations

import sys

from PySide6.QtWidgets import QApplication

from curator.gui.window import MainWindow

ORGANIZATION = "curator"
APPLICATION = "curator"


def application() -> QApplication:
    """The running QApplication, created with curator's names if there is none yet."""
    app = QApplication.instance()
    if app is None:
        app = QApplication(sys.argv[:1])
    assert isinstance(app, QApplication)
    if not app.organizationName():
        app.setOrganizationName(ORGANIZATION)
    app.setApplicationName(APPLICATION)
    app.setApplicationDisplayName("curator")
    return app


def run(
    paths: list[str] | None = None, *, endpoint: str | None = None, timeout: float = 30.0
) -> int:
    """Open the window on ``paths`` (the demo collection when None or empty) or on a SPARQL
    ``endpoint``'s query URL; returns the exit status of the event loop."""
    app = application()
    window = MainWindow()
    window.show()
    window.start(paths or None, endpoint=endpoint, timeout=timeout)
    return app.exec()

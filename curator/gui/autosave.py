"""Autosave to the recovery file: shortly after each change, and on a timer as a safety net.

The recovery file is the sessions service's; this only decides when to write it. It is written
only while there is unsaved work, and the window clears it on a clean exit or after a save, so a
recovery file found at start means work was lost and is worth offering back.
"""

from __future__ import annotations

import logging

from PySide6.QtCore import QObject, QSettings, QTimer

from curator.core.errors import CuratorError
from curator.core.session import Session
from curator.services.sessions import clear_recovery, write_recovery

log = logging.getLogger(__name__)

#: Where the list being recovered was saved last, so a restore can keep its file name.
DOCUMENT_KEY = "recovery/document"


class Autosaver(QObject):
    def __init__(
        self,
        session: Session,
        parent: QObject | None = None,
        *,
        delay_ms: int = 1500,
        interval_ms: int = 60_000,
    ) -> None:
        super().__init__(parent)
        self._session = session
        self._dirty = False
        self.document = ""
        self._soon = QTimer(self)
        self._soon.setSingleShot(True)
        self._soon.setInterval(delay_ms)
        self._soon.timeout.connect(self.write_now)
        self._every = QTimer(self)
        self._every.setInterval(interval_ms)
        self._every.timeout.connect(self._tick)
        self._every.start()

    def set_delay(self, milliseconds: int) -> None:
        """How long after a change the recovery file is written (tests shorten it)."""
        self._soon.setInterval(milliseconds)

    def changed(self) -> None:
        """The session has unsaved changes: write them soon."""
        self._dirty = True
        self._soon.start()

    def _tick(self) -> None:
        if self._dirty:
            self.write_now()

    def write_now(self) -> bool:
        self._soon.stop()
        try:
            write_recovery(self._session)
        except (OSError, CuratorError) as exc:  # never interrupt the curator for a backup
            log.warning("could not write the recovery file: %s", exc)
            return False
        QSettings().setValue(DOCUMENT_KEY, self.document)
        self._dirty = False
        return True

    def saved(self) -> None:
        """The work is safe in its own file now; the recovery copy is not needed."""
        self._soon.stop()
        self._dirty = False
        clear_recovery()

    def stop(self) -> None:
        self._soon.stop()
        self._every.stop()

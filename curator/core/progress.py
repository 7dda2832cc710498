"""Progress and cancellation as plain objects, so long work can run in any front end.

A core function that may take long accepts a :class:`Progress` and checks it; the window's worker
passes one whose callback emits a Qt signal, the command line one that prints nothing.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from dataclasses import dataclass, field

from curator.core.errors import Cancelled

ProgressCallback = Callable[[str, float], None]


@dataclass
class CancelToken:
    """Set from any thread; checked by the worker at safe points."""

    _event: threading.Event = field(default_factory=threading.Event, repr=False)

    def cancel(self) -> None:
        self._event.set()

    @property
    def cancelled(self) -> bool:
        return self._event.is_set()


@dataclass
class Progress:
    """Reports a stage and a fraction in [0, 1]; raises :class:`Cancelled` when asked to stop."""

    callback: ProgressCallback | None = None
    token: CancelToken = field(default_factory=CancelToken)
    base: float = 0.0
    span: float = 1.0

    def report(self, stage: str, fraction: float) -> None:
        """Say where the work is; also the place where a cancel request takes effect."""
        self.check()
        if self.callback is not None:
            clamped = min(1.0, max(0.0, fraction))
            self.callback(stage, self.base + self.span * clamped)

    def check(self) -> None:
        if self.token.cancelled:
            raise Cancelled("Stopped at your request; nothing was changed.")

    def part(self, start: float, end: float) -> Progress:
        """A child reporter covering ``[start, end]`` of this one's range."""
        return Progress(
            callback=self.callback,
            token=self.token,
            base=self.base + self.span * start,
            span=self.span * (end - start),
        )


def silent() -> Progress:
    """A reporter that reports nothing and is never cancelled."""
    return Progress()

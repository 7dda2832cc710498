"""Screenshots of the window at work on the demo collection, for the docs and for review.

Builds a small list the way a curator would (two starting titles, a few accepted candidates, a
note, a candidate selected so its rationale shows) and saves ``docs/screenshot.png`` and, in a
second process with ``QT_SCALE_FACTOR=1.5``, ``docs/screenshot-150.png``. A third picture,
``docs/screenshot-balance.png``, shows the same list with targets set, *Fill the gaps* on and the
Balance tab open, its column widened the way a curator would drag it. Needs a display (run
``scripts/screenshot.sh`` on a machine without one). Settings and the recovery file go to a
temporary folder, so the user's own are never touched.

    python scripts/screenshot.py                 # all three pictures
    python scripts/screenshot.py --scale 1.5 --out docs/x.png
    python scripts/screenshot.py --scene balance --out docs/x.png
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]
SEEDS = ("The Mirror of Gullstane", "Thessaly's Heron")
#: Which candidates go onto the list, by position among those that are not versions of a seed.
ACCEPT = (0, 1, 3, 5)
NOTE = "Two copies at the Cindlebeck branch; display face-out beside the seeds."
LIST_TITLE = "Secrets and long winters"
#: Window size in device-independent pixels at scale 1; larger scales fill the screen instead.
SIZE = (1500, 920)
#: The balance picture: the targets a curator might set for this list, and the column widths
#: after widening the Balance tab.
TARGETS = """\
max_entries = 12

[[require]]
facet = "kind"
value = "Film"
min_share = 0.4

[[require]]
facet = "decade"
min_distinct = 5

[[require]]
facet = "creator"
max_share = 0.25        # no creator with more than a quarter of the list
"""
BALANCE_COLUMNS = (0.40, 0.32, 0.28)


def _wait(app: object, done: Callable[[], bool], timeout: float = 15.0) -> None:
    from PySide6.QtCore import QEventLoop, QTimer

    loop = QEventLoop()
    deadline = time.monotonic() + timeout

    def check() -> None:
        if done() or time.monotonic() > deadline:
            loop.quit()

    timer = QTimer()
    timer.timeout.connect(check)
    timer.start(20)
    loop.exec()
    timer.stop()
    if not done():
        raise SystemExit("screenshot: timed out waiting for the window")


def shoot(out: Path, scale: float, scene: str = "list") -> float:
    """Build the scene and save it to ``out``; returns the last refresh latency in seconds."""
    os.environ["QT_SCALE_FACTOR"] = f"{scale:g}"
    state = Path(tempfile.mkdtemp(prefix="curator-shot-"))
    os.environ["CURATOR_STATE_DIR"] = str(state / "state")

    from PySide6.QtCore import QSettings
    from PySide6.QtWidgets import QApplication

    import curator.gui  # noqa: F401  (guards a PySide6 bug before any Qt call)

    QSettings.setDefaultFormat(QSettings.Format.IniFormat)
    QSettings.setPath(QSettings.Format.IniFormat, QSettings.Scope.UserScope, str(state))
    from curator.gui.app import application
    from curator.gui.window import MainWindow

    app = application()
    app.setOrganizationName("curator-screenshot")
    window = MainWindow(languages=("en",))
    if scale > 1:
        screen = app.primaryScreen().availableGeometry()
        window.setGeometry(screen)
    else:
        window.resize(*SIZE)
    window.show()
    window.open_catalogue([])
    _wait(app, lambda: window.workspace is not None)

    seeds = window.seeds_panel
    for title in SEEDS:
        seeds.field.setFocus()
        seeds.search(title)
        seeds.choose_result(0)
        _wait(app, lambda: window.candidate_model.rowCount() > 0 and window._changed_at is None)
    window.list_panel.title.setText(LIST_TITLE)
    window.editor.set_title(LIST_TITLE)

    candidates = window.candidates_panel
    others = [
        row
        for row in window.candidate_model.rows()
        if not any(row.line.title.startswith(seed) for seed in SEEDS)
    ]
    chosen = [others[i].iri for i in ACCEPT]
    for iri in chosen:
        candidates.select_iri(iri)
        candidates.add_action.trigger()
        _wait(app, lambda iri=iri: iri not in window.candidate_model.iris())
    window.list_panel.select_row(1)
    window.list_panel.note.setPlainText(NOTE)

    candidates.view.setFocus()
    showcase = next(
        row
        for row in window.candidate_model.rows()
        if row.path and not any(row.line.title.startswith(seed) for seed in SEEDS)
    )
    candidates.select_iri(showcase.iri)
    if scene == "balance":
        _balance_scene(app, window)
    _wait(app, lambda: True)
    for _ in range(5):
        app.processEvents()
        time.sleep(0.05)
    out.parent.mkdir(parents=True, exist_ok=True)
    if not window.grab().save(str(out)):
        raise SystemExit(f"screenshot: could not write {out}")
    latency = window.last_refresh_seconds or 0.0
    window.undo_stack.setClean()
    window.close()
    assert isinstance(app, QApplication)
    return latency


def _balance_scene(app: object, window: object) -> None:
    """Targets set, Fill the gaps on, the Balance tab open and widened; waits for its charts."""
    from curator.gui.window import MainWindow

    assert isinstance(window, MainWindow)
    window.editor.set_targets(TARGETS)
    window.controls.fill_gaps.setChecked(True)
    _wait(app, lambda: window._changed_at is None and window.candidates_panel.gaps_note.line())
    width = sum(window.columns.sizes())
    window.columns.setSizes([round(width * share) for share in BALANCE_COLUMNS])
    window.show_balance()
    panel = window.balance_panel

    def charted() -> bool:
        report = panel.report
        return (
            report is not None
            and report.targets is not None
            and report.chart is not None
            and not panel.needs_chart()
        )

    _wait(app, charted, timeout=30.0)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--out", type=Path, help="one picture at --scale, to this file")
    parser.add_argument("--scale", type=float, default=1.0)
    parser.add_argument("--scene", choices=("list", "balance"), default="list")
    args = parser.parse_args()
    if args.out is not None:
        latency = shoot(args.out, args.scale, args.scene)
        print(f"{args.out}: saved (last refresh {latency * 1000:.0f} ms after the change)")
        return 0
    status = 0
    for scale, scene, name in (
        (1.0, "list", "screenshot.png"),
        (1.5, "list", "screenshot-150.png"),
        (1.0, "balance", "screenshot-balance.png"),
    ):
        command = [
            sys.executable,
            __file__,
            "--scale",
            str(scale),
            "--scene",
            scene,
            "--out",
            str(REPO / "docs" / name),
        ]
        status |= subprocess.call(command)
    return status


if __name__ == "__main__":
    raise SystemExit(main())

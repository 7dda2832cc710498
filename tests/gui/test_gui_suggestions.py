"""Suggestions refresh by themselves, in a worker, quickly, and only the newest is shown."""

from __future__ import annotations

import time
from typing import Any

from gui_helpers import HERON, MIRROR, iri_of, wait_refresh

from curator.gui.controls import lam_to_slider, slider_to_lam
from curator.gui.window import MainWindow
from curator.services.workspace import Workspace


def _two_seeds(qtbot: Any, window: MainWindow, workspace: Workspace) -> None:
    iris = [iri_of(workspace, MIRROR), iri_of(workspace, HERON)]
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds(iris))


def test_slider_maps_to_lambda() -> None:
    assert slider_to_lam(0) == 1.0
    assert slider_to_lam(100) == 0.0
    assert lam_to_slider(0.7) == 30
    assert slider_to_lam(lam_to_slider(0.7)) == 0.7


def test_variety_slider_changes_the_candidates(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _two_seeds(qtbot, window, demo_workspace)
    slider = window.controls.slider
    wait_refresh(qtbot, window, lambda: slider.setValue(0))
    assert window.session.settings.lam == 1.0
    close = window.candidate_model.iris()
    wait_refresh(qtbot, window, lambda: slider.setValue(100))
    assert window.session.settings.lam == 0.0
    varied = window.candidate_model.iris()
    assert close and varied
    assert close != varied
    creators = (
        {tuple(demo_workspace.index.record(i).creators[:1]) for i in varied[:10]},
        {tuple(demo_workspace.index.record(i).creators[:1]) for i in close[:10]},
    )
    assert len(creators[0]) >= len(creators[1])  # more variety, by creator at least
    # Dragging the slider is one undo step back to where it started.
    wait_refresh(qtbot, window, window.undo_stack.undo)
    assert window.session.settings.lam == 0.7
    assert slider.value() == 30


def test_kind_and_year_filters(qtbot: Any, window: MainWindow, demo_workspace: Workspace) -> None:
    _two_seeds(qtbot, window, demo_workspace)
    controls = window.controls
    film = controls.kind.findText("Film")
    assert film > 0
    wait_refresh(qtbot, window, lambda: controls.kind.setCurrentIndex(film))
    kinds = {demo_workspace.index.record(i).kinds[0] for i in window.candidate_model.iris()}
    assert kinds == {controls.kind.itemData(film)}
    wait_refresh(qtbot, window, lambda: controls.year_from.setValue(1950))
    years = [demo_workspace.index.record(i).year for i in window.candidate_model.iris()]
    assert years and all(y is not None and y >= 1950 for y in years)
    assert window.session.settings.year_from == 1950
    wait_refresh(qtbot, window, lambda: controls.year_from.setValue(controls.year_from.minimum()))
    assert window.session.settings.year_from is None
    assert controls.year_from.text() == "any"


def test_language_filter(qtbot: Any, window: MainWindow, demo_workspace: Workspace) -> None:
    _two_seeds(qtbot, window, demo_workspace)
    box = window.controls.language
    french = box.findData("fr")
    assert box.itemText(french) == "French"
    wait_refresh(qtbot, window, lambda: box.setCurrentIndex(french))
    languages = {demo_workspace.index.record(i).languages for i in window.candidate_model.iris()}
    assert languages == {("fr",)}


def test_refresh_is_quick_after_a_change(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _two_seeds(qtbot, window, demo_workspace)
    timings = []
    for _ in range(5):
        iri = window.candidate_model.iris()[0]
        started = time.perf_counter()
        window.editor.accept([iri])
        qtbot.waitUntil(lambda iri=iri: iri not in window.candidate_model.iris(), timeout=2000)
        timings.append(time.perf_counter() - started)
    print(f"refresh after accepting, seconds: {[round(t, 3) for t in timings]}")
    assert max(timings) < 2.0
    assert window.last_refresh_seconds is not None and window.last_refresh_seconds < 2.0


def test_a_burst_of_changes_shows_only_the_last(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _two_seeds(qtbot, window, demo_workspace)
    shown: list[object] = []
    window.runner.ready.connect(shown.append)
    slider = window.controls.slider
    for value in (10, 40, 70, 100):
        slider.setValue(value)
    qtbot.waitUntil(lambda: bool(shown), timeout=2000)
    qtbot.wait(150)
    assert len(shown) == 1  # debounced and stale answers dropped
    # Requests made back to back: only the newest is answered.
    shown.clear()
    window.runner.request(demo_workspace, window.session)
    last = window.runner.request(demo_workspace, window.session)
    qtbot.waitUntil(lambda: bool(shown), timeout=2000)
    qtbot.wait(100)
    assert [a.generation for a in shown] == [last]  # type: ignore[attr-defined]


def test_no_seed_says_what_to_do(qtbot: Any, window: MainWindow) -> None:
    assert window.candidate_model.rowCount() == 0
    assert "starting title" in window.candidates_panel.explanation.toPlainText()

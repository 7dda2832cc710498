"""The Balance tab follows the list; targets are edited as TOML, checked, and undoable."""

from __future__ import annotations

import threading
from typing import Any

from gui_helpers import HERON, MIRROR, iri_of, wait_refresh

from curator.gui.balance import facet_line, targets_verdict
from curator.gui.targets_dialog import (
    FALLBACK_EXAMPLE,
    TargetsDialog,
    check_targets,
    example_targets,
    line_at_fault,
)
from curator.gui.window import MainWindow
from curator.services.workspace import Workspace

#: Targets that any list of the demo collection can be checked against.
TARGETS = """\
[[require]]
facet = "kind"
value = "Film"
min_share = 0.5

[[require]]
facet = "decade"
min_distinct = 1
"""


def _seeded(qtbot: Any, window: MainWindow, workspace: Workspace) -> None:
    iris = [iri_of(workspace, MIRROR), iri_of(workspace, HERON)]
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds(iris))


def _wait_balance(qtbot: Any, window: MainWindow, entries: int, **extra: Any) -> None:
    """Wait until the Balance tab shows a list of ``entries`` entries (and a chart for it)."""
    panel = window.balance_panel

    def shown() -> bool:
        report = panel.report
        if report is None or report.publication.audit is None:
            return entries == 0 and report is not None
        if report.publication.audit.entries != entries or report.chart is None:
            return False
        return all(getattr(report, k) == v for k, v in extra.items())

    qtbot.waitUntil(shown, timeout=10_000)


def _kind_counts(window: MainWindow) -> dict[str, int]:
    report = window.balance_panel.report
    assert report is not None and report.publication.audit is not None
    return {v.label: v.count for v in report.publication.audit.facet("kind").values}


def test_the_balance_follows_the_list(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    window.show_balance()
    panel = window.balance_panel
    qtbot.waitUntil(lambda: panel.report is not None, timeout=5000)
    assert "Nothing on the list yet" in panel.intro.text()
    _seeded(qtbot, window, demo_workspace)
    candidates = window.candidate_model.iris()
    wait_refresh(qtbot, window, lambda: window.editor.accept(candidates[:3]))
    _wait_balance(qtbot, window, 3)
    before = _kind_counts(window)
    assert sum(before.values()) == 3
    assert "Kind" in panel.facets.text() and "evenness" in panel.facets.text()
    assert "3 entries" in panel.summary.text()
    assert panel.canvas is not None and panel.canvas.isVisible()
    assert abs(panel.canvas.width() - panel.chart_style().width) <= 2  # drawn for its width

    # An entry of a kind: its count goes up by one, in words and in the chart's data.
    added = window.candidate_model.iris()[0]
    kind = demo_workspace.index.label(demo_workspace.index.record(added).kinds[0])
    wait_refresh(qtbot, window, lambda: window.editor.accept([added]))
    _wait_balance(qtbot, window, 4)
    after = _kind_counts(window)
    assert after[kind] == before.get(kind, 0) + 1
    assert "4 entries" in panel.summary.text()

    window.undo_stack.undo()
    _wait_balance(qtbot, window, 3)
    assert _kind_counts(window) == before

    # The slider changes the candidates, not the list: the balance is not recomputed.
    shown = panel.report
    wait_refresh(qtbot, window, lambda: window.controls.slider.setValue(80))
    assert not window._balance_stale and not window._balance_timer.isActive()
    assert panel.report is shown


def test_the_charts_are_drawn_off_the_gui_thread(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, monkeypatch: Any
) -> None:
    import curator.gui.balance as balance

    threads: list[str] = []
    draw = balance.draw_chart

    def spy(*args: Any) -> Any:
        threads.append(threading.current_thread().name)
        return draw(*args)

    monkeypatch.setattr(balance, "draw_chart", spy)
    window.show_balance()
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:2]))
    _wait_balance(qtbot, window, 2)
    assert threads and threading.main_thread().name not in threads


def test_bad_targets_name_the_field_and_keep_the_old_ones(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    window.editor.set_targets(TARGETS)
    steps = window.undo_stack.count()
    dialog = window.edit_targets()
    assert dialog.text() == TARGETS  # opens on the list's own targets
    bad = TARGETS.replace('facet = "decade"', 'facet = "decades"')
    dialog.editor.setPlainText(bad)
    assert not dialog.apply()
    assert dialog.isVisible()
    message = dialog.status.text()
    assert "require[1].facet" in message and "'decades'" in message
    assert "Traceback" not in message
    assert dialog.text() == bad  # nothing typed is lost
    assert dialog.fault_line == bad.splitlines().index('facet = "decades"') + 1
    assert window.session.settings.targets == TARGETS
    assert window.undo_stack.count() == steps

    dialog.editor.setPlainText("max_entries = [")
    assert not dialog.apply()
    assert "not valid TOML" in dialog.status.text()
    dialog.reject()
    assert window.session.settings.targets == TARGETS


def test_valid_targets_show_met_and_unmet_and_undo(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    window.show_balance()
    _seeded(qtbot, window, demo_workspace)
    novels = [
        r.iri
        for r in demo_workspace.index.records
        if r.kinds and demo_workspace.index.label(r.kinds[0]) == "Novel"
    ][:3]
    wait_refresh(qtbot, window, lambda: window.editor.accept(novels))
    _wait_balance(qtbot, window, 3)
    assert "None set" in window.balance_panel.targets.text()

    dialog = window.edit_targets()
    assert dialog.text() == example_targets()  # no targets yet: the template
    dialog.editor.setPlainText(TARGETS)
    assert dialog.apply()
    assert not dialog.isVisible()
    assert window.session.settings.targets == TARGETS
    qtbot.waitUntil(
        lambda: (
            window.balance_panel.report is not None
            and window.balance_panel.report.targets is not None
        ),
        timeout=10_000,
    )
    report = window.balance_panel.report
    assert report is not None
    results = {r.description: r for r in report.publication.targets}
    films = results["at least 50% films"]
    assert not films.met and films.gap == "3 more films needed"
    assert results["at least 1 different decades"].met
    text = window.balance_panel.targets.text()
    assert "at least 50% films" in text and "3 more films needed" in text
    assert "✗" in text and "✓" in text
    assert "1 of 2 met" in text

    assert window.undo_stack.undoText() == "Change the targets"
    window.undo_stack.undo()
    assert window.session.settings.targets == ""
    qtbot.waitUntil(lambda: "None set" in window.balance_panel.targets.text(), timeout=10_000)
    window.undo_stack.redo()
    assert window.session.settings.targets == TARGETS


def test_unreadable_stored_targets_are_reported_not_fatal(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    from dataclasses import replace

    window.show_balance()
    window.session.set_settings(replace(window.session.settings, targets="[[require]]\nfacet=1\n"))
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:2]))
    _wait_balance(qtbot, window, 2)
    text = window.balance_panel.targets.text()
    assert "could not be read" in text and "require[0].facet" in text


def test_the_example_template_comes_from_the_engine() -> None:
    text = example_targets()
    assert text != FALLBACK_EXAMPLE
    assert "[[require]]" in text and "min_share = 0.3" in text
    assert check_targets(text) is None
    assert check_targets("") is None


def test_the_line_at_fault() -> None:
    text = '[[require]]\nfacet = "kind"\nvalue = "Film"\nmin_count = 1\n\n'
    text += '[[require]]\nfacet = "x"\n'
    message = check_targets(text)
    assert message is not None
    assert line_at_fault(text, message) == 7
    assert line_at_fault("a = [", "not valid TOML (Invalid value (at line 1, column 5))") == 1
    assert line_at_fault(text, "require[4].facet is wrong") is None


def test_the_dialog_checks_while_typing(qtbot: Any) -> None:
    dialog = TargetsDialog("")
    qtbot.addWidget(dialog)
    dialog.editor.setPlainText("[[require]]\nfacet = 'kind'\n")
    qtbot.waitUntil(lambda: "sets no limit" in dialog.status.text(), timeout=3000)
    dialog.clear_button.click()
    qtbot.waitUntil(lambda: "No targets" in dialog.status.text(), timeout=3000)
    applied: list[str] = []
    dialog.applied.connect(applied.append)
    assert dialog.apply()
    assert applied == [""]


def test_fill_the_gaps_is_a_setting_and_undoable(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    _seeded(qtbot, window, demo_workspace)
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:3]))
    switch = window.controls.fill_gaps
    assert not switch.isChecked() and "unmet targets" in switch.toolTip()
    note = window.candidates_panel.gaps_note
    assert note.isHidden()
    wait_refresh(qtbot, window, switch.click)
    assert window.session.settings.fill_gaps
    assert not note.isHidden()
    assert note.line().startswith("Favouring works that fill the list's gaps")
    assert note.toolTip() == note.line()
    # ... and not repeated in the explanation area.
    assert "Favouring" not in window.candidates_panel._message

    wait_refresh(qtbot, window, window.undo_stack.undo)
    assert not window.session.settings.fill_gaps
    assert not switch.isChecked()
    assert note.isHidden()
    wait_refresh(qtbot, window, window.undo_stack.redo)
    assert window.session.settings.fill_gaps and switch.isChecked()

    # On and off again is no step at all.
    steps = window.undo_stack.count()
    wait_refresh(qtbot, window, switch.click)
    wait_refresh(qtbot, window, switch.click)
    assert window.session.settings.fill_gaps
    assert window.undo_stack.count() == steps


def test_wording_of_facets_and_verdicts(demo_workspace: Workspace) -> None:
    from curator.core.audit import audit_list

    index = demo_workspace.index
    positions = list(range(6))
    audit = audit_list(index, positions)
    line = facet_line(audit.facet("kind"))
    assert line.name == "Kind"
    largest = audit.facet("kind").largest
    assert largest is not None and largest.label in line.text
    unknown = audit_list(index, positions).facet("audience").unknown
    if unknown:
        assert f"unknown for {unknown}" in facet_line(audit.facet("audience")).text
    from curator.core.targets import TargetResult

    assert targets_verdict([TargetResult("a", True), TargetResult("b", False)]) == "1 of 2 met"
    assert targets_verdict([TargetResult("a", True), TargetResult("b", True)]) == "all 2 met"

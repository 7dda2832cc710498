"""Exporting the list in every format from the dialog, and importing a list made elsewhere."""

from __future__ import annotations

import csv
import json
from pathlib import Path
from typing import Any

import rdflib
from conftest import Dialogs
from gui_helpers import HERON, MIRROR, iri_of, wait_refresh
from PySide6.QtWidgets import QMessageBox

from curator.gui.export_dialog import EXPORT_CHOICES, ExportDialog
from curator.gui.import_dialog import ImportLineModel, plan_import
from curator.gui.window import MainWindow
from curator.services.publishing import load_list
from curator.services.workspace import Workspace

NOTE = "Shelve beside the atlas"


def _build(qtbot: Any, window: MainWindow, workspace: Workspace, title: str) -> None:
    iris = [iri_of(workspace, MIRROR), iri_of(workspace, HERON)]
    wait_refresh(qtbot, window, lambda: window.editor.add_seeds(iris))
    wait_refresh(qtbot, window, lambda: window.editor.accept(window.candidate_model.iris()[:3]))
    window.editor.edit_entry(1, "note", NOTE)
    window.editor.set_title(title)


def _open_export(window: MainWindow) -> ExportDialog:
    assert window.export_action.isEnabled()
    window.export_action.trigger()
    dialog = window.export_dialog
    assert dialog is not None and dialog.isVisible()
    return dialog


def test_export_is_offered_once_the_list_has_entries(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    assert not window.export_action.isEnabled()
    assert window.export_action.shortcut().toString() == "Ctrl+E"
    assert window.import_action.isEnabled()
    _build(qtbot, window, demo_workspace, "Winter")
    assert window.export_action.isEnabled()


def test_the_dialog_writes_every_format(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    _build(qtbot, window, demo_workspace, "Lighthouse winters")
    dialog = _open_export(window)
    preview = dialog.preview.toPlainText()
    assert "Lighthouse winters" in preview
    assert window.session.entries[0].rationale in preview
    assert NOTE in preview
    # The charts arrive as a picture a moment later, drawn in the background.
    qtbot.waitUntil(lambda: dialog._chart is not None, timeout=10_000)
    assert "balance-chart.png" in dialog.preview.toHtml()

    written: dict[str, Path] = {}
    for choice in EXPORT_CHOICES:
        dialog.set_format(choice.key)
        path = tmp_path / f"winter{choice.suffix}"
        dialog.path.setText(str(path))
        with qtbot.waitSignal(dialog.written, timeout=20_000):
            assert dialog.export()
        assert path.exists() and path.stat().st_size > 0, choice.key
        assert path.name in dialog.status.text()
        written[choice.key] = path

    html = written["html"].read_text(encoding="utf-8")
    assert "Lighthouse winters" in html and "<svg" in html
    assert "Lighthouse winters" in written["md"].read_text(encoding="utf-8")
    rows = list(csv.reader(written["csv"].open(encoding="utf-8")))
    assert rows[0][:2] == ["position", "title"] and len(rows) == 4
    assert json.loads(written["jsonld"].read_text(encoding="utf-8"))["name"] == (
        "Lighthouse winters"
    )
    graph = rdflib.Graph().parse(written["ttl"], format="turtle")  # an independent parser
    assert len(graph) > 10
    assert written["pdf"].read_bytes().startswith(b"%PDF")
    # Changing format swaps the file's extension.
    dialog.set_format("md")
    assert dialog.path.text().endswith(".md")
    dialog.reject()
    assert window.export_dialog is None


def test_a_hostile_title_is_text_in_the_preview(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace
) -> None:
    hostile = "<script>x</script>"
    _build(qtbot, window, demo_workspace, hostile)
    dialog = _open_export(window)
    text = dialog.preview.toPlainText()
    assert hostile in text
    assert text.splitlines()[0] == hostile  # the page's heading, shown as typed
    dialog.reject()


def test_an_export_that_cannot_be_written_says_why(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    _build(qtbot, window, demo_workspace, "Winter")
    dialog = _open_export(window)
    dialog.set_format("csv")
    dialog.path.setText(str(tmp_path / "no" / "such" / "folder" / "list.csv"))
    with qtbot.waitSignal(dialog.writer.failed, timeout=10_000):
        assert dialog.export()
    text = dialog.status.text()
    assert text.startswith("Not saved:") and "no such folder" in text
    assert "Traceback" not in text
    assert dialog.export_button.isEnabled()
    dialog.path.setText("")
    assert not dialog.export()
    dialog.reject()


def test_an_existing_file_is_replaced_only_when_the_curator_agrees(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path, dialogs: Dialogs
) -> None:
    _build(qtbot, window, demo_workspace, "Winter")
    target = tmp_path / "winter.md"
    target.write_text("mine", encoding="utf-8")
    dialog = _open_export(window)
    dialog.set_format("md")
    dialog.path.setText(str(target))
    dialogs.answers.append(QMessageBox.StandardButton.No)
    assert not dialog.export()
    assert "Replace the file?" in [title for _k, title, _t in dialogs.shown]
    assert target.read_text(encoding="utf-8") == "mine"
    dialogs.answers.append(QMessageBox.StandardButton.Yes)
    with qtbot.waitSignal(dialog.written, timeout=10_000):
        assert dialog.export()
    assert target.read_text(encoding="utf-8").startswith("# Winter")
    dialog.reject()


def _outside_list(tmp_path: Path, workspace: Workspace) -> Path:
    path = tmp_path / "winter_reading.txt"
    path.write_text(
        "# from the branch's spreadsheet\n"
        f"{MIRROR}\n"
        "Nothing Like This Was Ever Written\n"
        f"{HERON.upper()}\n"
        f"{MIRROR}\n",
        encoding="utf-8",
    )
    return path


def test_importing_adds_the_matched_works_and_reports_the_rest(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    path = _outside_list(tmp_path, demo_workspace)
    with qtbot.waitSignal(window.importer.done, timeout=10_000):
        assert window.import_list(path)
    dialog = window.import_dialog
    assert dialog is not None and dialog.isVisible()
    left_out = dialog.left_out_model
    rows = [left_out.line_at(r) for r in range(left_out.rowCount())]
    assert [(r.number, r.written) for r in rows if r] == [
        (3, "Nothing Like This Was Ever Written"),
        (5, MIRROR),
    ]
    assert rows[0] is not None and rows[0].result.startswith("Not in this catalogue")
    assert rows[1] is not None and "line 2" in rows[1].result  # listed twice
    assert dialog.summary.text() == (
        "winter_reading.txt: 4 lines read. 2 works found; 1 line not found; 1 line names a "
        "work twice."
    )
    assert dialog.adding_model.rowCount() == 2
    assert dialog.add_button.text() == "Add 2 works to the list"

    wait_refresh(qtbot, window, dialog.accept)
    mirror, heron = iri_of(demo_workspace, MIRROR), iri_of(demo_workspace, HERON)
    assert window.session.entry_iris == [mirror, heron]
    assert window.session.title == "Winter reading"  # an untitled, empty list takes its name
    assert window.session.entries[0].label == MIRROR
    # One undo step takes the whole import back.
    window.undo_stack.undo()
    assert window.session.entries == []
    assert window.session.title == "Untitled list"
    window.undo_stack.redo()
    assert window.session.entry_iris == [mirror, heron]


def test_a_work_already_listed_is_not_added_twice(
    qtbot: Any, window: MainWindow, demo_workspace: Workspace, tmp_path: Path
) -> None:
    mirror = iri_of(demo_workspace, MIRROR)
    wait_refresh(qtbot, window, lambda: window.editor.accept([mirror]))
    window.editor.set_title("Mine")
    path = _outside_list(tmp_path, demo_workspace)
    with qtbot.waitSignal(window.importer.done, timeout=10_000):
        window.import_list(path)
    dialog = window.import_dialog
    assert dialog is not None
    assert dialog.adding_model.rowCount() == 1
    results = [dialog.left_out_model.line_at(r) for r in range(dialog.left_out_model.rowCount())]
    assert any(r is not None and "on your list already" in r.result for r in results)
    wait_refresh(qtbot, window, dialog.accept)
    assert window.session.entry_iris == [mirror, iri_of(demo_workspace, HERON)]
    assert window.session.title == "Mine"


def test_an_unreadable_list_is_refused_with_a_message(
    qtbot: Any, window: MainWindow, tmp_path: Path, dialogs: Dialogs
) -> None:
    path = tmp_path / "broken.csv"
    path.write_text("author,year\nSomeone,1990\n", encoding="utf-8")
    with qtbot.waitSignal(window.importer.failed, timeout=10_000):
        window.import_list(path)
    qtbot.waitUntil(lambda: bool(dialogs.texts("warning")), timeout=2000)
    text = dialogs.texts("warning")[0]
    assert "broken.csv" in text and "title" in text and "Traceback" not in text
    assert window.import_dialog is None


def test_the_import_models_pass_the_model_tester(
    qtmodeltester: Any, demo_workspace: Workspace, tmp_path: Path
) -> None:
    loaded = load_list(demo_workspace, _outside_list(tmp_path, demo_workspace))
    plan = plan_import(demo_workspace, loaded, set(), "winter_reading.txt")
    for lines in (plan.adding, plan.left_out, ()):
        model = ImportLineModel(lines)
        qtmodeltester.check(model, force_py=True)
        assert model.columnCount() == 3

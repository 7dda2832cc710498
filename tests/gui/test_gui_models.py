"""Every Qt item model passes QAbstractItemModelTester, also while the session changes."""

from __future__ import annotations

from typing import Any

from gui_helpers import HERON, MIRROR, iri_of
from PySide6.QtCore import QModelIndex, Qt

from curator.core.session import ListEntry, Session
from curator.gui.describe import candidate_row, work_line
from curator.gui.models import (
    CandidateModel,
    EntryModel,
    Role,
    SeedModel,
    WorkDrag,
    WorkSearchModel,
)
from curator.services.browse import search_works
from curator.services.sessions import suggest_for_session
from curator.services.workspace import Workspace


def _describe(workspace: Workspace):
    return lambda iri, fallback: work_line(workspace, iri, fallback)


def test_search_model(qtmodeltester: Any, demo_workspace: Workspace) -> None:
    model = WorkSearchModel()
    model.set_results(search_works(demo_workspace, "mirror", 10))
    qtmodeltester.check(model, force_py=True)
    assert model.rowCount() >= 2
    assert "Posy Haverleigh" in model.index(1).data() or "Posy Haverleigh" in model.index(0).data()


def test_seed_model_follows_the_session(qtmodeltester: Any, demo_workspace: Workspace) -> None:
    session = Session()
    model = SeedModel(session, _describe(demo_workspace))
    qtmodeltester.check(model, force_py=True)
    session.add_seed(iri_of(demo_workspace, MIRROR))
    session.add_seed(iri_of(demo_workspace, HERON))
    assert model.rowCount() == 2
    assert model.index(0).data() == MIRROR
    assert "Idony Greyhallow" in model.index(1).data(Role.Byline)
    session.remove_seed(iri_of(demo_workspace, MIRROR))
    assert [model.index(0).data()] == [HERON]


def test_candidate_model(qtmodeltester: Any, demo_workspace: Workspace) -> None:
    session = Session(seeds=[iri_of(demo_workspace, MIRROR)])
    found = suggest_for_session(demo_workspace, session, 10)
    assert found.result is not None
    model = CandidateModel()
    model.set_rows([candidate_row(demo_workspace, s) for s in found.result.suggestions])
    qtmodeltester.check(model, force_py=True)
    first = model.index(0)
    assert 0.0 < first.data(Role.Relevance) <= 1.0
    assert first.data(Role.Tags)
    assert first.data(Role.Rationale) in first.data(Qt.ItemDataRole.ToolTipRole)
    drag = WorkDrag.from_mime(model.mimeData([first, model.index(2)]))
    assert drag is not None
    assert drag.source == "candidates"
    assert drag.iris == (model.iris()[0], model.iris()[2])


def test_entry_model_follows_inserts_moves_and_edits(
    qtmodeltester: Any, demo_workspace: Workspace
) -> None:
    session = Session()
    model = EntryModel(session, _describe(demo_workspace))
    qtmodeltester.check(model, force_py=True)
    works = demo_workspace.index.records[:4]
    for row, record in enumerate(works):
        session.insert_entry(row, ListEntry(record.iri, record.label))
    session.move_entry(0, 3)
    session.move_entry(2, 0)
    session.update_entry(1, note="for the window display")
    session.remove_entry(2)
    assert [model.index(r).data(Role.Iri) for r in range(model.rowCount())] == session.entry_iris
    assert model.index(1).data(Role.Note) == "for the window display"
    session.replace_with(Session())
    assert model.rowCount() == 0


def test_entry_for_a_work_the_catalogue_lacks_keeps_its_label(demo_workspace: Workspace) -> None:
    session = Session(entries=[ListEntry("https://elsewhere.example/w1", "A Lost Book")])
    model = EntryModel(session, _describe(demo_workspace))
    assert model.index(0).data() == "A Lost Book"
    assert "not in the open catalogue" in model.index(0).data(Role.Byline)


def test_damaged_drag_payload_is_ignored() -> None:
    from PySide6.QtCore import QMimeData

    from curator.gui.models import WORK_MIME

    mime = QMimeData()
    mime.setData(WORK_MIME, b"{not json")
    assert WorkDrag.from_mime(mime) is None
    assert WorkDrag.from_mime(QMimeData()) is None
    model = EntryModel(Session(), lambda iri, fb: work_line(None, iri, fb))
    assert not model.dropMimeData(mime, Qt.DropAction.CopyAction, 0, 0, QModelIndex())

"""The main window: three columns (starting titles with browsing and the balance, candidates,
the list), menus, files, import and export, autosave and the status bar. It wires the panels to
the session editor and the workers; the panels themselves know nothing of files, threads or the
undo stack.
"""

from __future__ import annotations

import itertools
import re
import time
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from PySide6.QtCore import QByteArray, QSettings, Qt, QTimer, Signal
from PySide6.QtGui import QAction, QCloseEvent, QKeySequence, QShowEvent, QUndoStack
from PySide6.QtWidgets import (
    QDialog,
    QFileDialog,
    QLabel,
    QMainWindow,
    QMenu,
    QMessageBox,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from curator.core.errors import CuratorError
from curator.core.index import Index
from curator.core.session import ListEntry, ListSettings, Session, SessionEvent
from curator.core.targets import TargetsError
from curator.gui.autosave import DOCUMENT_KEY, Autosaver
from curator.gui.balance_panel import NO_CATALOGUE, BalancePanel
from curator.gui.browse_panel import BrowsePanel
from curator.gui.candidates_panel import CandidatesPanel
from curator.gui.delegates import scaled_font
from curator.gui.describe import (
    CatalogueChoices,
    WorkLine,
    catalogue_choices,
    work_line,
)
from curator.gui.editor import SessionEditor
from curator.gui.endpoint_dialog import EndpointDialog, check_endpoint_url
from curator.gui.export_dialog import ExportDialog
from curator.gui.import_dialog import ImportDialog, plan_import
from curator.gui.list_panel import ListPanel
from curator.gui.models import CandidateModel, EntryModel, SeedModel
from curator.gui.recent import recent_lists, remember, remember_endpoint
from curator.gui.seeds_panel import SEARCH_LIMIT, StartingTitlesPanel
from curator.gui.status import LoadStatus
from curator.gui.targets_dialog import TargetsDialog
from curator.gui.workers import (
    SUGGESTION_STAGES,
    AskAnswer,
    AskRunner,
    BalanceAnswer,
    BalanceRunner,
    CatalogueLoader,
    EndpointOpened,
    Opened,
    SearchFound,
    SuggestionAnswer,
    SuggestionRunner,
    TaskRunner,
    search_endpoint,
)
from curator.services.browse import search_works
from curator.services.endpoint import EndpointWorkspace
from curator.services.publishing import LoadedList, from_session, load_list, publication_for
from curator.services.sessions import (
    catalogue_for_list,
    clear_recovery,
    entry_from,
    read_recovery,
    targets_of,
)
from curator.services.workspace import Workspace

#: Suggestions are recomputed this long after the last change, so a burst of edits costs one.
REFRESH_DEBOUNCE_MS = 50
#: The balance waits a little longer: its charts take the worker about half a second.
BALANCE_DEBOUNCE_MS = 150
#: How the width is shared between starting titles and browse, candidates, and the list.
COLUMN_SHARES = (0.28, 0.40, 0.32)
SESSION_SUFFIX = ".curator.json"
SESSION_FILTER = "curator lists (*.curator.json);;JSON files (*.json);;All files (*)"
CATALOGUE_FILTER = (
    "RDF files (*.ttl *.nt *.nq *.trig *.n3 *.rdf *.owl *.xml *.jsonld *.json);;All files (*)"
)
IMPORT_FILTER = "Lists (*.csv *.tsv *.txt);;curator lists (*.curator.json);;All files (*)"
#: Session changes that change what should be suggested (reordering and notes do not).
_REFRESHING = {"seeds", "entry-inserted", "entry-removed", "dismissed", "settings", "reset"}
#: Session changes that change the balance (the same: the audit ignores order and notes).
_REBALANCING = _REFRESHING - {"dismissed"}
#: Notes of the suggester shown on their own quiet line rather than in the explanation area.
GAPS_NOTE = "Favouring works that fill"
#: Typing waits this long before asking an endpoint for titles (each search is a few queries).
ENDPOINT_SEARCH_DELAY_MS = 250
NO_LANGUAGES_ON_ENDPOINT = (
    "Offering the languages would mean reading every work of the endpoint; on an endpoint "
    "candidates come in all languages."
)
ASKING_FOR_CANDIDATES = (
    "Asking the endpoint for candidates; the status bar shows how far it has got."
)
SUGGESTION_STOPPED = (
    "Suggesting stopped. The candidates shown were suggested before your last change; change "
    "the list or the settings to suggest again."
)
NO_IMPORT_ON_ENDPOINT = (
    "Importing a list matches every title against the whole catalogue, which an endpoint is "
    "not read for; open the catalogue's files to import."
)


def is_endpoint_url(text: str) -> bool:
    """Whether a saved catalogue source is an endpoint's URL rather than a file path."""
    return text.startswith(("http://", "https://")) and check_endpoint_url(text) is None

KEYS_HELP = """\
<table cellpadding='2'>
<tr><td><b>Ctrl+F</b></td><td>find a title to start from</td></tr>
<tr><td><b>Ctrl+1 … Ctrl+5</b></td>
<td>go to starting titles, candidates, your list, browse, balance</td></tr>
<tr><td><b>Enter</b> or <b>Insert</b></td><td>put the selected candidate on your list</td></tr>
<tr><td><b>D</b></td><td>the selected candidate is not for this list</td></tr>
<tr><td><b>S</b></td><td>use the selected candidate or entry as a starting title</td></tr>
<tr><td><b>Ctrl+Up</b>, <b>Ctrl+Down</b></td><td>move the selected entry</td></tr>
<tr><td><b>Delete</b></td><td>remove the selected entry or starting title</td></tr>
<tr><td><b>Alt+Left</b>, <b>Alt+Right</b></td><td>back and forward in Browse</td></tr>
<tr><td><b>Ctrl+Z</b>, <b>Ctrl+Shift+Z</b></td><td>undo and redo</td></tr>
<tr><td><b>Ctrl+T</b></td><td>the list's balance targets</td></tr>
<tr><td><b>Ctrl+E</b></td><td>export the list (web page, PDF, spreadsheet, linked data)</td></tr>
<tr><td><b>Esc</b></td><td>stop loading a catalogue</td></tr>
</table>"""


def default_file_name(title: str) -> str:
    slug = re.sub(r"[^\w]+", "-", title.casefold()).strip("-") or "list"
    return slug + SESSION_SUFFIX


class MainWindow(QMainWindow):
    """One list (the session) against one open catalogue (the workspace)."""

    catalogue_ready = Signal()
    suggestions_shown = Signal()

    def __init__(self, *, languages: Sequence[str] | None = None) -> None:
        super().__init__()
        self.setObjectName("curator-main-window")
        self.languages = tuple(languages) if languages else None
        self.session = Session()
        self.workspace: Opened | None = None
        #: The files opened (() = the demo), or a one-item tuple holding the endpoint's URL.
        self.catalogue_paths: tuple[str, ...] = ()
        #: On an endpoint: what it said about works met so far (searches, suggestions), so the
        #: list and starting titles keep their bylines between suggestions.
        self._lines: dict[str, WorkLine] = {}
        self._missing: set[str] = set()
        self._opening_endpoint = False
        self.document: Path | None = None
        self.last_refresh_seconds: float | None = None
        self.last_compute_seconds: float | None = None
        self._changed_at: float | None = None

        self.undo_stack = QUndoStack(self)
        self.editor = SessionEditor(self.session, self.undo_stack, self._entry_for)
        self.seed_model = SeedModel(self.session, self._describe, self)
        self.candidate_model = CandidateModel(self)
        self.entry_model = EntryModel(self.session, self._describe, self)
        self.seed_model.set_editor(self.editor)
        self.entry_model.set_editor(self.editor)

        self.seeds_panel = StartingTitlesPanel(self.seed_model)
        self.candidates_panel = CandidatesPanel(self.candidate_model)
        self.controls = self.candidates_panel.controls
        self._language_tip = self.controls.language.toolTip()
        self.list_panel = ListPanel(self.entry_model)
        self.browse_panel = BrowsePanel(in_tab=True)
        self.balance_panel = BalancePanel()
        self._build_layout()

        self.summary = QLabel("No catalogue open")
        self.summary.setContentsMargins(self.fontMetrics().averageCharWidth(), 0, 0, 0)
        self.load_status = LoadStatus()
        self.suggest_status = LoadStatus(
            name="Suggestion progress",
            cancel_tip="Stop this suggestion; the candidates shown now stay",
        )
        self.statusBar().addWidget(self.summary, 1)
        self.statusBar().addPermanentWidget(self.suggest_status)
        self.statusBar().addPermanentWidget(self.load_status)

        self.loader = CatalogueLoader(self)
        self.runner = SuggestionRunner(self)
        #: On an endpoint: title searches, and Browse's descriptions of works.
        self.searcher = AskRunner("endpoint search", self)
        self.describer = AskRunner("endpoint browse", self)
        self._searching = ""
        self._browsing = ""
        self.balance_runner = BalanceRunner(self)
        self.importer = TaskRunner("reading the list", self)
        self.autosaver = Autosaver(self.session, self)
        self._refresh_timer = QTimer(self)
        self._refresh_timer.setSingleShot(True)
        self._refresh_timer.setInterval(REFRESH_DEBOUNCE_MS)
        self._refresh_timer.timeout.connect(self._refresh)
        self._balance_timer = QTimer(self)
        self._balance_timer.setSingleShot(True)
        self._balance_timer.setInterval(BALANCE_DEBOUNCE_MS)
        self._balance_timer.timeout.connect(self._refresh_balance)
        #: The balance shown is older than the list (it is computed only while visible).
        self._balance_stale = True
        self._targets_balanced = self.session.settings.targets
        self.targets_dialog: TargetsDialog | None = None
        self.export_dialog: ExportDialog | None = None
        self.import_dialog: ImportDialog | None = None
        self.endpoint_dialog: EndpointDialog | None = None
        self._importing: tuple[Path, Workspace] | None = None

        self._build_actions()
        self._build_menus()
        self._connect()
        self._set_tab_order()
        self.seeds_panel.set_search(None)
        self.list_panel.set_title(self.session.title)
        self.candidates_panel.set_message("Opening the catalogue…")
        self._update_title()
        self._restore_geometry()

    # ----- building ------------------------------------------------------------------------

    def _build_layout(self) -> None:
        # Browse and Balance share the lower left: both are about the list's works, and a
        # curator looks at one or the other. The tabs carry the headings.
        self.lower_tabs = QTabWidget()
        self.lower_tabs.setDocumentMode(True)
        self.lower_tabs.tabBar().setFont(scaled_font(self.font(), 1.15, bold=True))
        self.lower_tabs.tabBar().setExpanding(False)
        self.lower_tabs.addTab(self.browse_panel, "B&rowse")
        self.lower_tabs.addTab(self.balance_panel, "Balance")
        self.lower_tabs.setTabToolTip(0, "What the catalogue says about a work (Ctrl+4)")
        self.lower_tabs.setTabToolTip(
            1, "How the list is spread over kinds, decades, creators… and its targets (Ctrl+5)"
        )
        self.left = QSplitter(Qt.Orientation.Vertical)
        self.left.setChildrenCollapsible(False)
        self.left.addWidget(self.seeds_panel)
        self.left.addWidget(self.lower_tabs)
        self.left.setStretchFactor(0, 2)
        self.left.setStretchFactor(1, 3)
        self.columns = QSplitter(Qt.Orientation.Horizontal)
        self.columns.setChildrenCollapsible(False)
        for widget in (self.left, self.candidates_panel, self.list_panel):
            self.columns.addWidget(widget)
        for column, share in enumerate(COLUMN_SHARES):
            self.columns.setStretchFactor(column, round(share * 100))
        centre = QWidget()
        layout = QVBoxLayout(centre)
        margin = self.fontMetrics().averageCharWidth() * 2
        layout.setContentsMargins(margin, margin // 2, margin, 0)
        layout.addWidget(self.columns)
        self.columns.setHandleWidth(margin)
        self.left.setHandleWidth(margin)
        self.setCentralWidget(centre)

    def _action(
        self, text: str, slot: object, shortcut: QKeySequence | str | None = None, tip: str = ""
    ) -> QAction:
        action = QAction(text, self)
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        if tip:
            action.setToolTip(tip)
            action.setStatusTip(tip)
        action.triggered.connect(slot)
        return action

    def _build_actions(self) -> None:
        std = QKeySequence.StandardKey
        self.new_action = self._action(
            "&New list", self.new_list, QKeySequence(std.New), "Start an empty list"
        )
        self.open_action = self._action(
            "&Open list…", self.open_list_dialog, QKeySequence(std.Open), "Open a saved list"
        )
        self.save_action = self._action("&Save", self.save, QKeySequence(std.Save), "Save the list")
        self.save_as_action = self._action(
            "Save &as…", self.save_as, "Ctrl+Shift+S", "Save the list under a new name"
        )
        self.catalogue_action = self._action(
            "Open &catalogue…",
            self.open_catalogue_dialog,
            "Ctrl+Shift+O",
            "Open RDF files of your catalogue (Turtle, N-Triples, RDF/XML, JSON-LD…)",
        )
        self.folder_action = self._action(
            "Open catalogue &folder…",
            self.open_folder_dialog,
            None,
            "Open every RDF file in a folder",
        )
        self.endpoint_action = self._action(
            "Open an &endpoint…",
            self.open_endpoint_dialog,
            None,
            "Use a SPARQL endpoint as the catalogue (give its query URL)",
        )
        self.demo_action = self._action(
            "Open the &demo collection",
            lambda: self.open_catalogue([]),
            None,
            "The invented library of Hollinmere",
        )
        self.import_action = self._action(
            "&Import a list…",
            self.import_list_dialog,
            None,
            "Add the works of a list made elsewhere (CSV, or one title a line)",
        )
        self.export_action = self._action(
            "&Export list…",
            self.export_list,
            "Ctrl+E",
            "Publish the list as a web page, PDF, Markdown, spreadsheet or linked data",
        )
        self.targets_action = self._action(
            "Balance &targets…",
            self.edit_targets,
            "Ctrl+T",
            "Say what balance this list should have",
        )
        for action in (self.import_action, self.export_action):
            action.setEnabled(False)
        self.quit_action = self._action("&Quit", self.close, QKeySequence(std.Quit))
        self.undo_action = self.undo_stack.createUndoAction(self, "&Undo")
        self.undo_action.setShortcut(QKeySequence(std.Undo))
        self.redo_action = self.undo_stack.createRedoAction(self, "&Redo")
        self.redo_action.setShortcuts([QKeySequence("Ctrl+Shift+Z"), QKeySequence("Ctrl+Y")])
        self.find_action = self._action(
            "&Find a title", self._focus_search, QKeySequence(std.Find), "Find a work to start from"
        )
        self.stop_action = self._action(
            "S&top loading", self.loader.cancel, "Esc", "Stop loading the catalogue"
        )
        self.stop_action.setEnabled(False)
        self.focus_actions = [
            self._action(text, slot, f"Ctrl+{n}")
            for n, (text, slot) in enumerate(
                (
                    ("&Starting titles", self._focus_search),
                    ("&Candidates", lambda: self.candidates_panel.view.setFocus()),
                    ("Your &list", lambda: self.list_panel.view.setFocus()),
                    ("&Browse", self.show_browse),
                    ("B&alance", self.show_balance),
                ),
                start=1,
            )
        ]
        for action in (*self.focus_actions, self.stop_action):
            self.addAction(action)

    def _build_menus(self) -> None:
        bar = self.menuBar()
        file_menu = bar.addMenu("&File")
        file_menu.addActions([self.new_action, self.open_action])
        self.recent_menu = QMenu("Open &recent", self)
        self.recent_menu.aboutToShow.connect(self._fill_recent)
        file_menu.addMenu(self.recent_menu)
        file_menu.addActions([self.save_action, self.save_as_action])
        file_menu.addSeparator()
        file_menu.addActions([self.import_action, self.export_action])
        file_menu.addSeparator()
        file_menu.addActions(
            [
                self.catalogue_action,
                self.folder_action,
                self.endpoint_action,
                self.demo_action,
                self.stop_action,
            ]
        )
        file_menu.addSeparator()
        file_menu.addAction(self.quit_action)

        edit = bar.addMenu("&Edit")
        edit.addActions([self.undo_action, self.redo_action])
        edit.addSeparator()
        c = self.candidates_panel
        edit.addActions([c.add_action, c.dismiss_action, c.seed_action])
        edit.addSeparator()
        lp = self.list_panel
        edit.addActions([lp.up_action, lp.down_action, lp.remove_action, lp.seed_action])
        edit.addSeparator()
        edit.addAction(self.targets_action)
        edit.addAction(self.find_action)

        view = bar.addMenu("&View")
        view.addActions(self.focus_actions)
        go = bar.addMenu("&Go")
        go.addActions([self.browse_panel.back_action, self.browse_panel.forward_action])
        help_menu = bar.addMenu("&Help")
        help_menu.addAction(self._action("&Keyboard", self._show_keys))
        help_menu.addAction(self._action("&About curator", self._show_about))

    def _connect(self) -> None:
        self.session.subscribe(self._on_session)
        self.undo_stack.cleanChanged.connect(self._clean_changed)
        self.undo_stack.indexChanged.connect(self._stack_changed)

        self.seeds_panel.seed_chosen.connect(self._seed_one)
        self.seeds_panel.remove_requested.connect(self.editor.remove_seed)
        self.seeds_panel.work_selected.connect(self.browse_panel.show_iri)

        c = self.candidates_panel
        c.accept_requested.connect(self._accept_many)
        c.dismiss_requested.connect(self.editor.dismiss)
        c.seed_requested.connect(self.editor.add_seeds)
        c.work_selected.connect(self.browse_panel.show_iri)
        self.controls.edited.connect(self._settings_edited)

        lp = self.list_panel
        lp.move_requested.connect(self._move_entry)
        lp.remove_requested.connect(self.editor.remove_entries)
        lp.seed_requested.connect(self.editor.add_seeds)
        lp.edit_requested.connect(self.editor.edit_entry)
        lp.title_edited.connect(self.editor.set_title)
        lp.work_selected.connect(self.browse_panel.show_iri)

        self.browse_panel.add_requested.connect(self._accept_one)
        self.browse_panel.seed_requested.connect(self._seed_one)
        self.balance_panel.refresh_wanted.connect(self._balance_wanted)
        self.balance_panel.edit_targets_requested.connect(self.edit_targets)

        self.loader.started.connect(self._load_started)
        self.loader.progressed.connect(self.load_status.report)
        self.loader.loaded.connect(self._loaded)
        self.loader.failed.connect(self._load_failed)
        self.loader.cancelled.connect(self._load_cancelled)
        self.loader.finished.connect(self._load_finished)
        self.load_status.cancel_requested.connect(self.cancel_loading)
        self.runner.ready.connect(self._show_answer)
        self.runner.progressed.connect(self.suggest_status.report)
        self.suggest_status.cancel_requested.connect(self.cancel_suggestion)
        self.seeds_panel.search_wanted.connect(self._search_endpoint)
        self.searcher.ready.connect(self._search_answered)
        self.browse_panel.details_wanted.connect(self._describe_for_browse)
        self.describer.ready.connect(self._browse_answered)
        self.balance_runner.ready.connect(self._show_balance)
        self.importer.done.connect(self._list_read)
        self.importer.failed.connect(self._list_failed)

    def _set_tab_order(self) -> None:
        s, c, lp = self.seeds_panel, self.candidates_panel, self.list_panel
        ctl = self.controls
        chain: list[QWidget] = [
            s.field,
            s.view,
            ctl.slider,
            ctl.kind,
            ctl.year_from,
            ctl.year_to,
            ctl.language,
            ctl.fill_gaps,
            c.view,
            lp.title,
            lp.view,
            lp.rationale,
            lp.note,
            self.browse_panel.page,
        ]
        for first, second in itertools.pairwise(chain):
            QWidget.setTabOrder(first, second)

    # ----- the session -------------------------------------------------------------------

    @property
    def endpoint_mode(self) -> bool:
        return isinstance(self.workspace, EndpointWorkspace)

    def _describe(self, iri: str, fallback: str) -> WorkLine:
        if not self.endpoint_mode:
            return work_line(self.workspace, iri, fallback)
        if iri in self._lines:
            return self._lines[iri]
        line = work_line(self.workspace, iri, fallback)
        if iri in self._missing:
            return WorkLine(iri, line.title, "not at this endpoint")
        if line.byline == "not in the open catalogue":  # not met yet: the saved title will do
            return WorkLine(iri, line.title, "")
        return line

    def _entry_for(self, iri: str) -> ListEntry:
        """An entry for ``iri``: with the suggestion's rationale when it was a candidate."""
        row = self.candidate_model.row_for(iri)
        if row is not None:
            return entry_from(row.suggestion)
        index = self.workspace.index if self.workspace is not None else None
        if index is not None and iri in index.position:
            return ListEntry(iri=iri, label=index.record(iri).label)
        return ListEntry(iri=iri, label=self._describe(iri, iri).title)

    def _on_session(self, event: SessionEvent) -> None:
        if event.kind in ("title", "reset"):
            self.list_panel.set_title(self.session.title)
            self._update_title()
        if event.kind in ("settings", "reset"):
            self.controls.set_settings(self.session.settings)
        if event.kind in _REFRESHING:
            self.schedule_refresh()
        if event.kind in _REBALANCING:
            # Of the settings only the targets count (the slider and filters change nothing).
            targets = self.session.settings.targets
            if event.kind != "settings" or targets != self._targets_balanced:
                self._targets_balanced = targets
                self.schedule_balance()
        if event.kind in ("entry-inserted", "entry-removed", "reset"):
            self._update_actions()

    def _stack_changed(self, _index: int) -> None:
        if self.undo_stack.isClean():
            self.autosaver.saved()
        else:
            self.autosaver.changed()
        self._update_title()

    def _clean_changed(self, _clean: bool) -> None:
        self._update_title()

    def _seed_one(self, iri: str) -> None:
        self.editor.add_seeds([iri])

    def _accept_one(self, iri: str) -> None:
        self.editor.accept([iri])

    def _accept_many(self, iris: list[str]) -> None:
        self.editor.accept(iris)

    def _settings_edited(self, settings: ListSettings, control: str) -> None:
        self.editor.change_settings(settings, control)

    def _move_entry(self, row: int, to: int) -> None:
        if self.editor.move_entry(row, to):
            self.list_panel.select_row(to)

    def is_modified(self) -> bool:
        return not self.undo_stack.isClean()

    def _update_title(self) -> None:
        self.setWindowTitle(f"{self.session.title}[*] — curator")
        self.setWindowModified(self.is_modified())

    def _replace_session(self, other: Session, document: Path | None) -> None:
        self._forget_suggestion()
        self.balance_runner.invalidate()
        self.session.replace_with(other)
        self.undo_stack.clear()
        self.document = document
        self.autosaver.document = str(document or "")

    # ----- suggestions -----------------------------------------------------------------------

    def schedule_refresh(self) -> None:
        """Recompute suggestions soon (debounced); the first unserved change starts the clock."""
        if self._changed_at is None:
            self._changed_at = time.perf_counter()
        self._refresh_timer.start()

    def _refresh(self) -> None:
        if self.workspace is None:
            return
        if not self.session.seeds:
            self._forget_suggestion()
            self.candidate_model.set_rows([])
            self.candidates_panel.set_status("")
            self.candidates_panel.set_gaps_note("")
            self.candidates_panel.set_message(
                "Add a starting title (on the left) and candidates that fit it appear here."
            )
            self._served(None)
            return
        self.runner.request(self.workspace, self.session)
        if self.endpoint_mode and self.suggest_status.isHidden():
            self.suggest_status.begin(SUGGESTION_STAGES[0])
            self.candidates_panel.set_status("Suggesting…")
            if not self.candidate_model.rowCount():
                self.candidates_panel.set_message(ASKING_FOR_CANDIDATES)

    def _forget_suggestion(self) -> None:
        """Drop the suggestion in flight (its answer would be for another list or catalogue)."""
        self.runner.invalidate()
        self.suggest_status.end()

    def cancel_suggestion(self) -> None:
        """Stop the suggestion under way; the candidates shown stay, and we say they are old."""
        if self.suggest_status.isHidden():
            return
        self._forget_suggestion()
        count = self.candidate_model.rowCount()
        self.candidates_panel.set_status(
            f"Stopped · {count} from before your last change" if count else "Stopped"
        )
        self.candidates_panel.status.setToolTip(SUGGESTION_STOPPED)
        self.candidates_panel.set_message(SUGGESTION_STOPPED)
        self._changed_at = None
        self.statusBar().showMessage(SUGGESTION_STOPPED, 8000)

    def _show_answer(self, answer: SuggestionAnswer) -> None:
        self.suggest_status.end()
        if answer.lines is not None:
            missing = set(answer.suggestions.missing) if answer.suggestions else self._missing
            if answer.lines.items() - self._lines.items() or missing != self._missing:
                self._lines.update(answer.lines)
                self._missing = missing
                self.seed_model.refresh_lines()
                self.entry_model.refresh_lines()
        self.candidate_model.set_rows(answer.rows)
        count = len(answer.rows)
        self.candidates_panel.set_status(f"{count} candidate{'s' if count != 1 else ''}")
        message = answer.error or ""
        if answer.suggestions is not None:
            notes = list(answer.suggestions.result.notes) if answer.suggestions.result else []
            missing = len(answer.suggestions.missing)
            if missing:
                where = "at this endpoint" if self.endpoint_mode else "in the open catalogue"
                notes.append(
                    f"{missing} work{'s' if missing != 1 else ''} of this list "
                    f"{'are' if missing != 1 else 'is'} not {where}; "
                    "kept on the list, left out of the suggestions."
                )
            gaps = [n for n in notes if n.startswith(GAPS_NOTE)]
            self.candidates_panel.set_gaps_note(gaps[0] if gaps else "")
            if not message and notes:
                message = " ".join(n for n in notes if not n.startswith(("Ranked by", GAPS_NOTE)))
        else:
            self.candidates_panel.set_gaps_note("")
        self.candidates_panel.set_message(message)
        self._served(answer.seconds)

    def _served(self, compute_seconds: float | None) -> None:
        if self._changed_at is not None:
            self.last_refresh_seconds = time.perf_counter() - self._changed_at
            self._changed_at = None
        self.last_compute_seconds = compute_seconds
        if self.last_refresh_seconds is not None:
            self.candidates_panel.status.setToolTip(
                f"Refreshed {self.last_refresh_seconds * 1000:.0f} ms after the change"
            )
        self.suggestions_shown.emit()

    # ----- the balance ----------------------------------------------------------------------

    def schedule_balance(self) -> None:
        """The list changed: recompute the balance soon, if it is on screen (else when shown)."""
        self._balance_stale = True
        if self.balance_panel.isVisible():
            self._balance_timer.start()

    def _balance_wanted(self) -> None:
        """The panel was shown or resized: refresh if the list changed or the charts no longer
        fit its width."""
        if self._balance_stale or self.balance_panel.needs_chart():
            self._balance_timer.start()

    def _refresh_balance(self) -> None:
        if self.workspace is None:
            self.balance_panel.show_nothing(NO_CATALOGUE)
            return
        if not self.balance_panel.isVisible():
            return
        self._balance_stale = False
        self.balance_panel.set_pending()
        self.balance_runner.request(self.workspace, self.session, self.balance_panel.chart_style())

    def _show_balance(self, answer: BalanceAnswer) -> None:
        if answer.report is None:
            self.balance_panel.show_nothing(answer.error or "The balance could not be computed.")
        else:
            self.balance_panel.show_report(answer.report)

    def show_balance(self) -> None:
        self.lower_tabs.setCurrentWidget(self.balance_panel)
        self.balance_panel.scroll.setFocus()

    def show_browse(self) -> None:
        self.lower_tabs.setCurrentWidget(self.browse_panel)
        self.browse_panel.page.setFocus()

    def edit_targets(self) -> TargetsDialog:
        """Open the targets editor (window-modal, not blocking); Apply stores them as one step."""
        if self.targets_dialog is not None and self.targets_dialog.isVisible():
            self.targets_dialog.raise_()
            return self.targets_dialog
        dialog = TargetsDialog(self.session.settings.targets, parent=self)
        dialog.applied.connect(self.editor.set_targets)
        self._open_dialog(dialog, "targets_dialog")
        return dialog

    def _open_dialog(self, dialog: QDialog, name: str) -> None:
        """Show ``dialog`` window-modal without blocking, kept as ``self.<name>`` until it
        closes (tests and the shutdown reach it there); then it is forgotten and deleted."""

        def closed(_result: int) -> None:
            if getattr(self, name) is dialog:
                setattr(self, name, None)
            dialog.deleteLater()

        dialog.finished.connect(closed)
        setattr(self, name, dialog)
        dialog.open()

    # ----- import and export -----------------------------------------------------------------

    def _update_actions(self) -> None:
        importable = self.workspace is not None and not self.endpoint_mode
        self.import_action.setEnabled(importable)
        tip = NO_IMPORT_ON_ENDPOINT if self.endpoint_mode else (
            "Add the works of a list made elsewhere (CSV, or one title a line)"
        )
        self.import_action.setToolTip(tip)
        self.import_action.setStatusTip(tip)
        self.export_action.setEnabled(self.workspace is not None and bool(self.session.entries))

    def export_list(self) -> ExportDialog | None:
        """Open the export dialog on the list as it is now."""
        if self.workspace is None or not self.session.entries:
            return None
        notice = ""
        try:
            targets = targets_of(self.session.settings)
        except TargetsError as exc:
            targets = None
            notice = f"Exported without targets: {exc}"
        try:
            # On an endpoint, the list's works are described for the export (a few queries).
            catalogue: Any = catalogue_for_list(self.workspace, self.session)
        except CuratorError as exc:
            QMessageBox.warning(self, "The list could not be exported", str(exc))
            return None
        publication = publication_for(catalogue, from_session(catalogue, self.session), targets)
        dialog = ExportDialog(
            publication,
            targets,
            folder=self.document.parent if self.document else None,
            notice=notice,
            parent=self,
        )
        dialog.written.connect(
            lambda path: self.statusBar().showMessage(f"Exported to {path}", 8000)
        )
        self._open_dialog(dialog, "export_dialog")
        return dialog

    def import_list_dialog(self) -> None:
        start = str(self.document.parent) if self.document else ""
        path, _ = QFileDialog.getOpenFileName(self, "Import a list", start, IMPORT_FILTER)
        if path:
            self.import_list(Path(path))

    def import_list(self, path: Path) -> bool:
        """Read and match ``path`` in the background; the import dialog follows."""
        workspace = self.workspace
        if not isinstance(workspace, Workspace) or self.importer.busy:
            return False
        self._importing = (Path(path), workspace)
        self.statusBar().showMessage(f"Reading {Path(path).name}…")
        return self.importer.start(lambda: load_list(workspace, Path(path)))

    def _list_read(self, loaded: Any) -> None:
        self.statusBar().clearMessage()
        importing, self._importing = self._importing, None
        if importing is None or not isinstance(loaded, LoadedList):
            return
        path, workspace = importing
        if workspace is not self.workspace:  # matched against a catalogue that is closed now
            self.statusBar().showMessage(
                f"The catalogue changed while {path.name} was read; import it again.", 8000
            )
            return
        plan = plan_import(workspace, loaded, set(self.session.entry_iris), path.name)
        dialog = ImportDialog(plan, self)
        dialog.accepted.connect(
            lambda: self.editor.import_entries(plan.entries, plan.source, plan.title)
        )
        self._open_dialog(dialog, "import_dialog")

    def _list_failed(self, message: str) -> None:
        self._importing = None
        self.statusBar().clearMessage()
        QMessageBox.warning(self, "The list could not be imported", message)

    # ----- catalogues ------------------------------------------------------------------------

    def open_catalogue(self, paths: Sequence[str | Path]) -> bool:
        """Start loading ``paths`` (the demo collection when empty) in the background."""
        if self.loader.busy:
            self.statusBar().showMessage("A catalogue is loading already; wait or press Esc.", 5000)
            return False
        self._opening_endpoint = False
        return self.loader.start([str(p) for p in paths], self.languages)

    def open_endpoint(self, url: str, timeout: float = 30.0) -> bool:
        """Connect to a SPARQL endpoint (its query URL) in the background and use it as the
        catalogue once it has answered; until then the open catalogue stays."""
        problem = check_endpoint_url(url)
        if problem is not None:
            QMessageBox.warning(self, "The endpoint could not be opened", problem)
            return False
        if self.loader.busy:
            self.statusBar().showMessage("A catalogue is loading already; wait or press Esc.", 5000)
            return False
        self._opening_endpoint = True
        return self.loader.start([], self.languages, endpoint=url.strip(), timeout=timeout)

    def open_endpoint_dialog(self) -> EndpointDialog:
        """Ask for an endpoint's URL and timeout (window-modal, not blocking)."""
        if self.endpoint_dialog is not None and self.endpoint_dialog.isVisible():
            self.endpoint_dialog.raise_()
            return self.endpoint_dialog
        dialog = EndpointDialog(self)
        if self.endpoint_mode:
            dialog.set_url(self.catalogue_paths[0])
        dialog.chosen.connect(self.open_endpoint)
        self._open_dialog(dialog, "endpoint_dialog")
        return dialog

    def open_catalogue_dialog(self) -> None:
        files, _ = QFileDialog.getOpenFileNames(self, "Open catalogue files", "", CATALOGUE_FILTER)
        if files:
            self.open_catalogue(files)

    def open_folder_dialog(self) -> None:
        folder = QFileDialog.getExistingDirectory(self, "Open a catalogue folder")
        if folder:
            self.open_catalogue([folder])

    def cancel_loading(self) -> None:
        self.load_status.cancelling()
        self.loader.cancel()

    def _opening_actions(self) -> tuple[QAction, ...]:
        return (self.catalogue_action, self.folder_action, self.endpoint_action, self.demo_action)

    def _load_started(self) -> None:
        self.load_status.begin(
            "Asking the endpoint…" if self._opening_endpoint else "Opening the catalogue…"
        )
        self.stop_action.setEnabled(True)
        for action in self._opening_actions():
            action.setEnabled(False)

    def _load_finished(self) -> None:
        self.load_status.end()
        self.stop_action.setEnabled(False)
        for action in self._opening_actions():
            action.setEnabled(True)

    def _loaded(self, opened: Workspace | EndpointOpened, paths: tuple[str, ...]) -> None:
        if isinstance(opened, EndpointOpened):
            remember_endpoint(opened.workspace.url)
            self.set_workspace(opened.workspace, paths, opened.choices)
        else:
            self.set_workspace(opened, paths)

    def _load_failed(self, message: str) -> None:
        if self.workspace is None:
            kept = "No catalogue is open; choose another with File ▸ Open catalogue."
        elif self.endpoint_mode:
            kept = f"The endpoint that was open before ({self.catalogue_paths[0]}) is still open."
        else:
            kept = "The catalogue that was open before is still open."
        what = "endpoint" if self._opening_endpoint else "catalogue"
        QMessageBox.warning(self, f"The {what} could not be opened", f"{message}\n\n{kept}")

    def _load_cancelled(self) -> None:
        self.statusBar().showMessage("Loading stopped; nothing was changed.", 5000)

    def set_workspace(
        self,
        workspace: Opened,
        paths: Sequence[str] = (),
        choices: CatalogueChoices | None = None,
    ) -> None:
        """Show and suggest from ``workspace`` from now on (``paths`` as opened; () = demo; for
        an endpoint, its URL, with the ``choices`` its controls offer)."""
        self._forget_suggestion()
        self.searcher.invalidate()
        self.describer.invalidate()
        self.workspace = workspace
        self.catalogue_paths = tuple(str(p) for p in paths)
        self._lines, self._missing = {}, set()
        if isinstance(workspace, EndpointWorkspace):
            self.catalogue_paths = (workspace.url,)
            self.seeds_panel.set_asked_search(delay_ms=ENDPOINT_SEARCH_DELAY_MS)
            self.controls.set_choices(choices or CatalogueChoices((), (), None))
            self.controls.language.setEnabled(False)
            self.controls.language.setToolTip(NO_LANGUAGES_ON_ENDPOINT)
            self.summary.setText(f"SPARQL endpoint: {workspace.summary_text()}")
            self.summary.setToolTip(
                f"Searches and suggestions ask {workspace.url}; each suggestion reads only the "
                "works near the starting titles."
            )
        else:
            self.seeds_panel.set_search(lambda text, limit: search_works(workspace, text, limit))
            self.controls.set_choices(catalogue_choices(workspace))
            self.controls.language.setEnabled(True)
            self.controls.language.setToolTip(self._language_tip)
            self.summary.setText(workspace.summary().text())
            self.summary.setToolTip("\n".join(str(s.path) for s in workspace.sources))
        self.seed_model.refresh_lines()
        self.entry_model.refresh_lines()
        self.browse_panel.set_workspace(workspace)
        self.candidate_model.set_rows([])
        self.candidates_panel.set_message("")
        self.balance_runner.invalidate()
        self._update_actions()
        self.schedule_refresh()
        self.schedule_balance()
        self.catalogue_ready.emit()

    def _search_endpoint(self, text: str) -> None:
        """Search the endpoint's titles in the worker ("" drops the search under way)."""
        workspace = self.workspace
        self._searching = text
        if not text or not isinstance(workspace, EndpointWorkspace):
            self.searcher.invalidate()
            return
        self.searcher.request(
            lambda progress: search_endpoint(workspace, text, SEARCH_LIMIT, progress)
        )

    def _search_answered(self, answer: AskAnswer) -> None:
        """What the endpoint found is remembered for the bylines and offered in the popup; a
        failure is said under the field rather than raised into the typing."""
        if answer.error is not None or not isinstance(answer.value, SearchFound):
            self.seeds_panel.show_search_failed(self._searching, answer.error or "no answer.")
            return
        found = answer.value
        for iri, line in found.lines.items():
            self._lines.setdefault(iri, line)
        self.seeds_panel.show_results(found.text, list(found.summaries))

    def _describe_for_browse(self, iri: str) -> None:
        """Ask the endpoint about a work for Browse, in the worker."""
        workspace = self.workspace
        if not isinstance(workspace, EndpointWorkspace):
            return
        self._browsing = iri
        self.describer.request(lambda progress: workspace.details(iri, progress)[1])

    def _browse_answered(self, answer: AskAnswer) -> None:
        index = answer.value if isinstance(answer.value, Index) else None
        self.browse_panel.show_details(self._browsing, index, answer.error)

    # ----- files -----------------------------------------------------------------------------

    def _confirm_discard(self) -> bool:
        """Ask before unsaved work would be lost; True when it is safe to go on."""
        if not self.is_modified():
            return True
        answer = QMessageBox.question(
            self,
            "Save the list?",
            f"“{self.session.title}” has changes that are not saved.",
            QMessageBox.StandardButton.Save
            | QMessageBox.StandardButton.Discard
            | QMessageBox.StandardButton.Cancel,
            QMessageBox.StandardButton.Save,
        )
        if answer == QMessageBox.StandardButton.Save:
            return self.save()
        return answer == QMessageBox.StandardButton.Discard

    def new_list(self) -> None:
        if self._confirm_discard():
            self._replace_session(Session(), None)
            self.autosaver.saved()
            self._update_title()

    def open_list_dialog(self) -> None:
        if not self._confirm_discard():
            return
        start = str(self.document.parent) if self.document else ""
        path, _ = QFileDialog.getOpenFileName(self, "Open a list", start, SESSION_FILTER)
        if path:
            self.open_list(Path(path), confirm=False)

    def open_list(self, path: Path, *, confirm: bool = True) -> bool:
        """Open a saved list; a damaged file is refused with a message and nothing changes."""
        if confirm and not self._confirm_discard():
            return False
        try:
            loaded = Session.load(path)
        except CuratorError as exc:
            QMessageBox.warning(self, "The list could not be opened", str(exc))
            return False
        self._replace_session(loaded, Path(path))
        self.autosaver.saved()
        remember(Path(path))
        self._update_title()
        wanted = tuple(loaded.catalogue)
        if wanted and wanted != self.catalogue_paths:
            if len(wanted) == 1 and is_endpoint_url(wanted[0]):
                self.open_endpoint(wanted[0])
            elif all(Path(p).exists() for p in wanted):
                self.open_catalogue(wanted)
            else:
                self.statusBar().showMessage(
                    "The catalogue this list was made with is not here; showing it against "
                    "the one that is open.",
                    8000,
                )
        return True

    def save(self) -> bool:
        if self.document is None:
            return self.save_as()
        return self.save_to(self.document)

    def save_as(self) -> bool:
        start = (
            str(self.document)
            if self.document
            else str(Path.home() / default_file_name(self.session.title))
        )
        path, _ = QFileDialog.getSaveFileName(self, "Save the list", start, SESSION_FILTER)
        if not path:
            return False
        if not path.endswith(".json"):
            path += SESSION_SUFFIX
        return self.save_to(Path(path))

    def save_to(self, path: Path) -> bool:
        """Write the list (atomically); on failure the old file is untouched and we say why."""
        self.session.catalogue = list(self.catalogue_paths)
        try:
            self.session.save(Path(path))
        except (OSError, CuratorError) as exc:
            QMessageBox.warning(self, "The list could not be saved", f"{path}: {exc}")
            return False
        self.document = Path(path)
        self.autosaver.document = str(path)
        self.undo_stack.setClean()
        self.autosaver.saved()
        remember(Path(path))
        self._update_title()
        self.statusBar().showMessage(f"Saved to {path}", 5000)
        return True

    def _fill_recent(self) -> None:
        self.recent_menu.clear()
        paths = recent_lists()
        for number, path in enumerate(paths, start=1):
            action = self.recent_menu.addAction(f"&{number} {path.name}")
            action.setToolTip(str(path))
            action.triggered.connect(lambda _c=False, p=path: self.open_list(p))
        if not paths:
            self.recent_menu.addAction("No recent lists").setEnabled(False)

    # ----- starting and stopping -------------------------------------------------------------

    def start(
        self,
        paths: Sequence[str] | None = None,
        *,
        endpoint: str | None = None,
        timeout: float = 30.0,
    ) -> None:
        """Offer back unsaved work from a crash, then open the catalogue (or ``endpoint``)."""
        recovered = self.offer_recovery()
        chosen = list(paths or [])
        if (
            endpoint is None
            and not chosen
            and recovered is not None
            and len(recovered.catalogue) == 1
            and is_endpoint_url(recovered.catalogue[0])
        ):
            endpoint = recovered.catalogue[0]
        if endpoint is not None:
            if not self.open_endpoint(endpoint, timeout):
                self.open_catalogue([])  # a bad URL: say so, and open the demo meanwhile
            return
        if (
            not chosen
            and recovered is not None
            and recovered.catalogue
            and all(Path(p).exists() for p in recovered.catalogue)
        ):
            chosen = list(recovered.catalogue)
        self.open_catalogue(chosen)

    def offer_recovery(self) -> Session | None:
        """If the last run left unsaved work, ask whether to restore it."""
        found = read_recovery()
        if found is None:
            return None
        answer = QMessageBox.question(
            self,
            "Restore your unsaved list?",
            f"curator did not close properly last time. Restore “{found.title}” as it was "
            f"({len(found.entries)} entries, {len(found.seeds)} starting titles)?",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No,
            QMessageBox.StandardButton.Yes,
        )
        if answer != QMessageBox.StandardButton.Yes:
            clear_recovery()
            return None
        saved_as = str(QSettings().value(DOCUMENT_KEY, "") or "")
        self._replace_session(found, Path(saved_as) if saved_as else None)
        self.undo_stack.resetClean()
        self.autosaver.changed()
        self._update_title()
        return found

    def closeEvent(self, event: QCloseEvent) -> None:
        if not self._confirm_discard():
            event.ignore()
            return
        self.shutdown()
        event.accept()

    def shutdown(self) -> None:
        """Stop the workers and timers, remember the layout, and remove the recovery file."""
        self._save_geometry()
        self._refresh_timer.stop()
        self._balance_timer.stop()
        for dialog in (
            self.export_dialog,
            self.import_dialog,
            self.targets_dialog,
            self.endpoint_dialog,
        ):
            if dialog is not None:
                dialog.reject()
        self.loader.stop()
        self.runner.stop()
        self.searcher.stop()
        self.describer.stop()
        self.balance_runner.stop()
        self.importer.stop()
        self.autosaver.stop()
        clear_recovery()
        self.session.unsubscribe(self._on_session)
        self.seed_model.detach()
        self.entry_model.detach()

    # ----- remembering the layout --------------------------------------------------------------

    def _save_geometry(self) -> None:
        settings = QSettings()
        settings.setValue("window/geometry", self.saveGeometry())
        settings.setValue("window/state", self.saveState())
        settings.setValue("window/columns", self.columns.saveState())
        settings.setValue("window/left", self.left.saveState())
        settings.setValue("window/list", self.list_panel.splitter.saveState())

    def _restore_geometry(self) -> None:
        settings = QSettings()
        geometry = settings.value("window/geometry")
        if isinstance(geometry, QByteArray) and not geometry.isEmpty():
            self.restoreGeometry(geometry)
        else:
            metrics = self.fontMetrics()
            self.resize(metrics.averageCharWidth() * 190, metrics.height() * 48)
        self._splitters_restored = False
        for key, target in (
            ("window/state", self.restoreState),
            ("window/columns", self.columns.restoreState),
            ("window/left", self.left.restoreState),
            ("window/list", self.list_panel.splitter.restoreState),
        ):
            value = settings.value(key)
            if isinstance(value, QByteArray) and not value.isEmpty():
                self._splitters_restored = bool(target(value)) or self._splitters_restored

    def showEvent(self, event: QShowEvent) -> None:
        """On a first run, share the width out by what each column needs (not by size hints)."""
        super().showEvent(event)
        if self._splitters_restored:
            return
        self._splitters_restored = True
        width = max(self.columns.width(), 1)
        self.columns.setSizes([round(width * share) for share in COLUMN_SHARES])
        height = max(self.left.height(), 1)
        self.left.setSizes([round(height * 0.24), round(height * 0.76)])
        list_height = max(self.list_panel.splitter.height(), 1)
        self.list_panel.splitter.setSizes([round(list_height * 0.6), round(list_height * 0.4)])

    # ----- small things --------------------------------------------------------------------------

    def _focus_search(self) -> None:
        self.seeds_panel.field.setFocus()
        self.seeds_panel.field.selectAll()

    def _show_keys(self) -> None:
        QMessageBox.information(self, "Keyboard", KEYS_HELP)

    def _show_about(self) -> None:
        QMessageBox.about(
            self,
            "About curator",
            "<p><b>curator</b> helps you build themed reading and viewing lists from your own "
            "catalogue: start from a few titles, take the candidates that fit, keep the list "
            "varied, and say why each entry belongs.</p>",
        )

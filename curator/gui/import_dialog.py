"""File ▸ Import a list: works from a list made elsewhere (a spreadsheet, a typed list).

The services match each line to the catalogue and report the lines they could not match
(nothing is guessed); this dialog shows both, line by line, so a curator can check near misses
and see what was left out and why, before the matched works go onto the list as one undo step.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Callable, Collection, Sequence
from dataclasses import dataclass
from typing import Any

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt
from PySide6.QtGui import QShowEvent
from PySide6.QtWidgets import (
    QAbstractItemView,
    QDialog,
    QDialogButtonBox,
    QGroupBox,
    QHeaderView,
    QLabel,
    QTableView,
    QVBoxLayout,
    QWidget,
)

from curator.core.outside_list import LineMatch, ListLine
from curator.core.session import ListEntry
from curator.gui.balance import plural
from curator.gui.describe import WorkLine, work_line
from curator.services.publishing import LoadedList
from curator.services.workspace import Workspace

Index = QModelIndex | QPersistentModelIndex
#: How many works of an ambiguous line are named.
NAMED_CANDIDATES = 3


@dataclass(frozen=True)
class ImportLine:
    """One line of the outside list: as written, and what became of it."""

    number: int
    written: str
    result: str
    iri: str | None = None


@dataclass(frozen=True)
class ImportPlan:
    """What importing would do: the works to add, and every line that adds nothing."""

    source: str
    title: str
    lines_read: int
    adding: tuple[ImportLine, ...]
    left_out: tuple[ImportLine, ...]
    entries: tuple[ListEntry, ...]
    #: How many lines had each outcome of matching (matched, unmatched, ambiguous, duplicate).
    outcomes: dict[str, int]

    def summary(self) -> str:
        """'list.csv: 5 lines read. 3 works found; 1 line not found; 1 line names a work twice.'"""
        n = self.outcomes.get
        parts = [plural(n("matched", 0), "work") + " found"]
        if n("unmatched"):
            parts.append(plural(n("unmatched", 0), "line") + " not found")
        if n("ambiguous"):
            parts.append(plural(n("ambiguous", 0), "line") + " fitting more than one work")
        if n("duplicate"):
            parts.append(plural(n("duplicate", 0), "line") + " names a work twice")
        return f"{self.source}: {plural(self.lines_read, 'line')} read. " + "; ".join(parts) + "."


def _written(line: ListLine) -> str:
    text = line.title
    if line.creator:
        text += f" — {line.creator}"
    if line.year is not None:
        text += f" ({line.year})"
    return text


def _found(line: WorkLine) -> str:
    return f"{line.title} · {line.byline}" if line.byline else line.title


def _why_not(match: LineMatch, describe: Callable[[int], WorkLine]) -> str:
    if match.outcome == "ambiguous":
        named = "; ".join(_found(describe(p)) for p in match.candidates[:NAMED_CANDIDATES])
        more = len(match.candidates) - NAMED_CANDIDATES
        tail = f"; and {more} more" if more > 0 else ""
        return f"More than one work fits: {named}{tail}. Add the creator or the year."
    if match.outcome == "duplicate":
        return f"Listed twice ({match.how})."
    return f"Not in this catalogue ({match.how})."


def plan_import(
    workspace: Workspace, loaded: LoadedList, listed: Collection[str], source: str
) -> ImportPlan:
    """Sort the lines of ``loaded`` into works to add and lines that add nothing."""
    works = workspace.index.works

    def describe_iri(iri: str) -> WorkLine:
        return work_line(workspace, iri, loaded.labels.get(iri, iri))

    def describe_position(position: int) -> WorkLine:
        return describe_iri(works[position])

    texts = {iri: (rationale, note) for iri, rationale, note in loaded.entries}
    adding: list[ImportLine] = []
    left_out: list[ImportLine] = []
    outcomes: Counter[str] = Counter()
    if loaded.report is None:  # a saved curator list: every entry is known by its IRI
        for number, (iri, _r, _n) in enumerate(loaded.entries, start=1):
            found = describe_iri(iri)
            if iri in listed:
                left_out.append(ImportLine(number, found.title, "On your list already."))
            else:
                adding.append(ImportLine(number, found.title, _found(found), iri))
        lines_read = len(loaded.entries)
        outcomes["matched"] = lines_read
    else:
        for match in loaded.report.lines:
            outcomes[match.outcome] += 1
            written = _written(match.line)
            if match.outcome == "matched" and match.position is not None:
                iri = works[match.position]
                found = _found(describe_iri(iri))
                if iri in listed:
                    left_out.append(
                        ImportLine(match.line.number, written, f"{found}: on your list already.")
                    )
                else:
                    adding.append(
                        ImportLine(match.line.number, written, f"{found} — {match.how}", iri)
                    )
            else:
                left_out.append(
                    ImportLine(match.line.number, written, _why_not(match, describe_position))
                )
        lines_read = len(loaded.report.lines)
    entries = tuple(
        ListEntry(
            iri=line.iri,
            label=describe_iri(line.iri).title,
            rationale=texts.get(line.iri, ("", ""))[0],
            note=texts.get(line.iri, ("", ""))[1],
        )
        for line in adding
        if line.iri is not None
    )
    return ImportPlan(
        source, loaded.title, lines_read, tuple(adding), tuple(left_out), entries, dict(outcomes)
    )


class ImportLineModel(QAbstractTableModel):
    """Lines of an outside list: number, as written, and what was found or why not."""

    HEADERS = ("Line", "As written", "Found")

    def __init__(
        self, lines: Sequence[ImportLine], result_header: str = "Found", parent: Any = None
    ) -> None:
        super().__init__(parent)
        self._lines = list(lines)
        self._headers = (*self.HEADERS[:2], result_header)

    def line_at(self, row: int) -> ImportLine | None:
        return self._lines[row] if 0 <= row < len(self._lines) else None

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._lines)

    def columnCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._headers)

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid() or not 0 <= index.row() < len(self._lines):
            return None
        line = self._lines[index.row()]
        values = (str(line.number), line.written, line.result)
        if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.ToolTipRole):
            return values[index.column()] if 0 <= index.column() < len(values) else None
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() == 0:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    def headerData(
        self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole
    ) -> Any:
        if (
            orientation == Qt.Orientation.Horizontal
            and role == Qt.ItemDataRole.DisplayRole
            and 0 <= section < len(self._headers)
        ):
            return self._headers[section]
        return None

    def flags(self, index: Index) -> Qt.ItemFlag:
        if not index.isValid():
            return Qt.ItemFlag.NoItemFlags
        return Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable


def _table(model: ImportLineModel, name: str) -> QTableView:
    view = QTableView()
    view.setModel(model)
    view.setAccessibleName(name)
    view.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
    view.setWordWrap(True)
    view.verticalHeader().setVisible(False)
    view.setShowGrid(False)
    view.setAlternatingRowColors(True)
    header = view.horizontalHeader()
    header.setSectionResizeMode(0, QHeaderView.ResizeMode.ResizeToContents)
    header.setSectionResizeMode(1, QHeaderView.ResizeMode.Interactive)
    header.setStretchLastSection(True)
    header.resizeSection(1, view.fontMetrics().averageCharWidth() * 44)
    return view


class ImportDialog(QDialog):
    """Accepted: the window adds ``plan.entries``; rejected: nothing changes."""

    def __init__(self, plan: ImportPlan, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.plan = plan
        self.setWindowTitle(f"Import “{plan.source}”")
        self.summary = QLabel(plan.summary())
        self.summary.setWordWrap(True)

        self.left_out_model = ImportLineModel(plan.left_out, "Why it is not added", self)
        self.adding_model = ImportLineModel(plan.adding, "Found", self)
        self.left_out_view = _table(self.left_out_model, "Lines not added")
        self.adding_view = _table(self.adding_model, "Works to add")
        left_box = QGroupBox(f"Not added ({len(plan.left_out)})")
        QVBoxLayout(left_box).addWidget(self.left_out_view)
        left_box.setVisible(bool(plan.left_out))
        adding_box = QGroupBox(f"To add to your list ({len(plan.adding)})")
        QVBoxLayout(adding_box).addWidget(self.adding_view)
        adding_box.setVisible(bool(plan.adding))

        self.buttons = QDialogButtonBox()
        count = len(plan.entries)
        self.add_button = self.buttons.addButton(
            f"Add {plural(count, 'work')} to the list" if count else "Nothing to add",
            QDialogButtonBox.ButtonRole.AcceptRole,
        )
        self.add_button.setEnabled(count > 0)
        self.add_button.setDefault(count > 0)
        if count:
            self.add_button.setFocus()
        self.buttons.addButton(QDialogButtonBox.StandardButton.Cancel)
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)

        layout = QVBoxLayout(self)
        layout.addWidget(self.summary)
        layout.addWidget(left_box, 1)
        layout.addWidget(adding_box, 2)
        layout.addWidget(self.buttons)
        metrics = self.fontMetrics()
        self.resize(metrics.averageCharWidth() * 150, metrics.lineSpacing() * 36)
        for view in (self.left_out_view, self.adding_view):
            view.horizontalHeader().sectionResized.connect(
                lambda *_a, v=view: v.resizeRowsToContents()
            )

    def showEvent(self, event: QShowEvent) -> None:
        """Rows wrap to the columns' real widths, known only once shown."""
        super().showEvent(event)
        for view in (self.left_out_view, self.adding_view):
            view.resizeRowsToContents()

"""File ▸ Export list: choose a format and a file, see the page as readers will, write it.

The preview is the HTML page itself in a QTextBrowser, on white like the printed page (the
page carries its own colours). Qt's rich text cannot show the page's inline SVG, so the preview
gets the charts as a PNG resource, drawn in the background like every chart. Writing goes
through :func:`curator.services.publishing.export_publication` in a worker (the HTML's SVG and
the PDF take matplotlib a second); a failure is shown in the dialog in words, never a traceback.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QSettings, Qt, QUrl, Signal
from PySide6.QtGui import QColor, QImage, QPalette, QTextDocument
from PySide6.QtWidgets import (
    QButtonGroup,
    QDialog,
    QDialogButtonBox,
    QFileDialog,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QMessageBox,
    QPushButton,
    QRadioButton,
    QSplitter,
    QTextBrowser,
    QVBoxLayout,
    QWidget,
)

from curator.core.export import to_html
from curator.core.publication import Publication
from curator.core.targets import Targets
from curator.gui.balance import chart_png
from curator.gui.style import quiet
from curator.gui.workers import TaskRunner
from curator.services.publishing import export_publication

FOLDER_KEY = "export/folder"
FORMAT_KEY = "export/format"
CHART_RESOURCE = "balance-chart.png"
#: The preview's charts are drawn at this many dots per inch (times the screen's pixel ratio).
PREVIEW_DPI = 96.0


@dataclass(frozen=True)
class ExportChoice:
    """A format as export_publication names it, and as a curator knows it."""

    key: str
    name: str
    suffix: str
    about: str


EXPORT_CHOICES: tuple[ExportChoice, ...] = (
    ExportChoice("html", "Web page (HTML)", ".html", "A page to put online or print, with charts."),
    ExportChoice("md", "Markdown", ".md", "Plain text with light markup, for a blog or a wiki."),
    ExportChoice(
        "csv",
        "Spreadsheet (CSV)",
        ".csv",
        "One row per entry: position, title, creators, year, kind, why, note, IRI.",
    ),
    ExportChoice(
        "jsonld",
        "Linked data (JSON-LD)",
        ".jsonld",
        "A schema.org ItemList that a catalogue or a web page can take in.",
    ),
    ExportChoice(
        "ttl", "Linked data (Turtle)", ".ttl", "The same schema.org ItemList, for an RDF store."
    ),
    ExportChoice("pdf", "PDF", ".pdf", "The page ready to print or send; charts as pictures."),
)
CHOICES = {c.key: c for c in EXPORT_CHOICES}


def file_stem(title: str) -> str:
    return re.sub(r"[^\w]+", "-", title.casefold()).strip("-") or "list"


def preview_html(publication: Publication, chart_width: int | None) -> str:
    """The export's HTML, with the charts as an image resource when there is one."""
    page = to_html(publication, chart_svg=None)
    if chart_width is None:
        return page
    image = f'<p><img src="{CHART_RESOURCE}" width="{chart_width}"></p>'
    return page.replace("</section>", image + "</section>", 1)


class ExportDialog(QDialog):
    """Emits ``written(path)`` after each file is written; stays open for another format."""

    written = Signal(Path)

    def __init__(
        self,
        publication: Publication,
        targets: Targets | None,
        *,
        folder: Path | None = None,
        notice: str = "",
        parent: QWidget | None = None,
    ) -> None:
        super().__init__(parent)
        self.setWindowTitle(f"Export “{publication.title}”")
        self.publication = publication
        self.targets = targets
        self._confirmed: Path | None = None
        self._writing: tuple[Path, ExportChoice] | None = None
        self._chart: QImage | None = None
        settings = QSettings()
        saved_folder = Path(str(settings.value(FOLDER_KEY, "") or ""))
        self._folder = (
            saved_folder if str(saved_folder) != "." and saved_folder.is_dir() else None
        ) or (folder or Path.home())

        self.writer = TaskRunner("writing the export", self)
        self.writer.done.connect(self._written)
        self.writer.failed.connect(self._failed)
        self.charts = TaskRunner("drawing the preview's charts", self)
        self.charts.done.connect(self._chart_drawn)

        # ----- the choices ----------------------------------------------------------------
        formats = QGroupBox("Format")
        formats_layout = QVBoxLayout(formats)
        self.format_group = QButtonGroup(self)
        self.format_buttons: dict[str, QRadioButton] = {}
        for number, choice in enumerate(EXPORT_CHOICES):
            button = QRadioButton(choice.name)
            button.setToolTip(choice.about)
            self.format_group.addButton(button, number)
            self.format_buttons[choice.key] = button
            formats_layout.addWidget(button)
        self.about = quiet()
        formats_layout.addWidget(self.about)

        self.path = QLineEdit()
        self.path.setAccessibleName("Save to")
        self.path.textEdited.connect(lambda _t: self._set_confirmed(None))
        path_label = QLabel("&Save to")
        path_label.setBuddy(self.path)
        self.choose = QPushButton("Choose…")
        self.choose.setToolTip("Choose the folder and the file name")
        self.choose.clicked.connect(self.choose_path)

        self.status = QLabel()
        self.status.setWordWrap(True)
        self.status.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.status.setAccessibleName("What happened")
        self.notice = quiet(notice)
        self.notice.setVisible(bool(notice))

        choices = QWidget()
        choices_layout = QVBoxLayout(choices)
        choices_layout.setContentsMargins(0, 0, 0, 0)
        choices_layout.addWidget(formats)
        choices_layout.addWidget(self.notice)
        choices_layout.addStretch(1)

        file_row = QHBoxLayout()
        file_row.addWidget(path_label)
        file_row.addWidget(self.path, 1)
        file_row.addWidget(self.choose)

        # ----- the preview ----------------------------------------------------------------
        self.preview = QTextBrowser()
        self.preview.setOpenLinks(False)
        self.preview.setAccessibleName("Preview of the page")
        paper = self.preview.palette()
        paper.setColor(QPalette.ColorRole.Base, QColor("white"))
        paper.setColor(QPalette.ColorRole.Text, QColor("#222222"))
        self.preview.setPalette(paper)
        preview_label = QLabel("Preview of the page")
        preview_box = QWidget()
        preview_layout = QVBoxLayout(preview_box)
        preview_layout.setContentsMargins(0, 0, 0, 0)
        preview_layout.addWidget(preview_label)
        preview_layout.addWidget(self.preview, 1)

        splitter = QSplitter(Qt.Orientation.Horizontal)
        splitter.setChildrenCollapsible(False)
        splitter.addWidget(choices)
        splitter.addWidget(preview_box)
        splitter.setStretchFactor(0, 1)
        splitter.setStretchFactor(1, 4)

        self.buttons = QDialogButtonBox()
        self.export_button = self.buttons.addButton(
            "Export", QDialogButtonBox.ButtonRole.AcceptRole
        )
        self.export_button.setDefault(True)
        self.buttons.addButton(QDialogButtonBox.StandardButton.Close)
        self.buttons.accepted.connect(self.export)
        self.buttons.rejected.connect(self.reject)

        layout = QVBoxLayout(self)
        layout.addWidget(splitter, 1)
        layout.addLayout(file_row)
        layout.addWidget(self.status)
        layout.addWidget(self.buttons)
        metrics = self.fontMetrics()
        self.resize(metrics.averageCharWidth() * 180, metrics.lineSpacing() * 46)

        saved = str(settings.value(FORMAT_KEY, "html") or "html")
        self.set_format(saved if saved in CHOICES else "html")
        self.format_group.idToggled.connect(self._format_toggled)
        self.path.setText(str(self._folder / (file_stem(publication.title) + self.choice.suffix)))
        self._show_preview()
        if publication.audit is not None:
            audit = publication.audit
            requirements = targets.requirements if targets else ()
            dpi = PREVIEW_DPI * (self.devicePixelRatioF() or 1.0)
            self.charts.start(lambda: chart_png(audit, requirements, dpi))

    # ----- the format and the file -----------------------------------------------------------

    @property
    def choice(self) -> ExportChoice:
        return EXPORT_CHOICES[max(0, self.format_group.checkedId())]

    def set_format(self, key: str) -> None:
        self.format_buttons[key].setChecked(True)
        self._show_choice()

    def _format_toggled(self, _id: int, checked: bool) -> None:
        if checked:
            self._show_choice()

    def _show_choice(self) -> None:
        choice = self.choice
        self.about.setText(choice.about)
        text = self.path.text().strip()
        if text:
            path = Path(text)
            if path.suffix.lower() in {c.suffix for c in EXPORT_CHOICES} or not path.suffix:
                self.path.setText(str(path.with_suffix(choice.suffix)))
                self._set_confirmed(None)

    def _set_confirmed(self, path: Path | None) -> None:
        self._confirmed = path

    def choose_path(self) -> None:
        choice = self.choice
        path, _filter = QFileDialog.getSaveFileName(
            self,
            "Export the list",
            self.path.text(),
            f"{choice.name} (*{choice.suffix});;All files (*)",
        )
        if path:
            chosen = Path(path)
            if not chosen.suffix:
                chosen = chosen.with_suffix(choice.suffix)
            self.path.setText(str(chosen))
            self._set_confirmed(chosen)  # the file dialog asked about replacing it

    # ----- writing ------------------------------------------------------------------------------

    def export(self) -> bool:
        """Write the chosen format in the background; False when it could not start."""
        text = self.path.text().strip()
        if not text:
            self._say("Choose where to save it first.", problem=True)
            return False
        path = Path(text).expanduser()
        if path.exists() and path != self._confirmed:
            answer = QMessageBox.question(
                self,
                "Replace the file?",
                f"{path.name} exists already in {path.parent}. Replace it?",
                QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No,
                QMessageBox.StandardButton.No,
            )
            if answer != QMessageBox.StandardButton.Yes:
                return False
        publication, fmt, targets = self.publication, self.choice.key, self.targets
        if not self.writer.start(lambda: export_publication(publication, fmt, path, targets)):
            return False
        self._writing = (path, self.choice)
        self.export_button.setEnabled(False)
        self._say(f"Writing {path.name}…")
        return True

    def _written(self, _result: object) -> None:
        if self._writing is None:
            return
        path, choice = self._writing
        self.export_button.setEnabled(True)
        self._say(f"Saved {choice.name} as {path.name} in {path.parent}.")
        settings = QSettings()
        settings.setValue(FOLDER_KEY, str(path.parent))
        settings.setValue(FORMAT_KEY, choice.key)
        self._set_confirmed(path)
        self.written.emit(path)

    def _failed(self, message: str) -> None:
        self.export_button.setEnabled(True)
        self._say(f"Not saved: {message}", problem=True)

    def _say(self, text: str, *, problem: bool = False) -> None:
        font = self.status.font()
        font.setBold(problem)
        self.status.setFont(font)
        self.status.setText(text)

    # ----- the preview ------------------------------------------------------------------------

    def _chart_drawn(self, png: object) -> None:
        if isinstance(png, bytes):
            image = QImage.fromData(png, "PNG")
            if not image.isNull():
                image.setDevicePixelRatio(self.devicePixelRatioF() or 1.0)
                self._chart = image
                self._show_preview()

    def _show_preview(self) -> None:
        document = self.preview.document()
        width: int | None = None
        if self._chart is not None:
            document.addResource(
                QTextDocument.ResourceType.ImageResource, QUrl(CHART_RESOURCE), self._chart
            )
            natural = round(self._chart.deviceIndependentSize().width())
            width = max(120, min(natural, self.preview.viewport().width() - 40))
        scroll = self.preview.verticalScrollBar().value()
        self.preview.setHtml(preview_html(self.publication, width))
        self.preview.verticalScrollBar().setValue(scroll)

    def done(self, result: int) -> None:
        """Wait for a file being written (never leave half a job behind) before closing."""
        self.writer.stop()
        self.charts.stop()
        super().done(result)

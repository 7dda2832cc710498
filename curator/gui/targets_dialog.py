"""Editing a list's balance targets as TOML text, checked before they are stored.

The text is checked as the curator types (quietly) and again on Apply; a text that does not
read stays in the editor with the message beside it and the line at fault marked, so nothing
typed is lost. Only a text that reads leaves the dialog, as ``applied``; the window stores it
through the undo stack.
"""

from __future__ import annotations

import re
import textwrap
from collections.abc import Callable

from PySide6.QtCore import Qt, QTimer, Signal
from PySide6.QtGui import QFontDatabase, QPalette, QTextCursor, QTextFormat
from PySide6.QtWidgets import (
    QDialog,
    QDialogButtonBox,
    QLabel,
    QPlainTextEdit,
    QPushButton,
    QTextEdit,
    QVBoxLayout,
    QWidget,
)

from curator.core import targets as targets_module
from curator.core.session import ListSettings
from curator.core.targets import Targets, TargetsError
from curator.gui.delegates import mix
from curator.gui.style import quiet
from curator.services.sessions import targets_of

#: Used when the engine's docstring no longer holds an example that reads.
FALLBACK_EXAMPLE = """\
[[require]]
facet = "kind"
value = "Film"
min_share = 0.3
"""

HELP = (
    "One <tt>[[require]]</tt> table per target. <tt>facet</tt> is one of kind, decade, "
    "language, creator, theme, subtheme, audience or place; <tt>value</tt> is a label as the "
    "catalogue gives it. Limits: <tt>min_share</tt> and <tt>max_share</tt> (0 to 1), "
    "<tt>min_count</tt>, <tt>min_distinct</tt>, or <tt>min_each</tt> with a <tt>branch</tt>. "
    "<tt>max_entries</tt> caps the length; <tt>[audience] allowed</tt> flags entries for "
    "another audience. A # starts a comment. Leave the text empty for no targets."
)
#: Typing is checked this long after the last key.
CHECK_DELAY_MS = 400

Check = Callable[[str], str | None]


def example_targets() -> str:
    """The example of :mod:`curator.core.targets`' docstring, so the template and the engine's
    documentation cannot drift apart."""
    doc = targets_module.__doc__ or ""
    _head, found, rest = doc.partition("Example::")
    if not found:
        return FALLBACK_EXAMPLE
    block = []
    for line in rest.splitlines()[1:]:
        if line.strip() and not line.startswith((" ", "\t")):
            break
        block.append(line)
    text = textwrap.dedent("\n".join(block)).strip() + "\n"
    try:
        Targets.from_toml(text)
    except TargetsError:
        return FALLBACK_EXAMPLE
    return text


def check_targets(text: str) -> str | None:
    """None when ``text`` reads as targets, else the message (naming the field)."""
    try:
        targets_of(ListSettings(targets=text))
    except TargetsError as exc:
        return str(exc)
    return None


def line_at_fault(text: str, message: str) -> int | None:
    """The 1-based line a targets error points at: TOML's own line, or the line of the field
    named by ``require[i].field`` (or the start of that table)."""
    found = re.search(r"line (\d+)", message)
    if found:
        return int(found.group(1))
    found = re.search(r"require\[(\d+)\](?:\.(\w+))?", message)
    lines = text.splitlines()
    if found:
        wanted, field = int(found.group(1)), found.group(2)
        tables = [i for i, line in enumerate(lines) if line.strip().startswith("[[require]]")]
        if wanted >= len(tables):
            return None
        start = tables[wanted]
        if field:
            for i in range(start + 1, len(lines)):
                stripped = lines[i].strip()
                if stripped.startswith("["):
                    break
                if re.match(rf"{re.escape(field)}\s*=", stripped):
                    return i + 1
        return start + 1
    for name in ("max_entries", "audience"):
        if name in message:
            for i, line in enumerate(lines):
                if line.strip().startswith((name, f"[{name}]")):
                    return i + 1
    return None


class TargetsDialog(QDialog):
    """Emits ``applied(text)`` with targets that read; stays open, text kept, when they do not."""

    applied = Signal(str)

    def __init__(self, text: str, check: Check = check_targets, parent: QWidget | None = None):
        super().__init__(parent)
        self.setWindowTitle("Balance targets")
        self._check = check
        #: The line the last error pointed at (1-based), or None.
        self.fault_line: int | None = None

        intro = QLabel(
            "Say what balance this list should have. The Balance tab checks the targets as "
            "the list grows, and <i>Fill the gaps</i> favours works that close them."
        )
        intro.setWordWrap(True)
        help_text = quiet(HELP)
        help_text.setTextFormat(Qt.TextFormat.RichText)

        self.editor = QPlainTextEdit()
        self.editor.setFont(QFontDatabase.systemFont(QFontDatabase.SystemFont.FixedFont))
        self.editor.setLineWrapMode(QPlainTextEdit.LineWrapMode.NoWrap)
        self.editor.setTabChangesFocus(True)
        self.editor.setAccessibleName("Targets (TOML)")
        self.editor.setPlainText(text if text.strip() else example_targets())
        metrics = self.editor.fontMetrics()
        self.editor.setMinimumSize(metrics.horizontalAdvance("x") * 72, metrics.lineSpacing() * 20)

        self.status = QLabel()
        self.status.setWordWrap(True)
        self.status.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.status.setAccessibleName("Whether the targets read")

        self.buttons = QDialogButtonBox()
        self.apply_button = self.buttons.addButton("Apply", QDialogButtonBox.ButtonRole.AcceptRole)
        self.apply_button.setDefault(True)
        self.buttons.addButton(QDialogButtonBox.StandardButton.Cancel)
        self.example_button = QPushButton("Start from the example")
        self.example_button.setToolTip(
            "Replace the text with the example (Ctrl+Z in the text brings yours back)"
        )
        self.buttons.addButton(self.example_button, QDialogButtonBox.ButtonRole.ResetRole)
        self.clear_button = QPushButton("No targets")
        self.clear_button.setToolTip("Empty the text: the list is checked against no targets")
        self.buttons.addButton(self.clear_button, QDialogButtonBox.ButtonRole.ResetRole)
        self.buttons.accepted.connect(self.apply)
        self.buttons.rejected.connect(self.reject)
        self.example_button.clicked.connect(lambda: self._replace_text(example_targets()))
        self.clear_button.clicked.connect(lambda: self._replace_text(""))

        layout = QVBoxLayout(self)
        layout.addWidget(intro)
        layout.addWidget(help_text)
        layout.addWidget(self.editor, 1)
        layout.addWidget(self.status)
        layout.addWidget(self.buttons)

        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(CHECK_DELAY_MS)
        self._timer.timeout.connect(lambda: self._show_check(final=False))
        self.editor.textChanged.connect(self._timer.start)
        self._show_check(final=False)
        self.editor.setFocus()

    def text(self) -> str:
        return self.editor.toPlainText()

    def _replace_text(self, text: str) -> None:
        """Replace everything as one edit, so the editor's own undo brings the old text back."""
        cursor = self.editor.textCursor()
        cursor.select(QTextCursor.SelectionType.Document)
        cursor.insertText(text)

    def apply(self) -> bool:
        """Check the text; emit and close when it reads, else say why in place."""
        self._timer.stop()
        if not self._show_check(final=True):
            return False
        self.applied.emit(self.text())
        self.accept()
        return True

    def _show_check(self, *, final: bool) -> bool:
        text = self.text()
        error = self._check(text)
        font = self.status.font()
        font.setBold(error is not None and final)
        self.status.setFont(font)
        if error is None:
            self._mark(None)
            self.status.setForegroundRole(QPalette.ColorRole.PlaceholderText)
            self.status.setText(
                "These targets read well." if text.strip() else "No targets: nothing is checked."
            )
            return True
        prefix = "Not applied: " if final else ""
        self.status.setForegroundRole(QPalette.ColorRole.WindowText)
        self.status.setText(f"{prefix}{error}")
        self._mark(line_at_fault(text, error))
        if final and self.fault_line is not None:
            block = self.editor.document().findBlockByLineNumber(self.fault_line - 1)
            self.editor.setTextCursor(QTextCursor(block))
            self.editor.setFocus()
        return False

    def _mark(self, line: int | None) -> None:
        """Tint the line at fault."""
        block = self.editor.document().findBlockByLineNumber(max(0, (line or 0) - 1))
        if line is None or line < 1 or not block.isValid():
            self.fault_line = None
            self.editor.setExtraSelections([])
            return
        selection = QTextEdit.ExtraSelection()
        palette = self.editor.palette()
        selection.format.setBackground(
            mix(
                palette.color(QPalette.ColorRole.Highlight),
                palette.color(QPalette.ColorRole.Base),
                0.25,
            )
        )
        selection.format.setProperty(QTextFormat.Property.FullWidthSelection, True)
        selection.cursor = QTextCursor(block)
        self.editor.setExtraSelections([selection])
        self.fault_line = line

"""Painted rows: candidates (title, byline, relevance bar, theme tags), list entries, seeds.

Every colour comes from the view's palette (so light and dark themes both work); the only one
of our own is a faint tint mixed from the palette's highlight for tags and the relevance track.
Every size comes from the font's metrics, so the rows grow with the font and with scaling.
"""

from __future__ import annotations

from collections.abc import Sequence

from PySide6.QtCore import (
    QEvent,
    QModelIndex,
    QPersistentModelIndex,
    QRect,
    QRectF,
    QSize,
    Qt,
    Signal,
)
from PySide6.QtGui import QColor, QFont, QFontMetrics, QMouseEvent, QPainter, QPalette
from PySide6.QtWidgets import (
    QApplication,
    QStyle,
    QStyledItemDelegate,
    QStyleOptionViewItem,
)

from curator.gui.describe import Tag
from curator.gui.models import Role

Index = QModelIndex | QPersistentModelIndex


def mix(a: QColor, b: QColor, share_of_a: float) -> QColor:
    """``a`` and ``b`` blended; used to derive quiet colours from the palette."""
    t = max(0.0, min(1.0, share_of_a))
    return QColor.fromRgbF(
        a.redF() * t + b.redF() * (1 - t),
        a.greenF() * t + b.greenF() * (1 - t),
        a.blueF() * t + b.blueF() * (1 - t),
        1.0,
    )


def scaled_font(font: QFont, factor: float, *, bold: bool = False, italic: bool = False) -> QFont:
    """``font`` made larger or smaller relative to itself (never a fixed pixel size)."""
    result = QFont(font)
    if result.pointSizeF() > 0:
        result.setPointSizeF(result.pointSizeF() * factor)
    elif result.pixelSize() > 0:
        result.setPixelSize(max(1, round(result.pixelSize() * factor)))
    result.setBold(bold)
    result.setItalic(italic)
    return result


class _RowColours:
    """The colours of one row, chosen from the palette for its state (selected or not)."""

    def __init__(self, option: QStyleOptionViewItem) -> None:
        palette = option.palette
        enabled = bool(option.state & QStyle.StateFlag.State_Enabled)
        active = bool(option.state & QStyle.StateFlag.State_Active)
        group = (
            QPalette.ColorGroup.Disabled
            if not enabled
            else QPalette.ColorGroup.Active
            if active
            else QPalette.ColorGroup.Inactive
        )
        self.selected = bool(option.state & QStyle.StateFlag.State_Selected)
        base = palette.color(group, QPalette.ColorRole.Base)
        highlight = palette.color(group, QPalette.ColorRole.Highlight)
        if self.selected:
            self.text = palette.color(group, QPalette.ColorRole.HighlightedText)
            behind = highlight
        else:
            self.text = palette.color(group, QPalette.ColorRole.Text)
            behind = base
        self.quiet = mix(self.text, behind, 0.62)
        self.accent = self.text if self.selected else highlight
        self.tint = mix(self.text if self.selected else highlight, behind, 0.16)
        self.track = mix(self.text, behind, 0.12)


def _padding(metrics: QFontMetrics) -> int:
    return max(3, metrics.height() // 3)


def _panel(option: QStyleOptionViewItem, painter: QPainter, index: Index) -> QStyleOptionViewItem:
    """Draw the style's own row background (selection, hover) and return the option used."""
    opt = QStyleOptionViewItem(option)
    opt.text = ""
    widget = opt.widget
    style = widget.style() if widget is not None else QApplication.style()
    style.drawPrimitive(QStyle.PrimitiveElement.PE_PanelItemViewItem, opt, painter, widget)
    return opt


def _focus(option: QStyleOptionViewItem, painter: QPainter) -> None:
    if option.state & QStyle.StateFlag.State_HasFocus:
        widget = option.widget
        style = widget.style() if widget is not None else QApplication.style()
        style.drawPrimitive(QStyle.PrimitiveElement.PE_FrameFocusRect, option, painter, widget)


def _text(painter: QPainter, rect: QRect, font: QFont, colour: QColor, text: str) -> None:
    metrics = QFontMetrics(font)
    painter.setFont(font)
    painter.setPen(colour)
    shown = metrics.elidedText(text, Qt.TextElideMode.ElideRight, max(0, rect.width()))
    painter.drawText(rect, int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter), shown)


def tag_font(font: QFont) -> QFont:
    return scaled_font(font, 0.88)


def draw_tags(
    painter: QPainter, rect: QRect, font: QFont, tags: Sequence[Tag], colours: _RowColours
) -> None:
    """Shared themes as rounded tags on one line; those that do not fit are counted as +N."""
    small = tag_font(font)
    metrics = QFontMetrics(small)
    height = rect.height()
    pad_x = max(4, metrics.averageCharWidth())
    painter.setFont(small)
    x = rect.left()
    for number, tag in enumerate(tags):
        width = metrics.horizontalAdvance(tag.label) + 2 * pad_x
        rest = len(tags) - number - 1
        more = f"+{rest}" if rest else ""
        room = rect.right() - x - (metrics.horizontalAdvance(more) + pad_x if rest else 0)
        if width > room:
            painter.setPen(colours.quiet)
            painter.drawText(
                QRect(x, rect.top(), rect.right() - x, height),
                int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter),
                f"+{len(tags) - number}",
            )
            return
        box = QRectF(x + 0.5, rect.top() + 0.5, width - 1, height - 1)
        painter.setPen(Qt.PenStyle.NoPen if not tag.broader else colours.quiet)
        painter.setBrush(colours.tint if not tag.broader else Qt.BrushStyle.NoBrush)
        painter.drawRoundedRect(box, height / 2, height / 2)
        painter.setPen(colours.text)
        painter.drawText(
            QRect(x, rect.top(), width, height), int(Qt.AlignmentFlag.AlignCenter), tag.label
        )
        x += width + pad_x // 2 + 2


class CandidateDelegate(QStyledItemDelegate):
    """Title, creator · year · kind, a thin relevance bar, and the themes shared as tags."""

    def _metrics(self, font: QFont) -> tuple[int, int, int, int]:
        normal = QFontMetrics(font)
        title = QFontMetrics(scaled_font(font, 1.0, bold=True))
        tags = QFontMetrics(tag_font(font))
        return _padding(normal), title.height(), normal.height(), tags.height() + 4

    def sizeHint(self, option: QStyleOptionViewItem, index: Index) -> QSize:
        pad, title_h, line_h, tag_h = self._metrics(option.font)
        tags = index.data(Role.Tags) or ()
        height = pad + title_h + line_h + (pad // 2 + tag_h if tags else 0) + pad
        return QSize(QFontMetrics(option.font).averageCharWidth() * 30, height)

    def paint(self, painter: QPainter, option: QStyleOptionViewItem, index: Index) -> None:
        painter.save()
        opt = _panel(option, painter, index)
        colours = _RowColours(opt)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        pad, title_h, line_h, tag_h = self._metrics(opt.font)
        area = opt.rect.adjusted(pad * 2, pad, -pad * 2, -pad)
        metrics = QFontMetrics(opt.font)
        bar_w = metrics.averageCharWidth() * 6
        bar_h = max(3, metrics.height() // 5)
        title_rect = QRect(area.left(), area.top(), area.width() - bar_w - pad * 2, title_h)
        _text(
            painter,
            title_rect,
            scaled_font(opt.font, 1.0, bold=True),
            colours.text,
            str(index.data(Qt.ItemDataRole.DisplayRole) or ""),
        )
        relevance = float(index.data(Role.Relevance) or 0.0)
        track = QRectF(area.right() - bar_w, area.top() + (title_h - bar_h) / 2, bar_w, bar_h)
        painter.setPen(Qt.PenStyle.NoPen)
        painter.setBrush(colours.track)
        painter.drawRoundedRect(track, bar_h / 2, bar_h / 2)
        filled = QRectF(track.left(), track.top(), max(bar_h, bar_w * relevance), bar_h)
        painter.setBrush(colours.accent)
        painter.drawRoundedRect(filled, bar_h / 2, bar_h / 2)
        by_rect = QRect(area.left(), area.top() + title_h, area.width(), line_h)
        _text(painter, by_rect, opt.font, colours.quiet, str(index.data(Role.Byline) or ""))
        tags = index.data(Role.Tags) or ()
        if tags:
            tag_rect = QRect(area.left(), by_rect.bottom() + 1 + pad // 2, area.width(), tag_h)
            draw_tags(painter, tag_rect, opt.font, tags, colours)
        _focus(opt, painter)
        painter.restore()


class EntryDelegate(QStyledItemDelegate):
    """A numbered list entry: title, byline, and the curator's note when there is one."""

    def _lines(self, index: Index) -> int:
        return 3 if index.data(Role.Note) else 2

    def sizeHint(self, option: QStyleOptionViewItem, index: Index) -> QSize:
        metrics = QFontMetrics(option.font)
        title = QFontMetrics(scaled_font(option.font, 1.0, bold=True))
        pad = _padding(metrics)
        height = pad * 2 + title.height() + metrics.height() * (self._lines(index) - 1)
        return QSize(metrics.averageCharWidth() * 24, height)

    def paint(self, painter: QPainter, option: QStyleOptionViewItem, index: Index) -> None:
        painter.save()
        opt = _panel(option, painter, index)
        colours = _RowColours(opt)
        metrics = QFontMetrics(opt.font)
        bold = scaled_font(opt.font, 1.0, bold=True)
        title_h = QFontMetrics(bold).height()
        pad = _padding(metrics)
        area = opt.rect.adjusted(pad * 2, pad, -pad * 2, -pad)
        gutter = metrics.horizontalAdvance("00.") + pad
        number_rect = QRect(area.left(), area.top(), gutter - pad, title_h)
        painter.setFont(bold)
        painter.setPen(colours.quiet)
        painter.drawText(
            number_rect,
            int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter),
            f"{index.row() + 1}.",
        )
        left = area.left() + gutter
        width = area.right() - left
        _text(
            painter,
            QRect(left, area.top(), width, title_h),
            bold,
            colours.text,
            str(index.data(Qt.ItemDataRole.DisplayRole) or ""),
        )
        by_top = area.top() + title_h
        _text(
            painter,
            QRect(left, by_top, width, metrics.height()),
            opt.font,
            colours.quiet,
            str(index.data(Role.Byline) or ""),
        )
        note = str(index.data(Role.Note) or "")
        if note:
            _text(
                painter,
                QRect(left, by_top + metrics.height(), width, metrics.height()),
                scaled_font(opt.font, 1.0, italic=True),
                colours.text,
                "✎ " + " ".join(note.split()),
            )
        _focus(opt, painter)
        painter.restore()


class SeedDelegate(QStyledItemDelegate):
    """A starting title with a × that removes it (Delete does the same from the keyboard)."""

    remove_clicked = Signal(QModelIndex)

    def close_rect(self, rect: QRect, font: QFont) -> QRect:
        metrics = QFontMetrics(font)
        side = metrics.height() + _padding(metrics)
        return QRect(
            rect.right() - side - _padding(metrics), rect.center().y() - side // 2, side, side
        )

    def sizeHint(self, option: QStyleOptionViewItem, index: Index) -> QSize:
        metrics = QFontMetrics(option.font)
        title = QFontMetrics(scaled_font(option.font, 1.0, bold=True))
        return QSize(
            metrics.averageCharWidth() * 24,
            _padding(metrics) * 2 + title.height() + metrics.height(),
        )

    def paint(self, painter: QPainter, option: QStyleOptionViewItem, index: Index) -> None:
        painter.save()
        opt = _panel(option, painter, index)
        colours = _RowColours(opt)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        metrics = QFontMetrics(opt.font)
        bold = scaled_font(opt.font, 1.0, bold=True)
        title_h = QFontMetrics(bold).height()
        pad = _padding(metrics)
        close = self.close_rect(opt.rect, opt.font)
        area = QRect(
            opt.rect.left() + pad * 2,
            opt.rect.top() + pad,
            close.left() - opt.rect.left() - pad * 3,
            opt.rect.height() - 2 * pad,
        )
        _text(
            painter,
            QRect(area.left(), area.top(), area.width(), title_h),
            bold,
            colours.text,
            str(index.data(Qt.ItemDataRole.DisplayRole) or ""),
        )
        _text(
            painter,
            QRect(area.left(), area.top() + title_h, area.width(), metrics.height()),
            opt.font,
            colours.quiet,
            str(index.data(Role.Byline) or ""),
        )
        hovered = bool(opt.state & QStyle.StateFlag.State_MouseOver)
        if hovered or colours.selected:
            painter.setPen(Qt.PenStyle.NoPen)
            painter.setBrush(colours.tint)
            painter.drawEllipse(QRectF(close).adjusted(1, 1, -1, -1))
        painter.setPen(colours.text if hovered or colours.selected else colours.quiet)
        painter.setFont(scaled_font(opt.font, 1.15))
        painter.drawText(close, int(Qt.AlignmentFlag.AlignCenter), "×")
        _focus(opt, painter)
        painter.restore()

    def editorEvent(
        self, event: QEvent, model: object, option: QStyleOptionViewItem, index: Index
    ) -> bool:
        if (
            event.type() == QEvent.Type.MouseButtonRelease
            and isinstance(event, QMouseEvent)
            and event.button() == Qt.MouseButton.LeftButton
            and self.close_rect(option.rect, option.font).contains(event.position().toPoint())
        ):
            self.remove_clicked.emit(QModelIndex(index))
            return True
        return super().editorEvent(event, model, option, index)  # type: ignore[arg-type]

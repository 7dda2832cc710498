"""The controls above the candidates: closeness against variety, kind, years, language, and
whether to fill the list's gaps.

They show a ListSettings and report edits as a new ListSettings plus the name of the control
that changed (so that dragging the slider merges into one undo step). They never change the
session themselves.
"""

from __future__ import annotations

from dataclasses import replace

from PySide6.QtCore import QLocale, QSize, Qt, Signal
from PySide6.QtGui import QResizeEvent
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QHBoxLayout,
    QLabel,
    QLayout,
    QSizePolicy,
    QSlider,
    QSpinBox,
    QVBoxLayout,
    QWidget,
)

from curator.core.session import ListSettings
from curator.gui.describe import CatalogueChoices

#: The slider runs 0..SLIDER_STEPS; the left end is pure relevance (lambda 1.0).
SLIDER_STEPS = 100

FILL_GAPS_TIP = (
    "Favour candidates that close the list's unmet targets, or add a kind, decade or language "
    "the list does not have yet.\nSet targets with Edit ▸ Balance targets (Ctrl+T); the "
    "Balance tab shows which are met."
)


def lam_to_slider(lam: float) -> int:
    return round((1.0 - max(0.0, min(1.0, lam))) * SLIDER_STEPS)


def slider_to_lam(value: int) -> float:
    return round(1.0 - value / SLIDER_STEPS, 2)


def language_name(code: str) -> str:
    """A language code as a word (``fr`` -> French), or the code when Qt does not know it."""
    locale = QLocale(code)
    if locale.language() == QLocale.Language.C:
        return code
    return QLocale.languageToString(locale.language())


def _group(*widgets: QWidget) -> QWidget:
    """Widgets that stay together on one line when the filters wrap."""
    group = QWidget()
    layout = QHBoxLayout(group)
    layout.setContentsMargins(0, 0, group.fontMetrics().averageCharWidth() * 2, 0)
    for widget in widgets:
        layout.addWidget(widget)
    return group


class SuggestionControls(QWidget):
    """Shows the settings; emits ``edited(settings, control)`` when the curator changes one."""

    edited = Signal(object, str)

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._settings = ListSettings()
        self._updating = False

        self.slider = QSlider(Qt.Orientation.Horizontal)
        self.slider.setRange(0, SLIDER_STEPS)
        self.slider.setPageStep(10)
        self.slider.setSingleStep(5)
        self.slider.setValue(lam_to_slider(self._settings.lam))
        self.slider.setToolTip(
            "Left: candidates closest to your starting titles.\n"
            "Right: more variety in creators, periods and kinds."
        )
        self.slider.setAccessibleName("Close to the theme or more variety")
        close_label = QLabel("Close to the the&me")
        close_label.setBuddy(self.slider)
        variety_label = QLabel("More variety")
        for label in (close_label, variety_label):
            label.setSizePolicy(QSizePolicy.Policy.Maximum, QSizePolicy.Policy.Preferred)

        self.kind = QComboBox()
        self.kind.setToolTip("Only candidates of this kind")
        self.kind.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToContents)
        kind_label = QLabel("&Kind")
        kind_label.setBuddy(self.kind)

        self.year_from = self._year_box("Earliest year (any: no limit)")
        self.year_to = self._year_box("Latest year (any: no limit)")
        years_label = QLabel("&Years")
        years_label.setBuddy(self.year_from)
        dash = QLabel("to")

        self.language = QComboBox()
        self.language.setToolTip("Only candidates in this language")
        self.language.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToContents)
        language_label = QLabel("Lang&uage")
        language_label.setBuddy(self.language)

        self.fill_gaps = QCheckBox("Fill the ga&ps")
        self.fill_gaps.setToolTip(FILL_GAPS_TIP)
        self.fill_gaps.setAccessibleDescription(FILL_GAPS_TIP)

        slider_row = QHBoxLayout()
        slider_row.addWidget(close_label)
        slider_row.addWidget(self.slider, 1)
        slider_row.addWidget(variety_label)
        self._kind_group = _group(kind_label, self.kind)
        self._years_group = _group(years_label, self.year_from, dash, self.year_to)
        self._language_group = _group(language_label, self.language)
        self._gaps_group = _group(self.fill_gaps)
        self._rows = (QHBoxLayout(), QHBoxLayout())
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        # The widget may be narrower than one row of filters: they then wrap onto two rows.
        layout.setSizeConstraint(QLayout.SizeConstraint.SetNoConstraint)
        layout.addLayout(slider_row)
        for row in self._rows:
            layout.addLayout(row)
        self._one_row: bool | None = None
        self._arrange(one_row=True)

        self.set_choices(CatalogueChoices((), (), None))
        self.slider.valueChanged.connect(self._slider_moved)
        self.kind.currentIndexChanged.connect(lambda _i: self._emit_filter("kind"))
        self.language.currentIndexChanged.connect(lambda _i: self._emit_filter("language"))
        self.year_from.valueChanged.connect(lambda _v: self._emit_filter("years"))
        self.year_to.valueChanged.connect(lambda _v: self._emit_filter("years"))
        self.fill_gaps.toggled.connect(lambda _on: self._emit_filter("gap filling"))

    def _groups(self) -> tuple[QWidget, ...]:
        return (self._kind_group, self._years_group, self._language_group, self._gaps_group)

    def _one_row_width(self) -> int:
        gap = self._rows[0].spacing() * (len(self._groups()) + 1)
        return sum(g.sizeHint().width() for g in self._groups()) + gap

    def _arrange(self, *, one_row: bool) -> None:
        """Filters on one row when they fit, else kind and language above years and gaps."""
        if one_row == self._one_row:
            return
        self._one_row = one_row
        for row in self._rows:
            while row.count():
                row.takeAt(0)
        first, second = self._rows
        if one_row:
            for group in self._groups():
                first.addWidget(group)
        else:
            first.addWidget(self._kind_group)
            first.addWidget(self._language_group)
            second.addWidget(self._years_group)
            second.addWidget(self._gaps_group)
        first.addStretch(1)
        second.addStretch(1)

    def minimumSizeHint(self) -> QSize:
        slider = self.slider.minimumSizeHint().width() * 3
        narrow = max(
            self._kind_group.sizeHint().width() + self._language_group.sizeHint().width(),
            self._years_group.sizeHint().width() + self._gaps_group.sizeHint().width(),
            slider,
        )
        rows = self._kind_group.sizeHint().height() * 2 + self.slider.sizeHint().height()
        return QSize(narrow + self._rows[0].spacing(), rows)

    def resizeEvent(self, event: QResizeEvent) -> None:
        self._arrange(one_row=self.width() >= self._one_row_width())
        super().resizeEvent(event)

    def _year_box(self, tip: str) -> QSpinBox:
        box = QSpinBox()
        box.setSpecialValueText("any")
        box.setToolTip(tip)
        box.setAccelerated(True)
        return box

    # ----- showing ---------------------------------------------------------------------

    def set_choices(self, choices: CatalogueChoices) -> None:
        """Offer this catalogue's kinds, years and languages (keeping the current settings)."""
        self._updating = True
        try:
            self.kind.clear()
            self.kind.addItem("All kinds", "")
            for iri, label in choices.kinds:
                self.kind.addItem(label, iri)
            self.language.clear()
            self.language.addItem("All languages", "")
            for code in choices.languages:
                self.language.addItem(language_name(code), code)
            low, high = choices.years or (0, 9999)
            for box in (self.year_from, self.year_to):
                box.setRange(low - 1, high)  # the minimum is the "any" value
        finally:
            self._updating = False
        self.set_settings(self._settings)

    def set_settings(self, settings: ListSettings) -> None:
        """Show ``settings`` without reporting it back as an edit."""
        self._settings = settings
        self._updating = True
        try:
            self.slider.setValue(lam_to_slider(settings.lam))
            self._select(self.kind, settings.kinds[0] if settings.kinds else "")
            self._select(self.language, settings.languages[0] if settings.languages else "")
            self._show_year(self.year_from, settings.year_from)
            self._show_year(self.year_to, settings.year_to)
            self.fill_gaps.setChecked(settings.fill_gaps)
        finally:
            self._updating = False

    @staticmethod
    def _select(box: QComboBox, value: str) -> None:
        found = box.findData(value)
        if found < 0 and value:
            box.addItem(value, value)  # a setting this catalogue has no works for
            found = box.count() - 1
        box.setCurrentIndex(max(0, found))

    @staticmethod
    def _show_year(box: QSpinBox, year: int | None) -> None:
        if year is not None and year > box.maximum():
            box.setMaximum(year)
        if year is not None and year <= box.minimum():
            box.setMinimum(year - 1)
        box.setValue(box.minimum() if year is None else year)

    # ----- reading -----------------------------------------------------------------------

    @staticmethod
    def _year(box: QSpinBox) -> int | None:
        return None if box.value() == box.minimum() else box.value()

    def current(self) -> ListSettings:
        kind = self.kind.currentData() or ""
        language = self.language.currentData() or ""
        year_from, year_to = self._year(self.year_from), self._year(self.year_to)
        return replace(
            self._settings,
            lam=slider_to_lam(self.slider.value()),
            kinds=(kind,) if kind else (),
            languages=(language,) if language else (),
            year_from=year_from,
            year_to=year_to,
            fill_gaps=self.fill_gaps.isChecked(),
        )

    def _slider_moved(self, _value: int) -> None:
        if not self._updating:
            self._report("variety")

    def _emit_filter(self, control: str) -> None:
        if not self._updating:
            self._report(control)

    def _report(self, control: str) -> None:
        settings = self.current()
        if settings != self._settings:
            self._settings = settings
            self.edited.emit(settings, control)

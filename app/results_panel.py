"""The live readout: what the loaded boat does, in figures, in words and as a GZ curve.

The status line and the badge show the one status decided in :mod:`hydro.assess` (never
a green badge beside a red status); the words come from :mod:`hydro.wording`.  GM state
(common practice, no source): unstable GM <= 0; marginal ("tender") 0 < GM < max(50 mm,
4 % of the waterline beam) or a list beyond 5 degrees; stable otherwise.

The figures keep a fixed number of decimals per quantity and sit right-aligned in a
fixed-pitch font, so the table does not jitter while a handle is dragged.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

from PySide6.QtCore import QSize, Qt, Signal
from PySide6.QtGui import QFontMetrics
from PySide6.QtWidgets import QGridLayout, QLabel, QVBoxLayout, QWidget

from hydro import Analysis
from hydro.assess import GmState, state_of
from hydro.stability import Status
from hydro.wording import badge_words, list_cell, status_sentence
from hydro.safety import SHORT_CAUTION
from hydro.sections import build_section_table

from app import style
from app.document import HullDocument
from app.gz_plot import LEGEND_HTML, GzPlot
from app.still_label import paint_own_background
from hydro.units import UnitSystem
from app.view_options import ViewOptions

__all__ = ["ResultsPanel"]

_STATE_TIP = (
    "The status decides first: a boat that floods, capsizes, sinks or lolls is red.\n"
    "Otherwise the upright GM (common practice, no source):\n"
    "TENDER (marginal): GM above zero but below 50 mm or 4 % of the waterline beam, "
    "whichever is larger, or a list beyond 5°.\n"
    "STABLE: anything more."
)


@dataclass(frozen=True)
class _Row:
    key: str
    label: str
    unit: Callable[[UnitSystem], str]
    value: Callable[[Analysis, UnitSystem], str]
    tip: str = ""


def _length(get: Callable[[Analysis], float | None]) -> Callable[[Analysis, UnitSystem], str]:
    def text(a: Analysis, u: UnitSystem) -> str:
        return u.length_text(get(a), unit=False)

    return text


def _angle(value: float | None) -> str:
    return "—" if value is None or not math.isfinite(value) else f"{value:.1f}"


def _range(a: Analysis) -> str:
    c = a.curve
    if c is None:
        return "—"
    return f"{'≥' if c.range_open else ''}{c.range_deg:.1f}"


_LEN = lambda u: u.length  # noqa: E731
_DEG = lambda u: "°"  # noqa: E731

ROWS: tuple[_Row, ...] = (
    _Row("displacement", "Displacement", lambda u: u.mass, lambda a, u: u.mass_text(a.weights.mass, unit=False),
         "Everything aboard: crew, hull material, ballast, fittings, bilge water"),
    _Row("draft", "Draft amidships", _LEN, _length(lambda a: a.hydrostatics.draft_mid),
         "Depth of the lowest point of the hull below the water, halfway along"),
    _Row("trim", "Trim", _DEG, lambda a, u: _angle(abs(a.hydrostatics.trim_deg)),
         "How far the boat sits down by the bow or by the stern"),
    _Row("freeboard", "Least freeboard", _LEN, _length(lambda a: a.hydrostatics.min_freeboard),
         "Lowest height of the gunwale above the water, upright"),
    _Row("kb", "KB", _LEN, _length(lambda a: a.hydrostatics.kb), "Centre of buoyancy above the keel"),
    _Row("bm", "BM", _LEN, _length(lambda a: a.hydrostatics.bm), "Metacentre above the centre of buoyancy"),
    _Row("km", "KM", _LEN, _length(lambda a: a.hydrostatics.km), "Metacentre above the keel"),
    _Row("kg", "KG", _LEN, _length(lambda a: a.weights.kg), "Centre of gravity above the keel"),
    _Row("gm", "GM (upright)", _LEN, _length(lambda a: a.hydrostatics.gm),
         "Upright metacentric height: KM - KG, less any loose-water correction"),
    _Row("list", "List", _DEG, lambda a, u: list_cell(a.curve.list_deg),
         "Steady heel as loaded, from a centre of gravity off the centreline "
         "(stbd = starboard down)"),
    _Row("gunwale", "Gunwale awash at", _DEG, lambda a, u: _angle(a.curve.gunwale_immersion_deg),
         "Heel at which the low gunwale meets the water: an open boat starts to fill"),
    _Row("max_gz", "Max GZ", _LEN, _length(lambda a: a.curve.max_gz),
         "Largest righting arm, towards the side the boat lists to"),
    _Row("max_gz_deg", "  at heel", _DEG, lambda a, u: _angle(abs(a.curve.max_gz_deg)),
         "Heel of the largest righting arm"),
    _Row("range", "Range of stability", _DEG, lambda a, u: _range(a),
         "Heel span from the list over which GZ stays positive "
         "(≥: still positive at the last angle)"),
)


def trim_words(trim_deg: float | None) -> str:
    """The unit and sense of a trim angle, in words: "° by the bow", "° by the stern".

    >>> trim_words(0.3), trim_words(-1.3), trim_words(0.01)
    ('° by the bow', '° by the stern', '° level')
    """
    if trim_deg is None or not math.isfinite(trim_deg):
        return "°"
    if abs(trim_deg) < 0.05:  # shows as 0.0
        return "° level"
    return "° by the bow" if trim_deg > 0 else "° by the stern"


def _text_or_dash(row: _Row, analysis: Analysis, units: UnitSystem) -> str:
    try:
        return row.value(analysis, units)
    except AttributeError:  # no hydrostatics or curve: the boat does not float
        return "—"


class ResultsPanel(QWidget):
    """Status line, GM state in words and colour, the table of figures and the GZ plot.

    Signals
    -------
    helpRequested : the user asked for the full safety cautions
    """

    helpRequested = Signal()

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__()
        self.document = document
        self.options = options

        self.status = QLabel()
        self.status.setWordWrap(True)
        self.status.setMinimumHeight(44)
        self.status.setAlignment(Qt.AlignmentFlag.AlignTop | Qt.AlignmentFlag.AlignLeft)
        self.state = QLabel()
        self.state.setToolTip(_STATE_TIP)
        self.state.setMinimumHeight(46)
        self.state.setWordWrap(True)
        self.state.setAccessibleName("GM state")

        grid = QGridLayout()
        grid.setHorizontalSpacing(10)
        grid.setVerticalSpacing(2)
        figures = style.figure_font()
        width = QFontMetrics(figures).horizontalAdvance("≥-00000.00") + 4
        self.values: dict[str, QLabel] = {}
        self.units: dict[str, QLabel] = {}
        for r, row in enumerate(ROWS):
            name = QLabel(row.label)
            name.setToolTip(row.tip)
            value = QLabel("—")
            value.setFont(figures)
            value.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
            value.setFixedSize(width, value.sizeHint().height())  # no relayout for new figures
            value.setToolTip(row.tip)
            unit = QLabel()
            unit.setFixedWidth(self.fontMetrics().horizontalAdvance("° by the stern  "))
            for label in (value, unit):  # a new figure repaints its label only
                paint_own_background(label)
            grid.addWidget(name, r, 0)
            grid.addWidget(value, r, 1)
            grid.addWidget(unit, r, 2)
            self.values[row.key] = value
            self.units[row.key] = unit
        grid.setColumnStretch(3, 1)
        self.quality = QLabel()
        self.quality.setStyleSheet(f"color: {style.INK_FAINT};")
        self.quality.setWordWrap(True)  # never cut off; two lines kept, so no relayout
        self.quality.setFixedHeight(2 * self.quality.fontMetrics().lineSpacing() + 2)
        self.gz_plot = GzPlot()
        legend = QLabel(LEGEND_HTML)
        legend.setWordWrap(True)
        legend.setStyleSheet("font-size: 8pt;")
        caution = QLabel(f"{SHORT_CAUTION} <a href='#cautions'>Safety notes…</a>")
        caution.setWordWrap(True)
        caution.setStyleSheet(f"color: {style.WARNING}; font-size: 9pt;")
        caution.linkActivated.connect(lambda _link: self.helpRequested.emit())
        caution.setAccessibleName("safety caution")
        self.caution = caution

        layout = QVBoxLayout(self)
        layout.setContentsMargins(8, 6, 8, 6)
        layout.addWidget(self.status)
        layout.addWidget(self.state)
        layout.addLayout(grid)
        layout.addWidget(self.quality)
        self.compare = QLabel()  # pinned version against the current one
        self.compare.setFont(figures)
        self.compare.hide()
        layout.addWidget(self.compare)
        layout.addWidget(self.gz_plot, 1)
        layout.addWidget(legend)
        layout.addWidget(caution)

        document.analysisReady.connect(self.show_analysis)
        document.analysisFailed.connect(self.show_failure)
        options.changed.connect(self._on_options_changed)
        self._on_options_changed()

    def sizeHint(self) -> QSize:
        return QSize(380, 720)

    def minimumSizeHint(self) -> QSize:
        """Constant, so changing texts never re-lay out the window during a drag."""
        return QSize(330, 520)

    def _on_options_changed(self) -> None:
        units = self.options.units
        for row in ROWS:
            self.units[row.key].setText(row.unit(units))
        self.gz_plot.set_units(units)
        if self.document.analysis is not None:
            self.show_analysis(self.document.analysis)

    def show_analysis(self, analysis: Analysis) -> None:
        """Fill the panel from ``analysis``."""
        units = self.options.units
        for row in ROWS:
            self.values[row.key].setText(_text_or_dash(row, analysis, units))
        hs = analysis.hydrostatics
        self.units["trim"].setText(trim_words(None if hs is None else hs.trim_deg))
        state = state_of(analysis)
        self._show_state(analysis, state)
        self._show_status(analysis, state)
        self.gz_plot.show_curve(
            analysis.curve,
            steady=self.document.analysis_is_live,
            open_boat=self.document.design.settings.open_boat,
        )
        self.quality.setText("Exact figures for the design as it stands.")

    def show_failure(self, message: str) -> None:
        """The design cannot be analysed: say why, blank the figures."""
        for value in self.values.values():
            value.setText("—")
        self._set_status(f"No result: {message}", "unstable")
        self._show_state(None, GmState.NONE)
        self.gz_plot.show_curve(None)
        self.quality.setText("")

    def _show_status(self, analysis: Analysis, state: GmState) -> None:
        text = status_sentence(analysis, self.options.units)
        if analysis.status is Status.SINKS:
            capacity = self._closed_hull_capacity()
            if capacity is not None:
                over = self.options.units.mass_text(analysis.weights.mass - capacity)
                text += f" Too heavy by at least {over}."
        tone = "unstable" if state in (GmState.UNSTABLE, GmState.NONE) else state.value
        self._set_status(text, tone)

    def _closed_hull_capacity(self) -> float | None:
        """Mass (kg) the whole closed hull displaces when pushed under."""
        design = self.document.design
        try:
            table = build_section_table(design.stations())
            return float(table.totals[0] @ table.weights) * design.water_density
        except ValueError:
            return None

    def _set_status(self, text: str, tone: str) -> None:
        self.status.setText(text)
        if self.status.property("tone") != tone:  # restyling is slow: only on a change
            bg, fg = style.STATE_COLOURS[tone]
            self.status.setProperty("tone", tone)
            self.status.setStyleSheet(
                f"background: {bg}; color: {fg}; border-radius: 4px; padding: 4px 6px;"
            )

    def _show_state(self, analysis: Analysis | None, state: GmState) -> None:
        """The badge (rich text is slow to lay out: only redone on a change)."""
        if analysis is None:
            word, meaning = "NO RESULT", "the design could not be analysed"
        else:
            word, meaning = badge_words(analysis, state.value)
        key = f"{state.value}|{word}|{meaning}"
        if self.state.property("badge") == key:
            return
        bg, fg = style.STATE_COLOURS[state.value]
        glyph = style.STATE_GLYPHS[state.value]
        self.state.setProperty("badge", key)
        self.state.setProperty("gm_state", state.value)
        self.state.setText(
            f"<span style='font-size: 14pt; font-weight: 600'>{glyph} {word}</span>"
            f"<br><span style='font-size: 9pt'>{meaning}</span>"
        )
        self.state.setStyleSheet(
            f"background: {bg}; color: {fg}; border: 1px solid {fg}; border-radius: 5px; "
            "padding: 4px 8px;"
        )

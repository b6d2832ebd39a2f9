"""droprig's visual language in Qt: outcome colours, labels and hatches, overlay ramps.

The data (names, words, tags, hex colours, hatch kinds, ramps) live in the Qt-free
:mod:`droprig.outcomes`, which the printed annex reads as well; this module turns
them into QColors, brushes and pens. Shared by every view that shows a verdict
(plan view, results table, legend, inspector) so an outcome always looks and
reads the same.

Design rules (our own):

* Three outcome colours told apart by **lightness** as well as by a blue /
  amber / plum hue split (the blue–yellow axis survives red-green colour
  blindness), so they stay distinct under the common colour-vision deficiencies
  and in greyscale print: mid blue, light amber, dark plum. Every pair differs
  by a WCAG contrast ratio of at least ``MIN_OUTCOME_CONTRAST`` (tested).
* Colour is never alone: every outcome also has a **text label**, a one-letter
  **tag** drawn in the bay, and a **hatch** (no hatch / single diagonal /
  cross-hatch, getting denser as the outcome gets worse).
* "No result" (bay outside every zone, or analysis not run) is a neutral grey
  with a dotted hatch and the word "not assessed" — never a good colour.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from PySide6.QtCore import Qt
from PySide6.QtGui import QBrush, QColor, QPen

from droprig import outcomes, units

# ---------------------------------------------------------------- outcomes

HATCH_STYLE: dict[str, Qt.BrushStyle] = {
    "none": Qt.BrushStyle.NoBrush,
    "diagonal": Qt.BrushStyle.BDiagPattern,
    "cross": Qt.BrushStyle.DiagCrossPattern,
    "grid": Qt.BrushStyle.CrossPattern,
    "dots": Qt.BrushStyle.Dense7Pattern,
}
"""Qt brush pattern of each hatch kind of :mod:`droprig.outcomes`."""


@dataclass(frozen=True)
class OutcomeStyle:
    """One outcome of :mod:`droprig.outcomes` with its Qt brushes and pens.

    key, label, tag, meaning, fill, edge, ink: as :class:`droprig.outcomes.Outcome`;
    hatch: the Qt brush pattern of its hatch kind (``hatch_kind``).
    """

    key: str
    label: str
    tag: str
    meaning: str
    fill: str
    edge: str
    ink: str
    hatch: Qt.BrushStyle
    hatch_kind: str

    @classmethod
    def of(cls, o: outcomes.Outcome) -> OutcomeStyle:
        return cls(o.key, o.label, o.tag, o.meaning, o.fill, o.edge, o.ink,
                   HATCH_STYLE[o.hatch], o.hatch)

    def fill_color(self, alpha: int = 255) -> QColor:
        c = QColor(self.fill)
        c.setAlpha(alpha)
        return c

    def fill_brush(self, alpha: int = 255) -> QBrush:
        """Solid fill of the outcome colour."""
        return QBrush(self.fill_color(alpha))

    def hatch_brush(self, alpha: int = 200) -> QBrush:
        """The hatch pattern in the outcome's edge colour (draw over the fill)."""
        c = QColor(self.edge)
        c.setAlpha(alpha)
        return QBrush(c, self.hatch)

    def edge_pen(self, width: float = 0.0) -> QPen:
        pen = QPen(QColor(self.edge))
        pen.setWidthF(width)
        pen.setCosmetic(True)
        return pen


OUTCOME_NONE = outcomes.NOT_ASSESSED

OUTCOMES: dict[str, OutcomeStyle] = {k: OutcomeStyle.of(o) for k, o in outcomes.OUTCOMES.items()}
"""Outcome styles by response key, best to worst, then ``"none"`` (from
:data:`droprig.outcomes.OUTCOMES`)."""

OUTCOME_ORDER: tuple[str, ...] = outcomes.ORDER
"""Response keys from best to worst (same order as the solver's RESPONSES)."""


def outcome(key: str | None) -> OutcomeStyle:
    """The style for a response key; unknown or ``None`` -> "not assessed"."""
    return OUTCOMES.get(key or OUTCOME_NONE, OUTCOMES[OUTCOME_NONE])


def worst(keys: list[str] | tuple[str, ...]) -> str:
    """The worst of several response keys (``"none"`` if the list is empty)."""
    return outcomes.worst(keys)


# ------------------------------------------------------------ overlay ramps

# Ramps of droprig.outcomes: utilisation pale to deep (past 1.0 the "exceeds"
# colour and cross-hatch); allowable drop height dark (short) to pale (tall).
_UTIL_STOPS = outcomes.UTILISATION_STOPS
_DROP_STOPS = outcomes.DROP_HEIGHT_STOPS


def _lerp(stops: tuple[tuple[float, str], ...], v: float) -> QColor:
    if v <= stops[0][0]:
        return QColor(stops[0][1])
    for (v0, c0), (v1, c1) in itertools.pairwise(stops):
        if v <= v1:
            t = (v - v0) / (v1 - v0)
            a, b = QColor(c0), QColor(c1)
            return QColor(round(a.red() + t * (b.red() - a.red())),
                          round(a.green() + t * (b.green() - a.green())),
                          round(a.blue() + t * (b.blue() - a.blue())))
    return QColor(stops[-1][1])


def utilisation_color(u: float | None) -> QColor:
    """Fill colour for a maximum utilisation (dimensionless). Above 1.0 the
    "exceeds" colour; ``None``/nan -> the "not assessed" grey."""
    if u is None or u != u:
        return QColor(OUTCOMES[OUTCOME_NONE].fill)
    if u > 1.0:
        return QColor(OUTCOMES["exceeds"].fill)
    return _lerp(_UTIL_STOPS, max(0.0, u))


def utilisation_hatch(u: float | None) -> Qt.BrushStyle:
    if u is None or u != u:
        return OUTCOMES[OUTCOME_NONE].hatch
    return OUTCOMES["exceeds"].hatch if u > 1.0 else Qt.BrushStyle.NoBrush


def drop_height_color(h: float | None) -> QColor:
    """Fill colour for an allowable drop height (m). ``None``/nan (no height is
    safe) -> the darkest stop."""
    if h is None or h != h:
        return QColor(_DROP_STOPS[0][1])
    return _lerp(_DROP_STOPS, h)


MIN_OUTCOME_CONTRAST = 1.8
"""Least WCAG contrast ratio between any two outcome fills (our own target)."""


def relative_luminance(color: QColor | str) -> float:
    """Relative luminance L of an sRGB colour, 0..1 (W3C WCAG 2.1, definition
    of "relative luminance")."""
    c = QColor(color)

    def lin(v: int) -> float:
        x = v / 255.0
        return x / 12.92 if x <= 0.04045 else ((x + 0.055) / 1.055) ** 2.4

    return 0.2126 * lin(c.red()) + 0.7152 * lin(c.green()) + 0.0722 * lin(c.blue())


def contrast_ratio(a: QColor | str, b: QColor | str) -> float:
    """(L1 + 0.05) / (L2 + 0.05), L1 the lighter (W3C WCAG 2.1, "contrast ratio")."""
    la, lb = relative_luminance(a), relative_luminance(b)
    hi, lo = max(la, lb), min(la, lb)
    return (hi + 0.05) / (lo + 0.05)


def ink_on(color: QColor) -> QColor:
    """Near-black or white text, whichever has the higher contrast on ``color``."""
    dark, light = QColor("#101010"), QColor("#FFFFFF")
    return dark if contrast_ratio(color, dark) >= contrast_ratio(color, light) else light


OVERLAYS: dict[str, str] = {
    "outcome": "Outcome",
    "utilisation": "Max utilisation",
    "drop_height": "Allowable drop height",
}
"""Plan overlay modes and their menu labels."""

# ------------------------------------------------------------ plan chrome

PLAN = {
    "background": "#FBFBF8",
    "grid_line": "#6F7A86",      # column grid lines (dash-dot)
    "grid_label": "#26313C",     # grid bubble text
    "girder": "#2A2A2A",
    "beam": "#5C5C5C",
    "opening": "#FFFFFF",        # deck opening fill (drawn with a heavy outline)
    "column": "#1A1A1A",
    "zone_edge": "#0E7C66",      # lift zone outline (teal; distinct from outcomes)
    "zone_fill": "#0E7C6622",    # #RRGGBBAA (alpha last): faint teal wash
    "crane": "#0E7C66",
    "protection_edge": "#5A4A8A",
    "protection_fill": "#5A4A8A33",  # #RRGGBBAA
    "selection": "#E0115F",      # selected bay/member outline (vivid, thick)
    "hover": "#E0115F88",
    "handle": "#0E7C66",
}
"""Colours of the non-verdict plan elements. Zone teal and selection magenta
are kept away from the three outcome colours so neither reads as a verdict."""

SELECTION_WIDTH_PX = 3.0
HANDLE_SIZE_PX = 9.0

CAUTION_SHORT = (
    "Results are an aid for a competent person — review against local codes with the "
    "appointed lifting person and a licensed engineer"
)
"""The caution of the bay inspector, the export dialog and (room allowing) the status
bar: it defers to local codes, the appointed lifting person and a licensed engineer
(the full sentence is ``droprig.texts.CAUTION``; the export dialog and the bay's
outcome once left out the local codes, seen under Xvfb)."""

CAUTION_PLAN_SHORT = (
    "CAUTION: an aid only. Review against local codes with the appointed lifting person "
    "and a licensed structural engineer; keep people out from under the load path."
)
"""The plan's caution strip on a small plan (1280 × 720 at 150–200 %), where the
full ``droprig.texts.CAUTION`` took a third of the plan's height: the same three
deferrals and the same instruction, in fewer words."""

APP_ORGANISATION = "Droprig Works"
APP_NAME = "droprig"


CONFIRMING = "confirming…"
"""What a limit, condition or verdict reads while the outcomes of an edit are shown
and its limits are still being confirmed (``Document.results_confirmed``): never the
untried value."""

SHORT_DROP_M = 0.5
"""m: allowable drops below this are shown in mm / in, not m / ft."""


def fmt_drop(height: float | None, system: units.UnitSystem) -> str:
    """An allowable drop height, rounded down. Below :data:`SHORT_DROP_M` it is
    given in mm or in, so a drop of a few millimetres does not read as "0.00 ft"."""
    q = "small_length" if height is not None and height < SHORT_DROP_M else "length"
    return units.fmt(height, q, system, rounding="down")


BASIS_LABELS = {"en1993": "EN 1993-1-1", "aisc360": "AISC 360-16"}
"""Design basis as the window names it (status bar, inspector)."""
UNIT_LABELS = {"SI": "SI (m · kN · kg · MPa)", "US": "US (ft · kip · lb · ksi)"}
"""Unit system as the window names it (status bar, inspector)."""

"""Outcome palette: told apart without colour, readable text on every fill.

Contrast ratio and relative luminance as defined in W3C WCAG 2.1 ("contrast
ratio", "relative luminance"); black on white is 21:1 by that definition, and
WCAG 2.1 SC 1.4.3 asks 4.5:1 for normal text.
"""

from __future__ import annotations

import itertools
import math

import pytest
from PySide6.QtCore import Qt

from droprig.gui import style
from droprig.solver.results import RESPONSES

WCAG_TEXT_MIN = 4.5  # WCAG 2.1 SC 1.4.3 (AA, normal text)


def test_contrast_ratio_matches_the_wcag_definition() -> None:
    assert math.isclose(style.contrast_ratio("#000000", "#FFFFFF"), 21.0, rel_tol=1e-9)
    assert math.isclose(style.contrast_ratio("#777777", "#777777"), 1.0, rel_tol=1e-9)


def test_every_solver_response_has_a_style() -> None:
    assert set(style.OUTCOME_ORDER) == set(RESPONSES)
    assert style.outcome(None).key == style.OUTCOME_NONE
    assert style.outcome("unknown").key == style.OUTCOME_NONE


@pytest.mark.parametrize(("a", "b"), list(itertools.combinations(style.OUTCOME_ORDER, 2)))
def test_outcome_fills_differ_in_lightness(a: str, b: str) -> None:
    ratio = style.contrast_ratio(style.OUTCOMES[a].fill, style.OUTCOMES[b].fill)
    assert ratio >= style.MIN_OUTCOME_CONTRAST


def test_outcomes_never_rely_on_colour_alone() -> None:
    styles = list(style.OUTCOMES.values())
    for attr in ("label", "tag", "hatch"):
        values = [getattr(s, attr) for s in styles]
        assert len(set(values)) == len(values), attr
    # Getting worse adds hatch lines: none, single diagonal, cross-hatch, square grid.
    assert [style.OUTCOMES[k].hatch for k in style.OUTCOME_ORDER] == [
        Qt.BrushStyle.NoBrush, Qt.BrushStyle.BDiagPattern, Qt.BrushStyle.DiagCrossPattern,
        Qt.BrushStyle.CrossPattern]


@pytest.mark.parametrize("key", list(style.OUTCOMES))
def test_text_on_each_fill_is_readable(key: str) -> None:
    s = style.OUTCOMES[key]
    assert style.contrast_ratio(s.fill, s.ink) >= WCAG_TEXT_MIN
    assert style.contrast_ratio(s.fill, style.ink_on(s.fill_color())) >= WCAG_TEXT_MIN


def test_worst_of_several_responses() -> None:
    assert style.worst(["elastic", "exceeds", "plastic"]) == "exceeds"
    assert style.worst([]) == style.OUTCOME_NONE


def test_utilisation_ramp_darkens_and_jumps_past_one() -> None:
    lums = [style.relative_luminance(style.utilisation_color(u)) for u in (0.0, 0.5, 0.8, 1.0)]
    assert lums == sorted(lums, reverse=True)
    assert style.utilisation_color(1.01).name().upper() == style.OUTCOMES["exceeds"].fill
    assert style.utilisation_hatch(1.01) == style.OUTCOMES["exceeds"].hatch

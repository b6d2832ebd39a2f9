"""Outcome styles of the printed plan: readable in grey print and under
colour-vision deficiency, and the same visual language as the desktop plan.

Relative luminance and contrast ratio as defined in W3C WCAG 2.1 (§1.4.3,
"relative luminance", "contrast ratio").
"""

from __future__ import annotations

import itertools

import pytest

from droprig.report.content import NOT_ASSESSED, OUTCOMES

MIN_GREY_CONTRAST = 1.5
"""Least contrast ratio between two outcome fills printed in grey (our own target)."""


def _luminance(hex_colour: str) -> float:
    # WCAG 2.1 relative luminance: sRGB channels linearised, 0.2126 R + 0.7152 G + 0.0722 B
    rgb = [int(hex_colour[i:i + 2], 16) / 255 for i in (1, 3, 5)]
    lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4 for c in rgb]
    return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]


def _contrast(a: str, b: str) -> float:
    # WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05), L1 the lighter
    la, lb = sorted((_luminance(a), _luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


@pytest.mark.parametrize(("a", "b"), list(itertools.combinations(
    ["elastic", "plastic", "exceeds"], 2)))
def test_outcome_fills_differ_in_lightness(a: str, b: str) -> None:
    assert _contrast(OUTCOMES[a].fill, OUTCOMES[b].fill) >= MIN_GREY_CONTRAST


def test_every_outcome_has_its_own_hatch_tag_and_words() -> None:
    keys = ["elastic", "plastic", "exceeds", NOT_ASSESSED]
    for attr in ("hatch", "tag", "label"):
        values = [getattr(OUTCOMES[k], attr) for k in keys]
        assert len(set(values)) == len(values), attr


def test_tag_is_readable_on_its_fill() -> None:
    # WCAG 2.1 SC 1.4.3: 4.5:1 for normal text
    for o in OUTCOMES.values():
        assert _contrast(o.ink, o.fill) >= 4.5, o.key


def test_print_and_screen_read_one_palette() -> None:
    # one Qt-free source (droprig.outcomes) for the annex and the desktop plan
    from droprig import outcomes

    assert OUTCOMES is outcomes.OUTCOMES
    style = pytest.importorskip("droprig.gui.style")
    for key, o in outcomes.OUTCOMES.items():
        g = style.OUTCOMES[key]
        assert (g.label, g.tag, g.meaning, g.fill, g.edge, g.ink, g.hatch_kind) == (
            o.label, o.tag, o.meaning, o.fill, o.edge, o.ink, o.hatch), key
    assert style._UTIL_STOPS is outcomes.UTILISATION_STOPS
    assert style._DROP_STOPS is outcomes.DROP_HEIGHT_STOPS

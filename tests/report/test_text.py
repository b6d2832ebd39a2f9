"""Text helpers of the annex: escaping, unit formatting and number substitution.

Conversion factors: 1 ft = 0.3048 m and 1 in = 25.4 mm exactly (international
yard and pound agreement, 1959); 1 lbf = 4.4482216152605 N (NIST SP 811,
Appendix B.8).
"""

from __future__ import annotations

import pytest
from reportlab.platypus import Paragraph

from droprig.report.text import esc, fmt_allow, fmt_util, fmt_value, substitute, substitute_all


@pytest.mark.parametrize("raw", ["<b>Bay & Co</b>", "a < b > c & d", "&amp; stays &amp;",
                                 "<font size=40>x</font>", "</para>"])
def test_escaped_text_prints_literally_in_a_paragraph(raw: str) -> None:
    # XML 1.0 §2.4: '<' and '&' must be escaped in character data (W3C)
    p = Paragraph(esc(raw))
    text = "".join(frag.text for frag in p.frags)
    assert text == raw


@pytest.mark.parametrize(("value", "quantity", "system", "expected"), [
    (3.048, "length", "US", "10.00 ft"),        # 1 ft = 0.3048 m exactly
    (0.0254, "length", "US", "1.00 in"),        # 1 in = 25.4 mm exactly (small length)
    (0.0021, "length", "SI", "2.1 mm"),         # below 0.1 m prints in mm
    (1.5, "length", "SI", "1.500 m"),
    (4448.2216152605, "force", "US", "1.00 kip"),  # NIST SP 811 B.8: 1 lbf = 4.448 N
    (47.88025898033584, "pressure", "US", "1.0 psf"),  # NIST SP 811 B.8: 1 psf = 47.88 Pa
    (2500.0, "pressure", "SI", "2.50 kPa"),
    (float("inf"), "force", "SI", "∞ kN"),
    (2.5e12, "force", "SI", "2.500e+09 kN"),  # 1 kN = 1000 N
    (None, "length", "SI", "none"),
    (float("nan"), "force", "SI", "none"),
])
def test_fmt_value(value: float | None, quantity: str, system: str, expected: str) -> None:
    assert fmt_value(value, quantity, system) == expected


@pytest.mark.parametrize(("u", "expected"), [(1.3749, "1.37"), (0.5, "0.50"),
                                             (float("nan"), "none"), (None, "none"),
                                             (float("inf"), "> 99"), (99.0, "99.00"),
                                             (123.4, "> 99"), (31994980.66, "> 99")])
def test_fmt_util(u: float | None, expected: str) -> None:
    # utilisation = demand/resistance printed to 2 decimals (common practice, no source)
    assert fmt_util(u) == expected


def test_substitute_replaces_whole_symbols_longest_first() -> None:
    # Gere 7th ed. §9.10 Eq. 9-94 with the mass correction: K = 1 + √(1 + 2ηh/δst)
    formula = "1 + √(1 + 2·η·h/δ_st)"
    inputs = {"η": (0.5, "dimensionless"), "h": (0.3048, "length"),
              "δ_st": (0.00254, "length")}
    got = substitute(formula, inputs, "US")
    # 0.3048 m = 1.00 ft; 2.54 mm = 0.10 in (exact conversions)
    assert got == "1 + √(1 + 2·0.500·(1.00 ft)/(0.10 in))"


def test_substitute_leaves_symbols_inside_words_alone() -> None:
    # "h" must not be replaced inside "sqrt" or "h_w" (token rule, no source)
    got = substitute("sqrt(h) + h_w", {"h": (2.0, "length")}, "SI")
    assert got == "sqrt(2.000 m) + h_w"


@pytest.mark.parametrize(("value", "expected"), [(float("inf"), "unlimited"), (None, "none"),
                                                 (0.3048, "1.00 ft")])
def test_fmt_allow(value: float | None, expected: str) -> None:
    # an infinite allowable height means no limit is reached (common practice, no
    # source); 1 ft = 0.3048 m exactly
    assert fmt_allow(value, "length", "US") == expected


def test_runs_without_operators_are_split_into_symbols() -> None:
    # Gere 7th ed. §9.10 Eq. 9-94 as written in the solver's trace: 2ηh/δ_st
    inputs = {"η": (1.0, "dimensionless"), "h": (2.9, "length"),
              "δ_st": (0.0024, "length"), "L": (9.0, "length")}
    got, unused = substitute_all("1 + √(1 + 2ηh/δ_st)", inputs, "SI")
    assert got == "1 + √(1 + 2·1.000·(2.900 m)/(2.4 mm))"
    # an input the formula does not name is reported, to be listed beside it
    assert unused == ["L"]


def test_words_are_not_split() -> None:
    # "height" is not h·e·i·g·h·t even when h, e, t are inputs (token rule, no source)
    inputs = {"h": (1.0, "length"), "e": (2.0, "length"), "t": (3.0, "length")}
    got, _ = substitute_all("drop height h", inputs, "SI")
    assert got == "drop height (1.000 m)"


@pytest.mark.parametrize("system", ["SI", "US"])
@pytest.mark.parametrize("quantity", ["length", "small_length", "force", "mass", "moment",
                                      "stress", "stiffness", "compliance", "area",
                                      "inertia", "modulus", "line_load"])
@pytest.mark.parametrize("value", [0.37, 1234.5678, 2.5e5, 3.1e-5])
def test_fast_formatting_matches_droprig_units(system: str, quantity: str,
                                               value: float) -> None:
    # the report's cached conversion factor gives droprig.units.fmt's text (pint,
    # whose definitions follow NIST SP 811)
    from droprig import units
    from droprig.report.text import HUGE, SMALL_LENGTH_BELOW

    if quantity == "length" and value < SMALL_LENGTH_BELOW:
        quantity_shown = "small_length"  # short lengths print in mm / in on purpose
        assert fmt_value(value, quantity, system) == units.fmt(value, quantity_shown, system)
    elif abs(units.to_display(value, quantity, system)) >= HUGE:
        # degenerate magnitudes print in powers of ten on purpose
        assert "e+" in fmt_value(value, quantity, system)
    else:
        assert fmt_value(value, quantity, system) == units.fmt(value, quantity, system)

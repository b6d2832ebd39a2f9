"""Text helpers for the annex: escaping user text, formatting SI values in the
project's units and substituting numbers into trace formulas.

Every string that came from the user (project info, ids, names, section and
grade names, labels) goes through :func:`esc` before it reaches a reportlab
Paragraph, so markup-like text such as ``<b>Bay & Co</b>`` prints literally.
"""

from __future__ import annotations

import math
import re
from xml.sax.saxutils import escape

from droprig import units
from droprig.units import UnitSystem

SMALL_LENGTH_BELOW = 0.1
"""Lengths below this (m) print in mm / in instead of m / ft so deflections keep
their significant figures (common practice, no source)."""


PSF = 4.4482216152605 / 0.3048**2
"""One pound-force per square foot, Pa (NIST SP 811, Appendix B.8)."""


def esc(text: object) -> str:
    """User text made safe for a reportlab Paragraph (``& < >`` escaped)."""
    return escape(str(text))


def is_none(value: float | None) -> bool:
    return value is None or (isinstance(value, float) and math.isnan(value))


def fmt_value(value: float | None, quantity: str, system: UnitSystem, *,
              unit: bool = True) -> str:
    """An SI value as text in the project's unit system.

    Delegates to :func:`droprig.units.fmt`; lengths under
    :data:`SMALL_LENGTH_BELOW` use the small-length unit (mm / in). Quantities
    the unit table does not know print as a plain number with 4 significant
    figures. ``None`` / nan print ``none``.
    """
    if is_none(value):
        return "none"
    assert value is not None
    v = float(value)
    if quantity == "length" and math.isfinite(v) and 0 < abs(v) < SMALL_LENGTH_BELOW:
        quantity = "small_length"
    if math.isinf(v):
        u = fmt_unit(quantity if quantity != "length" else "length", system)
        return ("∞" if v > 0 else "-∞") + (f" {u}" if unit and u else "")
    if quantity not in units.QUANTITIES:
        return f"{v:.4g}"
    if quantity == "pressure" and system == "US" and math.isfinite(v):
        # droprig.units cannot format psf (pint has no 'psf' unit); 1 psf = 1 lbf/ft²
        # = 4.4482216152605 N / 0.09290304 m² (NIST SP 811 B.8).
        d = units.QUANTITIES["pressure"][4]
        return f"{v / PSF:,.{d}f} psf" if unit else f"{v / PSF:,.{d}f}"
    if quantity == "dimensionless" and math.isfinite(v):
        return f"{v:.3f}" if abs(v) < 1000 else f"{v:,.0f}"
    return units.fmt(v, quantity, system, unit=unit)


def fmt_allow(value: float | None, quantity: str, system: UnitSystem) -> str:
    """An allowable value (drop height, mass): ``unlimited`` when infinite (no
    limit is reached at any value), ``none`` when none is acceptable, otherwise
    as :func:`fmt_value`."""
    if not is_none(value) and math.isinf(float(value)) and float(value) > 0:  # type: ignore[arg-type]
        return "unlimited"
    return fmt_value(value, quantity, system)


def fmt_unit(quantity: str, system: UnitSystem) -> str:
    """Display unit of ``quantity`` (empty for dimensionless)."""
    if quantity not in units.QUANTITIES:
        return ""
    return units.display_unit(quantity, system)


def fmt_util(u: float | None) -> str:
    """Utilisation as a ratio with two decimals (``1.37``); ``none`` for nan; ``∞``
    where the demand meets no resistance at all."""
    if is_none(u):
        return "none"
    assert u is not None
    if math.isinf(u):
        return "∞" if u > 0 else "-∞"
    return f"{u:.2f}"


def substitute(formula: str, inputs: dict[str, tuple[float, str]], system: UnitSystem) -> str:
    """``formula`` with each input symbol replaced by its value in project units.

    Symbols are matched as whole tokens (longest first, so ``δ_st`` is not read
    as ``δ``); a value carrying a unit or a minus sign is bracketed so the
    expression stays readable: ``K = 1 + √(1 + 2·0.612·(1.000 m)/(2.4 mm))``.
    """
    if not inputs:
        return formula
    symbols = sorted(inputs, key=len, reverse=True)
    pattern = re.compile(
        r"(?<![\w.])(" + "|".join(re.escape(s) for s in symbols) + r")(?![\w])")

    def repl(m: re.Match[str]) -> str:
        value, quantity = inputs[m.group(1)]
        text = fmt_value(value, quantity, system)
        enclosed = (m.start() > 0 and m.string[m.start() - 1] == "("
                    and m.end() < len(m.string) and m.string[m.end()] == ")")
        if (" " in text or text.startswith("-")) and not enclosed:
            return f"({text})"
        return text

    return pattern.sub(repl, formula)

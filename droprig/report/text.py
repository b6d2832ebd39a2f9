"""Text helpers for the annex: escaping user text, formatting SI values in the
project's units and substituting numbers into trace formulas.

Every string that came from the user (project info, ids, names, section and
grade names, labels) goes through :func:`esc` before it reaches a reportlab
Paragraph, so markup-like text such as ``<b>Bay & Co</b>`` prints literally.
"""

from __future__ import annotations

import math
from functools import lru_cache
from xml.sax.saxutils import escape

from droprig import tracefmt, units
from droprig.outcomes import fmt_utilisation
from droprig.units import UnitSystem

SMALL_LENGTH_BELOW = 0.1
"""Lengths below this (m) print in mm / in instead of m / ft so deflections keep
their significant figures (common practice, no source)."""


HUGE = 1e9
"""Display magnitudes from this size print in powers of ten (no 19-digit numbers)."""
PSF = 4.4482216152605 / 0.3048**2
"""One pound-force per square foot, Pa (NIST SP 811, Appendix B.8)."""


def esc(text: object) -> str:
    """User text made safe for a reportlab Paragraph (``& < >`` escaped)."""
    return escape(str(text))


def is_none(value: float | None) -> bool:
    return value is None or (isinstance(value, float) and math.isnan(value))


def fmt_value(value: float | None, quantity: str, system: UnitSystem, *,
              unit: bool = True, rounding: units.Rounding = "nearest") -> str:
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
    if quantity == "dimensionless":
        if abs(v) >= HUGE:
            return f"{v:.3e}"
        return f"{v:.3f}" if abs(v) < 1000 else f"{v:,.0f}"
    mag = v * _factor(quantity, system)
    u = fmt_unit(quantity, system)
    if abs(mag) >= HUGE:  # a degenerate value: keep it short and plainly odd
        return f"{mag:.3e}" + (f" {u}" if unit and u else "")
    _, _, _, d_si, d_us = units.QUANTITIES[quantity]
    d = d_si if system == "SI" else d_us
    text = f"{units.round_display(mag, d, rounding):,.{d}f}"
    return f"{text} {u}" if unit and u else text


@lru_cache(maxsize=64)
def _factor(quantity: str, system: UnitSystem) -> float:
    """SI -> display-unit factor, from :func:`droprig.units.to_display` once per
    quantity (every droprig quantity converts by a factor; a report formats
    thousands of values and pint is slow per call)."""
    return units.to_display(1.0, quantity, system)


def fmt_allow(value: float | None, quantity: str, system: UnitSystem) -> str:
    """An allowable value (drop height, mass): ``unlimited`` when infinite (no
    limit is reached at any value), ``none`` when none is acceptable, otherwise
    as :func:`fmt_value` rounded down (a limit is never overstated, as in
    :mod:`droprig.advice`)."""
    if not is_none(value) and math.isinf(float(value)) and float(value) > 0:  # type: ignore[arg-type]
        return "unlimited"
    return fmt_value(value, quantity, system, rounding="down")


@lru_cache(maxsize=64)
def fmt_unit(quantity: str, system: UnitSystem) -> str:
    """Display unit of ``quantity`` (empty for dimensionless)."""
    if quantity not in units.QUANTITIES:
        return ""
    return units.display_unit(quantity, system)


def fmt_util(u: float | None) -> str:
    """Utilisation as everywhere in droprig: :func:`droprig.outcomes.fmt_utilisation`
    (a ratio with two decimals, ``> 99`` beyond 99, ``none`` for nan)."""
    return fmt_utilisation(u)


def substitute_all(formula: str, inputs: dict[str, tuple[float, str]], system: UnitSystem
                   ) -> tuple[str, list[str]]:
    """``formula`` with each input symbol replaced by its value in project units, and
    the input symbols that do not appear in it (:func:`droprig.tracefmt.substitute_all`)."""
    return tracefmt.substitute_all(formula, inputs,
                                   lambda v, q: fmt_value(v, q, system))


def substitute(formula: str, inputs: dict[str, tuple[float, str]], system: UnitSystem) -> str:
    """``formula`` with the numbers put in (see :func:`substitute_all`)."""
    return substitute_all(formula, inputs, system)[0]

"""Unit conversion at the edges (input fields, files, CLI, report) with pint.

Core code never sees a unit string: :func:`parse` turns user text into an SI
float for a named quantity (by a grammar, never by evaluating an expression),
:func:`fmt` turns an SI float into text in the user's unit system.
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
from typing import Literal

import pint

from droprig.model.errors import quote

UnitSystem = Literal["SI", "US"]

# quantity -> (SI base unit, SI display unit, US display unit, display decimals SI, US)
QUANTITIES: dict[str, tuple[str, str, str, int, int]] = {
    "length": ("m", "m", "ft", 3, 2),
    "small_length": ("m", "mm", "in", 1, 2),
    "force": ("N", "kN", "kip", 1, 2),
    "mass": ("kg", "kg", "lb", 0, 0),
    "moment": ("N*m", "kN*m", "kip*ft", 1, 1),
    "stress": ("Pa", "MPa", "ksi", 0, 1),
    "pressure": ("Pa", "kPa", "psf", 2, 1),
    "stiffness": ("N/m", "kN/mm", "kip/in", 2, 1),
    "compliance": ("m/N", "mm/kN", "in/kip", 4, 4),
    "area": ("m**2", "cm**2", "in**2", 1, 2),
    "inertia": ("m**4", "cm**4", "in**4", 0, 0),
    "modulus": ("m**3", "cm**3", "in**3", 0, 1),
    "angle": ("rad", "deg", "deg", 2, 2),
    "speed": ("m/s", "m/s", "ft/s", 2, 2),
    "line_load": ("N/m", "kN/m", "kip/ft", 2, 3),
    "mass_per_length": ("kg/m", "kg/m", "lb/ft", 1, 1),
    "dimensionless": ("", "", "", 3, 3),
}


class UnitError(ValueError):
    """User text that is not a quantity of the expected kind."""


@lru_cache(maxsize=1)
def registry() -> pint.UnitRegistry:
    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    # pint's "t" is the metric tonne; "ton" alone is ambiguous and refused in parse().
    # Pounds per square foot, the US unit of floor pressure (ASCE 7 tables).
    ureg.define("psf = lbf / foot ** 2")
    return ureg


_AMBIGUOUS = {"ton", "tons"}

MAX_MAGNITUDE = 1e15
"""Largest number (in the unit typed) read from text; anything larger is refused with a
message, never evaluated (the largest realistic input, a mat stiffness of 1e12 N/m,
stays well inside)."""

MAX_TEXT = 100
"""Longest text read as a quantity, characters."""

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d{1,3})?"
_NAME = r"[A-Za-zµμΩ_][A-Za-zµμΩ_]*"
_FACTOR = rf"{_NAME}(?:\s*(?:\*\*|\^)\s*[+-]?\d)?"
_UNIT = rf"{_FACTOR}(?:\s*(?:\*|/|\s)\s*{_FACTOR})*"
_QUANTITY = re.compile(rf"^\s*(?P<num>{_NUMBER})?\s*(?P<unit>{_UNIT})?\s*$")
"""The grammar of a quantity: an optional number (decimal, optional exponent of at most
three digits) and an optional unit — unit names joined by ``*``, ``/`` or a space, each
with an optional one-digit power (``**2``, ``^3``). Nothing is evaluated: ``9**9**9``
or ``2**1000000`` do not match and are refused at once."""
_ALIASES = {"kips": "kip", "lbs": "lb", "lbf": "lbf", "kn": "kN", "mpa": "MPa", "kpa": "kPa"}


DECIMAL_MARK: str = "."
"""The decimal mark of the user's locale ("." or ","): set once at start by the
window (from the system locale) and the command line (from ``LC_NUMERIC``); see
:func:`normalise_decimal`."""

_NUMBER_TOKEN = re.compile(r"(?<![\w.,])\d[\d.,]*(?![\w.,])|(?<![\w.,])\d[\d.,]*(?=[eE][-+]?\d)")


def set_decimal_mark(mark: str) -> None:
    """Set :data:`DECIMAL_MARK` ("." or ","; anything else is taken as ".")."""
    global DECIMAL_MARK
    DECIMAL_MARK = "," if mark == "," else "."


def system_decimal_mark() -> str:
    """The decimal mark of the process's numeric locale (``LC_ALL`` /
    ``LC_NUMERIC`` / ``LANG``), "." when that locale is unknown here."""
    import locale as _locale

    try:
        old = _locale.setlocale(_locale.LC_NUMERIC)
        try:
            _locale.setlocale(_locale.LC_NUMERIC, "")
            mark = _locale.localeconv()["decimal_point"]
        finally:
            _locale.setlocale(_locale.LC_NUMERIC, old)
    except _locale.Error:
        return "."
    return "," if mark == "," else "."


def normalise_decimal(text: str, locale: str | None = None) -> str:
    """``text`` with every number written with a decimal point, or
    :class:`UnitError` when a number could be read two ways.

    ``locale``: the decimal mark of the user's locale, "." or "," (default
    :data:`DECIMAL_MARK`). Thousands separators are never guessed:

    - a number with one mark followed by other than three digits has only one
      reading: ``1,5`` and ``1.5`` are 1.5 and ``0,125`` is 0.125 in any locale;
    - one mark followed by exactly three digits (``1,500``, ``1.500``) is the
      decimal mark when it is the locale's mark, and otherwise could be a
      thousands separator: refused;
    - a number with several marks (``1,500,000``, ``1.500,5``) holds a thousands
      separator: refused (write the number without one).
    """
    mark = "," if (locale or DECIMAL_MARK) == "," else "."

    def fix(m: re.Match[str]) -> str:
        tok = m.group(0)
        seps = [c for c in tok if c in ".,"]
        if not seps:
            return tok
        if len(seps) > 1:
            head, _, tail = tok.rpartition(seps[-1])
            plain = head.replace(",", "").replace(".", "") + (f".{tail}" if tail else "")
            raise UnitError(f"{tok!r} holds a thousands separator; write numbers without "
                            f"one and with a single decimal mark, e.g. '{plain}'")
        whole, frac = tok.split(seps[0])
        if not frac:
            return whole
        if seps[0] != mark and len(frac) == 3 and whole not in ("", "0"):
            dec = f"{whole}.{frac}".rstrip("0").rstrip(".")
            raise UnitError(f"{tok!r} is ambiguous: '{seps[0]}' may separate thousands "
                            f"({whole}{frac}) or decimals ({dec}); write '{whole}{frac}' "
                            f"or '{dec}'")
        return f"{whole}.{frac}"

    return _NUMBER_TOKEN.sub(fix, text)


def _normalise(text: str) -> str:
    t = text.strip().replace("²", "**2").replace("³", "**3").replace("⁴", "**4")
    t = t.replace("·", "*").replace("°", " deg")
    return t


def parse(text: str | float, quantity: str, system: UnitSystem = "SI", *,
          field: str = "value") -> float:
    """Parse ``text`` (``"12 ft"``, ``"3.5 m"``, ``"4400 lb"``, ``"2 t"``,
    ``"50 ksi"``, ``"2e6 N/m"``) as ``quantity`` and return SI base units.

    A bare number takes the display unit of ``system``. Pound-mass and
    pound-force are told apart by the quantity asked for (``lb`` is a mass for
    ``mass`` and a force for ``force``). The text is read by the grammar
    :data:`_QUANTITY` (number, optional exponent, unit), never evaluated; numbers
    beyond :data:`MAX_MAGNITUDE` are refused (:class:`UnitError` naming ``field``).
    """
    if quantity not in QUANTITIES:
        raise KeyError(quantity)
    base, si_unit, us_unit, _, _ = QUANTITIES[quantity]
    if isinstance(text, int | float) and not isinstance(text, bool):
        value = float(text)
        unit_text = si_unit if system == "SI" else us_unit
        text_in = f"{value!r} {unit_text}"
    else:
        if not isinstance(text, str) or not text.strip():
            raise UnitError(f"{field}: enter a {quantity.replace('_', ' ')} "
                            f"(for example {_example(quantity, system)})")
        try:
            text_in = _normalise(normalise_decimal(text))
        except UnitError as exc:
            raise UnitError(f"{field}: {exc}") from None
    ureg = registry()
    q = _read(text_in, text, quantity, system, field)
    units_text = str(q.units)
    if any(w in _AMBIGUOUS for w in units_text.replace("*", " ").split()):
        raise UnitError(f"{field}: 'ton' is ambiguous; write t (metric tonne), "
                        "short_ton or long_ton")
    if quantity == "force" and q.check("[mass]"):
        q = (q * ureg.standard_gravity)
    if quantity in ("stress", "pressure") and q.check("[mass]/[length]**2"):
        q = q * ureg.standard_gravity
    if quantity == "line_load" and q.check("[mass]/[length]"):
        q = q * ureg.standard_gravity
    if quantity == "stiffness" and q.check("[mass]/[length]"):
        q = q * ureg.standard_gravity
    try:
        value = q.to(base).magnitude if base else q.to("dimensionless").magnitude
    except pint.DimensionalityError as exc:
        raise UnitError(f"{field}: {_shown(text)} is not a {quantity.replace('_', ' ')} "
                        f"(for example {_example(quantity, system)})") from exc
    value = float(value)
    if not math.isfinite(value):
        raise UnitError(f"{field}: {_shown(text)} is not a finite number")
    return value


def _shown(text: object) -> str:
    return quote(text) if isinstance(text, str) else repr(text)


def _read(text_in: str, text: object, quantity: str, system: UnitSystem,
          field: str) -> pint.Quantity:
    """``text_in`` read by the grammar :data:`_QUANTITY` into a pint quantity (a
    bare number takes the display unit of ``system``); :class:`UnitError` naming
    ``field`` for anything else."""
    what = quantity.replace("_", " ")
    shown = _shown(text)
    m = _QUANTITY.match(text_in) if len(text_in) <= MAX_TEXT else None
    if m is None or (m.group("num") is None):
        raise UnitError(f"{field}: cannot read {shown} as a {what}: write a number and a "
                        f"unit (for example {_example(quantity, system)})")
    value = float(m.group("num"))
    if not math.isfinite(value) or abs(value) > MAX_MAGNITUDE:
        raise UnitError(f"{field}: {shown} is too large a number; at most "
                        f"{MAX_MAGNITUDE:g} in the unit typed")
    ureg = registry()
    unit_text = m.group("unit")
    if not unit_text:
        _, si_unit, us_unit, _, _ = QUANTITIES[quantity]
        unit_text = si_unit if system == "SI" else us_unit
    try:
        unit = ureg.parse_units(unit_text) if unit_text else ureg.dimensionless
    except Exception as exc:  # pint raises several unrelated types
        raise UnitError(f"{field}: cannot read {shown} as a {what}: unknown unit "
                        f"{quote(unit_text)} (for example {_example(quantity, system)})"
                        ) from exc
    return ureg.Quantity(value, unit)


def _example(quantity: str, system: UnitSystem) -> str:
    _, si_unit, us_unit, _, _ = QUANTITIES[quantity]
    u = si_unit if system == "SI" else us_unit
    return f"'12 {u}'" if u else "'1.5'"


def display_unit(quantity: str, system: UnitSystem) -> str:
    """The unit label shown for ``quantity`` in ``system`` (pretty form)."""
    _, si_unit, us_unit, _, _ = QUANTITIES[quantity]
    u = si_unit if system == "SI" else us_unit
    return u.replace("**2", "²").replace("**3", "³").replace("**4", "⁴").replace("*", "·")


def to_display(value: float, quantity: str, system: UnitSystem) -> float:
    """SI value -> magnitude in the display unit of ``system``."""
    base, si_unit, us_unit, _, _ = QUANTITIES[quantity]
    if not base:
        return float(value)
    ureg = registry()
    return float(ureg.Quantity(value, base).to(si_unit if system == "SI" else us_unit).magnitude)


Rounding = Literal["nearest", "down", "up"]


def round_display(mag: float, decimals: int, rounding: Rounding = "nearest") -> float:
    """``mag`` rounded to ``decimals``: to the nearest, or down / up for a limit that
    must not be overstated (an allowable height) or an amount that must at least be
    provided (a mat's travel). A hair of slack keeps an exact value (0.4) where it is."""
    if rounding == "nearest" or not math.isfinite(mag):
        return mag
    k = 10.0**decimals
    return (math.floor(mag * k + 1e-9) if rounding == "down"
            else math.ceil(mag * k - 1e-9)) / k


def fmt(value: float | None, quantity: str, system: UnitSystem = "SI", *,
        decimals: int | None = None, unit: bool = True,
        rounding: Rounding = "nearest") -> str:
    """SI value -> text in the user's units; ``None`` / nan -> ``"none"``.
    ``rounding="down"`` for limits (allowable heights, the stiffest mat), ``"up"``
    for amounts that must at least be provided (:func:`round_display`)."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "none"
    if isinstance(value, float) and math.isinf(value):
        return "unlimited"
    _, _, _, d_si, d_us = QUANTITIES[quantity]
    d = decimals if decimals is not None else (d_si if system == "SI" else d_us)
    mag = round_display(to_display(float(value), quantity, system), d, rounding)
    text = f"{mag:,.{d}f}"
    u = display_unit(quantity, system)
    return f"{text} {u}" if unit and u else text


def sig_decimals(mag: float, sig: int) -> int:
    """Decimals that show ``mag`` to ``sig`` significant figures (never fewer than 0):
    0.0700 → 4, 0.930 → 3, 10.8 → 1, 4,980 → 0 (common practice, no source)."""
    if mag == 0.0 or not math.isfinite(mag):
        return max(sig - 1, 0)
    return max(sig - 1 - math.floor(math.log10(abs(mag))), 0)


def fmt_sig(value: float | None, quantity: str, system: UnitSystem = "SI", *,
            sig: int = 3, unit: bool = True, rounding: Rounding = "nearest") -> str:
    """As :func:`fmt`, to ``sig`` significant figures in the display unit (a small
    allowable height keeps its digits: ``0.0176 m`` rather than ``0.018 m`` or
    ``0.0 mm``; a large one does not print six of them). The rounding happens at the
    shown digits, down for limits and up for amounts to provide."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "none"
    if isinstance(value, float) and math.isinf(value):
        return "unlimited"
    mag = to_display(float(value), quantity, system)
    d = sig_decimals(mag, sig)
    mag = round_display(mag, d, rounding)
    d = sig_decimals(mag, sig) if mag != 0.0 else d  # 0.0999 rounded up to 0.1
    text = f"{mag:,.{d}f}"
    u = display_unit(quantity, system)
    return f"{text} {u}" if unit and u else text


def nice_length(target: float) -> float:
    """The largest 1, 2 or 5 × 10^k not above ``target`` (> 0): a round length
    for a scale bar (common practice, no source)."""
    k = math.floor(math.log10(target))
    for m in (5.0, 2.0, 1.0):
        if m * 10 ** k <= target:
            return m * 10 ** k
    return 10.0 ** k

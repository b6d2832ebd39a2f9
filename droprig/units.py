"""Unit conversion at the edges (input fields, files, CLI, report) with pint.

Core code never sees a unit string: :func:`parse` turns user text into an SI
float for a named quantity (by a grammar, never by evaluating an expression),
:func:`fmt` turns an SI float into text in the user's unit system.

pint is imported only when it is needed: the display units (:data:`DISPLAY_FACTORS`)
and the common input units (:data:`PARSE_FACTORS`) are converted by a table of
pint's own conversion factors (``tests/test_units_light.py`` checks every entry
against pint bit for bit and against NIST SP 811), so opening a window or a
project does not load pint's unit definitions (about a second); any other unit
text goes through pint as before.
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
from typing import TYPE_CHECKING, Literal

from droprig.model.errors import quote

if TYPE_CHECKING:
    import pint

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


DISPLAY_FACTORS: dict[tuple[str, str], float] = {
    ("N", "kN"): 0.001,
    ("N", "kip"): 0.00022480894309971047,
    ("N*m", "kN*m"): 0.001,
    ("N*m", "kip*ft"): 0.0007375621492772653,
    ("N/m", "kN/m"): 0.001,
    ("N/m", "kN/mm"): 1e-06,
    ("N/m", "kip/ft"): 6.852176585679175e-05,
    ("N/m", "kip/in"): 5.710147154732646e-06,
    ("Pa", "MPa"): 1e-06,
    ("Pa", "kPa"): 0.001,
    ("Pa", "ksi"): 1.4503773773020921e-07,
    ("Pa", "psf"): 0.02088543423315013,
    ("kg", "kg"): 1.0,
    ("kg", "lb"): 2.2046226218487757,
    ("kg/m", "kg/m"): 1.0,
    ("kg/m", "lb/ft"): 0.6719689751395068,
    ("m", "ft"): 3.2808398950131235,
    ("m", "in"): 39.37007874015748,
    ("m", "m"): 1.0,
    ("m", "mm"): 1000.0,
    ("m/s", "m/s"): 1.0,
    ("m/s", "ft/s"): 3.2808398950131235,
    ("m**2", "cm**2"): 10000.0,
    ("m**2", "in**2"): 1550.0031000062002,
    ("m**2/m", "inch**2/ft"): 472.44094488188983,
    ("m**2/m", "mm**2/m"): 1000000.0,
    ("m**3", "cm**3"): 999999.9999999999,
    ("m**3", "in**3"): 61023.7440947323,
    ("m**4", "cm**4"): 99999999.99999999,
    ("m**4", "in**4"): 2402509.610028831,
    ("m/N", "in/kip"): 175126.83524647643,
    ("m/N", "mm/kN"): 1000000.0,
    ("rad", "deg"): 57.29577951308232,
}
"""(SI unit, display unit) → the factor pint multiplies by to convert (its
``_get_conversion_factor``, pint 0.25), so :func:`convert` gives pint's numbers bit
for bit without loading pint. Definitions: NIST SP 811 (2008) Appendix B."""

PARSE_FACTORS: dict[tuple[str, str], float] = {
    ("length", "m"): 1.0,
    ("length", "mm"): 0.001,
    ("length", "cm"): 0.01,
    ("length", "ft"): 0.30479999999999996,
    ("length", "in"): 0.0254,
    ("small_length", "m"): 1.0,
    ("small_length", "mm"): 0.001,
    ("small_length", "cm"): 0.01,
    ("small_length", "ft"): 0.30479999999999996,
    ("small_length", "in"): 0.0254,
    ("force", "N"): 1.0,
    ("force", "kN"): 1000.0,
    ("force", "MN"): 1000000.0,
    ("force", "kip"): 4448.221615260501,
    ("force", "lbf"): 4.4482216152605005,
    ("force", "lb"): 4.4482216152605005,
    ("force", "kg"): 9.80665,
    ("force", "t"): 9806.65,
    ("mass", "kg"): 1.0,
    ("mass", "t"): 1000.0,
    ("mass", "lb"): 0.4535923700000001,
    ("moment", "N*m"): 1.0,
    ("moment", "kN*m"): 1000.0,
    ("moment", "kip*ft"): 1355.8179483314004,
    ("moment", "kip*in"): 112.98482902761671,
    ("moment", "lbf*ft"): 1.3558179483314006,
    ("stress", "Pa"): 1.0,
    ("stress", "kPa"): 1000.0,
    ("stress", "MPa"): 1000000.0,
    ("stress", "GPa"): 1000000000.0,
    ("stress", "ksi"): 6894757.293168363,
    ("stress", "psi"): 6894.7572931683635,
    ("stress", "N/mm**2"): 1000000.0,
    ("pressure", "Pa"): 1.0,
    ("pressure", "kPa"): 1000.0,
    ("pressure", "MPa"): 1000000.0,
    ("pressure", "psf"): 47.88025898033586,
    ("pressure", "psi"): 6894.7572931683635,
    ("pressure", "kN/m**2"): 1000.0,
    ("stiffness", "N/m"): 1.0,
    ("stiffness", "kN/m"): 1000.0,
    ("stiffness", "N/mm"): 1000.0,
    ("stiffness", "kN/mm"): 1000000.0,
    ("stiffness", "kip/in"): 175126.83524647643,
    ("stiffness", "lbf/in"): 175.12683524647645,
    ("compliance", "m/N"): 1.0,
    ("compliance", "mm/kN"): 1e-06,
    ("compliance", "in/kip"): 5.710147154732646e-06,
    ("area", "m**2"): 1.0,
    ("area", "mm**2"): 1e-06,
    ("area", "cm**2"): 0.0001,
    ("area", "in**2"): 0.00064516,
    ("inertia", "m**4"): 1.0,
    ("inertia", "mm**4"): 1.0000000000000002e-12,
    ("inertia", "cm**4"): 1e-08,
    ("inertia", "in**4"): 4.1623142559999997e-07,
    ("modulus", "m**3"): 1.0,
    ("modulus", "mm**3"): 1e-09,
    ("modulus", "cm**3"): 1.0000000000000002e-06,
    ("modulus", "in**3"): 1.6387063999999996e-05,
    ("speed", "m/s"): 1.0,
    ("speed", "ft/s"): 0.30479999999999996,
    ("angle", "rad"): 1.0,
    ("angle", "deg"): 0.017453292519943295,
    ("line_load", "N/m"): 1.0,
    ("line_load", "kN/m"): 1000.0,
    ("line_load", "kip/ft"): 14593.902937206369,
    ("line_load", "lbf/ft"): 14.59390293720637,
    ("mass_per_length", "kg/m"): 1.0,
    ("mass_per_length", "lb/ft"): 1.488163943569554,
    ("dimensionless", ""): 1.0,
}
"""(quantity, unit text) → the SI value of 1 of that unit as :func:`parse` reads it
through pint (pound-mass as a force by standard gravity, as there), so the common
units are read without loading pint and give the same numbers bit for bit."""

_SPACED_OPERATOR = re.compile(r"\s*(\*\*|\*|/|\^)\s*")


def _unit_key(unit_text: str) -> str:
    """``unit_text`` in the form of the keys of :data:`PARSE_FACTORS`: no blanks
    beside ``*``, ``/`` and powers, ``^`` written ``**`` (a blank that multiplies,
    "kN m", stays and goes to pint)."""
    return _SPACED_OPERATOR.sub(lambda m: "**" if m.group(1) == "^" else m.group(1),
                                unit_text.strip())


def convert(value: float, from_unit: str, to_unit: str) -> float:
    """``value`` in ``from_unit`` → ``to_unit``, by :data:`DISPLAY_FACTORS` where the
    pair is there (no pint), else by pint."""
    f = DISPLAY_FACTORS.get((from_unit, to_unit))
    if f is not None:
        return float(value * f)
    return float(registry().Quantity(value, from_unit).to(to_unit).magnitude)


@lru_cache(maxsize=1)
def registry() -> pint.UnitRegistry:
    """pint's unit registry (loaded on first use: about a second)."""
    import pint

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
    light = _read_light(text_in, text, quantity, system, field)
    if light is not None:
        return light
    import pint

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


def _read_light(text_in: str, text: object, quantity: str, system: UnitSystem,
                field: str) -> float | None:
    """The SI value of ``text_in`` when its unit (or the bare number's display unit)
    is in :data:`PARSE_FACTORS`, read by the grammar :data:`_QUANTITY`; ``None``
    sends the text to pint (any other unit, or text the grammar refuses, which pint's
    path words as before)."""
    m = _QUANTITY.match(text_in) if len(text_in) <= MAX_TEXT else None
    if m is None or m.group("num") is None:
        return None
    unit_text = m.group("unit")
    if not unit_text:
        _, si_unit, us_unit, _, _ = QUANTITIES[quantity]
        unit_text = si_unit if system == "SI" else us_unit
    factor = PARSE_FACTORS.get((quantity, _unit_key(unit_text)))
    if factor is None:
        return None
    value = float(m.group("num"))
    if not math.isfinite(value) or abs(value) > MAX_MAGNITUDE:
        raise UnitError(f"{field}: {_shown(text)} is too large a number; at most "
                        f"{MAX_MAGNITUDE:g} in the unit typed")
    value = float(value * factor)
    if not math.isfinite(value):
        raise UnitError(f"{field}: {_shown(text)} is not a finite number")
    return value


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
    return convert(value, base, si_unit if system == "SI" else us_unit)


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

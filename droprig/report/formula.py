"""Numbers on a calculation sheet that a checker can reproduce by hand.

:func:`fmt_sig` writes a value with a fixed count of significant figures in the
project's units (never ``0.0 mm`` for a small non-zero value, no thousands
separators); :func:`evaluate` reads a substituted formula as printed (numbers,
units, ``·``, ``/``, ``√(…)``, ``²``, ``|…|``) back into an SI value, so the
annex can refuse to print a substituted line whose printed numbers do not give
the printed result. No ``eval``: the expression is parsed with :mod:`ast` and
only arithmetic nodes are evaluated.
"""

from __future__ import annotations

import ast
import math
import operator
import re

from droprig.units import UnitSystem

SIG = 4
"""Significant figures of every number on a calculation sheet."""

# display unit -> SI factor (NIST SP 811 Appendix B.8 for the US units)
_LB = 0.45359237
_LBF = 4.4482216152605
_IN = 0.0254
_FT = 0.3048
UNIT_FACTORS: dict[str, float] = {
    "mm": 1e-3, "m": 1.0, "cm": 1e-2, "in": _IN, "ft": _FT,
    "N": 1.0, "kN": 1e3, "MN": 1e6, "kip": 1e3 * _LBF, "lbf": _LBF,
    "kg": 1.0, "t": 1e3, "lb": _LB,
    "kN·m": 1e3, "kip·ft": 1e3 * _LBF * _FT, "kN·m/m": 1e3,
    "MPa": 1e6, "kPa": 1e3, "ksi": 1e3 * _LBF / _IN**2, "psf": _LBF / _FT**2,
    "kN/mm": 1e6, "kip/in": 1e3 * _LBF / _IN, "mm/kN": 1e-6, "in/kip": _IN / (1e3 * _LBF),
    "cm²": 1e-4, "in²": _IN**2, "cm⁴": 1e-8, "in⁴": _IN**4, "cm³": 1e-6, "in³": _IN**3,
    "kN/m": 1e3, "kip/ft": 1e3 * _LBF / _FT, "kg/m": 1.0, "lb/ft": _LB / _FT,
    "°": math.pi / 180.0, "deg": math.pi / 180.0, "rad": 1.0,
    "m/s": 1.0, "ft/s": _FT,
}
"""The units a sheet prints, with the factor that takes them to SI."""

# quantity -> (SI unit, US unit) on the sheets; lengths switch to the small unit
SHEET_UNITS: dict[str, tuple[str, str]] = {
    "length": ("m", "ft"), "small_length": ("mm", "in"), "force": ("kN", "kip"),
    "mass": ("kg", "lb"), "moment": ("kN·m", "kip·ft"), "stress": ("MPa", "ksi"),
    "pressure": ("kPa", "psf"), "stiffness": ("kN/mm", "kip/in"),
    "compliance": ("mm/kN", "in/kip"), "area": ("cm²", "in²"), "inertia": ("cm⁴", "in⁴"),
    "modulus": ("cm³", "in³"), "angle": ("°", "°"), "line_load": ("kN/m", "kip/ft"),
    "mass_per_length": ("kg/m", "lb/ft"), "speed": ("m/s", "ft/s"),
    "dimensionless": ("", ""),
}

SMALL_LENGTH = 0.1
"""Lengths below this (m) print in mm / in (common practice, no source)."""

_SUP = str.maketrans("0123456789-−", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁻")
_UNSUP = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")


def sheet_unit(value: float, quantity: str, system: UnitSystem) -> str:
    """The unit a sheet prints ``value`` of ``quantity`` in ('' if dimensionless)."""
    if quantity == "length" and math.isfinite(value) and abs(value) < SMALL_LENGTH:
        quantity = "small_length"
    si, us = SHEET_UNITS.get(quantity, ("", ""))
    return si if system == "SI" else us


def sig_text(mag: float, sig: int = SIG) -> str:
    """``mag`` with ``sig`` significant figures: fixed notation from 10⁻³ to 10⁷,
    otherwise ``d.ddd×10ⁿ``; ``0`` for zero; no thousands separators."""
    if mag == 0:
        return "0"
    a = abs(mag)
    e = math.floor(math.log10(a))
    # rounding can carry into the next decade (9.9996 -> 10.00)
    if round(a, sig - 1 - e) >= 10 ** (e + 1):
        e += 1
    if -3 <= e < 7:
        d = max(0, sig - 1 - e)
        return f"{mag:.{d}f}"
    m = mag / 10**e
    return f"{m:.{sig - 1}f}×10{str(e).translate(_SUP)}"


def fmt_sig(value: float | None, quantity: str, system: UnitSystem, sig: int = SIG) -> str:
    """An SI value as printed on a calculation sheet: ``sig`` significant figures
    in the sheet unit of ``quantity``; ``none`` for None / nan; ``no limit`` for
    +∞ (a check that cannot be reached)."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "none"
    v = float(value)
    if math.isinf(v):
        return "no limit" if v > 0 else "none"
    unit = sheet_unit(v, quantity, system)
    mag = v / UNIT_FACTORS[unit] if unit else v
    text = sig_text(mag, sig)
    return f"{text} {unit}" if unit else text


# ----------------------------------------------------------------- evaluation

_UNIT_ALT = "|".join(re.escape(u) for u in sorted(UNIT_FACTORS, key=len, reverse=True))
_NUM = r"-?\d+(?:\.\d+)?(?:×10[⁻]?[⁰¹²³⁴⁵⁶⁷⁸⁹]+)?"
_QTY = re.compile(rf"({_NUM})(?:\s?({_UNIT_ALT})(?![\w²³⁴]))?")

_OPS = {ast.Add: operator.add, ast.Sub: operator.sub, ast.Mult: operator.mul,
        ast.Div: operator.truediv, ast.Pow: operator.pow, ast.USub: operator.neg,
        ast.UAdd: operator.pos}
_FUNCS = {"sqrt": math.sqrt, "abs": abs, "atan": math.atan}


def _num(text: str) -> float:
    if "×10" in text:
        m, e = text.split("×10")
        return float(m) * 10.0 ** int(e.translate(_UNSUP))
    return float(text)


def to_python(expr: str) -> str:
    """A printed right-hand side as a Python arithmetic expression in SI."""
    def q(m: re.Match[str]) -> str:
        v = _num(m.group(1))
        u = m.group(2)
        return repr(v * UNIT_FACTORS[u]) if u else repr(v)

    s = _QTY.sub(q, expr.replace("−", "-"))
    s = s.replace("·", "*").replace("×", "*")
    s = s.replace("²", "**2").replace("√", "sqrt")
    # |a| -> abs(a): bars pair left to right
    out, open_bar = [], False
    for ch in s:
        if ch == "|":
            out.append(")" if open_bar else "abs(")
            open_bar = not open_bar
        else:
            out.append(ch)
    s = "".join(out)
    s = re.sub(r"\)\s*\(", ")*(", s)
    s = re.sub(r"(\d)\s*\(", r"\1*(", s)
    return s


def _eval(node: ast.AST) -> float:
    if isinstance(node, ast.Expression):
        return _eval(node.body)
    if isinstance(node, ast.Constant) and isinstance(node.value, int | float):
        return float(node.value)
    if isinstance(node, ast.BinOp) and type(node.op) in _OPS:
        return _OPS[type(node.op)](_eval(node.left), _eval(node.right))
    if isinstance(node, ast.UnaryOp) and type(node.op) in _OPS:
        return _OPS[type(node.op)](_eval(node.operand))
    if (isinstance(node, ast.Call) and isinstance(node.func, ast.Name)
            and node.func.id in _FUNCS and len(node.args) == 1):
        return float(_FUNCS[node.func.id](_eval(node.args[0])))
    raise ValueError("not arithmetic")


def evaluate(expr: str) -> float | None:
    """The SI value of a printed right-hand side, or ``None`` when it is not plain
    arithmetic on printed numbers (it still names a symbol, or holds words)."""
    try:
        py = to_python(expr)
        if re.search(r"[A-Za-z_]", re.sub(r"\b(sqrt|abs|atan)\(", "", py).replace("e-", "")
                     .replace("e+", "")):
            return None
        return _eval(ast.parse(py, mode="eval"))
    except (ValueError, SyntaxError, ZeroDivisionError, OverflowError, TypeError):
        return None


def printed_tolerance(result_text: str) -> float:
    """Half a unit of the last printed digit of ``result_text``'s number, relative
    to it (``12.35`` -> 0.005/12.35)."""
    m = re.search(_NUM, result_text)
    if not m:
        return 0.0
    t = m.group(0)
    mant = t.split("×10")[0]
    v = abs(_num(t))
    if v == 0:
        return math.inf
    digits = len(mant.split(".")[1]) if "." in mant else 0
    half = 0.5 * 10.0 ** -digits
    scale = abs(_num(t)) / abs(float(mant)) if float(mant) else 1.0
    return half * scale / v

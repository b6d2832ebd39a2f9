"""Validation errors that name the field, the offending value and the allowed range."""

from __future__ import annotations

import math
import re
import unicodedata

QUOTE_MAX = 80
"""At most this many characters of a user value are quoted in a message (a 50 MB
description must not be printed whole)."""


def quote(value: object, limit: int = QUOTE_MAX) -> str:
    """``repr(value)`` cut to about ``limit`` characters (``…`` and the full length
    when cut), with characters that cannot be printed (lone surrogates, control and
    bidi-override characters) shown as ``\\u`` escapes so the message itself is
    always printable and reads in its own direction."""
    if isinstance(value, str):
        n = len(value)
        head = value[:limit]
        text = "'" + "".join(_escape(c) for c in head) + "'"
        return text if n <= limit else f"{text[:-1]}…' ({n:,} characters)"
    if isinstance(value, tuple | list) and len(value) > 8:
        return f"{type(value).__name__} of {len(value):,} items"
    text = repr(value)
    if len(text) > limit:
        return text[:limit] + "…"
    return "".join(_escape(c) for c in text)


def _escape(c: str) -> str:
    return f"\\u{ord(c):04x}" if text_char_problem(c) else c


BIDI_CONTROLS = frozenset("\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069"
                          "\u200e\u200f\u061c")
"""Unicode bidirectional formatting characters (Unicode Standard Annex #9, Table 1
'explicit directional embeddings, overrides and isolates' and the marks): they can
make a name read differently from what is stored (CVE-2021-42574 'Trojan Source')."""


def text_char_problem(c: str) -> str | None:
    """Why one character may not appear in droprig text, or None.

    Refused: lone surrogates (U+D800–U+DFFF: not characters; no UTF-8 encoding
    exists, Unicode Standard §3.9 D76), control characters (general category Cc)
    other than tab and line feed, and the bidi formatting characters
    (:data:`BIDI_CONTROLS`)."""
    o = ord(c)
    if 0xD800 <= o <= 0xDFFF:
        return "a lone surrogate (not a character)"
    if c in BIDI_CONTROLS:
        return "a bidirectional-override character"
    if c not in "\t\n" and unicodedata.category(c) == "Cc":
        return "a control character"
    return None


_PLAIN = re.compile(r"[\t\n\x20-\x7e\u00a0-\u061b\u061d-\u200d\u2010-\u2029"
                    r"\u202f-\u2065\u206a-\ud7ff\ue000-\U0010ffff]*")


def text_problem(value: str) -> str | None:
    """The first character of ``value`` that droprig text may not hold, described
    with its position (``a control character U+0007 at character 5``), or None.
    Linear in the length of the text."""
    m = _PLAIN.match(value)
    if m is not None and m.end() == len(value):
        return None
    for i, c in enumerate(value):
        why = text_char_problem(c)
        if why:
            return f"{why} U+{ord(c):04X} at character {i + 1}"
    return None


class ModelError(ValueError):
    """An input is outside what droprig can assess.

    ``field`` is a dotted path (``levels[0].members[3].span``), ``value`` the
    offending value in SI units and ``allowed`` a human sentence such as
    ``"> 0 m"``. The edges (GUI, CLI, file loader) re-express the value in the
    user's units; the message here is already readable on its own.
    """

    def __init__(self, field: str, value: object, allowed: str, unit: str = "") -> None:
        self.field = field
        self.value = value
        self.allowed = allowed
        self.unit = unit
        shown = f"{value:g}" if isinstance(value, float) else quote(value)
        suffix = f" {unit}" if unit and isinstance(value, int | float) else ""
        super().__init__(f"{field}: {shown}{suffix} is not allowed; allowed: {allowed}")


def check_finite(field: str, value: float, unit: str = "") -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ModelError(field, value, "a number", unit)
    if not math.isfinite(value):
        raise ModelError(field, value, "a finite number", unit)
    return float(value)


def check_range(
    field: str,
    value: float,
    lo: float | None = None,
    hi: float | None = None,
    *,
    unit: str = "",
    lo_inclusive: bool = True,
    hi_inclusive: bool = True,
) -> float:
    """Return ``value`` as float or raise :class:`ModelError` naming the range."""
    v = check_finite(field, value, unit)
    ok = True
    if lo is not None:
        ok &= v >= lo if lo_inclusive else v > lo
    if hi is not None:
        ok &= v <= hi if hi_inclusive else v < hi
    if not ok:
        u = f" {unit}" if unit else ""
        parts = []
        if lo is not None:
            parts.append(f"{'≥' if lo_inclusive else '>'} {lo:g}{u}")
        if hi is not None:
            parts.append(f"{'≤' if hi_inclusive else '<'} {hi:g}{u}")
        raise ModelError(field, v, " and ".join(parts), unit)
    return v


def check_positive(field: str, value: float, unit: str = "") -> float:
    return check_range(field, value, 0.0, None, unit=unit, lo_inclusive=False)


def check_choice(field: str, value: object, choices: tuple[str, ...]) -> str:
    if value not in choices:
        raise ModelError(field, value, "one of " + ", ".join(choices))
    return str(value)


def check_text(field: str, value: object, *, required: bool = False, max_len: int = 200) -> str:
    if not isinstance(value, str):
        raise ModelError(field, value, "text")
    if required and not value.strip():
        raise ModelError(field, value, "non-empty text")
    if len(value) > max_len:
        raise ModelError(field, value, f"at most {max_len} characters")
    problem = text_problem(value)
    if problem is not None:
        raise ModelError(field, value, f"printable text ({problem} is not)")
    return value

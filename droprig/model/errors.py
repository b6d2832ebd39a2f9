"""Validation errors that name the field, the offending value and the allowed range."""

from __future__ import annotations

import math


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
        shown = f"{value:g}" if isinstance(value, float) else repr(value)
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
        raise ModelError(field, f"{value[:20]}…", f"at most {max_len} characters")
    return value

"""Advice for a bay in plain words, in the user's units (an edge module).

The solver says *what* a bay needs as data (``BaySummary.advice_kind`` and its SI
numbers, :data:`droprig.solver.results.ADVICE_KINDS`); this module writes it for a
lift planner or safety officer. Used by the command line, the desktop app and the
annex so the wording is the same everywhere.

Limits are rounded towards the safe side for display: a drop-height limit and the
stiffest acceptable mat are rounded down, the travel a mat must allow is rounded
up (common practice, no source), so a printed figure never promises more than the
analysis found. Allowable heights elsewhere on screen and in print are rounded down
the same way, so the advice and the tables agree.
"""

from __future__ import annotations

from droprig import units
from droprig.outcomes import fmt_utilisation
from droprig.solver import BaySummary
from droprig.units import UnitSystem

__all__ = ["advice_text", "fmt_down", "fmt_up", "local_damage_text"]

OPENING = ("Keep clear: exclusion zone. The load can fall through a deck opening; "
           "cover the opening or keep the load path away from it.")
KEEP_CLEAR = ("Keep clear: exclusion zone. No practical drop-height limit (50 mm or more) "
              "and no spring mat (compressing 0.3 m at most) keeps the members and deck "
              "within their limits; keep people out, protect the bay with a crushable pad "
              "designed for this load, or re-plan the lift.")
YIELDS = "Members yield but stay within the ductility and rotation limits. "
ACCEPT = "No mat keeps it elastic; accept only with the engineer's approval."


def fmt_down(value: float, quantity: str, system: UnitSystem = "SI") -> str:
    """``value`` (SI) in the display unit of ``system``, rounded down to the display
    decimals of :data:`droprig.units.QUANTITIES` (for limits not to be exceeded)."""
    return units.fmt(value, quantity, system, rounding="down")


def fmt_up(value: float, quantity: str, system: UnitSystem = "SI") -> str:
    """As :func:`fmt_down`, rounded up (for amounts that must at least be provided)."""
    return units.fmt(value, quantity, system, rounding="up")


def _height(b: BaySummary, system: UnitSystem) -> str:
    assert b.height_limit is not None
    text = f"limit the drop height to {fmt_down(b.height_limit, 'length', system)}"
    if b.height_limit_yields and b.allowable_drop_height is not None:
        text += (" (members may then yield within the ductility and rotation limits; "
                 f"{fmt_down(b.allowable_drop_height, 'length', system)} keeps them "
                 "elastic)")
    return text


def _mat(b: BaySummary, system: UnitSystem) -> str:
    assert b.mat_stiffness_max is not None
    travel = (f"; it must be able to compress {fmt_up(b.mat_travel, 'small_length', system)}"
              if b.mat_travel is not None else "")
    return (f"lay a spring mat no stiffer than "
            f"{fmt_down(b.mat_stiffness_max, 'stiffness', system)} over the bay "
            f"(any softer mat also works{travel})")


def _below(b: BaySummary) -> str:
    return f"level {b.level_below}" if b.level_below else "the level below"


def local_damage_text(b: BaySummary, system: UnitSystem = "SI") -> str:
    """The level-below sentence of a bay a hard load may perforate or scab ("" for
    neither): what starts from which drop height, the exclusion of the level below,
    and the extrapolation caution."""
    if b.response != "perforates" and not b.scabbing:
        return ""
    parts = []
    o = b.strike_orientation
    how = f" on {'an' if o and o[0] in 'aeiou' else 'a'} {o} strike" if o else ""
    if b.response == "perforates":
        h = (f" from a drop of {fmt_down(b.perforation_height, 'length', system)}"
             if b.perforation_height is not None else "")
        parts.append(f"the load may go through the deck{how}{h}")
    if b.scabbing:
        h = (f" from {fmt_down(b.scabbing_height, 'length', system)}"
             if b.scabbing_height is not None else "")
        parts.append(f"concrete may scab off the soffit{h}")
    text = ("Local damage: " + " and ".join(parts) + f"; keep {_below(b)} clear under "
            "this bay (exclusion zone).")
    if b.local_extrapolated:
        text += (" The penetration formulas are used below the impact speeds they were "
                 "tested at: an estimate for the appointed lifting person and a licensed "
                 "engineer to judge, never a pass.")
    return text


def advice_text(b: BaySummary, system: UnitSystem = "SI") -> str:
    """What the bay needs, in one or two sentences with numbers in ``system`` (and
    the level-below sentence of :func:`local_damage_text` where a hard load may
    perforate or scab the deck)."""
    text = _framing_text(b, system)
    extra = local_damage_text(b, system)
    return f"{text} {extra}" if extra and b.advice_kind != "level_below" else text


def _framing_text(b: BaySummary, system: UnitSystem) -> str:
    kind = b.advice_kind
    if kind == "level_below":
        limit = (f" A drop of no more than {fmt_down(b.height_limit, 'length', system)} "
                 "neither perforates nor scabs the deck and keeps the framing within its "
                 + ("ductility and rotation limits." if b.height_limit_yields
                    else "elastic limits.")
                 if b.height_limit is not None else "")
        return "Keep clear: exclusion zone below. " + local_damage_text(b, system) + limit
    if kind == "opening":
        return OPENING
    if kind == "none":
        planned = (f" dropped {units.fmt(b.planned_drop_height, 'length', system)}"
                   if b.planned_drop_height is not None else "")
        return (f"No protection needed: every checked member stays elastic for "
                f"{b.load_name}{planned} "
                f"(largest utilisation {fmt_utilisation(b.max_utilisation)}).")
    if kind == "plastic_mat":
        return YIELDS + "For an elastic response: " + _mat(b, system) + "."
    if kind == "plastic_accept":
        return YIELDS + ACCEPT
    if kind == "limit_height":
        return "Protection needed: " + _height(b, system) + "."
    if kind == "mat":
        return "Protection needed: " + _mat(b, system) + "."
    if kind == "limit_or_mat":
        return "Protection needed: " + _height(b, system) + ", or " + _mat(b, system) + "."
    if kind == "keep_clear":
        return KEEP_CLEAR
    raise ValueError(f"advice_kind {kind!r}; allowed: see droprig.solver.results.ADVICE_KINDS")

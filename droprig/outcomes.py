"""droprig's outcome language as plain data (no Qt): names, words, tags, colours,
hatch kinds and overlay ramps, plus the one way a utilisation is written.

The desktop app (``droprig/gui/style.py`` builds QColors and brushes from this)
and the printed annex (``droprig/report``) both read it, so an outcome always
looks and reads the same on screen and on paper.

Design rules (our own):

* Four outcome colours told apart by **lightness** as well as by a blue /
  amber / plum hue split (the blue–yellow axis survives red-green colour
  blindness), so they stay distinct under the common colour-vision deficiencies
  and in greyscale print: mid blue, light amber, dark plum, near-black.
* Colour is never alone: every outcome also has a **label**, a one-letter **tag**
  drawn in the bay, and a **hatch** that gets denser as the outcome gets worse
  (none / single diagonal / cross-hatch / square grid; dots for "not assessed").
* Scabbing of the soffit is a **flag**, not an outcome: a small mark (``SCABBING``)
  added to whatever outcome the bay has.
* "No result" is a neutral grey with the word "not assessed" — never a good colour.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

Hatch = Literal["none", "diagonal", "cross", "grid", "dots"]
HATCHES: tuple[Hatch, ...] = ("none", "diagonal", "cross", "grid", "dots")


@dataclass(frozen=True)
class Outcome:
    """How one response state is named and drawn.

    key: the solver's response string (``droprig.solver.results.RESPONSES``) or
    ``"none"``. label: short words for tables and legends. tag: one character
    drawn inside a bay. meaning: one sentence for tooltips and legends.
    fill / edge / ink: ``#RRGGBB`` (area fill; outline and hatch; text on the fill).
    hatch: the pattern laid over the fill.
    """

    key: str
    label: str
    tag: str
    meaning: str
    fill: str
    edge: str
    ink: str
    hatch: Hatch


NOT_ASSESSED = "none"
"""Key of the "not assessed" outcome (no drop point in the bay, or no results)."""

ORDER: tuple[str, ...] = ("elastic", "plastic", "exceeds", "perforates")
"""Response keys from best to worst (the solver's RESPONSES order)."""

OUTCOMES: dict[str, Outcome] = {
    "elastic": Outcome(
        "elastic", "Stays elastic", "E",
        "Every check at or below its capacity (U ≤ 1.00): the framing springs back.",
        "#4F8CC2", "#173F66", "#06182B", "none"),
    "plastic": Outcome(
        "plastic", "Yields, within limits", "Y",
        "Bending capacity exceeded; permanent set within the ductility and rotation "
        "limits. Expect damage to repair.",
        "#F2C572", "#8A5A00", "#3D2800", "diagonal"),
    "exceeds": Outcome(
        "exceeds", "Exceeds limits", "X",
        "A brittle check fails, a limit is passed, the path collapses or the load falls "
        "through an opening. Not acceptable as planned.",
        "#7B2D5E", "#3E0F2C", "#FFFFFF", "cross"),
    "perforates": Outcome(
        "perforates", "May go through", "P",
        "A hard load may perforate the deck here (local damage, estimated beyond the "
        "formulas' test speeds): keep the level below clear.",
        "#1E1A24", "#A49DB3", "#FFFFFF", "grid"),
    NOT_ASSESSED: Outcome(
        NOT_ASSESSED, "Not assessed", "–",
        "No drop point of the lift zones considered falls in this bay.",
        "#E4E4E0", "#8C8C86", "#3A3A36", "dots"),
}
"""Outcomes by response key, best to worst, then ``"none"``."""


@dataclass(frozen=True)
class Flag:
    """A mark added to a bay's outcome: ``label`` for tables and legends, ``tag`` a
    character drawn beside the outcome tag, ``meaning`` one sentence, ``ink`` its
    colour (#RRGGBB)."""

    key: str
    label: str
    tag: str
    meaning: str
    ink: str


SCABBING = Flag(
    "scabbing", "Soffit may scab", "s",
    "A hard load may knock concrete off the underside of the deck here: keep the level "
    "below clear.", "#C0733A")
"""The scabbing flag (our own mark: a burnt-orange disc with a white lower-case s,
drawn in the top-right corner of a bay where a hard load may scab the soffit over
the level below — on the screen plan and on the annex plan alike)."""


def outcome(key: str | None) -> Outcome:
    """The outcome for a response key; unknown or ``None`` -> "not assessed"."""
    return OUTCOMES.get(key or NOT_ASSESSED, OUTCOMES[NOT_ASSESSED])


def worst(keys: object) -> str:
    """The worst of several response keys (``"none"`` if there are none)."""
    ranked = [k for k in keys if k in ORDER]  # type: ignore[attr-defined]
    return max(ranked, key=ORDER.index) if ranked else NOT_ASSESSED


# ------------------------------------------------------------ overlay ramps

UTILISATION_STOPS: tuple[tuple[float, str], ...] = (
    (0.0, "#EEF3F8"),
    (0.5, "#9CC6E8"),
    (0.8, "#4F8CC2"),
    (1.0, "#2B4F85"),
)
"""Sequential ramp for utilisation 0 → 1, pale to deep, one hue family so it reads
in greyscale; above 1.0 the "exceeds" fill and hatch."""

DROP_HEIGHT_STOPS: tuple[tuple[float, str], ...] = (
    (0.0, "#3E0F2C"),
    (0.25, "#7B2D5E"),
    (0.5, "#C0733A"),
    (1.0, "#F2C572"),
    (2.0, "#CFE3F1"),
    (4.0, "#F4F8FB"),
)
"""Allowable drop height (m) ramp: short is bad (dark), tall is good (pale)."""


# ------------------------------------------------------------ utilisation text

UTIL_MAX_SHOWN = 99.0
"""Utilisations beyond this print as ``> 99``: the exact figure no longer matters."""


def fmt_utilisation(u: float | None) -> str:
    """A utilisation U = demand / resistance as a ratio with two decimals (``1.42``);
    ``> 99`` beyond :data:`UTIL_MAX_SHOWN` (and where the demand meets no resistance
    at all, U = ∞); ``none`` for None / nan. A utilisation is written as a ratio
    everywhere in droprig (common practice, no source)."""
    if u is None or (isinstance(u, float) and math.isnan(u)):
        return "none"
    u = float(u)
    if u > UTIL_MAX_SHOWN:
        return f"> {UTIL_MAX_SHOWN:.0f}"
    if math.isinf(u):  # -inf: no meaning for a utilisation
        return "none"
    return f"{u:.2f}"


def fmt_utilisation_check(u: float | None, check: str) -> str:
    """:func:`fmt_utilisation` with the check that sets it in brackets (``3.39
    (shear)``; the ratio alone where no check is named): the one text of a bay's
    largest U in the results table, the permit's cells and the inspector."""
    util = fmt_utilisation(u)
    return f"{util} ({check.replace('_', ' ')})" if check else util



def outcome_check(check: str, response: str) -> str:
    """The words for the check that sets a point's outcome: for a point whose load
    may go through the deck (``response`` ``"perforates"``) the local-damage check
    (perforation of the slab), not the framing check the chain names at that point
    (seen under Xvfb on the rooftop demo: "B3/B-C · web yielding" beside "P May go
    through" and "5.48 (deck flexure)", three reasons for one bay). Common practice,
    no source: name the check that sets the outcome."""
    if response == "perforates":
        return "deck perforation (local damage)"
    return check.replace("_", " ")


def fmt_worst_point(member: str, check: str, response: str) -> str:
    """The worst point's member and the check that sets its outcome
    (:func:`outcome_check`): the one text of the results table's "worst point"
    column, the inspector and the annex's point sheet. Where the deck itself is the
    worst point's member its checks drop their own "deck" ("deck · perforation (local
    damage)", not "deck · deck perforation …", seen under Xvfb on the steel demo)."""
    words = outcome_check(check, response)
    if member == "deck" and words.startswith("deck "):
        words = words[len("deck "):]
    return f"{member} · {words}" if words else member

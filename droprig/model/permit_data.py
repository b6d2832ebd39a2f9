"""Permit data the signing annex prints: permit number, lift-plan revision,
validity window, the crane and its configuration, pick-up and set-down points,
and where each load's mass comes from.

None of it changes a number droprig computes; it identifies what is signed.
An empty text (or ``None`` for a mass source) means *not recorded*: the annex
flags it on page 1 and leaves a write-in blank, it never fills in a value.

Validation raises :class:`~droprig.model.errors.ModelError` (field, value,
allowed). Text here is single-line and printable: control characters (Unicode
general category Cc, line breaks included), format characters (Cf: zero-width
and bidirectional controls), surrogates (Cs) and private-use characters (Co) are
refused — they would print as nothing or reorder the text a signer reads
(Unicode Standard 15.0, §4.5 General Category, Table 4-4).
"""

from __future__ import annotations

import datetime as _dt
import re
import unicodedata
from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal

from droprig.model.errors import ModelError, check_choice, check_range, check_text

if TYPE_CHECKING:
    from droprig.model.project import LiftLoad, LiftZone, ProjectInfo

MassSource = Literal["weighed", "data_plate", "drawing", "estimate"]
MASS_SOURCES: tuple[str, ...] = ("weighed", "data_plate", "drawing", "estimate")
"""Where a load's mass comes from, most to least reliable (common practice, no
source): weighed (load cell or weighbridge ticket), the manufacturer's data
plate or certificate, a drawing or schedule, an estimate."""

MASS_SOURCE_WORDS: dict[str, str] = {
    "weighed": "weighed",
    "data_plate": "manufacturer's data plate",
    "drawing": "drawing",
    "estimate": "estimate",
}
"""The words the edges print for each mass source."""

LiftPointKind = Literal["pick_up", "set_down"]
LIFT_POINT_KINDS: tuple[str, ...] = ("pick_up", "set_down")
LIFT_POINT_WORDS: dict[str, str] = {"pick_up": "pick-up", "set_down": "set-down"}

MAX_LIFT_POINTS = 40
"""At most this many pick-up and set-down points in one lift zone."""
PERMIT_TEXT_MAX = 200
"""Longest permit number, revision, crane description or point label, characters."""
CRANE_CONFIGURATION_MAX = 600
"""Longest crane configuration text, characters."""

_DATE_RE = re.compile(r"^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2})?$")
DATE_ALLOWED = "a date YYYY-MM-DD or a date and time YYYY-MM-DD HH:MM (ISO 8601), or empty"


def check_line_text(field: str, value: object, *, max_len: int = PERMIT_TEXT_MAX) -> str:
    """Single-line printable text (see the module docstring), ``max_len``
    characters at most; empty allowed (= not recorded)."""
    text = check_text(field, value, max_len=max_len)
    for i, ch in enumerate(text):
        if unicodedata.category(ch) in ("Cc", "Cf", "Cs", "Co"):
            raise ModelError(field, text, "printable text on one line (no control or format "
                             f"characters; found U+{ord(ch):04X} at character {i + 1})")
    if text != text.strip():
        raise ModelError(field, text, "text without leading or trailing spaces")
    return text


def parse_permit_date(field: str, value: str) -> _dt.datetime | None:
    """``value`` as a date-time (a bare date is its start, 00:00), None if empty.

    Accepted: ``YYYY-MM-DD`` and ``YYYY-MM-DD HH:MM`` / ``YYYY-MM-DDTHH:MM``
    (ISO 8601-1:2019, §5.2.2 calendar date, §5.4.2 local time, extended format);
    the calendar must hold the day (no 2026-02-30)."""
    if value == "":
        return None
    if not _DATE_RE.match(value):
        raise ModelError(field, value, DATE_ALLOWED)
    try:
        return _dt.datetime.fromisoformat(value.replace(" ", "T"))
    except ValueError:
        raise ModelError(field, value, DATE_ALLOWED + " — a day and time the calendar "
                         "holds") from None


def check_permit_info(info: ProjectInfo) -> None:
    """The permit fields of the title block: permit number, lift-plan revision
    and the validity window (``valid_to`` not before ``valid_from``)."""
    check_line_text("info.permit_number", info.permit_number)
    check_line_text("info.lift_plan_revision", info.lift_plan_revision)
    start = parse_permit_date("info.valid_from", check_line_text("info.valid_from",
                                                                 info.valid_from))
    end = parse_permit_date("info.valid_to", check_line_text("info.valid_to", info.valid_to))
    if start is not None and end is not None:
        # a bare end date is valid to the end of that day
        end_of = end + _dt.timedelta(days=1) if len(info.valid_to) == 10 else end
        if end_of <= start:
            raise ModelError("info.valid_to", info.valid_to,
                             f"after valid_from = {info.valid_from}")


@dataclass(frozen=True)
class LiftPoint:
    """A pick-up or set-down point of a lift zone, in plan (m, level axes).

    ``label`` names it on the conditions plan and in the annex's inputs
    (``"trailer bed, Quayside Road"``); empty: numbered only."""

    kind: LiftPointKind
    at: tuple[float, float]
    label: str = ""

    def __post_init__(self) -> None:
        check_choice("lift_point.kind", self.kind, LIFT_POINT_KINDS)
        if not (isinstance(self.at, tuple) and len(self.at) == 2):
            raise ModelError("lift_point.at", self.at, "a pair (x, y) of numbers in m")
        check_range("lift_point.at.x", self.at[0], -10_000.0, 10_000.0, unit="m")
        check_range("lift_point.at.y", self.at[1], -10_000.0, 10_000.0, unit="m")
        check_line_text("lift_point.label", self.label, max_len=64)


def check_zone_permit(zone: LiftZone) -> None:
    """Crane description and configuration, and the zone's lift points."""
    check_line_text(f"zone {zone.id}.crane_description", zone.crane_description)
    check_line_text(f"zone {zone.id}.crane_configuration", zone.crane_configuration,
                    max_len=CRANE_CONFIGURATION_MAX)
    if not isinstance(zone.lift_points, tuple):
        raise ModelError(f"zone {zone.id}.lift_points", zone.lift_points,
                         "a tuple of LiftPoint")
    if len(zone.lift_points) > MAX_LIFT_POINTS:
        raise ModelError(f"zone {zone.id}.lift_points", len(zone.lift_points),
                         f"at most {MAX_LIFT_POINTS} pick-up and set-down points")
    for i, p in enumerate(zone.lift_points):
        if not isinstance(p, LiftPoint):
            raise ModelError(f"zone {zone.id}.lift_points[{i}]", p, "a LiftPoint")


def check_mass_source(load: LiftLoad) -> None:
    """``None`` (not recorded) or one of :data:`MASS_SOURCES`."""
    if load.mass_source is not None:
        check_choice(f"load {load.name}.mass_source", load.mass_source, MASS_SOURCES)


def lift_point_tags(zone: LiftZone) -> list[str]:
    """Short tags of the zone's points in order: pick-ups ``P1, P2 …``, set-downs
    ``S1, S2 …`` (numbered separately; shared by the plan and the tables)."""
    counts = {"pick_up": 0, "set_down": 0}
    out = []
    for p in zone.lift_points:
        counts[p.kind] += 1
        out.append(f"{'P' if p.kind == 'pick_up' else 'S'}{counts[p.kind]}")
    return out

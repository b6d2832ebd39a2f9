"""The permit data as the annex prints it: sign-off rows, the page-1 list of
what is not recorded, mass sources and lift points in words.

Nothing here is ever filled in: a field the project file does not record is
printed as a write-in blank marked NOT RECORDED, and listed on page 1 so the
signer completes it by hand (:mod:`droprig.model.permit_data`).
"""

from __future__ import annotations

import datetime as _dt
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from droprig.model import (
    MASS_SOURCE_WORDS,
    LiftLoad,
    LiftZone,
    Project,
    bays,
    lift_point_tags,
)
from droprig.model.permit_data import LIFT_POINT_WORDS, parse_permit_date

NOT_RECORDED = "NOT RECORDED"
BLANK = "________________________"
WRITE_IN = f"{NOT_RECORDED}: write in {BLANK}"

Fmt = Callable[[float], str]
"""A length in m -> text in the project's units."""


def mass_source_text(load: LiftLoad) -> str:
    """``"weighed"``, ``"manufacturer's data plate"`` … or NOT RECORDED."""
    if load.mass_source is None:
        return NOT_RECORDED
    return MASS_SOURCE_WORDS[load.mass_source]


def validity_text(project: Project) -> str:
    """``"2026-12-06 06:00 to 2026-12-06 18:00"`` with a write-in for a missing end."""
    info = project.info
    start = info.valid_from or WRITE_IN
    end = info.valid_to or WRITE_IN
    return f"{start} to {end}"


def lift_plan_text(project: Project) -> str:
    info = project.info
    ref = info.lift_reference or WRITE_IN
    rev = info.lift_plan_revision or WRITE_IN
    return f"{ref}, revision {rev}"


def crane_text(zone: LiftZone, fmt: Fmt) -> str:
    """One zone's crane, its configuration and its position in words."""
    desc = zone.crane_description or f"crane {WRITE_IN}"
    conf = zone.crane_configuration or f"configuration {WRITE_IN}"
    return (f"{zone.id}: {desc}; {conf}; slew centre at ({fmt(zone.crane[0])}, "
            f"{fmt(zone.crane[1])}), radius {fmt(zone.r_min)} to {fmt(zone.r_max)} over "
            "the level")


@dataclass(frozen=True)
class PointRow:
    """A pick-up or set-down point as the inputs table prints it."""

    zone_id: str
    tag: str
    kind: str
    label: str
    x: float
    y: float
    bay: str
    """The bay of the zone's level the point lies in (on a shared edge: the first
    in grid order), or ``"off the framing"``."""


OFF_FRAMING = "off the framing"


def point_rows(project: Project, zones: Sequence[LiftZone]) -> list[PointRow]:
    out = []
    for z in zones:
        level_bays = bays(project.level(z.level_id))
        for tag, p in zip(lift_point_tags(z), z.lift_points, strict=True):
            bay = next((b.id for b in level_bays if b.rect.contains(*p.at)), OFF_FRAMING)
            out.append(PointRow(z.id, tag, LIFT_POINT_WORDS[p.kind], p.label, p.at[0],
                                p.at[1], bay))
    return out


def not_recorded(project: Project, zones: Sequence[LiftZone]) -> list[str]:
    """Every permit field the project does not record, in words, in the order
    the sign-off block asks for them (empty list: all recorded)."""
    info = project.info
    out: list[str] = []
    # the lift-plan reference itself is flagged with the title block
    for label, value in (("permit number", info.permit_number),
                         ("lift-plan revision", info.lift_plan_revision)):
        if not value:
            out.append(label)
    if not info.valid_from and not info.valid_to:
        out.append("validity window (from / to)")
    elif not info.valid_from:
        out.append("start of the validity window")
    elif not info.valid_to:
        out.append("end of the validity window")
    for z in zones:
        missing = [w for w, v in (("crane", z.crane_description),
                                  ("crane configuration", z.crane_configuration)) if not v]
        kinds = {p.kind for p in z.lift_points}
        missing += [f"{LIFT_POINT_WORDS[k]} points" for k in ("pick_up", "set_down")
                    if k not in kinds]
        if missing:
            out.append(f"zone {z.id}: " + ", ".join(missing))
        loads = [ld.name for ld in z.loads if ld.mass_source is None]
        if loads:
            out.append(f"mass source of {', '.join(loads)} (zone {z.id})")
    return out


def points_in_exclusions(clashes: Sequence[object],
                         conditions: Sequence[object]) -> list[str]:
    """The permit's plan clashes (:func:`droprig.permit.plan_clashes`: pick-up or
    set-down points in a bay a load must not be carried over) in words, one sentence
    per bay (:func:`droprig.permit.clash_sentences`), each load with the number of
    the ``exclude_area`` condition it meets as printed (``conditions`` numbered from
    1: C1, C2 …; a condition with no bays covers the whole zone)."""
    from droprig.permit import clash_sentences

    numbers: dict[tuple[str, str, str], int] = {}
    for c in clashes:
        key = (getattr(c, "zone_id", ""), getattr(c, "load_name", ""),
               getattr(c, "bay_id", ""))
        n = next((k for k, cond in enumerate(conditions, start=1)
                  if getattr(cond, "kind", "") == "exclude_area"
                  and getattr(cond, "zone_id", None) == key[0]
                  and getattr(cond, "load_name", None) in (None, key[1])
                  and (not getattr(cond, "bays", ()) or key[2] in getattr(cond, "bays", ()))),
                 None)
        if n is not None:
            numbers[key] = n
    return clash_sentences(clashes, numbers)  # type: ignore[arg-type]


WINDOW_MARGIN = _dt.timedelta(hours=14)
"""The validity window is local site time without a time zone: it counts as ended
only when it has ended in every time zone (UTC−12 is the latest civil time, UTC+14
the earliest; 14 h covers both — IANA time zone database, Etc/GMT+12)."""


def window_ended(project: Project, now_utc: _dt.datetime) -> str | None:
    """A sentence if the permit's validity window ended before ``now_utc`` (an
    aware or naive UTC date-time), else None (not recorded or not yet ended). A
    bare ``valid_to`` date runs to the end of that day."""
    info = project.info
    if not info.valid_to:
        return None
    end = parse_permit_date("info.valid_to", info.valid_to)
    if end is None:  # pragma: no cover - empty handled above
        return None
    if len(info.valid_to) == 10:
        end += _dt.timedelta(days=1)
    now = now_utc.replace(tzinfo=None)
    if now - WINDOW_MARGIN <= end:
        return None
    return (f"the validity window ended {info.valid_to}, before this annex was printed "
            f"({now:%Y-%m-%d %H:%M} UTC)")

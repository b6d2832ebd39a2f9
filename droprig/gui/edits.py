"""Edits of the project: pure functions that return a new :class:`Project`.

The project is immutable. Every edit builds a new project with
:func:`dataclasses.replace` (so the model's validation runs on the result); the
window pushes it with :meth:`droprig.gui.document.Document.edit` as one undoable
:class:`droprig.gui.commands.ProjectEdit`. This module imports neither Qt nor the
document. The pure functions raise :class:`~droprig.model.ModelError`
(field, value, allowed range) for anything the model refuses; the caller shows
the message and leaves the project unchanged.
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import replace

from droprig.model import (
    Deck,
    Level,
    LiftLoad,
    LiftZone,
    Member,
    ModelError,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Settings,
    check_corridor,
    without_members,
)

# ------------------------------------------------------------------ helpers


def unique_id(prefix: str, existing: Iterable[str]) -> str:
    """``prefix`` + the smallest positive integer not yet used (``Z1``, ``Z2`` …)."""
    taken = set(existing)
    n = 1
    while f"{prefix}{n}" in taken:
        n += 1
    return f"{prefix}{n}"


def unique_name(base: str, existing: Iterable[str]) -> str:
    """``base``, or ``base 2``, ``base 3`` … if taken."""
    taken = set(existing)
    if base not in taken:
        return base
    stem = re.sub(r"\s+\d+$", "", base)
    n = 2
    while f"{stem} {n}" in taken:
        n += 1
    return f"{stem} {n}"


def _index(items: tuple, key: str, attr: str, what: str) -> int:
    for i, it in enumerate(items):
        if getattr(it, attr) == key:
            return i
    raise ModelError(what, key, "an existing " + what.split(".")[-1].rstrip("s"))


def _swap_at(items: tuple, i: int, new: object) -> tuple:
    return (*items[:i], new, *items[i + 1:])


def _drop_at(items: tuple, i: int) -> tuple:
    return (*items[:i], *items[i + 1:])


# ------------------------------------------------------------------ info, settings


def with_info(p: Project, info: ProjectInfo) -> Project:
    return replace(p, info=info)


def with_settings(p: Project, settings: Settings) -> Project:
    return replace(p, settings=settings)


# ------------------------------------------------------------------ levels


def with_level(p: Project, level_id: str, level: Level) -> Project:
    """Replace level ``level_id``. If the id changes, zones and protection areas on
    the level follow it."""
    i = _index(p.levels, level_id, "id", "levels")
    zones = tuple(replace(z, level_id=level.id) if z.level_id == level_id else z
                  for z in p.lift_zones)
    prots = tuple(replace(a, level_id=level.id) if a.level_id == level_id else a
                  for a in p.protection_areas)
    return replace(p, levels=_swap_at(p.levels, i, level), lift_zones=zones,
                   protection_areas=prots)


def add_level(p: Project, level: Level) -> Project:
    return replace(p, levels=(*p.levels, level))


def remove_level(p: Project, level_id: str) -> Project:
    """Remove a level with every lift zone and protection area on it."""
    i = _index(p.levels, level_id, "id", "levels")
    return replace(
        p,
        levels=_drop_at(p.levels, i),
        lift_zones=tuple(z for z in p.lift_zones if z.level_id != level_id),
        protection_areas=tuple(a for a in p.protection_areas if a.level_id != level_id),
    )


def with_member(p: Project, level_id: str, member_id: str, member: Member) -> Project:
    lv = p.level(level_id)
    i = _index(lv.members, member_id, "id", f"level {level_id}.members")
    return with_level(p, level_id, replace(lv, members=_swap_at(lv.members, i, member)))


def remove_members(p: Project, level_id: str, member_ids: Iterable[str]) -> Project:
    """Level ``level_id`` without ``member_ids`` (one undo step for all of them). The
    model refuses (ModelError naming them) if another member would be left resting
    on nothing, or if no member would be left; see
    :func:`droprig.model.without_members`."""
    return with_level(p, level_id, without_members(p.level(level_id), member_ids))


def with_members(p: Project, level_id: str, members: dict[str, Member]) -> Project:
    """Replace several members of one level at once (one undo step)."""
    lv = p.level(level_id)
    new = tuple(members.get(m.id, m) for m in lv.members)
    return with_level(p, level_id, replace(lv, members=new))


def with_deck(p: Project, level_id: str, deck: Deck) -> Project:
    return with_level(p, level_id, replace(p.level(level_id), deck=deck))


def add_opening(p: Project, level_id: str, rect: Rect) -> Project:
    deck = p.level(level_id).deck
    return with_deck(p, level_id, replace(deck, openings=(*deck.openings, rect)))


def with_opening(p: Project, level_id: str, index: int, rect: Rect) -> Project:
    deck = p.level(level_id).deck
    if not 0 <= index < len(deck.openings):
        raise ModelError(f"level {level_id}.deck.openings", index, "an existing opening")
    return with_deck(p, level_id, replace(deck, openings=_swap_at(deck.openings, index, rect)))


def remove_opening(p: Project, level_id: str, index: int) -> Project:
    deck = p.level(level_id).deck
    if not 0 <= index < len(deck.openings):
        raise ModelError(f"level {level_id}.deck.openings", index, "an existing opening")
    return with_deck(p, level_id, replace(deck, openings=_drop_at(deck.openings, index)))


# ------------------------------------------------------------------ lift zones and loads


def with_zone(p: Project, zone_id: str, zone: LiftZone) -> Project:
    i = _index(p.lift_zones, zone_id, "id", "lift_zones")
    return replace(p, lift_zones=_swap_at(p.lift_zones, i, zone))


def with_corridor(p: Project, zone_id: str, corridor: Iterable[tuple[float, float]]) -> Project:
    """Zone ``zone_id`` with ``corridor`` (plan polygon, m; empty = whole sector).
    Refused (ModelError): fewer than 3 corners, a polygon that crosses or touches
    itself or encloses no area (:func:`droprig.model.check_corridor`), points out of
    range."""
    pts = check_corridor(f"zone {zone_id}.corridor", tuple(corridor))
    return with_zone(p, zone_id, replace(p.zone(zone_id), corridor=pts))


def add_zone(p: Project, zone: LiftZone) -> Project:
    return replace(p, lift_zones=(*p.lift_zones, zone))


def remove_zone(p: Project, zone_id: str) -> Project:
    i = _index(p.lift_zones, zone_id, "id", "lift_zones")
    return replace(p, lift_zones=_drop_at(p.lift_zones, i))


def with_load(p: Project, zone_id: str, load_name: str, load: LiftLoad) -> Project:
    z = p.zone(zone_id)
    i = _index(z.loads, load_name, "name", f"zone {zone_id}.loads")
    return with_zone(p, zone_id, replace(z, loads=_swap_at(z.loads, i, load)))


def add_load(p: Project, zone_id: str, load: LiftLoad) -> Project:
    z = p.zone(zone_id)
    return with_zone(p, zone_id, replace(z, loads=(*z.loads, load)))


def remove_load(p: Project, zone_id: str, load_name: str) -> Project:
    z = p.zone(zone_id)
    i = _index(z.loads, load_name, "name", f"zone {zone_id}.loads")
    return with_zone(p, zone_id, replace(z, loads=_drop_at(z.loads, i)))


# ------------------------------------------------------------------ protection


def with_protection(p: Project, prot_id: str, area: ProtectionArea) -> Project:
    i = _index(p.protection_areas, prot_id, "id", "protection_areas")
    return replace(p, protection_areas=_swap_at(p.protection_areas, i, area))


def add_protection(p: Project, area: ProtectionArea) -> Project:
    return replace(p, protection_areas=(*p.protection_areas, area))


def remove_protection(p: Project, prot_id: str) -> Project:
    i = _index(p.protection_areas, prot_id, "id", "protection_areas")
    return replace(p, protection_areas=_drop_at(p.protection_areas, i))

"""The ``.droprig`` project file: versioned JSON, checked against a JSON Schema.

Layout (format 1, described by ``resources/droprig.schema.json`` and
``docs/file_format.md``): one JSON object with ``format_version``,
``application``, ``info``, ``settings``, ``levels``, ``lift_zones`` and
``protection_areas``. Every number is SI with its unit in the key name
(``elevation_m``, ``mass_kg``, ``fc_Pa``, ``stiffness_N_per_m``); angles are
degrees (``slew_start_deg``). Library sections and grades are written by name,
custom ones inline with all their properties.

Loading collects every problem it can find, each prefixed with the JSON path of
the offending value, and raises one :class:`ProjectFileError`. Saving is atomic
(temporary file in the same folder, fsync, :func:`os.replace`) and keeps one
``.bak`` of the previous file. No pickle, no eval: JSON text only.
"""

from __future__ import annotations

import copy
import decimal
import hashlib
import json
import math
import os
import re
from collections.abc import Callable, Iterable
from decimal import Decimal
from functools import lru_cache
from pathlib import Path
from typing import Any

from droprig.io.atomic import atomic_write_bytes
from droprig.model import (
    DESIGN_TILT_DEFAULT,
    ColumnGrid,
    Concrete,
    Deck,
    Grade,
    Level,
    LiftLoad,
    LiftPoint,
    LiftZone,
    Member,
    ModelError,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Section,
    Settings,
    bounds,
)
from droprig.model.errors import QUOTE_MAX, quote, text_problem

FORMAT_VERSION = 2
"""The file layout this droprig writes and the newest it reads."""

APPLICATION = "droprig"
SUFFIX = ".droprig"
SCHEMA_PATH = Path(__file__).resolve().parents[2] / "resources" / "droprig.schema.json"

__all__ = [
    "FORMAT_VERSION",
    "MIGRATIONS",
    "MIGRATION_NOTES",
    "SCHEMA_PATH",
    "ProjectFileError",
    "dumps_project",
    "load_project",
    "loads_project",
    "project_fingerprint",
    "project_to_document",
    "save_project",
    "schema",
]


class ProjectFileError(ValueError):
    """A project file that cannot be read. ``problems`` lists every problem
    found, each starting with the JSON path of the offending value (``$`` is the
    whole document); ``source`` names the file when one was read."""

    def __init__(self, problems: Iterable[str], source: str | None = None) -> None:
        found = list(problems) or ["unknown problem"]
        self.total = getattr(problems, "total", len(found))
        limit = bounds.MAX_PROBLEMS_SHOWN
        if len(found) > limit:
            more = self.total - limit
            found = [*found[:limit], f"… and {more:,} more problem(s) not listed"]
        self.problems: list[str] = found
        self.source = source
        where = f"{source}: " if source else ""
        if len(self.problems) == 1:
            text = f"{where}{self.problems[0]}"
        else:
            text = f"{where}{self.total} problems\n" + "\n".join(
                f"  {p}" for p in self.problems)
        super().__init__(text)


# --------------------------------------------------------------------------- paths

_IDENT = re.compile(r"^[A-Za-z_][A-Za-z0-9_]*$")


def _json_path(parts: Iterable[str | int]) -> str:
    out = "$"
    for p in parts:
        if isinstance(p, int):
            out += f"[{p}]"
        elif _IDENT.match(p):
            out += f".{p}"
        else:
            out += "[" + json.dumps(p, ensure_ascii=False) + "]"
    return out


# --------------------------------------------------------------------------- angles
# The model holds radians; the file holds degrees. A float written as its
# shortest decimal in degrees does not always come back as the same radian float
# (degree floats are sparser than radian floats), so the writer picks the
# shortest decimal that reads back exactly, using more than 17 digits (read with
# an exact π/180) only when no ordinary float will do. Round trip is exact.

_PI_OVER_180 = Decimal(
    "0.017453292519943295769236907684886127134428718885417254560971914401710091146")
_EXACT_CONTEXT = decimal.Context(prec=80)
_FLOAT_DIGITS = 17


def _deg_to_rad(value: float | int | Decimal) -> float:
    """Degrees (as read from the file) -> radians."""
    if isinstance(value, Decimal) and len(value.as_tuple().digits) > _FLOAT_DIGITS:
        return float(_EXACT_CONTEXT.multiply(value, _PI_OVER_180))
    return math.radians(float(value))


class _Raw(str):
    """Number text written verbatim by :func:`_emit`."""


def _rad_to_deg_text(rad: float) -> _Raw:
    """Shortest decimal degree text that :func:`_deg_to_rad` maps back to ``rad``."""
    deg = math.degrees(rad)
    for n in range(1, _FLOAT_DIGITS + 1):
        cand = float(f"{deg:.{n}g}")
        if math.isfinite(cand) and math.radians(cand) == rad:
            return _Raw(repr(cand))
    exact = _EXACT_CONTEXT.divide(Decimal(rad), _PI_OVER_180)
    for n in range(_FLOAT_DIGITS + 1, 60):
        text = str(decimal.Context(prec=n).plus(exact))
        if _deg_to_rad(Decimal(text)) == rad:
            return _Raw(text)
    raise AssertionError(f"cannot write angle {rad!r} exactly")  # pragma: no cover


# --------------------------------------------------------------------------- writing

def _emit(value: object, indent: int = 0) -> str:
    """Stable JSON text: keys in the order built, indent 2, short lists of
    scalars on one line."""
    pad = "  " * indent
    inner = "  " * (indent + 1)
    if isinstance(value, _Raw):
        return str(value)
    if isinstance(value, dict):
        if not value:
            return "{}"
        items = [f"{inner}{json.dumps(k, ensure_ascii=False)}: {_emit(v, indent + 1)}"
                 for k, v in value.items()]
        return "{\n" + ",\n".join(items) + "\n" + pad + "}"
    if isinstance(value, list | tuple):
        if not value:
            return "[]"
        if all(not isinstance(v, dict | list | tuple) for v in value):
            return "[" + ", ".join(_emit(v) for v in value) + "]"
        return "[\n" + ",\n".join(inner + _emit(v, indent + 1) for v in value) + "\n" + pad + "]"
    if isinstance(value, bool) or value is None or isinstance(value, str | int):
        return json.dumps(value, ensure_ascii=False)
    if isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError(f"cannot write the non-finite number {value!r}")
        return repr(value)
    raise TypeError(f"cannot write {type(value).__name__}")


def _lib_section_name(sec: Section) -> str | None:
    try:
        from droprig.io import sections as lib

        return sec.name if lib.get_section(sec.name) == sec else None
    except (ImportError, ValueError, KeyError):
        return None


def _lib_grade_name(grade: Grade) -> str | None:
    try:
        from droprig.io import sections as lib

        return grade.name if lib.get_grade(grade.name) == grade else None
    except (ImportError, ValueError, KeyError):
        return None


def _section_doc(sec: Section) -> object:
    name = _lib_section_name(sec)
    if name is not None:
        return name
    return {
        "name": sec.name, "family": sec.family,
        "d_m": sec.d, "bf_m": sec.bf, "tw_m": sec.tw, "tf_m": sec.tf, "r_m": sec.r,
        "A_m2": sec.A, "Ix_m4": sec.Ix, "Sx_m3": sec.Sx, "Zx_m3": sec.Zx, "Iy_m4": sec.Iy,
        "mass_per_length_kg_per_m": sec.mass_per_length,
    }


def _grade_doc(grade: Grade) -> object:
    name = _lib_grade_name(grade)
    if name is not None:
        return name
    return {
        "name": grade.name, "family": grade.family,
        "fy_steps": [{"max_thickness_m": t, "fy_Pa": fy} for t, fy in grade.fy_steps],
        "fu_Pa": grade.fu, "E_Pa": grade.E,
    }


def _rect_doc(r: Rect) -> dict[str, object]:
    return {"x0_m": r.x0, "y0_m": r.y0, "x1_m": r.x1, "y1_m": r.y1}


def _point_doc(p: tuple[float, float]) -> list[float]:
    return [p[0], p[1]]


def _level_doc(lv: Level, memo: dict[int, object]) -> dict[str, object]:
    def cached(obj: Section | Grade, fn: Callable[[Any], object]) -> object:
        key = id(obj)
        if key not in memo:
            memo[key] = (obj, fn(obj))  # keep obj alive so id() stays unique
        return memo[key][1]  # type: ignore[index]

    d = lv.deck
    return {
        "id": lv.id,
        "name": lv.name,
        "elevation_m": lv.elevation,
        "grid": {
            "x_lines_m": list(lv.grid.x_lines),
            "y_lines_m": list(lv.grid.y_lines),
            "x_labels": list(lv.grid.x_labels),
            "y_labels": list(lv.grid.y_labels),
        },
        "deck": {
            "kind": d.kind,
            "thickness_m": d.thickness,
            "cover_m": d.cover,
            "rebar_area_m2_per_m": d.rebar_area,
            "concrete": {
                "fc_Pa": d.concrete.fc,
                "density_kg_per_m3": d.concrete.density,
                "fy_rebar_Pa": d.concrete.fy_rebar,
            },
            "openings": [_rect_doc(o) for o in d.openings],
            **_deck_extra_doc(d),
            # steel decks only (absent = the defaults; a concrete deck's file unchanged)
            **({"steel_fy_Pa": d.steel_fy} if d.is_steel else {}),
            **({"bar_thickness_m": d.bar_thickness, "bar_pitch_m": d.bar_pitch}
               if d.kind == "grating" else {}),
        },
        "superimposed_dead_Pa": lv.superimposed_dead,
        "live_in_place_Pa": lv.live_in_place,
        **{key: v for key, v in (("column_area_m2", lv.column_area),
                                 ("column_height_m", lv.column_height)) if v is not None},
        # absent = occupied (the safe side); an older file is unchanged
        **({} if lv.occupied_below else {"occupied_below": False}),
        "members": [
            {
                "id": m.id,
                "role": m.role,
                "start_m": _point_doc(m.start),
                "end_m": _point_doc(m.end),
                "section": cached(m.section, _section_doc),
                "grade": cached(m.grade, _grade_doc),
                "end_condition": m.end_condition,
                **_member_extra_doc(m),
            }
            for m in lv.members
        ],
    }


def _deck_extra_doc(d: Deck) -> dict[str, object]:
    """Slab and composite-deck data, only when given (older files round-trip unchanged)."""
    out: dict[str, object] = {}
    if d.rib_height:
        out["rib_height_m"] = d.rib_height
    if d.top_rebar_area:
        out["top_rebar_area_m2_per_m"] = d.top_rebar_area
    return out


def _member_extra_doc(m: Member) -> dict[str, object]:
    """Composite flag and connection capacity, only when given."""
    out: dict[str, object] = {}
    if m.composite:
        out["composite"] = True
    if m.connection_capacity is not None:
        out["connection_capacity_N"] = m.connection_capacity
    return out


def _load_doc(ld: LiftLoad) -> dict[str, object]:
    out: dict[str, object] = {
        "name": ld.name,
        "kind": ld.kind,
        "mass_kg": ld.mass,
        "footprint_length_m": ld.footprint_length,
        "footprint_width_m": ld.footprint_width,
    }
    if ld.drop_height is not None:
        out["drop_height_m"] = ld.drop_height
    if ld.hook_elevation is not None:
        out["hook_elevation_m"] = ld.hook_elevation
    out["hang_length_m"] = ld.hang_length
    if ld.contact_stiffness is not None:
        out["contact_stiffness_N_per_m"] = ld.contact_stiffness
    if ld.mass_source is not None:
        out["mass_source"] = ld.mass_source
    # strike data only when not the defaults, so older files round-trip unchanged
    if ld.strike_orientations != _DEFAULT_LOAD.strike_orientations or ld.strike_reason:
        out["strike_orientations"] = list(ld.strike_orientations)
        out["strike_reason"] = ld.strike_reason
    if ld.edge_width != _DEFAULT_LOAD.edge_width:
        out["edge_width_m"] = ld.edge_width
    if ld.hard is not None:
        out["hard"] = ld.hard
    return out


def _zone_permit_doc(z: LiftZone) -> dict[str, object]:
    """Crane, configuration and lift points, only when recorded (format 2)."""
    out: dict[str, object] = {}
    if z.crane_description:
        out["crane_description"] = z.crane_description
    if z.crane_configuration:
        out["crane_configuration"] = z.crane_configuration
    if z.lift_points:
        out["lift_points"] = [
            {"kind": p.kind, "at_m": _point_doc(p.at), **({"label": p.label} if p.label
                                                           else {})}
            for p in z.lift_points]
    return out


def _info_permit_doc(i: ProjectInfo) -> dict[str, object]:
    """Permit number, lift-plan revision and validity, only when recorded (format 2)."""
    return {k: getattr(i, k) for k in _PERMIT_INFO_KEYS if getattr(i, k)}


_PERMIT_INFO_KEYS = ("permit_number", "lift_plan_revision", "valid_from", "valid_to")


_DEFAULT_LOAD = LiftLoad(name="default", mass=1.0)
_ZONE_DRIFT_KEYS = (("slew_speed", "slew_speed_rad_per_s"), ("hoist_speed", "hoist_speed_m_per_s"),
                    ("radial_speed", "radial_speed_m_per_s"),
                    ("swing_length", "swing_length_m"))


def _zone_doc(z: LiftZone) -> dict[str, object]:
    out: dict[str, object] = {
        "id": z.id,
        "name": z.name,
        "level_id": z.level_id,
        "crane_m": _point_doc(z.crane),
        "r_min_m": z.r_min,
        "r_max_m": z.r_max,
        "slew_start_deg": _rad_to_deg_text(float(z.slew_start)),
        "slew_end_deg": _rad_to_deg_text(float(z.slew_end)),
        "drift_margin_m": z.drift_margin,
        "corridor_m": [_point_doc(p) for p in z.corridor],
        "loads": [_load_doc(ld) for ld in z.loads],
        **_zone_permit_doc(z),
    }
    # drift data only when computed or entered, so older files round-trip unchanged
    if z.drift_mode != "given" or any(getattr(z, a) for a, _ in _ZONE_DRIFT_KEYS) \
            or z.swing_angle:
        out["drift_mode"] = z.drift_mode
        for attr, key in _ZONE_DRIFT_KEYS:
            out[key] = getattr(z, attr)
        out["swing_angle_deg"] = _rad_to_deg_text(float(z.swing_angle))
    return out


def _protection_doc(p: ProtectionArea) -> dict[str, object]:
    out: dict[str, object] = {
        "id": p.id,
        "name": p.name,
        "level_id": p.level_id,
        "area": _rect_doc(p.area),
        "kind": p.kind,
        "thickness_m": p.thickness,
    }
    for key, v in (("stiffness_N_per_m", p.stiffness), ("modulus_Pa", p.modulus),
                   ("crush_force_N", p.crush_force), ("crush_stress_Pa", p.crush_stress),
                   ("crush_stroke_m", p.crush_stroke)):
        if v is not None:
            out[key] = v
    return out


def project_to_document(project: Project) -> dict[str, object]:
    """The JSON document (plain dicts and lists) for ``project``."""
    i, s = project.info, project.settings
    memo: dict[int, object] = {}
    return {
        "format_version": FORMAT_VERSION,
        "application": APPLICATION,
        "info": {
            "name": i.name, "site": i.site, "lift_reference": i.lift_reference,
            "revision": i.revision, "date": i.date, "prepared_by": i.prepared_by,
            "checked_by": i.checked_by, "approved_by": i.approved_by,
            "description": i.description,
            **_info_permit_doc(i),
        },
        "settings": {
            "unit_system": s.unit_system,
            "design_basis": s.design_basis,
            "resistance_factor": s.resistance_factor,
            "dynamic_increase_factor": s.dynamic_increase_factor,
            "deflection_limit_ratio": s.deflection_limit_ratio,
            "ductility_limit": s.ductility_limit,
            "rotation_limit_deg": _rad_to_deg_text(float(s.rotation_limit)),
            "grid_resolution_m": s.grid_resolution,
            "include_member_mass": s.include_member_mass,
            "include_existing_loads": s.include_existing_loads,
            # written only when on, so files of projects without it stay byte-equal
            **({"dynamic_amplification": True} if s.dynamic_amplification else {}),
            **({"tilted_landing": True} if s.tilted_landing else {}),
            **({"design_tilt_deg": _rad_to_deg_text(float(s.design_tilt))}
               if s.design_tilt != DESIGN_TILT_DEFAULT else {}),
        },
        "levels": [_level_doc(lv, memo) for lv in project.levels],
        "lift_zones": [_zone_doc(z) for z in project.lift_zones],
        "protection_areas": [_protection_doc(p) for p in project.protection_areas],
    }


def dumps_project(project: Project) -> str:
    """The file text for ``project``: fixed key order, indent 2, final newline.
    ``loads_project(dumps_project(p)) == p``."""
    return _emit(project_to_document(project)) + "\n"


def save_project(project: Project, path: str | os.PathLike[str], *, backup: bool = True) -> None:
    """Write ``project`` to ``path`` atomically.

    The text goes to a temporary file in the same folder, is flushed and
    fsync'ed, and then replaces ``path`` in one :func:`os.replace`; a failure
    at any point leaves the previous file as it was and removes the temporary
    file. With ``backup`` the previous file is first copied to ``<path>.bak``
    (one backup, replaced each save). A symbolic link is followed: the file it
    points to is replaced.
    """
    data = dumps_project(project).encode("utf-8")
    target = Path(os.path.realpath(os.fspath(path)))
    if backup and target.exists():
        atomic_write_bytes(target.with_name(target.name + ".bak"), target.read_bytes(),
                           like=target)
    atomic_write_bytes(target, data, like=target if target.exists() else None)




def project_fingerprint(path: str | os.PathLike[str]) -> str:
    """SHA-256 of the file's bytes, hex: names the exact input in a permit annex."""
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


# --------------------------------------------------------------------------- reading

def _migrate_0_to_1(doc: dict[str, Any]) -> dict[str, Any]:
    """Format 0 (pre-release draft): loads carried ``drop_height_mm`` in
    millimetres and the file had no ``application`` key. Format 1 stores
    ``drop_height_m`` in metres and names the application."""
    for zone in doc.get("lift_zones", []) if isinstance(doc.get("lift_zones"), list) else []:
        loads = zone.get("loads", []) if isinstance(zone, dict) else []
        for ld in loads if isinstance(loads, list) else []:
            if isinstance(ld, dict) and "drop_height_mm" in ld:
                mm = ld.pop("drop_height_mm")
                ld["drop_height_m"] = mm / 1000.0 if isinstance(mm, int | float) else mm
    doc.setdefault("application", APPLICATION)
    doc["format_version"] = 1
    return doc


def _migrate_1_to_2(doc: dict[str, Any]) -> dict[str, Any]:
    """Format 2: one drop-height datum. ``drop_height_m`` is the height of the load's
    underside above the finished surface of the level (format 1 measured it to the
    deck or to the top of a pad or mat, whichever was struck). The numbers are kept;
    where a pad or mat lies on the zone's level the fall onto it is now the value less
    the pad's thickness, which :func:`migration_notes` tells the user. Format 2 also
    adds optional permit data (``info.permit_number``, ``info.lift_plan_revision``,
    ``info.valid_from`` / ``valid_to``; per zone ``crane_description``,
    ``crane_configuration``, ``lift_points``; per load ``mass_source``): a format-1
    file recorded none of them, so nothing is added (absent = not recorded, flagged
    on page 1 of the annex); no value is guessed."""
    doc["format_version"] = 2
    return doc


def _notes_1_to_2(doc: dict[str, Any]) -> list[str]:
    """What the format 1 → 2 step changes in meaning: one note per load given by drop
    height on a level that carries a pad or mat (hook-elevation loads read the same)."""
    pads: dict[str, list[str]] = {}
    for pa in _list(doc.get("protection_areas")):
        if isinstance(pa, dict):
            t = pa.get("thickness_m", 0.2)
            pads.setdefault(str(pa.get("level_id")), []).append(
                f"{pa.get('id')} ({t:g} m)" if isinstance(t, int | float) else str(pa.get("id")))
    notes = []
    for zone in _list(doc.get("lift_zones")):
        if not isinstance(zone, dict):
            continue
        on = pads.get(str(zone.get("level_id")))
        for ld in _list(zone.get("loads")):
            if isinstance(ld, dict) and "drop_height_m" in ld and on:
                notes.append(
                    f"load {ld.get('name')} (zone {zone.get('id')}): its drop height "
                    f"{ld['drop_height_m']:g} m is now measured from the finished surface "
                    f"of level {zone.get('level_id')}, no longer from the top of a pad or "
                    f"mat; over {', '.join(on)} the fall is that much less. Check the "
                    "value and save the project to keep the new meaning.")
    return notes


def _list(v: Any) -> list[Any]:
    return v if isinstance(v, list) else []


MIGRATIONS: dict[int, Callable[[dict[str, Any]], dict[str, Any]]] = {
    0: _migrate_0_to_1, 1: _migrate_1_to_2}
"""``MIGRATIONS[v]`` turns a format-``v`` document into a format-``v + 1`` one.
Each step works on its own deep copy; a failing step leaves nothing half done."""

MIGRATION_NOTES: dict[int, Callable[[dict[str, Any]], list[str]]] = {1: _notes_1_to_2}
"""``MIGRATION_NOTES[v]``: what the step from format ``v`` changes in meaning, in
words for the user (read from the format-``v`` document)."""


def _reject_constant(name: str) -> float:
    raise ValueError(f"{name} is not a number JSON allows")


def _no_duplicates(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for k, v in pairs:
        if k in out:
            raise ValueError(f"the key {k!r} appears twice in one object")
        out[k] = v
    return out


def _parse(text: str) -> Any:
    try:
        return json.loads(text, parse_float=Decimal, parse_constant=_reject_constant,
                          object_pairs_hook=_no_duplicates)
    except json.JSONDecodeError as exc:
        end = " (the file looks truncated)" if exc.pos >= len(text.rstrip()) else ""
        raise ProjectFileError(
            [f"$: not a readable JSON file: {exc.msg} at line {exc.lineno}, column "
             f"{exc.colno}{end}"]) from None
    except RecursionError:
        raise ProjectFileError([f"$: lists and objects nested too deep (droprig reads up to "
                                f"{bounds.MAX_NESTING} levels)"]) from None
    except ValueError as exc:
        raise ProjectFileError([f"$: not a readable JSON file: {exc}"]) from None


def _to_floats(value: Any, path: list[str | int], problems: list[str]) -> Any:
    """Decimal -> float everywhere except under ``*_deg`` keys (kept exact for
    :func:`_deg_to_rad`); numbers too large for a float, text droprig does not hold
    (:func:`droprig.model.errors.text_problem`, in keys too) and nesting deeper than
    :data:`~droprig.model.bounds.MAX_NESTING` are problems. Iterative (no recursion
    limit can be reached from a file) and linear in the size of the document; the
    containers are converted in place."""
    root: list[Any] = [value]
    # (container, key or index, path, depth)
    stack: list[tuple[Any, Any, list[str | int], int]] = [(root, 0, path, 0)]
    deep = False
    while stack:
        holder, key, where, depth = stack.pop()
        v = holder[key]
        if isinstance(v, dict):
            if depth >= bounds.MAX_NESTING:
                if not deep:
                    problems.append(f"{_json_path(where)}: lists and objects nested more "
                                    f"than {bounds.MAX_NESTING} deep")
                deep = True
                holder[key] = None
                continue
            for k in list(v):
                why = text_problem(k)
                if why is not None:
                    problems.append(f"{_json_path(where)}: the key {quote(k)} holds {why}")
                    continue
                if k.endswith("_deg") and isinstance(v[k], Decimal):
                    continue
                stack.append((v, k, [*where, k], depth + 1))
        elif isinstance(v, list):
            if depth >= bounds.MAX_NESTING:
                if not deep:
                    problems.append(f"{_json_path(where)}: lists and objects nested more "
                                    f"than {bounds.MAX_NESTING} deep")
                deep = True
                holder[key] = None
                continue
            for i in range(len(v) - 1, -1, -1):
                stack.append((v, i, [*where, i], depth + 1))
        elif isinstance(v, Decimal):
            f = float(v)
            if not math.isfinite(f):
                text = str(v)
                shown = text if len(text) <= 40 else f"a {len(text):,}-character number"
                problems.append(f"{_json_path(where)}: {shown} is too large a number")
                f = 0.0
            holder[key] = f
        elif isinstance(v, int) and not isinstance(v, bool) and abs(v) > 10**300:
            problems.append(f"{_json_path(where)}: the number is too large")
            holder[key] = 0
        elif isinstance(v, str):
            why = text_problem(v)
            if why is not None:
                problems.append(f"{_json_path(where)}: {quote(v)} holds {why}; droprig text "
                                "holds no control, bidi-override or lone-surrogate "
                                "characters")
    return root[0]


def _count_problems(doc: dict[str, Any]) -> list[str]:
    """Counts over the limits of :mod:`droprig.model.bounds`, each with its JSON path,
    found before the schema check (a file of 200,000 members is refused at once)."""
    out: list[str] = []

    def lst(v: Any) -> list[Any]:
        return v if isinstance(v, list) else []

    def over(path: str, n: int, limit: int, what: str, advice: str) -> None:
        if n > limit:
            out.append(f"{path}: {n:,} {what}; the limit is {limit:,}: {advice}")

    levels = lst(doc.get("levels"))
    zones = lst(doc.get("lift_zones"))
    over("$.levels", len(levels), bounds.MAX_LEVELS, "levels", "split the project")
    total = 0
    for i, lv in enumerate(levels[: bounds.MAX_LEVELS]):
        if not isinstance(lv, dict):
            continue
        n = len(lst(lv.get("members")))
        total += n
        over(f"$.levels[{i}].members", n, bounds.MAX_MEMBERS_PER_LEVEL, "members on one level",
             "split the level")
        deck = lv.get("deck")
        if isinstance(deck, dict):
            over(f"$.levels[{i}].deck.openings", len(lst(deck.get("openings"))),
                 bounds.MAX_OPENINGS_PER_LEVEL, "deck openings", "merge neighbouring openings")
    over("$.levels", total, bounds.MAX_MEMBERS, "members in all", "split the project")
    over("$.lift_zones", len(zones), bounds.MAX_LIFT_ZONES, "lift zones", "split the project")
    n_loads = 0
    for i, z in enumerate(zones[: bounds.MAX_LIFT_ZONES]):
        if not isinstance(z, dict):
            continue
        n = len(lst(z.get("loads")))
        n_loads += n
        over(f"$.lift_zones[{i}].loads", n, bounds.MAX_LOADS_PER_ZONE, "loads in one lift zone",
             "split the zone")
        over(f"$.lift_zones[{i}].corridor_m", len(lst(z.get("corridor_m"))),
             bounds.MAX_CORRIDOR_CORNERS, "corridor corners",
             "simplify the corridor (a few corners follow a real lift path)")
    over("$.lift_zones", n_loads, bounds.MAX_LOADS, "loads in all", "split the project")
    over("$.protection_areas", len(lst(doc.get("protection_areas"))),
         bounds.MAX_PROTECTION_AREAS, "protection areas", "merge neighbouring mats")
    return out


def _check_version(doc: Any) -> int:
    if not isinstance(doc, dict):
        raise ProjectFileError([f"$: a droprig project is a JSON object, not "
                                f"{_json_type(doc)}"])
    app = doc.get("application", APPLICATION)
    if app != APPLICATION:
        raise ProjectFileError([f"$.application: {app!r} — this is not a droprig project file"])
    if "format_version" not in doc:
        raise ProjectFileError(["$.format_version: missing; a droprig project file names its "
                                "format version"])
    v = doc["format_version"]
    if isinstance(v, float) and v.is_integer():
        v = int(v)
    if isinstance(v, bool) or not isinstance(v, int):
        raise ProjectFileError([f"$.format_version: {_shown(v)} is not a whole number"])
    if v > FORMAT_VERSION:
        raise ProjectFileError([
            f"$.format_version: written by a newer droprig (format {v}); this droprig "
            f"reads up to format {FORMAT_VERSION}. Open it with a newer droprig."])
    if v < min(MIGRATIONS, default=FORMAT_VERSION):
        raise ProjectFileError([f"$.format_version: format {v} is older than any this "
                                f"droprig can convert (oldest {min(MIGRATIONS)})"])
    return v


def _migrate(doc: dict[str, Any], version: int,
             notes: list[str] | None = None) -> dict[str, Any]:
    while version < FORMAT_VERSION:
        step = MIGRATIONS.get(version)
        if notes is not None and version in MIGRATION_NOTES:
            try:
                notes.extend(MIGRATION_NOTES[version](doc))
            except Exception:  # a note must never stop a file from opening
                notes.append(f"the file was converted from format {version}; check its "
                             "loads' drop heights")
        if step is None:
            raise ProjectFileError([f"$.format_version: no conversion from format {version}"])
        try:
            doc = step(copy.deepcopy(doc))
        except Exception as exc:
            raise ProjectFileError([f"$: cannot convert from format {version} to "
                                    f"{version + 1}: {exc}"]) from None
        version += 1
        doc["format_version"] = version
    return doc


@lru_cache(maxsize=1)
def _validator() -> Any:
    """The schema's validator, with its local ``$ref``s written out in place (the
    schema has no recursion): the same rules, without a reference lookup per value
    (a third of the check time of a 5,000-member file). The shipped schema is checked
    against the JSON Schema meta-schema by the tests (``test_project_file.py``), not
    on every start (a tenth of a second of the window's start)."""
    import jsonschema

    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    cls = jsonschema.Draft202012Validator
    return cls(_inline_refs(schema, schema.get("$defs", {})))


_ANNOTATIONS = frozenset({"description", "title", "$comment", "examples", "default"})


def _inline_refs(node: Any, defs: dict[str, Any], depth: int = 0) -> Any:
    """``node`` with every ``{"$ref": "#/$defs/name", ...}`` replaced by the
    definition (annotations beside the reference kept; other keys beside it joined
    with ``allOf``)."""
    if depth > bounds.MAX_NESTING:
        raise ValueError("the schema nests too deep or refers to itself")
    if isinstance(node, list):
        return [_inline_refs(v, defs, depth + 1) for v in node]
    if not isinstance(node, dict):
        return node
    out = {k: _inline_refs(v, defs, depth + 1) for k, v in node.items()
           if k not in ("$ref", "$defs")}
    ref = node.get("$ref")
    if isinstance(ref, str) and ref.startswith("#/$defs/"):
        target = _inline_refs(defs[ref[len("#/$defs/"):]], defs, depth + 1)
        extra = {k: v for k, v in out.items() if k not in _ANNOTATIONS}
        if not extra:
            return {**target, **out}
        return {**out, "allOf": [*out.get("allOf", []), target]}
    if isinstance(ref, str):
        out["$ref"] = ref
    return out


def schema() -> dict[str, Any]:
    """The published JSON Schema of the current format (a copy)."""
    return json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))


def _json_type(v: object) -> str:
    if isinstance(v, bool):
        return "true/false"
    if v is None:
        return "null"
    if isinstance(v, int | float | Decimal):
        return "a number"
    if isinstance(v, str):
        return "text"
    if isinstance(v, list):
        return "a list"
    return "an object"


def _shown(v: object) -> str:
    if isinstance(v, dict):
        return "an object"
    if isinstance(v, list):
        return "a list"
    if isinstance(v, Decimal):
        return str(v)
    if isinstance(v, str) and len(v) > 60:
        return json.dumps(v[:57], ensure_ascii=False)[:-1] + f'…" ({len(v):,} characters)'
    text = json.dumps(v, ensure_ascii=False) if not isinstance(v, float) else repr(v)
    return text if len(text) <= 60 else text[:57] + "..."


_TYPE_WORDS = {"number": "a number", "string": "text", "object": "an object",
               "array": "a list", "boolean": "true or false", "integer": "a whole number"}


def _schema_problems(doc: dict[str, Any]) -> list[str]:
    out: list[tuple[list[str | int], str]] = []
    for err in _validator().iter_errors(doc):
        path = list(err.absolute_path)
        v = err.validator
        if v == "additionalProperties" and isinstance(err.instance, dict):
            allowed = sorted(err.schema.get("properties", {}))
            for key in sorted(set(err.instance) - set(allowed)):
                out.append(([*path, key], "unknown key; allowed keys here: "
                             + ", ".join(allowed)))
            continue
        if v == "required":
            key = re.search(r"'([^']+)'", err.message)
            name = key.group(1) if key else "?"
            out.append(([*path, name], "missing (required)"))
            continue
        if v == "type":
            want = err.validator_value
            want_t = " or ".join(str(_TYPE_WORDS.get(w, w)) for w in (
                want if isinstance(want, list) else [want]))
            out.append((path, f"{_shown(err.instance)} is {_json_type(err.instance)}; "
                              f"expected {want_t}"))
            continue
        if v == "const":
            out.append((path, f"{_shown(err.instance)} is not allowed; expected "
                              f"{_shown(err.validator_value)}"))
            continue
        if v in ("maxLength", "minLength") and isinstance(err.instance, str):
            word = "at most" if v == "maxLength" else "at least"
            out.append((path, f"{_shown(err.instance)} is {len(err.instance):,} characters; "
                              f"{word} {err.validator_value} allowed"))
            continue
        msg = err.message
        if len(msg) > 2 * QUOTE_MAX:  # the schema's own text echoes a long value
            msg = f"{_shown(err.instance)} fails the {err.validator} rule of the format"
        out.append((path, msg))
    out.sort(key=lambda item: [(0, p, "") if isinstance(p, int) else (1, 0, p)
                               for p in item[0]])
    return [f"{_json_path(p)}: {m}" for p, m in out]


def loads_project(text: str, *, source: str | None = None,
                  notes: list[str] | None = None) -> Project:
    """Parse, check, migrate and build a project from file text.

    Raises :class:`ProjectFileError` listing every problem with its JSON path.
    ``notes``, if given, receives what a migration from an older format changed in
    meaning (for the user to check; :data:`MIGRATION_NOTES`).
    """
    try:
        if len(text) > bounds.MAX_FILE_BYTES:
            raise ProjectFileError([_too_large(len(text))])
        parsed = _parse(text)
        # counts first: a file of 200,000 members is refused before it is walked
        problems = _count_problems(parsed) if isinstance(parsed, dict) else []
        if problems:
            raise ProjectFileError(problems)
        raw = _to_floats(parsed, [], problems)
        if problems:
            raise ProjectFileError(problems)
        doc = _migrate(raw, _check_version(raw), notes)
        problems = _schema_problems(doc)
        if problems:
            raise ProjectFileError(problems)
        return _Builder().project(doc)
    except ProjectFileError as exc:
        if source is not None and exc.source is None:
            raise ProjectFileError(exc.problems, source) from None
        raise


def _too_large(n: int) -> str:
    return (f"$: the file is {n:,} bytes; droprig reads project files up to "
            f"{bounds.MAX_FILE_BYTES:,} bytes")


def load_project(path: str | os.PathLike[str], *, notes: list[str] | None = None) -> Project:
    """Read a ``.droprig`` file of at most :data:`~droprig.model.bounds.MAX_FILE_BYTES`.
    Raises :class:`ProjectFileError` (bad content) or :class:`OSError` (cannot read
    the file). ``notes``: see :func:`loads_project`."""
    p = Path(path)
    with open(p, "rb") as fh:
        data = fh.read(bounds.MAX_FILE_BYTES + 1)
        if len(data) > bounds.MAX_FILE_BYTES:
            size = max(os.fstat(fh.fileno()).st_size, len(data))
            raise ProjectFileError([_too_large(size)], str(p))
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise ProjectFileError([f"$: not UTF-8 text (byte {exc.start})"], str(p)) from None
    return loads_project(text, source=str(p), notes=notes)


# --------------------------------------------------------------------------- building

_COMPONENT = {"x": "[0]", "y": "[1]"}
_FIELD_TAIL = re.compile(r"\.([A-Za-z_][A-Za-z0-9_]*)(\[\d+\])?(?:\.([xy]))?$")

_KEYS_MEMBER = {"id": "id", "role": "role", "start": "start_m", "end": "end_m",
                "end_condition": "end_condition", "composite": "composite",
                "connection_capacity": "connection_capacity_N"}
_KEYS_LEVEL = {"id": "id", "name": "name", "elevation": "elevation_m",
               "superimposed_dead": "superimposed_dead_Pa",
               "live_in_place": "live_in_place_Pa", "members": "members",
               "column_area": "column_area_m2", "column_height": "column_height_m",
               "occupied_below": "occupied_below"}
_KEYS_GRID = {"x_lines": "x_lines_m", "y_lines": "y_lines_m", "x_labels": "x_labels",
              "y_labels": "y_labels"}
_KEYS_DECK = {"kind": "kind", "thickness": "thickness_m", "cover": "cover_m",
              "rebar_area": "rebar_area_m2_per_m", "rib_height": "rib_height_m",
              "top_rebar_area": "top_rebar_area_m2_per_m", "steel_fy": "steel_fy_Pa",
              "bar_thickness": "bar_thickness_m", "bar_pitch": "bar_pitch_m"}
_KEYS_CONCRETE = {"fc": "fc_Pa", "density": "density_kg_per_m3", "fy_rebar": "fy_rebar_Pa"}
_KEYS_RECT = {"x0": "x0_m", "y0": "y0_m", "x1": "x1_m", "y1": "y1_m"}
_KEYS_SECTION = {"name": "name", "d": "d_m", "bf": "bf_m", "tw": "tw_m", "tf": "tf_m",
                 "r": "r_m", "A": "A_m2", "Ix": "Ix_m4", "Sx": "Sx_m3", "Zx": "Zx_m3",
                 "Iy": "Iy_m4", "mass_per_length": "mass_per_length_kg_per_m"}
_KEYS_GRADE = {"name": "name", "fu": "fu_Pa", "E": "E_Pa", "fy_steps": "fy_steps"}
_KEYS_LOAD = {"name": "name", "mass": "mass_kg", "footprint_length": "footprint_length_m",
              "footprint_width": "footprint_width_m", "drop_height": "drop_height_m",
              "hook_elevation": "hook_elevation_m", "hang_length": "hang_length_m",
              "kind": "kind", "contact_stiffness": "contact_stiffness_N_per_m",
              "mass_source": "mass_source",
              "strike_orientations": "strike_orientations", "strike_reason": "strike_reason",
              "edge_width": "edge_width_m", "hard": "hard"}
_KEYS_ZONE = {"id": "id", "name": "name", "level_id": "level_id", "crane": "crane_m",
              "r_min": "r_min_m", "r_max": "r_max_m", "slew_start": "slew_start_deg",
              "slew_end": "slew_end_deg", "drift_margin": "drift_margin_m",
              "corridor": "corridor_m", "loads": "loads", "drift_mode": "drift_mode",
              "slew_speed": "slew_speed_rad_per_s", "hoist_speed": "hoist_speed_m_per_s",
              "radial_speed": "radial_speed_m_per_s", "swing_angle": "swing_angle_deg",
              "swing_length": "swing_length_m",
              "crane_description": "crane_description",
              "crane_configuration": "crane_configuration", "lift_points": "lift_points"}
_KEYS_LIFT_POINT = {"kind": "kind", "at": "at_m", "label": "label"}
_KEYS_PROTECTION = {"id": "id", "name": "name", "level_id": "level_id", "kind": "kind",
                    "thickness": "thickness_m", "stiffness": "stiffness_N_per_m",
                    "crush_force": "crush_force_N", "crush_stroke": "crush_stroke_m",
                    "crush_stress": "crush_stress_Pa", "modulus": "modulus_Pa"}
_KEYS_SETTINGS = {"unit_system": "unit_system", "design_basis": "design_basis",
                  "resistance_factor": "resistance_factor",
                  "dynamic_increase_factor": "dynamic_increase_factor",
                  "deflection_limit_ratio": "deflection_limit_ratio",
                  "ductility_limit": "ductility_limit", "rotation_limit": "rotation_limit_deg",
                  "grid_resolution": "grid_resolution_m",
                  "include_member_mass": "include_member_mass",
                  "include_existing_loads": "include_existing_loads",
                  "dynamic_amplification": "dynamic_amplification",
                  "tilted_landing": "tilted_landing", "design_tilt": "design_tilt_deg"}
_KEYS_INFO = {k: k for k in ("name", "site", "lift_reference", "revision", "date",
                             "prepared_by", "checked_by", "approved_by", "description",
                             *_PERMIT_INFO_KEYS)}


def _point(v: list[float]) -> tuple[float, float]:
    return (float(v[0]), float(v[1]))


class _BuildFailedError(Exception):
    """A child object could not be built (its problem is already recorded)."""


class _Builder:
    """Builds model objects from a schema-valid document, recording every
    :class:`ModelError` with the JSON path it came from."""

    def __init__(self) -> None:
        self.problems: list[str] = []
        self._sections: dict[str, Section | Exception] = {}
        self._grades: dict[str, Grade | Exception] = {}

    def _make(self, path: str, keys: dict[str, str], fn: Callable[[], Any]) -> Any:
        try:
            return fn()
        except ModelError as exc:
            where = path
            m = _FIELD_TAIL.search(exc.field)
            if m and m.group(1) in keys:
                where = f"{path}.{keys[m.group(1)]}{m.group(2) or ''}"
                if m.group(3):
                    where += _COMPONENT[m.group(3)]
            note = ""
            if where.endswith("_deg") and isinstance(exc.value, float):
                note = f" (the file gives degrees: {math.degrees(exc.value):.6g} deg)"
            self.problems.append(f"{where}: {exc}{note}")
            raise _BuildFailedError from None

    def _collect(self, items: list[Any], path: str, fn: Callable[[Any, str], Any]) -> list[Any]:
        out, failed = [], False
        for i, item in enumerate(items):
            try:
                out.append(fn(item, f"{path}[{i}]"))
            except _BuildFailedError:
                failed = True
        if failed:
            raise _BuildFailedError
        return out

    def _duplicates(self, items: list[dict[str, Any]], key: str, path: str, what: str) -> bool:
        """Record every repeated ``key``; True if there was one."""
        seen: dict[Any, int] = {}
        found = False
        for i, item in enumerate(items):
            v = item.get(key)
            if v in seen:
                self.problems.append(f"{path}[{i}].{key}: {what} {v!r} is already used at "
                                     f"{path}[{seen[v]}]")
                found = True
            else:
                seen[v] = i
        return found

    # ---- leaves
    def _library(self, name: str, path: str, cache: dict[str, Any], getter: str) -> Any:
        """A section or grade by library name (cached per file, misses included);
        an unknown name is a problem at ``path``."""
        hit = cache.get(name)
        if hit is None:
            from droprig.io import sections as lib

            try:
                hit = getattr(lib, getter)(name)
            except ValueError as exc:  # SectionNotFound / GradeNotFound
                hit = exc
            cache[name] = hit
        if isinstance(hit, Exception):
            self.problems.append(f"{path}: {hit}")
            raise _BuildFailedError
        return hit

    def section(self, v: Any, path: str) -> Section:
        if isinstance(v, str):
            return self._library(v, path, self._sections, "get_section")
        return self._make(path, _KEYS_SECTION, lambda: Section(
            name=v["name"], family=v["family"], d=v["d_m"], bf=v["bf_m"], tw=v["tw_m"],
            tf=v["tf_m"], r=v["r_m"], A=v["A_m2"], Ix=v["Ix_m4"], Sx=v["Sx_m3"],
            Zx=v["Zx_m3"], Iy=v["Iy_m4"], mass_per_length=v["mass_per_length_kg_per_m"]))

    def grade(self, v: Any, path: str) -> Grade:
        if isinstance(v, str):
            return self._library(v, path, self._grades, "get_grade")
        kw: dict[str, Any] = {}
        if "E_Pa" in v:
            kw["E"] = v["E_Pa"]
        steps = tuple((s["max_thickness_m"], s["fy_Pa"]) for s in v["fy_steps"])
        return self._make(path, _KEYS_GRADE, lambda: Grade(
            name=v["name"], family=v["family"], fy_steps=steps, fu=v["fu_Pa"], **kw))

    def concrete(self, v: Any, path: str) -> Concrete:
        if isinstance(v, str):
            try:
                from droprig.io import sections as lib

                return lib.get_concrete(v)
            except (ImportError, ValueError, KeyError) as exc:
                self.problems.append(f"{path}: {exc}")
                raise _BuildFailedError from None
        return self._make(path, _KEYS_CONCRETE, lambda: Concrete(**_kwargs(v, _KEYS_CONCRETE)))

    def rect(self, v: dict[str, Any], path: str) -> Rect:
        return self._make(path, _KEYS_RECT, lambda: Rect(
            v["x0_m"], v["y0_m"], v["x1_m"], v["y1_m"]))

    # ---- composites
    def member(self, v: dict[str, Any], path: str) -> Member:
        sec_grade: list[Any] = []
        failed = False
        for key, fn in (("section", self.section), ("grade", self.grade)):
            try:
                sec_grade.append(fn(v[key], f"{path}.{key}"))
            except _BuildFailedError:
                failed = True
        if failed:
            raise _BuildFailedError
        kw = _kwargs(v, {k: k2 for k, k2 in _KEYS_MEMBER.items()
                         if k in ("end_condition", "composite", "connection_capacity")})
        return self._make(path, _KEYS_MEMBER, lambda: Member(
            v["id"], v["role"], _point(v["start_m"]), _point(v["end_m"]),
            sec_grade[0], sec_grade[1], **kw))

    def deck(self, v: dict[str, Any], path: str) -> Deck:
        kw = _kwargs(v, _KEYS_DECK)
        failed = False
        if "concrete" in v:
            try:
                kw["concrete"] = self.concrete(v["concrete"], f"{path}.concrete")
            except _BuildFailedError:
                failed = True
        if "openings" in v:
            try:
                kw["openings"] = tuple(self._collect(v["openings"], f"{path}.openings",
                                                     self.rect))
            except _BuildFailedError:
                failed = True
        if failed:
            raise _BuildFailedError
        return self._make(path, _KEYS_DECK, lambda: Deck(**kw))

    def level(self, v: dict[str, Any], path: str) -> Level:
        failed = False
        g = v["grid"]
        grid = deck = None
        try:
            grid = self._make(f"{path}.grid", _KEYS_GRID, lambda: ColumnGrid(
                tuple(g["x_lines_m"]), tuple(g["y_lines_m"]), tuple(g["x_labels"]),
                tuple(g["y_labels"])))
        except _BuildFailedError:
            failed = True
        try:
            deck = self.deck(v.get("deck", {}), f"{path}.deck")
        except _BuildFailedError:
            failed = True
        if self._duplicates(v["members"], "id", f"{path}.members", "member id"):
            failed = True
        try:
            members = self._collect(v["members"], f"{path}.members", self.member)
        except _BuildFailedError:
            failed = True
        if failed:
            raise _BuildFailedError
        assert grid is not None and deck is not None  # built, or failed above
        kw = _kwargs(v, {k: k2 for k, k2 in _KEYS_LEVEL.items()
                         if k in ("superimposed_dead", "live_in_place", "column_area",
                                  "column_height", "occupied_below")})
        return self._make(path, _KEYS_LEVEL, lambda: Level(
            v["id"], v.get("name", ""), v["elevation_m"], grid, tuple(members), deck, **kw))

    def load(self, v: dict[str, Any], path: str) -> LiftLoad:
        kw = _kwargs(v, {k: k2 for k, k2 in _KEYS_LOAD.items()
                         if k in ("footprint_length", "footprint_width", "hang_length", "kind",
                                  "contact_stiffness", "mass_source", "strike_reason",
                                  "edge_width", "hard")})
        if "strike_orientations" in v:
            kw["strike_orientations"] = tuple(v["strike_orientations"])
        return self._make(path, _KEYS_LOAD, lambda: LiftLoad(
            name=v["name"], mass=v["mass_kg"], drop_height=v.get("drop_height_m"),
            hook_elevation=v.get("hook_elevation_m"), **kw))

    def zone(self, v: dict[str, Any], path: str) -> LiftZone:
        failed = self._duplicates(v.get("loads", []), "name", f"{path}.loads", "load name")
        try:
            loads = self._collect(v.get("loads", []), f"{path}.loads", self.load)
        except _BuildFailedError:
            failed, loads = True, []
        kw: dict[str, Any] = {}
        for key, attr in (("slew_start_deg", "slew_start"), ("slew_end_deg", "slew_end")):
            if key in v:
                kw[attr] = _deg_to_rad(v[key])
        if "drift_margin_m" in v:
            kw["drift_margin"] = v["drift_margin_m"]
        if "drift_mode" in v:
            kw["drift_mode"] = v["drift_mode"]
        for attr, key in _ZONE_DRIFT_KEYS:
            if key in v:
                kw[attr] = v[key]
        if "swing_angle_deg" in v:
            kw["swing_angle"] = _deg_to_rad(v["swing_angle_deg"])
        if "corridor_m" in v:
            kw["corridor"] = tuple(_point(p) for p in v["corridor_m"])
        try:
            kw.update(self.zone_permit(v, path))
        except _BuildFailedError:
            failed = True
        zone = self._make(path, _KEYS_ZONE, lambda: LiftZone(
            id=v["id"], name=v.get("name", ""), level_id=v["level_id"],
            crane=_point(v["crane_m"]), r_min=v["r_min_m"], r_max=v["r_max_m"],
            loads=() if failed else tuple(loads), **kw))
        if failed:
            raise _BuildFailedError
        return zone

    def zone_permit(self, v: dict[str, Any], path: str) -> dict[str, Any]:
        """A zone's crane description, configuration and lift points (format 2)."""
        kw: dict[str, Any] = {k: v[k] for k in ("crane_description", "crane_configuration")
                              if k in v}
        if "lift_points" in v:
            kw["lift_points"] = tuple(self._collect(
                v["lift_points"], f"{path}.lift_points",
                lambda p, where: self._make(where, _KEYS_LIFT_POINT, lambda: LiftPoint(
                    p["kind"], _point(p["at_m"]), p.get("label", "")))))
        return kw

    def protection(self, v: dict[str, Any], path: str) -> ProtectionArea:
        area = self.rect(v["area"], f"{path}.area")
        kw = _kwargs(v, {k: k2 for k, k2 in _KEYS_PROTECTION.items()
                         if k in ("kind", "thickness", "crush_force", "crush_stroke",
                                  "crush_stress", "modulus")})
        kw["stiffness"] = v.get("stiffness_N_per_m")
        return self._make(path, _KEYS_PROTECTION, lambda: ProtectionArea(
            id=v["id"], name=v.get("name", ""), level_id=v["level_id"], area=area, **kw))

    def project(self, doc: dict[str, Any]) -> Project:
        parts: dict[str, Any] = {}
        failed = False

        def attempt(name: str, fn: Callable[[], Any]) -> None:
            nonlocal failed
            try:
                parts[name] = fn()
            except _BuildFailedError:
                failed = True

        attempt("info", lambda: self._make("$.info", _KEYS_INFO, lambda: ProjectInfo(
            **_kwargs(doc.get("info", {}), _KEYS_INFO))))
        st = dict(doc.get("settings", {}))
        for key in ("rotation_limit_deg", "design_tilt_deg"):
            if key in st:
                st[key] = _deg_to_rad(st[key])
        attempt("settings", lambda: self._make("$.settings", _KEYS_SETTINGS, lambda: Settings(
            **_kwargs(st, _KEYS_SETTINGS))))
        levels = doc["levels"]
        zones = doc.get("lift_zones", [])
        prots = doc.get("protection_areas", [])
        self._duplicates(levels, "id", "$.levels", "level id")
        self._duplicates(zones, "id", "$.lift_zones", "lift zone id")
        self._duplicates(prots, "id", "$.protection_areas", "protection area id")
        level_ids = [lv["id"] for lv in levels]
        for coll, name in ((zones, "lift_zones"), (prots, "protection_areas")):
            for i, item in enumerate(coll):
                if item["level_id"] not in level_ids:
                    self.problems.append(
                        f"$.{name}[{i}].level_id: {item['level_id']!r} is not the id of a "
                        f"level in this file (levels: {', '.join(level_ids) or 'none'})")
        attempt("levels", lambda: tuple(self._collect(levels, "$.levels", self.level)))
        attempt("lift_zones", lambda: tuple(self._collect(zones, "$.lift_zones", self.zone)))
        attempt("protection_areas", lambda: tuple(
            self._collect(prots, "$.protection_areas", self.protection)))
        if failed or self.problems:
            raise ProjectFileError(self.problems)
        try:
            return Project(**parts)
        except ModelError as exc:
            raise ProjectFileError([f"{_project_field_path(doc, exc.field)}: {exc}"]) from None


def _project_field_path(doc: dict[str, Any], field: str) -> str:
    """JSON path of a project-wide :class:`ModelError` field (``zone Z1`` ->
    ``$.lift_zones[0]``, ``levels`` -> ``$.levels``); ``$`` when unknown."""
    if field in ("levels", "lift_zones", "protection_areas"):
        return f"$.{field}"
    m = re.match(r"^(zone|level|protection) (.+?)(?:\.([A-Za-z_]+))?$", field)
    if m:
        coll = {"zone": "lift_zones", "level": "levels", "protection": "protection_areas"}[
            m.group(1)]
        for i, item in enumerate(doc.get(coll, [])):
            if isinstance(item, dict) and item.get("id") == m.group(2):
                return f"$.{coll}[{i}]"
    return "$"


def _kwargs(v: dict[str, Any], keys: dict[str, str]) -> dict[str, Any]:
    """Model keyword arguments for the file keys present in ``v``."""
    return {attr: v[key] for attr, key in keys.items() if key in v}

"""Inspector: edit every field of the selected object in the user's units.

A form is a list of :class:`FieldSpec`: how to read a value from the model
object, which unit quantity it is (``droprig.units``), and how to build the new
object. On commit the text is parsed (``units.parse``), the new object is
built with :func:`dataclasses.replace` (the model validates), the new project is
pushed to the undo stack. Anything refused — unreadable text, a value outside
the model's range — shows a message naming the field and the allowed range in
the user's units, and the project stays exactly as it was.
"""

from __future__ import annotations

import itertools
import math
import re
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from html import escape as html_escape
from typing import Any

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QAction
from PySide6.QtWidgets import (
    QApplication,
    QCheckBox,
    QComboBox,
    QCompleter,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QFrame,
    QLabel,
    QLineEdit,
    QPlainTextEdit,
    QPushButton,
    QScrollArea,
    QSizePolicy,
    QVBoxLayout,
    QWidget,
)

from droprig import units
from droprig.gui import edits as ed
from droprig.gui import style
from droprig.gui.document import Document, Selection, resolve
from droprig.model import (
    CORRIDOR_ALLOWED,
    END_CONDITIONS,
    MASS_SOURCE_WORDS,
    MASS_SOURCES,
    Deck,
    Level,
    LiftLoad,
    LiftZone,
    Member,
    ModelError,
    Project,
    ProtectionArea,
    Rect,
    corridor_problem,
    lift_point_tags,
)
from droprig.outcomes import fmt_utilisation_check, fmt_worst_point
from droprig.permit import LIMIT_NOTE

# ------------------------------------------------------------------ messages

_SI_UNIT_QUANTITY = {"m": "length", "kg": "mass", "N": "force", "Pa": "stress",
                     "N/m": "stiffness", "rad": "angle"}
_NUM_UNIT = re.compile(
    r"(?<![\w.])(-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?)\s?(N/m|kg|Pa|rad|N|m)(?![\w²/])")


FIELD_MIN_WIDTH_CAP = 220
"""px: an edit box never asks for more than this, so the inspector stays narrow."""


def _fit_width(w: QLineEdit, *samples: str) -> None:
    """Give ``w`` a minimum width that shows the longest of ``samples`` (its value,
    its placeholder, a typical quantity) uncut, up to :data:`FIELD_MIN_WIDTH_CAP`;
    the form then moves the box under its label rather than cutting the text."""
    fm = w.fontMetrics()
    need = max((fm.horizontalAdvance(t) for t in samples if t), default=0) + 18
    w.setMinimumWidth(min(max(need, w.minimumWidth()), FIELD_MIN_WIDTH_CAP))


def titled(kind: str, name: str) -> str:
    """Heading for an object of ``kind`` called ``name``: "Load 2" for a load
    named "Load 2" (not "Load Load 2"), "Level Roof" for a level named "Roof"."""
    return name if name.lower().startswith(kind.lower()) else f"{kind} {name}"


def _quantity_for(si_unit: str, hint: str | None) -> str | None:
    if hint and units.QUANTITIES.get(hint, ("",))[0] == si_unit.replace("²", "**2"):
        return hint
    return _SI_UNIT_QUANTITY.get(si_unit)


def _in_user_units(text: str, system: units.UnitSystem, hint: str | None) -> str:
    """Re-express every "<number> <SI unit>" in ``text`` in the user's units."""
    def sub(m: re.Match[str]) -> str:
        q = _quantity_for(m.group(2), hint)
        if q is None:
            return m.group(0)
        return fmt_q(float(m.group(1)), q, system).replace(",", "")
    return _NUM_UNIT.sub(sub, text)


def describe_refusal(exc: Exception, label: str, system: units.UnitSystem,
                     quantity: str | None = None) -> str:
    """A one-paragraph message for a refused input, in the user's units."""
    from droprig.model.bounds import BudgetError
    from droprig.model.errors import quote

    if isinstance(exc, BudgetError):  # the same words as droprig validate / analyse
        return f"{label}: {exc}. Nothing was changed."
    if isinstance(exc, ModelError):
        value = exc.value
        q = _quantity_for(exc.unit, quantity) if exc.unit else None
        if q is not None and isinstance(value, int | float) and not isinstance(value, bool):
            shown = fmt_q(float(value), q, system).replace(",", "")
        elif isinstance(value, float):
            shown = f"{value:g}"
        else:
            shown = quote(value)
        allowed = _in_user_units(exc.allowed, system, quantity)
        where = f" ({exc.field})" if exc.field else ""
        return f"{label}: {shown} refused{where}. Allowed: {allowed}. Nothing was changed."
    text = str(exc)
    return f"{text}. Nothing was changed." if not text.endswith(".") else \
        f"{text} Nothing was changed."


REBAR = "rebar_area"
"""Local quantity: reinforcement area per width, SI m²/m, shown as mm²/m or in²/ft."""
_REBAR_UNITS = {"SI": ("mm**2/m", "mm²/m", 0), "US": ("inch**2/ft", "in²/ft", 3)}
_NUMBER = re.compile(r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?")


def unit_label(quantity: str, system: units.UnitSystem) -> str:
    if quantity == REBAR:
        return _REBAR_UNITS[system][1]
    return units.display_unit(quantity, system)


def fmt_q(value: float | None, quantity: str, system: units.UnitSystem) -> str:
    """``units.fmt`` plus reinforcement area per width (not a droprig.units quantity)."""
    if value is not None and value == value:
        if quantity == REBAR:
            unit, label, d = _REBAR_UNITS[system]
            mag = units.convert(value, "m**2/m", unit)
            return f"{mag:,.{d}f} {label}"
    return units.fmt(value, quantity, system)


def parse_q(text: str, quantity: str, system: units.UnitSystem, *, field: str) -> float:
    """``units.parse`` plus reinforcement area per width (a bare number is mm²/m
    or in²/ft)."""
    t = text.strip()
    if quantity == REBAR:
        unit, label, _ = _REBAR_UNITS[system]
        example = f"(for example '300 {label}')"
        if _NUMBER.fullmatch(t):
            t = f"{t} {unit}"
        t = re.sub(r"\b(mm|cm|in|ft|m)2\b", r"\1**2", t)  # "mm2/m", "in2/ft"
        try:
            q = units.registry().parse_expression(units._normalise(t))
            value = float(q.to("m**2/m").magnitude)
        except Exception as exc:  # pint raises several unrelated types
            raise units.UnitError(f"{field}: cannot read {text!r} as an area per width "
                                  f"{example}") from exc
        if not math.isfinite(value):
            raise units.UnitError(f"{field}: {text!r} is not a finite number")
        return value
    return units.parse(text, quantity, system, field=field)


def _edit_text(value: float | None, quantity: str, system: units.UnitSystem) -> str:
    """Text for an input box: the display value without thousands separators."""
    if value is None:
        return ""
    return fmt_q(value, quantity, system).replace(",", "")


# ------------------------------------------------------------------ corridor text


def _corridor_allowed(system: units.UnitSystem) -> str:
    unit = units.display_unit("length", system)
    return (f"empty (no corridor: the whole swing sector), or at least 3 corner points "
            f"x,y in {unit} separated by ';', for example 0,0; 12,0; 12,6, making "
            f"{CORRIDOR_ALLOWED}")


def corridor_text(corridor: tuple[tuple[float, float], ...], system: units.UnitSystem) -> str:
    """``"0,0; 12,0; 12,6"``: the corridor's corners in the display length unit."""
    def num(v: float) -> str:
        t = f"{units.to_display(v, 'length', system):.3f}".rstrip("0").rstrip(".")
        return "0" if t in ("-0", "") else t
    return "; ".join(f"{num(x)},{num(y)}" for x, y in corridor)


def parse_corridor(text: str, system: units.UnitSystem) -> tuple[tuple[float, float], ...]:
    """Corner points (m) from ``"x,y; x,y; …"`` in the display length unit (a
    number may carry its own unit, ``"40 ft"``). Empty text: no corridor.
    Raises ValueError naming what is allowed."""
    if not text.strip():
        return ()
    pts = []
    for part in [q for q in text.split(";") if q.strip()]:
        xy = part.split(",")
        if len(xy) != 2:
            raise ValueError(f"Corridor: cannot read {part.strip()!r} as a point. Allowed: "
                             f"{_corridor_allowed(system)}")
        try:
            pts.append(tuple(units.parse(v, "length", system, field="Corridor") for v in xy))
        except units.UnitError as exc:
            raise ValueError(f"Corridor: cannot read {part.strip()!r} as a point. Allowed: "
                             f"{_corridor_allowed(system)}") from exc
    if len(pts) < 3:
        raise ValueError(f"Corridor: {len(pts)} point(s) refused. Allowed: "
                         f"{_corridor_allowed(system)}")
    problem = corridor_problem(pts)  # type: ignore[arg-type]
    if problem is not None:
        raise ValueError(f"Corridor: {problem}, refused. Allowed: "
                         f"{_corridor_allowed(system)}")
    return tuple(pts)  # type: ignore[return-value]


# ------------------------------------------------------------------ field specs

Getter = Callable[[Any], Any]
Setter = Callable[[Any, Any], Any]


@dataclass(frozen=True)
class FieldSpec:
    """One row of a form.

    kind: ``quantity`` (unit-aware number), ``optional`` (a quantity that may be
    left empty: the model value ``None``, meaning ``empty``),
    ``text``, ``longtext``, ``choice`` (``choices`` = (value, label)
    pairs), ``bool``, ``section`` (library search), ``readonly``.
    ``get`` reads the value from the model object; ``set`` returns a new object
    with the value (the model validates and may raise ModelError). For
    ``readonly`` rows ``get`` returns display text.
    """

    key: str
    label: str
    kind: str
    get: Getter
    set: Setter | None = None
    quantity: str = ""
    choices: tuple[tuple[str, str], ...] = ()
    tip: str = ""
    empty: str = ""
    """What an empty box means (``optional`` and ``text``; shown as the placeholder)."""


@dataclass
class Form:
    """A titled list of fields for one selected object and how to put the edited
    object back into the project."""

    title: str
    subtitle: str
    obj: Any
    fields: list[FieldSpec]
    commit: Callable[[Project, Any], Project] | None
    notes: list[str] = field(default_factory=list)
    buttons: list[str] = field(default_factory=list)
    """Names of actions (``Inspector.actions``) offered as buttons."""

    @property
    def signature(self) -> tuple:
        """The shape of the form: its rows (key, kind, label) and buttons. Not the
        title nor a combo box's choices: renaming an object changes those, and the
        widgets then stay (see :meth:`FormEditor.set_form`)."""
        return (tuple((f.key, f.kind, f.label) for f in self.fields), tuple(self.buttons))


def _q(key: str, label: str, quantity: str, tip: str = "") -> FieldSpec:
    return FieldSpec(key, label, "quantity", lambda o: getattr(o, key),
                     lambda o, v: replace(o, **{key: v}), quantity=quantity, tip=tip)


def _t(key: str, label: str, kind: str = "text") -> FieldSpec:
    return FieldSpec(key, label, kind, lambda o: getattr(o, key),
                     lambda o, v: replace(o, **{key: v}))


def _ro(key: str, label: str, get: Getter) -> FieldSpec:
    return FieldSpec(key, label, "readonly", get)


def _choice(key: str, label: str, choices: tuple[tuple[str, str], ...],
            set_: Setter | None = None) -> FieldSpec:
    return FieldSpec(key, label, "choice", lambda o: getattr(o, key),
                     set_ or (lambda o, v: replace(o, **{key: v})), choices=choices)


_NOT_RECORDED_HINT = "empty = not recorded (flagged in the annex)"


def _permit_info_fields() -> list[FieldSpec]:
    """Permit number, lift-plan revision, validity window: plain text boxes."""
    out = []
    for key, label in (("permit_number", "Permit number"),
                       ("lift_plan_revision", "Lift-plan revision")):
        out.append(FieldSpec(key, label, "text", lambda o, k=key: getattr(o, k),
                             lambda o, v, k=key: replace(o, **{k: v}),
                             empty=_NOT_RECORDED_HINT))
    for key, label in (("valid_from", "Valid from"), ("valid_to", "Valid to")):
        out.append(FieldSpec(key, label, "text", lambda o, k=key: getattr(o, k),
                             lambda o, v, k=key: replace(o, **{k: v}),
                             tip="YYYY-MM-DD or YYYY-MM-DD HH:MM",
                             empty="YYYY-MM-DD HH:MM; empty = not recorded"))
    return out


def _crane_fields(system: units.UnitSystem) -> list[FieldSpec]:
    """The zone's crane and configuration (text) and its lift points (read only)."""
    def points(o: LiftZone) -> str:
        if not o.lift_points:
            return "not recorded"
        return "; ".join(
            f"{tag} {'pick-up' if p.kind == 'pick_up' else 'set-down'} "
            f"({units.fmt(p.at[0], 'length', system)}, {units.fmt(p.at[1], 'length', system)})"
            + (f" {p.label}" if p.label else "")
            for tag, p in zip(lift_point_tags(o), o.lift_points, strict=True))

    return [
        FieldSpec("crane_description", "Crane", "text", lambda o: o.crane_description,
                  lambda o, v: replace(o, crane_description=v),
                  tip="Type, capacity, fleet number", empty=_NOT_RECORDED_HINT),
        FieldSpec("crane_configuration", "Crane configuration", "text",
                  lambda o: o.crane_configuration,
                  lambda o, v: replace(o, crane_configuration=v),
                  tip="Boom and jib, counterweight, outriggers or tracks, duty chart",
                  empty=_NOT_RECORDED_HINT),
        _ro("lift_points", "Pick-up / set-down points", points),
    ]


def _mass_source_field() -> FieldSpec:
    return FieldSpec("mass_source", "Mass source", "choice",
                     lambda o: o.mass_source or "",
                     lambda o, v: replace(o, mass_source=v or None),
                     choices=(("", "not recorded"),
                              *((k, MASS_SOURCE_WORDS[k]) for k in MASS_SOURCES)))


def _rect_fields(prefix: str, get_rect: Getter, set_rect: Setter) -> list[FieldSpec]:
    out = []
    for k, lab in (("x0", "West edge x"), ("y0", "South edge y"), ("x1", "East edge x"),
                   ("y1", "North edge y")):
        out.append(FieldSpec(
            f"{prefix}{k}", lab, "quantity",
            (lambda o, k=k: getattr(get_rect(o), k)),
            (lambda o, v, k=k: set_rect(o, replace(get_rect(o), **{k: v}))),
            quantity="length"))
    return out


def _spacings(lines: tuple[float, ...], system: units.UnitSystem) -> str:
    gaps = [b - a for a, b in itertools.pairwise(lines)]
    return ", ".join(units.fmt(g, "length", system, decimals=2) for g in gaps)


# ------------------------------------------------------------------ forms per kind


def build_form(project: Project, sel: Selection | None) -> Form | None:
    """The form for ``sel`` in ``project`` (None: nothing selected / gone)."""
    obj = resolve(project, sel)
    if sel is None or obj is None:
        return None
    system = project.settings.unit_system
    k, ids = sel.kind, sel.ids
    level_choices = tuple((lv.id, f"{lv.name} ({lv.id})") for lv in project.levels)

    if k == "info":
        return Form("Project", "Title block of the permit annex", obj, [
            _t("name", "Project name"), _t("site", "Site"),
            _t("lift_reference", "Lift-plan reference"), _t("revision", "Annex revision"),
            _t("date", "Date"), _t("prepared_by", "Prepared by"),
            _t("checked_by", "Checked by"), _t("approved_by", "Approved by"),
            _t("description", "Description", "longtext"),
            *_permit_info_fields(),
        ], lambda p, o: ed.with_info(p, o))

    if k == "settings":
        return Form("Analysis settings", "Change them in the settings dialog", obj, [
            # named as the status bar names them (it showed the file's key 'en1993')
            _ro("u", "Units", lambda o: style.UNIT_LABELS.get(o.unit_system, o.unit_system)),
            _ro("b", "Design basis",
                lambda o: style.BASIS_LABELS.get(o.design_basis, o.design_basis)),
            _ro("phi", "Resistance factor φ", lambda o: f"{o.resistance_factor:.2f}"),
            _ro("dif", "Dynamic increase factor", lambda o: f"{o.dynamic_increase_factor:.2f}"),
            _ro("res", "Drop-point spacing",
                lambda o: units.fmt(o.grid_resolution, "length", system)),
            _ro("amp", "Dynamic amplification",
                lambda o: "on" if o.dynamic_amplification else "off (energy method)"),
            _ro("tilt", "Tilted landing",
                lambda o: (f"checked, any tilt up to {math.degrees(o.design_tilt):g}°"
                           if o.tilted_landing else "not checked")),
        ], None, buttons=["settings"])

    if k == "level":
        lv: Level = obj
        return Form(titled("Level", lv.name), f"id {lv.id} · {len(lv.members)} members", obj, [
            _t("name", "Name"),
            _q("elevation", "Top of deck elevation", "length"),
            _q("superimposed_dead", "Superimposed dead load", "pressure",
               "Finishes, services, ceilings: carried by the framing during the lift"),
            _q("live_in_place", "Live load left in place", "pressure",
               "Occupancy or stored material that stays on the floor during the lift"),
            replace(_t("occupied_below", "Level below occupied", "bool"),
                    tip="People may be under this deck during the lift (the safe "
                        "side). Unticked: concrete scabbing off the soffit is a note "
                        "instead of keeping the level below clear; a drop that goes "
                        "through the deck always keeps it clear"),
            _ro("gx", "Grid spacings along x", lambda o: _spacings(o.grid.x_lines, system)),
            _ro("gy", "Grid spacings along y", lambda o: _spacings(o.grid.y_lines, system)),
            _ro("gl", "Grid labels", lambda o: f"{', '.join(o.grid.x_labels)} / "
                                                f"{', '.join(o.grid.y_labels)}"),
        ], lambda p, o: ed.with_level(p, ids[0], o), buttons=["generate", "add_opening"])

    if k == "deck":
        dk: Deck = obj

        def set_deck_kind(o: Deck, v: str) -> Deck:
            # a new kind keeps the thickness where it is in that kind's range, else
            # takes a typical one (the ranges do not overlap: 10 mm is no slab)
            lo, hi, typical = {"steel_plate": (0.003, 0.05, 0.01),
                               "grating": (0.02, 0.1, 0.03)}.get(v, (0.05, 0.6, 0.13))
            t = o.thickness if lo <= o.thickness <= hi else typical
            return replace(o, kind=v, thickness=t)  # type: ignore[arg-type]

        def set_conc(o: Deck, key: str, v: float) -> Deck:
            return replace(o, concrete=replace(o.concrete, **{key: v}))

        return Form("Deck", f"on level {ids[0]} · {len(dk.openings)} openings", obj, [
            _choice("kind", "Deck type", (("composite", "Composite metal deck"),
                                          ("solid_slab", "Solid slab"),
                                          ("steel_plate", "Steel plate"),
                                          ("grating", "Steel grating")),
                    set_deck_kind),
            _q("thickness", "Total thickness (plate; grating bar depth)", "small_length"),
            _q("steel_fy", "Steel yield strength (plate, grating)", "stress"),
            _q("bar_thickness", "Grating bar thickness", "small_length"),
            _q("bar_pitch", "Grating bar pitch", "small_length"),
            _q("cover", "Cover to bottom bars", "small_length"),
            FieldSpec("rebar_area", "Bottom bars per width", "quantity",
                      lambda o: o.rebar_area, lambda o, v: replace(o, rebar_area=v),
                      quantity=REBAR, tip="Area of bottom reinforcement in one metre "
                                          "strip of slab"),
            FieldSpec("fc", "Concrete strength f'c / fck", "quantity",
                      lambda o: o.concrete.fc, lambda o, v: set_conc(o, "fc", v),
                      quantity="stress"),
            FieldSpec("fy_rebar", "Rebar yield strength", "quantity",
                      lambda o: o.concrete.fy_rebar, lambda o, v: set_conc(o, "fy_rebar", v),
                      quantity="stress"),
        ], lambda p, o: ed.with_deck(p, ids[0], o), buttons=["add_opening"])

    if k == "opening":
        idx = int(ids[1])
        return opening_form(obj, ids[0], idx,
                            lambda p, o: ed.with_opening(p, ids[0], idx, o))

    if k == "member":
        m: Member = obj
        sec = m.section
        return Form(f"{m.role.capitalize()} {m.id}", f"level {ids[0]} · span "
                    f"{units.fmt(m.span, 'length', system)}", obj, [
            FieldSpec("section", "Section", "section", lambda o: o.section.name,
                      lambda o, v: replace(o, section=v),
                      tip="Type to search the section library (W, IPE, HEA, HEB, HEM)"),
            FieldSpec("grade", "Steel grade", "choice", lambda o: o.grade.name,
                      lambda o, v: replace(o, grade=_grade(v)),
                      choices=tuple((g, g) for g in _grade_names(m.grade.name))),
            _choice("end_condition", "End conditions",
                    tuple((c, _END_LABELS.get(c, c)) for c in END_CONDITIONS)),
            FieldSpec("connection_capacity", "End connection shear capacity", "optional",
                      lambda o: o.connection_capacity,
                      lambda o, v: replace(o, connection_capacity=v), quantity="force",
                      tip="Shear capacity of each end connection (bolts, welds, plates), "
                          "from the drawings or the connection design. Leave empty only "
                          "if it is not known: the end shear is then checked against the "
                          "web's shear resistance, which a simple connection may not "
                          "reach, and the permit asks the engineer to confirm the "
                          "connection.",
                      empty="empty = not entered: the engineer must confirm"),
            _ro("ends", "From → to", lambda o: f"({units.fmt(o.start[0], 'length', system)}, "
                f"{units.fmt(o.start[1], 'length', system)}) → "
                f"({units.fmt(o.end[0], 'length', system)}, "
                f"{units.fmt(o.end[1], 'length', system)})"),
            _ro("props", "Section properties",
                lambda o: f"d {units.fmt(sec.d, 'small_length', system)} · "
                          f"Ix {units.fmt(sec.Ix, 'inertia', system)} · "
                          f"Zx {units.fmt(sec.Zx, 'modulus', system)} · "
                          f"{units.fmt(sec.mass_per_length, 'mass_per_length', system)}"),
            _ro("fy", "Yield strength used",
                lambda o: units.fmt(o.grade.section_fy(o.section), "stress", system)),
        ], lambda p, o: ed.with_member(p, ids[0], m.id, o), buttons=["apply_like", "delete"])

    if k == "zone":
        z: LiftZone = obj
        return Form(f"Lift zone {z.id}", f"{len(z.loads)} load(s) · crane at "
                    f"({units.fmt(z.crane[0], 'length', system)}, "
                    f"{units.fmt(z.crane[1], 'length', system)})", obj, [
            _t("name", "Name"),
            _choice("level_id", "Level", level_choices),
            FieldSpec("cx", "Crane centre x", "quantity", lambda o: o.crane[0],
                      lambda o, v: replace(o, crane=(v, o.crane[1])), quantity="length"),
            FieldSpec("cy", "Crane centre y", "quantity", lambda o: o.crane[1],
                      lambda o, v: replace(o, crane=(o.crane[0], v)), quantity="length"),
            _q("r_min", "Inner radius", "length", "Closest the load comes to the crane centre"),
            _q("r_max", "Outer radius", "length", "Farthest the load goes from the crane centre"),
            _q("slew_start", "Slew from (anticlockwise, from east)", "angle"),
            _q("slew_end", "Slew to", "angle", "Same as 'from' (or 360° apart) for a full "
                                              "circle"),
            _q("drift_margin", "Load swing margin", "length",
               "The region is widened by this much for load swing"),
            *_crane_fields(system),
            FieldSpec("corridor", f"Corridor ({units.display_unit('length', system)})",
                      "text", lambda o: corridor_text(o.corridor, system),
                      lambda o, v: replace(o, corridor=parse_corridor(v, system)),
                      tip="Plan polygon the load stays inside (the region is the swing "
                          "sector within it): corner points x,y separated by ';', e.g. "
                          "0,0; 12,0; 12,6. Empty for the whole sector. Or draw it on "
                          "the plan.",
                      empty="none: the whole swing sector"),
        ], lambda p, o: ed.with_zone(p, z.id, o),
            buttons=["add_load", "draw_corridor", "clear_corridor", "delete"])

    if k == "load":
        ld: LiftLoad = obj
        zone = project.zone(ids[0])
        elev = project.level(zone.level_id).elevation

        def set_mode(o: LiftLoad, v: str) -> LiftLoad:
            if v == "drop" and o.drop_height is None:
                return replace(o, drop_height=o.height_above(elev), hook_elevation=None)
            if v == "hook" and o.hook_elevation is None:
                return replace(o, hook_elevation=elev + o.hang_length + (o.drop_height or 0.0),
                               drop_height=None)
            return o

        fields = [
            _t("name", "Name"),
            _choice("kind", "Kind", (("load", "Lifted load"), ("rigging", "Rigging item"))),
            _q("mass", "Mass", "mass"),
            _q("footprint_length", "Footprint length", "length",
               "Plan size of the load's underside"),
            _q("footprint_width", "Footprint width", "length"),
            FieldSpec("contact_stiffness", "Underside stiffness", "optional",
                      lambda o: o.contact_stiffness,
                      lambda o, v: replace(o, contact_stiffness=v), quantity="stiffness",
                      tip="Stiffness of the load's own underside where it lands (skid, base "
                          "frame, timber dunnage), in series with the deck. Leave empty to "
                          "take the load as rigid (the highest contact force; where the deck "
                          "concrete crushes, a softer underside can raise the framing's "
                          "demand: enter the real stiffness where it is known).",
                      empty="empty = rigid (highest contact force)"),
            _mass_source_field(),
            FieldSpec("mode", "Height given as", "choice",
                      lambda o: "drop" if o.drop_height is not None else "hook", set_mode,
                      choices=(("drop", "Drop height above the deck"),
                               ("hook", "Hook elevation"))),
        ]
        if ld.drop_height is not None:
            fields.append(_q("drop_height", "Drop height", "length",
                             "Height of the load's underside above the finished surface "
                             "(top of deck); over a pad the fall is this less its "
                             "thickness"))
        else:
            fields += [_q("hook_elevation", "Hook elevation", "length",
                          "Same datum as level elevations"),
                       _q("hang_length", "Hook to load underside", "length"),
                       _ro("h", "Drop height onto deck",
                           lambda o: _safe(lambda: units.fmt(o.height_above(elev), "length",
                                                             system)))]
        return Form(titled("Load", ld.name), f"in lift zone {zone.id} "
                    f"({zone.name or 'unnamed'})", obj, fields,
                    lambda p, o: ed.with_load(p, zone.id, ld.name, o), buttons=["delete"])

    if k == "protection":
        a: ProtectionArea = obj
        return protection_form(a, project, lambda p, o: ed.with_protection(p, a.id, o))

    if k == "bay":
        return Form(f"Bay {ids[1]}", f"on level {ids[0]}", obj, [
            _ro("size", "Size", lambda o: f"{units.fmt(o.rect.width, 'length', system)} × "
                                          f"{units.fmt(o.rect.height, 'length', system)}"),
        ], None, notes=[])
    return None


def protection_form(a: ProtectionArea, project: Project,
                    commit: Callable[[Project, Any], Project] | None) -> Form:
    """Form of a protection area (also used by the new-protection dialog)."""
    level_choices = tuple((lv.id, f"{lv.name} ({lv.id})") for lv in project.levels)

    def set_kind(o: ProtectionArea, v: str) -> ProtectionArea:
        if v == "crushable":
            return replace(o, kind=v, crush_force=o.crush_force or 200e3,
                           crush_stroke=o.crush_stroke or 0.05)
        return replace(o, kind=v, stiffness=o.stiffness or 50e6)

    fields = [
        _t("name", "Name"),
        _choice("level_id", "Level", level_choices),
        *_rect_fields("", lambda o: o.area, lambda o, r: replace(o, area=r)),
        _choice("kind", "Mat behaviour", (("spring", "Elastic mat (spring)"),
                                         ("crushable", "Crushable layer")), set_kind),
        _q("thickness", "Thickness", "small_length",
           "Raises the struck surface and spreads the load at 1:1"),
    ]
    if a.kind == "spring":
        fields.append(_q("stiffness", "Mat stiffness under the load", "stiffness",
                         "Spring stiffness of the mat under the load's footprint "
                         "(not per unit area, not for the whole mat)"))
    else:
        fields += [_q("crush_force", "Crush force", "force",
                      "Constant force while the layer crushes"),
                   _q("crush_stroke", "Crush stroke", "small_length",
                      "Depth the layer can crush before it bottoms out")]
    return Form(f"Protection {a.id}", f"on level {a.level_id}", a, fields, commit,
                buttons=["delete"] if commit else [])


def opening_form(r: Rect, level_id: str, index: int | None,
                 commit: Callable[[Project, Any], Project] | None) -> Form:
    """Form of a deck opening (also used by the new-opening dialog)."""
    title = "New deck opening" if index is None else f"Deck opening {index + 1}"
    return Form(title, f"on level {level_id}: a load over it falls through", r,
                _rect_fields("", lambda o: o, lambda o, new: new), commit,
                buttons=["delete"] if commit else [])


_END_LABELS = {"simple": "Simple (pinned both ends)", "fixed": "Fixed both ends",
               "propped": "Fixed at start, pinned at end",
               "cantilever": "Cantilever (fixed at start)"}


def _safe(fn: Callable[[], str]) -> str:
    try:
        return fn()
    except (ModelError, ValueError) as exc:
        return f"— {exc}"


def _grade_names(current: str) -> list[str]:
    from droprig.io.sections import list_grades

    names = list_grades()
    return names if current in names else [current, *names]


def _grade(name: str):
    from droprig.io.sections import get_grade

    return get_grade(name)


def _section(name: str):
    from droprig.io.sections import get_section

    return get_section(name)


# ------------------------------------------------------------------ widgets


class _LongText(QPlainTextEdit):
    """Multi-line text that commits when it loses focus."""

    editingFinished = Signal()

    def focusOutEvent(self, e: Any) -> None:
        super().focusOutEvent(e)
        self.editingFinished.emit()


class FormEditor(QWidget):
    """Input widgets for a :class:`Form` plus a message line for refusals.

    ``apply(spec, new_obj)`` puts an edited object back (into the document, or
    into a dialog's working copy); it may raise ModelError / ValueError, which
    is shown as a refusal. Subclasses or owners set :attr:`apply`.
    """

    refused = Signal(str)

    def __init__(self, system: Callable[[], units.UnitSystem],
                 apply: Callable[[FieldSpec, Any], None],
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._system_fn = system
        self.apply = apply
        self.form: Form | None = None
        self._editors: dict[str, QWidget] = {}
        self._signature: tuple | None = None
        self._message = QLabel()
        self._message.setObjectName("formMessage")
        self._message.setWordWrap(True)
        self._message.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self._message.setStyleSheet(
            "background: #FBE9EC; color: #6B0F24; border: 1px solid #C98292;"
            "border-radius: 3px; padding: 4px;")
        self._message.hide()
        self.setFocusPolicy(Qt.FocusPolicy.ClickFocus)  # holds the focus during a rebuild
        self._layout = QFormLayout()
        self._layout.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        self._layout.setRowWrapPolicy(QFormLayout.RowWrapPolicy.WrapLongRows)
        v = QVBoxLayout(self)
        v.setContentsMargins(0, 0, 0, 0)
        v.addWidget(self._message)
        v.addLayout(self._layout)

    def resizeEvent(self, event: Any) -> None:
        super().resizeEvent(event)
        self._fit_rows()

    def _fit_rows(self) -> None:
        """Every label above its box when a box beside its label would run past the
        form's right edge (QFormLayout kept such rows side by side: at 1280 × 720
        under X the lift zone's boxes were cut at the inspector's edge)."""
        lay = self._layout
        gap = max(lay.horizontalSpacing(), 6)
        label_w = field_w = 0
        for r in range(lay.rowCount()):
            lab = lay.itemAt(r, QFormLayout.ItemRole.LabelRole)
            fld = lay.itemAt(r, QFormLayout.ItemRole.FieldRole)
            lw = lab.widget() if lab is not None else None
            fw = fld.widget() if fld is not None else None
            if not isinstance(lw, QLabel) or fw is None:
                continue
            one_line = lw.fontMetrics().horizontalAdvance(lw.text())
            if one_line > FIELD_MIN_WIDTH_CAP:
                continue  # wrapped under any policy
            label_w = max(label_w, one_line)
            field_w = max(field_w, fw.minimumWidth(), fw.minimumSizeHint().width())
        policy = (QFormLayout.RowWrapPolicy.WrapAllRows
                  if label_w and self.width() < label_w + gap + field_w
                  else QFormLayout.RowWrapPolicy.WrapLongRows)
        if lay.rowWrapPolicy() != policy:
            lay.setRowWrapPolicy(policy)

    # -------------------------------------------------------------- public

    @property
    def message(self) -> str:
        return self._message.text()

    def editor(self, key: str) -> QWidget:
        return self._editors[key]

    def set_form(self, form: Form | None) -> None:
        """Show ``form`` (re-using the widgets when the layout is the same)."""
        self.form = form
        if form is None:
            self._signature = None
            self._clear()
            return
        sig = (*form.signature, self._system_fn())
        if sig != self._signature:
            focus = QApplication.focusWidget()
            focus_key = next((k for k, w in self._editors.items() if w is focus), None)
            focus_key = focus_key if focus_key in {f.key for f in form.fields} else None
            self._clear()
            for spec in form.fields:
                w = self._make_editor(spec)
                lab = QLabel(spec.label)
                # wrapped: a long label ("Slew from (anticlockwise, from east)") set
                # the form's width, and at 1280 × 720 the boxes ran under the
                # panel's edge behind a horizontal scroll bar (seen under Xvfb)
                lab.setWordWrap(True)
                if spec.tip:
                    lab.setToolTip(spec.tip)
                    w.setToolTip(spec.tip)
                self._layout.addRow(lab, w)
                self._editors[spec.key] = w
            self._signature = sig
            self._fit_rows()
            if focus_key in self._editors:  # same field in the new shape: keep typing
                self._editors[focus_key].setFocus(Qt.FocusReason.OtherFocusReason)
        for spec in form.fields:
            self._load_value(spec, self._editors[spec.key], form.obj)

    def clear_message(self) -> None:
        self._message.clear()
        self._message.hide()

    # -------------------------------------------------------------- building

    def _clear(self) -> None:
        """Take every row out of the layout and delete its widgets *later*.

        A form is rebuilt from inside a widget's own signal (a line edit's
        ``editingFinished`` during its focus-out, while Qt is moving the focus to
        the next box on Tab). Deleting the widgets there (``removeRow``) freed
        objects Qt was still using: a double free. Here they are hidden,
        detached from the focus chain and handed to ``deleteLater``; the focus,
        if it was in the form, is parked on the editor itself."""
        self._editors.clear()  # first: a box losing the focus below commits nothing
        focus = QApplication.focusWidget()
        had_focus = focus is not None and (focus is self or self.isAncestorOf(focus))
        if had_focus:
            self.setFocus(Qt.FocusReason.OtherFocusReason)
        while self._layout.rowCount():
            row = self._layout.takeRow(0)
            for item in (row.labelItem, row.fieldItem):
                w = item.widget() if item is not None else None
                if w is not None:
                    w.hide()
                    w.setEnabled(False)
                    w.deleteLater()

    def _make_editor(self, spec: FieldSpec) -> QWidget:
        system = self._system_fn()
        if spec.kind in ("quantity", "optional", "text", "section"):
            w = QLineEdit()
            if spec.kind == "quantity":
                unit = unit_label(spec.quantity, system)
                w.setPlaceholderText(f"e.g. 12 {unit}" if unit else "e.g. 1.0")
            elif spec.kind == "optional":
                # an empty box shows no value, so the hint names the unit to type in
                unit = unit_label(spec.quantity, system)
                hint = spec.empty or "empty = none"
                w.setPlaceholderText(f"{hint}; or in {unit}" if unit else hint)
            elif spec.empty:
                w.setPlaceholderText(spec.empty)
            if spec.kind == "section":
                from droprig.io.sections import list_sections

                comp = QCompleter(list_sections(), w)
                comp.setCaseSensitivity(Qt.CaseSensitivity.CaseInsensitive)
                comp.setFilterMode(Qt.MatchFlag.MatchContains)
                comp.setMaxVisibleItems(15)
                w.setCompleter(comp)
                comp.activated.connect(lambda _t, s=spec, w=w: self._commit_text(s, w))
            w.editingFinished.connect(lambda s=spec, w=w: self._commit_text(s, w))
            _fit_width(w, w.placeholderText(), "-000.000 mm")
            return w
        if spec.kind == "longtext":
            w = _LongText()
            w.setFixedHeight(80)
            w.editingFinished.connect(lambda s=spec, w=w: self._commit_text(s, w))
            return w
        if spec.kind == "choice":
            w = QComboBox()
            for value, label in spec.choices:
                w.addItem(label, value)
            w.activated.connect(lambda _i, s=spec, w=w: self.commit_value(s, w.currentData()))
            return w
        if spec.kind == "bool":
            w = QCheckBox()
            w.toggled.connect(lambda on, s=spec: self.commit_value(s, bool(on)))
            return w
        w = QLabel()
        w.setWordWrap(True)
        w.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        w.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Preferred)
        return w

    def _load_value(self, spec: FieldSpec, w: QWidget, obj: Any) -> None:
        v = spec.get(obj)
        if isinstance(w, QLineEdit):
            text = _edit_text(v, spec.quantity, self._system_fn()) \
                if spec.kind in ("quantity", "optional") else str(v)
            if w.text() != text:
                w.setText(text)
                w.setCursorPosition(0)
                _fit_width(w, text, w.placeholderText(), "-000.000 mm")
        elif isinstance(w, _LongText):
            if w.toPlainText() != str(v):
                w.setPlainText(str(v))
        elif isinstance(w, QComboBox):
            w.blockSignals(True)
            have = tuple((w.itemData(i), w.itemText(i)) for i in range(w.count()))
            if have != tuple(spec.choices):  # e.g. a level renamed: new labels
                w.clear()
                for value, label in spec.choices:
                    w.addItem(label, value)
            w.setCurrentIndex(w.findData(v))
            w.blockSignals(False)
        elif isinstance(w, QCheckBox):
            w.blockSignals(True)
            w.setChecked(bool(v))
            w.blockSignals(False)
        elif isinstance(w, QLabel):
            w.setText(str(v))

    # -------------------------------------------------------------- commits

    def _commit_text(self, spec: FieldSpec, w: QWidget) -> None:
        form = self.form
        if form is None or self._editors.get(spec.key) is not w:
            return
        text = w.toPlainText() if isinstance(w, _LongText) else w.text()  # type: ignore[attr-defined]
        current = spec.get(form.obj)
        system = self._system_fn()
        if spec.kind == "optional" and not text.strip():
            if current is None:
                return
            value: Any = None  # empty box: no value (e.g. a rigid load)
        elif spec.kind in ("quantity", "optional"):
            if text.strip() == _edit_text(current, spec.quantity, system):
                return  # display text unchanged: keep the stored value unrounded
            try:
                value = parse_q(text, spec.quantity, system, field=spec.label)
            except units.UnitError as exc:
                self.refuse(describe_refusal(exc, spec.label, system, spec.quantity), spec)
                return
        elif spec.kind == "section":
            if text.strip() == current:
                return
            try:
                value = _section(text)
            except ValueError as exc:
                self.refuse(f"Section: {exc}. Nothing was changed.", spec)
                return
        else:
            if text == current:
                return
            value = text
        self.commit_value(spec, value)

    def commit_value(self, spec: FieldSpec, value: Any) -> None:
        """Build the edited object and hand it to :attr:`apply`; refuse on error."""
        form = self.form
        if form is None or spec.set is None:
            return
        system = self._system_fn()
        try:
            new_obj = spec.set(form.obj, value)
            if new_obj == form.obj:
                self.clear_message()
                return
            self.apply(spec, new_obj)
        except (ModelError, ValueError) as exc:
            self.refuse(describe_refusal(exc, spec.label, system, spec.quantity or None), spec)
            return
        self.clear_message()

    def refuse(self, message: str, spec: FieldSpec | None = None) -> None:
        self._message.setText(message)
        self._message.show()
        self.refused.emit(message)
        if self.form is not None and spec is not None and spec.key in self._editors:
            self._load_value(spec, self._editors[spec.key], self.form.obj)


class FormDialog(QDialog):
    """Edit a new object before it is added (protection area, deck opening).

    ``make_form(obj)`` returns the :class:`Form` for the working copy; every
    field edit is validated at once; OK returns with :meth:`value`.
    """

    def __init__(self, title: str, obj: Any, make_form: Callable[[Any], Form],
                 system: units.UnitSystem, intro: str = "",
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle(title)
        self._obj = obj
        self._make_form = make_form
        self.editor = FormEditor(lambda: system, self._apply, self)
        lay = QVBoxLayout(self)
        if intro:
            lab = QLabel(intro)
            lab.setWordWrap(True)
            lay.addWidget(lab)
        lay.addWidget(self.editor)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok
                                   | QDialogButtonBox.StandardButton.Cancel)
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        lay.addWidget(buttons)
        self.setMinimumWidth(420)
        self.editor.set_form(make_form(obj))

    def _apply(self, spec: FieldSpec, new_obj: Any) -> None:
        self._obj = new_obj
        self.editor.set_form(self._make_form(new_obj))

    def value(self) -> Any:
        return self._obj


class Inspector(QWidget):
    """Form for ``document.selection``. ``actions`` maps names used in
    :attr:`Form.buttons` (``settings``, ``generate``, ``add_opening``,
    ``apply_like``, ``add_load``, ``delete``) to the window's QActions."""

    refused = Signal(str)
    """Emitted with the message when an input is refused."""

    def __init__(self, document: Document, actions: dict[str, QAction] | None = None,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._doc = document
        self._actions = actions or {}
        self._buttons_sig: tuple = ()

        self._title = QLabel()
        self._title.setObjectName("inspectorTitle")
        self._title.setStyleSheet("font-size: 14px; font-weight: 600;")
        self._subtitle = QLabel()
        self._subtitle.setWordWrap(True)
        self._subtitle.setStyleSheet("color: #555;")
        self.form_editor = FormEditor(self._system, self._apply)
        self.form_editor.refused.connect(self.refused)
        self._extra = QLabel()
        self._extra.setWordWrap(True)
        self._extra.setTextFormat(Qt.TextFormat.RichText)
        self._buttons = QWidget()
        self._buttons_layout = QVBoxLayout(self._buttons)
        self._buttons_layout.setContentsMargins(0, 4, 0, 0)
        self._empty = QLabel("Select something in the project tree, the plan or the "
                             "results table to see and edit it here.")
        self._empty.setWordWrap(True)
        self._empty.setStyleSheet("color: #666;")

        inner = QWidget()
        v = QVBoxLayout(inner)
        for w in (self._title, self._subtitle, self.form_editor, self._buttons, self._extra,
                  self._empty):
            v.addWidget(w)
        v.addStretch(1)
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        scroll.setFrameShape(QFrame.Shape.NoFrame)
        scroll.setWidget(inner)
        outer = QVBoxLayout(self)
        outer.setContentsMargins(0, 0, 0, 0)
        outer.addWidget(scroll)

        document.selection_changed.connect(self._on_selection_changed)
        document.project_changed.connect(self._on_project_changed)
        document.results_changed.connect(self._on_results_changed)
        self._rebuild()

    # -------------------------------------------------------------- public (tests, window)

    @property
    def form(self) -> Form | None:
        return self.form_editor.form

    def editor(self, key: str) -> QWidget:
        """The input widget of field ``key`` of the current form."""
        return self.form_editor.editor(key)

    @property
    def message(self) -> str:
        return self.form_editor.message

    # -------------------------------------------------------------- document events

    def _on_selection_changed(self, sel: Selection | None) -> None:
        self.form_editor.clear_message()
        self._rebuild()

    def _on_project_changed(self, project: Project) -> None:
        self._rebuild()

    def _on_results_changed(self, results: object) -> None:
        self._refresh_extra()

    # -------------------------------------------------------------- building

    def _system(self) -> units.UnitSystem:
        return self._doc.project.settings.unit_system

    def _rebuild(self) -> None:
        form = build_form(self._doc.project, self._doc.selection)
        self._empty.setVisible(form is None)
        for w in (self._title, self._subtitle, self.form_editor, self._buttons):
            w.setVisible(form is not None)
        self.form_editor.set_form(form)
        if form is not None:
            self._title.setText(form.title)
            self._subtitle.setText(form.subtitle)
            if tuple(form.buttons) != self._buttons_sig:
                self._make_buttons(form)
        else:
            self._make_buttons(None)
        self._refresh_extra()

    def _make_buttons(self, form: Form | None) -> None:
        while self._buttons_layout.count():
            item = self._buttons_layout.takeAt(0)
            if item.widget():
                item.widget().deleteLater()
        self._buttons_sig = tuple(form.buttons) if form else ()
        for name in self._buttons_sig:
            act = self._actions.get(name)
            if act is None:
                continue
            b = QPushButton(act.text().replace("&", ""))
            b.setToolTip(act.toolTip())
            b.clicked.connect(act.trigger)
            self._buttons_layout.addWidget(b)

    # -------------------------------------------------------------- commits

    def _apply(self, spec: FieldSpec, new_obj: Any) -> None:
        form = self.form
        if form is None or form.commit is None:
            return
        after = form.commit(self._doc.project, new_obj)  # may raise ModelError
        sel = self._doc.selection
        follow = None
        if sel is not None and sel.kind == "load" and spec.key == "name":
            follow = Selection("load", (sel.ids[0], new_obj.name))
        self._doc.edit(after, f"{form.title}: {spec.label.lower()}", select=follow)

    # -------------------------------------------------------------- results details

    def _refresh_extra(self) -> None:
        sel = self._doc.selection
        res = self._doc.results
        if sel is None or sel.kind not in ("bay", "zone", "load"):
            self._extra.setText("")
            self._extra.setVisible(False)
            return
        system = self._system()
        rows = []
        if res is not None:
            for b in res.bays:
                if sel.kind == "bay" and (b.level_id, b.bay_id) != sel.ids:
                    continue
                if sel.kind == "zone" and b.zone_id != sel.ids[0]:
                    continue
                if sel.kind == "load" and (b.zone_id, b.load_name) != sel.ids:
                    continue
                rows.append(b)
        if not rows:
            msg = ("No results yet." if res is None else
                   "No drop point of any lift zone falls in this bay.") \
                if sel.kind == "bay" else ""
            if self._doc.analysis_error:
                msg = f"Analysis failed: {self._doc.analysis_error}"
            self._extra.setText(f"<p>{msg}</p>" if msg else "")
            self._extra.setVisible(bool(msg))
            return
        if sel.kind in ("zone", "load"):
            # each bay once, by its worst outcome over the loads of the zone
            rank = {k: i for i, k in enumerate(style.OUTCOME_ORDER)}
            worst: dict[tuple[str, str], str] = {}
            for b in rows:
                key = (b.level_id, b.bay_id)
                if key not in worst or rank.get(b.response, -1) > rank.get(worst[key], -1):
                    worst[key] = b.response
            counts: dict[str, int] = {}
            for resp in worst.values():
                counts[resp] = counts.get(resp, 0) + 1
            parts = []
            for key in reversed(style.OUTCOME_ORDER):
                if counts.get(key):
                    st = style.outcome(key)
                    parts.append(f"{_chip(st)} {counts[key]} bay(s): {st.label.lower()}")
            n_loads = len({b.load_name for b in rows})
            head = "Outcome by bay" + (f" (worst of {n_loads} loads)" if n_loads > 1 else "")
            html = f"<p><b>{head}</b><br>" + "<br>".join(parts) + "</p>"
        else:
            html = "<p><b>Outcome in this bay</b></p>"
            order = {k: i for i, k in enumerate(style.OUTCOME_ORDER)}
            # the permit's words and figures (droprig.permit), as in the results table;
            # none while the limits of an edit are still being confirmed
            confirmed = self._doc.results_confirmed
            permit = self._doc.permit(self._doc.project, res) \
                if res is not None and confirmed else None
            verdicts = {(v.zone_id, v.load_name, v.bay_id): v
                        for v in (permit.bays if permit is not None else ())}
            # worst first, and among equal outcomes the highest utilisation first:
            # the plan's tag shows that one (X 6.99), and the list opened with
            # another load's U 1.15 (seen under Xvfb on the rooftop demo)
            for b in sorted(rows, key=lambda r: (-order.get(r.response, -1),
                                                 -r.max_utilisation)):
                st = style.outcome(b.response)
                v = verdicts.get((b.zone_id, b.load_name, b.bay_id))
                cells = v.cells(system) if v is not None else None
                allow = cells["allowable"] if cells else "none" if confirmed \
                    else style.CONFIRMING
                # max U with the check that sets it, the table's own cell; the
                # worst point's check can be another (seen under Xvfb on the rooftop
                # demo: "max U 6.85" beside "governing: … (web yielding)" while the
                # table read "6.85 (shear)")
                util = cells["utilisation"] if cells else fmt_utilisation_check(
                    b.max_utilisation, b.utilisation_check)
                html += (f"<p>{_chip(st)} <b>{st.label}</b> — zone {b.zone_id}, "
                         f"{b.load_name}<br>max U {html_escape(util)}; "
                         f"allowable drop {html_escape(allow)}<br>worst point: "
                         + html_escape(fmt_worst_point(b.governing_member,
                                                       b.governing_check, b.response)))
                if cells:
                    html += (f"<br><b>{html_escape(cells['verdict'])}</b>; max hook "
                             f"elevation: {html_escape(cells['hook'])}<br>"
                             f"<i>{html_escape(cells['conditions'])}</i>")
                    if v is not None and any(c.kind == "cap_hook" for c in v.conditions):
                        # why the limit reads below the allowable drop beside it
                        html += (f"<br><span style='color:#555'>"
                                 f"{html_escape(LIMIT_NOTE)}</span>")
                elif not confirmed:
                    html += f"<br><i>Verdict, limits and conditions: {style.CONFIRMING}</i>"
                html += "</p>"
        html += f"<p style='color:#6B4E00'>⚠ {style.CAUTION_SHORT}.</p>"
        self._extra.setText(html)
        self._extra.setVisible(True)


def _chip(st: style.OutcomeStyle) -> str:
    return (f"<span style='background:{st.fill}; color:{st.ink}; "
            f"border:1px solid {st.edge}'>&nbsp;{st.tag}&nbsp;</span>")


__all__ = ["FieldSpec", "Form", "Inspector", "build_form", "describe_refusal"]

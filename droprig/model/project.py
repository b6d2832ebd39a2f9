"""The droprig project: framing, lift zones, loads and protection (SI units).

Plain frozen dataclasses; every constructor validates and raises
:class:`~droprig.model.errors.ModelError` naming the field, value and range.
Edit with :func:`dataclasses.replace`.
"""

from __future__ import annotations

import copy
import itertools
import math
from collections.abc import Iterable
from dataclasses import dataclass, field
from typing import Literal

from droprig.model import bounds
from droprig.model.errors import (
    ModelError,
    check_choice,
    check_finite,
    check_range,
    check_text,
)
from droprig.model.permit_data import (
    LiftPoint,
    MassSource,
    check_mass_source,
    check_permit_info,
    check_zone_permit,
)
from droprig.model.sections import Concrete, Grade, Section

Point = tuple[float, float]
EndCondition = Literal["simple", "fixed", "propped", "cantilever"]
END_CONDITIONS: tuple[str, ...] = ("simple", "fixed", "propped", "cantilever")
MemberRole = Literal["girder", "beam"]
UnitSystem = Literal["SI", "US"]
DesignBasis = Literal["aisc360", "en1993"]
DeckKind = Literal["composite", "solid_slab", "steel_plate", "grating"]
DECK_KINDS: tuple[str, ...] = ("composite", "solid_slab", "steel_plate", "grating")
STEEL_DECK_KINDS: tuple[str, ...] = ("steel_plate", "grating")
STEEL_DENSITY = 7850.0
"""Density of structural steel, kg/m³ (EN 1991-1-1 Table A.4)."""
MatKind = Literal["spring", "crushable"]
LoadKind = Literal["load", "rigging"]
StrikeOrientation = Literal["flat", "edge", "corner"]
STRIKE_ORIENTATIONS: tuple[str, ...] = ("flat", "edge", "corner")
DriftMode = Literal["given", "computed"]

CONTACT_STIFFNESS_RANGE = (1e4, 1e12)
"""Allowed stiffness of a load's own underside, N/m: from a very soft timber-and-rubber
bearer (10 kN/m) to practically rigid steel (1e12 N/m)."""

GEOMETRY_TOL = 1e-6
"""Two plan points closer than this (m) are the same point."""


def _repeated(ids: Iterable[str]) -> str | None:
    """The smallest id that appears more than once, or None (linear time)."""
    seen: set[str] = set()
    dup: set[str] = set()
    for i in ids:
        (dup if i in seen else seen).add(i)
    return min(dup) if dup else None


def _check_point(name: str, p: Point, lim: float = 10_000.0) -> Point:
    if not (isinstance(p, tuple) and len(p) == 2):
        raise ModelError(name, p, "a pair (x, y) of numbers in m")
    return (
        check_range(f"{name}.x", p[0], -lim, lim, unit="m"),
        check_range(f"{name}.y", p[1], -lim, lim, unit="m"),
    )


@dataclass(frozen=True)
class Rect:
    """Axis-aligned rectangle in plan, m."""

    x0: float
    y0: float
    x1: float
    y1: float

    def __post_init__(self) -> None:
        for n in ("x0", "y0", "x1", "y1"):
            check_range(f"rect.{n}", getattr(self, n), -10_000.0, 10_000.0, unit="m")
        if self.x1 <= self.x0:
            raise ModelError("rect.x1", self.x1, f"> x0 = {self.x0:g} m", "m")
        if self.y1 <= self.y0:
            raise ModelError("rect.y1", self.y1, f"> y0 = {self.y0:g} m", "m")

    @property
    def width(self) -> float:
        return self.x1 - self.x0

    @property
    def height(self) -> float:
        return self.y1 - self.y0

    def contains(self, x: float, y: float) -> bool:
        return self.x0 <= x <= self.x1 and self.y0 <= y <= self.y1


@dataclass(frozen=True)
class ProjectInfo:
    """Title-block data.

    ``lift_reference`` is the lift-plan reference and ``lift_plan_revision``
    its revision; ``revision`` and ``date`` are those of this assessment.
    Permit fields (:mod:`droprig.model.permit_data`): ``permit_number``,
    ``lift_plan_revision``, ``valid_from`` / ``valid_to`` (ISO 8601 date or
    date and time). Empty text: not recorded.
    """

    name: str = "Untitled lift"
    site: str = ""
    lift_reference: str = ""
    revision: str = "A"
    date: str = ""
    prepared_by: str = ""
    checked_by: str = ""
    approved_by: str = ""
    description: str = ""
    permit_number: str = ""
    lift_plan_revision: str = ""
    valid_from: str = ""
    valid_to: str = ""

    def __post_init__(self) -> None:
        check_permit_info(self)
        check_text("info.name", self.name, required=True)
        for n in ("site", "lift_reference", "revision", "date", "prepared_by", "checked_by",
                  "approved_by"):
            check_text(f"info.{n}", getattr(self, n))
        check_text("info.description", self.description, max_len=4000)


DESIGN_TILT_DEFAULT = math.radians(5.0)
"""Default design tilt of a load landing on one edge, rad (5°: a load hung for a lift is
levelled within a few degrees; common practice, no source). The same value as
``droprig.solver.footprint.PAD_TILT``, the solver's default where no project is at hand."""

DESIGN_TILT_MAX = math.radians(15.0)
"""Largest design tilt the tilted landing is checked for, rad (15°). Common practice, no
source: a load hanging further out of level is not under control in its rigging (it
may slip in its slings), and the edge model's small-rotation energy balance (the
centre of mass over the middle of the edges, tan θ for θ) drifts beyond it — past 15°
the engineer's own look, not this check."""


@dataclass(frozen=True)
class Settings:
    """Analysis settings.

    resistance_factor: φ applied to every resistance (accidental situation: 1.0,
    common practice, no source). dynamic_increase_factor: multiplies the yield
    strength (UFC 3-340-02 gives values for blast strain rates; 1.0 default for
    the slower strain rates of a dropped load, from memory). deflection_limit_ratio:
    N in span/N (240, IBC Table 1604.3 dead + live; information only).
    ductility_limit μ and rotation_limit θ (rad): NAVFAC DM-2.08 non-reusable
    steel beams, μ = 6, θ = 2°. grid_resolution: drop-point spacing, m.
    dynamic_amplification: the checks use the larger of the energy method and the
    time-history-based demand (droprig.solver.amplification; README, "Dynamic
    amplification"). Off by default until the permit conditions are confirmed
    under it: with it on, a condition printed for the steel demo (lay PAD1, cap the
    hook) left bay 3-4/B-C exceeding when followed (tests/test_permit.py closed
    loop) — README, "Dynamic amplification".
    tilted_landing: every drop point is also checked for the load landing out of
    level on its shorter edge (the whole mass through an edge strip,
    droprig.solver.chain.LANDINGS), the worse governing; off by default until the
    edge contact is reviewed (README, limits).
    design_tilt: the tilt up to which the tilted landing is checked, rad (the tilt the
    lift plan allows the load to hang out of level; default
    :data:`DESIGN_TILT_DEFAULT`, 5°), 0 to :data:`DESIGN_TILT_MAX` (15°). Read only
    with ``tilted_landing`` on.
    """

    unit_system: UnitSystem = "SI"
    design_basis: DesignBasis = "en1993"
    resistance_factor: float = 1.0
    dynamic_increase_factor: float = 1.0
    deflection_limit_ratio: float = 240.0
    ductility_limit: float = 6.0
    rotation_limit: float = math.radians(2.0)
    grid_resolution: float = 0.5
    include_member_mass: bool = True
    include_existing_loads: bool = True
    dynamic_amplification: bool = False
    tilted_landing: bool = False
    design_tilt: float = DESIGN_TILT_DEFAULT

    def __post_init__(self) -> None:
        check_choice("settings.unit_system", self.unit_system, ("SI", "US"))
        check_choice("settings.design_basis", self.design_basis, ("aisc360", "en1993"))
        check_range("settings.resistance_factor", self.resistance_factor, 0.5, 1.0)
        check_range("settings.dynamic_increase_factor", self.dynamic_increase_factor, 1.0, 2.0)
        check_range("settings.deflection_limit_ratio", self.deflection_limit_ratio, 60.0, 2000.0)
        check_range("settings.ductility_limit", self.ductility_limit, 1.0, 30.0)
        check_range("settings.rotation_limit", self.rotation_limit, math.radians(0.1),
                    math.radians(15.0), unit="rad")
        check_range("settings.grid_resolution", self.grid_resolution, 0.05, 5.0, unit="m")
        check_range("settings.design_tilt", self.design_tilt, 0.0, DESIGN_TILT_MAX, unit="rad")
        for n in ("include_member_mass", "include_existing_loads", "dynamic_amplification",
                  "tilted_landing"):
            if not isinstance(getattr(self, n), bool):
                raise ModelError(f"settings.{n}", getattr(self, n), "true or false")


@dataclass(frozen=True)
class ColumnGrid:
    """Orthogonal column grid: lines x = x_lines[i] (labels x_labels) and
    y = y_lines[j] (labels y_labels), strictly increasing. Columns stand at every
    intersection; under a drop they act as axial springs E·A/L (``Level.column_area``,
    ``Level.column_height``)."""

    x_lines: tuple[float, ...]
    y_lines: tuple[float, ...]
    x_labels: tuple[str, ...]
    y_labels: tuple[str, ...]

    def __post_init__(self) -> None:
        for axis in ("x", "y"):
            lines = getattr(self, f"{axis}_lines")
            labels = getattr(self, f"{axis}_labels")
            if len(lines) < 2:
                raise ModelError(f"grid.{axis}_lines", len(lines), "at least 2 grid lines")
            if len(lines) > 60:
                raise ModelError(f"grid.{axis}_lines", len(lines), "at most 60 grid lines")
            if len(labels) != len(lines):
                raise ModelError(f"grid.{axis}_labels", len(labels),
                                 f"one label per grid line ({len(lines)})")
            for i, v in enumerate(lines):
                check_range(f"grid.{axis}_lines[{i}]", v, -10_000.0, 10_000.0, unit="m")
            for i in range(1, len(lines)):
                gap = lines[i] - lines[i - 1]
                if gap < 0.5 or gap > 60.0:
                    raise ModelError(f"grid.{axis}_lines[{i}]", lines[i],
                                     f"0.5 m to 60 m after the previous line "
                                     f"({lines[i - 1]:g} m)", "m")
            if len(set(labels)) != len(labels):
                raise ModelError(f"grid.{axis}_labels", labels, "unique labels")
            for i, lab in enumerate(labels):
                check_text(f"grid.{axis}_labels[{i}]", lab, required=True, max_len=8)

    @property
    def columns(self) -> tuple[Point, ...]:
        return tuple((x, y) for y in self.y_lines for x in self.x_lines)

    @property
    def extent(self) -> Rect:
        return Rect(self.x_lines[0], self.y_lines[0], self.x_lines[-1], self.y_lines[-1])


@dataclass(frozen=True)
class Member:
    """A steel beam or girder in plan from ``start`` to ``end``.

    End conditions: ``simple`` (pinned both ends), ``fixed`` (both ends),
    ``propped`` (fixed at ``start``, pinned at ``end``), ``cantilever`` (fixed at
    ``start``, free at ``end``). A member's ends rest on a column (grid
    intersection) or on another member whose line passes through the end.

    ``composite``: studded to the deck (shear connectors), so the slab over it acts
    with it in bending (EN 1994-1-1 ch. 6 / AISC 360-16 ch. I). ``connection_capacity``
    (N): shear capacity of each end connection; ``None`` = not entered: the check
    runs at the web's plastic shear resistance and the permit requires the engineer to
    confirm the connections (``droprig.solver.composite.CONNECTION_DEFAULT_FRACTION``).
    """

    id: str
    role: MemberRole
    start: Point
    end: Point
    section: Section
    grade: Grade
    end_condition: EndCondition = "simple"
    composite: bool = False
    connection_capacity: float | None = None

    def __post_init__(self) -> None:
        check_text("member.id", self.id, required=True, max_len=32)
        if not isinstance(self.composite, bool):
            raise ModelError(f"member {self.id}.composite", self.composite, "true or false")
        if self.connection_capacity is not None:
            check_range(f"member {self.id}.connection_capacity", self.connection_capacity,
                        1e3, 1e8, unit="N")
        check_choice(f"member {self.id}.role", self.role, ("girder", "beam"))
        _check_point(f"member {self.id}.start", self.start)
        _check_point(f"member {self.id}.end", self.end)
        check_choice(f"member {self.id}.end_condition", self.end_condition, END_CONDITIONS)
        span = self.span
        if span < 0.5 or span > 60.0:
            raise ModelError(f"member {self.id}.span", span, "0.5 m to 60 m", "m")
        if abs(self.start[0] - self.end[0]) > GEOMETRY_TOL and abs(
            self.start[1] - self.end[1]
        ) > GEOMETRY_TOL:
            raise ModelError(f"member {self.id}.end", self.end,
                             "a member parallel to the x or y axis")

    @property
    def span(self) -> float:
        return math.hypot(self.end[0] - self.start[0], self.end[1] - self.start[1])

    @property
    def axis(self) -> Literal["x", "y"]:
        """Direction the member spans along."""
        return "x" if abs(self.end[0] - self.start[0]) > abs(self.end[1] - self.start[1]) else "y"


@dataclass(frozen=True)
class Deck:
    """Floor deck spanning one way between the members parallel to the infill
    beams.

    Concrete kinds (``composite``, ``solid_slab``): thickness is the total slab
    depth, m; cover to the bottom bars, m; rebar_area: bottom reinforcement per
    metre width, m²/m.

    Steel kinds: ``steel_plate`` — thickness is the plate thickness (3–50 mm);
    ``grating`` — thickness is the depth of the bearing bars (20–100 mm), which
    span between the beams, ``bar_thickness`` their thickness (2–20 mm) and
    ``bar_pitch`` their centre spacing (10–100 mm, more than the bar thickness).
    ``steel_fy``: yield strength of the plate or bars, Pa (200–700 MPa; the grade's
    nominal value, e.g. 235 MPa for S235, 250 MPa for A36). A steel deck has no
    concrete: cover, rebar and concrete are kept but not used.

    Concrete kinds may also give ``rib_height``: height of the profiled steel
    deck's ribs, m (composite decks; 0 for a solid slab or when not known — then
    the full depth is used). Punching and local flexure use the concrete over the
    ribs, thickness − rib_height (EN 1994-1-1 §9.7.6), at least 40 mm (§9.2.1(2),
    from memory); ``top_rebar_area``: top bars over the beams and girders per metre
    width, m²/m (0: none, no hogging capacity is counted).
    """

    kind: DeckKind = "composite"
    thickness: float = 0.13
    concrete: Concrete = field(default_factory=Concrete)
    cover: float = 0.025
    rebar_area: float = 2.5e-4
    openings: tuple[Rect, ...] = ()
    rib_height: float = 0.0
    top_rebar_area: float = 0.0

    steel_fy: float = 235e6
    bar_thickness: float = 0.005
    bar_pitch: float = 0.03

    def __post_init__(self) -> None:
        check_choice("deck.kind", self.kind, DECK_KINDS)
        if self.kind == "steel_plate":
            check_range("deck.thickness", self.thickness, 0.003, 0.05, unit="m")
        elif self.kind == "grating":
            check_range("deck.thickness", self.thickness, 0.02, 0.1, unit="m")
        else:
            check_range("deck.thickness", self.thickness, 0.05, 0.6, unit="m")
            check_range("deck.cover", self.cover, 0.01, 0.1, unit="m")
            if self.cover >= self.thickness / 2:
                raise ModelError("deck.cover", self.cover,
                                 f"< thickness/2 = {self.thickness / 2:g} m", "m")
            check_range("deck.rebar_area", self.rebar_area, 5e-5, 5e-3, unit="m²/m")
            check_range("deck.rib_height", self.rib_height, 0.0, 0.25, unit="m")
            if self.rib_height > 0.0 and self.thickness - self.rib_height < 0.04:
                raise ModelError("deck.rib_height", self.rib_height,
                                 f"≤ thickness − 0.04 m = {self.thickness - 0.04:g} m (at "
                                 "least 40 mm of concrete over the ribs)", "m")
            check_range("deck.top_rebar_area", self.top_rebar_area, 0.0, 5e-3,
                        unit="m²/m")
        check_range("deck.steel_fy", self.steel_fy, 200e6, 700e6, unit="Pa")
        check_range("deck.bar_thickness", self.bar_thickness, 0.002, 0.02, unit="m")
        check_range("deck.bar_pitch", self.bar_pitch, 0.01, 0.1, unit="m")
        if self.bar_pitch <= self.bar_thickness:
            raise ModelError("deck.bar_pitch", self.bar_pitch,
                             f"> bar_thickness = {self.bar_thickness:g} m", "m")

    @property
    def is_steel(self) -> bool:
        """A steel plate or grating deck (no concrete)."""
        return self.kind in STEEL_DECK_KINDS

    @property
    def steel_depth(self) -> float:
        """Steel per unit plan area of a steel deck, m (m³/m²): the plate thickness,
        or for a grating the bar depth × bar thickness / pitch (the bars smeared over
        the plan; cross bars left out). 0 for a concrete deck."""
        if self.kind == "steel_plate":
            return self.thickness
        if self.kind == "grating":
            return self.thickness * self.bar_thickness / self.bar_pitch
        return 0.0

    def _derived(self, **values: float) -> Deck:
        """A copy with ``values`` changed, not validated again (a section derived from
        a validated deck, e.g. the 40 mm topping over ribs that a solid slab's 50 mm
        minimum would refuse)."""
        out = copy.copy(self)
        for name, value in values.items():
            object.__setattr__(out, name, value)
        return out

    def over_ribs(self) -> Deck:
        """The concrete over the ribs of a profiled (composite) deck as a solid slab:
        thickness − rib_height, m, with the same cover, bars and concrete (EN 1994-1-1
        §9.7.6: punching of a composite slab with the depth of concrete over the
        ribs). The deck itself where it has no ribs or is steel."""
        if self.is_steel or self.rib_height <= 0.0:
            return self
        return self._derived(thickness=self.thickness - self.rib_height, rib_height=0.0)

    def hogging_section(self) -> Deck:
        """The deck with its top bars as the tension steel (``rebar_area`` =
        ``top_rebar_area``, m²/m): the section that resists hogging over the beams and
        girders (EN 1992-1-1 §6.1, the same rectangular section with the top bars;
        cover taken as for the bottom bars). The deck itself when steel."""
        if self.is_steel:
            return self
        return self._derived(rebar_area=self.top_rebar_area)

    @property
    def self_weight_pressure(self) -> float:
        """Deck self-weight, Pa: thickness × density × g for concrete; steel depth
        (:attr:`steel_depth`) × 7850 kg/m³ × g for a steel deck."""
        if self.is_steel:
            return self.steel_depth * STEEL_DENSITY * 9.80665
        return self.thickness * self.concrete.density * 9.80665


@dataclass(frozen=True)
class Level:
    """A framed floor or roof level at ``elevation`` (top of deck, m).

    ``column_area`` (m²) and ``column_height`` (m): the steel columns under the level,
    axial springs E·A/L under a drop over a column; ``None`` takes the stated defaults
    of ``droprig.solver.crushing`` (stiff: a higher force).

    ``occupied_below``: whether the space under this level's deck (the level below)
    is occupied or open to people during the lift. Default ``True``, the safe side:
    concrete scabbing off the soffit over an occupied level below makes the permit
    keep that area clear (or ask for a catch deck); over an unoccupied one it is a
    note. A perforating drop always names the level below as an exclusion area."""

    id: str
    name: str
    elevation: float
    grid: ColumnGrid
    members: tuple[Member, ...]
    deck: Deck = field(default_factory=Deck)
    superimposed_dead: float = 1000.0
    live_in_place: float = 0.0
    column_area: float | None = None
    column_height: float | None = None
    occupied_below: bool = True

    def __post_init__(self) -> None:
        check_text("level.id", self.id, required=True, max_len=32)
        if not isinstance(self.occupied_below, bool):
            raise ModelError(f"level {self.id}.occupied_below", self.occupied_below,
                             "true or false (is the level below occupied or open to "
                             "people during the lift?)")
        if self.column_area is not None:
            check_range(f"level {self.id}.column_area", self.column_area, 1e-3, 1.0, unit="m²")
        if self.column_height is not None:
            check_range(f"level {self.id}.column_height", self.column_height, 1.0, 30.0,
                        unit="m")
        check_text(f"level {self.id}.name", self.name)
        check_range(f"level {self.id}.elevation", self.elevation, -500.0, 1000.0, unit="m")
        check_range(f"level {self.id}.superimposed_dead", self.superimposed_dead, 0.0, 50e3,
                    unit="Pa")
        check_range(f"level {self.id}.live_in_place", self.live_in_place, 0.0, 50e3, unit="Pa")
        if len(self.members) > bounds.MAX_MEMBERS_PER_LEVEL:
            raise ModelError(f"level {self.id}.members", len(self.members),
                             f"at most {bounds.MAX_MEMBERS_PER_LEVEL:,} members on one level")
        dup = _repeated(m.id for m in self.members)
        if dup is not None:
            raise ModelError(f"level {self.id}.members", dup, "unique member ids")

    def member(self, member_id: str) -> Member:
        for m in self.members:
            if m.id == member_id:
                return m
        raise KeyError(member_id)


@dataclass(frozen=True)
class LiftLoad:
    """A load (or a rigging item) that could drop.

    Give either ``drop_height`` (m, the load's underside above the finished surface
    — top of deck — of the zone's level) or ``hook_elevation`` (m, same datum as
    level elevations) with ``hang_length`` from the hook to the load's underside;
    both mean the same height (drop height = hook elevation − hang length − level
    elevation), droprig's one datum. Over a pad or mat the load falls that height
    less the pad's thickness. Footprint is the plan contact size of the load's
    underside, m.

    ``contact_stiffness`` (N/m): stiffness of the load's own underside where it
    strikes — skid, base frame, timber dunnage or bearers — acting in series with
    the deck and the framing (springs in series, Gere §9.10 energy method:
    1/k_eff = Σ 1/k). ``None`` takes the load as rigid, which gives the highest
    impact force (conservative).

    Local damage of the deck by a hard item is checked for it striking flat, on
    an edge and on a corner (``strike_orientations``); ``edge_width`` (m) is the
    bearing width of its edges (a flange or plate thickness). Restricting the
    orientations (e.g. a spreader that cannot land on a corner) needs a
    ``strike_reason``, which the annex prints. ``hard``: whether the item is a
    hard object for local damage; ``None`` decides by kind — a rigging item
    (spreader, shackle, hook block) with no declared soft underside is hard, a load
    is not (its own structure crushes first; common practice, no source).
    """

    name: str
    mass: float
    footprint_length: float = 1.0
    footprint_width: float = 1.0
    drop_height: float | None = 1.0
    hook_elevation: float | None = None
    hang_length: float = 0.0
    kind: LoadKind = "load"
    contact_stiffness: float | None = None
    strike_orientations: tuple[StrikeOrientation, ...] = ("flat", "edge", "corner")
    strike_reason: str = ""
    edge_width: float = 0.02
    hard: bool | None = None
    mass_source: MassSource | None = None
    """Where ``mass`` comes from (:data:`~droprig.model.permit_data.MASS_SOURCES`);
    None: not recorded."""

    def __post_init__(self) -> None:
        check_text("load.name", self.name, required=True, max_len=64)
        check_mass_source(self)
        check_range(f"load {self.name}.mass", self.mass, 1.0, 500_000.0, unit="kg")
        check_range(f"load {self.name}.footprint_length", self.footprint_length, 0.01, 30.0,
                    unit="m")
        check_range(f"load {self.name}.footprint_width", self.footprint_width, 0.01, 30.0,
                    unit="m")
        check_choice(f"load {self.name}.kind", self.kind, ("load", "rigging"))
        if (self.drop_height is None) == (self.hook_elevation is None):
            raise ModelError(f"load {self.name}.drop_height", self.drop_height,
                             "either a drop height or a hook elevation, not both")
        if self.drop_height is not None:
            check_range(f"load {self.name}.drop_height", self.drop_height, 0.0, 200.0, unit="m")
        if self.hook_elevation is not None:
            check_range(f"load {self.name}.hook_elevation", self.hook_elevation, -500.0,
                        1500.0, unit="m")
        check_range(f"load {self.name}.hang_length", self.hang_length, 0.0, 200.0, unit="m")
        if self.contact_stiffness is not None:
            check_range(f"load {self.name}.contact_stiffness", self.contact_stiffness,
                        CONTACT_STIFFNESS_RANGE[0], CONTACT_STIFFNESS_RANGE[1], unit="N/m")
        orient = self.strike_orientations
        if not isinstance(orient, tuple) or not orient:
            raise ModelError(f"load {self.name}.strike_orientations", orient,
                             "one or more of " + ", ".join(STRIKE_ORIENTATIONS))
        for o in orient:
            check_choice(f"load {self.name}.strike_orientations", o, STRIKE_ORIENTATIONS)
        if len(set(orient)) != len(orient):
            raise ModelError(f"load {self.name}.strike_orientations", orient,
                             "each orientation once")
        check_text(f"load {self.name}.strike_reason", self.strike_reason, max_len=400)
        if set(orient) != set(STRIKE_ORIENTATIONS) and not self.strike_reason.strip():
            raise ModelError(f"load {self.name}.strike_reason", self.strike_reason,
                             "a reason when not every strike orientation (flat, edge, "
                             "corner) is checked")
        check_range(f"load {self.name}.edge_width", self.edge_width, 0.002, 1.0, unit="m")
        if self.hard is not None and not isinstance(self.hard, bool):
            raise ModelError(f"load {self.name}.hard", self.hard, "true, false or none")

    @property
    def weight(self) -> float:
        """W = M·g, N."""
        return self.mass * 9.80665

    def height_above(self, surface_elevation: float) -> float:
        """Height of the load's underside above the level's finished surface at
        ``surface_elevation`` (m, the level's elevation), ≥ 0: ``drop_height`` as
        given, or hook elevation − hang length − ``surface_elevation``."""
        if self.drop_height is not None:
            return self.drop_height
        assert self.hook_elevation is not None
        h = self.hook_elevation - self.hang_length - surface_elevation
        if h < 0:
            raise ModelError(f"load {self.name}.hook_elevation", self.hook_elevation,
                             f"≥ {surface_elevation + self.hang_length:g} m (load underside "
                             "above the struck surface)", "m")
        return h


@dataclass(frozen=True)
class LiftZone:
    """A crane position and the plan region its load may pass over.

    Region: annulus r_min ≤ r ≤ r_max around the crane centre, slewing
    counter-clockwise from ``slew_start`` to ``slew_end`` (rad, from +x); equal
    angles mod 2π mean a full circle. If ``corridor`` (polygon, ≥ 3 points) is
    given, the region is the sector intersected with the corridor. The region
    is widened by a drift margin for where a released load lands:
    ``drift_mode = "given"`` uses ``drift_margin`` (m) as entered;
    ``"computed"`` works it out (``droprig.solver.drift``) from ``slew_speed``
    (rad/s), ``hoist_speed`` (lowering, m/s), ``radial_speed`` (luffing or
    trolleying, m/s) and the pendulum swing (``swing_angle``, rad, on a rope of
    ``swing_length``, m).
    """

    id: str
    name: str
    level_id: str
    crane: Point
    r_min: float
    r_max: float
    slew_start: float = 0.0
    slew_end: float = 2 * math.pi
    drift_margin: float = 0.5
    corridor: tuple[Point, ...] = ()
    loads: tuple[LiftLoad, ...] = ()
    drift_mode: DriftMode = "given"
    slew_speed: float = 0.0
    hoist_speed: float = 0.0
    radial_speed: float = 0.0
    swing_angle: float = 0.0
    swing_length: float = 0.0
    crane_description: str = ""
    """The crane: type, capacity, owner's or fleet number. Empty: not recorded."""
    crane_configuration: str = ""
    """Boom and jib, counterweight, outrigger or track set-up, duty chart used.
    Empty: not recorded."""
    lift_points: tuple[LiftPoint, ...] = ()
    """Pick-up and set-down points in plan (m)."""

    def __post_init__(self) -> None:
        check_text("zone.id", self.id, required=True, max_len=32)
        check_zone_permit(self)
        check_text(f"zone {self.id}.name", self.name)
        check_text(f"zone {self.id}.level_id", self.level_id, required=True)
        _check_point(f"zone {self.id}.crane", self.crane)
        check_range(f"zone {self.id}.r_min", self.r_min, 0.0, 200.0, unit="m")
        check_range(f"zone {self.id}.r_max", self.r_max, 0.5, 200.0, unit="m")
        if self.r_max <= self.r_min:
            raise ModelError(f"zone {self.id}.r_max", self.r_max,
                             f"> r_min = {self.r_min:g} m", "m")
        check_finite(f"zone {self.id}.slew_start", self.slew_start, "rad")
        check_finite(f"zone {self.id}.slew_end", self.slew_end, "rad")
        check_range(f"zone {self.id}.drift_margin", self.drift_margin, 0.0, 20.0, unit="m")
        if len(self.loads) > bounds.MAX_LOADS_PER_ZONE:
            raise ModelError(f"zone {self.id}.loads", len(self.loads),
                             f"at most {bounds.MAX_LOADS_PER_ZONE} loads in one lift zone")
        if len(self.corridor) > bounds.MAX_CORRIDOR_CORNERS:
            raise ModelError(f"zone {self.id}.corridor", len(self.corridor),
                             f"at most {bounds.MAX_CORRIDOR_CORNERS} corners: simplify the "
                             "corridor (a few corners follow a real lift path)")
        check_choice(f"zone {self.id}.drift_mode", self.drift_mode, ("given", "computed"))
        # crane slew up to ~3 rev/min, hoist and radial speeds up to 5 m/s
        # (common practice, no source)
        check_range(f"zone {self.id}.slew_speed", self.slew_speed, 0.0, 0.35, unit="rad/s")
        check_range(f"zone {self.id}.hoist_speed", self.hoist_speed, 0.0, 5.0, unit="m/s")
        check_range(f"zone {self.id}.radial_speed", self.radial_speed, 0.0, 5.0, unit="m/s")
        check_range(f"zone {self.id}.swing_angle", self.swing_angle, 0.0, math.radians(30.0),
                    unit="rad")
        check_range(f"zone {self.id}.swing_length", self.swing_length, 0.0, 300.0, unit="m")
        if self.corridor and len(self.corridor) < 3:
            raise ModelError(f"zone {self.id}.corridor", len(self.corridor),
                             "no corridor, or a polygon of at least 3 points")
        for i, p in enumerate(self.corridor):
            _check_point(f"zone {self.id}.corridor[{i}]", p)
        dup = _repeated(ld.name for ld in self.loads)
        if dup is not None:
            raise ModelError(f"zone {self.id}.loads", dup, "unique load names")

    @property
    def slew_sweep(self) -> float:
        """Counter-clockwise sweep from start to end, rad, in (0, 2π]."""
        sweep = (self.slew_end - self.slew_start) % (2 * math.pi)
        return 2 * math.pi if sweep < 1e-9 else sweep


@dataclass(frozen=True)
class ProtectionArea:
    """A mat or protective layer laid over a rectangle of a level.

    ``spring``: an elastic mat of compression modulus ``modulus`` (Pa), stiffness
    modulus × pressed area / thickness; older projects give ``stiffness`` (N/m, for
    the load's footprint). ``crushable``: a layer that crushes at ``crush_stress``
    (Pa) over the pressed area (the overlap of the load's footprint and the layer)
    through ``crush_stroke`` (m), then bottoms out; older projects give a
    ``crush_force`` (N), read as a stress over the largest declared footprint of the
    level's loads (with a warning).
    ``thickness`` raises the struck surface (reduces the free fall) and spreads
    the load at 1:1 to the deck below (common practice, no source).
    """

    id: str
    name: str
    level_id: str
    area: Rect
    kind: MatKind = "spring"
    thickness: float = 0.2
    stiffness: float | None = 50e6
    crush_force: float | None = None
    crush_stroke: float | None = None
    crush_stress: float | None = None
    modulus: float | None = None

    def __post_init__(self) -> None:
        check_text("protection.id", self.id, required=True, max_len=32)
        check_text(f"protection {self.id}.name", self.name)
        check_text(f"protection {self.id}.level_id", self.level_id, required=True)
        check_choice(f"protection {self.id}.kind", self.kind, ("spring", "crushable"))
        check_range(f"protection {self.id}.thickness", self.thickness, 0.0, 3.0, unit="m")
        if self.kind == "spring":
            if self.modulus is not None:
                check_range(f"protection {self.id}.modulus", self.modulus, 1e4, 1e11,
                            unit="Pa")
                if self.thickness <= 0.0:
                    raise ModelError(f"protection {self.id}.thickness", self.thickness,
                                     "> 0 m for a mat given by its modulus", "m")
            elif self.stiffness is None:
                raise ModelError(f"protection {self.id}.stiffness", None,
                                 "> 0 N/m for a spring mat (or give its modulus)")
            if self.stiffness is not None:
                check_range(f"protection {self.id}.stiffness", self.stiffness, 1e3, 1e12,
                            unit="N/m")
        else:
            if (self.crush_force is None and self.crush_stress is None) \
                    or self.crush_stroke is None:
                raise ModelError(f"protection {self.id}.crush_stress", self.crush_stress,
                                 "a crush stress and a crush stroke for a crushable layer")
            if self.crush_stress is not None:
                check_range(f"protection {self.id}.crush_stress", self.crush_stress, 1e3,
                            1e8, unit="Pa")
            if self.crush_force is not None:
                check_range(f"protection {self.id}.crush_force", self.crush_force, 1e2, 1e8,
                            unit="N")
            check_range(f"protection {self.id}.crush_stroke", self.crush_stroke, 1e-3, 3.0,
                        unit="m")


def uncovered_area(whole: Rect, parts: Iterable[Rect]) -> float:
    """Plan area (m²) of ``whole`` that no rectangle of ``parts`` covers.

    A = Σ over the cells of ``whole`` cut at every x and y edge of the parts
    (coordinate compression) of the cells that lie in no part: exact for axis-aligned
    rectangles (plane geometry; common practice, no source). O(n³) in the number of
    parts — a bay meets a handful of pads."""
    clip = [(max(r.x0, whole.x0), max(r.y0, whole.y0), min(r.x1, whole.x1),
             min(r.y1, whole.y1)) for r in parts]
    clip = [c for c in clip if c[2] > c[0] and c[3] > c[1]]
    xs = sorted({whole.x0, whole.x1, *(c[0] for c in clip), *(c[2] for c in clip)})
    ys = sorted({whole.y0, whole.y1, *(c[1] for c in clip), *(c[3] for c in clip)})
    left = 0.0
    for xa, xb in itertools.pairwise(xs):
        for ya, yb in itertools.pairwise(ys):
            xm, ym = 0.5 * (xa + xb), 0.5 * (ya + yb)
            if not any(c[0] <= xm <= c[2] and c[1] <= ym <= c[3] for c in clip):
                left += (xb - xa) * (yb - ya)
    return left


def pads_above(pads: Iterable[ProtectionArea], rect: Rect,
               height: float) -> tuple[ProtectionArea, ...]:
    """The pads and mats of ``pads`` that lie on ``rect`` (overlap it with an area)
    and whose top — their ``thickness``, m above the finished surface — stands at or
    above ``height`` (m on the same datum): a load whose underside is kept to that
    height cannot pass over them there (common practice, no source)."""
    return tuple(pa for pa in pads
                 if pa.thickness >= height
                 and min(pa.area.x1, rect.x1) - max(pa.area.x0, rect.x0) > GEOMETRY_TOL
                 and min(pa.area.y1, rect.y1) - max(pa.area.y0, rect.y0) > GEOMETRY_TOL)


def limit_is_practical(pads: Iterable[ProtectionArea], rect: Rect,
                       height: float) -> bool:
    """Whether a drop-height limit ``height`` (m above the finished surface) can be
    kept over the bay ``rect``: yes unless the pads whose top stands at or above it
    (:func:`pads_above`) cover the whole bay. Where they cover part of it, the load
    is kept off them there and the limit holds over the rest (a pad reaching a
    0.3 m lip into a neighbouring bay took away that bay's limit: the steel demo's
    plywood pad over 3-4/B-C kept the joist bundle off five bays around it).
    One rule for the solver's bay summary and the permit. Common practice, no
    source: a pad standing above the limit is an obstacle to carry the load round,
    not a reason to keep it off the bay."""
    above = pads_above(pads, rect, height)
    return not above or uncovered_area(rect, (pa.area for pa in above)) > \
        GEOMETRY_TOL * max(rect.width * rect.height, 1.0)


@dataclass(frozen=True)
class Project:
    info: ProjectInfo = field(default_factory=ProjectInfo)
    settings: Settings = field(default_factory=Settings)
    levels: tuple[Level, ...] = ()
    lift_zones: tuple[LiftZone, ...] = ()
    protection_areas: tuple[ProtectionArea, ...] = ()

    def __post_init__(self) -> None:
        bounds.check_counts(self)
        level_ids = [lv.id for lv in self.levels]
        known = set(level_ids)
        for kind, ids in (("levels", level_ids), ("lift_zones", [z.id for z in self.lift_zones]),
                          ("protection_areas", [p.id for p in self.protection_areas])):
            dup = _repeated(ids)
            if dup is not None:
                raise ModelError(kind, dup, "unique ids")
        for z in self.lift_zones:
            if z.level_id not in known:
                raise ModelError(f"zone {z.id}.level_id", z.level_id,
                                 "the id of a level: " + ", ".join(level_ids))
        for p in self.protection_areas:
            if p.level_id not in known:
                raise ModelError(f"protection {p.id}.level_id", p.level_id,
                                 "the id of a level: " + ", ".join(level_ids))
        bounds.check_drop_points(self)

    def level(self, level_id: str) -> Level:
        for lv in self.levels:
            if lv.id == level_id:
                return lv
        raise KeyError(level_id)

    def zone(self, zone_id: str) -> LiftZone:
        for z in self.lift_zones:
            if z.id == zone_id:
                return z
        raise KeyError(zone_id)

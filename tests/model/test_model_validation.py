"""Every model constructor refuses a bad value with a ModelError naming the
field, the value and the allowed range.

Source of the limits: the ranges are droprig's statement of what it can
assess (docstrings of droprig/model/*.py); where a limit has an outside basis
it is named beside the row. Physical-sign limits (a span, a mass, a thickness
must be positive) are common practice, no source.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import replace

import pytest

from droprig.model import (
    ColumnGrid,
    Concrete,
    Deck,
    Grade,
    Level,
    LiftLoad,
    LiftZone,
    Member,
    ModelError,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Section,
    Settings,
    generate_level,
)

# A valid object of each kind (invented inputs, not check values).
SEC = Section("T300", "custom", 0.30, 0.15, 0.0071, 0.0107, 0.015, 5.38e-3, 8.356e-5,
              5.57e-4, 6.28e-4, 6.04e-6, 42.2)
GRADE = Grade("T355", "EN", ((0.016, 355e6), (0.040, 345e6)), 470e6, 210e9)
GRID = ColumnGrid((0.0, 6.0), (0.0, 8.0), ("1", "2"), ("A", "B"))
MEMBER = Member("B1", "beam", (0.0, 0.0), (0.0, 8.0), SEC, GRADE)
LEVEL = Level("L1", "Level 1", 3.5, GRID, (MEMBER,))
LOAD = LiftLoad("crate", 500.0, 1.0, 1.0, 1.0)
ZONE = LiftZone("Z1", "crane", "L1", (-5.0, 4.0), 2.0, 15.0, loads=(LOAD,))
MAT = ProtectionArea("P1", "mat", "L1", Rect(0.0, 0.0, 6.0, 8.0))
CRUSH = ProtectionArea("P2", "pad", "L1", Rect(0.0, 0.0, 6.0, 8.0), "crushable", 0.1, None,
                       20e3, 0.05)

Case = tuple[Callable[[], object], str, str]

CASES: dict[str, Case] = {
    # ---- Rect: plan coordinates within ±10 km of the origin; positive width and height
    "rect.x0 far": (lambda: Rect(-2e4, 0.0, 1.0, 1.0), "rect.x0", "≥ -10000 m and ≤ 10000 m"),
    "rect.x1 <= x0": (lambda: Rect(2.0, 0.0, 1.0, 1.0), "rect.x1", "> x0 = 2 m"),
    "rect.y1 <= y0": (lambda: Rect(0.0, 1.0, 1.0, 1.0), "rect.y1", "> y0 = 1 m"),
    "rect nan": (lambda: Rect(math.nan, 0.0, 1.0, 1.0), "rect.x0", "a finite number"),
    "rect text": (lambda: Rect("0", 0.0, 1.0, 1.0), "rect.x0", "a number"),  # type: ignore[arg-type]
    # ---- ProjectInfo
    "info.name empty": (lambda: ProjectInfo("  "), "info.name", "non-empty text"),
    "info.site not text": (lambda: ProjectInfo("x", site=3), "info.site", "text"),  # type: ignore[arg-type]
    "info.date long": (lambda: ProjectInfo("x", date="d" * 201), "info.date",
                       "at most 200 characters"),
    "info.description long": (lambda: ProjectInfo("x", description="d" * 4001),
                              "info.description", "at most 4000 characters"),
    # ---- Settings
    "unit_system": (lambda: Settings(unit_system="metric"), "settings.unit_system",  # type: ignore[arg-type]
                    "one of SI, US"),
    "design_basis": (lambda: Settings(design_basis="bs5950"), "settings.design_basis",  # type: ignore[arg-type]
                     "one of aisc360, en1993"),
    # φ ≤ 1 by definition of a resistance factor (AISC 360-16 §B3.1)
    "resistance_factor": (lambda: Settings(resistance_factor=1.1), "settings.resistance_factor",
                          "≥ 0.5 and ≤ 1"),
    # a dynamic increase factor below 1 would be a decrease (UFC 3-340-02 §2-13, from memory)
    "dynamic_increase_factor": (lambda: Settings(dynamic_increase_factor=0.9),
                                "settings.dynamic_increase_factor", "≥ 1 and ≤ 2"),
    "deflection_limit_ratio": (lambda: Settings(deflection_limit_ratio=50.0),
                               "settings.deflection_limit_ratio", "≥ 60 and ≤ 2000"),
    "ductility_limit": (lambda: Settings(ductility_limit=0.5), "settings.ductility_limit",
                        "≥ 1 and ≤ 30"),
    "rotation_limit": (lambda: Settings(rotation_limit=math.radians(20.0)),
                       "settings.rotation_limit", "≥ 0.00174533 rad and ≤ 0.261799 rad"),
    "grid_resolution": (lambda: Settings(grid_resolution=0.01), "settings.grid_resolution",
                        "≥ 0.05 m and ≤ 5 m"),
    "include_member_mass": (lambda: Settings(include_member_mass="yes"),  # type: ignore[arg-type]
                            "settings.include_member_mass", "true or false"),
    # ---- ColumnGrid
    "grid one line": (lambda: ColumnGrid((0.0,), (0.0, 8.0), ("1",), ("A", "B")),
                      "grid.x_lines", "at least 2 grid lines"),
    "grid 61 lines": (lambda: ColumnGrid(tuple(float(i) for i in range(61)), (0.0, 8.0),
                                         tuple(str(i) for i in range(61)), ("A", "B")),
                      "grid.x_lines", "at most 60 grid lines"),
    "grid labels count": (lambda: ColumnGrid((0.0, 6.0), (0.0, 8.0), ("1",), ("A", "B")),
                          "grid.x_labels", "one label per grid line (2)"),
    "grid gap small": (lambda: ColumnGrid((0.0, 0.4), (0.0, 8.0), ("1", "2"), ("A", "B")),
                       "grid.x_lines[1]", "0.5 m to 60 m after the previous line (0 m)"),
    "grid decreasing": (lambda: ColumnGrid((0.0, 6.0), (8.0, 0.0), ("1", "2"), ("A", "B")),
                        "grid.y_lines[1]", "0.5 m to 60 m after the previous line (8 m)"),
    "grid labels repeat": (lambda: ColumnGrid((0.0, 6.0), (0.0, 8.0), ("1", "1"), ("A", "B")),
                           "grid.x_labels", "unique labels"),
    "grid label long": (lambda: ColumnGrid((0.0, 6.0), (0.0, 8.0), ("1", "123456789"),
                                           ("A", "B")),
                        "grid.x_labels[1]", "at most 8 characters"),
    # ---- Member
    "member id empty": (lambda: replace(MEMBER, id=""), "member.id", "non-empty text"),
    "member role": (lambda: replace(MEMBER, role="joist"), "member B1.role",
                    "one of girder, beam"),
    "member end condition": (lambda: replace(MEMBER, end_condition="hinged"),
                             "member B1.end_condition",
                             "one of simple, fixed, propped, cantilever"),
    "member span short": (lambda: replace(MEMBER, end=(0.0, 0.4)), "member B1.span",
                          "0.5 m to 60 m"),
    "member span long": (lambda: replace(MEMBER, end=(0.0, 61.0)), "member B1.span",
                         "0.5 m to 60 m"),
    "member diagonal": (lambda: replace(MEMBER, end=(3.0, 4.0)), "member B1.end",
                        "a member parallel to the x or y axis"),
    "member start not a pair": (lambda: replace(MEMBER, start=(0.0, 0.0, 0.0)),
                                "member B1.start", "a pair (x, y) of numbers in m"),
    "member start far": (lambda: replace(MEMBER, start=(0.0, -2e4)), "member B1.start.y",
                         "≥ -10000 m and ≤ 10000 m"),
    # ---- Deck and Concrete
    "deck kind": (lambda: Deck(kind="timber"),  # type: ignore[arg-type]
                  "deck.kind", "one of composite, solid_slab, steel_plate, grating"),
    "deck thin": (lambda: Deck(thickness=0.04), "deck.thickness", "≥ 0.05 m and ≤ 0.6 m"),
    "deck cover small": (lambda: Deck(cover=0.005), "deck.cover", "≥ 0.01 m and ≤ 0.1 m"),
    # bottom bars must sit in the lower half of the slab (common practice, no source)
    "deck cover vs thickness": (lambda: Deck(thickness=0.1, cover=0.06), "deck.cover",
                                "< thickness/2 = 0.05 m"),
    "deck rebar": (lambda: Deck(rebar_area=1e-5), "deck.rebar_area",
                   "≥ 5e-05 m²/m and ≤ 0.005 m²/m"),
    "concrete fc": (lambda: Concrete(fc=10e6), "deck.concrete.fc",
                    "≥ 1.5e+07 Pa and ≤ 1e+08 Pa"),
    "concrete density": (lambda: Concrete(density=3000.0), "deck.concrete.density",
                         "≥ 1400 kg/m³ and ≤ 2600 kg/m³"),
    "concrete fy_rebar": (lambda: Concrete(fy_rebar=100e6), "deck.concrete.fy_rebar",
                          "≥ 2e+08 Pa and ≤ 7e+08 Pa"),
    # ---- Level
    "level id": (lambda: replace(LEVEL, id=""), "level.id", "non-empty text"),
    "level elevation": (lambda: replace(LEVEL, elevation=2000.0), "level L1.elevation",
                        "≥ -500 m and ≤ 1000 m"),
    "level sdl negative": (lambda: replace(LEVEL, superimposed_dead=-1.0),
                           "level L1.superimposed_dead", "≥ 0 Pa and ≤ 50000 Pa"),
    "level live": (lambda: replace(LEVEL, live_in_place=60e3), "level L1.live_in_place",
                   "≥ 0 Pa and ≤ 50000 Pa"),
    "level duplicate members": (lambda: replace(LEVEL, members=(MEMBER, MEMBER)),
                                "level L1.members", "unique member ids"),
    # ---- LiftLoad
    "load name": (lambda: replace(LOAD, name=" "), "load.name", "non-empty text"),
    "load mass": (lambda: replace(LOAD, mass=0.5), "load crate.mass",
                  "≥ 1 kg and ≤ 500000 kg"),
    "load footprint length": (lambda: replace(LOAD, footprint_length=0.0),
                              "load crate.footprint_length", "≥ 0.01 m and ≤ 30 m"),
    "load footprint width": (lambda: replace(LOAD, footprint_width=31.0),
                             "load crate.footprint_width", "≥ 0.01 m and ≤ 30 m"),
    "load kind": (lambda: replace(LOAD, kind="crate"), "load crate.kind",
                  "one of load, rigging"),
    "load both heights": (lambda: replace(LOAD, hook_elevation=20.0), "load crate.drop_height",
                          "either a drop height or a hook elevation, not both"),
    "load no height": (lambda: replace(LOAD, drop_height=None), "load crate.drop_height",
                       "either a drop height or a hook elevation, not both"),
    "load drop negative": (lambda: replace(LOAD, drop_height=-0.1), "load crate.drop_height",
                           "≥ 0 m and ≤ 200 m"),
    "load hook": (lambda: replace(LOAD, drop_height=None, hook_elevation=2000.0),
                  "load crate.hook_elevation", "≥ -500 m and ≤ 1500 m"),
    "load hang": (lambda: replace(LOAD, hang_length=-1.0), "load crate.hang_length",
                  "≥ 0 m and ≤ 200 m"),
    # ---- LiftZone
    "load strike orientation": (lambda: replace(LOAD, strike_orientations=("upside",)),
                                "load crate.strike_orientations", "one of flat, edge, corner"),
    "load strike none": (lambda: replace(LOAD, strike_orientations=()),
                         "load crate.strike_orientations", "one or more of flat, edge, corner"),
    "load strike twice": (lambda: replace(LOAD, strike_orientations=("flat", "flat"),
                                          strike_reason="x"),
                          "load crate.strike_orientations", "each orientation once"),
    "load strike reason": (lambda: replace(LOAD, strike_orientations=("flat", "edge")),
                           "load crate.strike_reason",
                           "a reason when not every strike orientation (flat, edge, corner) "
                           "is checked"),
    "load edge width": (lambda: replace(LOAD, edge_width=0.001), "load crate.edge_width",
                        "≥ 0.002 m and ≤ 1 m"),
    "load hard": (lambda: replace(LOAD, hard="yes"), "load crate.hard", "true, false or none"),
    "zone drift mode": (lambda: replace(ZONE, drift_mode="guess"), "zone Z1.drift_mode",
                        "one of given, computed"),
    "zone slew speed": (lambda: replace(ZONE, slew_speed=1.0), "zone Z1.slew_speed",
                        "≥ 0 rad/s and ≤ 0.35 rad/s"),
    "zone hoist speed": (lambda: replace(ZONE, hoist_speed=-1.0), "zone Z1.hoist_speed",
                         "≥ 0 m/s and ≤ 5 m/s"),
    "zone radial speed": (lambda: replace(ZONE, radial_speed=6.0), "zone Z1.radial_speed",
                          "≥ 0 m/s and ≤ 5 m/s"),
    "zone swing angle": (lambda: replace(ZONE, swing_angle=1.0), "zone Z1.swing_angle",
                         "≥ 0 rad and ≤ 0.523599 rad"),
    "zone swing length": (lambda: replace(ZONE, swing_length=400.0), "zone Z1.swing_length",
                          "≥ 0 m and ≤ 300 m"),
    "zone id": (lambda: replace(ZONE, id=""), "zone.id", "non-empty text"),
    "zone level id": (lambda: replace(ZONE, level_id=""), "zone Z1.level_id", "non-empty text"),
    "zone r_min": (lambda: replace(ZONE, r_min=-1.0), "zone Z1.r_min", "≥ 0 m and ≤ 200 m"),
    "zone r_max": (lambda: replace(ZONE, r_min=0.0, r_max=0.4), "zone Z1.r_max",
                   "≥ 0.5 m and ≤ 200 m"),
    "zone r_max <= r_min": (lambda: replace(ZONE, r_max=2.0), "zone Z1.r_max",
                            "> r_min = 2 m"),
    "zone slew nan": (lambda: replace(ZONE, slew_start=math.nan), "zone Z1.slew_start",
                      "a finite number"),
    "zone drift": (lambda: replace(ZONE, drift_margin=25.0), "zone Z1.drift_margin",
                   "≥ 0 m and ≤ 20 m"),
    "zone corridor two points": (lambda: replace(ZONE, corridor=((0.0, 0.0), (1.0, 1.0))),
                                 "zone Z1.corridor",
                                 "no corridor, or a polygon of at least 3 points"),
    "zone corridor far": (lambda: replace(ZONE, corridor=((0.0, 0.0), (2e4, 0.0), (1.0, 1.0))),
                          "zone Z1.corridor[1].x", "≥ -10000 m and ≤ 10000 m"),
    "zone crane not a pair": (lambda: replace(ZONE, crane=(1.0,)), "zone Z1.crane",
                              "a pair (x, y) of numbers in m"),
    "zone duplicate loads": (lambda: replace(ZONE, loads=(LOAD, LOAD)), "zone Z1.loads",
                             "unique load names"),
    # ---- ProtectionArea
    "mat kind": (lambda: replace(MAT, kind="foam"), "protection P1.kind",
                 "one of spring, crushable"),
    "mat thickness": (lambda: replace(MAT, thickness=4.0), "protection P1.thickness",
                      "≥ 0 m and ≤ 3 m"),
    # the message now names the modulus, the other way to describe a mat (pads by area)
    "mat no stiffness": (lambda: replace(MAT, stiffness=None), "protection P1.stiffness",
                         "> 0 N/m for a spring mat (or give its modulus)"),
    "mat modulus": (lambda: replace(MAT, modulus=10.0), "protection P1.modulus",
                    "≥ 10000 Pa and ≤ 1e+11 Pa"),
    "mat modulus no thickness": (lambda: replace(MAT, modulus=2e6, thickness=0.0),
                                 "protection P1.thickness", "> 0 m for a mat given by its modulus"),
    "mat stiffness": (lambda: replace(MAT, stiffness=10.0), "protection P1.stiffness",
                      "≥ 1000 N/m and ≤ 1e+12 N/m"),
    # a crushable layer is now described by its crush stress (pads by area); an older
    # crush force is still read, so the message asks for the stress
    "crush no force": (lambda: replace(CRUSH, crush_force=None), "protection P2.crush_stress",
                       "a crush stress and a crush stroke for a crushable layer"),
    "crush stress": (lambda: replace(CRUSH, crush_stress=10.0), "protection P2.crush_stress",
                     "≥ 1000 Pa and ≤ 1e+08 Pa"),
    "crush force": (lambda: replace(CRUSH, crush_force=10.0), "protection P2.crush_force",
                    "≥ 100 N and ≤ 1e+08 N"),
    "crush stroke": (lambda: replace(CRUSH, crush_stroke=5.0), "protection P2.crush_stroke",
                     "≥ 0.001 m and ≤ 3 m"),
    # ---- Deck, Member, Level fields for the slab and composite physics
    "deck rib height": (lambda: replace(LEVEL.deck, rib_height=0.3), "deck.rib_height",
                        "≥ 0 m and ≤ 0.25 m"),
    "deck topping": (lambda: replace(LEVEL.deck, thickness=0.1, rib_height=0.07),
                     "deck.rib_height", "≤ thickness − 0.04 m = 0.06 m (at least 40 mm of "
                     "concrete over the ribs)"),
    "deck top bars": (lambda: replace(LEVEL.deck, top_rebar_area=-1e-4), "deck.top_rebar_area",
                      "≥ 0 m²/m and ≤ 0.005 m²/m"),
    "member composite flag": (lambda: replace(LEVEL.members[0], composite="yes"),
                              f"member {LEVEL.members[0].id}.composite", "true or false"),
    "member connection": (lambda: replace(LEVEL.members[0], connection_capacity=10.0),
                          f"member {LEVEL.members[0].id}.connection_capacity",
                          "≥ 1000 N and ≤ 1e+08 N"),
    "level column area": (lambda: replace(LEVEL, column_area=5.0), "level L1.column_area",
                          "≥ 0.001 m² and ≤ 1 m²"),
    "level column height": (lambda: replace(LEVEL, column_height=0.2), "level L1.column_height",
                            "≥ 1 m and ≤ 30 m"),
    # ---- Project: ids unique, references resolve
    "project levels repeat": (lambda: Project(levels=(LEVEL, LEVEL)), "levels", "unique ids"),
    "project zone level": (lambda: Project(levels=(LEVEL,),
                                           lift_zones=(replace(ZONE, level_id="L9"),)),
                           "zone Z1.level_id", "the id of a level: L1"),
    "project mat level": (lambda: Project(levels=(LEVEL,),
                                          protection_areas=(replace(MAT, level_id="L9"),)),
                          "protection P1.level_id", "the id of a level: L1"),
    # ---- Section and Grade
    "section depth": (lambda: replace(SEC, d=0.0), "section T300.d", "> 0"),
    "section root radius": (lambda: replace(SEC, r=-0.001), "section T300.r", "≥ 0 m"),
    "section flanges deeper than the section": (lambda: replace(SEC, tf=0.16), "section T300.tf",
                                                "< d/2 = 0.15 m"),
    "section web wider than flange": (lambda: replace(SEC, tw=0.2), "section T300.tw",
                                      "< bf = 0.15 m"),
    "section Zx": (lambda: replace(SEC, Zx=-1.0), "section T300.Zx", "> 0"),
    "grade no steps": (lambda: replace(GRADE, fy_steps=()), "grade T355.fy_steps",
                       "at least one step"),
    "grade fy": (lambda: replace(GRADE, fy_steps=((0.016, 50e6),)), "grade T355.fy",
                 "≥ 1e+08 Pa and ≤ 1e+09 Pa"),
    "grade fu": (lambda: replace(GRADE, fu=3000e6), "grade T355.fu",
                 "≥ 1e+08 Pa and ≤ 2e+09 Pa"),
    # E of structural steel: 200 GPa (AISC 360-16 §B4), 210 GPa (EN 1993-1-1 §3.2.6)
    "grade E": (lambda: replace(GRADE, E=100e9), "grade T355.E",
                "≥ 1.5e+11 Pa and ≤ 2.5e+11 Pa"),
}


def _gen(**over: object) -> Level:
    kw: dict[str, object] = dict(
        level_id="L1", name="", elevation=0.0, x_spacings=(6.0,), y_spacings=(8.0,),
        girder_direction="x", beam_spacing=3.0, girder_section=SEC, beam_section=SEC,
        girder_grade=GRADE, beam_grade=GRADE)
    kw.update(over)
    return generate_level(**kw)  # type: ignore[arg-type]


CASES.update({
    "generator beam spacing": (lambda: _gen(beam_spacing=0.2), "generator.beam_spacing",
                               "≥ 0.5 m and ≤ 10 m"),
    "generator no bays": (lambda: _gen(x_spacings=()), "generator.spacings",
                          "at least one bay each way"),
    "generator spacing": (lambda: _gen(y_spacings=(8.0, 70.0)), "generator.y_spacings[1]",
                          "≥ 0.5 m and ≤ 60 m"),
})


@pytest.mark.parametrize("build, field, allowed", CASES.values(), ids=list(CASES))
def test_constructor_refuses_bad_value(build: Callable[[], object], field: str,
                                       allowed: str) -> None:
    with pytest.raises(ModelError) as info:
        build()
    err = info.value
    assert err.field == field
    assert err.allowed == allowed
    text = str(err)
    assert text.startswith(f"{field}: ") and f"allowed: {allowed}" in text


def test_model_error_message_carries_the_unit() -> None:
    with pytest.raises(ModelError) as info:
        replace(LOAD, mass=0.5)
    assert str(info.value) == ("load crate.mass: 0.5 kg is not allowed; "
                               "allowed: ≥ 1 kg and ≤ 500000 kg")
    assert info.value.value == 0.5 and info.value.unit == "kg"


def test_model_error_is_a_value_error() -> None:
    # The edges catch ValueError for all bad input (droprig/commands/__init__.py).
    assert issubclass(ModelError, ValueError)


@pytest.mark.parametrize("edge", [0.5, 60.0])
def test_span_limits_are_inclusive(edge: float) -> None:
    assert replace(MEMBER, end=(0.0, edge)).span == edge


def test_hook_elevation_below_the_struck_surface_is_refused() -> None:
    load = LiftLoad("crate", 500.0, drop_height=None, hook_elevation=10.0, hang_length=3.0)
    # free fall = hook − hang − surface (geometry, common practice, no source)
    assert load.height_above(5.0) == pytest.approx(2.0, abs=1e-12)
    with pytest.raises(ModelError) as info:
        load.height_above(8.0)
    assert info.value.field == "load crate.hook_elevation"
    assert "≥ 11 m" in info.value.allowed


def test_weight_uses_standard_gravity() -> None:
    # g_n = 9.80665 m/s² (3rd CGPM 1901; ISO 80000-3)
    assert LOAD.weight == pytest.approx(500.0 * 9.80665, rel=1e-15)


def test_deck_self_weight_pressure() -> None:
    # q = t·ρ·g_n (g_n from the 3rd CGPM 1901): 0.13 m × 2400 kg/m³ × 9.80665 m/s²
    assert Deck().self_weight_pressure == pytest.approx(0.13 * 2400.0 * 9.80665, rel=1e-12)


@pytest.mark.parametrize("start_deg, end_deg, sweep_deg", [
    (0.0, 90.0, 90.0),
    (-35.0, 35.0, 70.0),
    (300.0, 30.0, 90.0),   # counter-clockwise through 0°
    (0.0, 360.0, 360.0),   # equal mod 360°: full circle
    (45.0, 45.0, 360.0),
])
def test_slew_sweep_is_counter_clockwise(start_deg: float, end_deg: float,
                                         sweep_deg: float) -> None:
    # plane geometry, angles from +x counter-clockwise (common practice, no source)
    z = replace(ZONE, slew_start=math.radians(start_deg), slew_end=math.radians(end_deg))
    assert math.degrees(z.slew_sweep) == pytest.approx(sweep_deg, abs=1e-9)


@pytest.mark.parametrize("thickness, fy", [(0.010, 355e6), (0.016, 355e6), (0.017, 345e6),
                                           (0.040, 345e6), (0.080, 345e6)])
def test_grade_yield_by_thickness_step(thickness: float, fy: float) -> None:
    # step rule as in EN 10025-2 Table 7 (nominal thickness ≤ 16 mm, ≤ 40 mm); beyond the
    # last step the last value is kept (droprig/model/sections.py docstring)
    assert GRADE.yield_strength(thickness) == fy

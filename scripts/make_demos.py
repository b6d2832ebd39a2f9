"""Regenerate the demo projects in ``demo_projects/``.

    .venv/bin/python scripts/make_demos.py

Both scenarios are invented for demonstration: the buildings, sites, companies
and people are fictional, and the values are plausible inputs, not data from a
real job. They are never used as expected values in tests.
"""

from __future__ import annotations

import dataclasses
import math
import sys
from pathlib import Path

from droprig.io.project_file import save_project
from droprig.io.sections import get_concrete, get_grade, get_section
from droprig.model import (
    Deck,
    LiftLoad,
    LiftPoint,
    LiftZone,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Settings,
    generate_level,
)

OUT = Path(__file__).resolve().parents[1] / "demo_projects"

DECK_AS_SI = 9.0e-4
"""Bottom reinforcement of the SI roof deck, m²/m: the 1.0 mm profiled steel sheet
(about 1300 mm²/m at 350 MPa) acts as the slab's bottom reinforcement; entered as
the equivalent area of 500 MPa bars, 1300 × 350/500 ≈ 900 mm²/m (common practice,
no source)."""

HOOK_CLEAR = 0.8
"""Planned clearance of the air-handling units' underside over the roof deck, m."""
US_CLEAR = 3.0 * 0.3048
WELDER_CLEAR = 2.5 * 0.3048
"""Planned clearance of the welder's skid over the level 3 floor, m (2.5 ft)."""
"""Planned clearance of a pick's underside over the level 3 floor, m (3 ft)."""
AHU_HANG = 5.5
"""Hook to the underside of an air-handling unit (hook block, spreader, slings), m."""

# Exact conversions to SI.
FT = 0.3048
INCH = 0.0254
LB = 0.45359237  # kg
LBF = LB * 9.80665  # N
KIP = 1000.0 * LBF
PSF = LBF / FT**2  # Pa
PSI = LBF / INCH**2  # Pa


def rooftop_plant_swap() -> Project:
    """SI, EN 1993 basis: an air-handling unit swapped on a steel roof by a
    mobile crane standing on the street to the west."""
    s355 = get_grade("S355")
    roof = generate_level(
        level_id="RF", name="Main roof", elevation=18.6,
        x_spacings=(7.5, 7.5, 7.5), y_spacings=(9.0, 9.0),
        girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("HEB 400"), beam_section=get_section("IPE 360"),
        girder_grade=s355, beam_grade=s355,
        deck=Deck("composite", 0.13, get_concrete("C30/37"), 0.025, DECK_AS_SI),
        superimposed_dead=1500.0,  # finishes, insulation, services
        live_in_place=0.0,         # roof closed to other work during the lift
    )
    # The existing AHU plinth bay 2-3/A-B was strengthened when the plant was
    # first installed: heavier infill beams there (edited one by one).
    heavier = get_section("IPE 450")
    members = tuple(
        dataclasses.replace(m, section=heavier)
        if m.role == "beam" and m.id.startswith("B2.") and m.id.endswith("/A-B")
        else m
        for m in roof.members
    )
    roof = dataclasses.replace(roof, members=members)
    # Hook height over the roof is limited by the lift plan: the units travel with
    # their underside HOOK_CLEAR above the roof deck (the hook block, slings and
    # spreader hang above them).
    roof_top = roof.elevation
    hook = roof_top + HOOK_CLEAR + AHU_HANG
    zone = LiftZone(
        id="MC1", name="All-terrain crane on Quayside Road (west)", level_id="RF",
        crane=(-8.0, 9.0), r_min=14.0, r_max=26.0,
        slew_start=math.radians(-35.0), slew_end=math.radians(35.0), drift_margin=1.0,
        loads=(
            # Both units stand on bolted steel channel base rails. Order of magnitude
            # of their contact stiffness: a unit of ~4 t sags a millimetre or two on
            # its own rails when set down, i.e. some 20-40 kN/mm; 25 kN/mm taken for
            # the new unit, 20 kN/mm for the old one (lighter, worn rails)
            # (common practice, no source).
            # Mass sources: the new unit's data plate; the old unit's drained mass
            # is estimated from its schedule less the water in its coils.
            LiftLoad("AHU-3 (new)", 4200.0, 3.0, 2.0, hook_elevation=hook,
                     hang_length=AHU_HANG, drop_height=None, contact_stiffness=2.5e7,
                     mass_source="data_plate"),
            LiftLoad("AHU-3 (old, drained)", 3650.0, 2.8, 1.9, hook_elevation=hook,
                     hang_length=AHU_HANG, drop_height=None, contact_stiffness=2.0e7,
                     mass_source="estimate"),
            # The spreader beam is rigid steel with a small footprint and rides
            # 4 m above the unit's underside: no contact stiffness (rigid).
            LiftLoad("Spreader beam 4 m", 300.0, 4.0, 0.3, hook_elevation=hook,
                     hang_length=AHU_HANG - 4.0, drop_height=None, kind="rigging",
                     mass_source="weighed"),
        ),
        crane_description="90 t all-terrain crane, fleet no. AT90-07 (fictional)",
        crane_configuration=(
            "Main boom 38.4 m, no jib; 26 t counterweight; outriggers fully extended "
            "8.6 m x 8.3 m on 1.2 m x 1.2 m timber outrigger pads; 360° slewing duty chart"),
        # The old unit goes from its plinth (south-west of bay 2-3/A-B) to trailer
        # T2, the new one from trailer T1 onto the plinth (both trailers in the
        # closed lane west of the building).
        lift_points=(
            LiftPoint("pick_up", (10.2, 1.4), "old AHU-3 on the plinth"),
            LiftPoint("set_down", (-17.0, 1.0), "old unit onto trailer T2"),
            LiftPoint("pick_up", (-13.0, -4.0), "new AHU-3 on trailer T1"),
            LiftPoint("set_down", (8.2, 1.4), "new unit onto the plinth"),
        ),
    )
    # Landing bay 2-3/A-B: a crushable pad of timber sleepers over foam blocks laid
    # over the whole bay and 0.3 m past its inner beam lines. Its crush force, 90 kN,
    # stays below the deck's punching and flexural resistance under the spread
    # footprint and below the remaining capacity of the IPE 360 beams at midspan
    # (about 100 kN with the roof's existing load); its stroke absorbs a unit dropped
    # from the planned clearance onto the pad top (0.8 m - 0.5 m = 0.3 m):
    # (F_c - W)·c = W·h gives c = 41 kN × 0.3 m / 49 kN ≈ 0.25 m of the 0.35 m
    # available (energy balance).
    mat = ProtectionArea(
        id="MAT1", name="Timber-and-foam landing pad, bay 2-3/A-B", level_id="RF",
        area=Rect(7.2, 0.0, 15.3, 9.3), kind="crushable", thickness=0.5, stiffness=None,
        crush_force=90e3, crush_stroke=0.35)
    # The units come in over the parapet through bay 1-2/A-B: the same pad there.
    approach = ProtectionArea(
        id="MAT2", name="Timber-and-foam pad, approach bay 1-2/A-B", level_id="RF",
        area=Rect(0.0, 0.0, 7.2, 9.3), kind="crushable", thickness=0.5, stiffness=None,
        crush_force=90e3, crush_stroke=0.35)
    info = ProjectInfo(
        name="Harrowgate Clinic - roof plant replacement",
        site="Harrowgate Clinic, 12 Quayside Road, Port Ellery (fictional)",
        lift_reference="LP-2026-041",
        revision="B",
        date="2026-11-24",
        prepared_by="R. Okonjo, Brightwell Lifting Ltd (fictional)",
        checked_by="S. Lindqvist CEng, Tallow & Vane Structures (fictional)",
        approved_by="M. Haddad, appointed person",
        permit_number="PTW-HC-2026-118",
        lift_plan_revision="C",
        valid_from="2026-12-06 06:00",
        valid_to="2026-12-06 18:00",
        description=(
            "Removal of the existing air-handling unit AHU-3 and placing of its replacement "
            "on the plinth in roof bay 2-3/A-B. 90 t all-terrain crane on outriggers in the "
            "closed lane of Quayside Road. The units come in over the parapet through bay "
            "1-2/A-B and travel with their underside at most 0.8 m above the roof; both "
            "bays of row A-B are covered by timber-and-foam crushable pads. Roof cleared of "
            "people under the swing zone for the duration of the lift; the other bays are "
            "exclusion zones while a load or the spreader beam is over them."),
    )
    settings = Settings(unit_system="SI", design_basis="en1993", grid_resolution=0.5)
    return Project(info, settings, (roof,), (zone,), (mat, approach))


def steel_erection_floor() -> Project:
    """US customary, AISC 360 basis: steel bundles and a welder slewed by a
    crawler crane over a completed floor of a building under construction."""
    a992 = get_grade("ASTM A992")
    bay = 30.0 * FT
    floor = generate_level(
        level_id="L3", name="Level 3", elevation=28.0 * FT,
        x_spacings=(bay, bay, bay), y_spacings=(bay, bay, bay),
        girder_direction="y", beam_spacing=10.0 * FT,
        girder_section=get_section("W24X55"), beam_section=get_section("W21X44"),
        girder_grade=a992, beam_grade=a992,
        # 3.25 in normal-weight topping on 3 in 20 gauge composite deck: 6.25 in
        # total. The deck sheet (about 0.5 in²/ft at 50 ksi) is the slab's bottom
        # reinforcement: entered as the equivalent area of 65 ksi bars,
        # 0.5 × 50/65 ≈ 0.38 in²/ft, with its centroid 1.5 in above the soffit
        # (mid-depth of the ribs) (common practice, no source).
        deck=Deck("composite", 6.25 * INCH,
                  dataclasses.replace(get_concrete("4000 psi"), fy_rebar=65_000 * PSI),
                  1.25 * INCH, 0.38 * INCH**2 / FT),
        superimposed_dead=15.0 * PSF,
        live_in_place=20.0 * PSF,  # construction materials left on the floor
    )
    # Spandrel beams on the south and north edges carry half the tributary
    # width: lighter section (edited one by one).
    y_edges = (floor.grid.y_lines[0], floor.grid.y_lines[-1])
    spandrel = get_section("W16X26")
    members = tuple(
        dataclasses.replace(m, section=spandrel)
        if m.role == "beam" and any(abs(m.start[1] - y) < 1e-9 and abs(m.end[1] - y) < 1e-9
                                    for y in y_edges)
        else m
        for m in floor.members
    )
    floor = dataclasses.replace(floor, members=members)
    # Agreed swing corridor: from the laydown area west of the building, over
    # the middle row of bays, to the hoist landing on the east side.
    corridor = tuple((x * FT, y * FT) for x, y in (
        (-20.0, 25.0), (70.0, 25.0), (70.0, 15.0), (95.0, 15.0),
        (95.0, 75.0), (70.0, 75.0), (70.0, 65.0), (-20.0, 65.0)))
    zone = LiftZone(
        id="CC1", name="Crawler crane at the west laydown", level_id="L3",
        crane=(-45.0 * FT, 45.0 * FT), r_min=30.0 * FT, r_max=140.0 * FT,
        slew_start=math.radians(-40.0), slew_end=math.radians(40.0), drift_margin=2.0 * FT,
        corridor=corridor,
        # The lift plan holds every pick at most US_CLEAR above the level 3 floor
        # while it crosses the building (taglines, a signaller on the floor).
        loads=(
            # Joists banded on two 4x4 timber dunnage sticks: the long, flexible
            # bundle bending between its dunnage and the crushing of the timber make
            # its underside soft, of the order of 30 kip/in (5e6 N/m)
            # (common practice, no source).
            # Mass sources: the bundle from the fabricator's shipping list (drawing),
            # the welder from its data plate, the spreader bar weighed.
            LiftLoad("Joist bundle J-7", 4000.0 * LB, 20.0 * FT, 2.0 * FT, US_CLEAR,
                     contact_stiffness=5e6, mass_source="drawing"),
            # Welder on its steel skid with rubber feet: of the order of 60 kip/in
            # (1e7 N/m) (common practice, no source). Being light and compact it is
            # walked across lower, WELDER_CLEAR above the floor.
            LiftLoad("Engine-driven welder", 1150.0 * LB, 5.0 * FT, 2.5 * FT, WELDER_CLEAR,
                     contact_stiffness=1e7, mass_source="data_plate"),
            # The spreader bar rides 10 ft above the load it carries; solid steel
            # pipe: rigid.
            LiftLoad("Spreader bar 12 ft", 250.0 * LB, 12.0 * FT, 0.5 * FT,
                     US_CLEAR + 10.0 * FT, kind="rigging", mass_source="weighed"),
        ),
        crane_description="110 US ton lattice-boom crawler crane, unit C-3 (fictional)",
        crane_configuration=(
            "Main boom 150 ft, jib stowed; upper counterweight 70,000 lb and carbody "
            "counterweight 20,000 lb; tracks extended, on 4 ft x 20 ft timber crane mats; "
            "standard boom duty chart"),
        lift_points=(
            LiftPoint("pick_up", (-25.0 * FT, 22.0 * FT), "laydown area, west"),
            LiftPoint("set_down", (84.0 * FT, 35.0 * FT), "hoist landing, bay 3-4/B-C"),
        ),
    )
    # Laydown bay 3-4/B-C at the hoist landing: a crushable pad of plywood over EPS
    # foam blocks over the whole bay and 1 ft past its inner beam lines. Crush force
    # 25 kip, below the W21X44 infill beams' remaining flexural capacity at midspan
    # (about 35 kip with the floor's existing load), and 8 in of stroke for a bundle
    # dropped from the planned clearance onto the pad top (3 ft - 1 ft = 2 ft):
    # (F_c - W)·c = W·h gives c = 4 kip × 2 ft / 21 kip ≈ 4.6 in (energy balance).
    pad = ProtectionArea(
        id="PAD1", name="Plywood over EPS foam landing pad, bay 3-4/B-C", level_id="L3",
        area=Rect(59.0 * FT, 29.0 * FT, 90.0 * FT, 61.0 * FT), kind="crushable",
        thickness=12.0 * INCH, stiffness=None, crush_force=25.0 * KIP,
        crush_stroke=8.0 * INCH)
    info = ProjectInfo(
        name="Cedar Fork Logistics Office - steel erection, level 3",
        site="Lot 7, Cedar Fork Business Park, Millbrook (fictional)",
        lift_reference="CF-LP-019",
        revision="A",
        date="2026-10-05",
        prepared_by="D. Alvarez, Ironline Erectors Inc. (fictional)",
        checked_by="K. Brennan PE, North Ridge Engineering (fictional)",
        approved_by="T. Yamada, lift director",
        permit_number="CF-HW-2026-0457",
        lift_plan_revision="2",
        valid_from="2026-10-06",
        valid_to="2026-10-09",
        description=(
            "Crawler crane at the west laydown area slews joist bundles, a welder and its "
            "rigging over the completed level 3 floor to the east hoist landing, where a "
            "crushable plywood-over-foam pad covers bay 3-4/B-C. Bundles travel at most "
            "3 ft, the welder 2.5 ft above the floor. The load path is held to the agreed "
            "corridor by taglines; level 3 is closed to the trades under the corridor "
            "during picks."),
    )
    settings = Settings(unit_system="US", design_basis="aisc360", grid_resolution=2.0 * FT)
    return Project(info, settings, (floor,), (zone,), (pad,))


DEMOS = {
    "rooftop_plant_swap.droprig": rooftop_plant_swap,
    "steel_erection_floor.droprig": steel_erection_floor,
}


def main() -> int:
    OUT.mkdir(exist_ok=True)
    for name, build in DEMOS.items():
        save_project(build(), OUT / name, backup=False)
        print(f"wrote {OUT / name}")
    return 0


if __name__ == "__main__":
    sys.exit(main())

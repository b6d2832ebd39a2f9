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
    LiftZone,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Settings,
    generate_level,
)

OUT = Path(__file__).resolve().parents[1] / "demo_projects"

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
        deck=Deck("composite", 0.13, get_concrete("C30/37"), 0.025, 2.5e-4),
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
    zone = LiftZone(
        id="MC1", name="All-terrain crane on Quayside Road (west)", level_id="RF",
        crane=(-8.0, 9.0), r_min=14.0, r_max=26.0,
        slew_start=math.radians(-35.0), slew_end=math.radians(35.0), drift_margin=1.0,
        loads=(
            LiftLoad("AHU-3 (new)", 4200.0, 3.0, 2.0, hook_elevation=27.0, hang_length=5.5,
                     drop_height=None),
            LiftLoad("AHU-3 (old, drained)", 3650.0, 2.8, 1.9, hook_elevation=27.0,
                     hang_length=5.5, drop_height=None),
            LiftLoad("Spreader beam 4 m", 300.0, 4.0, 0.3, hook_elevation=27.0,
                     hang_length=1.5, drop_height=None, kind="rigging"),
        ),
    )
    mat = ProtectionArea(
        id="MAT1", name="Timber crane mats, two layers, landing bay 2-3/A-B", level_id="RF",
        area=Rect(8.0, 0.5, 14.5, 8.5), kind="spring", thickness=0.3, stiffness=1.2e8)
    info = ProjectInfo(
        name="Harrowgate Clinic - roof plant replacement",
        site="Harrowgate Clinic, 12 Quayside Road, Port Ellery (fictional)",
        lift_reference="LP-2026-041",
        revision="B",
        date="2026-11-24",
        prepared_by="R. Okonjo, Brightwell Lifting Ltd (fictional)",
        checked_by="S. Lindqvist CEng, Tallow & Vane Structures (fictional)",
        approved_by="M. Haddad, appointed person",
        description=(
            "Removal of the existing air-handling unit AHU-3 and placing of its replacement "
            "on the plinth in roof bay 2-3/A-B. 90 t all-terrain crane on outriggers in the "
            "closed lane of Quayside Road; loads pass over roof bays 1-2 and 2-3 only. Roof "
            "cleared of people under the swing zone for the duration of the lift."),
    )
    settings = Settings(unit_system="SI", design_basis="en1993", grid_resolution=0.5)
    return Project(info, settings, (roof,), (zone,), (mat,))


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
        # 3.25 in normal-weight topping on 3 in composite deck: 6.25 in total,
        # 6x6 W2.9xW2.9 welded wire reinforcement (0.058 in²/ft) at 3/4 in cover.
        deck=Deck("composite", 6.25 * INCH,
                  dataclasses.replace(get_concrete("4000 psi"), fy_rebar=65_000 * PSI),
                  0.75 * INCH, 0.058 * INCH**2 / FT),
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
        loads=(
            LiftLoad("Joist bundle J-7", 4000.0 * LB, 20.0 * FT, 2.0 * FT, 6.0 * FT),
            LiftLoad("Engine-driven welder", 1150.0 * LB, 5.0 * FT, 2.5 * FT, 4.0 * FT),
            LiftLoad("Spreader bar 12 ft", 250.0 * LB, 12.0 * FT, 0.5 * FT, 10.0 * FT,
                     kind="rigging"),
        ),
    )
    pad = ProtectionArea(
        id="PAD1", name="EPS foam landing pad under plywood, bay 3-4/B-C", level_id="L3",
        area=Rect(62.0 * FT, 32.0 * FT, 88.0 * FT, 58.0 * FT), kind="crushable",
        thickness=6.0 * INCH, stiffness=None, crush_force=40.0 * KIP, crush_stroke=4.0 * INCH)
    info = ProjectInfo(
        name="Cedar Fork Logistics Office - steel erection, level 3",
        site="Lot 7, Cedar Fork Business Park, Millbrook (fictional)",
        lift_reference="CF-LP-019",
        revision="A",
        date="2026-10-05",
        prepared_by="D. Alvarez, Ironline Erectors Inc. (fictional)",
        checked_by="K. Brennan PE, North Ridge Engineering (fictional)",
        approved_by="T. Yamada, lift director",
        description=(
            "Crawler crane at the west laydown area slews joist bundles, a welder and its "
            "rigging over the completed level 3 floor to the east hoist landing. The load "
            "path is held to the agreed corridor by taglines; level 3 is closed to the "
            "trades under the corridor during picks."),
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

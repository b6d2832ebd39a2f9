"""Floor compliance against an independent finite-element grillage (PyNiteFEA).

Reference: PyNiteFEA 3.x (PyPI ``PyNiteFEA``, ``import Pynite``), a general 3D frame
solver. The same floor is modelled as a grillage in the X–Z plane with Y vertical:
every member a 3D frame element with its strong-axis inertia as ``Iz`` (bending
under vertical load), girders split at the beam connections, simple (pinned)
member ends made by releasing the end rotation about the bending axis, and one
torsion release per beam so that no torque couples a beam to its girder (the
droprig model gives members no torsional stiffness). Columns are fixed supports.

Both models share the deck assumption (the lever rule shares a unit load at p
between the two nearest deck-supporting members), so the test checks the
member-tree statics, the Green's functions and the cross terms of two beams on one
girder. The compliance is the external work of a unit load: f = Σ P_i·δ_i.
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.model import Grade, Section, generate_level
from droprig.solver import loadpath

Pynite = pytest.importorskip("Pynite")

REL_TOL = 1e-6
"""The brief asks for ≤ 1 %; Euler–Bernoulli frame elements are exact for point
loads applied at nodes, so the FE grillage is held to rounding-level agreement."""

E = 200e9
G_SHEAR = 77e9


def _section(name: str, Ix: float, d: float, mass: float) -> Section:
    # custom properties (not catalogue data): only Ix, d and the mass enter the
    # compliance and the effective mass.
    return Section(name, "custom", d=d, bf=0.18, tw=0.008, tf=0.012, r=0.01, A=8e-3,
                   Ix=Ix, Sx=Ix / (d / 2), Zx=1.12 * Ix / (d / 2), Iy=1e-5,
                   mass_per_length=mass)


GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=E)
GIRDER = _section("G", 3.5e-4, 0.45, 80.0)
BEAM = _section("B", 1.2e-4, 0.35, 45.0)


@pytest.fixture(scope="module")
def two_bay_floor():
    """Two 8 m × 6 m bays, girders along x on the y grid lines, beams at ≤ 2.7 m."""
    return generate_level(level_id="L", name="grillage", elevation=0.0,
                          x_spacings=(8.0, 8.0), y_spacings=(6.0,), girder_direction="x",
                          beam_spacing=2.7, girder_section=GIRDER, beam_section=BEAM,
                          girder_grade=GRADE, beam_grade=GRADE)


def _pynite_compliance(level, loads):
    """Build the grillage and return Σ P·δ for unit point loads ``loads`` =
    [(member index, position along member, magnitude)]."""
    m, loaded_nodes, _ = _pynite_grillage(level, loads)
    return sum(-P * m.nodes[nm].DY["Combo 1"] for nm, P in loaded_nodes)


def _pynite_grillage(level, loads):
    """The analysed grillage under ``loads`` (see :func:`_pynite_compliance`), its
    loaded nodes [(name, P)] and, per droprig member, its FE elements
    [(name, start along the member, length)]."""
    from Pynite import FEModel3D

    m = FEModel3D()
    m.add_material("steel", E, G_SHEAR, 0.3, 7850.0)
    names = {}

    def node(x: float, y: float) -> str:
        key = (round(x, 6), round(y, 6))
        if key not in names:
            nm = f"N{len(names)}"
            m.add_node(nm, x, 0.0, y)
            names[key] = nm
        return names[key]

    # split points of every member: its ends, member ends resting on it, load points
    splits: dict[int, set[float]] = {k: {0.0, mb.span} for k, mb in enumerate(level.members)}
    for k, mb in enumerate(level.members):
        for j, other in enumerate(level.members):
            if j == k or other.axis == mb.axis:
                continue
            for p in (other.start, other.end):
                ax = 0 if mb.axis == "x" else 1
                if abs(p[1 - ax] - mb.start[1 - ax]) < 1e-6:
                    s = abs(p[ax] - mb.start[ax])
                    if 1e-6 < s < mb.span - 1e-6:
                        splits[k].add(s)
    for k, s, _ in loads:
        splits[k].add(s)
    columns = {(round(x, 6), round(y, 6)) for x, y in level.grid.columns}
    loaded_nodes = []
    elements: dict[int, list[tuple[str, float, float]]] = {}
    for k, mb in enumerate(level.members):
        sec = f"S{k}"
        m.add_section(sec, mb.section.A, mb.section.Iy, mb.section.Ix, 1e-6)
        ss = sorted(splits[k])
        (x0, y0), (x1, y1) = mb.start, mb.end
        for i in range(len(ss) - 1):
            a, b = ss[i] / mb.span, ss[i + 1] / mb.span
            ni = node(x0 + (x1 - x0) * a, y0 + (y1 - y0) * a)
            nj = node(x0 + (x1 - x0) * b, y0 + (y1 - y0) * b)
            nm = f"M{k}_{i}"
            m.add_member(nm, ni, nj, "steel", sec)
            elements.setdefault(k, []).append((nm, ss[i], ss[i + 1] - ss[i]))
            first, last = i == 0, i == len(ss) - 2
            # simple ends: release the bending rotation at both member ends;
            # one torsion release per member (no torque passes between members)
            m.def_releases(nm, Rxi=first, Rzi=first, Rzj=last)
        for kk, s, P in loads:
            if kk == k:
                t = s / mb.span
                loaded_nodes.append((node(x0 + (x1 - x0) * t, y0 + (y1 - y0) * t), P))
    for (x, y), nm in names.items():
        if (x, y) in columns:
            m.def_support(nm, True, True, True, True, True, True)
    for nm, P in loaded_nodes:
        m.add_node_load(nm, "FY", -P)
    m.analyze_linear(check_statics=False)
    return m, loaded_nodes, elements


DROP_POINTS = [
    (4.0, 3.0),     # off-grid, between two infill beams, middle of a girder span
    (2.0, 0.4),     # near girder GA, between an edge beam and an infill beam
    (8.0 / 3, 3.0),  # on an infill beam at its midspan
    (10.3, 5.6),    # second bay, near girder GB
    (12.0, 1.7),    # second bay, off-grid
]


@pytest.mark.parametrize("p", DROP_POINTS)
def test_compliance_matches_pynite_grillage(two_bay_floor, p):
    frame = loadpath.build_frame(two_bay_floor)
    res = loadpath.evaluate(frame, [p[0]], [p[1]])
    loads = [(int(res.members[0, k]), float(res.a[0, k]), float(res.share[0, k]))
             for k in range(2) if res.share[0, k] > 0]
    f_fe = _pynite_compliance(two_bay_floor, loads)  # PyNiteFEA grillage
    assert res.f[0] == pytest.approx(f_fe, rel=REL_TOL)


def test_girder_cross_terms_matter(two_bay_floor):
    """Two beams loading one girder: without the cross terms r_iᵀG r_k the compliance
    would differ from the FE grillage by far more than the tolerance."""
    frame = loadpath.build_frame(two_bay_floor)
    res = loadpath.evaluate(frame, [4.0], [3.0])
    r = res.r[0]
    nl = frame.pair_nodes[res.pair[0]]
    D = frame.D[np.ix_(nl, nl)]
    diag_only = np.sum(res.share[0] ** 2 * res.g_own[0] / np.where(res.share[0] > 0,
                                                                 res.share[0], 1.0)) \
        + float(r @ np.diag(np.diag(D)) @ r)
    loads = [(int(res.members[0, k]), float(res.a[0, k]), float(res.share[0, k]))
             for k in range(2)]
    f_fe = _pynite_compliance(two_bay_floor, loads)  # PyNiteFEA grillage
    assert res.f[0] == pytest.approx(f_fe, rel=REL_TOL)
    assert abs(diag_only - f_fe) / f_fe > 0.05


@pytest.fixture(scope="module")
def two_by_two_floor():
    """Two 8 m bays each way, girders along x on y = 0, 6, 13 m: the middle girder
    carries beams from both sides, so a load on one side moves the other side's
    beams as rigid bodies (they carry none of it)."""
    return generate_level(level_id="L", name="grillage", elevation=0.0,
                          x_spacings=(8.0, 8.0), y_spacings=(6.0, 7.0), girder_direction="x",
                          beam_spacing=2.7, girder_section=GIRDER, beam_section=BEAM,
                          girder_grade=GRADE, beam_grade=GRADE)


MASS_TOL = 1e-4
"""Gauss–Legendre quadrature (20 points an element) of the FE deflected shapes, which
are exact cubics between nodes for nodal loads: agreement to rounding and quadrature."""


@pytest.mark.parametrize("p", [(2.0, 6.0), (4.0, 6.0), (6.5, 6.0), (2.0, 3.0), (12.0, 9.5),
                               (9.0, 6.0)])
def test_rayleigh_mass_of_the_path_matches_pynite(two_by_two_floor, p):
    """Rayleigh's struck mass by its definition, Σ over the members carrying the load
    of ∫ μ w² dx with the static deflected shape w of a unit load at p (Timoshenko,
    *Strength of Materials* Part I), the shape taken from the PyNiteFEA grillage's
    element deflections (independent of droprig's Green's functions and node
    matrices). The members that only ride along on a deflecting support (the other
    side's beams on the middle girder, y = 6) are left out by design: counted as
    rigid bodies they would double the mass at a girder point and read the framing
    force below a grillage time history
    (tests/solver/test_struck_mass_grillage.py); here they are shown to move."""
    level = two_by_two_floor
    frame = loadpath.build_frame(level)
    res = loadpath.evaluate(frame, [p[0]], [p[1]])
    loads = [(int(res.members[0, k]), float(res.a[0, k]), float(res.share[0, k]))
             for k in range(2) if res.share[0, k] > 0]
    m, _, elements = _pynite_grillage(level, loads)
    xg, wg = np.polynomial.legendre.leggauss(20)
    kin, riders = 0.0, 0.0
    on_path = set(loadpath.path_members(frame, int(res.pair[0]))) | {k for k, _, _ in loads}
    for k, mb in enumerate(level.members):
        part = 0.0
        for nm, _s0, length in elements[k]:
            if length < 1e-6:  # a split repeated within rounding: no element there
                continue
            xs = 0.5 * length * (xg + 1.0)
            w = np.array([m.members[nm].deflection("dy", float(x), "Combo 1") for x in xs])
            part += mb.section.mass_per_length * 0.5 * length * float(np.sum(wg * w * w))
        if k in on_path:
            kin += part
        else:
            riders += part
    # droprig: m_e = Σ∫μw² / w_ref² (its normalising deflection w_ref); abs=0: the
    # integrals are ~1e-12 m²·kg/N², pytest.approx's default absolute 1e-12 would
    # pass anything
    assert res.m_e[0] * res.w_ref[0] ** 2 == pytest.approx(kin, rel=MASS_TOL, abs=0.0)
    if abs(p[1] - 6.0) < 1e-9:
        assert riders > 0.2 * kin  # the riding beams move, and are left out

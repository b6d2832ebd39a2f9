"""Dynamic amplification at a governing point of each demo, worked by hand.

Sources: Gere, *Mechanics of Materials* 7th ed. §9.10 Eq. 9-94 (K = 1 + √(1 + 2ηh/δst),
δst = W·f) with Timoshenko's struck-mass share η (*Strength of Materials* Part I, from
memory); the amplification table's cells and values as published in
droprig/solver/amplification_table.py, interpolated by hand between the cells' upper
envelope at their corners (amplification.amplification's docstring; calibrated on the
time history and re-checked on 200 random members in test_amplification.py /
test_amplification_eta_one.py);
each check is linear in the force, U = |F·u + E|/R (droprig.solver.linear_checks).
The path's compliance f, f_s and Rayleigh mass at these points are the chain's (worked
by hand for the governing bays in test_governing_bays.py). The demo projects are
invented scenarios: they give the inputs, never an expected value.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analysis, pointhistory
from droprig.solver.amplification import SET_BY
from droprig.solver.amplification_table import TABLE
from droprig.solver.chain import (
    Compliance,
    Demands,
    DynamicAmplification,
    Impact,
    LoadInputs,
    StruckMass,
    energy_fall,
)
from droprig.solver.evaluate import evaluate_chain

G = 9.80665
R_EDGES = (0.03, 0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0)  # as printed in the table's module
K_EDGES = (0.003, 0.01, 0.03, 0.1, 0.3, 1.0, 3.0)
B_SHEAR = 6.1  # amplification.B_SHEAR
# the interpolation nodes: the cell edges and one node half a decade into each outer
# cell (amplification.MASS_RATIO_NODES / COMPLIANCE_RATIO_NODES, as documented there)
R_NODES = (0.01, *R_EDGES, 300.0)
K_NODES = (0.001, *K_EDGES, 10.0)


def _cell(q: int, i: int, j: int) -> float:
    """The envelope over every end condition and position band of cell (i, j)."""
    return max(TABLE[0][q][ci][band][i][j] for ci in range(4) for band in range(3))


def _node(q: int, p: int, k: int) -> float:
    """Node (p, k) of R_NODES × K_NODES: the largest cell touching it (cells p − 1, p
    in r and k − 1, k in κ, clamped to the table: the outermost nodes lie inside
    the outer cells)."""
    return max(_cell(q, i, j) for i in {max(p - 1, 0), min(p, 8)}
               for j in {max(k - 1, 0), min(k, 7)})


def _by_hand(q: int, r: float, kappa: float) -> float:
    """The factor at (r, κ), interpolated by hand: bilinear in (ln r, ln κ) between the
    four nodes around the point (amplification.amplification's docstring)."""
    def bracket(nodes: tuple[float, ...], x: float) -> tuple[int, float]:
        x = min(max(x, nodes[0]), nodes[-1])
        p = max(i for i in range(len(nodes) - 1) if nodes[i] <= x)
        return p, math.log(x / nodes[p]) / math.log(nodes[p + 1] / nodes[p])
    p, s = bracket(R_NODES, r)
    k, t = bracket(K_NODES, kappa)
    return ((1 - s) * (1 - t) * _node(q, p, k) + s * (1 - t) * _node(q, p + 1, k)
            + (1 - s) * t * _node(q, p, k + 1) + s * t * _node(q, p + 1, k + 1))


@pytest.mark.parametrize(("demo", "load", "bay"), [
    ("rooftop_plant_swap", "AHU-3 (new)", "3-4/B-C"),
    ("steel_erection_floor", "Engine-driven welder", "1-2/B-C"),
])
def test_governing_point_amplified_by_hand(demo: str, load: str, bay: str) -> None:
    p = load_project(demo_dir() / f"{demo}.droprig")
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True,
                                    tilted_landing=False))
    res = analysis.analyse(p)
    b = next(x for x in res.bays if x.bay_id == bay and x.load_name == load)
    # the verdict's check is the brittle shear (the AHU's); the U printed may be
    # another family's (utilisation_check, test_utilisation_label.py). The welder (r
    # below 1 at its worst point) takes the impulse bound on its member shear (below)
    # and its verdict is now the ductility limit's
    assert b.governing_check == ("shear" if load.startswith("AHU") else "ductility")
    zone = next(z for z in p.lift_zones if z.id == b.zone_id)
    ld = next(x for x in zone.loads if x.name == load)
    fm = analysis.build_floor(p.level(b.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([b.utilisation_x]),
                                  np.array([b.utilisation_y]))
    c = evaluate_chain(fm, p, ld, geo, detail=True)
    inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
    M, W = float(inp.M[0]), float(inp.W[0])
    h = float(energy_fall(c, inp.h)[0])
    f, f_s, eta = float(comp.f[0]), float(comp.f_s[0]), float(sm.eta[0])
    assert not bool(inp.crushable[0]) and not bool(inp.protected[0])
    # the point lies over a supporting line (the deck member's end): the table's
    # envelope over every end condition and position band
    # the path's Rayleigh mass with its shape scaled to 1 at the struck point (the
    # tables' calibration, beam.rayleigh_mass_factor): mₑ·(w_ref/f_path)²
    m_path = float(geo.path.m_e[0]) * (float(geo.path.w_ref[0]) / float(geo.path.f[0])) ** 2
    r, kappa = M / m_path, (f - f_s) / f_s
    row = sum(r >= e for e in R_EDGES)
    col = sum(kappa >= e for e in K_EDGES)
    A_V, A_F = _by_hand(2, r, kappa), _by_hand(0, r, kappa)
    # interpolated between the nodes' upper envelope: never below the cell's own bound
    assert A_V >= _cell(2, row, col) and A_F >= _cell(0, row, col)
    # Gere Eq. 9-94: the energy method's elastic force with the struck-mass share
    F_ref = W * (1.0 + math.sqrt(1.0 + 2.0 * eta * h / (W * f)))
    # rigid-base bound on the contact force: η = 1 on the contact spring alone, + 5 %
    F_rigid = 1.05 * W * (1.0 + math.sqrt(1.0 + 2.0 * h / (W * (f - f_s))))
    F = float(imp.F[0])
    # two forces per point: F is the two-mass model's force on the framing (the floor
    # with its slab as the struck mass m2, CEB Bulletin 187 — from memory), between the
    # one-mass balance with η2 = M/(M + m2) and the energy bound on the framing spring
    # alone, W(1 + √(1 + 2h/(W·f_s) + f_c/f_s)) (Gere §9.10; Clough & Penzien, energy
    # of a 2-DOF system); the tables still multiply the energy method's F_ref
    m2 = sm.m2
    assert m2 is not None and imp.two_mass is not None and bool(imp.two_mass[0])
    f_c = float(comp.f_series[0])
    F_1 = W * (1.0 + math.sqrt(1.0 + 2.0 * M / (M + float(m2[0])) * h / (W * f)))
    B_f = W * (1.0 + math.sqrt(1.0 + 2.0 * h / (W * f_s) + f_c / f_s))
    assert F_1 * (1 - 1e-9) <= F <= B_f * (1 + 1e-9)
    F_local = max(F, min(A_F * F_ref, F_rigid, float(imp.F_crush[0])))
    V_force = max(F, min(A_V * F_ref, B_SHEAR * F_local))
    amp = c[DynamicAmplification]
    if SET_BY[int(amp.set_by["shear"][0])] == "impulse bound":
        # a light item's contact: the impulse bound of the point's own time history
        # (chain._with_impulse_bounds; worked by hand in test_amplification_impulse.py)
        # where it is below the table's and the contact-force bound's force
        got = pointhistory.impulse_factors(c, np.array([0]), np.array([h]), imp.F)
        # fading into the other bounds between r = 0.5 and 1, linearly in ln r
        # (chain.impulse_fade): A_I + t·(A − A_I) where A_I is the lesser
        t = min(max(math.log(float(amp.mass_ratio[0]) / 0.5) / math.log(2.0), 0.0), 1.0)

        def fade(A_I: float, A: float) -> float:
            return A_I + t * (A - A_I) if A_I < A else A

        V_force = F * fade(max(float(got["shear"][0]), 1.0), V_force / F)
        F_local = F * fade(max(float(got["force"][0]), 1.0), F_local / F)
    assert float(amp.A_shear[0]) * F == pytest.approx(V_force, rel=1e-9)
    assert float(amp.A_force[0]) * F == pytest.approx(F_local, rel=1e-9)
    # what sets it: the two-mass framing force where that is larger, else the lesser
    # of the table and B_V × the contact-force bound (with r keyed on the struck
    # point's Rayleigh mass the AHU's table term is the larger: the bound sets it)
    by = SET_BY[int(amp.set_by["shear"][0])]
    least = min(A_V * F_ref, B_SHEAR * F_local)
    assert by == ("impulse bound" if V_force < least * (1 - 1e-9) else "energy method"
                  if F >= least else "time-history table"
                  if A_V * F_ref <= B_SHEAR * F_local else "contact-force bound")
    # the shear check at the amplified force: U = |A·F·u + E|/R of the energy method's
    # check (its demand per N u, existing demand E and resistance R)
    shear = c[Demands].checks["shear"]
    unit, exist, resist = (float(np.ravel(v)[0]) for v in (shear.unit, shear.exist,
                                                           shear.resist))
    U_hand = abs(V_force * unit + exist) / resist
    assert float(shear.U[0]) == pytest.approx(U_hand, rel=1e-9)
    # the bay reads at least this (its largest U may be a ductile family's, its
    # verdict the brittle shear's)
    assert b.max_utilisation >= U_hand * (1.0 - 1e-9)

"""The web's local yielding bounds what a hard strike passes into a beam (issues 10/12,
``chain.web_contact_bound``): hand check, an independent time history, the verdict.

Sources: AISC 360-16 J10.2 (web local yielding, Eq. J10-2 R = Fy·tw·(5k + lb); here
at Fu as an upper estimate, as ``capacity.flange_contact_force_bound`` takes it);
EN 10365 IPE 360 (h 360, b 170, tw 8.0, tf 12.7, r 18 mm — from memory); EN 10025-2
S355 (fu = 470 MPa for 3 ≤ t ≤ 100 mm — from memory); modal superposition of a
simply supported Euler–Bernoulli beam (Clough & Penzien, *Dynamics of Structures*,
ch. 18: modes sin(nπx/L), ω_n = (nπ/L)²√(EI/μ), generalised mass μL/2 — from
memory), integrated by scipy ``solve_ivp`` (DOP853), an integrator independent of
droprig's (``droprig.solver.exacthistory``: exact modal steps of a Timoshenko beam).
The demo project is an invented scenario: it gives the geometry, never an expected
value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate, pointhistory, verification
from droprig.solver import chain as chain_mod
from droprig.solver.chain import Demands, Impact, LoadInputs, energy_fall, outputs
from droprig.solver.evaluate import governing_point, point_case
from droprig.solver.impact import G
from droprig.solver.results import RESPONSES

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "two_level_rigging.droprig"
LOAD = "Spreader beam 4 m"
X, Y = 7.5, 11.5
"""The struck point: on grid line 2 (x = 7.5 m), beam B2/B-C (IPE 360, S355, 9 m),
2.5 m from its end at y = 9 m — where the member history read 4,842 kN of contact
and 3,339 kN of end shear before the web bounded it."""

MODES = 20
"""Sine modes of the test's own beam (the brief's ≥ 20; 30 moved the peak moment by
0.5 % and the contact force not at all)."""

EB_OVER_TIMOSHENKO = 1.15
"""How far the test's Euler–Bernoulli peak moment may lie above droprig's Timoshenko
history (both with the contact at the same cap): a beam without shear deformation and
rotary inertia is stiffer in its higher modes, so a short pulse excites them harder
(Clough & Penzien ch. 18 — from memory); measured 1.107 here."""


@pytest.fixture(scope="module")
def struck():
    """The chain at the point (the case that governs there) and its verification."""
    p = load_project(DEMO)
    case = point_case(p, "MC1", LOAD, X, Y, opening=True, fields=("z", "l", "p"))
    gp = governing_point(case.fm, p, case.load, case.geo, case.zone.hoist_speed)
    pv = verification.verify_point(p, "MC1", LOAD, X, Y)
    return p, gp.chain, pv.verification


def test_web_bound_by_hand(struck) -> None:
    """AISC 360-16 Eq. J10-2 at Fu, by hand. The point is 2.5 m from the end, more
    than d = 0.36 m: the interior equation. k = tf + r = 12.7 + 18 = 30.7 mm (k_des
    of a rolled I: the flange and root radius); the spreader's footprint is 4.0 ×
    0.3 m, its smaller side the bearing along the beam, lb = 0.3 m (the chain's
    ``LoadInputs.lb``); the base sits with its centre over the flange (its whole
    force bears on the steel, σ = 0) and the beam takes all of it (share 1):

        F_web = fu·tw·(5k + lb) = 470 MPa × 8.0 mm × (153.5 + 300) mm = 1,705.16 kN

    — 2.2 × the web check's own resistance at the point (765.8 kN: EN 1993-1-5 §6's
    patch resistance at fy with its buckling reduction χ_F, the project's basis),
    and 1/41 of the deck concrete's crushing force under the footprint (69.3 MN),
    which bounded the contact before."""
    _p, c, _v = struck
    fm = c.drop.fm
    sec, grade = fm.groups[int(fm.group[int(c.drop.geo.path.members[0, 0])])
                           if len(fm.groups) > 1 else 0]
    assert sec.tw == pytest.approx(0.0080, rel=1e-6)
    assert sec.tf == pytest.approx(0.0127, rel=1e-6)
    assert sec.k_des == pytest.approx(0.0127 + 0.018, rel=1e-6)
    assert grade.fu == pytest.approx(470e6, rel=1e-9)
    assert float(c[LoadInputs].lb[0]) == pytest.approx(0.3, rel=1e-12)
    F_hand = 470e6 * 0.0080 * (5 * 0.0307 + 0.3)
    assert F_hand == pytest.approx(1_705_160.0, rel=1e-9)
    imp = c[Impact]
    assert float(imp.F_web[0]) == pytest.approx(F_hand, rel=1e-9)
    assert float(imp.F_cap[0]) == pytest.approx(F_hand, rel=1e-9)
    assert float(imp.F_crush[0]) > 40 * F_hand
    # the plastic depth over which the cap holds: the flange's thickness
    assert float(imp.cap_depth[0]) == pytest.approx(0.0127, rel=1e-12)
    chk = c[Demands].checks["web_yielding"]
    assert float(chk.F_allow[0]) < F_hand  # at the cap the web check reads U > 1


def _history(L: float, EI: float, mu: float, a: float, M: float, v0: float, k_c: float,
             F_y: float, t_end: float) -> dict[str, float]:
    """The load M (kg, at v0 m/s) on an elastic–perfectly plastic contact (stiffness
    k_c N/m, yielding at F_y N, plastic set δp while it yields and closes) on a
    simply supported Euler–Bernoulli beam (L m, EI N·m², μ kg/m, struck at a m) of
    :data:`MODES` modes, gravity on the load; peaks of the contact force, the moment
    over the span, the end shear, the plastic set and the largest drift of the total
    energy over the load's initial kinetic energy."""
    n = np.arange(1, MODES + 1)
    kn = n * math.pi / L
    wn = kn**2 * math.sqrt(EI / mu)
    phi = np.sin(kn * a)
    mn = mu * L / 2.0

    def rhs(_t: float, Y: np.ndarray) -> np.ndarray:
        u, ud = Y[0], Y[1]
        q, qd = Y[3:3 + MODES], Y[3 + MODES:]
        e = u - q @ phi - Y[2]
        rel = ud - qd @ phi
        if k_c * e >= F_y and rel > 0.0:
            P, dpd = F_y, rel
        else:
            P, dpd = max(k_c * e, 0.0), 0.0
        return np.concatenate(([ud, G - P / M, dpd], qd, -wn**2 * q + phi * P / mn))

    y0 = np.concatenate(([0.0, v0, 0.0], np.zeros(2 * MODES)))
    sol = solve_ivp(rhs, (0.0, t_end), y0, method="DOP853", rtol=1e-7, atol=1e-12)
    assert sol.success
    u, ud, dp = sol.y[0], sol.y[1], sol.y[2]
    q, qd = sol.y[3:3 + MODES], sol.y[3 + MODES:]
    e = np.maximum(u - phi @ q - dp, 0.0)
    P = np.minimum(k_c * e, F_y)
    xs = np.linspace(0.0, L, 181)
    moment = EI * (np.sin(np.outer(xs, kn)) * kn**2) @ q
    shear = EI * np.vstack([kn**3, kn**3 * np.cos(kn * L)]) @ q
    energy = (0.5 * M * ud**2 - M * G * u + 0.5 * mn * (qd**2 + (wn[:, None] * q) ** 2).sum(0)
              + 0.5 * P**2 / k_c + F_y * dp)
    E0 = 0.5 * M * v0**2
    return {"force": float(P.max()), "moment": float(np.abs(moment).max()),
            "shear": float(np.abs(shear).max()), "set": float(dp.max()),
            "drift": float(np.abs(energy - energy[0]).max() / E0)}


def test_independent_history_at_the_cap(struck) -> None:
    """The 300 kg spreader, rigid, 4.8 m (with the hoist's head) onto B2/B-C: the
    test's own history with the contact at the chain's cap reaches the cap (a hard
    strike: uncapped its contact read 4,842 kN), yields the web by a set well inside
    the flange's thickness (so the cap holds: the chain's ``cap_depth``), closes
    its energy balance, and agrees with droprig's own member history on the contact
    force (exact: both sit at the cap) and the moment (within
    :data:`EB_OVER_TIMOSHENKO`). The energy method's moment (260.2 kN·m) lies below
    both: the amplification the verdict adds when it is on (issue 12)."""
    _p, c, v = struck
    s = pointhistory.struck_member(c, np.array([0]))
    assert str(s["cond"][0]) == "simple" and float(s["share"][0]) == 1.0
    L, EI, mu, a = (float(s[k][0]) for k in ("L", "EI", "mu", "a"))
    M = float(c[LoadInputs].M[0])
    h_e = float(energy_fall(c, c[LoadInputs].h)[0])
    F_cap = float(c[Impact].F_cap[0])
    assert float(s["F_yield"][0]) == F_cap  # the history reads the chain's cap
    k_c = 1.0 / v.contact_compliance
    T1 = 2 * math.pi / ((math.pi / L) ** 2 * math.sqrt(EI / mu))
    th = _history(L, EI, mu, a, M, math.sqrt(2 * G * h_e), k_c, F_cap, 0.6 * T1)
    assert th["drift"] < 1e-5  # the energy balance closes
    assert th["force"] == pytest.approx(F_cap, rel=1e-9)
    assert v.time_history["force"] == pytest.approx(F_cap, rel=1e-6)
    assert 0.0 < th["set"] < float(c[Impact].cap_depth[0])
    # the plastic work at the cap is part of what the load brings: at most its
    # energy M·g·h_e plus its weight over the travel in contact (< 0.1 m here)
    assert F_cap * th["set"] <= M * G * (h_e + 0.1)
    ratio = th["moment"] / v.time_history["moment"]
    assert 1.0 <= ratio <= EB_OVER_TIMOSHENKO
    assert v.energy["moment"] < min(th["moment"], v.time_history["moment"])
    # the end shear stays far below the uncapped history's 3,339 kN (E–B with 20
    # modes under-reads a short pulse's shear: not compared further)
    assert max(th["shear"], v.time_history["shear"]) < 0.5 * 3_339e3


@pytest.fixture(scope="module")
def heavy():
    """The same beam line struck by a 12 t rigid load (the spreader's footprint): the
    framing force passes the web's cap at every point."""
    p = load_project(DEMO)
    zone = p.lift_zones[0]
    load = replace(next(ld for ld in zone.loads if ld.name == LOAD), mass=12_000.0)
    fm = analysis.build_floor(p.levels[0], p.settings)
    ys = np.array([9.4, 10.5, 11.5, 13.5, 16.0, 17.6])
    geo = analysis.point_geometry(fm, p, np.full(ys.size, X), ys)
    return evaluate.evaluate_chain(fm, p, load, geo)


def test_where_the_cap_is_reached_the_web_reads_damaged(heavy) -> None:
    """Wherever the force on the framing reaches the web's cap the web yielding check
    reads U ≥ 1 and the point's response is at least ``exceeds``: the cap is the
    web's local damage, never an elastic answer (by construction the cap is at or
    above the check's resistance over the share; checked here on the chain's own
    numbers). Near the ends (y = 9.4, 17.6 m, within d of the beam's ends at 9 and
    18 m) the cap fades out (∞ at the end: the load bears on the support there)."""
    c = heavy
    imp = c[Impact]
    U = c[Demands].checks["web_yielding"].U
    resp = outputs(c)["response"]
    reached = imp.F >= imp.F_web * (1 - 1e-12)
    assert reached.sum() >= 3
    assert np.all(U[reached] >= 1.0)
    assert np.all(resp[reached] >= RESPONSES.index("exceeds"))
    # by hand: interior (more than d from the ends) fu·tw·(5k + lb) = 1,705.16 kN;
    # at y = 9.4 m the bearing's near edge is 0.4 − 0.15 = 0.25 m < d from the end:
    # fu·tw·(2.5k + lb) (Eq. J10-3 at Fu) over the fade t = 0.25/0.36 = 2,039.9 kN;
    # at y = 17.6 m the deck's edge (y = 18) cuts the 4 m side lying along the beam
    # to 2.0 + 0.4 = 2.4 m: 60 % of the area bears, as a rectangle of the footprint's
    # proportions (the chain's cut), lb = 0.3·√0.6; near edge 0.4 − lb/2 from the end
    interior = 470e6 * 0.0080 * (5 * 0.0307 + 0.3)
    np.testing.assert_allclose(imp.F_web[1:-1], interior, rtol=1e-9)
    assert float(imp.F_web[0]) == pytest.approx(
        470e6 * 0.0080 * (2.5 * 0.0307 + 0.3) / (0.25 / 0.36), rel=1e-9)
    lb = float(c[LoadInputs].lb[-1])
    assert lb == pytest.approx(0.3 * math.sqrt(0.6), rel=1e-9)
    assert float(imp.F_web[-1]) == pytest.approx(
        470e6 * 0.0080 * (2.5 * 0.0307 + lb) / ((0.4 - lb / 2) / 0.36), rel=1e-9)


def test_never_below_the_history_with_the_cap(monkeypatch) -> None:
    """Amplification on with the floors' point histories (issue 12): at three seeded
    random points on beam line 2 the verdict's demand (the chain's force on the
    member's unit-load envelopes times its factors) is never below droprig's member
    history with the contact at the chain's cap (force, moment, end shear), within
    the verification's rounding (``TOL``)."""
    TOL = 1e-6
    monkeypatch.setattr(chain_mod, "FLOOR_POINT_HISTORY", True)
    p = load_project(DEMO)
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    rng = np.random.default_rng(32)
    for y in rng.uniform(9.5, 17.5, 3):
        v = verification.verify_point(p, "MC1", LOAD, X, float(y)).verification
        assert v.verdict is not None
        assert v.crushing_force < 3e6  # the web's cap, not the concrete's 69 MN
        for q in ("force", "moment", "shear"):
            assert v.verdict[q] >= v.time_history[q] * (1 - TOL), (y, q)

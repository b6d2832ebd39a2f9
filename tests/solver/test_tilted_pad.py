"""A load landing tilted on one edge on a crushable pad: the crushed band widens from the
edge strip to the whole base as the edge sinks (``footprint.wedge_crush_work``), and
the chain credits that work (``chain._tilted_crush_credit``) in place of the strip's
area alone.

Sources: the plateau stress of a crushable layer, F = σ_c·A — Gibson & Ashby,
*Cellular Solids* 2nd ed. (1997) ch. 5 (from memory); the energy balance of a load
stopped by a crushing layer W·(h + δ) = ∫F dδ — Gere, *Mechanics of Materials* 7th ed.
§2.8 (from memory); a uniform block's inertia I_G = M(b² + H²)/12 — Meriam & Kraige,
*Dynamics*, Appendix B (from memory). The independent method is a time history of the
body integrated here with scipy ``solve_ivp``: the body's drop and rotation (2 DOF,
small rotation) on the pad as 40 columns across the base, each elastic up to its share
of the plateau force and then crushing with a permanent set (a state of the history).
Invented numbers (of the steel demo's welder and its pad); the expected values are the
hand formulas' and the history's.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate
from droprig.solver.chain import Impact, LoadInputs
from droprig.solver.footprint import EDGE_CONTACT_WIDTH, PAD_TILT, wedge_crush_work
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]

# the steel demo's welder (521.6 kg, base 1.524 × 0.762 m) on its plywood-over-foam pad
# (plateau 29.9 kPa, stroke 0.2032 m)
M, B, ELL, SIGMA, STROKE = 521.6312255, 1.524, 0.762, 29925.161862709898, 0.2032


def test_wedge_work_hand_checks():
    # a layer under the whole base (geometry of a plane pressed in at θ): the band is
    # w0 + δ/tanθ wide until the base lies flat at δ_f = (b − w0)·tanθ, then b:
    # ∫o dδ = w0·δ_f + δ_f²/(2 tanθ) + b·(s − δ_f)
    t = math.tan(PAD_TILT)
    w0 = EDGE_CONTACT_WIDTH
    d_f = (B - w0) * t
    work, o_end = wedge_crush_work(0.0, w0, B, STROKE, PAD_TILT, -1.0, 5.0)
    assert float(work) == pytest.approx(w0 * d_f + d_f**2 / (2 * t) + B * (STROKE - d_f),
                                        rel=1e-12)
    assert float(o_end) == pytest.approx(B, rel=1e-12)
    # before the base lies flat: w0·s + s²/(2 tanθ), the band w0 + s/tanθ
    work, o_end = wedge_crush_work(0.0, w0, B, 0.05, PAD_TILT, -1.0, 5.0)
    assert float(work) == pytest.approx(w0 * 0.05 + 0.05**2 / (2 * t), rel=1e-12)
    assert float(o_end) == pytest.approx(w0 + 0.05 / t, rel=1e-12)
    # a layer over [0.5, 0.8] m across the edge only: the band meets it at
    # δ = (0.5 − w0)·tanθ, covers it at (0.8 − w0)·tanθ: ∫o dδ = tanθ·0.3²/2 + 0.3·(s −
    # 0.75·tanθ)
    work, o_end = wedge_crush_work(0.0, w0, B, STROKE, PAD_TILT, 0.5, 0.8)
    assert float(work) == pytest.approx(t * 0.045 + 0.3 * (STROKE - 0.75 * t), rel=1e-12)
    assert float(o_end) == pytest.approx(0.3, rel=1e-12)
    # the work is the integral of the band: against scipy's quadrature of o(δ)
    from scipy.integrate import quad

    def o(dl: float) -> float:
        x = min(w0 + dl / t, B)
        return max(min(x, 0.8) - 0.5, 0.0)

    ref, _ = quad(o, 0.0, STROKE, points=[(0.5 - w0) * t, (0.8 - w0) * t], limit=200)
    assert float(work) == pytest.approx(ref, rel=1e-9)


def test_wedge_refuses_a_bad_tilt():
    for bad in (-0.01, 0.5 * math.pi, float("nan")):
        with pytest.raises(ValueError, match="tilt"):
            wedge_crush_work(0.0, 0.05, 1.0, 0.1, bad, 0.0, 1.0)


def test_wedge_at_no_tilt_is_the_flat_base():
    # θ → 0 (a design tilt of 0°): δ_f = (b − w0)·tanθ → 0, so the hand check above,
    # w0·δ_f + δ_f²/(2 tanθ) + b·(s − δ_f), tends to b·s (geometry of a plane pressed in)
    work, o_end = wedge_crush_work(0.0, EDGE_CONTACT_WIDTH, B, STROKE, 0.0, -1.0, 5.0)
    assert float(work) == pytest.approx(B * STROKE, rel=1e-12)
    assert float(o_end) == pytest.approx(B, rel=1e-12)
    # and the wedge's work at a small tilt approaches it from below (continuous at 0)
    near, _ = wedge_crush_work(0.0, EDGE_CONTACT_WIDTH, B, STROKE, 1e-6, -1.0, 5.0)
    assert float(near) < float(work)
    assert float(near) == pytest.approx(B * STROKE, rel=1e-5)
    # a layer over [0.5, 0.8] m across the edge: its whole width at once
    work, o_end = wedge_crush_work(0.0, EDGE_CONTACT_WIDTH, B, STROKE, 0.0, 0.5, 0.8)
    assert float(work) == pytest.approx(0.3 * STROKE, rel=1e-12)


def _history(h: float, I_G: float, tilt: float, n: int = 24) -> tuple[float, float, float]:
    """The body (mass M, inertia ``I_G`` kg·m² about its centre of mass over the base's
    middle, base B across the edge, ELL along it) released at rest tilted by ``tilt``
    (rad), its lowest edge ``h`` (m) above the pad on a rigid deck. The pad: ``n``
    columns across the base, each elastic (0.5 mm to its plateau) and then crushing at
    σ_c·ELL·B/n with a permanent set. Small rotation φ (flattening positive): point ξ
    from the edge moves down z + (ξ − B/2)·φ and its gap was h + ξ·tanθ. Returns the
    deepest set under the leading column (m), the pad's plastic work at the end (J) and
    the drop of the centre of mass at the end (m)."""
    xi = (np.arange(n) + 0.5) * B / n
    arm = xi - 0.5 * B
    gap0 = h + xi * math.tan(tilt)
    F_col = SIGMA * ELL * B / n
    k_e = F_col / 5e-4

    def rhs(_t: float, y: np.ndarray) -> np.ndarray:
        z, phi, vz, w = y[:4]
        c = y[4:]
        p = z + arm * phi - gap0
        f = np.clip(k_e * (p - c), 0.0, F_col)
        dp = vz + arm * w
        yielding = (k_e * (p - c) >= F_col) & (dp > 0.0)
        out = np.empty_like(y)
        out[0], out[1] = vz, w
        out[2] = G - f.sum() / M
        out[3] = -(f * arm).sum() / I_G
        out[4:] = np.where(yielding, dp, 0.0)
        return out

    T = math.sqrt(2.0 * h / G) + 0.25
    s = solve_ivp(rhs, (0.0, T), np.zeros(4 + n), max_step=4e-4, rtol=1e-6, atol=1e-9)
    c = s.y[4:]
    # the pad's plastic work: each column's plateau force times its set
    return float(c[0].max()), float((F_col * c[:, -1]).sum()), float(s.y[0, -1])


@pytest.fixture(scope="module")
def histories():
    """The welder dropped from 0.4572 m (its fall onto the pad in the demo), tilted 5°,
    as a thin plate (I_G = M·B²/12: turns most) and as the corner-mass bound
    (I_G = M(B² + H²)/4, H = 1 m: turns least); from 0.6 m as the corner-mass bound."""
    plate, corners = M * B**2 / 12, M * (B**2 + 1.0) / 4
    return {(h, name): _history(h, I_G, PAD_TILT)
            for h, name, I_G in ((0.4572, "plate", plate), (0.4572, "corners", corners),
                                 (0.6, "corners", corners))}


def _wedge_depth(h: float) -> float:
    """The crush under the edge at which the fixed-tilt wedge has done the work of the
    fall: W·(h + δ) = σ_c·ELL·∫o dδ (energy balance, Gere §2.8), m."""
    W = M * G

    def gap(dl: float) -> float:
        work, _ = wedge_crush_work(0.0, EDGE_CONTACT_WIDTH, B, dl, PAD_TILT, -1.0, 5.0)
        return SIGMA * ELL * float(work) - W * (h + dl)

    return float(brentq(gap, 1e-6, 2.0))


def test_wedge_bounds_the_history_crush(histories):
    # the body turns flat under the eccentric crush force, so its band widens faster
    # than the fixed-tilt wedge's: the history crushes less under the edge (the wedge
    # is on the safe side), and not by much where it turns least (the corner-mass
    # bound: measured 0.89 and 0.91 of the wedge's depth); the thin plate turns more and
    # crushes less (0.59: the bound is not vacuous)
    W = M * G
    for h in (0.4572, 0.6):
        d_w = _wedge_depth(h)
        d_corners = histories[(h, "corners")][0]
        assert 0.85 * d_w <= d_corners <= d_w
        # the flat landing's crush, W·h/(F − W) with F = σ·ELL·B, is shallower: the
        # tilted landing takes more of the stroke
        assert W * h / (SIGMA * ELL * B - W) < d_corners
    d_plate = histories[(0.4572, "plate")][0]
    assert 0.5 * _wedge_depth(0.4572) <= d_plate <= histories[(0.4572, "corners")][0]


def test_history_work_is_the_energy_of_the_fall(histories):
    # the pad's plastic work is the weight's work over the drop of the centre of mass,
    # W·z (energy balance of the run, Gere §2.8), less what is still elastic or moving
    # at the end (measured 0.3 %: the columns' 0.5 mm and the last rocking)
    W = M * G
    for (depth, work, z_end) in histories.values():
        assert 0.97 * W * z_end <= work <= W * z_end
        assert z_end > depth


@pytest.fixture(scope="module")
def welder_on_pad():
    """The steel demo's welder at the middle of its pad (22.9, 13.7) in bay 3-4/B-C,
    flat and tilted."""
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    zone = p.lift_zones[0]
    load = next(ld for ld in zone.loads if ld.name == "Engine-driven welder")
    fm = analysis.build_floor(p.level(zone.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([22.9]), np.array([13.7]))
    return {ld: evaluate.evaluate_chain(fm, p, load, geo, landing=ld)
            for ld in ("flat", "tilted")}


def test_chain_credits_the_wedge_net_work(welder_on_pad):
    # the chain's constant-force layer (F_c over s_c, net work (F_c − W)·s_c) holds the
    # wedge's net work E − W·s with F_c the whole base's plateau σ·ELL·B: by hand
    # E = σ·ELL·(w0·δ_f + δ_f²/(2 tanθ) + B·(s − δ_f)) = 4,894 J, W·s = 1,039 J,
    # F_c = 34,752 N, s_c = 3,855/(34,752 − 5,115) = 0.1301 m
    t = math.tan(PAD_TILT)
    w0 = EDGE_CONTACT_WIDTH
    d_f = (B - w0) * t
    E = SIGMA * ELL * (w0 * d_f + d_f**2 / (2 * t) + B * (STROKE - d_f))
    W = M * G
    inp = welder_on_pad["tilted"][LoadInputs]
    assert float(inp.F_c[0]) == pytest.approx(SIGMA * ELL * B, rel=1e-9)
    assert float(inp.s_c[0]) == pytest.approx((E - W * STROKE) / (SIGMA * ELL * B - W),
                                              rel=1e-9)
    assert float(inp.s_c[0]) == pytest.approx(0.1301, abs=5e-4)
    # the flat landing's layer: the whole base over the whole stroke
    flat = welder_on_pad["flat"][LoadInputs]
    assert float(flat.s_c[0]) == pytest.approx(STROKE, rel=1e-12)
    assert float(flat.F_c[0]) == pytest.approx(SIGMA * ELL * B, rel=1e-9)


def test_tilted_welder_on_its_pad_is_held(welder_on_pad):
    # the wedge holds the welder's 0.457 m fall (W·(h + δ) = E at δ = 0.15 m of the
    # 0.2032 m stroke, by the history 0.09-0.135 m): the framing sees the pad's plateau,
    # as the flat landing's (before this the strip's 1.1 kN credit let the pad bottom
    # out: 134 kN on the framing here against 46 kN)
    tilted, flat = welder_on_pad["tilted"], welder_on_pad["flat"]
    assert _wedge_depth(float(tilted[LoadInputs].h[0])) < STROKE
    assert float(tilted[Impact].F[0]) == pytest.approx(float(flat[Impact].F[0]), rel=1e-6)

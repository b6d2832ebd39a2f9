"""The dynamic-amplification steps of the chain (project setting
``dynamic_amplification``).

Sources: the factors are those of droprig.solver.amplification (checked against the
time history, itself checked against Blevins 1979 Table 8-1 and Gere 7th ed. §9.10,
in tests/solver/test_amplification.py and test_timehistory.py); each check is linear
in the force, U = |F·u + E|/R (AISC 360-16 / EN 1993-1-1 checks as in
droprig.solver.linear_checks), so the amplified check is U = |A·F·u + E|/R. The demo
project is an invented scenario used as input only.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from droprig.commands.demo import demo_dir
from droprig.io.project_file import dumps_project, load_project, loads_project
from droprig.solver import amplification, analysis, pointhistory
from droprig.solver.chain import (
    Compliance,
    Demands,
    DynamicAmplification,
    Impact,
    LoadInputs,
    StruckMass,
)
from droprig.solver.evaluate import evaluate_chain

REL = 1e-9


def _project(on: bool):
    p = load_project(demo_dir() / "rooftop_plant_swap.droprig")
    return replace(p, settings=replace(p.settings, dynamic_amplification=on))


def _grid(p) -> tuple[np.ndarray, np.ndarray]:
    members = p.level(p.lift_zones[0].level_id).members
    xs = [c for m in members for c in (m.start[0], m.end[0])]
    ys = [c for m in members for c in (m.start[1], m.end[1])]
    X, Y = np.meshgrid(np.linspace(min(xs), max(xs), 11)[1:-1],
                       np.linspace(min(ys), max(ys), 9)[1:-1])
    return X.ravel(), Y.ravel()


def _chains(on: bool):
    p = _project(on)
    zone = p.lift_zones[0]
    fm = analysis.build_floor(p.level(zone.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, *_grid(p))
    return [evaluate_chain(fm, p, ld, geo) for ld in zone.loads]


def test_off_is_the_energy_method_unchanged() -> None:
    for ch in _chains(False):
        amp = ch[DynamicAmplification]
        assert np.all(amp.A_moment == 1.0) and np.all(amp.A_force == 1.0)
        # the replaced Demands is step 5's own object
        dems = [r for r in ch.history if isinstance(r, Demands)]
        assert dems[-1] is dems[0]


def test_on_checks_use_the_amplified_force() -> None:
    off, on = _chains(False), _chains(True)
    for c0, c1 in zip(off, on, strict=True):
        inp, comp, sm, imp = c1[LoadInputs], c1[Compliance], c1[StruckMass], c1[Impact]
        amp = c1[DynamicAmplification]
        ok = np.isfinite(imp.F)
        # the factors are amplification.amplified_forces' for this path (r, κ as the
        # step defines them: the elastic contact through a crushable layer is the
        # load's underside alone) over the energy method's force
        # keyed on the struck member's condition and position band where its own
        # bending is at least half the members' (pointhistory.struck_member picks
        # the same member), the envelope of every condition and band elsewhere
        # the path's Rayleigh mass with its shape scaled to 1 at the struck point, as
        # the tables were calibrated (beam.rayleigh_mass_factor): mₑ·(w_ref/f)²
        path = c1.drop.geo.path
        with np.errstate(divide="ignore", invalid="ignore"):
            m_path = path.m_e * (path.w_ref / path.f) ** 2
        m_path = np.where(np.isfinite(m_path) & (m_path > 0.0), m_path, 0.0)
        f_b = np.where(inp.crushable, comp.f_struct, comp.f)
        s = pointhistory.struck_member(c1, np.arange(c1.drop.n))
        k = np.where(path.share[:, 0] >= path.share[:, 1], 0, 1)
        rows = np.arange(c1.drop.n)
        own = path.share[rows, k] * path.g_own[rows, k] / path.f
        key = own * (comp.f_s - comp.f_col) >= 0.5 * comp.f_s
        # fading from the envelope (share ≤ 0.5) to the member's own table (≥ 0.6)
        # linearly (chain.own_table_weight, so the factor does not step at one half)
        w_own = np.clip((own * (comp.f_s - comp.f_col) / comp.f_s - 0.5) / 0.1, 0.0, 1.0)
        cond = np.where(key, [amplification.CONDITIONS.index(x) for x in s["cond"]], -1)
        ref = amplification.amplification(inp.M, m_path, f_b - comp.f_s, comp.f_s,
                                          struck_mass=sm.m_e > 0.0, cond=cond,
                                          xi=path.a[rows, k] / s["L"], own_weight=w_own)
        assert key.any() and not key.all()  # both kinds of point are exercised
        from droprig.solver import impact as impact_mod
        _, F_ref, _ = impact_mod.impact_elastic(inp.W, inp.h, f_b, sm.eta)
        F_cap = np.where(inp.crushable, inp.F_c, imp.F_crush)
        stroke = np.where(inp.crushable, inp.s_c, c1.drop.fm.level.deck.cover)
        holds = amplification.crush_depth_bound(inp.W, inp.h, f_b, F_cap) <= stroke
        # the member energy bound (energy conservation; minimum potential energy)
        F_low = np.where(inp.crushable, np.fmin(inp.F_c, imp.F_crush), F_cap)
        s_all = np.where(inp.crushable, inp.s_c + c1.drop.fm.level.deck.cover, stroke)
        F_E = amplification.member_energy_force(inp.W, inp.h, comp.f_s, f_b - comp.f_s,
                                                F_low, s_all)
        fo = amplification.amplified_forces(
            ref, imp.F, F_ref, amplification.contact_force_bound(inp.W, inp.h, f_b - comp.f_s),
            F_cap, holds, imp.bottomed | imp.deck_through, F_energy=F_E)
        # the light loads' points take the impulse bound where it is less
        # (chain._with_impulse_bounds: pointhistory.impulse_factors, itself checked
        # against the time history in tests/solver/test_amplification_impulse.py)
        ti = amplification.SET_BY.index("impulse bound")
        for A, Fx, by in ((amp.A_moment, fo.moment, "moment"),
                          (amp.A_force, fo.local, "local")):
            bound = np.maximum(Fx / imp.F, 1.0)
            imp_pts = amp.set_by[by] == ti
            np.testing.assert_allclose(A[ok & ~imp_pts], bound[ok & ~imp_pts], rtol=REL)
            assert np.all(A[ok & imp_pts] <= bound[ok & imp_pts] * (1 + REL))
            sel = np.flatnonzero(ok & imp_pts)
            if sel.size:
                got = pointhistory.impulse_factors(c1, sel, inp.h[sel], imp.F[sel])
                q = "moment" if by == "moment" else "force"
                # fading into the other bounds from r = 0.5 to 1, linearly in ln r
                # (chain.impulse_fade): A_I + t·(bound − A_I)
                t = np.clip(np.log(amp.mass_ratio[sel] / 0.5) / np.log(2.0), 0.0, 1.0)
                A_I = np.maximum(got[q], 1.0)
                np.testing.assert_allclose(A[sel], A_I + t * (bound[sel] - A_I), rtol=REL)
        # the contact force never above the crushing force where the crushing holds
        # within its stroke (elastic–perfectly plastic contact)
        assert np.all(fo.local[ok & holds] <= np.maximum(F_cap, imp.F)[ok & holds] * (1 + REL))
        # amplified check = the energy-method check at A·F (linear in F)
        for name in ("flexure", "shear", "web_yielding", "deck_punching"):
            A = amp.factor[name]
            U_ref = c0[Demands].checks[name].U_at(A * imp.F)
            np.testing.assert_allclose(c1[Demands].checks[name].U[ok], U_ref[ok], rtol=REL)
            assert np.all(c1[Demands].checks[name].U[ok]
                          >= c0[Demands].checks[name].U[ok] * (1 - REL))
            assert np.all(A >= 1.0)
        # contact-force factor of the local checks never beyond the rigid-base bound
        F_loc = amp.factor["web_yielding"] * imp.F
        assert np.all(F_loc[ok] <= np.maximum(amp.F_bound[ok], imp.F[ok]) * (1 + REL))


def test_on_never_reads_lower_than_off() -> None:
    r0 = analysis.analyse(_project(False))
    r1 = analysis.analyse(_project(True))
    for b0, b1 in zip(r0.bays, r1.bays, strict=True):
        assert b1.max_utilisation >= b0.max_utilisation * (1 - REL)


def test_setting_round_trips_and_is_omitted_when_off() -> None:
    p = _project(True)
    text = dumps_project(p)
    assert '"dynamic_amplification": true' in text
    assert loads_project(text).settings.dynamic_amplification is True
    assert "dynamic_amplification" not in dumps_project(_project(False))


@pytest.mark.parametrize("bad", ["yes", 1])
def test_setting_must_be_a_bool(bad: object) -> None:
    from droprig.model import ModelError
    p = _project(False)
    with pytest.raises(ModelError, match="dynamic_amplification"):
        replace(p.settings, dynamic_amplification=bad)


def test_on_beyond_yield_takes_the_amplified_energy() -> None:
    # Biggs (1964) elastic–plastic energy balance with the kinetic energy × A_δ²: more
    # energy gives a larger plastic deflection and a lower allowable plastic height
    from droprig.solver.chain import BeyondYield, InverseAnswers

    for c0, c1 in zip(_chains(False), _chains(True), strict=True):
        A = c1[DynamicAmplification].A_deflection
        np.testing.assert_allclose(c1[BeyondYield].h_struct, c0[BeyondYield].h_struct * A**2,
                                   rtol=REL)
        d0, d1 = c0[BeyondYield].d_m, c1[BeyondYield].d_m
        both = np.isfinite(d0) & np.isfinite(d1)
        assert np.all(d1[both] >= d0[both] * (1 - REL))
        h0, h1 = c0[InverseAnswers].h_pl, c1[InverseAnswers].h_pl
        both = np.isfinite(h0) & np.isfinite(h1)
        assert np.all(h1[both] <= h0[both] * (1 + REL))


@pytest.mark.parametrize("two_forces", [False, True])
def test_each_family_amplifies_the_force_it_reads(monkeypatch, two_forces: bool) -> None:
    # chain.TWO_FORCES on: the framing families read the framing force F, the deck's
    # checks the deck's force F_deck (the contact force under a soft load); each
    # family's amplified force is the larger of its own force and the bounds
    # (amplification.amplified_forces), so amplification never lowers a family below
    # what it reads with amplification off, and the deck never above the larger of
    # F_deck and the contact-force bound
    from droprig.solver import chain as chain_mod
    monkeypatch.setattr(chain_mod, "TWO_FORCES", two_forces)
    off, on = _chains(False), _chains(True)
    saw_two = False
    for c0, c1 in zip(off, on, strict=True):
        imp, amp = c1[Impact], c1[DynamicAmplification]
        ok = np.isfinite(imp.F) & (imp.F > 0.0)
        saw_two |= imp.F_deck is not None and bool(np.any(imp.deck_ratio[ok] != 1.0))
        for name, chk in c1[Demands].checks.items():
            assert np.all(chk.U[ok] >= c0[Demands].checks[name].U[ok] * (1 - REL)), name
        F_deck = imp.F * imp.deck_ratio
        A_deck = amp.factor["deck_punching"]
        bound = np.maximum(F_deck, np.minimum(amp.F_bound, amp.A_force * imp.F))
        assert np.all((A_deck * F_deck)[ok] <= np.maximum(bound, F_deck)[ok] * (1 + REL))
        assert np.all(A_deck >= 1.0)
        for name in ("deck_flexure", "deck_punching"):
            U_ref = c0[Demands].checks[name].U_at(A_deck * imp.F)
            np.testing.assert_allclose(c1[Demands].checks[name].U[ok], U_ref[ok], rtol=REL)
    assert saw_two == two_forces


def test_forward_run_of_the_bounds_at_another_height_reads_the_deck_at_its_own_force(
        ) -> None:
    """chain.amplified_utilisation_at (the height confirmation's forward run of the
    bounds) at a fall h other than the planned one must read what the chain run at h
    reads: step 5 scaled the deck's (contact) families to the planned height's
    F_deck/F, which changes with h (two forces per point). A random floor (seed 13 of
    tests/permit_projects.py, invented) at a point whose deck flexure governs: with
    the planned ratio it read U 1.001 at falls where the chain reads 0.43-0.77, so the
    confirmation found no height (NaN) and the bay was excluded although a hook limit
    holds (the closed loop of tests/test_permit.py with amplification on). Each check
    is linear in its force (U = |F·u + E|/R), so the two must agree to rounding."""
    from droprig.solver import chain, floor, geometry
    from tests.permit_projects import random_project

    p = random_project(13)
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    zone = p.lift_zones[0]
    load = zone.loads[0]
    fm = floor.floor_cache(p)(zone.level_id)
    geo = geometry.point_geometry(fm, p, np.array([2.0]), np.array([0.25]))
    planned = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
    for H in (0.03, 0.138, 0.3):
        at_h = evaluate_chain(fm, p, replace(load, drop_height=H), geo,
                              v_hoist=zone.hoist_speed)
        h = at_h[LoadInputs].h
        assert planned[Impact].deck_ratio[0] != pytest.approx(at_h[Impact].deck_ratio[0])
        U_fn = chain.amplified_utilisation_at(planned, h)
        U_fw = np.max([c.U for c in at_h[Demands].checks.values()], axis=0)
        np.testing.assert_allclose(U_fn, U_fw, rtol=1e-9)
    # the elastic height is found, and the chain run at it holds
    h_el = planned[chain.InverseAnswers].h_el
    assert np.isfinite(h_el[0]) and h_el[0] > 0.0
    at = evaluate_chain(fm, p, replace(load, drop_height=float(h_el[0])), geo,
                        v_hoist=zone.hoist_speed)
    assert float(at[chain.Checks].U[0]) <= 1.0 + 1e-9

"""Inverse answers through the crushing-limited contact, and the forward trial of every
limit a bay offers (droprig.solver.confirm).

Forward model checked against: the crushing-limited contact of
droprig.solver.crushing (the constant-force layer energy balance ηWh + W(δ + c) =
δ²/(2f) + F_crush·c, Gere, *Mechanics of Materials* 7th ed. §9.10, with EN 1992-1-1
§6.7 for the crushing force) and Gere Eq. 9-94 for the elastic part. The inverse
answers are checked against that forward model, as issue 10 asks (never against a
number of our own); projects are the invented demo and random projects.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analyse, crushing, limits
from droprig.solver import impact as impact_mod
from droprig.solver.chain import _mass_through_crushing, with_crush_energy
from tests.permit_projects import random_project

ROOT = Path(__file__).resolve().parents[2]

# a hard 500 kg load on a stiff point whose concrete crushes at 2 MN, cover 25 mm
W = 500.0 * impact_mod.G
F_ALLOW = 3.0e6  # above the crushing force: the force passes it only through the cover
F_CRUSH = 2.0e6
COVER = 0.025
F = 2.0e-9  # m/N
ETA = 0.6


def _forward(h: float, M: float = 500.0, m_e: float | None = None) -> float:
    """Peak force of the impact step: elastic (Gere Eq. 9-94), capped by crushing."""
    Wm = M * impact_mod.G
    eta = ETA if m_e is None else float(impact_mod.mass_efficiency(M, m_e))
    _, F_el, _ = impact_mod.impact_elastic(Wm, h, F, eta)
    if float(F_el) <= F_CRUSH:
        return float(F_el)
    Fc, _, _ = crushing.crushing_limited_impact(Wm, h, F, eta, F_CRUSH, COVER)
    return float(Fc)


def test_allowable_height_counts_the_crushing_through_the_cover() -> None:
    h_el = float(limits.allowable_drop_height_elastic(W, F_ALLOW, W * F, ETA))
    h = float(with_crush_energy(np.array(h_el), np.array(True), np.array(F_CRUSH),
                                np.array(COVER), np.array(W), np.array(ETA)))
    # the crushing work (F_crush − W)·cover over ηW, added (energy balance)
    assert h == pytest.approx(h_el + (F_CRUSH - W) * COVER / (ETA * W), rel=1e-12)
    assert _forward(h * (1 - 1e-9)) <= F_ALLOW * (1 + 1e-9)
    assert _forward(h * 1.001) > F_ALLOW
    # the purely elastic answer would have been far too low: the force stays at the
    # crushing force between the two
    assert _forward(0.5 * (h_el + h)) == pytest.approx(F_CRUSH, rel=1e-12)


@pytest.mark.parametrize("m_e", [0.0, 200.0, 2000.0])
def test_allowable_mass_by_bisection_on_the_forward_model(m_e: float) -> None:
    h = 0.4
    M_el = limits.allowable_mass(np.array([F_ALLOW]), np.array([h]), np.array([F]),
                                 np.array([m_e]))
    M = float(_mass_through_crushing(np.array([F_ALLOW]), np.array([h]), np.array([F]),
                                     np.array([m_e]), np.array([F_CRUSH]), COVER, M_el)[0])
    assert M >= float(M_el[0])
    assert _forward(h, M, m_e) <= F_ALLOW * (1 + 1e-9)
    assert _forward(h, M * 1.001, m_e) > F_ALLOW


def _conditions_hold(project, res, spacing: float | None) -> int:
    """Apply every hook limit and advised mat the permit prints (droprig.permit) at
    the bay's analysis points (``spacing`` None) or at a lattice of that spacing over
    the bay, through the forward chain; returns how many were applied."""
    from droprig.model import bays
    from droprig.permit import derive_conditions
    from droprig.solver import droppoints, evaluate, floor, geometry

    pc = derive_conditions(project, res)
    applied = 0
    for bv in pc.bays:
        zone = project.zone(bv.zone_id)
        load = replace(next(ld for ld in zone.loads if ld.name == bv.load_name), hard=False)
        lv = project.level(bv.level_id)
        fm = floor.floor_cache(project)(lv.id)
        rect = next(x.rect for x in bays(lv) if x.id == bv.bay_id)
        if spacing is None:
            case = next(c for c in res.cases
                        if (c.zone_id, c.load_name) == (bv.zone_id, bv.load_name))
            tol = 1e-7
            sel = ((case.x >= rect.x0 - tol) & (case.x <= rect.x1 + tol)
                   & (case.y >= rect.y0 - tol) & (case.y <= rect.y1 + tol))
            X, Y = case.x[sel], case.y[sel]
        else:
            gx = np.arange(rect.x0, rect.x1 + 1e-9, spacing)
            gy = np.arange(rect.y0, rect.y1 + 1e-9, spacing)
            X, Y = (a.ravel() for a in np.meshgrid(gx, gy))
            keep = droppoints.in_zone(zone, X, Y)
            X, Y = X[keep], Y[keep]
        kinds = {c.kind for c in bv.conditions}
        allowed = (0, 1) if "separate_signoff" in kinds else (0,)  # elastic, plastic
        geo = geometry.point_geometry(fm, project, X, Y)
        for c in bv.conditions:
            if c.kind == "cap_hook":
                r = evaluate.evaluate_case(fm, project, load, geo,
                                           H=np.full(X.size, c.max_drop_height))
            elif c.kind == "lay_protection" and c.protection_id is None:
                r = evaluate.evaluate_case(fm, project, load, geo,
                                           mat_k=np.full(X.size, c.mat_stiffness_max))
            else:
                continue
            assert np.isin(r["response"], allowed).all(), (
                bv.bay_id, bv.load_name, c.sentence(), float(np.nanmax(r["utilisation"])))
            applied += 1
    return applied


def test_every_printed_limit_works_at_the_bays_points_on_the_demos() -> None:
    """Each hook limit and mat the demos' permits print, applied at every drop point
    of the bay the analysis reports, leaves those points within the response it is
    offered for (the forward chain itself)."""
    applied = 0
    for name in ("steel_erection_floor", "rooftop_plant_swap"):
        project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
        applied += _conditions_hold(project, analyse(project), None)
    assert applied > 0


@pytest.mark.parametrize("seed", [39, 87])
def test_advised_mat_and_hook_limits_hold_between_the_sampled_points(seed: int) -> None:
    """Two random projects where the offered mat (seed 39) and hook limit (seed 87)
    used to fail at points between the analysis' samples (a deck-strip maximum
    between the sampled rows): each condition printed now holds at a lattice of
    points over its bay (0.1 m), run through the forward chain."""
    project = random_project(seed)
    assert _conditions_hold(project, analyse(project), 0.1) > 0


def test_perforation_mass_is_where_the_least_ballistic_limit_meets_the_strike_speed() -> None:
    """local_damage.perforation_mass inverts the families' ballistic limits
    (DOE-STD-3014 App. C / Kennedy 1976 / Degen / Barr / Chang, as
    local_damage.family_ballistic_limits codes them): at the mass returned the
    least ballistic limit over the strike orientations equals the strike speed, and
    a heavier load of that shape perforates (the limit falls with the mass)."""

    from droprig.solver import local_damage as ld

    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    deck = project.levels[0].deck
    load = next(x for x in project.lift_zones[0].loads if x.name.startswith("Spreader"))
    v = float(ld.impact_speed(4.8))

    def least(m: float) -> float:
        out = []
        for o in load.strike_orientations:
            d, p, n = ld.strike_geometry(o, load.footprint_length, load.footprint_width,
                                         load.edge_width)
            out.append(float(np.min(ld.family_ballistic_limits(
                m, d, p, deck.thickness, deck.concrete.fc, deck.concrete.density,
                ld.slab_reinforcement_percent(deck), n))))
        return min(out)

    m = ld.perforation_mass(load, deck, v, 1e4)
    assert 0.0 < m < 1e4
    assert least(m) == pytest.approx(v, rel=1e-6)
    assert least(1.01 * m) < v < least(0.99 * m)
    # a cap below it is returned as is
    assert ld.perforation_mass(load, deck, v, 0.5 * m) == 0.5 * m


def test_a_printed_allowable_mass_keeps_its_bay_elastic_when_lifted() -> None:
    """Closed loop on the allowable mass (the bay summary's 'heaviest load from the
    planned height that keeps the bay elastic'): the rooftop demo's 4 m spreader,
    run again at the mass printed for bay 3-4/A-B, leaves that bay elastic — before
    the mass was confirmed it printed 39.9 kg, and 0.99 × that perforated the deck
    with U 1.04 (the closed form ignored local damage and the refinement's worst
    point). Each bay's printed mass is a forward run's (confirm.py, 'mass' trial)."""
    import dataclasses

    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    res = analyse(project)
    b = next(x for x in res.bays if x.load_name.startswith("Spreader")
             and x.bay_id == "3-4/A-B")
    assert b.allowable_mass is not None and b.allowable_mass > 0.0
    z = project.lift_zones[0]
    loads = tuple(dataclasses.replace(x, mass=b.allowable_mass)
                  if x.name == b.load_name else x for x in z.loads)
    again = analyse(dataclasses.replace(project, lift_zones=(
        dataclasses.replace(z, loads=loads),)))
    b2 = next(x for x in again.bays if (x.load_name, x.bay_id) == (b.load_name, b.bay_id))
    assert b2.response == "elastic" and b2.max_utilisation <= 1.0


@pytest.mark.parametrize("seed", [
    32, 41, 45,  # each printed a mass a lattice point read beyond elastic before
    # seed 31: with two forces the printed mass (about 24 kg of a 1072 kg load) read
    # U 1.002 at a lattice point 0.25 m from column (12.96, 6.42), between the points
    # the analysis samples (measured on two10); it holds since chain.base_on_line
    # (phys10) removed the girder-line step (an expected failure until stop 23)
    31,
])
def test_allowable_masses_hold_on_a_lattice_over_each_bay(seed: int) -> None:
    """Each bay's printed allowable mass (the heaviest load that keeps the bay
    elastic from the planned height), the load run at that mass, as hard as it is,
    at a 0.25 m lattice over the bay through the forward chain (a finer search than
    the analysis's and the trial's points): no point beyond elastic, U ≤ 1.0 + 1e-6
    (the closed loop, droprig's own contract). Over 60 random floors the old closed
    form failed this on 15, the confirmed mass on 1 (seed 31, until the cross strip
    near a girder line was made continuous)."""
    _masses_hold_on_a_lattice(random_project(seed))


@pytest.mark.parametrize("seed", [41])
def test_allowable_masses_hold_on_a_lattice_with_amplification(seed: int) -> None:
    """The same with dynamic amplification on. A point's own allowable mass is Gere's
    Eq. 9-94 solved for M with the factors at the load's own mass (r = M/mₑ keys
    them, and below r = 0.03 the bounds alone apply), so U need not grow as √M: the
    trial of a mass must not leave out the points whose own answer is far above it
    (confirm._span). Before, seed 41 printed 2.24 kg where lattice points read U
    1.02 (a 540 kg load; at 2.24 kg r = 0.018, the bounds; at 4 kg r = 0.033, the
    table, U 0.85) and seed 45 printed 5.14 kg where they read U 1.25 (with the
    tables read at their own mass ratio, chain.table_mass, seed 45 prints no mass of
    1 kg or more, which this lattice cannot try, so it is no longer here)."""
    project = random_project(seed)
    _masses_hold_on_a_lattice(replace(project, settings=replace(
        project.settings, dynamic_amplification=True)))


def _masses_hold_on_a_lattice(project) -> None:
    from droprig.model import bays
    from droprig.solver import droppoints, evaluate, floor, geometry

    res = analyse(project)
    tried = 0
    for b in res.bays:
        m = b.allowable_mass
        if m is None or not np.isfinite(m):
            continue
        zone = project.zone(b.zone_id)
        load = next(ld for ld in zone.loads if ld.name == b.load_name)
        trial = replace(load, mass=max(m, 1.0))  # the model's least declared mass
        if trial.mass != m:
            continue
        lv = project.level(b.level_id)
        fm = floor.floor_cache(project)(lv.id)
        rect = next(x.rect for x in bays(lv) if x.id == b.bay_id)
        gx = np.arange(rect.x0, rect.x1 + 1e-9, 0.25)
        gy = np.arange(rect.y0, rect.y1 + 1e-9, 0.25)
        X, Y = (a.ravel() for a in np.meshgrid(gx, gy))
        keep = droppoints.in_zone(zone, X, Y)
        X, Y = X[keep], Y[keep]
        if X.size == 0:
            continue
        geo = geometry.point_geometry(fm, project, X, Y)
        r = evaluate.evaluate_case(fm, project, (trial,), geo, np.zeros(X.size, np.int64),
                                   H=np.full(X.size, float(b.planned_drop_height or 0.0)),
                                   v_hoist=zone.hoist_speed)
        ok = np.isfinite(r["utilisation"])
        assert (r["response"][ok] == 0).all(), (b.bay_id, b.load_name, m)
        assert float(np.max(r["utilisation"][ok], initial=0.0)) <= 1.0 + 1e-6, (
            b.bay_id, b.load_name, m, float(np.max(r["utilisation"][ok])))
        tried += 1
    assert tried > 0


def test_calculation_sheet_states_the_mass_the_bay_prints() -> None:
    """The calculation sheet of the point that sets a bay's allowable mass holds the
    point's closed-form mass (Gere §9.10 solved for M) and the mass held below
    perforation (the perforation families' ballistic limits, bisection); the bay
    prints LIMIT_MARGIN × that, tried by the forward chain (never more). Rooftop demo,
    4 m spreader over 3-4/A-B: 39.9 kg closed form, 33.7 kg not perforating, 30.3 kg
    printed; the sheet said only 39.9 kg before, beside a table's 30.3 kg."""
    from droprig.solver import trace_point
    from droprig.solver.results import LIMIT_MARGIN

    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    b = next(x for x in analyse(project).bays if x.load_name.startswith("Spreader")
             and x.bay_id == "3-4/A-B")
    t = trace_point(project, b.zone_id, b.load_name, b.allowable_mass_x, b.allowable_mass_y)
    by = {s.symbol: s.value for s in t.steps}
    # with two forces per point the least mass of the bay lies on the crushable pad
    # (one force there, no local damage assessed: the pad takes the hit) — the sheet
    # states the point's mass, and the held-below-perforation mass where assessed
    m_point = by.get("M_allow,p", by["M_allow"])
    assert m_point <= by["M_allow"]
    assert b.allowable_mass <= LIMIT_MARGIN * m_point * (1.0 + 1e-9)
    # the bare deck's points of the bay state both (a hard spreader perforates first)
    pts = [s for s in trace_point(project, b.zone_id, b.load_name, 20.0, 4.0).steps
           if s.symbol in ("M_allow", "M_allow,p")]
    bare = {s.symbol: s.value for s in pts}
    assert bare["M_allow,p"] < bare["M_allow"]


def test_neighbour_pairs_of_the_cell_hash_equal_every_pair_within_reach() -> None:
    """The fast neighbour search of the steep stretches (a cell hash) against the
    plain reference: every pair of points no farther apart than the reach, from the
    full distance matrix (numpy). Random points with a dense cluster (a refinement
    lattice) and points exactly a reach apart."""
    from droprig.solver.confirm import _neighbours

    rng = np.random.default_rng(7)
    x = np.r_[rng.uniform(0.0, 9.0, 300), 4.0 + 0.03 * np.arange(5).repeat(5), 0.0, 0.5]
    y = np.r_[rng.uniform(0.0, 7.5, 300), 3.0 + 0.03 * np.tile(np.arange(5), 5), 0.0, 0.0]
    reach = 0.5
    i, j = _neighbours(x, y, reach)
    got = {(min(a, b), max(a, b)) for a, b in zip(i.tolist(), j.tolist(), strict=True)}
    assert len(got) == i.size  # each pair once
    d = np.hypot(x[:, None] - x[None, :], y[:, None] - y[None, :])
    a, b = np.nonzero(np.triu(d <= reach, k=1))
    assert got == set(zip(a.tolist(), b.tolist(), strict=True))


def test_a_plastic_limit_holds_across_a_steep_change_between_samples() -> None:
    """Random project 41, bay 1-2/B-C, load 0 (an invented floor, grid 1.0 m): along
    the bay's edge y = 7.48 m the point's plastic allowable height (the chain's own
    inverse answer) falls from about 0.45 m at x = 0.53 m to 0.18 m at x = 0.60 m and
    rises again to 0.27 m at x = 0.95 m. The analysis samples x = 0.475 and 0.949 m,
    both above 0.26 m, so the least height of the bay's samples (0.217 m) lies above
    the dip, and the hook limit printed from it (0.196 m) used to leave the bay
    exceeding when followed (U 1.24 on re-analysis). The confirmation cuts the steep
    stretch between those samples (droprig.solver.confirm._Stretches). Checked
    against the forward chain itself: the bay's height limit, applied at a 10 mm line
    of points along the whole bay's edge, keeps every point within the response it
    is offered for (plastic, with the engineer's sign-off). The limit lies below the
    top of the 164 mm pad that covers part of the bay: since stop 33 the bay keeps it
    and the permit keeps the load off that pad there (droprig.model.
    limit_is_practical; before, the pad took the limit away and the bay was
    excluded), so the permit's hook limit is checked the same way."""
    from droprig.model import bays
    from droprig.permit import derive_conditions
    from droprig.solver import evaluate, floor, geometry

    project = random_project(41)
    res = analyse(project)
    key = ("1-2/B-C", "load 0")
    bv = next(b for b in derive_conditions(project, res).bays
              if (b.bay_id, b.load_name) == key)
    s = next(b for b in res.bays if (b.bay_id, b.load_name) == key)
    lv = project.level(bv.level_id)
    rect = next(b.rect for b in bays(lv) if b.id == bv.bay_id)
    zone = project.zone(bv.zone_id)
    load = replace(next(ld for ld in zone.loads if ld.name == bv.load_name), hard=False)
    fm = floor.floor_cache(project)(lv.id)
    x = np.arange(rect.x0, rect.x1 + 1e-9, 0.01)
    geo = geometry.point_geometry(fm, project, x, np.full(x.size, rect.y0))
    at = evaluate.evaluate_case(fm, project, load, geo, v_hoist=zone.hoist_speed)
    hp = at["allowable_drop_height_plastic"]
    # the premise: the dip lies between the analysis' samples of that line
    case = next(c for c in res.cases if c.load_name == bv.load_name)
    on_line = np.isclose(case.y, rect.y0) & (case.x > 0.4) & (case.x < 1.0)
    assert case.x[on_line].size >= 2
    assert np.all(case.allowable_drop_height_plastic[on_line] > 0.26)
    dip = (x > 0.55) & (x < 0.75)
    assert np.nanmin(hp[dip]) < 0.19
    # the bay's limit (a drop beyond the elastic limits, the plastic limit offered)
    # holds across it, and so does any hook limit the permit prints
    assert s.advice_kind == "limit_height" and s.height_limit_yields
    limits = [s.height_limit] + [c.max_drop_height for c in bv.conditions
                                 if c.kind == "cap_hook"]
    cap = next(c for c in bv.conditions if c.kind == "cap_hook")
    assert s.height_limit < max(pa.thickness for pa in cap.off_pads)
    assert bv.verdict == "acceptable_with_conditions"
    for h in limits:
        assert h is not None and h < np.nanmin(hp)
        r = evaluate.evaluate_case(fm, project, load, geo, H=np.full(x.size, h),
                                   v_hoist=zone.hoist_speed)
        assert np.isin(r["response"], (0, 1)).all(), (h, float(np.nanmax(r["utilisation"])))

"""The confirmation of the amplified allowable heights re-runs only the points still
over (``chain.confirm_amplified_height`` on ``chain.rows_chain``), and the bounds
read height-free quantities kept with the chain (``chain.table_amplification``,
``chain.bottoming_floors``, ``pointhistory.struck_members``); each against its plain
reference.

The plain references are the chain's own forms: ``chain.amplified_utilisation_at``
over every point (the impact of Gere, *Mechanics of Materials* 7th ed. §9.10 Eq. 9-94
and the amplification bounds at the fall), ``chain.confirm_amplified_height_reference``
(every live point re-run each round, as first written), ``pointhistory.struck_member``
with ``member_energy_peaks`` and ``chain.bottoming_floor`` at the rows asked. Every
quantity of these steps is per point, so the shortcut does the same arithmetic on the
same numbers: compared at tolerance 0 (bit for bit; common practice, no source).
Points, heights and subsets are random over the invented demo projects and random
projects (invented data).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, pointhistory
from droprig.solver.chain import Impact, LoadInputs
from droprig.solver.evaluate import evaluate_chain
from tests.permit_projects import random_project

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _amplified(p):
    return replace(p, settings=replace(p.settings, dynamic_amplification=True))


def _chains(p, seed: int, n: int = 120):
    """One chain per load of each zone of ``p`` (amplification on) at ``n`` random
    points, and the generator it drew them with; every other load lands tilted
    (``Drop.landing``)."""
    p = _amplified(p)
    k = 0
    rng = np.random.default_rng(seed)
    for zone in p.lift_zones:
        lv = p.level(zone.level_id)
        fm = analysis.build_floor(lv, p.settings)
        ext = lv.grid.extent
        geo = analysis.point_geometry(fm, p, rng.uniform(ext.x0, ext.x1, n),
                                      rng.uniform(ext.y0, ext.y1, n))
        for load in zone.loads:
            k += 1
            yield evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed,
                                 landing="tilted" if k % 2 == 0 else "flat"), rng


def _projects():
    for demo in DEMOS:
        yield demo.stem, load_project(demo)
    for seed in (3, 8, 21):
        yield f"random{seed}", random_project(seed)


PROJECTS = list(_projects())


@pytest.mark.parametrize(("name", "p"), PROJECTS, ids=[n for n, _ in PROJECTS])
def test_rows_give_the_full_runs_utilisation(name, p) -> None:
    """U of the amplified bounds at random falls: the rows' own chain against every
    point's, bit for bit, with the kept quantities and without."""
    seen = 0
    for c, rng in _chains(p, 5):
        n = c.drop.n
        for h in (10 ** rng.uniform(-3, 1, n), c[LoadInputs].h * rng.uniform(0.1, 2, n)):
            full = chain.amplified_utilisation_at(c, h)
            rows = np.flatnonzero(rng.random(n) < 0.4)
            got = chain.amplified_utilisation_at(c, h, rows=rows)
            np.testing.assert_array_equal(got[rows], full[rows])
            assert np.isnan(np.delete(got, rows)).all()
            # the rows' chain: the impact and every factor of the bounds
            sub = chain.rows_chain(c, rows)
            imp_f, imp_s = chain.impact_at(c, h), chain.impact_at(sub, h[rows])
            np.testing.assert_array_equal(imp_s.F, imp_f.F[rows])
            np.testing.assert_array_equal(imp_s.deck_ratio, imp_f.deck_ratio[rows])
            amp_f = chain.amplification_at(c, h, imp_f, th_points=np.zeros(n, bool))
            amp_s = chain.amplification_at(sub, h[rows], imp_s,
                                           th_points=np.zeros(rows.size, bool))
            for k, v in amp_f.factor.items():
                np.testing.assert_array_equal(amp_s.factor[k], v[rows], err_msg=k)
            for k, v in amp_f.set_by.items():
                np.testing.assert_array_equal(amp_s.set_by[k], v[rows], err_msg=k)
            seen += rows.size
    assert seen > 40


@pytest.mark.parametrize(("name", "p"), PROJECTS, ids=[n for n, _ in PROJECTS])
def test_confirmation_equals_its_reference(name, p) -> None:
    """The confirmed heights from closed-form-like starting heights (random, up to
    twice the planned fall): identical to re-running every point each round."""
    lowered = 0
    for c, rng in _chains(p, 9):
        n = c.drop.n
        h0 = c[LoadInputs].h * rng.uniform(0.2, 3.0, n)
        h0[rng.random(n) < 0.1] = np.nan  # points with no height stay so
        got = chain.confirm_amplified_height(c, h0)
        ref = chain.confirm_amplified_height_reference(c, h0)
        np.testing.assert_array_equal(got, ref)
        lowered += int(np.sum(np.isfinite(h0) & ~(got == h0)))
    assert lowered > 0  # the rounds did lower heights (the test exercised them)


@pytest.mark.parametrize(("name", "p"), PROJECTS[:3], ids=[n for n, _ in PROJECTS[:3]])
def test_kept_quantities_equal_their_plain_forms(name, p) -> None:
    """The struck member and its unit envelopes, and the bottoming floor, kept per
    chain: equal at every row to the functions worked out at those rows alone."""
    pads = 0
    for c, rng in _chains(p, 13):
        kept = pointhistory.struck_members(c)
        on = np.flatnonzero((c.drop.geo.path.pair >= 0) & ~c.drop.geo.opening)
        sel = np.sort(rng.choice(on, size=min(on.size, 40), replace=False))
        plain = pointhistory.struck_member(c, sel)
        for k, v in plain.items():
            np.testing.assert_array_equal(kept[k][sel], v, err_msg=k)
        F = c[Impact].F[sel]
        energy = pointhistory.member_energy_peaks(plain, F)
        w = plain["share"]
        np.testing.assert_array_equal(w * F * kept["unit_m"][sel], energy["moment"])
        np.testing.assert_array_equal(w * F * kept["unit_v"][sel], energy["shear"])
        # the impulse factors with the kept rows and without
        h = c[LoadInputs].h[sel]
        plain_f = pointhistory.impulse_factors(c, sel, h, F)
        c._once[pointhistory.struck_members] = kept
        kept_f = pointhistory.impulse_factors(c, sel, h, F)
        for q, v in plain_f.items():
            np.testing.assert_array_equal(kept_f[q], v, err_msg=q)
        floors = chain.bottoming_floors(c)
        p2 = np.flatnonzero(chain.pad_two_mass(c))
        if p2.size:
            inp, comp, sm = c[LoadInputs], c[chain.Compliance], c[chain.StruckMass]
            assert sm.m2 is not None
            one = chain.bottoming_floor(inp.W[p2], inp.F_c[p2], inp.s_c[p2],
                                        comp.f_struct[p2], sm.eta[p2],
                                        comp.f_series[p2], comp.f_s[p2], sm.m2[p2])
            np.testing.assert_array_equal(floors[p2], one)
            pads += p2.size
    assert (pads > 0) == (name != "two_level_rigging")


def test_single_members_confirmation_equals_its_reference() -> None:
    """``droprig check``'s one member (the deck-less mode, ``Drop.bare``) with
    amplification: the confirmed height from random starting falls, with and without
    the rows' chain (random invented members: spans, positions, masses)."""
    from droprig.solver.member import MemberDrop, member_chain
    from tests.builders import BEAM, S355

    rng = np.random.default_rng(17)
    checked = 0
    for cond in ("simple", "fixed", "propped", "cantilever"):
        for _ in range(2):
            L = float(rng.uniform(3.0, 9.0))
            c = member_chain(MemberDrop(BEAM, S355, cond, L, float(rng.uniform(0.1, 0.9)) * L,
                                        float(10 ** rng.uniform(0, 3)),
                                        float(rng.uniform(0.05, 2.0)), "en1993",
                                        dynamic_amplification=True))
            for h0 in (0.01, 0.3, 3.0):
                h = np.full(c.drop.n, h0)
                with np.errstate(all="ignore"):  # as member_chain runs the chain
                    got = chain.confirm_amplified_height(c, h)
                    ref = chain.confirm_amplified_height_reference(c, h)
                np.testing.assert_array_equal(got, ref)
                checked += 1
    assert checked == 24

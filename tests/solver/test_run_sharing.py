"""Work the floor analysis shares between rows of one run, against the plain runs.

Three speed paths, each compared with its plain form on the same inputs (DEVELOPERS.md,
"Fast kernels beside plain formulas"; common practice, no source):

* ``evaluate._distinct_rows``: a trial run's repeated rows (the same point, load,
  trial height and mat) are run once and their outputs spread back. Plain form: every
  row run (``evaluate._outputs``). Every step of the chain works row by row, so the
  numbers are the same bit for bit: compared exactly.
* ``chain.TwoForceKernel._own_bottoming_floor``: a height search's kernel works out
  ``chain.bottoming_floor`` once per row (it reads no height). Plain form: the
  function itself at those rows; and the kernel's forces against the impact step
  (``chain.impact_at``, whose physics tests/solver/test_two_force_kernel.py and
  test_after_bottoming.py check against Gere 7th ed. §9.10 and scipy time
  histories). Compared exactly (the same function of the same inputs).
* The tip-off rows riding in the ordinary run (``evaluate._with_tip_rows``) are
  compared with the two separate runs merged in tests/solver/test_tip_off_fold.py.

The demo project is an invented scenario.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import chain, evaluate
from droprig.solver.chain import Impact, TwoForceKernel, bottoming_floor, impact_at
from droprig.solver.floor import floor_model
from droprig.solver.geometry import point_geometry, take_geo

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def rooftop():
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = p.lift_zones[0]
    fm = floor_model(p.level(zone.level_id), p.settings)
    # across the pads (free edge at y = 9.3 m) and the bare deck
    xs, ys = np.meshgrid(np.linspace(1.0, 14.0, 7), np.linspace(6.5, 11.5, 6))
    geo = point_geometry(fm, p, xs.ravel(), ys.ravel())
    return p, zone, fm, geo


def test_distinct_rows_maps_every_row_to_its_first_copy():
    x = np.array([1.0, 2.0, 1.0, 3.0, 2.0, 1.0])
    y = np.array([5.0, 5.0, 5.0, 5.0, 5.0, 6.0])
    geo = type("G", (), {})()
    geo.x, geo.y = x, y
    geo.bay = geo.protection = np.zeros(6, dtype=np.int64)
    geo.opening = np.zeros(6, dtype=bool)
    H = np.array([2.0, 2.0, 2.0, 2.0, 2.5, 2.0])
    got = evaluate._distinct_rows(geo, None, H, None)  # type: ignore[arg-type]
    assert got is not None
    u, back = got
    # rows 0 and 2 repeat; row 4 differs from row 1 by its height, row 5 by its y
    np.testing.assert_array_equal(u, [0, 1, 3, 4, 5])
    np.testing.assert_array_equal(u[back], [0, 1, 0, 3, 4, 5])
    # all distinct: no sharing
    assert evaluate._distinct_rows(geo, np.arange(6), H, None) is None  # type: ignore[arg-type]


def test_trial_with_repeated_rows_equals_every_row_run(rooftop):
    p, zone, fm, geo = rooftop
    loads = tuple(zone.loads)
    n = geo.x.size
    rng = np.random.default_rng(3)
    idx = rng.integers(0, n, 2 * n)  # every point about twice, in any order
    g = take_geo(geo, idx, steps=False)
    li = idx % len(loads)
    # trial heights from 0.3 m to 4 m (below and above the pads' tip-off Δ, ~1 m),
    # the same at the repeats of a point
    H = np.linspace(0.3, 4.0, n)[idx]
    mat = np.where(idx % 5 == 0, 5e6, np.nan)
    with np.errstate(all="ignore"):
        got = evaluate.evaluate_case(fm, p, loads, g, li, H, mat, trial=True,
                                     v_hoist=zone.hoist_speed)
        ref = evaluate._outputs(fm, p, loads, g, li, H, mat, zone.hoist_speed, True)
    assert evaluate._distinct_rows(g, li, H, mat) is not None  # the shared path ran
    assert got.keys() == ref.keys()
    for k, a in ref.items():
        np.testing.assert_array_equal(got[k], a, err_msg=k)


def test_height_search_bottoming_floor_once_per_row(rooftop):
    p, zone, fm, geo = rooftop
    c = evaluate.evaluate_chain(fm, p, zone.loads[0], geo, v_hoist=zone.hoist_speed)
    searched = c[Impact].searched
    assert searched is not None
    idx = np.flatnonzero(searched)
    kern = TwoForceKernel(c, idx)
    assert kern.pad.sum() >= 5  # rows on the crushable pads
    rng = np.random.default_rng(8)
    # falls from 1 cm to 30 m, and just past each pad row's bottoming (where the
    # floor is what the framing takes: the force must not fall across it)
    hb = np.full(c.drop.n, np.nan)
    hb[idx] = kern.bottoming_fall()
    near = np.isfinite(hb)
    assert near.sum() >= 5
    for k in range(4):
        h = 10 ** rng.uniform(-2, 1.5, c.drop.n)
        if k % 2:
            h = np.where(near, hb * (1.0 + 10 ** rng.uniform(-6, -2, c.drop.n)), h)
        rows = rng.integers(0, idx.size, 2 * idx.size)
        F, F_deck, eta = kern.forces(h[idx][rows], rows)
        ref = impact_at(c, h)
        assert ref.F_deck is not None and ref.eta_frame is not None
        np.testing.assert_allclose(F, ref.F[idx][rows], rtol=1e-12)
        np.testing.assert_allclose(F_deck, ref.F_deck[idx][rows], rtol=1e-12)
        np.testing.assert_allclose(eta, ref.eta_frame[idx][rows], rtol=1e-12)
    have = np.flatnonzero(kern._have)
    assert have.size >= 3
    # the remembered floors are the function's own at those rows, bit for bit
    plain = bottoming_floor(kern.W[have], kern.F_c[have], kern.s_c[have], kern.f[have],
                            kern.eta[have], kern.f_series[have], kern.f_s[have],
                            kern.m2[have])
    np.testing.assert_array_equal(kern._floor[have], plain)
    # and a search's answers are those of a kernel that remembers nothing
    start = c[chain.InverseAnswers].h_el.copy()
    h_el = chain.two_force_elastic_height(c, start.copy(), TwoForceKernel(c, idx))
    plain_h = chain.two_force_elastic_height(c, start.copy(), _Plain(c, idx))
    np.testing.assert_array_equal(h_el, plain_h)


class _Plain(TwoForceKernel):
    """The kernel with bottoming_floor worked out at every call (the plain form)."""

    def _own_bottoming_floor(self, rows: np.ndarray) -> np.ndarray:
        return bottoming_floor(self.W[rows], self.F_c[rows], self.s_c[rows], self.f[rows],
                               self.eta[rows], self.f_series[rows], self.f_s[rows],
                               self.m2[rows])

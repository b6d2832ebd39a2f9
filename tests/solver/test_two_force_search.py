"""The two-force searches' root finder (``chain.search_boundary``, used by
``chain.two_force_height`` for the allowable heights and masses) ends within
``chain.H_TOL`` below the boundary and on the safe side, whatever its estimates.

Sources: the bracket argument is common practice, no source (a passing and a failing
trial of a non-decreasing excess hold the boundary between them). The synthetic
excesses below have exact boundaries by construction: power laws 1 + r = (h/h*)^p
with p from 0.1 to 2.5 (the range measured on the demos' excesses), steps where a
crushable pad bottoms out (a jump of the force, impact.impact_crushable), and the
larger of two laws (two check families). On the demos the reference is the forward
chain itself (``two_force_utilisation_at`` through ``impact_at``, the plain impact
step): the elastic allowable height passes and the height H_TOL above it fails.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.solver import chain
from droprig.solver.chain import (
    BISECTIONS,
    H_SEARCH_MAX,
    H_TOL,
    Impact,
    InverseAnswers,
    search_boundary,
    two_force_utilisation_at,
)
from tests.solver.test_two_force_demos import _chains

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))
ROUNDING = 1e-9  # the elastic height is lowered by 1e-9 of itself where rounding left it over


class Counted:
    """A vectorised excess of known boundaries ``h_star`` (per point), counting the
    trials it is asked for."""

    def __init__(self, excess) -> None:
        self.excess = excess
        self.rows = 0
        self.calls = 0

    def __call__(self, w: np.ndarray, trial: np.ndarray) -> np.ndarray:
        self.calls += 1
        self.rows += trial.size
        ww = w[:, None] if trial.ndim == 2 else w
        r = self.excess(np.broadcast_to(ww, trial.shape), trial)
        return np.where(np.isnan(r), np.inf, r)


def _power_laws(rng: np.random.Generator, n: int):
    h_star = 10.0 ** rng.uniform(-4.0, 2.0, n)
    p = rng.uniform(0.1, 2.5, n)
    start = h_star * 10.0 ** rng.uniform(-1.5, 1.5, n)  # the closed form's error

    def excess(w: np.ndarray, h: np.ndarray) -> np.ndarray:
        return (h / h_star[w]) ** p[w] - 1.0

    return h_star, start, excess


def _within(found: np.ndarray, h_star: np.ndarray) -> None:
    assert np.all(np.isfinite(found))
    assert np.all(found <= h_star)  # the safe side: a passing trial
    assert np.all(found >= (1.0 - H_TOL) * h_star * (1.0 - 1e-12))


def test_power_law_boundaries_within_tolerance():
    rng = np.random.default_rng(25)
    h_star, start, excess = _power_laws(rng, 2000)
    run = Counted(excess)
    found = search_boundary(run, start, H_SEARCH_MAX)
    _within(found, h_star)
    # the Newton step on the local power law finds these in a few rounds (the √h
    # false position it replaced took ~11 trials a point on the demos)
    assert run.rows / h_star.size < 9.0
    assert run.calls <= 2 + 12 + 32 + 1 + BISECTIONS


def test_two_families_the_larger_excess():
    rng = np.random.default_rng(26)
    h1, start, ex1 = _power_laws(rng, 1000)
    h2 = h1 * 10.0 ** rng.uniform(-0.5, 0.5, h1.size)
    p2 = rng.uniform(0.1, 2.5, h1.size)

    def excess(w: np.ndarray, h: np.ndarray) -> np.ndarray:
        return np.maximum(ex1(w, h), (h / h2[w]) ** p2[w] - 1.0)

    _within(search_boundary(Counted(excess), start, H_SEARCH_MAX), np.minimum(h1, h2))


def test_steps_at_a_pad_bottoming():
    # below the jump the force is the pad's crush force (passes, nearly flat), above
    # it the stage after bottoming (fails): the boundary is the jump itself
    rng = np.random.default_rng(27)
    n = 1000
    jump = 10.0 ** rng.uniform(-3.0, 0.5, n)
    below = -rng.uniform(0.01, 0.9, n)
    above = rng.uniform(0.01, 2.0, n)
    start = jump * 10.0 ** rng.uniform(-1.0, 1.0, n)

    def excess(w: np.ndarray, h: np.ndarray) -> np.ndarray:
        return np.where(h <= jump[w], below[w] + 1e-3 * h / jump[w], above[w])

    bare, hinted = Counted(excess), Counted(excess)
    _within(search_boundary(bare, start, H_SEARCH_MAX), jump)
    # the hint, a trial at the jump (as TwoForceKernel.bottoming_fall gives it)
    _within(search_boundary(hinted, start, H_SEARCH_MAX, jump * (1.0 - 0.2 * H_TOL)),
            jump)
    assert hinted.rows < 0.6 * bare.rows


def test_no_passing_height_and_passing_at_the_top():
    start = np.array([0.1, 0.1, 0.3])

    def excess(w: np.ndarray, h: np.ndarray) -> np.ndarray:
        return np.where(w == 0, 1.0, np.where(w == 1, -0.5, np.sqrt(h / 0.2) - 1.0))

    found = search_boundary(Counted(excess), start, H_SEARCH_MAX)
    assert np.isnan(found[0])  # fails at every height, a zero fall too
    assert found[1] == H_SEARCH_MAX  # passes at the ceiling
    assert 0.2 * (1 - H_TOL) <= found[2] <= 0.2


@pytest.fixture(scope="module")
def demo_chains():
    # 40 random points a zone of each demo, each load's chain (the demos' loads and
    # hoist speeds: tests/solver/test_two_force_demos.py)
    return [c for demo in DEMOS for _, c in _chains(demo, 3, 40)]


def test_demo_elastic_heights_within_tolerance_of_the_forward_chain(demo_chains):
    assert chain.TWO_FORCES
    seen = 0
    for c in demo_chains:
        two = c[Impact].two_mass  # searched from the closed form (pads may keep it)
        assert two is not None
        h = c[InverseAnswers].h_el
        ok = two & np.isfinite(h) & (h > 0.0) & (h < H_SEARCH_MAX * (1 - H_TOL))
        if not ok.any():
            continue
        U = two_force_utilisation_at(c, np.where(ok, h, 0.0), ok)[ok]
        assert float(U.max()) <= 1.0 + ROUNDING
        above = h / (1.0 - H_TOL) * (1.0 + 2 * ROUNDING)
        U_up = two_force_utilisation_at(c, np.where(ok, above, 0.0), ok)[ok]
        assert bool(np.all(U_up > 1.0))
        seen += int(ok.sum())
    assert seen > 50

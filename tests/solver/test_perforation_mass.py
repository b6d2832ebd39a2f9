"""The mass of a hard load that just does not perforate a concrete deck
(:func:`droprig.solver.local_damage.perforation_mass`, the vectorised bracket
search) against its plain bisection (:func:`perforation_mass_reference`) and an
independent root finder.

Sources:
* US DOE, DOE-STD-3014 Appendix C — the perforation families and the 1.2 margin
  on the slab thickness, as :func:`droprig.solver.local_damage.family_ballistic_limits`
  codes them (checked against the published forms in ``test_local_damage.py`` and
  ``test_local_damage_published.py``).
* SciPy, ``scipy.optimize.brentq`` (Brent 1973, *Algorithms for Minimization without
  Derivatives*, ch. 4) — an independent root finder on log M for the mass where the
  least ballistic limit meets the strike speed.

Random loads and decks are inputs only (invented data); every expected value is the
reference's or Brent's root of the published families.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from droprig.model import Concrete, Deck, LiftLoad
from droprig.solver import local_damage as ld

KERNEL_REL = 1e-12
"""Kernel against its plain reference: the same bracket narrowed to the same width
(2⁻⁶⁰ of 40 on log M), so the two masses agree to a few ulps."""

BRENT_REL = 1e-9
"""Against Brent's root on log M (xtol 1e-13): the two roots of the same function."""


def _case(rng: np.random.Generator) -> tuple[LiftLoad, Deck, float, float]:
    L = float(rng.uniform(0.05, 2.0))
    W = float(rng.uniform(0.05, L))
    load = LiftLoad("item", mass=float(rng.uniform(5.0, 2e4)), footprint_length=L,
                    footprint_width=W, edge_width=float(rng.uniform(0.005, 0.1)),
                    hard=True)
    deck = Deck(thickness=float(rng.uniform(0.08, 0.4)),
                concrete=Concrete(fc=float(rng.uniform(20e6, 50e6))))
    v = float(ld.impact_speed(float(rng.uniform(0.2, 30.0)), float(rng.uniform(0.0, 1.0))))
    m_max = float(10.0 ** rng.uniform(0.0, 5.0))
    return load, deck, v, m_max


CASES = [_case(np.random.default_rng(seed)) for seed in range(60)]


@pytest.mark.parametrize("case", CASES)
def test_kernel_matches_the_plain_bisection(case: tuple[LiftLoad, Deck, float, float]) -> None:
    load, deck, v, m_max = case
    fast = ld.perforation_mass(load, deck, v, m_max)
    slow = ld.perforation_mass_reference(load, deck, v, m_max)
    assert fast == pytest.approx(slow, rel=KERNEL_REL, abs=0.0)


def test_random_cases_reach_every_branch() -> None:
    """The random cases include masses capped at m_max and masses found inside the
    bracket (else the comparison above would test one branch only)."""
    found = [ld.perforation_mass(*c) for c in CASES]
    assert sum(m == c[3] for m, c in zip(found, CASES, strict=True)) >= 5
    assert sum(0.0 < m < c[3] for m, c in zip(found, CASES, strict=True)) >= 20


@pytest.mark.parametrize("case", [c for c in CASES
                                  if 0.0 < ld.perforation_mass_reference(*c) < c[3]][:20])
def test_kernel_finds_brents_root(case: tuple[LiftLoad, Deck, float, float]) -> None:
    """Where the answer lies inside the bracket it is the root of least V_bl(M) = v
    (the limit falls as M grows, DOE-STD-3014 App. C families), as Brent finds it."""
    load, deck, v, m_max = case

    def f(log_m: float) -> float:
        return float(ld.least_ballistic_limit(load, deck, math.exp(log_m))) - v

    root = math.exp(brentq(f, math.log(m_max) - 40.0, math.log(m_max), xtol=1e-13,
                           rtol=4 * np.finfo(float).eps))
    assert ld.perforation_mass(load, deck, v, m_max) == pytest.approx(root, rel=BRENT_REL)


def test_least_limit_of_many_masses_is_the_one_mass_answer() -> None:
    """``least_ballistic_limit`` over an array of masses gives, mass for mass, the
    least over the orientations' ballistic limits the start speeds use
    (``_orientation_speeds``, one mass at a time)."""
    for load, deck, _, _ in CASES[:10]:
        masses = np.geomspace(1.0, 1e5, 7)
        many = ld.least_ballistic_limit(load, deck, masses)
        one = [min(r[3] for r in ld._orientation_speeds(load, deck, float(m))) for m in masses]
        assert np.allclose(many, one, rtol=1e-14, atol=0.0)


DISTINCT_REL = 1e-14
"""The damage worked out once per distinct height against the same formulas run at
every point: the same arithmetic on the same values (a few ulps at most)."""


@pytest.mark.parametrize("seed", range(8))
def test_damage_per_distinct_height_is_the_damage_per_point(seed: int) -> None:
    """``distinct_height_damage`` (the chain's local-damage step: one evaluation per
    distinct drop height) gives every point what ``load_local_damage`` gives it run
    point by point (DOE-STD-3014 App. C families; BRL on a steel plate), for few
    heights (remembered) and many (not)."""
    rng = np.random.default_rng(100 + seed)
    load, deck, _, _ = CASES[seed]
    if seed % 4 == 3:
        deck = Deck(kind="steel_plate", thickness=float(rng.uniform(0.006, 0.02)), steel_fy=235e6)
    n_distinct = 3 if seed % 2 == 0 else 40
    heights = rng.uniform(0.1, 25.0, n_distinct)
    h = heights[rng.integers(0, n_distinct, 200)]
    v0 = float(rng.uniform(0.0, 1.0))
    r, at = ld.distinct_height_damage(load, deck, h, v0)
    per_point = ld.load_local_damage(load, deck, h, v0)
    for name in ("penetration", "h_scabbing", "h_perforation", "v_residual"):
        np.testing.assert_allclose(getattr(r, name)[at], getattr(per_point, name),
                                   rtol=DISTINCT_REL, atol=0.0, equal_nan=True)
    for name in ("scabbing", "perforation", "extrapolated", "governing"):
        np.testing.assert_array_equal(getattr(r, name)[at], getattr(per_point, name))
    # and again: the remembered answer is the same
    again, at2 = ld.distinct_height_damage(load, deck, h, v0)
    np.testing.assert_array_equal(again.h_perforation[at2], r.h_perforation[at])

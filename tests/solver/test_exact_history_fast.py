"""The bounded search of droprig.solver.exacthistory (the default) against its plain
stepping run (``stepping=True``), on random members, and the closed forms through it.

Sources:
* Chopra, *Dynamics of Structures* 4th ed., §10.2 and §12.1–12.4 (modal superposition
  of an undamped linear system: each phase a constant plus harmonics) — the model both
  runs solve; the bounded search drops only samples that a bound shows cannot change a
  peak or hold a landing: |Σⱼ aⱼ·cos(Ωⱼt + φⱼ)| ≤ Σⱼ|aⱼ| (triangle inequality —
  common practice, no source) and a falling body's parabola (Gere 7th ed. §9.10's free
  fall, u = v·t + g·t²/2).
* Gere, *Mechanics of Materials* 7th ed., §9.10, Eq. 9-94: a mass dropped on a
  massless linear spring, K = 1 + √(1 + 2h/δst); h = 0 (suddenly applied) K = 2 — the
  load bounces clear and flies, so these cases run the leap.
* Where the two runs may differ (exacthistory module docstring, "Bounded search"): both
  refine every sampled crest by its parabola, so the rounds' and pieces' edges do not
  matter; a dead output's crest whose parabola would rise above its bound is refined
  by the stepping run alone. The tolerance is ``exacthistory.FAST_TOLERANCE`` (1e-5
  relative; measured 5e-13 here, 2.1e-7 on the demos' member cases).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import beam, exacthistory, impact
from tests.solver.test_exact_history import _random_cases

G = impact.G
QUANTITIES = ("force", "moment", "shear", "deflection", "reaction", "crush")
# a W-shape-like member (invented demo values): E = 200 GPa, I = 1e-4 m⁴, 50 kg/m, 6 m
L, EI, MU = 6.0, 2e11 * 1e-4, 50.0


@pytest.fixture(scope="module")
def both_runs():
    """40 random members and contacts (tests/solver/test_exact_history.py's ranges, a
    third crushing), half of them Timoshenko members (shear flexibility EI/(κGA·L²)
    0.002–0.05, rotary inertia μ·r² with r 0.05–0.2 m: invented, compared run to run),
    by the bounded search and by the stepping run."""
    rng = np.random.default_rng(20261205)
    c = _random_cases(rng, 40)
    n = c["L"].size
    timo = rng.uniform(size=n) < 0.5
    kGA = np.where(timo, c["EI"] / (c["L"] ** 2 * rng.uniform(0.002, 0.05, n)), math.inf)
    rhoI = np.where(timo, c["mu"] * rng.uniform(0.05, 0.2, n) ** 2, 0.0)
    args = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    kw = {"F_yield": c["F_y"], "kGA": kGA, "rhoI": rhoI}
    fast = exacthistory.exact_time_history(*args, **kw)
    step = exacthistory.exact_time_history(*args, **kw, stepping=True)
    return fast, step


@pytest.mark.parametrize("q", QUANTITIES)
def test_bounded_search_agrees_with_the_stepping_run(both_runs, q: str) -> None:
    fast, step = both_runs
    a, b = getattr(fast, q), getattr(step, q)
    scale = np.maximum(np.abs(b), 1e-12 * np.abs(b).max())
    rel = np.abs(a - b) / scale
    assert float(rel.max()) <= exacthistory.FAST_TOLERANCE, (q, float(rel.max()))


def test_separations_are_the_stepping_runs(both_runs) -> None:
    # the phases' ends are found the same way on the same sample grid: the first
    # separation to the bisection's 1e-12 of a sample spacing
    fast, step = both_runs
    np.testing.assert_array_equal(np.isnan(fast.t_separation), np.isnan(step.t_separation))
    ok = ~np.isnan(step.t_separation)
    np.testing.assert_allclose(fast.t_separation[ok], step.t_separation[ok], rtol=1e-9)


def test_the_bounded_search_leaps_free_flight(both_runs) -> None:
    # the leap is what makes it cheaper: a load that bounces clear and flies is not
    # scanned for a landing until it could land (on these members 18 of the 39 that
    # bounce clear leap; the rest stay near the member, and step)
    fast, step = both_runs
    assert step.leapt is None and fast.leapt is not None
    bounced = ~np.isnan(fast.t_separation)
    assert bounced.sum() >= 30
    assert int(np.count_nonzero(fast.leapt[bounced] > 0)) >= 15
    assert not np.any(fast.leapt[~bounced] > 0)


@pytest.mark.parametrize("h_over_dst", [0.0, 1.0, 10.0])
@pytest.mark.parametrize("stepping", [False, True])
def test_mass_on_massless_spring_gere_both_runs(h_over_dst: float, stepping: bool) -> None:
    # Gere §9.10 Eq. 9-94 on a simple member's spring (no member modes in time): the
    # load rebounds elastically and flies, which the bounded search leaps
    a = 2.5
    f_s = float(beam.green("simple", L, EI, a, a))
    M = 500.0
    h = h_over_dst * M * G * 2.0 * f_s
    res = exacthistory.exact_time_history("simple", L, EI, MU, a, M, h, f_s, n_modes=0,
                                          sections=64, stepping=stepping)
    K = 1.0 + math.sqrt(1.0 + 2.0 * h_over_dst)
    # 8 samples a period, refined by a parabola: at most 0.85 % low on a cosine (hand
    # calculation, tests/solver/test_exact_history.py REL_CLOSED)
    assert float(res.force[0]) == pytest.approx(K * M * G, rel=0.0085)
    if not stepping and h_over_dst >= 10.0:  # it flies past the window's end
        assert res.leapt is not None and float(res.leapt[0]) > 0.0


@pytest.mark.parametrize("a", [3.125, 4.5])
def test_free_flight_peak_of_a_light_hard_load(a: float) -> None:
    # a 220 kg hard item dropped 6 m on a 9 m floor beam carrying its slab (an invented
    # case shaped like the demos' light items: EI 34.2 MN·m², 1,219 kg/m, Timoshenko
    # terms, a crushing deck): the load bounces clear within a millisecond and the
    # member's largest moment comes in its free vibration afterwards, over the samples
    # the bounded search leaps — they must read as the stepping run reads them
    args = ("simple", 9.0, 3.4157e7, 1219.48, a, 220.0, 6.0, 5.27e-10)
    kw = {"F_yield": 8.7158e6, "stroke": 0.025, "weight": 2157.463, "kGA": 2.326e8,
          "rhoI": 1.2768, "n_modes": 40, "cutoff": 8.0}
    fast = exacthistory.exact_time_history(*args, **kw)
    step = exacthistory.exact_time_history(*args, **kw, stepping=True)
    assert fast.leapt is not None and float(fast.leapt[0]) > 1000.0
    for q in ("force", "moment", "shear", "deflection", "reaction"):
        assert float(getattr(fast, q)[0]) == pytest.approx(float(getattr(step, q)[0]),
                                                           rel=exacthistory.FAST_TOLERANCE)

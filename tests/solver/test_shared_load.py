"""A load shared by the lever rule between two members, seen by one of them: the
generalised-coordinate reduction (:func:`droprig.solver.pointhistory.shared_load`:
mass w²·M, weight w·W, speed v/w, contact (f_all − w²·g)/w²) against a history of both
members struck together.

Sources:
* Clough & Penzien, *Dynamics of Structures* 2nd ed., §8-2 (generalised coordinates by
  virtual work) and §18-2 (simply supported beam modes sin(nπx/L), ωₙ =
  n²π²√(EI/(m̄L⁴))) — from memory.
* Roark 7th ed., Table 8.1 case 1e / AISC Manual Table 3-23 case 8: G(a, a) =
  a²b²/(3EIL) for a simply supported beam.

Reference: two simply supported Euler–Bernoulli members (each its own modes, mass and
stiffness) under a massless footprint that passes w·F to member 1 and (1 − w)·F to
member 2, F the compression-only contact force of the load (mass M, from h) on a
contact spring; each phase solved exactly (``timoshenko_reference.contact_drop``,
scipy eigh). The reduction is exact where member 2 is massless (a spring: 1.000–1.001
on force, moment, deflection); with its real mass it is the one-member idealisation of
``droprig.solver.pointhistory``, whose figures the last test states.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import exacthistory, impact, pointhistory
from tests.solver.timoshenko_reference import contact_drop

G = impact.G
N_MODES = 24
SECTIONS = np.linspace(0.0, 1.0, 17)
REL_EXACT = 0.02  # member 2 massless: the reduction is exact (sampling of the peaks)
REL_MASSIVE = 0.15  # member 2 with its mass: the idealisation (see the test)
# member 1: 6 m, EI 17.5 MN·m², 42 kg/m (IPE 300-like); struck at 0.4 L
L1, EI1, MU1, XI1 = 6.0, 17.5e6, 42.0, 0.4


def g_aa(L: float, EI: float, a: float) -> float:
    return a**2 * (L - a) ** 2 / (3.0 * EI * L)  # Roark Table 8.1 case 1e


def two_members(w: float, M: float, h: float, f_c: float, L2: float, EI2: float, mu2: float,
                xi2: float) -> dict[str, float]:
    """Peaks of member 1 (largest |moment|, |deflection| over its sections) and the
    contact force of the load shared w : 1 − w between members 1 and 2; ``mu2`` = 0:
    member 2 a massless spring (its G(a, a)·(1 − w)² in series with the contact)."""
    k1 = np.arange(1, N_MODES + 1) * math.pi / L1
    n2 = N_MODES if mu2 > 0.0 else 0
    k2 = np.arange(1, n2 + 1) * math.pi / L2
    nd = 1 + N_MODES + n2
    i1, i2 = np.arange(1, N_MODES + 1), np.arange(N_MODES + 1, nd)
    f_spring = f_c + (0.0 if n2 else (1 - w) ** 2 * g_aa(L2, EI2, xi2 * L2))
    mass = np.empty(nd)
    mass[0], mass[i1], mass[i2] = M, MU1 * L1 / 2, mu2 * L2 / 2
    K = np.zeros((nd, nd))
    K[i1, i1] = EI1 * k1**4 * L1 / 2
    K[i2, i2] = EI2 * k2**4 * L2 / 2
    c = np.zeros(nd)
    c[0] = 1.0
    c[i1] = -w * np.sin(k1 * XI1 * L1)
    c[i2] = -(1.0 - w) * np.sin(k2 * xi2 * L2)
    b = np.zeros(nd)
    b[0] = M * G
    outs = {}
    for j, s in enumerate(SECTIONS):
        rd, rm = np.zeros(nd), np.zeros(nd)
        rd[i1] = np.sin(k1 * s * L1)
        rm[i1] = EI1 * k1**2 * np.sin(k1 * s * L1)  # M = −EI·w''
        outs[f"d{j}"], outs[f"m{j}"] = rd, rm
    T1 = 2 * math.pi / (math.pi**2 / L1**2 * math.sqrt(EI1 / MU1))
    f_all = f_c + w**2 * g_aa(L1, EI1, XI1 * L1) + (1 - w) ** 2 * g_aa(L2, EI2, xi2 * L2)
    T_sys = 2 * math.pi * math.sqrt((M + 0.5 * MU1 * L1) * f_all)
    pk = contact_drop(mass, K, c, 1.0 / f_spring, b, math.sqrt(2 * G * h),
                      1.25 * max(T1, T_sys), outs, samples_per_period=8)
    return {"force": pk["force"],
            "deflection": max(pk[f"d{j}"] for j in range(SECTIONS.size)),
            "moment": max(pk[f"m{j}"] for j in range(SECTIONS.size)), "f_all": f_all}


def reduced(w: float, M: float, h: float, f_all: float, share: bool = True
            ) -> dict[str, float]:
    """Member 1's peaks by droprig's one-member history: through the reduction, or
    (``share`` False) the whole load on member 1 with the rest of the path's
    compliance f_all − g (the rule before it)."""
    a = XI1 * L1
    g = g_aa(L1, EI1, a)
    if share:
        r = pointhistory.shared_load(w, M, h, f_all, g)
        t = exacthistory.exact_time_history("simple", L1, EI1, MU1, a, r["M"], r["h"],
                                            r["f_c"], weight=r["weight"], n_modes=N_MODES,
                                            cutoff=1e9, sections=16)
        return {"force": float(t.force[0]) / w, "moment": float(t.moment[0]),
                "deflection": float(t.deflection[0])}
    t = exacthistory.exact_time_history("simple", L1, EI1, MU1, a, M, h,
                                        max(f_all - g, 1e-3 * g), n_modes=N_MODES,
                                        cutoff=1e9, sections=16)
    return {"force": float(t.force[0]), "moment": float(t.moment[0]),
            "deflection": float(t.deflection[0])}


CASES = [  # w, M kg, h m, contact compliance m/N, member 2 (L, EI, xi)
    (0.7, 150.0, 0.5, 2e-8, (5.0, 10e6, 0.5)),
    (0.55, 40.0, 1.0, 5e-8, (6.0, 17.5e6, 0.3)),
]


@pytest.mark.parametrize(("w", "M", "h", "f_c", "m2"), CASES)
def test_reduction_exact_for_a_massless_second_member(
        w: float, M: float, h: float, f_c: float, m2: tuple[float, float, float]) -> None:
    L2, EI2, xi2 = m2
    ref = two_members(w, M, h, f_c, L2, EI2, 0.0, xi2)
    got = reduced(w, M, h, ref["f_all"])
    for q in ("force", "moment", "deflection"):
        assert got[q] == pytest.approx(ref[q], rel=REL_EXACT), q


@pytest.fixture(scope="module")
def massive() -> list[tuple[dict[str, float], dict[str, float], dict[str, float]]]:
    out = []
    for w, M, h, f_c, (L2, EI2, xi2) in CASES:
        ref = two_members(w, M, h, f_c, L2, EI2, MU1, xi2)
        out.append((ref, reduced(w, M, h, ref["f_all"]),
                    reduced(w, M, h, ref["f_all"], share=False)))
    return out


def test_reduction_with_a_massive_second_member(
        massive: list[tuple[dict[str, float], dict[str, float], dict[str, float]]]) -> None:
    # member 2's own mass, left out by the one-member idealisation: member 1's moment
    # reads 0.97 / 0.95 and its deflection 1.10 / 1.05 of the two-member history, the
    # contact force 0.75 / 0.80 (member 2's inertia stiffens the contact: the
    # idealisation's, not the reduction's, shortfall). The whole load on member 1 (the
    # rule before) read the moment 1.61 / 3.27 and the contact force 4.4 / 8.9 ×.
    for ref, got, whole in massive:
        for q in ("moment", "deflection"):
            assert got[q] == pytest.approx(ref[q], rel=REL_MASSIVE), q
        for q in ("moment", "force"):
            assert abs(got[q] / ref[q] - 1.0) < abs(whole[q] / ref[q] - 1.0), q


def test_bad_share_and_weight_are_refused_by_name() -> None:
    # common practice, no source: a share outside (0, 1] or a weight ≤ 0 is refused
    # with the input named, never run
    for w in (0.0, -0.2, 1.5, float("nan")):
        with pytest.raises(ValueError, match="w:"):
            pointhistory.shared_load(w, 10.0, 1.0, 1e-7, 5e-8)
    for weight in (0.0, -1.0, float("nan"), float("inf")):
        with pytest.raises(ValueError, match="weight:"):
            exacthistory.exact_time_history("simple", L1, EI1, MU1, 2.0, 10.0, 1.0, 1e-8,
                                            weight=weight)


def test_whole_share_changes_nothing() -> None:
    # w = 1 (a point on one member, droprig check): the load as it is
    r = pointhistory.shared_load(1.0, 12.0, 0.8, 3e-7, 1e-7, 5e4, 0.02)
    assert (r["M"], r["h"], r["weight"], r["F_yield"], r["stroke"]) == pytest.approx(
        (12.0, 0.8, 12.0 * G, 5e4, 0.02))
    assert r["f_c"] == pytest.approx(2e-7)

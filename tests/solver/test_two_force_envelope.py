"""The two forces per point as the chain uses them: the envelope of the two-mass
peaks over lower drops (monotone in the drop height), its energy bounds, the table it
is read from, and inverse answers that hold in the forward chain.

Sources: CEB Bulletin 187 (1988) two-mass model (from memory); Clough & Penzien,
*Dynamics of Structures*, 2-DOF free vibration and the energy of a 2-DOF system;
Gere, *Mechanics of Materials* 7th ed. §9.10 Eq. 9-94 (one-mass balance); Biggs,
*Introduction to Structural Dynamics* (1964) ch. 5 (a lower drop can give the
larger peak of a two-mass system; from memory). The reference time histories
integrate the equations of motion with scipy ``solve_ivp`` (DOP853, tight
tolerances). Projects are the invented demos.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import struck_mass
from droprig.solver.impact import G, impact_elastic


def _two_dof_history(M: float, v0: float, kc: float, m2: float, k2: float
                     ) -> tuple[float, float]:
    """Peak contact force and peak framing force k2·x2 (N) of the load M on the
    push-only contact spring kc striking m2 on k2 (scipy solve_ivp) over two periods
    of the slow mode."""
    from scipy.integrate import solve_ivp

    def rhs(t, y):
        F = kc * max(y[0] - y[2], 0.0)
        return [y[1], G - F / M, y[3], (F - k2 * y[2]) / m2]

    w_hi = math.sqrt(kc * (1 / M + 1 / m2) + k2 / m2)
    b = kc * m2 + (kc + k2) * M
    w_lo = math.sqrt(2 * kc * k2 / (b + math.sqrt(b * b - 4 * M * m2 * kc * k2)))
    sol = solve_ivp(rhs, (0.0, 4 * math.pi / w_lo), [0.0, v0, 0.0, 0.0], method="DOP853",
                    max_step=2 * math.pi / w_hi / 40, rtol=1e-10, atol=1e-13)
    return (float(np.max(kc * np.maximum(sol.y[0] - sol.y[2], 0.0))),
            float(k2 * np.max(sol.y[2])))


def _random_systems(seed: int, n: int) -> tuple[np.ndarray, ...]:
    rng = np.random.default_rng(seed)
    M = 10 ** rng.uniform(1.0, 4.3, n)
    m2 = 10 ** rng.uniform(1.5, 5.0, n)
    k2 = 10 ** rng.uniform(5.5, 9.0, n)
    kc = k2 * 10 ** rng.uniform(-1.5, 6.0, n)
    return M, m2, k2, kc


def test_energy_bounds_hold_in_the_time_history():
    # The conservation of energy bounds both peaks (Clough & Penzien, energy of a
    # 2-DOF system): the scipy time history never passes them, and for a rigid,
    # massless framing the contact bound is Gere's Eq. 9-94 with η = 1.
    rng = np.random.default_rng(3)
    for _ in range(6):
        M = 10 ** rng.uniform(1.3, 3.7)
        m2 = 10 ** rng.uniform(2.0, 4.2)
        k2 = 10 ** rng.uniform(6.5, 8.0)
        kc = k2 * 10 ** rng.uniform(-0.5, 2.5)
        h = rng.uniform(0.05, 3.0)
        Fc_ref, Ff_ref = _two_dof_history(M, math.sqrt(2 * G * h), kc, m2, k2)
        Bc, Bf = struck_mass.energy_bounds(M * G, h, 1 / kc, 1 / k2)
        assert Fc_ref <= float(Bc) * (1 + 1e-6)
        assert Ff_ref <= float(Bf) * (1 + 1e-6)
    W, h, fc = 2000.0, 1.5, 3e-8
    _, F_gere, _ = impact_elastic(W, h, fc, 1.0)
    Bc, _ = struck_mass.energy_bounds(W, h, fc, 0.0)
    assert float(Bc) == pytest.approx(float(F_gere), rel=1e-12)


def test_catch_up_follows_the_time_history():
    # After a contact the load and the structure part and meet again; the later
    # contacts are found without passing one (safe advance): the peaks match the
    # scipy time history over the same two slow periods within 1 % (before the
    # sampled search could miss a meeting and let the load fall through the
    # structure: 0.57 of the history's contact force in the second case here).
    rng = np.random.default_rng(7)  # the second system is the one the old search missed
    for _ in range(4):
        M = 10 ** rng.uniform(1.3, 3.7)
        m2 = 10 ** rng.uniform(2.5, 4.2)
        k2 = 10 ** rng.uniform(6.5, 8.0)
        kc = k2 * 10 ** rng.uniform(-0.5, 2.5)
        v0 = math.sqrt(2 * G * rng.uniform(0.2, 4.0))
        Fc_ref, Ff_ref = _two_dof_history(M, v0, kc, m2, k2)
        pk = struck_mass.two_mass_peaks(M, v0, kc, m2, k2)
        assert float(pk.F_contact) == pytest.approx(Fc_ref, rel=0.01)
        assert float(pk.F_frame) == pytest.approx(Ff_ref, rel=0.01)


def test_envelope_is_monotone_and_between_one_mass_and_energy_bounds():
    M, m2, k2, kc = _random_systems(11, 300)
    nh = 120
    hs = np.geomspace(1e-3, 30.0, nh)
    W = np.repeat(M * G, nh)
    fc, ff, m2r = np.repeat(1 / kc, nh), np.repeat(1 / k2, nh), np.repeat(m2, nh)
    H = np.tile(hs, M.size)
    Fc, Ff = struck_mass.envelope_two_forces(W, H, fc, ff, m2r)
    # non-decreasing in the drop height, for every system (to the rounding of the
    # interpolation's logarithms, 10⁻¹⁴)
    for F in (Fc, Ff):
        F2 = F.reshape(-1, nh)
        assert np.all(np.diff(F2, axis=1) >= -1e-14 * F2[:, 1:])
    # never below the one-mass balance with η = M/(M + m2) (Gere Eq. 9-94) ...
    _, F1, _ = impact_elastic(W, H, fc + ff, W / G / (W / G + m2r))
    assert np.all(Fc >= F1 * (1 - 1e-12)) and np.all(Ff >= F1 * (1 - 1e-12))
    # ... nor above the energy bounds
    Bc, Bf = struck_mass.energy_bounds(W, H, fc, ff)
    assert np.all(Fc <= Bc * (1 + 1e-12)) and np.all(Ff <= Bf * (1 + 1e-12))


TABLE_OVER = 1.05
"""The table against the pointwise solution (the running maximum over lower drops of
struck_mass.two_mass_peaks at the point's own μ, κ): at most 5 % above it for most
points (:data:`TABLE_SHARE_WITHIN`), never below it by more than the closed form's
own ripple bound lets a sample stand above a time history (:data:`TABLE_UNDER`)."""
TABLE_SHARE_WITHIN = (0.74, 0.84)
"""Share of random (system, planned height) pairs whose table force (framing,
contact) lies within [1, TABLE_OVER] × the pointwise solution (measured on this
tree, the 300 systems of the test: 0.79 and 0.89, every one ≥ 1; with the table
before the covering nodes and its ×1.10 margin: 0.25 and 0.45). The rest are
systems whose peaks jump where a later contact starts or stops between the table's
samples (up to 1.36 × the pointwise peak; 1.86 before)."""
TABLE_MEDIAN = 1.04
"""Median of the table over the pointwise solution (measured 1.032 and 1.031; 1.19
and 1.07 before)."""
TABLE_UNDER = 0.85
"""Lowest table / pointwise ratio allowed (measured 0.87 in a sample of 100 systems
× 3,000 heights: a closed-form peak raised by the slow window's ripple bound above
the scipy time history, which the table stays above; see
:func:`test_table_under_the_closed_form_is_above_the_time_history`)."""


def _pointwise_running_max(M, m2, k2, kc, h, nh):
    """The running maximum over nh lower drops (quadratically spaced up to h) of the
    pointwise peaks, each within its energy bound (as the table's samples): the
    reference the table is read against. Returns (contact, framing), N."""
    fr = np.linspace(0.0, 1.0, nh + 1)[1:] ** 2
    H = (h[:, None] * fr[None, :]).ravel()
    W = M * G

    def rep(a):
        return np.repeat(a, nh)

    Fc, Ff = struck_mass.impact_two_forces(rep(W), H, rep(1 / kc), rep(1 / k2), rep(m2))
    Bc, Bf = struck_mass.energy_bounds(rep(W), H, rep(1 / kc), rep(1 / k2))
    return (np.minimum(Fc, Bc).reshape(-1, nh).max(axis=1),
            np.minimum(Ff, Bf).reshape(-1, nh).max(axis=1))


def test_table_within_its_tolerance_of_the_pointwise_solution():
    # 300 random systems (the demos' range and beyond) at one planned height each,
    # against the pointwise running maximum over 400 lower drops
    M, m2, k2, kc = _random_systems(8, 300)
    h = np.random.default_rng(9).uniform(0.05, 5.0, M.size)
    ref_c, ref_f = _pointwise_running_max(M, m2, k2, kc, h, 400)
    Fc, Ff = struck_mass.envelope_two_forces(M * G, h, 1 / kc, 1 / k2, m2)
    for got, ref, share in ((Ff, ref_f, TABLE_SHARE_WITHIN[0]),
                            (Fc, ref_c, TABLE_SHARE_WITHIN[1])):
        r = got / ref
        assert np.mean((r >= 1.0 - 1e-9) & (r <= TABLE_OVER)) >= share
        assert np.median(r) <= TABLE_MEDIAN
        assert np.mean(r >= 1.0 - 1e-9) >= 0.99
        assert r.min() >= TABLE_UNDER


def test_table_at_the_rooftop_units_governing_point():
    # AHU-3 (new) of the invented rooftop demo at (7.5, 17.75): μ = 1.03, κ = 0.149,
    # ĥ = 3 249 (W = 41 188 N, h = 0.8 m, f_s = 5.979e-9 m/N, f_c = 4.001e-8 m/N,
    # m2 = 4 331 kg). The pointwise two-mass peak on the framing is 1.824 MN (the
    # running maximum over lower drops is the same: the peak rises with the height
    # here); the table read 2.459 MN before (1.35 ×, U 3.39 on shear), within 5 %
    # now
    W, h, fs, fc, m2 = 41187.93, 0.8, 5.97890829e-09, 4.00138492e-08, 4331.2415805
    ref_c, ref_f = _pointwise_running_max(np.array([W / G]), np.array([m2]),
                                          np.array([1 / fs]), np.array([1 / fc]),
                                          np.array([h]), 2000)
    assert float(ref_f[0]) == pytest.approx(1.824e6, rel=2e-3)
    Fc, Ff = struck_mass.envelope_two_forces(W, h, fc, fs, m2)
    assert 1.0 <= float(Ff) / float(ref_f[0]) <= TABLE_OVER
    assert 1.0 <= float(Fc) / float(ref_c[0]) <= TABLE_OVER


def test_table_under_the_closed_form_is_above_the_time_history():
    # Where the table reads below the closed-form peak (the slow window's ripple
    # bound of two_mass_peaks is an upper bound and jumps), the scipy time history
    # shows the real peak below the table: AHU-3 (new) on the rooftop demo at a
    # point with μ = 2.22, κ = 5.41, ĥ = 89.7, the contact force at h = 0.8 m
    # (closed form 31.07 W, time history 26.57 W, table 27.5 W)
    M = 4200.0
    W = M * G
    f_s = 0.8 / (89.67511415271605 * W)  # ĥ = h/(W·f_s)
    f_c = f_s / 5.413439194433118
    m2 = 2.222308960734305 * M
    Fc_th, _ = _two_dof_history(M, math.sqrt(2 * G * 0.8), 1 / f_c, m2, 1 / f_s)
    Fc, _ = struck_mass.envelope_two_forces(W, 0.8, f_c, f_s, m2)
    assert float(Fc) >= Fc_th


def test_envelope_against_the_time_history():
    # The forces given to the checks are at least 0.98 of the peaks of the scipy
    # time history at that drop height (random systems in the demos' range)
    rng = np.random.default_rng(7)
    for _ in range(10):
        M = 10 ** rng.uniform(1.3, 3.7)
        m2 = 10 ** rng.uniform(2.5, 4.2)
        k2 = 10 ** rng.uniform(6.5, 8.0)
        kc = k2 * 10 ** rng.uniform(-0.5, 2.5)
        h = rng.uniform(0.2, 4.0)
        Fc_ref, Ff_ref = _two_dof_history(M, math.sqrt(2 * G * h), kc, m2, k2)
        Fc, Ff = struck_mass.envelope_two_forces(M * G, h, 1 / kc, 1 / k2, m2)
        assert float(Fc) >= 0.98 * Fc_ref
        assert float(Ff) >= 0.98 * Ff_ref


BUILD_RTOL = 5e-4
"""How closely a rebuild reproduces the stored table on another numpy / scipy: the
running maximum of the two-mass peaks where a later contact only grazes is sensitive to
rounding. Measured: with numpy 2.4.6 and scipy 1.17.1 two heights of node (25, 8) of
the contact envelope rebuild 2.0e-4 above the stored values (built with earlier
versions), every other value within float32 rounding; no source."""


def test_stored_table_is_the_build():
    # Nodes of the stored table rebuilt here (a node and its neighbours in μ and κ,
    # over every height: the running maximum needs them all): the same values within
    # the rebuild's reproducibility across library versions (BUILD_RTOL), and the
    # stored float32 never below them by more than that.
    lm, lk, lh = struck_mass.envelope_grid()
    Ft, Ct = struck_mass._envelope()
    for i, j in ((14, 22), (25, 8)):
        Ff, Fc = struck_mass.build_envelope(lm[i - 1:i + 2], lk[j - 1:j + 2], lh)
        for got, want in ((Ft[i, j], Ff[1, 1]), (Ct[i, j], Fc[1, 1])):
            assert np.all(got >= want * (1.0 - BUILD_RTOL))
            np.testing.assert_allclose(got, want, rtol=BUILD_RTOL)
            # all but a few heights agree to float32 rounding, as built
            assert np.mean(np.abs(got - want) <= 1e-6 * np.abs(want)) >= 0.95

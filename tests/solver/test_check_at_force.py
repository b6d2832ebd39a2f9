"""A check family made at another force names the member that governs there.

A linear check U = |F·u + E|/R (demand linear in the impact force, common practice, no
source) has many candidates per point; which one governs depends on F, because the
existing demand E does not grow with it. With dynamic amplification the checks are
made at A·F, so the member printed beside U (and the candidate's u, E, R the trace
prints) must be the argmax at A·F. Checked against the plain reference
(``droprig.solver.reference.check_reference``, one formula per candidate) and by hand.
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.solver import chain
from droprig.solver.linear_checks import Family, small_check
from droprig.solver.reference import CandidatesReference, check_reference


def _hand_family() -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    # member 7: existing moment 90 kN·m of R = 100 kN·m, 0.01 m of moment per N of F;
    # member 9: no existing moment, 0.05 m per N, R = 100 kN·m
    unit = np.array([[0.01], [0.05]])
    exist = np.array([[90e3], [0.0]])
    resist = np.array([[100e3], [100e3]])
    member = np.array([[7], [9]])
    return unit, exist, resist, member


@pytest.mark.parametrize("detail", [True, False])
def test_hand_case_governing_member_moves_with_the_force(detail: bool) -> None:
    unit, exist, resist, member = _hand_family()
    fam = Family.from_candidates(unit, exist, resist, member)
    F = np.array([100e3])
    # by hand at F = 100 kN: member 7 (90 + 1)/100 = 0.91, member 9 5/100 = 0.05
    at_F = fam.check("flexure", F, detail)
    assert at_F.U[0] == pytest.approx(0.91, rel=1e-12)
    assert at_F.member[0] == 7
    # at 8.4·F = 840 kN: member 7 (90 + 8.4)/100 = 0.984, member 9 42/100 = 0.42 ...
    # and at 30·F: member 7 (90 + 30)/100 = 1.20, member 9 150/100 = 1.50 -> member 9
    A = np.array([30.0])
    scaled = chain.at_force(chain._scaled(at_F, A), F)
    assert scaled.U[0] == pytest.approx(1.50, rel=1e-12)
    assert scaled.member[0] == 9
    if detail:
        assert scaled.unit is not None and scaled.exist is not None
        assert scaled.resist is not None
        # the line's own numbers give its U: |A·F·u + E|/R
        assert abs(A[0] * F[0] * scaled.unit[0] + scaled.exist[0]) / scaled.resist[0] \
            == pytest.approx(scaled.U[0], rel=1e-12)
    # the same through the small-family path (web, deck checks)
    sc = small_check("web", F, unit, exist, resist, member, detail)
    got = chain.at_force(chain._scaled(sc, A), F)
    assert got.member[0] == 9 and got.U[0] == pytest.approx(1.50, rel=1e-12)


def test_random_families_match_the_plain_reference_at_amplified_forces() -> None:
    rng = np.random.default_rng(20261204)
    C, n = 12, 400
    unit = rng.uniform(-0.05, 0.05, (C, n))
    exist = rng.uniform(-80e3, 80e3, (C, n))
    resist = rng.uniform(50e3, 150e3, (C, n))
    member = np.broadcast_to(np.arange(C)[:, None], (C, n)).copy()
    fam = Family.from_candidates(unit, exist, resist, member)
    F = rng.uniform(1e3, 3e6, n)
    A = rng.uniform(1.0, 40.0, n)
    ref = CandidatesReference(unit=unit, exist=exist, resist=resist, member=member,
                              source=member)
    U_ref, _, m_ref = check_reference(ref, A * F)
    for detail in (True, False):
        got = chain.at_force(chain._scaled(fam.check("shear", F, detail), A), F)
        np.testing.assert_allclose(got.U, U_ref, rtol=1e-12)
        np.testing.assert_array_equal(got.member, m_ref)
    # the governing member did move for some points (else the test shows nothing)
    _, _, m_at_F = check_reference(ref, F)
    assert np.count_nonzero(m_at_F != m_ref) > 20

"""A point's member history is set by its own inputs, not by the points it is run with
(droprig.solver.exacthistory runs cases in groups of similar numbers of kept modes;
the grouping is a vectorisation only).

Sources:
* Chopra, *Dynamics of Structures* 4th ed., §10.2 and §12.1–12.4 (modal superposition
  of an undamped linear system): a mode left out of a case (ω above the case's
  cut-off) has φ̃ = 0 and stays at rest, so it is no part of that case's solution and
  its frequency must not set the case's sampling — common practice, no source, for
  the vectorisation itself.
* Before stop 31 a contact phase was sampled at 8 samples a period of the highest
  frequency in the *group*, the left-out modes of a case included: the demos' member
  peaks moved by up to 0.6 % with the company a point kept (measured on the 1,505
  member cases of the three demos with the floors' point histories on).
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.solver import beam, exacthistory

QUANTITIES = ("force", "moment", "shear", "deflection", "reaction")
# an invented simply supported ("simple") member: 6 m, EI = 2e7 N·m², 50 kg/m, struck at 0.4 L
L, EI, MU, A = 6.0, 2e7, 50.0, 2.4


def _cases() -> dict[str, np.ndarray]:
    """Contacts from soft to stiff, so that the kept modes differ (6 to 14 of 40) and
    fall in one group of :func:`droprig.solver.exacthistory._groups`; loads light and
    heavy, elastic and crushing (invented, compared run to run; the two crushing
    forces about 0.8 × their elastic peaks, so that their rise to the cap keeps a few
    more modes than the contact alone — stop 32's cut-off,
    :func:`droprig.solver.timehistory.rise_frequency` — and they stay in the group)."""
    f_s = float(beam.green("simple", L, EI, A, A))
    f_c = f_s * np.array([0.1, 0.3, 0.05, 0.03, 0.02, 0.1])
    M = np.array([150.0, 10.0, 40.0, 150.0, 150.0, 40.0])
    h = np.array([0.3, 0.1, 0.5, 0.05, 1.0, 0.2])
    F_y = np.array([np.inf, np.inf, 1.2e5, np.inf, 3.5e5, np.inf])
    return {"f_c": f_c, "M": M, "h": h, "F_y": F_y}


def _run(c: dict[str, np.ndarray], idx: np.ndarray, stepping: bool):
    n = idx.size
    return exacthistory.exact_time_history(
        "simple", np.full(n, L), np.full(n, EI), np.full(n, MU), np.full(n, A),
        c["M"][idx], c["h"][idx], c["f_c"][idx], F_yield=c["F_y"][idx], stepping=stepping)


@pytest.fixture(scope="module")
def alone_and_together():
    c = _cases()
    n = c["M"].size
    out = {}
    for stepping in (False, True):
        together = _run(c, np.arange(n), stepping)
        alone = [_run(c, np.array([i]), stepping) for i in range(n)]
        out[stepping] = (together, alone)
    return out


def test_the_cases_keep_different_numbers_of_modes_in_one_group(alone_and_together) -> None:
    # the premise: the cases share a group yet keep different numbers of modes
    together, _ = alone_and_together[False]
    kept = np.asarray(together.modes)
    assert kept.min() < kept.max()
    groups = list(exacthistory._groups(kept, 256))
    assert len(groups) == 1


@pytest.mark.parametrize("stepping", [False, True])
@pytest.mark.parametrize("q", QUANTITIES)
def test_a_point_reads_the_same_alone_and_in_company(alone_and_together, stepping: bool,
                                                      q: str) -> None:
    together, alone = alone_and_together[stepping]
    got = np.asarray(getattr(together, q))
    own = np.array([float(np.asarray(getattr(r, q))[0]) for r in alone])
    # the same samples and phases; what is left is rounding (a larger eigenproblem)
    np.testing.assert_allclose(got, own, rtol=1e-9, err_msg=q)



@pytest.fixture(scope="module")
def short_rounds():
    """The same cases run in rounds of 16 samples (a tiny sample budget: every round
    edge elsewhere) against the default rounds."""
    c = _cases()
    n = c["M"].size
    mp = pytest.MonkeyPatch()
    out = {}
    for stepping in (False, True):
        default = _run(c, np.arange(n), stepping)
        mp.setattr(exacthistory, "_BUDGET", 16)
        try:
            short = _run(c, np.arange(n), stepping)
        finally:
            mp.undo()
        out[stepping] = (default, short)
    return out


@pytest.mark.parametrize("stepping", [False, True])
@pytest.mark.parametrize("q", QUANTITIES)
def test_peaks_do_not_depend_on_where_the_rounds_are_cut(short_rounds, stepping: bool,
                                                         q: str) -> None:
    # every sampled crest is refined by its parabola, wherever a round ends (before
    # stop 31 only a round's largest sample was, if inside its round)
    default, short = short_rounds[stepping]
    np.testing.assert_allclose(np.asarray(getattr(short, q)),
                               np.asarray(getattr(default, q)), rtol=1e-9, err_msg=q)

"""The dynamic amplification table's η = 1 half (droprig's rule under mats and
crushable layers) against the verdict's time history on 100 random members; the other
100 of issue 12's 200 cases are in test_amplification.py, with the sources.
"""

from __future__ import annotations

from tests.solver.test_amplification import check_never_below_time_history


def test_eta_one_demand_never_below_time_history() -> None:
    check_never_below_time_history(False, 20261206)

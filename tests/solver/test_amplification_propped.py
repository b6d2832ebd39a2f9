"""The dynamic amplification table against the verdict's time history on propped
and cantilever members (the chain's struck-mass share), 50 cases; issue 12's other
random cases and the sources are in test_amplification.py.
"""

from __future__ import annotations

from tests.solver.test_amplification import check_never_below_time_history


def test_propped_cantilever_never_below_time_history() -> None:
    check_never_below_time_history(True, 20261207, ("propped", "cantilever"))

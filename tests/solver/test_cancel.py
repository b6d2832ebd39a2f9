"""Cooperative cancellation (issue 16: an edit or closing the window stops a running
analysis). Source: droprig's own contract (droprig/solver/cancel.py); the demo
project is an invented input. The stop latency is measured in
benchmarks/bench_loadtest.py, not here."""

from __future__ import annotations

import threading
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, cancel, parallel
from droprig.solver.cancel import AnalysisCancelledError, CancelToken, cancellable

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "steel_erection_floor.droprig"


def test_a_cancelled_token_stops_the_analysis_before_any_work() -> None:
    project = load_project(DEMO)
    token = CancelToken()
    token.cancel()
    with cancellable(token), pytest.raises(AnalysisCancelledError):
        analysis.analyse(project)


def test_no_token_and_an_uncancelled_token_change_nothing() -> None:
    project = load_project(DEMO)
    plain = analysis.analyse(project)
    with cancellable(CancelToken()):
        again = analysis.analyse(project)
    assert [b.max_utilisation for b in plain.bays] == [b.max_utilisation for b in again.bays]


@pytest.mark.parametrize("threads", ["1", "2"])
def test_cancel_between_blocks_stops_the_remaining_blocks(
        threads: str, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("DROPRIG_THREADS", threads)
    token = CancelToken()
    ran: list[int] = []
    lock = threading.Lock()

    def block(s: int, t: int) -> None:
        with lock:
            ran.append(s)
        if s == 0:
            token.cancel()

    with cancellable(token), pytest.raises(AnalysisCancelledError):
        parallel.for_blocks(block, 100 * 10, 10)
    # blocks already started on other threads may finish; the rest never start
    assert 1 <= len(ran) <= parallel.workers() + 1


def test_check_outside_any_run_is_silent() -> None:
    cancel.check()

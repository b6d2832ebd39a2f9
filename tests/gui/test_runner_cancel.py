"""An edit or closing the window stops a running analysis (issue 16, item 7).

Before: an edit could not cancel a running analysis (a 10-level project was up to
date only after 43 s) and closing during a long analysis blocked 30 s. Source:
droprig's own contract (droprig/solver/cancel.py, droprig/gui/analysis_runner.py);
the demo project is an invented input.
"""

from __future__ import annotations

import threading
import time
from dataclasses import replace
from pathlib import Path

from droprig.gui.analysis_runner import AnalysisRunner
from droprig.gui.document import Document
from droprig.io.project_file import load_project
from droprig.model import Project
from droprig.solver import cancel
from droprig.solver.results import Results

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def _slow_until_cancelled(log: list[str], started: threading.Event):  # type: ignore[no-untyped-def]
    def analyse(project: Project) -> Results:
        if project.info.revision == "slow":
            started.set()
            for _ in range(3000):  # 60 s unless cancelled: stands for a long analysis
                cancel.check()
                time.sleep(0.02)
            log.append("slow finished")
        log.append(project.info.revision)
        return Results()
    return analyse


def test_an_edit_cancels_the_running_analysis(qtbot) -> None:
    project = load_project(DEMO)
    doc = Document(replace(project, info=replace(project.info, revision="slow")))
    log: list[str] = []
    started = threading.Event()
    runner = AnalysisRunner(doc, analyse=_slow_until_cancelled(log, started), debounce_ms=10)
    runner.request()
    assert started.wait(5.0)
    doc.edit(replace(doc.project, info=replace(doc.project.info, revision="fast")), "rev")
    qtbot.waitUntil(lambda: "fast" in log, timeout=10_000)
    assert "slow finished" not in log
    assert doc.results_current
    runner.shutdown()


def test_closing_cancels_the_running_analysis(qtbot) -> None:
    project = load_project(DEMO)
    doc = Document(replace(project, info=replace(project.info, revision="slow")))
    log: list[str] = []
    started = threading.Event()
    runner = AnalysisRunner(doc, analyse=_slow_until_cancelled(log, started), debounce_ms=10)
    runner.request()
    assert started.wait(5.0)
    runner.shutdown()  # returns once the job has stopped (it would run 60 s otherwise)
    assert runner.wait_idle(0)
    assert "slow finished" not in log

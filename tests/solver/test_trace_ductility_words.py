"""The calculation trace's ductility line says what a ductility below 1 means.

Found reading the steel demo's trace (the engine-driven welder over bay 1-2/A-B, its
governing point at (0, 7.62) m): the response is *plastic* by the deck's flexure while
the framing stays below its plastic resistance, and the trace printed a bare
"Ductility μ = 0" under a limit of 6. μ = δ_m/δ_y (Biggs 1964, from memory; UFC 3-340-02)
is below 1 only where the framing does not reach its resistance (the deck or the slab's
mechanism yields first), so the line says so; where the framing yields it reads as
before. Words only (common practice, no source: a line must not read as a
contradiction); the numbers are the chain's. The demo is an invented scenario.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.solver import trace_point

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "steel_erection_floor.droprig"


@pytest.fixture(scope="module")
def project():
    return load_project(DEMO)


def _mu(t):
    (s,) = [s for s in t.steps if s.symbol == "μ"]
    return s


def test_ductility_below_one_says_the_framing_stays_elastic(project) -> None:
    t = trace_point(project, "CC1", "Engine-driven welder", 0.0, 7.62)
    assert t.response == "plastic"
    s = _mu(t)
    assert s.value < 1.0
    assert "stays elastic" in s.title and "deck or the slab" in s.title


def test_ductility_of_a_yielding_framing_reads_as_before(project) -> None:
    t = trace_point(project, "CC1", "Joist bundle J-7", 18.830925, 13.4112)
    s = _mu(t)
    assert s.value > 1.0 and s.title == "Ductility"

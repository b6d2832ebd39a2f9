"""The level below: selection and the strike on it after a perforation.

Sources: uniform acceleration (Meriam & Kraige, *Engineering Mechanics:
Dynamics*, ch. 2 — from memory), checked against scipy ``solve_ivp``.
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.model import ColumnGrid, Deck, Level, Project
from droprig.solver import cascade

G = 9.80665
ODE = 1e-6


def _level(lid: str, z: float, x0: float = 0.0, t: float = 0.15) -> Level:
    grid = ColumnGrid((x0, x0 + 6.0), (0.0, 8.0), ("1", "2"), ("A", "B"))
    return Level(lid, lid, z, grid, (), Deck(thickness=t))


def test_level_below_is_the_next_lower_overlapping_level() -> None:
    roof, l3, l2, aside = _level("R", 12.0), _level("L3", 8.0), _level("L2", 4.0), \
        _level("X", 9.0, x0=100.0)
    p = Project(levels=(l2, roof, aside, l3))
    below = cascade.level_below(p, "R")
    assert below is not None and below.id == "L3"  # X is higher but not under the roof
    below2 = cascade.level_below(p, "L2")
    assert below2 is None


def test_equivalent_height_against_integration() -> None:
    roof, l3 = _level("R", 12.0, t=0.15), _level("L3", 8.0)
    assert cascade.clear_height_below(roof, l3) == pytest.approx(3.85)
    vr = 6.0
    h_eq = float(cascade.equivalent_drop_height_below(vr, roof, l3))

    def hit(_t: float, y: list[float]) -> float:
        return y[0] - 3.85

    hit.terminal = True  # type: ignore[attr-defined]
    sol = solve_ivp(lambda _t, y: [y[1], G], (0.0, 10.0), [0.0, vr], events=hit, rtol=1e-10,
                    atol=1e-12)
    v_hit = sol.y_events[0][0][1]
    assert np.sqrt(2 * G * h_eq) == pytest.approx(v_hit, rel=ODE)
    assert np.isnan(cascade.equivalent_drop_height_below(0.0, roof, l3))


def test_two_level_project_passes_a_perforating_drop_down() -> None:
    # A hard rigging item that perforates the roof deck strikes the floor below in the
    # same run: its strike there is the residual speed plus the clear fall (Recht &
    # Ipson 1963 with the plug neglected; kinematics), and that level gets its own bay
    # outcomes. Input: the invented two-level demo; the expected values are derived
    # from the run's own roof results, never from the demo.
    from pathlib import Path

    from droprig.io.project_file import load_project
    from droprig.solver import PERFORATES, analyse

    root = Path(__file__).resolve().parents[2]
    project = load_project(root / "demo_projects" / "two_level_rigging.droprig")
    res = analyse(project)
    roof, below = project.level("RF"), project.level("L3")
    assert cascade.level_below(project, "RF") == below
    assert res.cascade, "the demo's rigging perforates the roof deck"
    for fall in res.cascade:
        case = next(c for c in res.cases if c.load_name == fall.load_name)
        hit = case.response == PERFORATES
        h_eq = np.nanmax(cascade.equivalent_drop_height_below(case.residual_velocity[hit],
                                                              roof, below))
        assert fall.equivalent_height == pytest.approx(h_eq, rel=1e-12)
        assert (fall.from_level, fall.level_id) == ("RF", "L3")
        assert fall.case.level_id == "L3" and fall.case.n > 0
        assert np.allclose(fall.case.drop_height, h_eq)
        assert fall.bays and all(b.level_id == "L3" for b in fall.bays)
        # the roof's bays name the level below as the exclusion zone
        roof_bays = [b for b in res.bays if b.load_name == fall.load_name
                     and b.response == "perforates"]
        assert roof_bays and all(b.level_below == "L3" and b.advice_kind == "level_below"
                                 for b in roof_bays)


def test_trace_shows_the_local_damage_the_analysis_found() -> None:
    # the trace reads the same chain step as the analysis (same numbers)
    from pathlib import Path

    from droprig.io.project_file import load_project
    from droprig.solver import analyse, trace_point

    root = Path(__file__).resolve().parents[2]
    project = load_project(root / "demo_projects" / "two_level_rigging.droprig")
    res = analyse(project)
    case = res.cases[1]
    i = int(np.flatnonzero(case.perforation_height <= case.drop_height)[0])
    t = trace_point(project, case.zone_id, case.load_name, float(case.x[i]), float(case.y[i]))
    assert t.response == "perforates"
    by_symbol = {s.symbol: s.value for s in t.steps}
    assert by_symbol["h_p"] == pytest.approx(case.perforation_height[i], rel=1e-12)
    assert by_symbol["h_s"] == pytest.approx(case.scabbing_height[i], rel=1e-12)
    assert by_symbol["x"] == pytest.approx(case.penetration[i], rel=1e-12)


def _three_levels(thin: float = 0.06):  # type: ignore[no-untyped-def]
    """The invented two-level demo with the lower deck thinned and a copy of that
    level put 4 m under it (inputs only; expected values come from the run)."""
    from dataclasses import replace
    from pathlib import Path

    from droprig.io.project_file import load_project

    root = Path(__file__).resolve().parents[2]
    p = load_project(root / "demo_projects" / "two_level_rigging.droprig")
    l3 = p.level("L3")
    l3 = replace(l3, deck=replace(l3.deck, thickness=thin, cover=0.02))
    l2 = replace(l3, id="L2", name="L2", elevation=l3.elevation - 4.0)
    return replace(p, levels=(p.level("RF"), l3, l2))


def test_a_drop_that_still_perforates_goes_on_down() -> None:
    # Uniform acceleration (Meriam & Kraige ch. 2 — from memory): each lower strike is
    # the residual speed of the level above (Recht & Ipson 1963, plug neglected) plus
    # the clear fall; the chain stops at the lowest level of the project.
    from droprig.solver import PERFORATES, analyse

    project = _three_levels()
    res = analyse(project)
    for name in {f.load_name for f in res.cascade}:
        falls = [f for f in res.cascade if f.load_name == name]
        path = [(f.from_level, f.level_id) for f in falls]
        assert path[0] == ("RF", "L3")
        for (_, b), (c, _) in itertools.pairwise(path):
            assert b == c  # each fall starts where the last one struck
        for upper, lower in itertools.pairwise(falls):
            hit = upper.case.response == PERFORATES
            assert hit.any()
            h_eq = np.nanmax(cascade.equivalent_drop_height_below(
                upper.case.residual_velocity[hit], project.level(upper.level_id),
                project.level(lower.level_id)))
            assert lower.equivalent_height == pytest.approx(h_eq, rel=1e-12)
            assert lower.case.level_id == lower.level_id and lower.bays
        assert len(falls) <= len(project.levels) - 1
    assert any(f.level_id == "L2" for f in res.cascade), \
        "a 60 mm deck under a perforated roof is perforated in turn"


def test_the_cascade_stops_where_the_drop_no_longer_perforates() -> None:
    # the same project with the middle deck at its full 130 mm: any fall onto L2 must
    # come from a perforation of L3 (no fall without a perforating point above it)
    from droprig.solver import PERFORATES, analyse

    project = _three_levels(thin=0.13)
    res = analyse(project)
    for f in res.cascade:
        if f.level_id == "L2":
            src = next(g for g in res.cascade
                       if g.load_name == f.load_name and g.level_id == "L3")
            assert (src.case.response == PERFORATES).any()
        else:
            assert f.level_id == "L3"


def test_the_loads_falling_together_fall_as_each_alone() -> None:
    # every load of a zone falls onto a level in one vectorised run (each point with
    # its own load): the falls equal those of each load's case let fall alone, load by
    # load and level by level (a property of the implementation, no engineering
    # source; the invented three-level project of the tests above)
    from dataclasses import fields, replace

    from droprig.solver import analyse
    from droprig.solver.analysis import cascade_down
    from droprig.solver.floor import floor_cache

    project = _three_levels()
    res = analyse(project)
    zone = project.lift_zones[0]
    assert len(zone.loads) >= 2
    floor = floor_cache(project)
    below = cascade.level_below(project, zone.level_id)
    assert below is not None
    cases = [c for c in res.cases if c.zone_id == zone.id]
    both = cascade_down(project, zone, cases, below, floor)
    alone = []
    for ld, case in zip(zone.loads, cases, strict=True):
        alone.extend(cascade_down(project, replace(zone, loads=(ld,)), [case], below, floor))
    assert len({f.load_name for f in both}) >= 2, "both loads perforate the roof"
    assert any(f.level_id == "L2" for f in both)
    assert [(f.load_name, f.from_level, f.level_id) for f in both] == \
        [(f.load_name, f.from_level, f.level_id) for f in alone]
    for a, b in zip(both, alone, strict=True):
        assert a.equivalent_height == b.equivalent_height
        assert a.bays == b.bays
        for f in fields(a.case):
            va, vb = getattr(a.case, f.name), getattr(b.case, f.name)
            if isinstance(va, np.ndarray):
                assert np.array_equal(va, vb, equal_nan=True), f.name
            else:
                assert va == vb, f.name

"""``verify_point`` shows what the verdict used: with dynamic amplification on, the
factors of the chain's own amplification step at the point (droprig.solver.chain
``dynamic_amplification``), not factors the verification works out for itself.
A wiring check (the same numbers through two routes); the physics of the factors is
tested against outside sources in test_amplification*.py and test_point_history.py.
The demo project is an invented scenario used as input only."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model.errors import ModelError
from droprig.solver.chain import DynamicAmplification, Impact, planned_height
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.floor import floor_model
from droprig.solver.geometry import point_geometry
from droprig.solver.verification import verify_point

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "rooftop_plant_swap.droprig"


def test_verify_point_uses_the_chain_factors() -> None:
    p = load_project(DEMO)
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    zone = p.zone("MC1")
    load = next(ld for ld in zone.loads if ld.name == "AHU-3 (old, drained)")
    x, y = 7.5, 13.5
    pv = verify_point(p, "MC1", load.name, x, y)
    fm = floor_model(p.level(zone.level_id), p.settings)
    c = evaluate_chain(fm, p, load, point_geometry(fm, p, np.array([x]), np.array([y])),
                       detail=True)
    da = c[DynamicAmplification]
    F_c = float(c[Impact].contact[0])
    v = pv.verification
    want = {"moment": da.A_moment[0], "shear": da.A_shear[0],
            "deflection": da.A_deflection[0]}
    assert v.verdict is not None
    for q, A in want.items():
        assert v.amplification[q] == pytest.approx(float(A), rel=1e-12)
        assert v.verdict[q] == pytest.approx(float(A) * v.energy[q], rel=1e-12)
    # the force row compares the force the deck's checks take, F_deck (here, a declared
    # soft underside, the contact force F_c), times the factor they take it with
    F_deck = float(c[Impact].F_deck[0])  # type: ignore[index]
    assert F_deck == F_c
    assert v.energy["force"] == pytest.approx(F_deck, rel=1e-9)
    A_deck = float(da.factor["deck_punching"][0])
    assert v.verdict["force"] == pytest.approx(A_deck * F_deck, rel=1e-12)
    assert v.verdict["force"] == pytest.approx(v.amplification["force"] * F_deck, rel=1e-12)


def test_verify_point_force_row_is_the_contact_force() -> None:
    # two forces per point (the two-mass model): the contact force between load and
    # deck differs from the force on the framing; the verification's force row sets
    # the deck's force (under this declared soft underside, the contact force) beside
    # the time history's contact force (it showed the framing force). Amplification
    # off: the verdict's force is that force (test_verify_force_row.py: a hard load).
    p = load_project(DEMO)
    zone = p.zone("MC1")
    load = next(ld for ld in zone.loads if ld.name == "AHU-3 (old, drained)")
    x, y = 7.5, 13.5
    fm = floor_model(p.level(zone.level_id), p.settings)
    c = evaluate_chain(fm, p, load, point_geometry(fm, p, np.array([x]), np.array([y])),
                       detail=True)
    F, F_c = float(c[Impact].F[0]), float(c[Impact].contact[0])
    assert abs(F_c - F) > 0.01 * F  # the two forces differ here: the test can tell
    v = verify_point(p, "MC1", load.name, x, y).verification
    assert v.energy["force"] == pytest.approx(F_c, rel=1e-9)
    assert v.verdict is not None and v.verdict["force"] == pytest.approx(F_c, rel=1e-9)


TWO_LEVEL = DEMO.parent / "two_level_rigging.droprig"


def test_verify_point_strikes_at_the_chain_speed_with_the_hoist_lowering() -> None:
    # A load lowered at v_h and released from h strikes at √(v_h² + 2gh) (free-fall
    # kinematics, v² = v₀² + 2gh): the same strike as a load released at rest from
    # h + v_h²/2g. The chain takes that energy height (chain.energy_fall); the time
    # history of ``verify_point`` must start from the same speed (it started from
    # the free fall alone, 4.6 mm short on the two-level demo's hoist of 0.3 m/s).
    p = load_project(TWO_LEVEL)
    zone = p.lift_zones[0]
    assert zone.hoist_speed > 0.0
    load = zone.loads[0]
    h0 = planned_height(load, p.level(zone.level_id))
    head = zone.hoist_speed ** 2 / (2.0 * 9.80665)
    at_rest = replace(p, lift_zones=(replace(
        zone, hoist_speed=0.0,
        loads=tuple(replace(ld, drop_height=h0 + head, hook_elevation=None)
                    if ld.name == load.name else ld for ld in zone.loads)),
        *p.lift_zones[1:]))
    x, y = 11.25, 4.5
    lowered = verify_point(p, zone.id, load.name, x, y).verification
    dropped = verify_point(at_rest, zone.id, load.name, x, y).verification
    for q in ("force", "moment", "shear", "deflection"):
        assert lowered.time_history[q] == pytest.approx(dropped.time_history[q], rel=1e-9)
        assert lowered.energy[q] == pytest.approx(dropped.energy[q], rel=1e-9)


def test_verify_point_reads_the_chain_force_of_the_analysis_with_the_hoist() -> None:
    # the chain force shown beside the time history is the analysis's own at the
    # point, lowering speed included (a wiring check: the same number by two routes)
    from droprig.solver import analyse

    p = load_project(TWO_LEVEL)
    r = analyse(p)
    case = next(c for c in r.cases if c.level_id == p.lift_zones[0].level_id
                and c.load_name == "Hook block 12 t")
    # a bay whose governing point lies inside a panel (not over a column)
    bay = next(b for b in r.bays if b.zone_id == case.zone_id and b.bay_id == "2-3/B-C"
               and b.load_name == case.load_name and b.level_id == case.level_id)
    i = int(np.flatnonzero((case.x == bay.governing_x) & (case.y == bay.governing_y))[0])
    pv = verify_point(p, case.zone_id, case.load_name, float(case.x[i]), float(case.y[i]))
    assert pv.chain_peak_force == pytest.approx(float(case.peak_force[i]), rel=1e-9)
    # over a column the modelled member does not move: a message naming the point
    # and the field, no bare 'at: 0 m'
    with pytest.raises(ModelError, match=r"verify\.point.*off the supports of member"):
        verify_point(p, case.zone_id, case.load_name, 0.0, 0.0)


def test_verify_point_follows_the_landing_that_governs() -> None:
    # with the tilted landing checked, the point's verdict comes from the worse of the
    # two landings (chain.merge_landings); the time history beside it must start from
    # the same one, as the calculation trace does (a wiring check: the same force by
    # two routes). Bays whose governing point is inside a panel: with the tilted
    # landing the units' bays now govern on the deck's edge girders (their 2 m edge
    # strip half over the edge presses the slab beside the girder:
    # chain.uniform_on_line), where no member history is run, so every load is taken
    from droprig.solver import analyse

    p = load_project(DEMO)
    p = replace(p, settings=replace(p.settings, tilted_landing=True))
    r = analyse(p)
    seen = 0
    for b in r.bays:
        case = next(c for c in r.cases if c.zone_id == b.zone_id
                    and c.load_name == b.load_name and c.level_id == b.level_id)
        i = int(np.flatnonzero((case.x == b.governing_x) & (case.y == b.governing_y))[0])
        try:
            pv = verify_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        except ModelError:
            continue  # over a support: named in the verification table's notes
        assert pv.chain_peak_force == pytest.approx(float(case.peak_force[i]), rel=1e-9)
        seen += 1
    assert seen >= 3

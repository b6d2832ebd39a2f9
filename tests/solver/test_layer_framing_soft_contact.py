"""The framing under a crushable layer that crushes and does not bottom out
(``chain.framing_while_crushing``) where the load's declared underside is soft.

The pulse model takes the layer's force onto the floor at once and, after the crush,
the load riding on the floor as one mass (``impact.framing_under_crush``: a rigid
contact between them). With a soft underside (the steel demo's joist bundle, 5 MN/m,
against a framing of 6 MN/m) the load and the floor move apart after the crush and
the framing's peak passes that model's (0.869 × the history for the joist bundle,
0.964 × for the welder: the shortfall of stop 28); the default path now raises it by
the exact history's table (``crush_table``, the factor φ ≥ 1). The independent
method is the scipy time history
of load – layer (rigid–plastic at F_c) – contact spring – floor mass – framing of
``tests/solver/test_after_bottoming.py`` (``_history``), on the chain's own numbers
at a point of the steel demo wholly on its pad; sources as there (Biggs 1964 ch. 2,
Clough & Penzien ch. 2 and 4 — from memory). The demo is an invented scenario: it
supplies the geometry, never an expected value.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate, trace_point
from droprig.solver.chain import (
    Compliance,
    Impact,
    LoadInputs,
    StruckMass,
    crushing_parts,
    energy_fall,
)
from droprig.solver.crushhistory import crush_history
from droprig.solver.impact import G
from tests.solver.test_after_bottoming import _history

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def steel():
    return load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")


def _pad1(steel, name):
    """The chain at (22.5, 13.7) on PAD1 and the history's inputs there: (M, v0, F_c,
    s_c, k_c, m2, k2) in SI units."""
    z = steel.lift_zones[0]
    load = next(ld for ld in z.loads if ld.name == name)
    fm = analysis.build_floor(steel.level(z.level_id), steel.settings)
    geo = analysis.point_geometry(fm, steel, np.array([22.5]), np.array([13.7]))
    c = evaluate.evaluate_chain(fm, steel, load, geo, v_hoist=z.hoist_speed)
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    assert sm.m2 is not None
    v0 = math.sqrt(2.0 * G * float(inp.h[0]) + z.hoist_speed**2)
    return c, (load.mass, v0, float(inp.F_c[0]), float(inp.s_c[0]),
               1.0 / float(comp.f_series[0]), float(sm.m2[0]), 1.0 / float(comp.f_s[0]))


@pytest.mark.parametrize("name, ratio_pulse, ratio_chain", [
    ("Joist bundle J-7", 0.869, 1.231), ("Engine-driven welder", 0.964, 1.214)])
def test_exact_crush_history_at_the_pad_point(steel, name, ratio_pulse, ratio_chain):
    # the phase-by-phase closed form of the same system (crushhistory.crush_history)
    # reproduces the scipy history on the chain's own numbers (the history run to
    # the closed form's window, two periods of the slow mode after the last crush):
    # 162.3 kN = 1.46·F_c for the joist bundle, 39.0 kN = 1.12·F_c for the welder,
    # where the pulse model reads 0.869 × and 0.964 × that, and the default path,
    # with the table's factor, 1.231 × and 1.214 × (never below: the table's cell
    # read at its largest corner times its κ band's margin; crush29's coarser grid
    # and margin 1.19 read 1.454 × and 1.318 ×)
    c, args = _pad1(steel, name)
    r = crush_history(*args)
    _, F_frame, _ = _history(*args, math.inf, 0.0, t_end=float(r.t_end[0]))
    assert not bool(r.bottomed[0]) and not bool(r.bounded[0])
    assert F_frame * (1 - 2e-3) <= float(r.F_frame[0]) <= 1.01 * F_frame
    assert float(r.F_frame[0]) > 1.1 * args[2]  # well past the crush force
    imp, inp = c[Impact], c[LoadInputs]
    h_e = float(energy_fall(c, inp.h)[0])
    F_chain, phi = crushing_parts(inp.W[:1], np.array([h_e]), inp.F_c[:1],
                                  c[Compliance].f_series[:1], c[Compliance].f_s[:1],
                                  c[StruckMass].m2[:1])
    assert float(F_chain[0]) / float(r.F_frame[0]) == pytest.approx(ratio_pulse, abs=2e-3)
    assert float(imp.F[0]) == pytest.approx(float(F_chain[0] * phi[0]), rel=1e-12)
    assert float(imp.F[0]) / float(r.F_frame[0]) == pytest.approx(ratio_chain, abs=2e-3)


@pytest.mark.parametrize("name", ["Joist bundle J-7", "Engine-driven welder"])
def test_framing_while_crushing_with_a_soft_underside(steel, name):
    # (22.5, 13.7) lies on PAD1 (x 17.98-27.43, y 8.84-18.59 m) with the whole
    # footprint in either orientation: the layer crushes (F_c = crush stress × the
    # footprint) and does not bottom out
    z = steel.lift_zones[0]
    load = next(ld for ld in z.loads if ld.name == name)
    assert load.contact_stiffness is not None  # a declared (soft) underside
    lv = steel.level(z.level_id)
    fm = analysis.build_floor(lv, steel.settings)
    geo = analysis.point_geometry(fm, steel, np.array([22.5]), np.array([13.7]))
    c = evaluate.evaluate_chain(fm, steel, load, geo, v_hoist=z.hoist_speed)
    inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
    assert bool(inp.crushable[0]) and not bool(imp.bottomed[0]) and sm.m2 is not None
    assert float(inp.F_c[0]) == pytest.approx(
        29925.161862709898 * load.footprint_length * load.footprint_width, rel=1e-9)
    v0 = math.sqrt(2.0 * G * float(inp.h[0]) + z.hoist_speed**2)
    _, F_frame, _ = _history(load.mass, v0, float(inp.F_c[0]), float(inp.s_c[0]),
                             1.0 / float(comp.f_series[0]), float(sm.m2[0]),
                             1.0 / float(comp.f_s[0]), math.inf, 0.0)
    assert float(imp.F[0]) >= F_frame * (1 - 2e-3)  # TH_TOL of test_layer_framing.py


def test_trace_shows_the_table_factor(steel):
    # the calculation trace a signer reads names the factor as its own step, its
    # value the one the chain multiplies by (chain.crushing_parts), reworkable from
    # its printed inputs: φ = max(1, min(F_c·ψ, B_f)/F_chain) (crush_table's
    # docstring), and the framing force's step reads φ·F_chain
    z = steel.lift_zones[0]
    c, _ = _pad1(steel, "Joist bundle J-7")
    tr = trace_point(steel, z.id, "Joist bundle J-7", 22.5, 13.7)
    by = {s.symbol: s for s in tr.steps}
    phi, F_chain = by["φ_crush"], by["F_chain"]
    ins = {k: v[0] for k, v in phi.inputs.items()}
    assert phi.value > 1.0
    assert phi.value == pytest.approx(
        max(1.0, min(ins["F_c"] * ins["ψ"], ins["B_f"]) / ins["F_chain"]), rel=1e-12)
    assert ins["F_chain"] == pytest.approx(F_chain.value, rel=1e-12)
    assert by["F"].value == pytest.approx(float(c[Impact].F[0]), rel=1e-12)
    assert by["F"].value == pytest.approx(phi.value * F_chain.value, rel=1e-12)

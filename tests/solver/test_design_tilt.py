"""The design tilt of the tilted landing as a project input (``Settings.design_tilt``, rad
in the model, ``design_tilt_deg`` in the file, 0-15°, default 5°): the file keeps it, a
value out of range is refused naming the field and the range, and the chain, its search
kernel, the crushable pad's credit and the calculation trace take the project's value.

Sources: the energy bound of either edge's strike, F = W/2 + √(W²/4 + 2W·H'/f_c),
H' = h + b·tan θ/2 + W·f_c/8 + W·f_s/2 (energy method of impact, Gere, *Mechanics of
Materials* 7th ed. §9.10 — from memory; ``footprint.tilted_contact_bound``, checked
against a 2-DOF time history in ``tests/solver/test_tilted_edge_history.py``); the far
edge of a base b wide tilted θ falls b·tan θ below its near edge, the centre of mass
b·tan θ/2 (plane geometry); a crushable layer's plateau (Gibson & Ashby, *Cellular
Solids* 2nd ed. 1997 ch. 5 — from memory) worked by the wedge of a base pressed in at θ
(geometry, hand checks below). The default 5° and the 15° ceiling: common practice, no
source. The demo projects are invented; the expected values are the hand formulas'.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import ProjectFileError, dumps_project, load_project, loads_project
from droprig.model import DESIGN_TILT_DEFAULT, DESIGN_TILT_MAX, ModelError, Settings
from droprig.solver import analysis, evaluate
from droprig.solver.chain import (
    Compliance,
    Impact,
    LoadInputs,
    StruckMass,
    TwoForceKernel,
    impact_at,
)
from droprig.solver.footprint import EDGE_CONTACT_WIDTH, PAD_TILT
from droprig.solver.impact import G
from droprig.solver.struck_mass import envelope_two_forces

ROOT = Path(__file__).resolve().parents[2]
ROOF = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"
STEEL = ROOT / "demo_projects" / "steel_erection_floor.droprig"


def _tilted(path: Path, deg: float):
    p = load_project(path)
    return replace(p, settings=replace(p.settings, tilted_landing=True,
                                       design_tilt=math.radians(deg)))


# ------------------------------------------------------------------ model and file

def test_default_is_the_solver_default_and_files_without_it_read_it():
    # 5° (common practice, no source), the same as the solver's PAD_TILT, so a file
    # written before the input existed reads exactly as it did
    assert DESIGN_TILT_DEFAULT == PAD_TILT == math.radians(5.0)
    assert DESIGN_TILT_MAX == math.radians(15.0)
    p = load_project(STEEL)
    assert "design_tilt" not in STEEL.read_text()
    assert p.settings.design_tilt == DESIGN_TILT_DEFAULT
    # written only when not the default: a default project's file is unchanged
    assert "design_tilt" not in dumps_project(p)


@pytest.mark.parametrize("deg", [0.0, 2.0, 3.7, 15.0])
def test_file_round_trip(deg):
    p = _tilted(STEEL, deg)
    text = dumps_project(p)
    doc = json.loads(text)
    assert doc["settings"]["design_tilt_deg"] == deg  # degrees at the file's edge
    back = loads_project(text)
    assert back.settings.design_tilt == math.radians(deg)  # exact
    assert back.settings == p.settings


@pytest.mark.parametrize("deg", [-0.5, 15.01, 30.0])
def test_model_refuses_a_tilt_out_of_range(deg):
    with pytest.raises(ModelError) as err:
        Settings(tilted_landing=True, design_tilt=math.radians(deg))
    text = str(err.value)
    assert "settings.design_tilt" in text
    assert "≥ 0 rad" in text and f"≤ {DESIGN_TILT_MAX:g} rad" in text


def test_model_refuses_a_tilt_that_is_not_a_number():
    with pytest.raises(ModelError, match=r"settings\.design_tilt"):
        Settings(design_tilt=float("nan"))


@pytest.mark.parametrize("deg", [-1.0, 20.0])
def test_file_refuses_a_tilt_out_of_range(deg):
    doc = json.loads(STEEL.read_text())
    doc["settings"]["design_tilt_deg"] = deg
    with pytest.raises(ProjectFileError) as err:
        loads_project(json.dumps(doc))
    text = str(err.value)
    assert "$.settings.design_tilt_deg: settings.design_tilt" in text
    assert f"≤ {DESIGN_TILT_MAX:g} rad" in text
    assert f"the file gives degrees: {deg:g} deg" in text


# ------------------------------------------------------------------ the chain

def _roof_edge(deg: float):
    """The chain's tilted landing of the rooftop demo's new unit (4.2 t, base 3.0 ×
    2.0 m, its declared underside) on the bare deck at (4.1, 11.3), where the two-mass
    impact runs and the edges' energy bound sets the contact force."""
    p = _tilted(ROOF, deg)
    load = p.lift_zones[0].loads[0]
    fm = analysis.build_floor(p.level(p.lift_zones[0].level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([4.1]), np.array([11.3]))
    return load, evaluate.evaluate_chain(fm, p, load, geo, landing="tilted")


@pytest.fixture(scope="module")
def roof_edges():
    return {deg: _roof_edge(deg) for deg in (0.0, 2.0, 5.0)}


def _hand_edge(W: float, h: float, f_c: float, f_s: float, b: float, tilt: float) -> float:
    # Gere §9.10 energy balance of the body and floor, written out here
    H = h + b * math.tan(tilt) / 2 + W * f_c / 8 + W * f_s / 2
    return W / 2 + math.sqrt(W**2 / 4 + 2 * W * H / f_c)


def test_chain_at_no_tilt_is_the_tilt_free_edge_strike(roof_edges):
    # at 0° the far edge falls no further than the near one: the contact force is the
    # larger of the whole mass's two-mass envelope at the edge and the energy bound with
    # H' = h + W·f_c/8 + W·f_s/2 (no b·tan θ/2 term), by hand
    load, c = roof_edges[0.0]
    inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
    assert imp.two_mass is not None and bool(imp.two_mass[0])
    W, h = float(inp.W[0]), float(inp.h[0])
    f_c, f_s = float(comp.f_series[0]), float(comp.f_s[0])
    assert W == pytest.approx(load.mass * G, rel=1e-12)  # the whole mass on the edge
    hand = W / 2 + math.sqrt(W**2 / 4 + 2 * W * (h + W * f_c / 8 + W * f_s / 2) / f_c)
    env, _ = envelope_two_forces(inp.W, inp.h, comp.f_series, comp.f_s, sm.m2)
    assert hand > float(env[0])  # the bound sets it here (the check can fail)
    assert float(imp.contact[0]) == pytest.approx(hand, rel=1e-9)
    # and below the 5° default's (the far edge's extra fall gone)
    assert float(imp.contact[0]) < float(roof_edges[5.0][1][Impact].contact[0])


@pytest.mark.parametrize("deg", [2.0, 5.0])
def test_tilt_enters_the_far_edge_fall(roof_edges, deg):
    # from the chain's contact force the energy height is H' = ((F − W/2)² − W²/4)·f_c/2W
    # (the bound solved for H'); against the 0° run it is larger by the centre's extra
    # fall b·tan θ/2 (b = 3.0 m across the edge: 52.4 mm at 2°, 131.2 mm at 5°)
    load, c = roof_edges[deg]
    _, c0 = roof_edges[0.0]

    def energy_height(ch) -> float:
        W, f_c = float(ch[LoadInputs].W[0]), float(ch[Compliance].f_series[0])
        F = float(ch[Impact].contact[0])
        return ((F - W / 2) ** 2 - W**2 / 4) * f_c / (2 * W)

    b = max(load.footprint_length, load.footprint_width)
    assert b == 3.0
    extra = b * math.tan(math.radians(deg)) / 2
    assert energy_height(c) - energy_height(c0) == pytest.approx(extra, rel=1e-7)
    inp, comp = c[LoadInputs], c[Compliance]
    assert float(c[Impact].contact[0]) == pytest.approx(
        _hand_edge(float(inp.W[0]), float(inp.h[0]), float(comp.f_series[0]),
                   float(comp.f_s[0]), b, math.radians(deg)), rel=1e-9)


def test_search_kernel_takes_the_project_tilt(roof_edges):
    # the allowable-height searches run chain.TwoForceKernel, the fast copy of the
    # impact step (its plain reference chain.impact_at; common practice, no source):
    # at 2° it reads the 2° bound, not the 5° default, at every height tried
    _, c2 = roof_edges[2.0]
    _, c5 = roof_edges[5.0]
    idx = np.flatnonzero(c2[Impact].searched)
    assert idx.size == 1
    k2, k5 = TwoForceKernel(c2, idx), TwoForceKernel(c5, idx)
    inp, comp = c2[LoadInputs], c2[Compliance]
    W, f_c, f_s = float(inp.W[0]), float(comp.f_series[0]), float(comp.f_s[0])
    for h in (1e-4, 0.05, 0.3, 3.0):
        ref = impact_at(c2, np.array([h]))
        _, F_deck, _ = k2.forces(np.array([h]))
        assert float(F_deck[0]) == pytest.approx(float(ref.deck[0]), rel=1e-12)
        # the unit's soft underside: the deck takes the contact force, the bound here
        assert float(F_deck[0]) == pytest.approx(
            _hand_edge(W, h, f_c, f_s, 3.0, math.radians(2.0)), rel=1e-9)
        _, F5, _ = k5.forces(np.array([h]))
        assert float(F5[0]) > float(F_deck[0])


@pytest.fixture(scope="module")
def welder_on_pad():
    """The steel demo's welder (521.6 kg, base 1.524 × 0.762 m) at the middle of its
    pad (22.9, 13.7), tilted at 0°, 2° and 5°, and flat."""
    out = {}
    for deg in (0.0, 2.0, 5.0):
        p = _tilted(STEEL, deg)
        zone = p.lift_zones[0]
        load = next(ld for ld in zone.loads if ld.name == "Engine-driven welder")
        fm = analysis.build_floor(p.level(zone.level_id), p.settings)
        geo = analysis.point_geometry(fm, p, np.array([22.9]), np.array([13.7]))
        out[deg] = evaluate.evaluate_chain(fm, p, load, geo, landing="tilted")
    out["flat"] = evaluate.evaluate_chain(fm, p, load, geo, landing="flat")
    return out


def test_pad_credit_follows_the_design_tilt(welder_on_pad):
    # the wedge of a base B across the edge pressed in at θ (w0 the edge strip): band
    # w0 + δ/tanθ until flat at δ_f = (B − w0)·tanθ, so the work over the stroke s is
    # σ·ℓ·(w0·δ_f + δ_f²/(2 tanθ) + B·(s − δ_f)), credited as the plateau σ·ℓ·B over
    # s_c = (E − W·s)/(σ·ℓ·B − W) (net work kept). At 0° δ_f = 0: E = σ·ℓ·B·s, s_c = s,
    # the flat landing's credit exactly
    flat = welder_on_pad["flat"][LoadInputs]
    F_plateau, s = float(flat.F_c[0]), float(flat.s_c[0])
    W = float(flat.W[0])
    B = 1.524
    sl = F_plateau / B  # σ·ℓ, N/m
    for deg in (0.0, 2.0, 5.0):
        inp = welder_on_pad[deg][LoadInputs]
        t = math.tan(math.radians(deg))
        d_f = (B - EDGE_CONTACT_WIDTH) * t
        E = sl * (EDGE_CONTACT_WIDTH * d_f + (d_f**2 / (2 * t) if t else 0.0)
                  + B * (s - d_f))
        assert float(inp.F_c[0]) == pytest.approx(F_plateau, rel=1e-9)
        assert float(inp.s_c[0]) == pytest.approx((E - W * s) / (F_plateau - W), rel=1e-9)
    assert float(welder_on_pad[0.0][LoadInputs].s_c[0]) == pytest.approx(s, rel=1e-12)
    assert (float(welder_on_pad[5.0][LoadInputs].s_c[0])
            < float(welder_on_pad[2.0][LoadInputs].s_c[0]) < s)


def test_trace_states_the_design_tilt():
    # the calculation trace prints the tilt it used (2° here, not the 5° default) and
    # the edges' bound re-worked by hand from its printed inputs (Gere §9.10)
    from droprig.solver import trace_point

    p = _tilted(STEEL, 2.0)
    t = trace_point(p, "CC1", "Engine-driven welder", 9.58215, 7.62)
    steps = {s.symbol: s for s in t.steps}
    edge = steps["F_edge"]
    assert "up to 2°" in edge.title
    W, h_e, b, th = (edge.inputs[k][0] for k in ("W", "h_e", "b", "θ"))
    assert th == math.radians(2.0)
    f_c, f_2 = edge.inputs["f_c"][0], edge.inputs["f₂"][0]
    assert edge.value == pytest.approx(_hand_edge(W, h_e, f_c, f_2, b, th), rel=1e-9)
    assert steps["A_c"].inputs["θ_d"][0] == math.radians(2.0)


def test_inspector_states_the_design_tilt():
    # the settings' read-only panel names the tilt the tilted landing is checked for
    pytest.importorskip("PySide6")
    from droprig.gui.document import Selection
    from droprig.gui.inspector import build_form

    p = _tilted(STEEL, 2.5)
    form = build_form(p, Selection("settings", ()))
    assert form is not None
    row = next(f for f in form.fields if f.key == "tilt")
    assert row.get(p.settings) == "checked, any tilt up to 2.5°"
    off = replace(p, settings=replace(p.settings, tilted_landing=False))
    assert row.get(off.settings) == "not checked"

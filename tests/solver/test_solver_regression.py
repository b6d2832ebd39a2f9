"""Regression values: representative outputs of the solver at drop points inside the
bays of the demo projects (member positions 0.23–0.81 of the span, away from every
member end), recorded from the previous implementation before the speed work and
the near-column mass fix (the final outputs re-recorded when the framing's Rayleigh
mass was scaled to the struck point's own deflection, (f_s/f)², and again when the
columns became axial springs, the deck strip continuous over its supports, pads
acted by area and the contact force was bounded by the deck's crushing — the
effective mass, forces and utilisations moved by up to 6 % on the roof demo; on the
steel demo the deck flexure of the continuous strip no longer governs at four of the
six points, so their utilisations fell from 1.47–1.68 to 0.97–1.25; the cross strip to
the girders is checked with the distribution steel; and again when the struck mass
took the members' own share of the deflection, (f_s − f_col)/f, and the allowable
heights counted the deck's crushing work: effective mass −0.2 to −0.9 %, forces and
utilisations ≤ 0.02 %, allowable heights ≤ 0.03 %; and again when the footprint was
cut at the deck's edges and the slab's yield lines entered beyond yield: at the two
points of each demo nearest a deck edge the contact is smaller, effective mass, forces
and utilisations moved by under 0.3 %, allowable heights by up to 6 %; and again when
a flat rigid base that covers both beams of its deck strip rests on them, the strip's
bending out of the series: effective mass +0.7 to +9.4 %, forces +0.2 to +1.9 %,
utilisations +0.1 to +1.7 %, allowable heights −0.3 to −4.0 %; and again when a
spent crushable layer's residual thickness came in series with the contact: the
allowable heights of the two roof points on a pad +0.003 % and +0.015 %; and again
when a flat base's strip compliance became that of a rigid base bearing at its ends
or on the support lines it reaches (slab.rigid_base_strip_compliance), continuous where
it was a step as the base came over the second beam: the roof's second point (its
3 m base over 2.5 m strips) effective mass +0.73 %, force +0.15 %, utilisation
+0.14 %, allowable heights of its first two points −0.01 % and −0.33 %). They are not a
source: the physics is checked against published values elsewhere
(test_loadpath.py, test_analysis.py); this file guards that optimisations change no
result.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, evaluate
from droprig.solver.linear_checks import Family

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-12  # same arithmetic up to reordering of floating-point sums

# regression values from the previous implementation (not a source)
PREVIOUS = {
    "rooftop_plant_swap": {
        "x": (
            2.775, 2.775, 11.4, 11.4, 21.075, 21.075,
        ),
        "y": (
            5.49, 11.07, 5.49, 11.07, 5.49, 11.07,
        ),
        "f": (
            3.5311890944190025e-07, 2.1556198651948897e-07, 1.2664412000557167e-07,
            1.479171908406986e-07, 2.1502884570723612e-07, 1.25782276181328e-07,
        ),
        "m_e": (
            271.6580843975859, 276.9067772286013, 658.8384070049262, 444.68222327571857,
            382.035386886274, 372.6472814596499,
        ),
        "effective_mass": (
            0.0, 196.36408690124776, 0.0, 274.69911277997204, 270.92568161517084, 213.5257323202929,
        ),
        "dynamic_factor": (
            2.185106170666989, 13.082074963598062, 2.185106170666989,
            14.954947707321663, 12.996466179860573, 15.948893661401945,
        ),
        "peak_force": (
            90000.0, 538823.5878554295, 90000.0,
            615963.3393228252, 535297.5392634646, 656901.915703267,
        ),
        "utilisation": (
            0.7925050653944982, 2.349752632113238, 0.3725511571681077,
            1.7567135707536548, 2.1241573327857655, 1.8866519491022364,
        ),
        "allowable_drop_height": (
            0.4438497025861907, 0.07101359211009596, 0.681264893451643,
            0.17076001101795857, 0.07977469815417494, 0.14260592871704755,
        ),
    },
    "steel_erection_floor": {
        "x": (
            3.38328, 3.38328, 13.89888, 13.89888, 25.694640000000003, 25.694640000000003,
        ),
        "y": (
            5.57784, 20.39112, 5.57784, 20.39112, 5.57784, 20.39112,
        ),
        "f": (
            1.9936036216424575e-07, 1.4140584742069e-07, 2.1656120420029804e-07,
            1.5620048210333898e-07, 1.3655912372709652e-07, 8.61456773842129e-08,
        ),
        "m_e": (
            410.63559324219415, 373.6761686600796, 432.00009412160335, 395.50080263368113,
            438.4429446040067, 368.56377509492245,
        ),
        "effective_mass": (
            102.195462334929, 63.98432386236588, 116.61921006963125,
            75.92553100643923, 72.03747668040316, 33.30843999087422,
        ),
        "dynamic_factor": (
            16.63598892588284, 18.07422763131735, 16.254546751441826,
            17.665186829365734, 18.159112621310836, 19.79398810434128,
        ),
        "peak_force": (
            296002.26212538546, 321592.6801150577, 289215.3048241035,
            314314.66356799897, 323103.02910425846, 352192.18295176036,
        ),
        "utilisation": (
            1.2815525882083354, 1.1874925165211259, 1.3484114958924052,
            1.2502823472427396, 0.9700983941663465, 1.157008683990814,
        ),
        "allowable_drop_height": (
            0.4355384468438331, 0.5463122208229643, 0.3661248683257661,
            0.4608016778776049, 0.986921500577938, 0.636991999712718,
        ),
    },
}


@pytest.mark.parametrize("name", sorted(PREVIOUS))
def test_outputs_unchanged_by_the_speed_work(name, monkeypatch):
    ref = PREVIOUS[name]
    # recorded with one force per point: they guard the one-mass step (still the
    # force under mats and crushable layers, the deck's force of a hard load and the
    # two-mass envelope's lower bound); the two-force step is guarded against its own
    # plain reference (test_two_force_kernel.py) and the time histories
    # (test_two_force_envelope.py, test_governing_bays.py)
    monkeypatch.setattr(chain, "TWO_FORCES", False)
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    # recorded before dynamic amplification was on by default: the energy method
    project = replace(project, settings=replace(project.settings, dynamic_amplification=False))
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    x, y = np.array(ref["x"]), np.array(ref["y"])
    geo = analysis.point_geometry(fm, project, x, y)
    np.testing.assert_allclose(geo.path.f, ref["f"], rtol=REL, atol=0.0)
    np.testing.assert_allclose(geo.path.m_e, ref["m_e"], rtol=REL, atol=0.0)
    res = evaluate.evaluate_case(fm, project, zone.loads[0], geo)
    for key in ("effective_mass", "dynamic_factor", "peak_force", "utilisation"):
        np.testing.assert_allclose(res[key], ref[key], rtol=REL, atol=0.0, err_msg=key)
    # the recorded allowable heights were measured to the pad top; droprig now states
    # them above the finished surface (the fall plus the pad's thickness)
    pad = res["drop_height"] - res["fall_height"]
    np.testing.assert_allclose(res["allowable_drop_height"] - pad,
                               ref["allowable_drop_height"], rtol=REL, atol=0.0)


def test_allowed_force_of_a_check_family_follows_its_definition():
    # F_allow per candidate = (R − sign(unit)·exist)/|unit| (linear check
    # |F·unit + exist| ≤ R solved for F; common practice, no source), ∞ where the
    # candidate takes no share (unit = 0), −1 where the existing demand alone exceeds R
    rng = np.random.default_rng(7)
    unit = rng.normal(size=(6, 50))
    unit[0, :10] = 0.0
    unit[1, :5] = -0.0
    exist = rng.normal(scale=2.0, size=(6, 50))
    resist = rng.uniform(0.5, 3.0, size=(6, 50))
    member = np.zeros((6, 50), dtype=np.int64)
    with np.errstate(divide="ignore"):
        want = np.where(unit == 0.0, np.inf,
                        (resist - np.sign(unit) * exist) / np.abs(unit))
    want = np.where(np.abs(exist) > resist, -1.0, want)
    fam = Family.from_candidates(unit.copy(), exist.copy(), resist, member)
    np.testing.assert_allclose(fam.fa, want, rtol=1e-14)
    np.testing.assert_array_equal(fam.F_allow, fam.fa.min(axis=0))
    # a NaN unit demand sets no limit; a NaN existing demand gives no allowed force
    unit[2, 0], exist[3, 1] = np.nan, np.nan
    fam = Family.from_candidates(unit.copy(), exist.copy(), resist, member)
    assert fam.fa[2, 0] == np.inf and np.isnan(fam.fa[3, 1])

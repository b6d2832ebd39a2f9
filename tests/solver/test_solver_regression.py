"""Regression values: representative outputs of the solver at drop points inside the
bays of the demo projects (member positions 0.23–0.81 of the span, away from every
member end), recorded from the previous implementation before the speed work and
the near-column mass fix (the final outputs re-recorded when the framing's Rayleigh
mass was scaled to the struck point's own deflection, (f_s/f)²). They are not a
source: the physics is checked against published values elsewhere
(test_loadpath.py, test_analysis.py); this file guards that optimisations change no
result.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate
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
            0.0, 193.59365639009474, 0.0, 244.84548971321414, 248.99170357588565,
            187.96316184436148,
        ),
        "dynamic_factor": (
            2.185106170666989, 13.043295268952498, 2.185106170666989, 14.606569594217694,
            12.776392279589558, 15.523924791138397,
        ),
        "peak_force": (
            90000.0, 537226.3325069466, 90000.0, 601614.3659867668, 526233.1508642752,
            639398.3276226729,
        ),
        "utilisation": (
            0.7925050653944982, 2.3434899702099456, 0.3725511571681077, 1.7213135542632698,
            2.093581108769045, 1.8426981368498399,
        ),
        "allowable_drop_height": (
            0.443952785893339, 0.07147483941675811, 0.6957869303938167, 0.17966421296515875,
            0.08280603001936522, 0.15111362723420124,
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
            100.73403508091302, 61.650153089429146, 115.01125220144233, 73.25995813701954,
            70.84929548274795, 31.887084362783174,
        ),
        "dynamic_factor": (
            16.585936023496465, 17.92736063199599, 16.20822334576483, 17.529103206186637,
            18.09352345155027, 19.597914805496945,
        ),
        "peak_force": (
            295111.67651617905, 318979.4922712588, 288391.0777264039, 311893.3431115661,
            321936.0084536347, 348703.47300738114,
        ),
        "utilisation": (
            1.3598450955604013, 1.545497580805696, 1.3455143706675623, 1.5145825883681505,
            1.4694624290362346, 1.6751754381245823,
        ),
        "allowable_drop_height": (
            0.4238754149279392, 0.3106699577496847, 0.3683683571708017, 0.32587673214503704,
            0.3521585469434087, 0.2572102968563167,
        ),
    },
}


@pytest.mark.parametrize("name", sorted(PREVIOUS))
def test_outputs_unchanged_by_the_speed_work(name):
    ref = PREVIOUS[name]
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    x, y = np.array(ref["x"]), np.array(ref["y"])
    geo = analysis.point_geometry(fm, project, x, y)
    np.testing.assert_allclose(geo.path.f, ref["f"], rtol=REL, atol=0.0)
    np.testing.assert_allclose(geo.path.m_e, ref["m_e"], rtol=REL, atol=0.0)
    res = evaluate.evaluate_case(fm, project, zone.loads[0], geo)
    for key in ("effective_mass", "dynamic_factor", "peak_force", "utilisation",
                "allowable_drop_height"):
        np.testing.assert_allclose(res[key], ref[key], rtol=REL, atol=0.0, err_msg=key)


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

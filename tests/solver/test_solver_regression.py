"""Regression values: representative outputs of the solver at drop points inside the
bays of the demo projects (member positions 0.23–0.81 of the span, away from every
member end), recorded from the previous implementation before the speed work and
the near-column mass fix. They are not a source: the physics is checked against
published values elsewhere (test_loadpath.py, test_analysis.py); this file guards
that optimisations change no result.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis

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
            0.0, 276.9067772286013, 0.0, 444.68222327571857, 382.035386886274, 372.6472814596499,
        ),
        "dynamic_factor": (
            2.185106170666989, 12.931488870952075, 2.185106170666989, 14.312257340855263,
            12.605414614788298, 15.22901864911002,
        ),
        "peak_force": (
            90000.0, 532621.2584125531, 90000.0, 589492.2534971327, 519190.9347748774,
            627251.7540882381,
        ),
        "utilisation": (
            0.7925050653944982, 2.3254339830315724, 0.3725511571681077, 1.691407374080122,
            2.0698261274905683, 1.8121964928335261,
        ),
        "allowable_drop_height": (
            0.443952785893339, 0.07283017457038127, 0.6957869303938167, 0.18774177371279951,
            0.08528228081237797, 0.15747381900843913,
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
            410.63559324219415, 373.6761686600796, 432.00009412160335, 395.50080263368113,
            438.4429446040067, 368.56377509492245,
        ),
        "dynamic_factor": (
            15.464656195361249, 16.678544994067835, 15.099413288296779, 16.281286218455016,
            16.642091259933625, 18.108207381101433,
        ),
        "peak_force": (
            275160.8718431124, 296759.4574148294, 268662.1462670134, 289691.0771246979,
            296110.84026229836, 322197.2779449405,
        ),
        "utilisation": (
            1.2783163546374985, 1.4485574523850429, 1.2761679670492858, 1.417719980820362,
            1.3639281670721428, 1.5595359276603404,
        ),
        "allowable_drop_height": (
            0.4924668255321215, 0.3623416499667328, 0.4288896721143641, 0.38150777457668544,
            0.4208249781415699, 0.3041142392656989,
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
    res = analysis.evaluate_case(fm, project, zone.loads[0], geo)
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
    for owned in (False, True):
        fam = analysis._Family(unit.copy(), exist.copy(), resist, member, owned=owned)
        np.testing.assert_allclose(fam.fa, want, rtol=1e-14)
        np.testing.assert_array_equal(fam.F_allow, fam.fa.min(axis=0))

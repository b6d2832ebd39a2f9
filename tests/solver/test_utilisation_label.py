"""The check printed beside a utilisation is the one whose U it is.

A point's U is the largest demand/resistance ratio over its checks (common practice,
no source); the verdict's governing check can be another (a brittle check failing at
the yield force, ductility, rotation). Every surface prints U with its own check
(``utilisation_check``), the verdict with ``governing_check``. Checked on the demo
projects (invented scenarios: inputs only) with dynamic amplification off and on, and
with two forces per point (``chain.TWO_FORCES``) off and on: the label must be the
family whose amplified U equals the point's U, recomputed from the chain's own
Demands at that point.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analysis, chain
from droprig.solver.chain import Demands
from droprig.solver.evaluate import governing_point
from droprig.solver.results import CHECKS

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")


@pytest.mark.parametrize("two", [False, True])
@pytest.mark.parametrize("on", [False, True])
def test_every_bays_utilisation_label_names_its_own_check(monkeypatch, on: bool,
                                                          two: bool) -> None:
    monkeypatch.setattr(chain, "TWO_FORCES", two)
    differs = 0
    for name in DEMOS:
        p = load_project(demo_dir() / f"{name}.droprig")
        p = replace(p, settings=replace(p.settings, dynamic_amplification=on,
                                        tilted_landing=False))
        res = analysis.analyse(p)
        for case in res.cases:
            fin = np.isfinite(case.utilisation)
            # the per-point label is one of the checks (or the opening)
            assert np.all((case.utilisation_check >= 0)
                          & (case.utilisation_check < len(CHECKS)))
            differs += int(np.sum(fin & (case.utilisation_check != case.governing_check)))
        for b in res.bays:
            if b.utilisation_x is None or b.utilisation_check == "opening":
                continue
            zone = next(z for z in p.lift_zones if z.id == b.zone_id)
            load = next(ld for ld in zone.loads if ld.name == b.load_name)
            fm = analysis.build_floor(p.level(b.level_id), p.settings)
            geo = analysis.point_geometry(fm, p, np.array([b.utilisation_x]),
                                          np.array([b.utilisation_y]))
            # the case that governs the point (at a pad's edge, possibly the tip-off's)
            ch = governing_point(fm, p, load, geo, zone.hoist_speed).chain
            dem = ch[Demands]
            U = {k: float(v.U[0]) for k, v in dem.checks.items()}
            # the bay's U is this point's U, and the label is its family
            assert max(U.values()) == pytest.approx(b.max_utilisation, rel=1e-9), (name, b)
            assert U[b.utilisation_check] == pytest.approx(b.max_utilisation, rel=1e-9), (
                name, b.bay_id, b.load_name, b.utilisation_check, U)
    if on and not two:
        # the case the label got wrong (the verdict's check printed beside another
        # family's U) is exercised
        assert differs > 0


def test_point_table_carries_the_check_of_each_points_utilisation() -> None:
    # droprig analyse --csv: per point the check whose U it is beside the verdict's;
    # on the steel demo with amplification on they differ (flexure's U beside a
    # brittle check failing at the yield force)
    import csv
    import io

    from droprig.commands.analyse import csv_text

    p = load_project(demo_dir() / "steel_erection_floor.droprig")
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    rows = list(csv.DictReader(io.StringIO(csv_text(p, analysis.analyse(p)))))
    assert rows and all(r["utilisation_check"] in CHECKS for r in rows)
    assert any(r["utilisation_check"] != r["governing_check"] for r in rows)

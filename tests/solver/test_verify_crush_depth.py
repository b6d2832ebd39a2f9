"""The verification's crushed depth is the depth the crushable layer loses, in the
load's own travel, so it never exceeds the layer's stroke (issue 12; seen under Xvfb on
the steel demo: the spreader bar at (78, 38) ft on PAD1, stroke 8.00 in, read "crushed
10.00 in").

The time history runs in the struck member's generalised coordinate Q = u/w (the
member's lever-rule share w; droprig.solver.pointhistory.shared_load: the layer's
stroke s is s/w there, Lagrange's equations with a kinematic constraint, Clough &
Penzien, *Dynamics of Structures* 2nd ed. §8-2 — from memory), so its crushed depth
must be taken back by w like the load's travel. A layer cannot crush further than its
stroke (common practice, no source). Demo projects are invented scenarios.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.solver import verify_point

ROOT = Path(__file__).resolve().parents[2]
FT = 0.3048  # m per international foot (NIST SP 811)


def test_crushed_depth_is_within_the_layers_stroke():
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    pv = verify_point(p, "CC1", "Spreader bar 12 ft", 78.0 * FT, 38.0 * FT)
    v = pv.verification
    pad = p.protection_areas[0]
    assert pad.crush_stroke == pytest.approx(8.0 * 0.0254)  # 8.00 in, as the file says
    # the case of the finding: the layer used up, the force past the crushing cap
    assert v.time_history["force"] > 1.01 * v.crushing_force
    assert v.stroke == pytest.approx(pad.crush_stroke, rel=1e-9)
    assert 0.0 < v.crush <= v.stroke * (1.0 + 1e-6), (v.crush, v.stroke)

"""The annex plan: the drift band the analysis used and the scabbing mark.

Sources: plain kinematics for the drift margin (v = ω·R held over the fall time
from the hoist's lowering speed, t = (√(v_h² + 2gh) − v_h)/g; pendulum offset
L·sin θ and speed √(2gL(1 − cos θ)); Meriam & Kraige, *Engineering Mechanics:
Dynamics*, ch. 2 and 8 — from memory), worked by hand below. The mark and the
legend are droprig's own plan language (common practice, no source).
"""

from __future__ import annotations

import math
import pathlib

import pytest
from reportlab.graphics.shapes import Circle, String

from droprig import outcomes
from droprig.io.project_file import load_project
from droprig.model import bays
from droprig.report import content
from droprig.report.figures import BayMark, plan_drawing
from droprig.solver.results import BaySummary, Results

ROOT = pathlib.Path(__file__).resolve().parents[2]
G = 9.80665
HAND = 1e-4  # hand calculation carried to 5 figures


def _walk(node: object):  # type: ignore[no-untyped-def]
    yield node
    for c in getattr(node, "contents", ()) or ():
        yield from _walk(c)


def test_annex_zones_carry_the_computed_drift_margin() -> None:
    # Invented two-level demo, zone MC1 in computed mode: slew 0.05 rad/s at
    # r_max = 26 m, hoist lowering 0.3 m/s, swing 2.8648° (0.05 rad) on 20 m of rope;
    # the hook block falls 6.0 m (the larger of the two loads' falls).
    p = load_project(ROOT / "demo_projects" / "two_level_rigging.droprig")
    stored = p.lift_zones[0].drift_margin
    z = content.select_zones(p, None)[0]
    vh, h = 0.3, 6.0
    t = (math.sqrt(vh**2 + 2 * G * h) - vh) / G  # 1.07603 s by hand
    slew = 0.05 * 26.0 * t
    th, L = 0.05, 20.0
    swing = math.hypot(L * math.sin(th), math.sqrt(2 * G * L * (1 - math.cos(th))) * t)
    assert t == pytest.approx(1.07603, rel=HAND)
    assert z.drift_margin == pytest.approx(slew + swing, rel=HAND)
    assert z.drift_margin != pytest.approx(stored)
    assert content.select_zones(p, "MC1")[0].drift_margin == z.drift_margin


def test_scabbing_bays_and_their_mark() -> None:
    p = load_project(ROOT / "demo_projects" / "two_level_rigging.droprig")
    level = p.level("RF")
    ids = [b.id for b in bays(level)]

    def summary(bay: str, scab: bool) -> BaySummary:
        return BaySummary("RF", bay, "MC1", "Hook block 12 t", 3, 0.5, "elastic", 2.0, None,
                          1.0, 1.0, "B1", "flexure", "none", scabbing=scab)

    res = Results((), (summary(ids[0], True), summary(ids[1], False)))
    zones = content.select_zones(p, None)
    assert content.scabbing_bays(res, level, zones) == {ids[0]}
    assert content.scabbing_bays(res, p.level("L3"), zones) == set()
    ink = outcomes.SCABBING.ink.lower()

    def n_marks(marks: dict[str, BayMark]) -> int:
        d = plan_drawing(level, list(zones), (), {}, "SI", 500, 600, marks=marks)
        return sum(1 for n in _walk(d) if isinstance(n, Circle)
                   and n.fillColor is not None and n.fillColor.hexval().lower()
                   == "0x" + ink[1:])

    legend_only = n_marks({})
    assert legend_only == 1  # the key's sample
    assert n_marks({ids[0]: BayMark(scabbing=True)}) == legend_only + 1
    d = plan_drawing(level, list(zones), (), {}, "SI", 500, 600)
    words = " ".join(n.text for n in _walk(d) if isinstance(n, String))
    assert outcomes.OUTCOMES["perforates"].label in words
    assert outcomes.SCABBING.label.lower() in words


def test_pads_leave_the_bays_labels_and_outcome_fill_in_view() -> None:
    """On the rooftop demo's annex the pads' labels sat on their top edges and hid
    the padded bays' ids and outcomes ("X Exceeds limits" could not be read), and
    their solid near-black fill hid the outcome colour (a padded bay read like "may
    go through"). Every bay's label must stay clear of every pad's label, every
    bay's id must be printed, and no solid box may cover a pad's area (droprig's own
    plan language: common practice, no source)."""
    from reportlab.graphics.shapes import Rect

    from droprig.report.figures import PAD_FILL

    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    level = p.levels[0]
    prot = [a for a in p.protection_areas if a.level_id == level.id]
    assert len(prot) == 2  # the demo's two crushable pads
    ids = [b.id for b in bays(level)]
    outcomes_ = {b: ("exceeds", 7.42) for b in ids}
    marks = {b: BayMark(False, ("C1", "C2", "C3", "C5", "C7")) for b in ids}
    specs = {a.id: "crushable, 0.500 m thick; crushes at 15.0 kPa, stroke 0.350 m"
             for a in prot}
    d = plan_drawing(level, list(content.select_zones(p, None)), prot, outcomes_, "SI",
                     500, 600, marks=marks, pad_specs=specs)
    rects = [n for n in _walk(d) if isinstance(n, Rect)]
    pad_hex = PAD_FILL.hexval()

    def box(r: Rect) -> tuple[float, float, float, float]:
        return (r.x, r.y, r.x + r.width, r.y + r.height)

    bay_boxes = [box(r) for r in rects if r.fillColor is not None
                 and r.fillColor.hexval() == "0xffffff" and r.strokeWidth == 0.6]
    pad_boxes = [box(r) for r in rects if r.fillColor is not None
                 and r.fillColor.hexval() == pad_hex]
    assert len(bay_boxes) == len(ids)
    assert len(pad_boxes) == len(prot)  # the labels only: no solid pad fill
    for a in pad_boxes:
        for b in bay_boxes:
            w = min(a[2], b[2]) - max(a[0], b[0])
            h = min(a[3], b[3]) - max(a[1], b[1])
            assert w <= 0 or h <= 0, (a, b)
    words = " ".join(n.text for n in _walk(d) if isinstance(n, String))
    for b in ids:
        assert b in words
    assert words.count("X Exceeds limits") >= len(ids)


@pytest.mark.parametrize("width", [500.0, 515.0])
def test_every_legend_label_is_printed_whole(width: float) -> None:
    """The legend prints one line per entry and dropped what did not fit: "exclusion
    area: do not carry the load over it" read "… carry the load" and "pad or mat to
    lay (specification labelled)" lost its last word (seen in the rooftop demo's annex
    with pdftoppm). Every entry must be printed whole at the annex's widths (droprig's
    own plan language: common practice, no source)."""
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    d = plan_drawing(p.levels[0], list(content.select_zones(p, None)), (), {}, "SI",
                     width, 600)
    words = [n.text for n in _walk(d) if isinstance(n, String)]
    for label in ("exclusion area: keep the load off", "pad or mat to lay (see its label)",
                  "soffit may scab: clear level below",
                  "S1: set-down point (inputs, section 4)"):
        assert label in words, (label, [w for w in words if w[:8] == label[:8]])

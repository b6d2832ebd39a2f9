"""A pad covering part of a bay is an obstacle for a capped load, not a reason to
keep the load off the bay (droprig.model.limit_is_practical, the solver's bay
summary and the permit: one rule).

Sources: plane geometry for the covered area (a rectangle less the union of
rectangles, by hand); the rule itself is common practice, no source: a load whose
underside is kept below a pad's top cannot pass over the pad, so it is carried round
it, and the hook limit holds over the rest of the bay. The closed loop of
tests/test_permit.py (every printed condition followed, the pads' parts of the bays
kept clear of the load's footprint) checks that the limits so kept work.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.model import ProtectionArea, Rect, limit_is_practical, pads_above, uncovered_area
from droprig.permit import derive_conditions
from droprig.solver import BaySummary, analyse
from droprig.solver.summary import without_limit_under_pads

ROOT = Path(__file__).resolve().parents[1]
BAY = Rect(9.144, 0.0, 18.288, 9.144)  # a 30 ft square bay


def _pad(pid: str, r: Rect, t: float) -> ProtectionArea:
    return ProtectionArea(pid, "", "L1", r, "spring", t, 50e6)


def test_uncovered_area_by_hand():
    # a 0.3 m square lip in the bay's corner: 9.144² − 0.3² m²
    lip = Rect(17.988, 8.844, 27.432, 18.593)
    assert uncovered_area(BAY, [lip]) == pytest.approx(9.144 ** 2 - 0.3 * 0.3, rel=1e-9)
    # two overlapping pads that together cover the bay (overlap counted once): 0
    west = Rect(9.0, -1.0, 14.0, 10.0)
    east = Rect(13.0, -1.0, 19.0, 10.0)
    assert uncovered_area(BAY, [west, east]) == pytest.approx(0.0, abs=1e-12)
    # a strip across the middle, 2 m wide: 9.144 × (9.144 − 2) m²
    strip = Rect(0.0, 3.0, 30.0, 5.0)
    assert uncovered_area(BAY, [strip]) == pytest.approx(9.144 * 7.144, rel=1e-9)
    # a pad beside the bay sharing only its edge covers nothing
    assert uncovered_area(BAY, [Rect(18.288, 0.0, 20.0, 9.144)]) == \
        pytest.approx(9.144 ** 2, rel=1e-12)


def test_limit_practical_unless_the_pads_above_it_cover_the_bay():
    lip = _pad("LIP", Rect(17.988, 8.844, 27.432, 18.593), 0.305)
    whole = _pad("ALL", Rect(9.0, -0.1, 18.5, 9.5), 0.305)
    low = _pad("LOW", Rect(9.0, -0.1, 18.5, 9.5), 0.05)
    assert limit_is_practical([lip], BAY, 0.12)  # carried round the lip
    assert not limit_is_practical([whole], BAY, 0.12)  # nowhere to keep it
    assert limit_is_practical([low], BAY, 0.12)  # a thin mat under the limit
    assert limit_is_practical([whole], BAY, 0.4)  # the limit is above its top
    assert pads_above([lip, whole, low], BAY, 0.12) == (lip, whole)
    # the pad beside the bay (an edge in common) does not stand on it
    beside = _pad("NEXT", Rect(18.288, 0.0, 20.0, 9.144), 1.0)
    assert pads_above([beside], BAY, 0.12) == ()


def test_summary_keeps_the_limit_beside_a_lip():
    s = BaySummary(level_id="L1", bay_id="2-3/A-B", zone_id="Z", load_name="crate",
                   n_points=10, max_utilisation=1.5, response="exceeds",
                   allowable_drop_height=0.2, allowable_drop_height_plastic=None,
                   governing_x=10.0, governing_y=1.0, governing_member="B1",
                   governing_check="flexure", advice_kind="limit_height",
                   height_limit=0.18, protections=("LIP",))
    lip = _pad("LIP", Rect(17.988, 8.844, 27.432, 18.593), 0.305)
    assert without_limit_under_pads(s, [lip], BAY) is s
    whole = replace(lip, area=Rect(9.0, -0.1, 18.5, 9.5))
    gone = without_limit_under_pads(s, [whole], BAY)
    assert gone.height_limit is None and gone.advice_kind == "keep_clear"


@pytest.fixture(scope="module")
def steel_permit():
    project = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    return project, derive_conditions(project, analyse(project))


@pytest.mark.parametrize("load", ["Joist bundle J-7", "Spreader bar 12 ft"])
def test_steel_demo_pad_lip_keeps_the_neighbours_limits(steel_permit, load):
    """The steel demo's plywood pad PAD1 lies over bay 3-4/B-C and 0.3 m (1 ft) past
    its grid lines. Before stop 33 that lip took the hook limits of the five bays
    around it away (0.123–0.143 m for the joist bundle, 0.271 m for the spreader bar:
    both below the pad's 0.305 m top), so the permit kept the load off them while the
    same limits held in the bays beside them without a pad. Now each keeps its limit
    and the condition keeps the load off the pad's lip there."""
    _, pc = steel_permit
    for bay in ("2-3/A-B", "2-3/B-C", "2-3/C-D"):
        bv = pc.bay("CC1", load, bay)
        assert bv.verdict == "acceptable_with_conditions", bay
        cap = next(c for c in bv.conditions if c.kind == "cap_hook")
        assert cap.max_drop_height < 0.3048  # below the pad's top ...
        assert [pa.id for pa in cap.off_pads] == ["PAD1"]  # ... so kept off it there
        assert "Keep it off pad PAD1 there" in cap.sentence("US")
        # the same limit as the bay beyond without the lip (1-2/… has no pad) or
        # higher: a lip never lowers it (the spreader bar's 2-3 bays allow more)
        free = pc.bay("CC1", load, "1-2/" + bay.split("/")[1])
        free_cap = next(c for c in free.conditions if c.kind == "cap_hook")
        assert cap.max_drop_height >= free_cap.max_drop_height * (1 - 1e-9)
        assert free_cap.off_pads == ()

"""A bay the permit keeps the load off carries no drop-height limit in the results
(issue 10): a limit at or below the top of pads that cover the whole bay is no
practical hook limit — the load would pass the bay with its underside below a pad's
top. Where such pads cover only part of the bay (a pad's lip past the grid line), the
limit stays and the permit keeps the load off them there (stop 33: the rooftop demo's
drained unit, bay 1-2/B-C, was kept off for the mats' 0.3 m lip; its limit, 0.113 m,
now holds when followed, tests/test_permit.py's closed loop). Common practice, no
source (a hook limit is only offered where the load can be lifted at it); the
expected values are the permit's own rule (droprig.permit.derive_conditions).
"""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import pytest

from droprig.advice import advice_text
from droprig.commands.analyse import bays_csv_text, results_document
from droprig.io.project_file import load_project
from droprig.permit import derive_conditions
from droprig.solver import LIMIT_MARGIN, analyse
from droprig.solver.summary import without_limit_under_pads

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def rooftop():
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    r = analyse(p)
    return p, r, derive_conditions(p, r)


def _bay(r, load_start: str, bay: str):
    return next(b for b in r.bays if b.load_name.startswith(load_start) and b.bay_id == bay)


def test_keep_off_bay_has_no_limit(rooftop):
    _p, r, permit = rooftop
    b = _bay(r, "AHU-3 (new)", "1-2/A-B")
    # the mats MAT1 and MAT2 (0.5 m) cover the bay whole; its allowable height (0.513 m)
    # less the 10 % margin lies below their top
    assert {"MAT1", "MAT2"} <= set(b.protections)
    assert b.allowable_drop_height is not None and \
        LIMIT_MARGIN * b.allowable_drop_height < 0.5
    assert b.height_limit is None and b.height_limit_x is None and b.height_limit_check == ""
    assert b.advice_kind == "keep_clear"
    v = next(v for v in permit.bays if v.load_name == b.load_name and v.bay_id == b.bay_id)
    assert v.verdict == "not_acceptable" and v.max_hook_elevation is None
    assert not any(c.kind == "cap_hook" for c in v.conditions)


def test_lip_bay_keeps_its_limit_off_the_mats(rooftop):
    _p, r, permit = rooftop
    b = _bay(r, "AHU-3 (old", "1-2/B-C")
    # the bay's points on the line y = 9.3 lie on the mats' lip; the limit (0.113 m)
    # is below their top, but the mats cover 0.3 m of the bay's 9 m
    assert "MAT2" in b.protections
    assert b.height_limit is not None and b.height_limit < 0.5
    assert b.advice_kind == "limit_height"
    v = next(v for v in permit.bays if v.load_name == b.load_name and v.bay_id == b.bay_id)
    cap = next(c for c in v.conditions if c.kind == "cap_hook")
    assert cap.max_drop_height == b.height_limit
    assert [pa.id for pa in cap.off_pads] == ["MAT1", "MAT2"]
    assert "Keep it off pads MAT1 and MAT2 there" in cap.sentence("SI")
    # kept off the mats there, the bay does not rely on them
    assert not any(c.kind == "lay_protection" for c in v.conditions)


def test_cli_never_shows_the_kept_off_limit(rooftop):
    # what the CLI writes (JSON, bays CSV, the table) and the advice words: no limit
    # for the kept-off bay, and nowhere the figure it would have read
    p, r, permit = rooftop
    b = _bay(r, "AHU-3 (new)", "1-2/A-B")
    would = f"{LIMIT_MARGIN * b.allowable_drop_height:.3f}"
    doc = results_document(p, r, permit)
    row = next(d for d in doc["bays"] if d["load_name"] == b.load_name
               and d["bay_id"] == b.bay_id)
    assert row["height_limit"] is None and row["max_hook_elevation"] is None
    assert would not in json.dumps(row) and would not in advice_text(b)
    csv_rows = [ln for ln in bays_csv_text(p, r, permit).splitlines()
                if b.bay_id in ln and b.load_name in ln]
    assert csv_rows and not any(would in ln for ln in csv_rows)
    assert "limit the drop height" not in advice_text(b)


def test_limit_above_the_pads_top_is_kept():
    # the rule drops a limit at or below the top of pads covering the whole bay only; a
    # mat offered beside the limit stays the advice (common practice, no source)
    from droprig.model import ProtectionArea, Rect
    from droprig.solver.results import BaySummary

    bay = Rect(0.0, 0.0, 7.5, 9.0)
    base = BaySummary(level_id="RF", bay_id="1-2/A-B", zone_id="Z", load_name="L",
                      n_points=4, max_utilisation=1.5, response="exceeds",
                      allowable_drop_height=0.8, allowable_drop_height_plastic=0.8,
                      governing_x=0.0, governing_y=0.0, governing_member="B1",
                      governing_check="flexure", advice_kind="limit_or_mat",
                      height_limit=0.72, mat_stiffness_max=1e6, protections=("P1",))

    whole = Rect(-0.1, -0.1, 7.6, 9.1)

    def pad(t: float, area: Rect = whole) -> ProtectionArea:
        return ProtectionArea("P1", "", "RF", area, "spring", t, 50e6)

    assert without_limit_under_pads(base, [pad(0.5)], bay) is base
    low = without_limit_under_pads(base, [pad(0.75)], bay)
    assert low.height_limit is None and low.advice_kind == "mat"
    only = without_limit_under_pads(replace(base, advice_kind="limit_height",
                                            mat_stiffness_max=None), [pad(0.72)], bay)
    assert only.height_limit is None and only.advice_kind == "keep_clear"
    bare = replace(base, protections=())
    assert without_limit_under_pads(bare, [pad(0.75)], bay) is bare
    # the same thick pad over half the bay: the limit stays
    half = pad(0.75, Rect(-0.1, -0.1, 3.75, 9.1))
    assert without_limit_under_pads(base, [half], bay) is base


def test_height_limit_is_the_hook_limit_the_permit_prints(rooftop):
    # one meaning for a bay's height_limit on every advice: the drop-height limit of the
    # permit's hook condition for the bay (the rooftop spreader beam perforates the
    # deck in 1-2/A-B and 2-3/A-B: its field read 0.679 m, 90 % of the height where
    # perforation starts, while the permit printed 0.549 m, the framing's part taken on
    # top; the expected values are the permit's own rule, droprig.permit)
    _p, r, permit = rooftop
    seen = 0
    for b in r.bays:
        if b.advice_kind not in ("limit_height", "limit_or_mat", "level_below"):
            continue
        v = next(v for v in permit.bays if (v.zone_id, v.load_name, v.bay_id)
                 == (b.zone_id, b.load_name, b.bay_id))
        caps = [c.max_drop_height for c in v.conditions if c.kind == "cap_hook"]
        if b.height_limit is None:
            assert not caps, (b.bay_id, b.load_name)
            continue
        assert caps == [b.height_limit], (b.bay_id, b.load_name, caps, b.height_limit)
        assert b.height_limit_check and b.height_limit_x is not None
        seen += b.advice_kind == "level_below"
    assert seen >= 2  # the spreader beam's two perforated bays

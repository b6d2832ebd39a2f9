"""A bay of the level below a perforated deck offers no drop-height limit: the object
comes through the deck above at the speed the perforation leaves it, so no hook limit
controls that fall (common practice, no source: a condition is only stated where the
lifting crew can keep it). Seen at stop 30 on the two-level demo (invented): level L3's
bays under the hook block read "a drop of no more than 0.095 m ..." beside "strikes as if
dropped 9.200 m".
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest

from droprig.commands.analyse import table_text
from droprig.io.project_file import load_project
from droprig.permit import derive_conditions
from droprig.solver import analyse
from droprig.solver.summary import without_hook_limit

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def two_level():
    p = load_project(ROOT / "demo_projects" / "two_level_rigging.droprig")
    return p, analyse(p)


def test_cascade_bays_carry_no_hook_limit(two_level):
    p, r = two_level
    bays = [b for fall in r.cascade for b in fall.bays]
    assert bays, "the two-level demo's loads come through the roof onto level L3"
    for b in bays:
        assert b.height_limit is None and b.height_limit_x is None, (b.bay_id, b.load_name)
        assert b.advice_kind not in ("limit_height", "limit_or_mat")
    text = table_text(p, r, derive_conditions(p, r))
    below = text[text.index("Through the deck of level"):]
    assert "no more than" not in below.split("Warning:")[0]


def test_kinds_without_a_hook_limit(two_level):
    _p, r = two_level
    b = next(b for fall in r.cascade for b in fall.bays)
    for kind, want in (("limit_height", "keep_clear"), ("limit_or_mat", "mat"),
                       ("level_below", "level_below")):
        got = without_hook_limit(replace(b, advice_kind=kind, height_limit=0.3,
                                         height_limit_check="flexure"))
        assert got.advice_kind == want and got.height_limit is None
        assert got.height_limit_check == ""
    assert without_hook_limit(replace(b, height_limit=None)) == replace(b, height_limit=None)

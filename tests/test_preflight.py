"""One validator (issue 16, item 4): what ``droprig analyse`` refuses,
``droprig validate`` refuses with the same message and a JSON path.

Sources: the support rule (a member end rests on a column or on a perpendicular
member through it) is the load path of droprig's method (droprig/solver/loadpath.py,
common practice, no source); a load cannot fall a negative height (its underside
is above the struck surface, common practice, no source). The demo project is an
invented scenario used as an input only; the mutants are hand-made edge cases from
the hostile-file review.
"""

from __future__ import annotations

import copy
import json
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest

from droprig.cli import main
from droprig.io.project_file import loads_project
from droprig.preflight import analysis_problems, json_path_of

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def _base() -> dict[str, Any]:
    return json.loads(DEMO.read_text(encoding="utf-8"))


def _end_off_support(d: dict[str, Any]) -> None:
    m = next(m for m in d["levels"][0]["members"] if m["role"] == "beam")
    m["end_m"] = [m["end_m"][0], m["end_m"][1] - 0.7]  # the end now sits mid-bay


def _no_members(d: dict[str, Any]) -> None:
    d["levels"][0]["members"] = []


def _hook_below_pad_top(d: dict[str, Any]) -> None:
    ld = d["lift_zones"][0]["loads"][0]
    ld["hang_length_m"] = 6.1  # underside 18.8 m: above the deck (18.6), below a 0.5 m pad


def _hook_below_deck(d: dict[str, Any]) -> None:
    ld = d["lift_zones"][0]["loads"][1]
    ld["hang_length_m"] = 7.0  # underside 17.9 m, below the deck top at 18.6 m


MUTANTS: dict[str, tuple[Callable[[dict[str, Any]], None], str]] = {
    "member end not on a support": (_end_off_support, "$.levels[0].members[9].end_m"),
    "level with no members": (_no_members, "$.levels[0].members"),
    "hook below a pad's top": (_hook_below_pad_top, "$.lift_zones[0].loads[0].hook_elevation_m"),
    "hook below the deck": (_hook_below_deck, "$.lift_zones[0].loads[1].hook_elevation_m"),
}


def _lines(text: str) -> list[str]:
    return [ln.strip() for ln in text.splitlines() if ln.strip().startswith("$")]


@pytest.mark.parametrize("name", list(MUTANTS))
def test_validate_refuses_what_analyse_refuses_with_the_same_message(
        name: str, tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """Before: 213 of 3,300 mutants passed validate and were refused by analyse, the
    analyse messages carrying no JSON path."""
    mutate, path_start = MUTANTS[name]
    doc = _base()
    mutate(doc)
    f = tmp_path / "m.droprig"
    f.write_text(json.dumps(doc), encoding="utf-8")
    outs = {}
    for cmd in ("validate", "analyse"):
        code = main([cmd, str(f)])
        out, err = capsys.readouterr()
        assert code == 2, (cmd, out + err)
        assert "Traceback" not in out + err
        outs[cmd] = _lines(out + err)
    assert outs["validate"], outs
    assert outs["validate"] == outs["analyse"]
    assert any(ln.startswith(path_start) for ln in outs["validate"]), outs


def test_the_unchanged_demo_has_no_analysis_problem() -> None:
    assert analysis_problems(loads_project(DEMO.read_text(encoding="utf-8"))) == []


def test_json_path_of_names_member_fields() -> None:
    p = loads_project(DEMO.read_text(encoding="utf-8"))
    lv = p.levels[0]
    m = lv.members[3]
    assert json_path_of(p, f"level {lv.id}.members[{m.id}].start") == \
        "$.levels[0].members[3].start_m"
    assert json_path_of(p, f"level {lv.id}.members") == "$.levels[0].members"
    assert json_path_of(p, "nothing we know") == "$"


def test_hook_check_uses_the_mat_top_only_near_the_zone() -> None:
    doc = _base()
    _hook_below_pad_top(doc)
    for pa in doc["protection_areas"]:  # move the pads far from the zone
        pa["area"] = {"x0_m": 200.0, "y0_m": 200.0, "x1_m": 201.0, "y1_m": 201.0}
    assert analysis_problems(loads_project(json.dumps(copy.deepcopy(doc)))) == []

"""Hostile project files (issue 16): every one is refused cleanly — a message with
the JSON path, exit 2, no traceback — and quickly, before any large allocation.

Sources: JSON text is RFC 8259 (a string may hold any code point escaped, lone
surrogates included, §7 and §8.2); the character rules are the Unicode Standard
§3.9 D76 (surrogate code points are not characters) and Unicode Standard Annex #9,
Table 1 (explicit bidirectional formatting characters); CVE-2021-42574 ("Trojan
Source") for why bidi overrides are refused. The limits are droprig's own
(droprig/model/bounds.py, common practice, no source). The demo project is an
invented scenario used as an input only.
"""

from __future__ import annotations

import copy
import json
from pathlib import Path
from typing import Any

import pytest

from droprig.cli import main
from droprig.io.project_file import ProjectFileError, loads_project
from droprig.model import bounds
from droprig.model.errors import QUOTE_MAX

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


@pytest.fixture(scope="module")
def demo_doc() -> dict[str, Any]:
    return json.loads(DEMO.read_text(encoding="utf-8"))


def _problems(doc: Any) -> list[str]:
    text = doc if isinstance(doc, str) else json.dumps(doc)
    with pytest.raises(ProjectFileError) as info:
        loads_project(text)
    return info.value.problems


def _cli(capsys: pytest.CaptureFixture[str], *argv: str) -> tuple[int, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    assert "unexpected error" not in out + err
    return code, out + err


@pytest.mark.parametrize(("text", "why"), [
    ("\ud800", "lone surrogate"),
    ("pump \udfff skid", "lone surrogate"),
    ("abc\u202eevil", "bidirectional-override"),
    ("a\u2067b", "bidirectional-override"),
    ("bell\x07", "control character"),
    ("nul\x00", "control character"),
    ("c1\x85", "control character"),
])
def test_bad_characters_in_a_name_are_refused_with_the_json_path(
        demo_doc: dict[str, Any], text: str, why: str) -> None:
    doc = copy.deepcopy(demo_doc)
    doc["lift_zones"][0]["loads"][0]["name"] = text
    problems = _problems(doc)
    assert any(p.startswith("$.lift_zones[0].loads[0].name:") and why in p
               for p in problems), problems
    # the message itself is printable: it encodes as UTF-8
    for p in problems:
        p.encode("utf-8")


def test_bad_character_in_a_key_is_refused(demo_doc: dict[str, Any]) -> None:
    doc = copy.deepcopy(demo_doc)
    doc["info"]["\ud800"] = "x"
    problems = _problems(doc)
    assert any(p.startswith("$.info:") and "lone surrogate" in p for p in problems), problems


def test_tab_and_newline_stay_allowed_in_a_description(demo_doc: dict[str, Any]) -> None:
    doc = copy.deepcopy(demo_doc)
    doc["info"]["description"] = "line one\n\tline two"
    assert loads_project(json.dumps(doc)).info.description == "line one\n\tline two"


def test_lone_surrogate_name_cannot_reach_report(demo_doc: dict[str, Any], tmp_path: Path,
                                                 capsys: pytest.CaptureFixture[str]) -> None:
    """Before: validate and analyse passed, report stopped with UnicodeEncodeError."""
    doc = copy.deepcopy(demo_doc)
    doc["info"]["name"] = "Roof \ud800"
    path = tmp_path / "s.droprig"
    path.write_text(json.dumps(doc), encoding="utf-8")  # json escapes it as \ud800
    for argv in (["validate", str(path)], ["analyse", str(path)],
                 ["report", str(path), "-o", str(tmp_path / "a.pdf")]):
        code, out = _cli(capsys, *argv)
        assert code == 2
        assert "$.info.name" in out
    assert not (tmp_path / "a.pdf").exists()


def test_a_long_value_is_quoted_short(demo_doc: dict[str, Any]) -> None:
    """Before: a 50 MB description was printed whole."""
    doc = copy.deepcopy(demo_doc)
    doc["info"]["description"] = "x" * 2_000_000
    problems = _problems(doc)
    assert len(problems) == 1
    assert problems[0].startswith("$.info.description:")
    assert "2,000,000 characters" in problems[0]
    assert len(problems[0]) < QUOTE_MAX + 200


def test_a_long_id_in_a_schema_problem_is_quoted_short(demo_doc: dict[str, Any]) -> None:
    doc = copy.deepcopy(demo_doc)
    doc["settings"]["unit_system"] = "Y" * 100_000
    problems = _problems(doc)
    assert all(len(p) < 400 for p in problems), [len(p) for p in problems]


@pytest.mark.parametrize("depth", [40, 500, 900, 5000, 100_000])
def test_deep_nesting_is_refused_without_recursion_error(demo_doc: dict[str, Any],
                                                         depth: int) -> None:
    """Before: lists nested 500–900 deep ended in 'unexpected error (RecursionError)'."""
    text = json.dumps(demo_doc)
    text = text[:-1] + ', "x": ' + "[" * depth + "]" * depth + "}"
    problems = _problems(text)
    assert len(problems) == 1
    assert "nested" in problems[0], problems


def test_many_members_are_refused_by_count_before_building(demo_doc: dict[str, Any]) -> None:
    """Before: 200,000 members took > 300 s to validate (quadratic duplicate check)."""
    doc = copy.deepcopy(demo_doc)
    member = doc["levels"][0]["members"][0]
    doc["levels"][0]["members"] = [dict(member, id=f"M{i}") for i in range(200_000)]
    problems = _problems(doc)
    assert problems == [
        f"$.levels[0].members: 200,000 members on one level; the limit is "
        f"{bounds.MAX_MEMBERS_PER_LEVEL:,}: split the level"] or any(
        p.startswith("$.levels[0].members: 200,000 members") for p in problems), problems


def test_thousands_of_levels_are_one_problem(demo_doc: dict[str, Any]) -> None:
    """Before: 2,000 levels took 30–35 s and gave 1,999 messages."""
    doc = copy.deepcopy(demo_doc)
    lv = doc["levels"][0]
    doc["levels"] = [dict(lv, id=f"L{i}") for i in range(2_000)]
    problems = _problems(doc)
    assert problems[0].startswith("$.levels: 2,000 levels; the limit is 50")
    assert len(problems) <= bounds.MAX_PROBLEMS_SHOWN + 1


def test_problem_lists_are_capped(demo_doc: dict[str, Any]) -> None:
    doc = copy.deepcopy(demo_doc)
    members = doc["levels"][0]["members"]
    for m in members:
        m["role"] = "strut"
    if len(members) <= bounds.MAX_PROBLEMS_SHOWN:
        members.extend(dict(members[0], id=f"X{i}") for i in range(bounds.MAX_PROBLEMS_SHOWN))
    with pytest.raises(ProjectFileError) as info:
        loads_project(json.dumps(doc))
    exc = info.value
    assert exc.total > bounds.MAX_PROBLEMS_SHOWN
    assert len(exc.problems) == bounds.MAX_PROBLEMS_SHOWN + 1
    assert "more problem(s) not listed" in exc.problems[-1]


def test_fine_grid_on_a_huge_zone_is_refused_before_allocation(
        demo_doc: dict[str, Any], tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """Before: a 200 m zone at 0.05 m grew to 6.2 GB in 40 s and kept growing."""
    doc = copy.deepcopy(demo_doc)
    doc["settings"]["grid_resolution_m"] = 0.05
    z = doc["lift_zones"][0]
    z["r_min_m"], z["r_max_m"] = 0.0, 200.0
    z["slew_start_deg"], z["slew_end_deg"] = 0.0, 360.0
    z.pop("corridor_m", None)
    # a floor large enough to hold such a zone: 60 bays of 8 m each way (grid-line limit)
    grid = doc["levels"][0]["grid"]
    grid["x_lines_m"] = [8.0 * i for i in range(60)]
    grid["y_lines_m"] = [8.0 * i for i in range(60)]
    grid["x_labels"] = [f"X{i}" for i in range(60)]
    grid["y_labels"] = [f"Y{i}" for i in range(60)]
    path = tmp_path / "big.droprig"
    path.write_text(json.dumps(doc), encoding="utf-8")
    for cmd in ("validate", "analyse"):
        code, out = _cli(capsys, cmd, str(path))
        assert code == 2
        assert "$.lift_zones[0]" in out
        assert "drop points" in out
        assert f"the limit is {bounds.MAX_DROP_POINTS_PER_ZONE:,}" in out
        assert "coarsen the grid resolution or split the zone" in out


def test_corridor_of_twenty_thousand_corners_is_refused(demo_doc: dict[str, Any]) -> None:
    """Before: a 20,000-vertex corridor kept analyse busy for more than 6 minutes."""
    import math

    doc = copy.deepcopy(demo_doc)
    z = doc["lift_zones"][0]
    cx, cy = z["crane_m"]
    n = 20_000
    z["corridor_m"] = [[cx + 10 * math.cos(2 * math.pi * i / n),
                        cy + 10 * math.sin(2 * math.pi * i / n)] for i in range(n)]
    problems = _problems(doc)
    assert problems == [f"$.lift_zones[0].corridor_m: 20,000 corridor corners; the limit is "
                        f"{bounds.MAX_CORRIDOR_CORNERS}: simplify the corridor (a few corners "
                        "follow a real lift path)"]


def test_file_larger_than_the_limit_is_refused_unread(tmp_path: Path,
                                                      capsys: pytest.CaptureFixture[str],
                                                      monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(bounds, "MAX_FILE_BYTES", 1000)
    path = tmp_path / "big.droprig"
    path.write_bytes(b" " * 5000 + b"{}")
    code, out = _cli(capsys, "validate", str(path))
    assert code == 2
    assert "5,002 bytes" in out and "up to 1,000 bytes" in out

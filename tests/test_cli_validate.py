"""``droprig validate FILE`` through :func:`droprig.cli.main`.

Source: the command contract is droprig's own (droprig/cli.py: 0 ok, 2 bad
input, never a traceback); JSON text rules are RFC 8259 as implemented by
Python's ``json`` module.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

import pytest

from droprig.cli import main
from droprig.io.project_file import dumps_project, save_project
from droprig.io.sections import get_grade, get_section
from droprig.model import (
    LiftLoad,
    LiftZone,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    generate_level,
)

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture
def two_bay_floor() -> Project:
    """An invented two-bay floor, used only as an input."""
    lv = generate_level(
        level_id="F2", name="Level 2", elevation=4.2, x_spacings=(6.0, 6.0), y_spacings=(8.0,),
        girder_direction="x", beam_spacing=3.0, girder_section=get_section("IPE 450"),
        beam_section=get_section("IPE 300"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S275"))
    zone = LiftZone("Z1", "tower crane", "F2", (20.0, 4.0), 5.0, 25.0, math.radians(120.0),
                    math.radians(240.0), 0.5, (),
                    (LiftLoad("pallet", 800.0, 1.2, 1.0, 2.0),
                     LiftLoad("chains", 60.0, 0.3, 0.3, 3.0, kind="rigging")))
    mat = ProtectionArea("P1", "plywood", "F2", Rect(6.0, 0.0, 12.0, 8.0), "crushable", 0.05,
                         None, 20e3, 0.04)
    return Project(ProjectInfo("CLI test floor"), levels=(lv,), lift_zones=(zone,),
                   protection_areas=(mat,))


def _run(capsys: pytest.CaptureFixture[str], path: Path) -> tuple[int, str]:
    code = main(["validate", str(path)])
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    return code, out + err


def _write(tmp_path: Path, doc: Any) -> Path:
    path = tmp_path / "case.droprig"
    path.write_text(doc if isinstance(doc, str) else json.dumps(doc), encoding="utf-8")
    return path


def test_valid_file_prints_ok_and_a_summary(two_bay_floor: Project, tmp_path: Path,
                                            capsys: pytest.CaptureFixture[str]) -> None:
    path = tmp_path / "floor.droprig"
    save_project(two_bay_floor, path)
    code, out = _run(capsys, path)
    assert code == 0
    lines = out.splitlines()
    assert lines[0] == "ok"
    # Counted by hand for generate_level's framing (common practice, no source): girders
    # along x on the 2 y-lines, 2 bays each = 4; beams on the 3 x-lines = 3, plus one
    # infill beam in each 6 m bay at ≤ 3 m spacing = 2; 9 members.
    assert lines[1].endswith("1 level, 9 members, 1 lift zone, 2 loads, 1 protection area")


def _doc(p: Project) -> dict[str, Any]:
    return json.loads(dumps_project(p))


def test_truncated_file(two_bay_floor: Project, tmp_path: Path,
                        capsys: pytest.CaptureFixture[str]) -> None:
    text = dumps_project(two_bay_floor)
    code, out = _run(capsys, _write(tmp_path, text[: len(text) * 2 // 3]))
    assert code == 2
    assert "not a readable JSON file" in out and "line" in out and "truncated" in out


def test_wrong_type(two_bay_floor: Project, tmp_path: Path,
                    capsys: pytest.CaptureFixture[str]) -> None:
    doc = _doc(two_bay_floor)
    doc["lift_zones"][0]["loads"][0]["mass_kg"] = "800 kg"
    code, out = _run(capsys, _write(tmp_path, doc))
    assert code == 2
    assert '$.lift_zones[0].loads[0].mass_kg: "800 kg" is text; expected a number' in out


def test_negative_span(two_bay_floor: Project, tmp_path: Path,
                       capsys: pytest.CaptureFixture[str]) -> None:
    doc = _doc(two_bay_floor)
    doc["levels"][0]["grid"]["x_lines_m"] = [0.0, -6.0, 12.0]
    code, out = _run(capsys, _write(tmp_path, doc))
    assert code == 2
    assert "$.levels[0].grid.x_lines_m[1]: grid.x_lines[1]: -6 m is not allowed" in out
    assert "0.5 m to 60 m" in out


def test_unknown_key(two_bay_floor: Project, tmp_path: Path,
                     capsys: pytest.CaptureFixture[str]) -> None:
    doc = _doc(two_bay_floor)
    doc["protection_areas"][0]["colour"] = "orange"
    code, out = _run(capsys, _write(tmp_path, doc))
    assert code == 2
    assert "$.protection_areas[0].colour: unknown key" in out


def test_newer_format_version(two_bay_floor: Project, tmp_path: Path,
                              capsys: pytest.CaptureFixture[str]) -> None:
    doc = _doc(two_bay_floor)
    doc["format_version"] = 3
    code, out = _run(capsys, _write(tmp_path, doc))
    assert code == 2
    assert "written by a newer droprig (format 3); this droprig reads up to format 2" in out


def test_several_problems_are_listed_together(two_bay_floor: Project, tmp_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    doc = _doc(two_bay_floor)
    doc["levels"][0]["members"][0]["end_condition"] = "hinged"
    doc["settings"]["unit_system"] = "imperial"
    code, out = _run(capsys, _write(tmp_path, doc))
    assert code == 2
    assert "2 problems" in out
    assert "$.levels[0].members[0].end_condition: 'hinged' is not one of" in out
    assert "$.settings.unit_system: 'imperial' is not one of ['SI', 'US']" in out


def test_missing_file(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    code, out = _run(capsys, tmp_path / "absent.droprig")
    assert code == 2 and "file not found" in out


def test_a_folder_is_not_a_file(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    code, out = _run(capsys, tmp_path)
    assert code == 2 and str(tmp_path) in out


@pytest.mark.parametrize("name", ["rooftop_plant_swap.droprig", "steel_erection_floor.droprig"])
def test_demo_projects_validate(name: str, capsys: pytest.CaptureFixture[str]) -> None:
    code, out = _run(capsys, ROOT / "demo_projects" / name)
    assert code == 0, out
    assert out.startswith("ok\n")

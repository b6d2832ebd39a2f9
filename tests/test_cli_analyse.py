"""``droprig analyse``: exit codes, table, JSON (null, never NaN) and CSV (SI units).

The expected values are the solver's own results (the numbers are checked against
published sources in tests/solver); here the command line is checked against the
result contract and the team's CLI rules (exit 0 ok, 2 bad input, no traceback).
"""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path

import pytest

from droprig.cli import main
from droprig.io.project_file import save_project
from droprig.model import (
    ColumnGrid,
    Grade,
    Level,
    LiftLoad,
    LiftZone,
    Member,
    Project,
    ProjectInfo,
    Section,
    Settings,
    generate_level,
)
from droprig.texts import CAUTION

GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6)
SEC = Section("C1", "custom", d=0.3, bf=0.15, tw=0.0071, tf=0.0107, r=0.015, A=5.381e-3,
              Ix=8.356e-5, Sx=5.57e-4, Zx=6.28e-4, Iy=6.04e-6, mass_per_length=42.2)


def _project(unit_system: str = "SI") -> Project:
    level = generate_level(level_id="L1", name="first", elevation=5.0, x_spacings=(6.0, 6.0),
                           y_spacings=(6.0,), girder_direction="x", beam_spacing=2.0,
                           girder_section=SEC, beam_section=SEC, girder_grade=GRADE,
                           beam_grade=GRADE)
    zone = LiftZone("Z1", "zone", "L1", (6.0, -4.0), 4.0, 9.0, math.radians(40),
                    math.radians(140), 0.3,
                    loads=(LiftLoad("box", 400.0, 0.8, 0.8, drop_height=0.3),))
    return Project(info=ProjectInfo(name="CLI test floor"),
                   settings=Settings(unit_system=unit_system, grid_resolution=0.75),
                   levels=(level,), lift_zones=(zone,))


@pytest.fixture
def project_file(tmp_path: Path) -> Path:
    path = tmp_path / "floor.droprig"
    save_project(_project(), path)
    return path


def _no_nan(text: str) -> object:
    def refuse(name: str) -> float:
        raise AssertionError(f"JSON constant {name} in output")

    return json.loads(text, parse_constant=refuse)


def test_table_in_project_units_with_caution(project_file, capsys):
    assert main(["analyse", str(project_file)]) == 0
    out = capsys.readouterr().out
    assert "1-2/A-B" in out and "Z1" in out
    assert CAUTION in out
    assert "nan" not in out.lower().replace("none", "")


def test_table_in_us_units(tmp_path, capsys):
    path = tmp_path / "us.droprig"
    save_project(_project("US"), path)
    assert main(["analyze", str(path)]) == 0
    out = capsys.readouterr().out
    assert " ft" in out or "none" in out
    assert CAUTION in out


def test_json_to_stdout(project_file, capsys):
    assert main(["analyse", str(project_file), "--json", "-"]) == 0
    doc = _no_nan(capsys.readouterr().out)
    assert set(doc) >= {"droprig_version", "project", "points", "bays", "caution"}
    assert doc["project"] == "CLI test floor"
    assert doc["points"] > 0
    assert doc["caution"] == CAUTION
    for b in doc["bays"]:
        assert b["lift"] == "Z1" and b["level"] == "L1"
        assert b["response"] in ("elastic", "plastic", "exceeds")
        assert b["advice"]


def test_json_and_csv_files(project_file, tmp_path, capsys):
    jpath, cpath = tmp_path / "r.json", tmp_path / "r.csv"
    assert main(["analyse", str(project_file), "--json", str(jpath), "--csv", str(cpath)]) == 0
    out = capsys.readouterr().out
    assert CAUTION in out
    doc = _no_nan(jpath.read_text(encoding="utf-8"))
    with cpath.open(encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert len(rows) == doc["points"]
    header = rows[0].keys()
    for col in ("x_m", "y_m", "peak_force_N", "effective_mass_kg", "drop_height_m",
                "required_mat_stiffness_N_per_m", "response", "governing_check"):
        assert col in header
    for r in rows:
        assert r["response"] in ("elastic", "plastic", "exceeds")
        assert "nan" not in r.values()
        float(r["x_m"])
        float(r["peak_force_N"])


def test_local_damage_and_level_below_reach_json_and_csv(tmp_path, capsys):
    # the two-level demo (invented input): perforation, scabbing and the cascade to
    # the level below appear in both outputs, SI, never NaN
    from pathlib import Path

    demo = Path(__file__).resolve().parents[1] / "demo_projects" / "two_level_rigging.droprig"
    jpath, cpath = tmp_path / "r.json", tmp_path / "r.csv"
    assert main(["analyse", str(demo), "--json", str(jpath), "--csv", str(cpath)]) == 0
    out = capsys.readouterr().out
    assert CAUTION in out
    assert main(["analyse", str(demo)]) == 0
    table = capsys.readouterr().out
    assert "Through the deck of level RF to level L3" in table and CAUTION in table
    # each cascade states its bays one line each and a shared advice once, not the same
    # long local-damage paragraph bay by bay (readability, common practice, no source)
    blocks = table.split("Through the deck of level RF to level L3")[1:]
    assert blocks
    for block in blocks:
        block = block.split("Warning:")[0]
        assert block.count("Local damage:") == block.count("  For ")
        assert block.count("Local damage:") >= 1
    doc = _no_nan(jpath.read_text(encoding="utf-8"))
    perf = [b for b in doc["bays"] if b["response"] == "perforates"]
    assert perf and all(b["level_below"] == "L3" and b["advice_kind"] == "level_below"
                        and "level L3" in b["advice"] for b in perf)
    assert doc["level_below"] and all(f["level"] == "L3" and f["bays"]
                                      for f in doc["level_below"])
    with cpath.open(encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(fh))
    through = [r for r in rows if r["through_level"] == "RF"]
    assert len(rows) - len(through) == doc["points"]
    assert len(through) == sum(f["points"] for f in doc["level_below"])
    assert all(r["level"] == "L3" for r in through)
    for col in ("penetration_m", "scabbing_height_m", "perforation_height_m",
                "residual_velocity_m_per_s", "scabbing", "strike_orientation"):
        assert col in rows[0]
    assert {r["response"] for r in rows} <= {"elastic", "plastic", "exceeds", "perforates"}
    assert all("nan" not in r.values() for r in rows)


@pytest.mark.parametrize("content", ["not json at all", "{}", '{"format_version": 99}'])
def test_bad_file_exits_2_without_traceback(tmp_path, capsys, content):
    path = tmp_path / "bad.droprig"
    path.write_text(content, encoding="utf-8")
    assert main(["analyse", str(path)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("droprig analyse:")
    assert "Traceback" not in err


def test_missing_file_exits_2(tmp_path, capsys):
    assert main(["analyse", str(tmp_path / "nothing.droprig")]) == 2
    assert "not found" in capsys.readouterr().err


def test_framing_the_method_cannot_assess_exits_2(tmp_path, capsys):
    # a beam whose end rests on nothing: refused by name
    grid = ColumnGrid((0.0, 5.0), (0.0, 6.0), ("1", "2"), ("A", "B"))
    members = (Member("B1", "beam", (0.0, 0.0), (0.0, 6.0), SEC, GRADE),
               Member("B2", "beam", (2.5, 0.0), (2.5, 6.0), SEC, GRADE),
               Member("B3", "beam", (5.0, 0.0), (5.0, 6.0), SEC, GRADE))
    proj = Project(levels=(Level("L1", "x", 0.0, grid, members),),
                   lift_zones=(LiftZone("Z1", "z", "L1", (2.5, 3.0), 0.0, 3.0,
                                        loads=(LiftLoad("box", 100.0),)),))
    path = tmp_path / "free.droprig"
    save_project(proj, path)
    assert main(["analyse", str(path)]) == 2
    assert "B2" in capsys.readouterr().err


def test_both_outputs_on_stdout_refused(project_file, capsys):
    assert main(["analyse", str(project_file), "--json", "-", "--csv", "-"]) == 2
    assert "stdout" in capsys.readouterr().err


def test_unwritable_output_exits_2(project_file, tmp_path, capsys):
    target = tmp_path / "no" / "such" / "dir" / "r.json"
    assert main(["analyse", str(project_file), "--json", str(target)]) == 2
    assert not target.exists()


def test_json_and_table_name_the_plan_clashes() -> None:
    """The rooftop demo's plan picks up and sets down in bay 2-3/A-B, which the units
    must not be carried over: the JSON document and the readable table name each point,
    bay and load beside the verdict (droprig.permit.plan_clashes; common practice, no
    source: a permit whose conditions the plan cannot keep is not signed)."""
    from pathlib import Path

    from droprig.commands.analyse import results_document, table_text
    from droprig.io.project_file import load_project
    from droprig.solver import analyse

    project = load_project(Path(__file__).resolve().parents[1] / "demo_projects"
                           / "rooftop_plant_swap.droprig")
    results = analyse(project)
    doc = results_document(project, results)["permit"]
    assert doc["verdict"] == "not_acceptable"
    got = {(c["point"], c["kind"], c["bay"], c["load"]) for c in doc["plan_clashes"]}
    assert got == {("P1", "pick_up", "2-3/A-B", "AHU-3 (new)"),
                   ("P1", "pick_up", "2-3/A-B", "AHU-3 (old, drained)"),
                   ("S2", "set_down", "2-3/A-B", "AHU-3 (new)"),
                   ("S2", "set_down", "2-3/A-B", "AHU-3 (old, drained)")}
    text = table_text(project, results)
    assert "Permit verdict: NOT ACCEPTABLE\nThe lift plan and the conditions disagree:" in text
    # one sentence per bay (permit.clash_sentences)
    assert "pick-up point P1 (old AHU-3 on the plinth) and set-down point S2 (new unit " \
        "onto the plinth) of lift zone MC1 lie in bay 2-3/A-B of level RF, which AHU-3 " \
        "(new) and AHU-3 (old, drained) must not be carried over" in text

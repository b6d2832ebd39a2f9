"""Permit data in the project file (format 2): round trip, schema, migration of
a format-1 file.

References:
- JSON Schema Draft 2020-12 (``resources/droprig.schema.json``, validated with
  the jsonschema package): the published layout the writer must satisfy.
- ISO 8601-1:2019 §5.2.2 / §5.4.2: the date forms of the validity window.
- docs/file_format.md, "Versions and migration policy" (droprig's own
  specification): a format-1 file reads with every permit field not recorded,
  nothing guessed.
- ``data/format1_rooftop.droprig``: a file exactly as format 1 wrote it (the
  rooftop demo before format 2), kept to test the conversion; its values are
  inputs, never expected results.
"""

from __future__ import annotations

import dataclasses
import datetime
import json
import math
from pathlib import Path
from typing import Any

import jsonschema
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from droprig.io import project_file as pf
from droprig.io.project_file import (
    FORMAT_VERSION,
    ProjectFileError,
    dumps_project,
    load_project,
    loads_project,
    save_project,
)
from droprig.io.sections import get_grade, get_section
from droprig.model import (
    LiftLoad,
    LiftPoint,
    LiftZone,
    Project,
    ProjectInfo,
    generate_level,
)

DATA = Path(__file__).resolve().parent / "data"
FORMAT1 = DATA / "format1_rooftop.droprig"


@pytest.fixture()
def permit_roof() -> Project:
    """A small invented roof with every permit field recorded (input only)."""
    lv = generate_level(
        level_id="R", name="Roof", elevation=12.0, x_spacings=(7.5, 7.5), y_spacings=(9.0,),
        girder_direction="y", beam_spacing=3.0, girder_section=get_section("HEB 400"),
        beam_section=get_section("IPE 300"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(
        "Z1", "crane west", "R", (-5.0, 4.5), 6.0, 20.0, math.radians(-40.0),
        math.radians(40.0), 0.5, (),
        (LiftLoad("unit", 2000.0, 2.0, 1.5, 1.0, mass_source="weighed"),
         LiftLoad("frame", 300.0, 1.0, 1.0, 1.0, kind="rigging")),
        crane_description="60 t mobile crane, fleet no. 4",
        crane_configuration="boom 30.5 m; 12 t counterweight; outriggers full span",
        lift_points=(LiftPoint("pick_up", (-9.0, -2.0), "trailer"),
                     LiftPoint("set_down", (11.25, 4.5)),
                     LiftPoint("set_down", (3.75, 4.5), "Ünit plinth Δ")))
    info = ProjectInfo("Test roof", lift_reference="LP-9", permit_number="PTW 77/2",
                       lift_plan_revision="D", valid_from="2026-12-06 06:00",
                       valid_to="2026-12-07")
    return Project(info, levels=(lv,), lift_zones=(zone,))


def _problems(doc: Any) -> list[str]:
    with pytest.raises(ProjectFileError) as info:
        loads_project(json.dumps(doc))
    return info.value.problems


# ----------------------------------------------------------------- writing and reading


def test_permit_data_round_trips_exactly(permit_roof: Project, tmp_path: Path) -> None:
    path = tmp_path / "roof.droprig"
    save_project(permit_roof, path)
    again = load_project(path)
    assert again == permit_roof
    assert dumps_project(again) == path.read_text(encoding="utf-8")


def test_written_keys_and_schema(permit_roof: Project) -> None:
    doc = json.loads(dumps_project(permit_roof))
    assert doc["format_version"] == FORMAT_VERSION == 2
    jsonschema.Draft202012Validator(pf.schema()).validate(doc)
    assert {k: doc["info"][k] for k in ("permit_number", "lift_plan_revision", "valid_from",
                                        "valid_to")} == {
        "permit_number": "PTW 77/2", "lift_plan_revision": "D",
        "valid_from": "2026-12-06 06:00", "valid_to": "2026-12-07"}
    zone = doc["lift_zones"][0]
    assert zone["crane_description"] == "60 t mobile crane, fleet no. 4"
    assert zone["lift_points"] == [
        {"kind": "pick_up", "at_m": [-9.0, -2.0], "label": "trailer"},
        {"kind": "set_down", "at_m": [11.25, 4.5]},
        {"kind": "set_down", "at_m": [3.75, 4.5], "label": "Ünit plinth Δ"}]
    assert zone["loads"][0]["mass_source"] == "weighed"
    assert "mass_source" not in zone["loads"][1]  # not recorded: not written


def test_not_recorded_fields_are_not_written(permit_roof: Project) -> None:
    bare = dataclasses.replace(
        permit_roof, info=ProjectInfo("Test roof"),
        lift_zones=tuple(dataclasses.replace(z, crane_description="", crane_configuration="",
                                             lift_points=()) for z in permit_roof.lift_zones))
    doc = json.loads(dumps_project(bare))
    for key in ("permit_number", "lift_plan_revision", "valid_from", "valid_to"):
        assert key not in doc["info"]
    for key in ("crane_description", "crane_configuration", "lift_points"):
        assert key not in doc["lift_zones"][0]
    assert loads_project(dumps_project(bare)) == bare


def test_longest_allowed_texts_pass_the_schema(permit_roof: Project) -> None:
    # the limits the model states (permit_data.PERMIT_TEXT_MAX, CRANE_CONFIGURATION_MAX)
    z = dataclasses.replace(permit_roof.lift_zones[0], crane_description="d" * 200,
                            crane_configuration="c" * 600,
                            lift_points=(LiftPoint("pick_up", (0.0, 0.0), "l" * 64),))
    p = dataclasses.replace(permit_roof, lift_zones=(z,), info=dataclasses.replace(
        permit_roof.info, permit_number="n" * 200, lift_plan_revision="r" * 200))
    text = dumps_project(p)
    jsonschema.Draft202012Validator(pf.schema()).validate(json.loads(text))
    assert loads_project(text) == p


# ----------------------------------------------------------------- bad values in a file


@pytest.mark.parametrize("edit, where, says", [
    (lambda d: d["info"].__setitem__("permit_number", "PTW\u0007 9"), "$.info.permit_number",
     "control character U+0007"),
    (lambda d: d["info"].__setitem__("valid_from", "06/12/2026"), "$.info.valid_from",
     "does not match"),
    (lambda d: d["info"].__setitem__("valid_to", "2026-12-05"), "$.info.valid_to",
     "after valid_from = 2026-12-06 06:00"),
    (lambda d: d["info"].__setitem__("valid_from", "2026-02-30"), "$.info.valid_from",
     "a day and time the calendar holds"),
    (lambda d: d["info"].__setitem__("permit_number", "\u202ePTW"), "$.info.permit_number",
     "U+202E"),
    (lambda d: d["lift_zones"][0]["loads"][0].__setitem__("mass_source", "guessed"),
     "$.lift_zones[0].loads[0].mass_source", "is not one of"),
    (lambda d: d["lift_zones"][0]["lift_points"][0].__setitem__("kind", "drop"),
     "$.lift_zones[0].lift_points[0].kind", "is not one of"),
    (lambda d: d["lift_zones"][0]["lift_points"][1].__setitem__("at_m", [1.0, 2e4]),
     "$.lift_zones[0].lift_points[1].at_m[1]", "≤ 10000 m"),
    (lambda d: d["lift_zones"][0]["lift_points"][1].__setitem__("colour", "red"),
     "$.lift_zones[0].lift_points[1].colour", "unknown key"),
    (lambda d: d["lift_zones"][0].__setitem__("crane_configuration", "x" * 601),
     "$.lift_zones[0].crane_configuration", "at most 600"),
    (lambda d: d["lift_zones"][0].__setitem__("crane_description", "crane "),
     "$.lift_zones[0].crane_description", "leading or trailing spaces"),
])
def test_bad_permit_values_are_reported_with_their_path(permit_roof: Project, edit: Any,
                                                        where: str, says: str) -> None:
    doc = json.loads(dumps_project(permit_roof))
    edit(doc)
    problems = _problems(doc)
    assert any(p.startswith(where + ":") and says in p for p in problems), problems


# ----------------------------------------------------------------- migration


def test_format1_file_reads_with_every_permit_field_not_recorded() -> None:
    raw = json.loads(FORMAT1.read_text(encoding="utf-8"))
    assert raw["format_version"] == 1
    project = load_project(FORMAT1)
    info = project.info
    assert (info.permit_number, info.lift_plan_revision, info.valid_from,
            info.valid_to) == ("", "", "", "")
    # the fields format 1 did have are kept as written
    assert info.lift_reference == raw["info"]["lift_reference"]
    assert info.revision == raw["info"]["revision"]
    for z in project.lift_zones:
        assert (z.crane_description, z.crane_configuration, z.lift_points) == ("", "", ())
        assert all(ld.mass_source is None for ld in z.loads)


def test_format1_file_is_saved_as_format2_with_the_same_content(tmp_path: Path) -> None:
    project = load_project(FORMAT1)
    out = tmp_path / "converted.droprig"
    save_project(project, out)
    doc = json.loads(out.read_text(encoding="utf-8"))
    assert doc["format_version"] == 2
    old = json.loads(FORMAT1.read_text(encoding="utf-8"))
    del doc["format_version"], old["format_version"]
    assert doc == old  # nothing filled in, nothing lost
    assert load_project(out) == project


def test_migration_1_to_2_adds_no_value() -> None:
    raw = json.loads(FORMAT1.read_text(encoding="utf-8"))
    before = json.dumps(raw, sort_keys=True)
    out = pf._migrate(raw, 1)
    assert json.dumps(raw, sort_keys=True) == before  # input untouched
    raw["format_version"] = 2
    assert out == raw
    assert 1 in pf.MIGRATIONS


def test_a_newer_format_is_refused_by_version() -> None:
    raw = json.loads(FORMAT1.read_text(encoding="utf-8"))
    raw["format_version"] = 3
    problems = _problems(raw)
    assert problems == ["$.format_version: written by a newer droprig (format 3); this "
                        "droprig reads up to format 2. Open it with a newer droprig."]


# ----------------------------------------------------------------- random permit data

_LINE = st.text(st.characters(blacklist_categories=("Cc", "Cf", "Cs", "Co")),
                max_size=40).map(str.strip)
_COORD = st.floats(-10_000.0, 10_000.0, allow_nan=False)
_DATES = st.dates(min_value=datetime.date(2000, 1, 1),
                  max_value=datetime.date(2099, 12, 31))


@st.composite
def _permit_projects(draw: st.DrawFn, base: Project) -> Project:
    start = draw(_DATES)
    end = start + datetime.timedelta(days=draw(st.integers(0, 30)))
    with_time = draw(st.booleans())
    info = dataclasses.replace(
        base.info, permit_number=draw(_LINE), lift_plan_revision=draw(_LINE),
        valid_from=f"{start.isoformat()} 06:00" if with_time else draw(
            st.sampled_from(["", start.isoformat()])),
        valid_to=draw(st.sampled_from(["", end.isoformat()])))
    z = base.lift_zones[0]
    points = tuple(LiftPoint(draw(st.sampled_from(["pick_up", "set_down"])),
                             (draw(_COORD), draw(_COORD)),
                             draw(_LINE.map(lambda t: t[:64].strip())))
                   for _ in range(draw(st.integers(0, 5))))
    loads = tuple(dataclasses.replace(ld, mass_source=draw(st.sampled_from(
        [None, "weighed", "data_plate", "drawing", "estimate"]))) for ld in z.loads)
    z = dataclasses.replace(z, loads=loads, lift_points=points,
                            crane_description=draw(_LINE), crane_configuration=draw(_LINE))
    return dataclasses.replace(base, info=info, lift_zones=(z,))


@settings(max_examples=60, deadline=None, suppress_health_check=[
    HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(data=st.data())
def test_random_permit_data_round_trips(permit_roof: Project, data: st.DataObject) -> None:
    p = data.draw(_permit_projects(permit_roof))
    text = dumps_project(p)
    jsonschema.Draft202012Validator(pf.schema()).validate(json.loads(text))
    assert loads_project(text) == p

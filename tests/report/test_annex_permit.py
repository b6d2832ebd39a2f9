"""The annex prints the permit data: permit number, lift-plan reference and
revision, crane and configuration, validity window, pick-up and set-down points
(with their own symbols on the conditions plan) and each load's mass source —
and flags on page 1 whatever the project file does not record.

References:
- ISO 32000-1:2008 (PDF 1.7) §9.10 text extraction, read with pypdf.
- docs/file_format.md "Versions and migration policy" and issue 14 (droprig's own
  specification): missing permit data is flagged on page 1, never filled in.
- ``tests/io/data/format1_rooftop.droprig``: a file as format 1 wrote it (input
  only). The values compared below are the inputs the test itself sets, never
  results from a demo.
- Grey levels: ITU-R BT.601 luma, as poppler's ``pdftoppm -gray`` renders them;
  thresholds "light ≥ 0.8, dark ≤ 0.3" (common practice, no source).
"""

from __future__ import annotations

import dataclasses
import math
import pathlib
import re
import shutil
import subprocess

import pytest
from pypdf import PdfReader

from droprig.io.project_file import load_project
from droprig.model import LiftPoint, ModelError, Project
from droprig.report import annex, permit_fields

analysis = pytest.importorskip("droprig.solver.analysis")

ROOT = pathlib.Path(__file__).resolve().parents[2]
FORMAT1 = ROOT / "tests" / "io" / "data" / "format1_rooftop.droprig"


def _norm(text: str) -> str:
    return re.sub(r"\s+", " ", text)


def _squash(text: str) -> str:
    """No whitespace at all: table cells break lines anywhere."""
    return re.sub(r"\s+", "", text)


def _texts(path: pathlib.Path) -> list[str]:
    return [_norm(p.extract_text()) for p in PdfReader(str(path)).pages]


def _page_of(texts: list[str], heading: str) -> int:
    for k, t in enumerate(texts):
        if heading in t and not t.startswith(annex.HEADINGS["contents"]):
            return k
    raise AssertionError(heading)


@pytest.fixture(scope="module")
def recorded(tmp_path_factory: pytest.TempPathFactory) -> tuple[Project, list[str]]:
    """The format-1 roof with every permit field set by this test."""
    p = load_project(FORMAT1)
    info = dataclasses.replace(p.info, permit_number="PTW/T-0042", lift_plan_revision="R7",
                               valid_from="2027-03-01 07:30", valid_to="2027-03-02")
    zone = p.lift_zones[0]
    loads = tuple(dataclasses.replace(ld, mass_source=src) for ld, src in zip(
        zone.loads, ("weighed", "data_plate", "estimate"), strict=True))
    zone = dataclasses.replace(
        zone, loads=loads, crane_description="Test crane TC-9 (80 t)",
        crane_configuration="boom 41.1 m; counterweight 19.5 t; outriggers at 7.2 m",
        lift_points=(LiftPoint("pick_up", (-12.5, -3.5), "trailer north end"),
                     LiftPoint("set_down", (3.75, 1.5), "plinth grid line 1½")))
    p = dataclasses.replace(p, info=info, lift_zones=(zone,))
    out = tmp_path_factory.mktemp("permit") / "recorded.pdf"
    annex.write_annex(p, analysis.analyse(p), out)
    return p, _texts(out)


@pytest.fixture(scope="module")
def old_file(tmp_path_factory: pytest.TempPathFactory) -> tuple[Project, list[str]]:
    p = load_project(FORMAT1)
    out = tmp_path_factory.mktemp("permit") / "format1.pdf"
    annex.write_annex(p, analysis.analyse(p), out, project_path=FORMAT1)
    return p, _texts(out)


# ----------------------------------------------------------------- recorded values


def test_sign_off_prints_the_recorded_permit_data(recorded: tuple[Project, list[str]]) -> None:
    p, texts = recorded
    k = _page_of(texts, "Sign-off")
    assert k <= 1  # page 1 or 2
    page = texts[k]
    flat = _squash(page)
    assert "PTW/T-0042" in page
    assert _squash(f"{p.info.lift_reference}, revision R7") in flat
    assert "Test crane TC-9 (80 t)" in page
    assert _squash("boom 41.1 m; counterweight 19.5 t; outriggers at 7.2 m") in flat
    assert _squash("Valid from / to 2027-03-01 07:30 to 2027-03-02") in flat
    assert permit_fields.NOT_RECORDED not in page


def test_nothing_is_flagged_when_everything_is_recorded(
        recorded: tuple[Project, list[str]]) -> None:
    _, texts = recorded
    assert "in the project file:" not in texts[0]
    # the one flag left is the structure's: since the framing under a crushing pad
    # follows the crush's duration (the unit's momentum on a floor of about its own
    # mass, tests/test_permit.py::test_rooftop_demo_keeps_the_units_off_the_roof),
    # both units are kept off every bay of this roof, so a set-down point on it
    # (bay 1-2/A-B) lies in their exclusion areas and in no other
    first = texts[0]
    assert "LIFT PLAN AND CONDITIONS DISAGREE" in first
    clash = first.split("DISAGREE", 1)[1].split("The lift as planned", 1)[0]
    assert "set-down point S1" in clash and "pick-up point" not in clash
    # one sentence per bay: "... which AHU-3 (new) (C7) and AHU-3 (old, drained) (C8)
    # must not be carried over" (droprig.permit.clash_sentences)
    named = re.findall(r"(AHU-3 \((?:new|old, drained)\)|Spreader beam 4 m) \(C\d+\)",
                       _norm(clash))
    assert named and set(named) <= {"AHU-3 (new)", "AHU-3 (old, drained)"}, named


def test_title_block_names_the_lift_plan_revision(recorded: tuple[Project, list[str]]) -> None:
    p, texts = recorded
    for t in texts:
        assert _squash(f"{p.info.lift_reference} rev R7") in _squash(t)
        assert "ANNEX REV" in t


def test_inputs_print_mass_sources_crane_and_points(
        recorded: tuple[Project, list[str]]) -> None:
    _, texts = recorded
    k = _page_of(texts, annex.HEADINGS["inputs"])
    inputs = _squash(" ".join(texts[k:k + 2]))
    for words in ("weighed", "manufacturer's data plate", "estimate"):
        assert _squash(words) in inputs
    assert _squash("Test crane TC-9 (80 t)") in inputs
    # points: tag, kind, label and coordinates in the project's units (m, 3 decimals)
    # and the bay each lies in: (3.75, 1.5) is inside bay 1-2/A-B of the file's grid
    # (x lines 0, 7.5, 15, 22.5 m; y lines 0, 9, 18 m — its inputs)
    assert _squash("P1 pick-up trailer north end -12.500 -3.500 off the framing") in inputs
    assert _squash("S1 set-down plinth grid line 1½ 3.750 1.500 1-2/A-B") in inputs


def test_plan_tags_the_points(recorded: tuple[Project, list[str]]) -> None:
    _, texts = recorded
    plan = texts[_page_of(texts, annex.HEADINGS["plan"])]
    assert re.search(r"\bP1\b", plan) and re.search(r"\bS1\b", plan)
    assert "pick-up point" in plan and "set-down point" in plan  # legend


# ----------------------------------------------------------------- a format-1 file


def test_format1_file_is_flagged_on_page_one(old_file: tuple[Project, list[str]]) -> None:
    p, texts = old_file
    first = texts[0]
    assert f"{permit_fields.NOT_RECORDED} in the project file:" in first
    for item in ("permit number", "lift-plan revision", "validity window (from / to)",
                 "zone MC1: crane, crane configuration, pick-up points, set-down points"):
        assert item in first, item
    names = ", ".join(ld.name for ld in p.lift_zones[0].loads)
    assert f"mass source of {names} (zone MC1)" in first


def test_format1_file_leaves_write_in_blanks(old_file: tuple[Project, list[str]]) -> None:
    _, texts = old_file
    k = _page_of(texts, "Sign-off")
    page = texts[k]
    # permit number, lift-plan revision, crane, configuration, valid from, valid to
    assert page.count(f"{permit_fields.NOT_RECORDED}: write in") == 6
    inputs = " ".join(texts[_page_of(texts, annex.HEADINGS["inputs"]):][:2])
    assert inputs.count(permit_fields.NOT_RECORDED) >= 3 + 2  # masses, crane, configuration
    for words in ("weighed", "data plate"):  # nothing filled in
        assert f"{words} " not in inputs.replace("(weighed, data plate, drawing)", "")


def test_half_a_window_is_flagged_as_such(tmp_path: pathlib.Path) -> None:
    p = load_project(FORMAT1)
    p = dataclasses.replace(p, info=dataclasses.replace(p.info, valid_from="2027-03-01"))
    out = tmp_path / "half.pdf"
    annex.write_annex(p, analysis.analyse(p), out)
    texts = _texts(out)
    assert "end of the validity window" in texts[0]
    assert "validity window (from / to)" not in texts[0]
    assert _squash(f"2027-03-01 to {permit_fields.NOT_RECORDED}") in _squash(
        texts[_page_of(texts, "Sign-off")])


def test_not_recorded_list_follows_the_model() -> None:
    p = load_project(FORMAT1)
    z = p.lift_zones[0]
    z2 = dataclasses.replace(z, lift_points=(LiftPoint("set_down", (1.0, 1.0)),),
                             crane_description="crane")
    got = permit_fields.not_recorded(dataclasses.replace(p, lift_zones=(z2,)), (z2,))
    assert "zone MC1: crane configuration, pick-up points" in got


def test_point_inside_an_exclusion_area_is_flagged(tmp_path: pathlib.Path) -> None:
    from droprig.model import bays

    p = load_project(FORMAT1)
    results = analysis.analyse(p)
    permit = annex.permit_conditions(p, results)
    excl = [c for c in permit.conditions if c.kind == "exclude_area" and c.bays]
    assert excl, "the engine excludes no bay on this file: the test needs one"
    bay = next(b for b in bays(p.levels[0]) if b.id == excl[0].bays[0])
    centre = ((bay.rect.x0 + bay.rect.x1) / 2, (bay.rect.y0 + bay.rect.y1) / 2)
    z = dataclasses.replace(p.lift_zones[0], lift_points=(
        LiftPoint("set_down", centre, "landing"), LiftPoint("pick_up", (-12.0, -3.0))))
    p = dataclasses.replace(p, lift_zones=(z,))
    out = tmp_path / "clash.pdf"
    annex.write_annex(p, analysis.analyse(p), out)
    first = _norm(_texts(out)[0])
    assert "LIFT PLAN AND CONDITIONS DISAGREE" in first
    assert (f"set-down point S1 (landing) of lift zone MC1 lies in bay {bay.id} of level "
            f"{p.levels[0].id}, which {excl[0].load_name} (C") in first
    assert "pick-up point P1" not in first  # off the framing: no clash
    # the headline says why the verdict is what it is: a load kept off every bay it
    # can reach first, else the plan's clash (droprig.permit.plan_clashes)
    pc = annex.permit_conditions(p, analysis.analyse(p))
    assert pc.clashes
    whole = any(lv.bays and all(b.verdict == "not_acceptable" for b in lv.bays)
                for lv in pc.loads)
    assert ("NO PRACTICAL CONDITION MAKES IT ACCEPTABLE" if whole
            else "THE LIFT PLAN CANNOT KEEP THE CONDITIONS") in first
    # a load with bays it may be carried over, set down in one it may not: the clash
    # alone sets the headline
    for ld in z.loads:
        lv = next(v for v in pc.loads if v.load_name == ld.name)
        off = [b.bay_id for b in lv.bays if b.verdict == "not_acceptable"]
        if off and len(off) < len(lv.bays):
            break
    else:
        raise AssertionError("no load of this file is kept off some bays but not all")
    bay2 = next(b for b in bays(p.levels[0]) if b.id == off[0])
    at = ((bay2.rect.x0 + bay2.rect.x1) / 2, (bay2.rect.y0 + bay2.rect.y1) / 2)
    z2 = dataclasses.replace(z, loads=(ld,), lift_points=(LiftPoint("set_down", at, "deck"),))
    p2 = dataclasses.replace(p, lift_zones=(z2,))
    out2 = tmp_path / "clash2.pdf"
    annex.write_annex(p2, analysis.analyse(p2), out2)
    first2 = _norm(_texts(out2)[0])
    assert "NOT ACCEPTABLE AS PLANNED — THE LIFT PLAN CANNOT KEEP THE CONDITIONS" in first2
    assert f"set-down point S1 (deck) of lift zone MC1 lies in bay {bay2.id}" in first2


@pytest.mark.parametrize("valid_to, now, ended", [
    ("2026-12-06", "2026-12-07T13:59", False),        # bare date: to the end of the day,
    ("2026-12-06", "2026-12-07T14:01", True),         # + 14 h for any time zone
    ("2026-12-06 18:00", "2026-12-07T07:59", False),
    ("2026-12-06 18:00", "2026-12-07T08:01", True),
    ("", "2099-01-01T00:00", False),                  # not recorded: flagged elsewhere
])
def test_window_ended_only_when_ended_in_every_time_zone(valid_to: str, now: str,
                                                         ended: bool) -> None:
    # UTC-12 is the latest civil time zone (IANA tz database, Etc/GMT+12), UTC+14 the
    # earliest: a naive site time has certainly passed once UTC is 14 h beyond it
    import datetime as dt

    from droprig.model import ProjectInfo

    p = Project(ProjectInfo("Roof", valid_to=valid_to))
    got = permit_fields.window_ended(p, dt.datetime.fromisoformat(now))
    assert (got is not None) == ended, got


def test_annex_of_an_ended_window_says_do_not_sign(tmp_path: pathlib.Path) -> None:
    p = load_project(FORMAT1)
    p = dataclasses.replace(p, info=dataclasses.replace(
        p.info, valid_from="2001-05-01 06:00", valid_to="2001-05-01 18:00"))
    out = tmp_path / "ended.pdf"
    annex.write_annex(p, analysis.analyse(p), out)
    first = _texts(out)[0]
    assert "VALIDITY ENDED: the validity window ended 2001-05-01 18:00" in first
    assert "Do not sign" in first


# ----------------------------------------------------------------- refusals


def test_text_the_font_cannot_print_is_refused_by_field(tmp_path: pathlib.Path) -> None:
    p = load_project(FORMAT1)
    z = dataclasses.replace(p.lift_zones[0], crane_configuration="吊臂 40 m")
    p = dataclasses.replace(p, lift_zones=(z,))
    with pytest.raises(ModelError, match=r"zone MC1\.crane_configuration"):
        annex.write_annex(p, analysis.analyse(p), tmp_path / "x.pdf")
    assert list(tmp_path.iterdir()) == []


def test_control_characters_never_reach_the_annex() -> None:
    p = load_project(FORMAT1)
    with pytest.raises(ModelError, match=r"zone MC1\.crane_description"):
        dataclasses.replace(p.lift_zones[0], crane_description="crane\x1b[31m")


# ----------------------------------------------------------------- plan symbols


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="poppler-utils not installed")
def test_pick_up_and_set_down_read_apart_in_greyscale(tmp_path: pathlib.Path) -> None:
    """An open triangle (light centre, dark outline) and a filled one (dark
    centre), on a bare bay and on a dark pad."""
    import numpy as np
    from PIL import Image
    from reportlab.graphics import renderPDF

    from droprig.report.figures import POINT_SIZE, plan_drawing

    p = load_project(FORMAT1)
    level = p.levels[0]
    pad = p.protection_areas[0].area
    on_pad = ((pad.x0 + pad.x1) / 2 - 1.5, pad.y0 + 1.5)
    bare = (19.0, 13.0)  # bay 3-4/B-C: no pad there in this file
    assert not any(q.area.contains(*bare) for q in p.protection_areas)
    zone = dataclasses.replace(p.lift_zones[0], lift_points=(
        LiftPoint("pick_up", bare), LiftPoint("set_down", (bare[0] + 3.0, bare[1])),
        LiftPoint("pick_up", on_pad), LiftPoint("set_down", (on_pad[0] + 3.0, on_pad[1]))),
        r_min=0.0, r_max=0.6, crane=(-30.0, -30.0), slew_start=0.0, slew_end=2 * math.pi)
    d = plan_drawing(level, [zone], p.protection_areas, {}, "SI", 500, 600)
    pdf = tmp_path / "plan.pdf"
    renderPDF.drawToFile(d, str(pdf))
    subprocess.run(["pdftoppm", "-r", "288", "-gray", "-png", str(pdf), str(tmp_path / "g")],
                   check=True, timeout=60)
    img = np.asarray(Image.open(next(tmp_path.glob("g*.png"))), dtype=float) / 255.0
    s, ox, oy = d.plan_transform
    k = 4.0  # 288 dpi / 72

    def patch(x: float, y: float, half_pt: float) -> np.ndarray:
        px, py = (ox + s * x) * k, (d.height - (oy + s * y)) * k
        h = half_pt * k
        return img[int(py - h):int(py + h), int(px - h):int(px + h)]

    for pick, drop in ((bare, (bare[0] + 3.0, bare[1])),
                       (on_pad, (on_pad[0] + 3.0, on_pad[1]))):
        centre_pick = float(np.median(patch(*pick, 1.5)))
        centre_drop = float(np.median(patch(*drop, 1.5)))
        assert centre_pick >= 0.8, centre_pick     # open: light inside
        assert centre_drop <= 0.3, centre_drop     # filled: dark inside
        box = patch(*pick, POINT_SIZE)
        assert (box <= 0.3).mean() > 0.05          # its outline is drawn dark
        ring = patch(*drop, POINT_SIZE + 1.0)
        assert (ring >= 0.8).mean() > 0.05         # a light edge, so it reads on a pad


def test_a_bay_range_is_explained_on_page_one(recorded: tuple[Project, list[str]]) -> None:
    # page 1 words conditions with grid ranges ("1-3/A-B": every bay between grid
    # lines 1 and 3 and A and B, droprig's own wording, model.bay_ranges); a signer
    # must not read one as a single bay, so page 1 says what a range is
    # (readability, common practice, no source)
    from droprig.model import bay_ranges
    from droprig.permit import derive_conditions

    p, texts = recorded
    permit = derive_conditions(p, analysis.analyse(p))
    ranges = [n for c in permit.conditions if c.bays
              for n in bay_ranges(p.level(c.level_id), c.bays) if n not in c.bays]
    assert ranges, "this roof's conditions should name a range of bays"
    assert f"A bay range such as {ranges[0]} stands for every bay" in texts[0]


@pytest.mark.parametrize("system", ["SI", "US"])
@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])
def test_pad_label_units_match_permit_condition(name: str, system: str) -> None:
    """The conditions plan's pad label prints the thickness and stroke in the unit the
    permit condition uses for the same pad (seen with pdftoppm on the steel demo:
    "1.00 ft thick ... stroke 0.667 ft" on the plan against "12.00 in thick ...
    stroke 8.00 in" in condition C1). Common practice, no source: one quantity, one
    unit on one permit."""
    from droprig import permit, units

    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    assert project.protection_areas, "the demo has pads to label"
    for pa in project.protection_areas:
        words = permit.pad_words(pa, system)  # type: ignore[arg-type]
        label = annex.pad_label(pa, system, project)
        thick = units.fmt(pa.thickness, "small_length", system)  # type: ignore[arg-type]
        assert f"{thick} thick" in words
        assert f"{thick} thick" in label, (label, words)
        if pa.kind == "crushable":
            stroke = units.fmt_sig(pa.crush_stroke, "small_length", system)  # type: ignore[arg-type]
            assert f"stroke {stroke}" in words
            assert f"stroke {stroke}" in label, (label, words)


def test_heights_on_page_one_read_in_one_unit(recorded: tuple[Project, list[str]]) -> None:
    """Page 1's table printed the planned drop height in m / ft beside the least
    allowable in mm / in (seen with pdftoppm on the steel demo: planned "3.00" ft
    beside allowable "1.25" in, and conditions in ft), so a signer had to convert to
    compare them. Both now read in the unit of the permit conditions, and the bay
    table's allowable column too. Common practice, no source: one quantity, one unit
    on one permit."""
    p, texts = recorded
    big = "ft" if p.settings.unit_system == "US" else "m"
    small = "in" if big == "ft" else "mm"
    page1 = _squash(texts[0])
    assert _squash(f"Least allowable drop height, {big}") in page1
    assert _squash(f"drop height, {small}") not in page1
    bays = texts[_page_of(texts, annex.HEADINGS["bays"])]
    assert f"h allow, {big}" in bays and f"h allow, {small}" not in bays


@pytest.mark.parametrize("system", ["SI", "US"])
@pytest.mark.parametrize("h", [0.00163, 0.0318, 0.1222, 0.5248, 1.2, 4.8, 13.05])
def test_allowable_cell_prints_the_conditions_figure(system: str, h: float) -> None:
    """An allowable height in the annex's tables carries the digits of
    :func:`droprig.permit.fmt_height` (the conditions' and the window's: rounded down,
    three significant figures), without the unit its column header names."""
    from droprig import permit

    cell = annex._h_allow(h, system)
    assert f"{cell} {'ft' if system == 'US' else 'm'}" == permit.fmt_height(h, system)  # type: ignore[arg-type]
    assert annex._h_allow(math.inf, system) == "no limit"
    assert annex._h_allow(None, system) == "none"

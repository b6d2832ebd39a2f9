"""The lift-permit annex PDF, read back with pypdf.

Checks, per project (every demo project and two generated floors):
- every section heading is printed;
- the SHA-256 printed is hashlib's SHA-256 of the file bytes (FIPS 180-4 via
  Python's hashlib), or of the canonical serialisation when there is no file;
- the governing numbers printed are the solver's, formatted the same way;
- user text with markup characters prints literally (XML 1.0 §2.4 escaping);
- "page x of y" is right on every page;
- the page count is what the content needs;
- the plan is vector (no raster image on any page).

The expected page count is derived here from the results (the selection rule
for calculation sheets is droprig's own specification, issue 5: the governing
point of the worst bay and of every non-elastic bay, per zone × load; common
practice, no source), with the annex's published rows-per-page constants.
"""

from __future__ import annotations

import hashlib
import itertools
import math
import pathlib
import re
import shutil
import subprocess
import sys
from dataclasses import dataclass

import pytest
from pypdf import PdfReader

from droprig.model import Project
from droprig.permit import derive_conditions
from droprig.report import annex
from droprig.report.text import fmt_util, fmt_value
from droprig.solver.results import RESPONSES, BaySummary, Results

analysis = pytest.importorskip("droprig.solver.analysis")
trace_mod = pytest.importorskip("droprig.solver.trace")

ROOT = pathlib.Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))
PAGE_RE = re.compile(r"page (\d+) of (\d+)")


def _norm(text: str) -> str:
    """Whitespace runs -> one space (pypdf breaks lines inside table cells)."""
    return re.sub(r"\s+", " ", text)


@dataclass
class Annex:
    name: str
    project: Project
    results: Results
    path: pathlib.Path
    pages: int
    texts: list[str]
    reader: PdfReader
    sha256: str
    fractions: list[float]


def _sheet_points(results: Results, project: Project) -> list[BaySummary]:
    """Governing bays that need a calculation sheet (issue 5 rule, see module doc)."""
    out = []
    for z in project.lift_zones:
        for ld in z.loads:
            sums = [b for b in results.bays if b.zone_id == z.id and b.load_name == ld.name]
            if not sums:
                continue
            worst = max(sums, key=lambda b: (RESPONSES.index(b.response), b.max_utilisation))
            chosen = [worst] + [b for b in sums if b.response != "elastic" and b is not worst]
            seen = set()
            for b in chosen:
                key = (b.bay_id, round(b.governing_x, 6), round(b.governing_y, 6))
                if key not in seen:
                    seen.add(key)
                    out.append(b)
    return out


CASES = [f"demo:{p.stem}" for p in DEMOS] + ["si_floor", "us_floor", "two_levels"]


@pytest.fixture(scope="module", params=CASES)
def built(request: pytest.FixtureRequest, tmp_path_factory: pytest.TempPathFactory) -> Annex:
    from droprig.io.project_file import dumps_project, load_project, save_project

    name: str = request.param
    folder = tmp_path_factory.mktemp("annex")
    if name.startswith("demo:"):
        src = ROOT / "demo_projects" / f"{name[5:]}.droprig"
        project = load_project(src)
        project_path: pathlib.Path | None = src
        sha = hashlib.sha256(src.read_bytes()).hexdigest()
    elif name in ("si_floor", "two_levels"):
        # saved to a file and read back: the fingerprint is the file's
        src = folder / f"{name}.droprig"
        save_project(request.getfixturevalue(name), src)
        project = load_project(src)
        project_path = src
        sha = hashlib.sha256(src.read_bytes()).hexdigest()
    else:
        # never saved: the fingerprint is of the canonical serialisation
        project = request.getfixturevalue(name)
        project_path = None
        sha = hashlib.sha256(dumps_project(project).encode("utf-8")).hexdigest()
    results = analysis.analyse(project)
    out = folder / f"{name.replace(':', '_')}.pdf"
    fractions: list[float] = []
    pages = annex.write_annex(project, results, out, project_path=project_path,
                              progress=lambda f, _t: fractions.append(f))
    reader = PdfReader(str(out))
    texts = [_norm(p.extract_text()) for p in reader.pages]
    return Annex(name, project, results, out, pages, texts, reader, sha, fractions)


def test_every_section_heading_is_printed(built: Annex) -> None:
    text = " ".join(built.texts)
    for key, heading in annex.HEADINGS.items():
        if key == "members" and not any(lv.members for lv in built.project.levels):
            continue
        if key == "plan":
            heading += " — level"
        assert heading in text, heading


def test_fingerprint_is_the_sha256_of_the_input(built: Annex) -> None:
    # FIPS 180-4 SHA-256 (hashlib); printed in full on the last page and in every footer
    assert built.sha256 in built.texts[-1]
    for t in built.texts:
        assert built.sha256 in t
    label = ("canonical serialisation" if built.name == "us_floor"
             else "SHA-256 of the project file")
    assert label in built.texts[-1]


def test_page_x_of_y_on_every_page(built: Annex) -> None:
    n = len(built.reader.pages)
    assert built.pages == n
    for k, t in enumerate(built.texts):
        found = PAGE_RE.findall(t)
        assert found == [(str(k + 1), str(n))], (k, found)


def test_page_count_is_what_the_content_needs(built: Annex) -> None:
    p, r = built.project, built.results
    zone_ids = {z.id for z in p.lift_zones}
    n_cases = sum(len(z.loads) for z in p.lift_zones)
    n_rows = sum(1 for b in r.bays if b.zone_id in zone_ids)
    level_ids = {z.level_id for z in p.lift_zones}
    n_members = sum(len(lv.members) for lv in p.levels if lv.id in level_ids)
    sheets = _sheet_points(r, p)
    sheet_pages = 0
    for b in sheets:
        tr = trace_mod.trace_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        sheet_pages += max(1, math.ceil(len(tr.steps) / annex.STEPS_PER_PAGE))
    expected = (math.ceil(max(n_cases, 1) / annex.LIFT_ROWS_PER_PAGE)
                + max(1, math.ceil(n_rows / annex.BAY_ROWS_PER_PAGE))
                + len(level_ids)
                + (math.ceil(n_members / annex.MEMBER_ROWS_PER_PAGE) if n_members else 0)
                + sheet_pages
                + 1  # assumptions and limits; hazard cautions
                + 1)  # input identification and sign-off
    assert built.pages == expected
    text = " ".join(built.texts)
    for k in range(len(sheets)):
        assert f"Calculation sheet {k + 1} of {len(sheets)}" in text


def test_governing_numbers_are_the_solvers(built: Annex) -> None:
    system = built.project.settings.unit_system
    r = built.results
    bay_text = " ".join(t for t in built.texts if annex.HEADINGS["bays"] in t)
    permit = derive_conditions(built.project, r)
    for b in r.bays:
        assert b.bay_id in bay_text
        assert fmt_util(b.max_utilisation) in bay_text
        # the permit's cells (droprig.permit): the same text as the window and the CLI
        cells = permit.bay(b.zone_id, b.load_name, b.bay_id).cells(system)
        for key in ("verdict", "utilisation", "allowable", "hook"):
            assert _norm(cells[key]) in bay_text, (key, cells[key])
    # each calculation sheet prints the solver's peak force, dynamic factor and U there
    sheets = _sheet_points(r, built.project)
    for b in sheets:
        head = _norm(f"Lift zone {b.zone_id} · load {b.load_name} · bay {b.bay_id} · drop "
                     f"point x = {fmt_value(b.governing_x, 'length', system)}, "
                     f"y = {fmt_value(b.governing_y, 'length', system)}")
        page = " ".join(t for t in built.texts if head in t)
        assert page, head
        case = next(c for c in r.cases if c.zone_id == b.zone_id and c.load_name == b.load_name)
        d2 = (case.x - b.governing_x) ** 2 + (case.y - b.governing_y) ** 2
        i = int(d2.argmin())
        assert d2[i] < 1e-12
        assert fmt_value(float(case.peak_force[i]), "force", system) in page
        assert fmt_value(float(case.dynamic_factor[i]), "dimensionless", system) in page
        assert fmt_util(float(case.utilisation[i])) in page
        tr = trace_mod.trace_point(built.project, b.zone_id, b.load_name, b.governing_x,
                                   b.governing_y)
        for s in tr.steps:
            lhs = f"{s.symbol} = " if s.symbol else ""
            result = _norm(lhs + fmt_value(s.value, s.quantity, system))
            assert result in page, result


@pytest.mark.parametrize("built", ["si_floor"], indirect=True)
def test_user_markup_prints_literally(built: Annex) -> None:
    # the generated SI floor carries markup-like user text (conftest.MARKUP)
    markup = "<b>Bay & Co</b>"
    assert markup in built.texts[0]  # title block (project name)
    summary = " ".join(t for t in built.texts if annex.HEADINGS["summary"] in t)
    assert f"Tower {markup}" in summary  # zone name in the verdict table
    assert "B. Checker & Sons" in built.texts[-1]
    assert "Quay 7 <north>" in built.texts[-1]


def test_plan_is_vector_and_names_every_bay(built: Annex) -> None:
    from droprig.model import bays

    for page in built.reader.pages:
        # no raster anywhere: no image XObject on any page (ISO 32000-1 §8.9.5)
        xobjects = page["/Resources"].get("/XObject") or {}
        for ref in xobjects.values():
            assert ref.get_object().get("/Subtype") != "/Image"
    plan_text = " ".join(t for t in built.texts if annex.HEADINGS["plan"] + " — level" in t)
    for z in built.project.lift_zones:
        assert f"CRANE {z.id}" in plan_text
        for b in bays(built.project.level(z.level_id)):
            assert b.id in plan_text


def test_progress_runs_from_0_to_1(built: Annex) -> None:
    f = built.fractions
    assert f[0] == 0.0 and f[-1] == 1.0
    assert all(b >= a for a, b in itertools.pairwise(f))


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="poppler-utils not installed")
def test_every_page_renders(built: Annex, tmp_path: pathlib.Path) -> None:
    # an independent PDF reader (poppler) renders every page without complaint
    run = subprocess.run(["pdftoppm", "-r", "20", "-png", str(built.path),
                          str(tmp_path / "p")], capture_output=True, text=True, timeout=60)
    assert run.returncode == 0, run.stderr
    assert not run.stderr.strip()
    assert len(list(tmp_path.glob("p-*.png"))) == built.pages


# ----------------------------------------------------------------- lift, errors


def test_lift_filter_keeps_one_zone(si_floor: Project, tmp_path: pathlib.Path) -> None:
    results = analysis.analyse(si_floor)
    out = tmp_path / "one.pdf"
    annex.write_annex(si_floor, results, out, lift="M2")
    text = _norm(" ".join(p.extract_text() for p in PdfReader(str(out)).pages))
    assert "CRANE M2" in text and "CRANE T1" not in text
    assert "Lift zones in this annex M2" in text


def test_unknown_lift_is_refused_and_writes_nothing(si_floor: Project,
                                                    tmp_path: pathlib.Path) -> None:
    from droprig.model import ModelError

    results = analysis.analyse(si_floor)
    with pytest.raises(ModelError, match=r"T1, M2"):
        annex.write_annex(si_floor, results, tmp_path / "x.pdf", lift="Z9")
    assert list(tmp_path.iterdir()) == []


def test_failure_midway_leaves_no_file(si_floor: Project, tmp_path: pathlib.Path) -> None:
    results = analysis.analyse(si_floor)
    target = tmp_path / "annex.pdf"
    target.write_bytes(b"previous annex")

    def boom(f: float, _t: str) -> None:
        if f >= 0.6:
            raise RuntimeError("cancelled")

    with pytest.raises(RuntimeError):
        annex.write_annex(si_floor, results, target, progress=boom)
    # the previous file is untouched and no temporary file is left behind
    assert target.read_bytes() == b"previous annex"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["annex.pdf"]


def test_report_package_imports_neither_matplotlib_nor_qt() -> None:
    # layering rule of DEVELOPERS.md (common practice, no source)
    code = ("import sys, droprig.report.annex, droprig.report.figures, droprig.commands.report; "
            "bad = [m for m in ('matplotlib', 'PySide6') if m in sys.modules]; "
            "print(bad); sys.exit(1 if bad else 0)")
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=60, cwd=ROOT)
    assert run.returncode == 0, run.stdout + run.stderr


def test_edited_project_is_not_signed_under_the_saved_file(si_floor: Project,
                                                           tmp_path: pathlib.Path) -> None:
    # the fingerprint must name the input actually analysed (issue 5); FIPS 180-4
    # SHA-256 via hashlib
    import dataclasses

    from droprig.io.project_file import dumps_project, save_project

    src = tmp_path / "saved.droprig"
    save_project(si_floor, src)
    edited = dataclasses.replace(si_floor, info=dataclasses.replace(si_floor.info,
                                                                    revision="D"))
    out = tmp_path / "edited.pdf"
    annex.write_annex(edited, analysis.analyse(edited), out, project_path=src)
    last = _norm(PdfReader(str(out)).pages[-1].extract_text())
    assert hashlib.sha256(dumps_project(edited).encode("utf-8")).hexdigest() in last
    assert hashlib.sha256(src.read_bytes()).hexdigest() not in last
    assert "differs from the saved file saved.droprig" in last

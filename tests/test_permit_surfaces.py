"""Every surface prints the same permit: the window's results table, ``droprig
analyse`` (JSON, the per-bay CSV and the text table) and the annex (read back with
pypdf) give, for every bay and load, the same verdict, the same allowable height on
the same datum (the load's underside above the finished surface) and the same
conditions — over 200 random projects (tests/permit_projects.py; invented inputs,
never expected values).

The reference is the solver's own bay summary (droprig.solver.results.BaySummary):
each surface's figures are checked against it, not only against each other.
Annex rendering takes about two seconds a project on the shared test machine, so the
annex is read back for every tenth project (20 of the 200); the other surfaces for
all 200. The annex's bay × load table is compact (heights in m or ft, conditions by
number): there the test reads the verdict of every load, every condition sentence,
each bay's allowable height at the annex's stated rounding and U with its check.
"""

from __future__ import annotations

import csv
import io
import json
import math
import re

import pytest

from droprig.commands.analyse import bays_csv_text, results_document, table_text
from droprig.outcomes import fmt_utilisation
from droprig.permit import VERDICT_WORDS, derive_conditions, fmt_height
from droprig.solver import analyse
from tests.permit_projects import random_project

N_PROJECTS = 200  # brief: ≥ 200 random projects
ANNEX_EVERY = 10


def _norm(text: str) -> str:
    """Whitespace runs -> one space (pypdf breaks lines inside table cells)."""
    return re.sub(r"\s+", " ", text).strip()


def _gui_cells(project, results) -> dict[tuple[str, str, str], dict[str, str]]:
    from droprig.gui.results_table import CELL_OF, COL, BayResultsModel

    model = BayResultsModel()
    model.set_data(results, project)
    out = {}
    for r in range(model.rowCount()):
        b = model.row(r)
        out[(b.zone_id, b.load_name, b.bay_id)] = {
            CELL_OF[k]: model.data(model.index(r, COL[k])) for k in CELL_OF}
    return out


def _check_project(seed: int, tmp_path) -> int:
    project = random_project(seed)
    system = project.settings.unit_system
    results = analyse(project)
    permit = derive_conditions(project, results)
    verdicts = {(v.zone_id, v.load_name, v.bay_id): v for v in permit.bays}
    assert len(verdicts) == len(results.bays)
    gui = _gui_cells(project, results)
    doc = json.loads(json.dumps(results_document(project, results), allow_nan=False))
    rows = {(r["lift"], r["load"], r["bay"]): r
            for r in csv.DictReader(io.StringIO(bays_csv_text(project, results)))}
    text = _norm(table_text(project, results))
    assert doc["permit"]["verdict"] == permit.verdict
    assert _norm(f"Permit verdict: {permit.verdict_words.upper()}") in text
    for sentence in permit.sentences(system):
        assert _norm(sentence) in text
    assert [c["sentence"] for c in doc["permit"]["conditions"]] == \
        list(permit.sentences(system))
    for b, jb in zip(results.bays, doc["bays"], strict=True):
        key = (b.zone_id, b.load_name, b.bay_id)
        v = verdicts[key]
        cells = v.cells(system)
        # the solver's figure, on the datum, is what every surface carries
        assert v.allowable_drop_height == b.allowable_drop_height
        assert jb["allowable_drop_height"] == b.allowable_drop_height
        row = rows[key]
        assert (float(row["allowable_drop_height_m"]) if row["allowable_drop_height_m"]
                else None) == b.allowable_drop_height
        if b.allowable_drop_height is not None:
            assert cells["allowable"].startswith(fmt_height(b.allowable_drop_height, system))
        # verdict, allowable height, hook limit and conditions: one text everywhere
        assert gui[key]["verdict"] == jb["cells"]["verdict"] == row["verdict_text"] \
            == VERDICT_WORDS[v.verdict]
        assert jb["verdict"] == row["verdict"] == v.verdict
        for k in ("allowable", "hook", "conditions", "utilisation", "planned"):
            assert gui[key][k] == jb["cells"][k] == row[f"{k}_text"] == cells[k], k
        assert jb["conditions"] == [c.sentence(system) for c in v.conditions]
        for k in ("verdict", "utilisation", "allowable", "hook", "planned"):
            assert _norm(cells[k]) in text, (k, cells[k])
        # a bay on a pad says so, by name, in the conditions of every surface
        if any(c.kind == "lay_protection" and c.protection_id for c in v.conditions):
            pad = next(c.protection_id for c in v.conditions if c.kind == "lay_protection"
                       and c.protection_id)
            assert f"pad {pad}" in gui[key]["conditions"] and f"pad {pad}" in \
                row["conditions_text"]
    if seed % ANNEX_EVERY == 0:
        _check_annex(project, results, permit, tmp_path / f"annex{seed}.pdf")
    return len(results.bays)


def _check_annex(project, results, permit, path) -> None:
    from pypdf import PdfReader

    from droprig.report.annex import write_annex

    write_annex(project, results, path)
    text = _norm(" ".join(p.extract_text() or "" for p in PdfReader(str(path)).pages))
    system = project.settings.unit_system
    # the verdict of every load and every condition sentence, as the engine words
    # them with the bays as grid ranges of their level (the annex's wording)
    for lv in permit.loads:
        assert VERDICT_WORDS[lv.verdict] in text
    for c in permit.conditions:
        sentence = c.sentence(system, project.level(c.level_id))
        assert _norm(sentence) in text, sentence
    # the annex's bay table gives the allowable height in m (ft), the unit of the
    # permit's conditions, to three
    # significant figures, rounded down, and U with its own check
    for b in results.bays:
        assert _height(b.allowable_drop_height, system) in text, b.allowable_drop_height
        assert f"{fmt_utilisation(b.max_utilisation)} " \
            f"{b.utilisation_check.replace('_', ' ')}" in text


def _height(h: float | None, system: str) -> str:
    """A height in m (ft), three significant figures rounded down (the annex's
    stated rounding; common practice, no source; 1 ft = 0.3048 m exactly, NIST SP 811
    B.8)."""
    if h is None:
        return "none"
    if math.isinf(h):
        return "no limit"
    mag = h / (0.3048 if system == "US" else 1.0)
    d = max(0, 2 - math.floor(math.log10(mag))) if mag > 0 else 0
    return f"{math.floor(mag * 10**d + 1e-9) / 10**d:.{d}f}"


@pytest.mark.parametrize("chunk", range(0, N_PROJECTS, 20))
def test_every_surface_prints_the_same_permit(chunk, qapp, tmp_path):
    n_bays = sum(_check_project(seed, tmp_path) for seed in range(chunk, chunk + 20))
    assert n_bays > 0

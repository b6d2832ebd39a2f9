"""Verification plots (Qt-free): three figures with the time history and the energy
method's peak, and the caution.

Sources: the plotted numbers are droprig.solver.verify_point's (tested in
tests/test_cli_verify.py against the floor chain and, through the time history, against
Blevins 1979 Table 8-1 and Gere 7th ed. §9.10); 1 kN = 1000 N (SI, exact). The demo
project is an invented scenario used as input only.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.report.verify_plots import CAUTION_SHORT, PLOTS, point_verification_figures

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "rooftop_plant_swap.droprig"


def test_three_figures_with_energy_peak_and_caution() -> None:
    project = load_project(DEMO)
    pv, figs = point_verification_figures(project, "MC1", "AHU-3 (old, drained)", 7.5, 13.5)
    assert len(figs) == len(PLOTS) == 3
    v = pv.verification
    force_ax = figs[0].axes[0]
    lines = force_ax.get_lines()
    # the time-history curve peaks at the time history's peak (the curve is sampled 8
    # times a period; the peak is refined between the samples, within 0.85 % on a
    # pure cosine: tests/solver/test_exact_history.py); the dashed line is the energy
    # method's peak (display unit kN in the SI system)
    top = max(lines[0].get_ydata())
    assert top <= v.time_history["force"] / 1e3 * (1 + 1e-9)
    assert top == pytest.approx(v.time_history["force"] / 1e3, rel=0.0085)
    assert lines[1].get_ydata()[0] == pytest.approx(v.energy["force"] / 1e3, rel=1e-9)
    for fig in figs:
        assert any(CAUTION_SHORT in t.get_text() for t in fig.texts)


def test_unverifiable_point_names_the_field() -> None:
    from droprig.model import ModelError

    project = load_project(DEMO)
    with pytest.raises(ModelError, match=r"verify\.lift"):
        point_verification_figures(project, "NOPE", "x", 0.0, 0.0)


def test_annex_rows_match_the_solver_table() -> None:
    from droprig.report.verification import VERIFICATION_HEADER, verification_rows
    from droprig.solver import analyse, verification_table

    project = load_project(DEMO)
    res = analyse(project)
    rows = verification_rows(project, res)
    table = verification_table(project, res)
    assert len(rows) == len(table) > 0
    for row, pv in zip(rows, table, strict=True):
        assert len(row) == len(VERIFICATION_HEADER)
        assert row[1] == pv.bay_id and row[3] == pv.member_id
        assert float(row[11]) == pytest.approx(pv.verification.ratio("moment"), abs=0.005)

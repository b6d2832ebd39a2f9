"""Every table header of the annex prints white on its dark band (appendix B2's printed
dark grey on it, seen with pdftoppm in the rooftop demo's annex: its cells were
Paragraphs in the body style, whose colour wins over the table's TEXTCOLOR).
Legibility of a printed permit annex: common practice, no source."""

from __future__ import annotations

from pathlib import Path

import pytest
from reportlab.lib import colors
from reportlab.platypus import Paragraph

from droprig.io.project_file import load_project
from droprig.report import annex
from droprig.solver import analyse

ROOT = Path(__file__).resolve().parents[2]


def test_every_header_cell_is_white(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    heads: list[object] = []
    table = annex._table

    def recording(rows, widths, *, header_rows=1, **kw):  # type: ignore[no-untyped-def]
        heads.extend(c for r in rows[:header_rows] for c in r)
        return table(rows, widths, header_rows=header_rows, **kw)

    monkeypatch.setattr(annex, "_table", recording)
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    annex.write_annex(p, analyse(p), tmp_path / "annex.pdf")
    assert len(heads) > 100
    # plain strings are set in the white head style by _table; a Paragraph keeps its own
    dark = [c.text for c in heads
            if isinstance(c, Paragraph) and c.style.textColor != colors.white]
    assert not dark, dark

"""Appendix B2's ratio cells fit their columns on one line (seen with pdftotext in the
rooftop demo's annex: r = 0.00081 printed as "0.0008" over "1"). A cell that breaks
reads as two numbers. Page geometry and column widths are droprig's own layout
(common practice, no source); the text width is reportlab's own metric."""

from __future__ import annotations

import pytest
from reportlab.lib.pagesizes import A4, LETTER
from reportlab.pdfbase.pdfmetrics import stringWidth

from droprig.report import fonts
from droprig.report.annex import MARGIN_X, VERIFICATION_WIDTHS, _Styles, verification_table
from droprig.report.verification import _ratio_cell

SMALL_PT = 7.5  # the annex's small paragraph style
PADDING = 6.0  # 3 pt either side (annex._table)

# mass ratios and compliance ratios met on the demos and random floors: from a light
# shackle on a heavy girder to a heavy unit on a light joist
RATIOS = (0.000631, 0.00081, 0.0048, 0.0099, 0.0909, 0.297, 1.61, 16.8, 99.9, 999.0,
          1234.0, 0.0000123)


@pytest.mark.parametrize("page", [A4, LETTER], ids=["A4", "Letter"])
def test_r_and_kappa_cells_fit_on_one_line(page: tuple[float, float]) -> None:
    fonts.register()
    frame = page[0] - 2 * MARGIN_X
    for col in (4, 5):  # r = M/mₑ and κ
        room = VERIFICATION_WIDTHS[col] * frame - PADDING
        for r in RATIOS:
            text = _ratio_cell(r)
            assert stringWidth(text, fonts.REGULAR, SMALL_PT) <= room, (col, text, room)


def test_columns_fill_the_frame() -> None:
    assert len(VERIFICATION_WIDTHS) == 12
    assert sum(VERIFICATION_WIDTHS) == pytest.approx(1.0, abs=0.005)


def test_header_is_white_on_the_dark_band() -> None:
    # seen with pdftoppm on the rooftop demo's appendix B2: the header printed dark
    # grey on the tables' dark band (its cells were Paragraphs in the body style,
    # whose colour wins over the table's white TEXTCOLOR)
    from reportlab.lib import colors
    from reportlab.platypus import Paragraph

    fonts.register()
    row = ["MC1", "1-2/A-B", "Spreader beam 4 m", "B2/A-B", "0.0048", "1.61", *(["x"] * 4),
           "1.66", "0.60", "2.67", "1.66", "0.60", "0.60"]
    t = verification_table([row], A4[0] - 2 * MARGIN_X, _Styles.shared())
    head = t._cellvalues[0]  # type: ignore[attr-defined]
    assert len(head) == 12
    for cell in head:
        assert isinstance(cell, Paragraph)
        assert cell.style.textColor == colors.white
    body = t._cellvalues[1]  # type: ignore[attr-defined]
    assert [c.text for c in body][4:6] == ["0.0048", "1.61"]

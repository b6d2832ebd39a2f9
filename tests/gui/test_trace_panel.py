"""Trace panel: steps with numbers substituted in the user's units, escaping,
verdict words and the caution.

The trace below is a hand-written sample of the result contract (a dropped
load striking a beam, energy method, Gere 7th ed. Eq. 9-94 form); the checks are
on presentation and unit conversion, not on engineering values.
"""

from __future__ import annotations

import itertools
from pathlib import Path

import pytest

from droprig.gui import style
from droprig.gui.trace_panel import COLUMN_HEADS, TracePanel, substitute, trace_html
from droprig.solver.results import Trace, TraceStep
from droprig.texts import CAUTION

pytestmark = pytest.mark.gui

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture
def beam_strike_trace() -> Trace:
    steps = (
        TraceStep("Weight of the load", "W", "W = M·g",
                  {"M": (1000.0, "mass"), "g": (9.80665, "dimensionless")},
                  9806.65, "force", "Newton's second law"),
        TraceStep("Dynamic factor", "K", "K = 1 + sqrt(1 + 2·η·h/δ_st)",
                  {"η": (0.9, "dimensionless"), "h": (0.5, "length"),
                   "δ_st": (0.002, "small_length")},
                  22.2, "dimensionless", "Gere 7th ed., Eq. 9-94"),
        TraceStep("Peak force", "F", "K·W", {"K": (22.2, "dimensionless"),
                                           "W": (10_000.0, "force")},
                  222_000.0, "force", "energy method"),
    )
    return Trace("Z1", "Pump skid", 12.5, 7.0, steps, "plastic", "B2.1/A-B", "flexure")


def test_substitute_si_and_us() -> None:
    inputs = {"K": (2.5, "dimensionless"), "W": (10_000.0, "force")}
    assert substitute("K·W", inputs, "SI") == "2.500·(10.0 kN)"
    # 1 kip = 4448.222 N (NIST SP 811, App. B.8): 10 kN = 2.248 kip
    assert substitute("K·W", inputs, "US") == "2.500·(2.25 kip)"


def test_substitute_matches_whole_symbols_only() -> None:
    inputs = {"h": (0.5, "length"), "δ_st": (0.002, "small_length")}
    text = substitute("2·h/δ_st + height", inputs, "SI")
    assert text == "2·(0.500 m)/(2.0 mm) + height"


def test_panel_shows_steps_verdict_and_caution(qtbot, beam_strike_trace: Trace) -> None:
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.show_trace(beam_strike_trace, "SI")
    text = panel.browser.toPlainText()
    for title in ("Weight of the load", "Dynamic factor", "Peak force"):
        assert title in text
    assert "F = K·W" in text
    assert "F = 22.200·(10.0 kN)" in text
    assert "F = 222.0 kN" in text
    assert "Gere 7th ed., Eq. 9-94" in text
    assert style.outcome("plastic").label in text
    assert "B2.1/A-B" in text and "flexure" in text
    assert CAUTION in text
    assert panel.plain_text().endswith(CAUTION)


def test_panel_in_us_units(qtbot, beam_strike_trace: Trace) -> None:
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.show_trace(beam_strike_trace, "US")
    text = panel.browser.toPlainText()
    # 222 kN / 4.448222 kN per kip = 49.91 kip (NIST SP 811, App. B.8)
    assert "F = 49.91 kip" in text
    # 12.5 m / 0.3048 m per ft = 41.01 ft (NIST SP 811, App. B.8)
    assert "41.01 ft" in text


def test_user_text_is_escaped(qtbot) -> None:
    step = TraceStep("<b>bold</b> & co", "X", "X = <i>a</i>", {}, 1.0, "dimensionless",
                     "<script>alert(1)</script>")
    trace = Trace("<b>Z</b>", "<b>load</b>", 0.0, 0.0, (step,), "exceeds", "<b>m</b>",
                  "shear")
    page = trace_html(trace, "SI")
    assert "<b>bold</b>" not in page and "&lt;b&gt;bold&lt;/b&gt;" in page
    assert "<script>" not in page and "<i>a</i>" not in page
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.show_trace(trace, "SI")
    text = panel.browser.toPlainText()
    assert "<b>bold</b> & co" in text  # shown literally, not as markup
    assert "<b>load</b>" in text


def test_clear_and_unknown_values(qtbot, beam_strike_trace: Trace) -> None:
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.show_trace(beam_strike_trace, "SI")
    panel.show_trace(None)
    assert panel.plain_text() == ""
    assert "Click a drop point" in panel.browser.toPlainText()
    step = TraceStep("Allowable drop height", "h_a", "h_a = δ_st·((K_a − 1)² − 1)/(2·η)",
                     {"δ_st": (float("nan"), "small_length")}, float("nan"), "length", "—")
    panel.show_trace(Trace("Z1", "L", 0.0, 0.0, (step,), "exceeds", "", ""), "SI")
    text = panel.browser.toPlainText()
    assert "h_a = none" in text and "nan" not in text.lower()


@pytest.mark.parametrize(("formula", "inputs", "system", "expected"), [
    # runs written without operators are split into input symbols and numbers
    ("1 + sqrt(1 + 2ηh/δ_st)", {"η": (0.9, "dimensionless"), "h": (0.5, "length"),
                                "δ_st": (0.002, "length")}, "SI",
     "1 + sqrt(1 + 2·0.900·(0.500 m)/(2.0 mm))"),
    # a plain word made of letters that are not all symbols is left alone
    ("drop height above the deck", {"h": (1.0, "length")}, "SI",
     "drop height above the deck   with h = 1.000 m"),
    # an input that is not written in the formula is listed after it
    ("|F·u + E| / R", {"F": (1000.0, "force"), "t_mat": (0.05, "length")}, "SI",
     "|(1.0 kN)·u + E| / R   with t_mat = 50.0 mm"),
    # 0.05 m = 1.97 in (1 in = 25.4 mm exactly, NIST SP 811)
    ("W·f", {"W": (0.0, "force"), "f": (0.05, "length")}, "US", "(0.00 kip)·(1.97 in)"),
    # a value already alone in brackets gets no second pair (3 in = 0.0762 m, 1.5 in =
    # 0.0381 m exactly, NIST SP 811)
    ("δ_max / (L/N)", {"δ_max": (0.0762, "length"), "L/N": (0.0381, "length")}, "US",
     "(3.00 in) / (1.50 in)"),
])
def test_substitute_cases(formula: str, inputs: dict, system: str, expected: str) -> None:
    assert substitute(formula, inputs, system) == expected


def test_formula_left_side_and_symbol() -> None:
    from droprig.gui.trace_panel import split_formula

    def step(symbol: str, formula: str) -> TraceStep:
        return TraceStep("t", symbol, formula, {}, 1.0, "dimensionless", "s")

    assert split_formula(step("K", "K = 1 + x")) == ("K", "1 + x")
    assert split_formula(step("U_flexure", "U = |F·u + E| / R")) == ("U_flexure",
                                                                     "|F·u + E| / R")
    # an equation to solve keeps both sides and no extra symbol
    assert split_formula(step("δ_m", "R_p(δ_m − δ_y/2) = ηWh + Wδ_m")) == (
        "", "R_p(δ_m − δ_y/2) = ηWh + Wδ_m")
    # another quantity's definition is not relabelled
    assert split_formula(step("M_allow", "F_allow = M·g")) == ("", "F_allow = M·g")
    assert split_formula(step("F", "K·W")) == ("F", "K·W")


def test_real_trace_of_the_solver(qtbot) -> None:
    """A trace from droprig.solver.trace renders every step, its verdict and the
    caution, with no raw nan and the point's coordinates."""
    import math as _m

    import numpy as np

    from droprig.io.sections import get_grade, get_section
    from droprig.model import LiftLoad, LiftZone, Project, generate_level
    from droprig.solver.analysis import analyse
    from droprig.solver.trace import trace_point

    level = generate_level(
        level_id="L1", name="Level 1", elevation=0.0, x_spacings=(6.0, 6.0),
        y_spacings=(6.0,), girder_direction="x", beam_spacing=2.0,
        girder_section=get_section("IPE 400"), beam_section=get_section("IPE 270"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))
    zone = LiftZone("Z1", "Demo", "L1", crane=(6.0, 10.0), r_min=2.0, r_max=8.0,
                    slew_start=_m.radians(230), slew_end=_m.radians(310),
                    loads=(LiftLoad("Crate", 200.0, drop_height=0.3),))
    project = Project(levels=(level,), lift_zones=(zone,))
    case = analyse(project).cases[0]
    k = int(np.argmax(np.nan_to_num(case.utilisation, posinf=1e9)))
    trace = trace_point(project, "Z1", "Crate", float(case.x[k]), float(case.y[k]))
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.show_trace(trace, "SI")
    text = panel.browser.toPlainText()
    for step in trace.steps:
        assert step.title in text
    assert style.outcome(trace.response).label in text
    assert CAUTION in text
    assert " nan" not in text.lower() and "(nan" not in text.lower()


def _lines(browser) -> list[str]:
    """Every laid-out line of the browser's document, as text (table cells too)."""
    doc = browser.document()
    out = []
    block = doc.firstBlock()
    while block.isValid():
        layout, text = block.layout(), block.text()
        for i in range(layout.lineCount()):
            line = layout.lineAt(i)
            out.append(text[line.textStart():line.textStart() + line.textLength()])
        block = block.next()
    return out


def _broken_heads(lines: list[str]) -> list[str]:
    """Column-head words split over two lines ("Ste" / "p"), from the laid-out lines."""
    words = {w for h in COLUMN_HEADS for w in h.split()}
    bad = []
    for a, b in itertools.pairwise(lines):
        a_end = a.rstrip().split()[-1] if a.strip() else ""
        b_start = b.lstrip().split()[0] if b.strip() else ""
        for w in words:
            for k in range(1, len(w)):
                if a_end.endswith(w[:k]) and b_start.startswith(w[k:]) and \
                        not a_end.endswith(w):
                    bad.append(f"{a!r} / {b!r}")
    return bad


@pytest.mark.parametrize(("width", "narrow"), [(260, True), (330, True), (1100, False)])
def test_column_heads_never_break_inside_a_word(qtbot, width: int, narrow: bool) -> None:
    """Issue 15 at 1280 × 720: the trace panel (~255 px) broke its column heads in
    the middle of a word ("Ste / p", "For / mul / a"). A narrow panel now writes the
    sheet step by step with the heads as labels; a wide one keeps the table."""
    from droprig.io.project_file import load_project
    from droprig.solver import trace_point

    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = project.lift_zones[0]
    x0, y0 = project.levels[0].grid.x_lines[2], project.levels[0].grid.y_lines[1]
    trace = trace_point(project, zone.id, zone.loads[0].name, x0 + 1.7, y0 + 2.3)
    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.resize(width, 500)
    panel.show()
    qtbot.waitExposed(panel)
    panel.show_trace(trace, "SI")
    assert panel.is_narrow() is narrow
    lines = _lines(panel.browser)
    assert _broken_heads(lines) == []
    text = panel.browser.toPlainText()
    for head in COLUMN_HEADS[2:]:
        assert head in text  # the same words either way
    for step in trace.steps:
        assert step.title in text
    assert CAUTION in text
    # resizing across the limit changes the layout, same trace
    panel.resize(1100 if narrow else 260, 500)
    qtbot.waitUntil(lambda: panel.is_narrow() is not narrow)
    qtbot.wait(20)
    assert _broken_heads(_lines(panel.browser)) == []
    assert panel.trace is trace
    if narrow:  # the check itself: the six-column table at this width does break them
        panel.resize(width, 500)
        qtbot.waitUntil(panel.is_narrow)
        panel.browser.setHtml(trace_html(trace, "SI", narrow=False))
        assert _broken_heads(_lines(panel.browser))

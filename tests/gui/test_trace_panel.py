"""Trace panel: steps with numbers substituted in the user's units, escaping,
verdict words and the caution.

The trace below is a hand-written sample of the result contract (a dropped
load striking a beam, energy method, Gere 7th ed. Eq. 9-94 form); the checks are
on presentation and unit conversion, not on engineering values.
"""

from __future__ import annotations

import pytest

from droprig.cli import CAUTION
from droprig.gui import style
from droprig.gui.trace_panel import TracePanel, substitute, trace_html
from droprig.solver.results import Trace, TraceStep

pytestmark = pytest.mark.gui


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

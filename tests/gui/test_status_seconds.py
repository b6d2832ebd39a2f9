"""The status bar's analysis time: remembered rows come back in a few milliseconds, and
"in 0.00 s" (seen after an undo under Xvfb, rooftop demo) read as if nothing had run.
Wording and rounding are droprig's own (common practice, no source)."""

from __future__ import annotations

from droprig.gui.window_analysis import fmt_seconds


def test_below_a_second_in_milliseconds() -> None:
    assert fmt_seconds(0.0) == "under 1 ms"
    assert fmt_seconds(0.0012) == "1 ms"
    assert fmt_seconds(0.0042) == "4 ms"
    assert fmt_seconds(0.69) == "690 ms"


def test_from_a_second_in_seconds() -> None:
    assert fmt_seconds(1.0) == "1.00 s"
    assert fmt_seconds(12.345) == "12.35 s"

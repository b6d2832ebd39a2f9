"""Advice wording at the edge (droprig.advice): the words a safety officer reads, with
the numbers in the project's units and limits rounded towards the safe side.

Unit definitions: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N
(NIST SP 811, Appendix B.8).
"""

from __future__ import annotations

import pytest

from droprig.advice import advice_text, fmt_down, fmt_up
from droprig.solver.results import ADVICE_KINDS, BaySummary

FT = 0.3048  # NIST SP 811 B.8
IN = 0.0254  # NIST SP 811 B.8
KIP = 4448.2216152605  # NIST SP 811 B.8 (1000 lbf)


def _bay(kind: str, **kw: object) -> BaySummary:
    base: dict[str, object] = dict(
        level_id="L1", bay_id="1-2/A-B", zone_id="Z1", load_name="crate", n_points=9,
        max_utilisation=1.5, response="exceeds", allowable_drop_height=0.4,
        allowable_drop_height_plastic=0.6, governing_x=1.0, governing_y=1.0,
        governing_member="B1", governing_check="flexure", advice_kind=kind,
        planned_drop_height=1.0)
    base.update(kw)
    return BaySummary(**base)  # type: ignore[arg-type]


@pytest.mark.parametrize("kind, fields, system, words", [
    ("none", {"response": "elastic", "max_utilisation": 0.62}, "SI",
     ["No protection needed", "crate dropped 1.000 m", "largest utilisation 0.62"]),
    ("limit_height", {"height_limit": 0.4}, "SI", ["limit the drop height to 0.400 m"]),
    ("limit_height", {"height_limit": 0.6, "height_limit_yields": True}, "SI",
     ["limit the drop height to 0.600 m", "may then yield", "0.400 m keeps them elastic"]),
    ("mat", {"mat_stiffness_max": 3e6, "mat_travel": 0.05}, "SI",
     ["no stiffer than 3.00 kN/mm", "compress 50.0 mm"]),
    ("limit_or_mat", {"height_limit": 0.4, "mat_stiffness_max": 3e6}, "SI",
     ["limit the drop height to 0.400 m, or lay a spring mat no stiffer than 3.00 kN/mm"]),
    ("plastic_mat", {"response": "plastic", "mat_stiffness_max": 3e6}, "SI",
     ["Members yield but stay within", "For an elastic response"]),
    ("plastic_accept", {"response": "plastic"}, "SI", ["engineer's approval"]),
    ("keep_clear", {}, "SI", ["Keep clear: exclusion zone", "re-plan the lift"]),
    ("opening", {}, "SI", ["Keep clear: exclusion zone", "deck opening"]),
    # US customary: 6 ft = 1.8288 m, 10 kip/in = 1751268.35 N/m, 2 in = 0.0508 m
    ("limit_or_mat", {"height_limit": 6 * FT, "mat_stiffness_max": 10 * KIP / IN,
                      "mat_travel": 2 * IN}, "US",
     ["limit the drop height to 6.00 ft", "no stiffer than 10.0 kip/in", "compress 2.00 in"]),
])
def test_advice_words(kind, fields, system, words):
    # plain-language outcomes for a safety officer (DEVELOPERS.md; common practice, no source)
    text = advice_text(_bay(kind, **fields), system)
    for w in words:
        assert w in text
    if system == "US":
        assert " m " not in text and "mm" not in text and "kN" not in text


def test_every_kind_has_words():
    for kind in ADVICE_KINDS:
        fields = {"height_limit": 0.4, "mat_stiffness_max": 3e6, "mat_travel": 0.05}
        assert advice_text(_bay(kind, **fields), "SI")
    with pytest.raises(ValueError, match="advice_kind"):
        advice_text(_bay("shrug"), "SI")


@pytest.mark.parametrize("value, quantity, system, down, up", [
    (0.4, "length", "SI", "0.400 m", "0.400 m"),  # exact display value stays
    (0.4567, "length", "SI", "0.456 m", "0.457 m"),
    (1.0 * FT + 0.004, "length", "US", "1.01 ft", "1.02 ft"),  # 1.0131 ft
    (3.4567e6, "stiffness", "SI", "3.45 kN/mm", "3.46 kN/mm"),
    (0.05004, "small_length", "SI", "50.0 mm", "50.1 mm"),
])
def test_limits_round_towards_the_safe_side(value, quantity, system, down, up):
    # a limit printed must never exceed the computed one (common practice, no source)
    assert fmt_down(value, quantity, system) == down
    assert fmt_up(value, quantity, system) == up


@pytest.mark.parametrize("value, system, nearest, down", [
    (0.2374, "US", "0.78 ft", "0.77 ft"),  # 0.2374 m = 0.7789 ft
    (1.2346, "SI", "1.235 m", "1.234 m"),
    (0.4, "SI", "0.400 m", "0.400 m"),
])
def test_allowable_heights_print_like_the_advice(value, system, nearest, down):
    # the tables round allowable heights down as the advice does, so the two agree
    # (common practice, no source); 1 ft = 0.3048 m (NIST SP 811 B.8)
    from droprig import units
    from droprig.report.text import fmt_allow

    assert units.fmt(value, "length", system) == nearest
    assert units.fmt(value, "length", system, rounding="down") == down
    assert fmt_allow(value, "length", system) == down
    assert fmt_down(value, "length", system) == down


def test_keep_clear_names_the_thresholds_it_used() -> None:
    # The exclusion advice must not contradict a tiny allowable height shown beside
    # it: it names the smallest height limit and largest mat travel droprig offers
    # (summary.MIN_USEFUL_HEIGHT, MAX_MAT_TRAVEL; common practice, no source).
    from droprig import advice
    from droprig.solver import summary

    assert summary.MIN_USEFUL_HEIGHT == 0.05
    assert summary.MAX_MAT_TRAVEL == 0.3
    assert "50 mm" in advice.KEEP_CLEAR and "0.3 m" in advice.KEEP_CLEAR

"""The one utilisation format and the Qt-free outcome data (droprig.outcomes)."""

from __future__ import annotations

import math

import pytest

from droprig import outcomes
from droprig.solver.results import RESPONSES


@pytest.mark.parametrize("u, text", [
    (0.0, "0.00"), (0.5, "0.50"), (1.3749, "1.37"), (1.005, "1.00"),  # float 1.005 < 1.005
    (99.0, "99.00"), (99.01, "> 99"), (31994980.66, "> 99"), (math.inf, "> 99"),
    (math.nan, "none"), (None, "none"),
])
def test_utilisation_is_a_ratio_with_two_decimals(u, text):
    # U = demand/resistance written as a ratio, two decimals (common practice, no source)
    assert outcomes.fmt_utilisation(u) == text


def test_every_response_has_an_outcome_and_unknown_is_not_assessed():
    assert outcomes.ORDER == RESPONSES
    assert set(outcomes.OUTCOMES) == {*RESPONSES, outcomes.NOT_ASSESSED}
    assert outcomes.outcome(None).key == outcomes.NOT_ASSESSED
    assert outcomes.outcome("bogus").key == outcomes.NOT_ASSESSED
    assert outcomes.worst(["elastic", "exceeds", "plastic"]) == "exceeds"
    assert outcomes.worst([]) == outcomes.NOT_ASSESSED


def test_hatch_gets_denser_as_the_outcome_gets_worse():
    # never colour alone (team style rule, our own)
    assert [outcomes.OUTCOMES[k].hatch for k in outcomes.ORDER] == ["none", "diagonal",
                                                                   "cross", "grid"]
    assert all(o.hatch in outcomes.HATCHES for o in outcomes.OUTCOMES.values())


def test_gui_and_report_modules_do_not_restate_the_palette():
    # the hex colours live in droprig.outcomes only (one source)
    from pathlib import Path

    root = Path(outcomes.__file__).parent
    for rel in ("gui/style.py", "report/content.py", "report/figures.py"):
        text = (root / rel).read_text(encoding="utf-8")
        for o in outcomes.OUTCOMES.values():
            assert o.fill.upper() not in text.upper(), (rel, o.key)


def test_perforates_is_the_worst_and_scabbing_is_a_flag():
    # our own language: perforation outranks every framing outcome; scabbing is a
    # mark beside the outcome, never an outcome of its own
    assert outcomes.ORDER[-1] == "perforates"
    assert outcomes.worst(["exceeds", "perforates", "elastic"]) == "perforates"
    assert outcomes.SCABBING.key not in outcomes.OUTCOMES
    fills = [o.fill for o in outcomes.OUTCOMES.values()]
    assert len(set(fills)) == len(fills)
    tags = [o.tag for o in outcomes.OUTCOMES.values()] + [outcomes.SCABBING.tag]
    assert len(set(tags)) == len(tags)

"""Each check line of the calculation trace gives its U from its own printed numbers.

A checker re-works a trace line by hand: U = |A·F·u + E| / R with the numbers the
line prints (linear elastic check, demand over resistance; common practice, no
source). The deck's checks take the deck's force where the impact gives two
(CEB Bulletin 187 soft/hard impact, from memory): the line must print that force,
not the framing's. It printed F = 648 kN beside a deck-flexure U of 7.30 worked from
F_deck = 756 kN on the two-level demo's hook block (seen by hand, 6.26 ≠ 7.30).
With dynamic amplification on, the line is the family at A·F: the member and
candidate printed are the ones that govern there, not at F.
"""

from __future__ import annotations

import dataclasses
import math

import pytest

from droprig.io.project_file import load_project
from droprig.solver import analyse, trace_point

DEMOS = ("two_level_rigging", "rooftop_plant_swap", "steel_erection_floor")


CHECK_SYMBOLS = {f"U_{c}" for c in ("flexure", "shear", "connection", "web_yielding",
                                    "web_crippling", "deck_flexure", "deck_punching")}


def _check_lines(trace):  # type: ignore[no-untyped-def]
    return [s for s in trace.steps if s.symbol in CHECK_SYMBOLS]


# with dynamic amplification on, each line prints the member and candidate that govern
# at the amplified force A·F (linear_checks.Check.at): the steel demo's spreader bar
# printed G2/B-C (the largest existing moment, governing at F) with u ≈ 0 beside U 1.85
# worked at 8.4·F on another member
CASES = [(n, False) for n in DEMOS] + [(n, True) for n in DEMOS]


@pytest.mark.parametrize(("name", "amplified"), CASES)
def test_check_lines_reproduce_their_u(name: str, amplified: bool) -> None:
    p = load_project(f"demo_projects/{name}.droprig")
    if amplified:
        p = dataclasses.replace(p, settings=dataclasses.replace(
            p.settings, dynamic_amplification=True))
    res = analyse(p)
    seen: set[tuple[str, str, float, float]] = set()
    n_lines = n_deck = 0
    # each load's two worst bays (cheap; the suite's time is bounded)
    worst = sorted(res.bays, key=lambda b: -b.max_utilisation)
    for b in worst:
        key = (b.zone_id, b.load_name, round(b.governing_x, 6), round(b.governing_y, 6))
        if key in seen or sum(k[1] == b.load_name for k in seen) >= 2:
            continue
        seen.add(key)
        tr = trace_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        for s in _check_lines(tr):
            ins = {k: v[0] for k, v in s.inputs.items()}
            F = ins.get("F_deck", ins.get("F"))
            assert F is not None, s.title
            A = ins.get("A", 1.0)
            R, u, E = ins["R"], ins["u"], ins["E"]
            n_lines += 1
            if not math.isfinite(R) or R <= 0 or not math.isfinite(s.value):
                continue  # no such check here (web crippling over no bearing: R = ∞)
            expect = abs(A * F * u + E) / R
            assert s.value == pytest.approx(expect, rel=1e-9, abs=1e-12), (
                key, s.title, s.inputs, s.value)
            n_deck += "F_deck" in ins
    assert n_lines >= 7 * len(seen)
    if name == "two_level_rigging":
        assert n_deck > 0, "the hook block's deck lines take the deck's force"

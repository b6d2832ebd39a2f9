"""The verification's force row compares the force the point's checks take at the
contact, not a force no check takes.

Seen at stop 30 in the verify dialog (steel demo, the 12 ft spreader bar at
(78, 38) ft on crushable pad PAD1, which it bottoms out): the row read the chain's
two-mass contact spike through the spent layer, 448.85 kip (2.0 MN), as what the
"verdict uses", while the deck's flexure and punching there take the deck force
F_deck = 101.6 kN (a hard load: the one-mass force of the residual fall on deck
and framing in series, ``droprig.solver.chain.two_forces``), the webs the framing
force F = 66.3 kN, and no check takes the spike (the local-damage checks judge a
hard strike by its speed, DOE-STD-3014 App. C). The row now shows F_deck and the
factor the deck's checks take; the time history's contact force (the member's own
modal history, droprig.solver.exacthistory, an independent method) beside it.
The demo project is an invented scenario used as input only."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.solver.chain import Demands, DynamicAmplification, Impact
from droprig.solver.evaluate import governing_point, point_case
from droprig.solver.verification import verify_point

STEEL = Path(__file__).resolve().parents[2] / "demo_projects" / "steel_erection_floor.droprig"
FT = 0.3048
X, Y = 78 * FT, 38 * FT
LOAD = "Spreader bar 12 ft"


def _chain(p):  # type: ignore[no-untyped-def]
    case = point_case(p, "CC1", LOAD, X, Y, opening=True, fields=("lift", "load", "point"))
    return governing_point(case.fm, p, case.load, case.geo, case.zone.hoist_speed).chain


@pytest.fixture(scope="module")
def project():  # type: ignore[no-untyped-def]
    return load_project(STEEL)


def test_force_row_is_the_deck_force_not_the_contact_spike(project) -> None:  # type: ignore[no-untyped-def]
    c = _chain(project)
    imp = c[Impact]
    assert bool(imp.bottomed[0]) and imp.F_deck is not None
    assert "deck_punching" in c[Demands].checks
    F_deck, spike = float(imp.F_deck[0]), float(imp.contact[0])
    # the test can tell the two apart: the spike is an order of magnitude above
    assert spike > 10.0 * F_deck
    v = verify_point(project, "CC1", LOAD, X, Y).verification
    assert v.energy["force"] == pytest.approx(F_deck, rel=1e-12)
    # amplification off: the verdict's force is the deck force itself
    assert v.verdict["force"] == pytest.approx(F_deck, rel=1e-12)
    assert v.amplification["force"] == 1.0


def test_force_row_takes_the_deck_checks_factor_and_covers_the_history(project) -> None:  # type: ignore[no-untyped-def]
    p = replace(project, settings=replace(project.settings, dynamic_amplification=True))
    c = _chain(p)
    F_deck = float(c[Impact].F_deck[0])  # type: ignore[index]
    A = float(c[DynamicAmplification].factor["deck_punching"][0])
    v = verify_point(p, "CC1", LOAD, X, Y).verification
    assert v.energy["force"] == pytest.approx(F_deck, rel=1e-12)
    assert v.verdict["force"] == pytest.approx(A * F_deck, rel=1e-12)
    # the verdict's deck force covers the member's own time history at the point
    # (issue 12: the verdict never reads below the time history)
    assert v.verdict["force"] >= v.time_history["force"]

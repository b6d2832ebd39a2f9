"""``verify_point`` (``droprig verify``, the GUI's verification, the annex's table) and
the chain describe the same struck member: the one source
:func:`droprig.solver.pointhistory.struck_member` gives both the member's EI and the
contact's crushing force and stroke.

Sources:
* Composite member's stiffness: the uncracked transformed section with the
  short-term modular ratio n = E_a/E_cm (EN 1994-1-1 §5.4.2.2; AISC 360-16 §I3 and
  Commentary I3.2 use the same transformed section), effective width
  b_eff = Σ min(L/8, half the spacing) (EN 1994-1-1 §5.4.1.2(5); AISC 360-16 §I3.1a),
  E_cm = 22·((f_ck + 8)/10)^0.3 GPa (EN 1992-1-1 Table 3.1), parallel axes (Gere,
  *Mechanics of Materials* 7th ed. §12.5); IPE 360: A = 72.7 cm², I_y = 16 270 cm⁴,
  h = 360 mm (EN 10365 — from memory, checked against droprig's catalogue below).
* Crushing stroke: a steel plate deck's indentation bound holds until the dent
  reaches the plate's thickness (then it is perforated) — common practice, no
  source; a concrete deck's crushing bound holds over the concrete cover above the
  bars (EN 1992-1-1 §6.7 treats the concrete under a partially loaded area; the
  cover as its depth is common practice, no source).
The rooftop demo is an invented scenario: it supplies the geometry, never an
expected value.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import Deck, Project
from droprig.solver import pointhistory
from droprig.solver.chain import Impact, LoadInputs, crush_depth_available, energy_fall
from droprig.solver.evaluate import governing_landing_chain, point_case
from droprig.solver.verification import PointVerification, verify_point

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "rooftop_plant_swap.droprig"
ZONE, LOAD = "MC1", "AHU-3 (new)"
POINT = (10.0, 13.5)
"""Over member B2.1/B-C (x = 10 m, 9 m span along y from 9 to 18 m), at mid-span."""
MEMBER = "B2.1/B-C"
SPACING = 2.5
"""The member's neighbours stand 2.5 m either side (x = 7.5 and 12.5 m): the demo's
geometry, read as input."""
SAME = 1e-9
"""The same number through two routes (floating-point noise only)."""
HAND = 1e-6
"""A hand calculation repeated in full precision."""
CATALOGUE = 3e-3
"""Catalogue values against EN 10365's printed ones (rounded to 3 figures)."""


def _with(p: Project, **level_changes: object) -> Project:
    lv = p.levels[0]
    return replace(p, levels=(replace(lv, **level_changes), *p.levels[1:]))


@pytest.fixture(scope="module")
def roof() -> Project:
    return load_project(DEMO)


@pytest.fixture(scope="module")
def studded(roof: Project) -> Project:
    """The demo with member B2.1/B-C studded to the deck (composite)."""
    members = tuple(replace(m, composite=(m.id == MEMBER)) for m in roof.levels[0].members)
    return _with(roof, members=members)


@pytest.fixture(scope="module")
def plated(roof: Project) -> Project:
    """The demo's roof on a 12 mm steel plate deck (the cover kept at 25 mm, unused)."""
    return _with(roof, deck=Deck(kind="steel_plate", thickness=0.012))


def _chain_member(p: Project) -> tuple[dict[str, np.ndarray], pointhistory.PointHistory]:
    """The chain's own struck member at POINT and its own point history there."""
    case = point_case(p, ZONE, LOAD, *POINT, fields=("lift", "load", "point"))
    _, c = governing_landing_chain(case.fm, p, case.load, case.geo, case.zone.hoist_speed)
    sel = np.zeros(1, dtype=np.int64)
    h = energy_fall(c, c[LoadInputs].h)
    ph = pointhistory.point_history(c, sel, h, c[Impact].F[sel])
    s = pointhistory.struck_member(c, sel)
    s["crush_depth_available"] = np.array([crush_depth_available(c)])
    return s, ph


def _same_history(pv: PointVerification, ph: pointhistory.PointHistory) -> None:
    """The verification's time history is the chain's own point history (the same
    member, contact, cap and stroke), peak by peak."""
    v = pv.verification
    for q in ("force", "moment", "deflection"):
        assert v.time_history[q] == pytest.approx(float(ph.th[q][0]), rel=SAME), q
    # the shear row compares end shears; the largest section shear is kept beside it
    assert v.time_history["shear"] == pytest.approx(float(ph.th["end_shear"][0]), rel=SAME)
    assert v.section_shear == pytest.approx(float(ph.th["shear"][0]), rel=SAME)


def test_verification_takes_the_composite_members_ei(studded: Project) -> None:
    pv = verify_point(studded, ZONE, LOAD, *POINT)
    assert pv.member_id == MEMBER  # the point strikes the studded member
    lv = studded.levels[0]
    m = next(mm for mm in lv.members if mm.id == MEMBER)
    sec, deck = m.section, lv.deck
    # IPE 360 from the catalogue against EN 10365 (from memory)
    assert sec.A == pytest.approx(72.7e-4, rel=CATALOGUE)
    assert sec.Ix == pytest.approx(16270e-8, rel=CATALOGUE)
    assert sec.d == pytest.approx(0.360, rel=CATALOGUE)
    # hand: EN 1994-1-1 §5.4.1.2 / §5.4.2.2, EN 1992-1-1 Table 3.1, Gere §12.5
    assert studded.settings.design_basis == "en1993" and deck.rib_height == 0.0
    b_eff = 2 * min(m.span / 8, SPACING / 2)
    E_cm = 22e9 * ((deck.concrete.fc / 1e6 + 8) / 10) ** 0.3
    n = m.grade.E / E_cm
    h_c = deck.thickness
    A_c, z_c = b_eff * h_c / n, h_c / 2
    z_s = h_c + sec.d / 2
    z = (A_c * z_c + sec.A * z_s) / (A_c + sec.A)
    I_tr = b_eff * h_c**3 / (12 * n) + A_c * (z_c - z) ** 2 + sec.Ix + sec.A * (z_s - z) ** 2
    assert pv.EI == pytest.approx(m.grade.E * I_tr, rel=HAND)
    # the chain's EI for the same member (the two describe the same member) ...
    s, ph = _chain_member(studded)
    assert lv.members[int(s["member"][0])].id == MEMBER
    assert pv.EI == pytest.approx(float(s["EI"][0]), rel=SAME)
    # ... well above the bare steel's, which the verification took before: the check
    # can tell the two apart
    assert pv.EI > 3.0 * m.grade.E * sec.Ix
    # and the time history ran on it: the chain's own point history, peak by peak
    _same_history(pv, ph)


def test_verification_stroke_is_the_chains_crush_depth(roof: Project,
                                                       plated: Project) -> None:
    # a steel plate deck: the plate's thickness (not the concrete cover, which a
    # steel deck keeps unused); a concrete deck: its cover
    for p, want in ((plated, 0.012), (roof, roof.levels[0].deck.cover)):
        pv = verify_point(p, ZONE, LOAD, *POINT)
        s, ph = _chain_member(p)
        v = pv.verification
        assert v.crushing_force == pytest.approx(float(s["F_yield"][0]), rel=SAME)
        assert np.isfinite(v.crushing_force)  # a capped contact: the stroke matters
        assert v.stroke == pytest.approx(want, rel=SAME)
        assert v.stroke == pytest.approx(float(s["crush_depth_available"][0]), rel=SAME)
        assert v.stroke == pytest.approx(float(s["stroke"][0]), rel=SAME)
        _same_history(pv, ph)
    # the plate deck's cover differs from its plate: the check can tell them apart
    assert plated.levels[0].deck.cover != pytest.approx(0.012)


def test_slab_mass_option_adds_the_tributary_deck_and_dead_load(roof: Project) -> None:
    """``verify_point`` (default ``slab_mass=True``; ``droprig verify``; ``slab_mass=False``
    is ``--steel-mass``): the member's
    mass per length carries the deck's self-weight and the superimposed dead load over
    its tributary width, μ + (g_deck + q_sd)·b/g (lever rule: half the spacing to each
    neighbour, b = 2.5 m here; common practice, no source; g = 9.80665 m/s², ISO 80000-3).
    The time history's struck mass is its Rayleigh mass β·μ·L at the struck point, so at
    the same member, point and load the mass ratio r = M/mₑ falls by exactly the ratio
    of the two μ (Timoshenko, *Strength of Materials* Part I: the Rayleigh mass is
    linear in μ for a given shape)."""
    level = roof.levels[0]
    member = next(m for m in level.members if m.id == MEMBER)
    mu_steel = member.section.mass_per_length
    mu_slab = mu_steel + (level.deck.self_weight_pressure + level.superimposed_dead) \
        * SPACING / 9.80665
    bare = verify_point(roof, ZONE, LOAD, *POINT, slab_mass=False)
    slab = verify_point(roof, ZONE, LOAD, *POINT)
    assert bare.member_id == slab.member_id == MEMBER
    ratio = bare.verification.mass_ratio / slab.verification.mass_ratio
    assert ratio == pytest.approx(mu_slab / mu_steel, rel=HAND)
    assert mu_slab / mu_steel > 5.0, "a concrete roof slab outweighs the beam under it"

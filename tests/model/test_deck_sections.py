"""Sections derived from a deck: the concrete over the ribs of a composite deck and
the section with the top bars over the supports.

Sources: EN 1994-1-1 §9.7.6 (punching of a composite slab with the concrete over the
ribs, h_c = h − h_p; from memory) and §9.2.1(2) (at least 40 mm over the ribs; from
memory); EN 1992-1-1 §6.4.4 (punching, as in tests/solver/test_deck.py) and §6.1 /
§3.1.7 rectangular stress block (hogging with the top bars).
"""

from __future__ import annotations

import math

import pytest

from droprig.model import Deck
from droprig.solver import deck as deck_mod

REL = 1e-12


def test_over_ribs_is_the_topping_as_a_solid_slab():
    dk = Deck(thickness=0.13, rib_height=0.06, cover=0.025, rebar_area=2.5e-4)
    top = dk.over_ribs()
    assert isinstance(top, Deck)
    assert top.thickness == pytest.approx(0.07, rel=REL)
    assert top.rib_height == 0.0
    assert (top.cover, top.rebar_area, top.concrete) == (dk.cover, dk.rebar_area,
                                                          dk.concrete)
    assert not top.is_steel
    # the original deck is untouched (frozen)
    assert dk.thickness == 0.13 and dk.rib_height == 0.06
    # d = 0.07 − 0.025 − 0.012/2 = 0.039 m (effective_depth's 12 mm bar, test_deck)
    assert deck_mod.effective_depth(top) == pytest.approx(0.039, rel=1e-9)


def test_over_ribs_allows_the_40_mm_topping():
    # EN 1994-1-1 §9.2.1(2) (from memory): 40 mm over the ribs is allowed, below the
    # 50 mm a solid slab must have — the derived section must not be refused
    dk = Deck(thickness=0.10, rib_height=0.06, cover=0.015, rebar_area=2.0e-4)
    top = dk.over_ribs()
    assert top.thickness == pytest.approx(0.04, rel=REL)
    # EN 1992-1-1 §6.4.4 (ACI basis below checked in test_deck): the resistance of the
    # topping is less than that of the full depth
    R_full = deck_mod.punching_resistance(dk, 0.2, 0.2, "en1993")
    R_top = deck_mod.punching_resistance(top, 0.2, 0.2, "en1993")
    assert float(R_top) < 0.5 * float(R_full)


def test_no_ribs_or_steel_is_the_deck_itself():
    solid = Deck(thickness=0.15)
    assert solid.over_ribs() is solid
    plate = Deck(kind="steel_plate", thickness=0.01)
    assert plate.over_ribs() is plate
    assert plate.hogging_section() is plate


def test_hogging_section_uses_the_top_bars():
    # EN 1992-1-1 §6.1 / §3.1.7: the hogging section is the same rectangle with the top
    # bars in tension — its resistance is that of a slab reinforced with the top bars'
    # area (same d: the cover is taken as for the bottom bars)
    dk = Deck(thickness=0.15, cover=0.025, rebar_area=5.0e-4, top_rebar_area=3.0e-4)
    hog = dk.hogging_section()
    assert hog.rebar_area == pytest.approx(3.0e-4, rel=REL)
    assert hog.thickness == dk.thickness and hog.cover == dk.cover
    M_top = deck_mod.deck_flexure_resistance(hog, "en1993")
    M_as_bottom = deck_mod.deck_flexure_resistance(
        Deck(thickness=0.15, cover=0.025, rebar_area=3.0e-4), "en1993")
    assert M_top == pytest.approx(M_as_bottom, rel=REL)
    assert math.isfinite(M_top) and M_top > 0.0

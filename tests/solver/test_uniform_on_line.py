"""A footprint pressing uniformly on the deck near a support line (a declared underside
stiffness, a mat or a crushable layer: chain.presses_uniformly): the part of its
pressure over the flange bears on the steel, the part beyond it on the slab.

Sources: statics of a uniform pressure (common practice, no source); the simply
supported strip under a patch load, M(a) = a(L − a)/L − c/8 per newton, with the
patch spread 1:1 to the mid-plane (AISC Manual 15th ed. Table 3-23 case 7; the spread,
common practice); the crossing-strips share 1 − g_y/(g_main + g_y),
g_y = a²(L − a)²/(3L) (Rankine–Grashof, Reynolds, Reinforced Concrete Designer's
Handbook, two-way slabs — from memory). Numbers are invented for the check only.
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.solver import chain, deck


@pytest.mark.parametrize(("e", "share", "pos", "length"), [
    (1.00, 1.0, 1.00, 0.60),           # clear: [0.70, 1.30], all on the slab
    (0.35, 1.0, 0.35, 0.60),           # near edge at 0.05 = the flange's edge
    (0.30, 0.55 / 0.60, 0.325, 0.55),  # [0.00, 0.60]: 0.05 over the flange
    (0.00, 0.25 / 0.60, 0.175, 0.25),  # centred on the line: [0.05, 0.30] beyond
    (-0.0, 0.25 / 0.60, 0.175, 0.25),
])
def test_part_beyond_the_flange_by_hand(e: float, share: float, pos: float,
                                        length: float) -> None:
    # a 0.60 m footprint, flange half-width b = 0.05 m
    s, p, ln = chain.uniform_on_line(np.array([e]), np.array([0.60]), 0.05)
    assert s[0] == pytest.approx(share, rel=1e-12)
    assert p[0] == pytest.approx(pos, rel=1e-12)
    assert ln[0] == pytest.approx(length, rel=1e-12)


@pytest.mark.parametrize(("e", "share"), [
    (0.00, 0.25 / 0.35),  # rests on [−0.05, 0.30]: the flange's outer half and beyond
    (0.30, 0.55 / 0.60),  # [0.00, 0.60]: wholly over the deck, as an interior line
    (1.00, 1.0),
])
def test_at_the_decks_edge_the_load_rests_on_what_is_there(e: float, share: float) -> None:
    # the line is the deck's edge: nothing beyond the flange's outer edge, so the
    # load's weight rests on the flange and the slab only (statics of a uniform
    # pressure on what supports it; common practice, no source)
    s, _p, _ln = chain.uniform_on_line(np.array([e]), np.array([0.60]), 0.05,
                                       np.array([True]))
    assert s[0] == pytest.approx(share, rel=1e-12)


def test_within_the_flange_all_on_the_steel() -> None:
    s, _p, ln = chain.uniform_on_line(np.array([0.0, 0.01]), np.array([0.08, 0.06]), 0.05)
    np.testing.assert_array_equal(s, [0.0, 0.0])
    np.testing.assert_array_equal(ln, [0.0, 0.0])


def test_continuous_as_the_footprint_comes_over_the_line() -> None:
    # before, the whole patch stayed on the cross strip until the footprint's edge
    # reached the line and was dropped there (a step); now a 1 mm move changes the
    # share by at most 1 mm / extent
    e = np.linspace(0.0, 1.0, 2001)
    s, _p, _ln = chain.uniform_on_line(e, np.full(e.size, 0.53), 0.085)
    assert np.max(np.abs(np.diff(s))) <= (e[1] - e[0]) / 0.53 * (1 + 1e-9)


def test_cross_strip_moment_by_hand() -> None:
    # a 9.0 m cross strip, a 1.30 m footprint (0.5 m wide along the line) centred
    # 0.40 m from the girder, flange half-width 0.085 m, slab 0.15 m, main strip
    # deflection 2e-9 m/N under a unit load:
    # slab part [0.085, 1.05]: share 0.965/1.30, centre 0.5675 m, length 0.965 m
    L, e, ext, along, h, b, g_main = 9.0, 0.40, 1.30, 0.5, 0.15, 0.085, 2e-9
    share, a, c0 = 0.965 / 1.30, 0.5675, 0.965
    c = min(c0 + h, 2 * a, 2 * (L - a))  # spread 1:1, kept inside the span
    M = a * (L - a) / L - c / 8
    b_e = float(deck.deck_effective_width(L, a, along, h))
    g_y = a**2 * (L - a) ** 2 / (3 * L)
    cross = 1 - g_y / (g_main + g_y)
    hand = share * M / b_e * cross
    got = chain.uniform_cross_strip_moment(np.array([L]), np.array([e]), np.array([ext]),
                                           np.array([along]), h, b, np.array([g_main]))
    assert float(got[0]) == pytest.approx(hand, rel=1e-12)
    # clear of the flanges: the whole footprint at its centre, the rule before
    far = chain.uniform_cross_strip_moment(np.array([L]), np.array([3.0]), np.array([ext]),
                                           np.array([along]), h, b, np.array([np.inf]))
    assert float(far[0]) == pytest.approx(
        float(deck.deck_unit_moment_per_width(L, 3.0, ext, along, h)), rel=1e-12)

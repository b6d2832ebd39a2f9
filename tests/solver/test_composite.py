"""Composite beams: plastic moment by stress blocks, transformed inertia, effective
width; connection capacity default.

Sources: EN 1994-1-1:2004 §5.4.1.2, §5.4.2.2, §6.2.1.2 (Fig. 6.2), §6.2.1.3;
AISC 360-16 §I3.1a, §I3.2a and Commentary Eq. C-I3-4 (from memory); Gere,
*Mechanics of Materials* 7th ed. §12.5 (parallel axes). The reference here is an
independent fibre integration of the same stress blocks (bisection on the plastic
neutral axis over 20 000 fibres), not the closed form; the steel-only limit is the
plastic modulus of an I without fillets, bf·tf·(d − tf) + tw·(d − 2tf)²/4, below
the catalogue Wpl,y = 628 cm³ of IPE 300 (steel-sections package; from memory).
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest

from droprig.solver import composite

REL_FIBRE = 2e-4
"""Fibre integration with 20 000 fibres over the depth: discretisation error."""

IPE300 = dict(d=0.300, bf=0.150, tf=0.0107, tw=0.0071, A=5.38e-3, Ix=8.356e-5)


def _section(b_eff: float, h_c: float, h_p: float) -> composite.CompositeSection:
    # A is the catalogue area with fillets; the stress blocks use the plates, so take
    # the plate area for consistency with the fibre model
    d, bf, tf, tw = IPE300["d"], IPE300["bf"], IPE300["tf"], IPE300["tw"]
    A = 2 * bf * tf + tw * (d - 2 * tf)
    return composite.CompositeSection(d, bf, tf, tw, A, IPE300["Ix"], b_eff, h_c, h_p)


def _fibre_mp(sec: composite.CompositeSection, f_conc: float, f_st: float) -> float:
    """Full-connection plastic moment by fibres: PNA by bisection, M about the PNA."""
    top = sec.h_c + sec.h_p
    z = np.linspace(0.0, top + sec.d, 20001)
    zm = 0.5 * (z[1:] + z[:-1])
    dz = np.diff(z)
    conc_w = np.where(zm < sec.h_c, sec.b_eff, 0.0)
    zs = zm - top
    steel_w = np.where((zs >= 0) & (zs <= sec.d),
                       np.where((zs < sec.tf) | (zs > sec.d - sec.tf), sec.bf, sec.tw), 0.0)

    def net(zp: float) -> float:
        comp = np.sum(np.where(zm < zp, conc_w * f_conc + steel_w * f_st, 0.0) * dz)
        tens = np.sum(np.where(zm >= zp, steel_w * f_st, 0.0) * dz)
        return comp - tens

    lo, hi = 0.0, top + sec.d
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        lo, hi = (lo, mid) if net(mid) > 0 else (mid, hi)
    zp = 0.5 * (lo + hi)
    comp = np.where(zm < zp, conc_w * f_conc + steel_w * f_st, 0.0) * dz
    tens = np.where(zm >= zp, steel_w * f_st, 0.0) * dz
    return float(np.sum(comp * (zp - zm)) + np.sum(tens * (zm - zp)))


@pytest.mark.parametrize("b_eff, h_c, h_p, where", [
    (2.0, 0.10, 0.0, "slab"),     # wide solid slab: PNA in the concrete
    (0.9, 0.06, 0.05, "flange"),  # narrow topping over ribs: PNA in the top flange
    (0.4, 0.05, 0.05, "web"),     # very narrow: PNA in the web
])
@pytest.mark.parametrize("basis", ["en1993", "aisc360"])
def test_plastic_moment_against_fibres(b_eff, h_c, h_p, where, basis):
    sec = _section(b_eff, h_c, h_p)
    fy, fc = 355e6, 30e6
    f_conc = 0.85 * fc / 1.2 if basis == "en1993" else 0.85 * fc
    M = composite.composite_plastic_moment(sec, fy, fc, basis)
    assert M == pytest.approx(_fibre_mp(sec, f_conc, fy), rel=REL_FIBRE)
    # the case named is the one reached (equilibrium of the blocks)
    Cc = f_conc * b_eff * h_c
    Ts = sec.A * fy
    if where == "slab":
        assert Ts <= Cc
    elif where == "flange":
        assert 0 < (Ts - Cc) / 2 <= sec.bf * sec.tf * fy
    else:
        assert (Ts - Cc) / 2 > sec.bf * sec.tf * fy


def test_no_connection_is_the_bare_steel():
    sec = _section(2.0, 0.10, 0.0)
    fy = 355e6
    d, bf, tf, tw = IPE300["d"], IPE300["bf"], IPE300["tf"], IPE300["tw"]
    Wpl_plates = bf * tf * (d - tf) + tw * (d - 2 * tf) ** 2 / 4
    M0 = composite.composite_plastic_moment(sec, fy, 30e6, "en1993", shear_connection=0.0)
    assert M0 == pytest.approx(fy * Wpl_plates, rel=1e-9)
    assert M0 < fy * 628e-6  # catalogue Wpl,y of IPE 300 counts the fillets
    # more connection, more moment
    Ms = [composite.composite_plastic_moment(sec, fy, 30e6, "en1993", shear_connection=e)
          for e in (0.0, 0.4, 0.8, 1.0)]
    assert all(a < b for a, b in itertools.pairwise(Ms))


def test_transformed_inertia_against_fibres():
    from dataclasses import replace

    sec0 = _section(1.5, 0.08, 0.05)
    # plates only (no fillets), so that area and inertia describe the same steel
    Ix_plates = (sec0.bf * sec0.d**3 - (sec0.bf - sec0.tw) * (sec0.d - 2 * sec0.tf) ** 3) / 12
    sec = replace(sec0, Ix=Ix_plates)
    n = 200e9 / 33e9
    top = sec.h_c + sec.h_p
    edges = [0.0, sec.h_c, top, top + sec.tf, top + sec.d - sec.tf, top + sec.d]
    z = np.unique(np.concatenate([np.linspace(a, b, 8001) for a, b in itertools.pairwise(edges)]))
    zm, dz = 0.5 * (z[1:] + z[:-1]), np.diff(z)
    zs = zm - top
    steel = np.where((zs >= 0) & (zs <= sec.d),
                     np.where((zs < sec.tf) | (zs > sec.d - sec.tf), sec.bf, sec.tw), 0.0)
    b = np.where(zm < sec.h_c, sec.b_eff / n, 0.0) + steel
    A = np.sum(b * dz)
    zbar = np.sum(b * zm * dz) / A
    I_ref = np.sum(b * (zm - zbar) ** 2 * dz)  # fibre sum (Gere §12.5 in the limit)
    assert composite.transformed_inertia(sec, n) == pytest.approx(I_ref, rel=1e-6)
    assert composite.effective_inertia(sec.Ix, I_ref, 1.0) == pytest.approx(I_ref)
    assert composite.effective_inertia(sec.Ix, I_ref, 0.25) == pytest.approx(
        sec.Ix + 0.5 * (I_ref - sec.Ix))


def test_effective_width_and_connection_default():
    # EN 1994-1-1 §5.4.1.2(5) / AISC I3.1a: L/8 a side, ≤ half the spacing
    assert composite.effective_width(9.0, 3.0, 3.0, "en1993") == pytest.approx(2.25)
    assert composite.effective_width(16.0, 3.0, 0.0, "aisc360") == pytest.approx(1.5)
    # stated default: the web's own plastic shear resistance (enter the real capacity)
    assert composite.connection_capacity(400e3) == pytest.approx(400e3)
    assert composite.connection_capacity(400e3, 150e3) == 150e3
    with pytest.raises(ValueError, match="connection_capacity"):
        composite.connection_capacity(400e3, -1.0)

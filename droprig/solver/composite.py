"""Composite steel–concrete beams (studded to the deck): plastic moment, effective
width and effective inertia; and the end-shear check of a beam's connections.

Plastic moment by rectangular stress blocks with full or partial shear connection:
EN 1994-1-1 §6.2.1.2 (concrete 0.85·fcd over the compressed depth, steel ±fyd;
Fig. 6.2), §6.2.1.3 (partial connection, plastic theory); AISC 360-16 §I3.2a
(0.85·f'c, Fy; Commentary Fig. C-I3.3). The concrete acts only above the ribs of a
profiled deck (ribs perpendicular to the beam, the usual case). Root fillets of
the steel section are ignored (its plastic moment is then slightly below Fy·Zx:
conservative).

SI units: m, m², m⁴, Pa, N, N·m.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "CONNECTION_DEFAULT_FRACTION",
    "CompositeSection",
    "composite_plastic_moment",
    "connection_capacity",
    "effective_inertia",
    "effective_width",
    "transformed_inertia",
]

CONNECTION_DEFAULT_FRACTION = 1.0
"""Working connection capacity, as a share of the beam's plastic shear resistance
V_pl, while the user has entered none: 1.0 — the connection check then repeats the
web's shear check and adds no margin of its own.

Decision (common practice, no source): a connection's capacity cannot be inferred
from the beam. Simple fin-plate and double-angle connections of existing floors were
designed for the gravity reaction and often carry well under V_pl; no fraction of V_pl
is conservative for every connection (0.5 was tried: every demo bay became a
keep-clear area on a guess, which is not a safer answer, only a different guess).
So the capacity is a required input for a permit: until every member of a lift
zone's level has one, :func:`droprig.permit.derive_conditions` adds a separate
sign-off condition naming the members whose connections the engineer must confirm
(or whose capacity must be entered), and the permit cannot read "Acceptable" without
conditions. The annex and the inspector say so."""


@dataclass(frozen=True)
class CompositeSection:
    """Steel I-section (depth d, flange bf × tf, web tw, area A, Ix; m, m², m⁴) under
    a concrete slab of effective width b_eff with h_c of concrete over ribs of
    height h_p (h_p = 0 for a solid slab)."""

    d: float
    bf: float
    tf: float
    tw: float
    A: float
    Ix: float
    b_eff: float
    h_c: float
    h_p: float = 0.0

    def __post_init__(self) -> None:
        for name in ("d", "bf", "tf", "tw", "A", "Ix", "b_eff", "h_c"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v > 0.0):
                raise ValueError(f"composite section {name}: {v!r} must be > 0")
        if not (math.isfinite(self.h_p) and self.h_p >= 0.0):
            raise ValueError(f"composite section h_p: {self.h_p!r} must be ≥ 0")


def effective_width(span: float, spacing_left: float, spacing_right: float,
                    basis: str) -> float:
    """Effective width of the slab acting with a beam, m.

    EN 1994-1-1 §5.4.1.2(5): b_eff = Σ b_ei, b_ei = L_e/8 ≤ half the distance to
    the next web (b0 = 0, one line of studs), L_e the span between points of zero
    moment (the span of a simple beam). AISC 360-16 §I3.1a: each side min(L/8,
    half the distance to the next beam). The same for both here (span/8 a side).
    A free edge: spacing 0 on that side (its overhang is then not counted:
    conservative)."""
    if basis not in ("aisc360", "en1993"):
        raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")
    return min(span / 8.0, spacing_left / 2.0) + min(span / 8.0, spacing_right / 2.0)


def composite_plastic_moment(sec: CompositeSection, fy: float, fc: float, basis: str,
                             shear_connection: float = 1.0, *, gamma_c: float = 1.2,
                             gamma_a: float = 1.0) -> float:
    """Sagging plastic moment of the composite section, N·m.

    Concrete block: EN 1994-1-1 §6.2.1.2(1)(d): 0.85·fck/γc; AISC 360-16 §I3.2a:
    0.85·f'c. Steel fy/γa. Full connection: C_c,max = 0.85·fc'·b_eff·h_c. Partial
    (EN §6.2.1.3, AISC I3.2d): the concrete force is limited to
    N_c = η·min(C_c,max, A·fy), η = ``shear_connection`` (0–1).
    Plastic neutral axis (PNA) by equilibrium C_c + C_s = T_s: in the slab when
    A·fy ≤ C_c (depth a = A·fy/(0.85fc·b)); otherwise the steel above the PNA is in
    compression, C_s = (A·fy − N_c)/2, in the top flange or the web. The moment is
    taken about the top of the slab: M = T_s·z_T − C_c·z_c − C_s·z_s.
    With partial connection the concrete block is N_c/(0.85fc·b) deep from the top.
    """
    if basis == "en1993":
        f_conc = 0.85 * fc / gamma_c
        f_st = fy / gamma_a
    elif basis == "aisc360":
        f_conc = 0.85 * fc
        f_st = fy
    else:
        raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")
    if not 0.0 <= shear_connection <= 1.0:
        raise ValueError(f"shear connection degree: {shear_connection!r} must be 0 to 1")
    top = sec.h_c + sec.h_p  # depth of the steel's top from the top of the slab
    Ts = sec.A * f_st
    Nc = shear_connection * min(f_conc * sec.b_eff * sec.h_c, Ts)
    a = Nc / (f_conc * sec.b_eff)
    z_c = a / 2.0
    Cs = 0.5 * (Ts - Nc)
    flange = sec.bf * sec.tf * f_st
    if Cs <= 0.0:
        return Ts * (top + sec.d / 2.0) - Nc * z_c
    if Cs <= flange:
        y = Cs / (sec.bf * f_st)
        z_s = top + y / 2.0
    else:
        y_w = (Cs - flange) / (sec.tw * f_st)
        web_force = Cs - flange
        z_s = (flange * (top + sec.tf / 2.0) + web_force * (top + sec.tf + y_w / 2.0)) / Cs
    # tension: the whole steel at +fy plus the compressed part reversed
    # (A·fy at mid-depth minus 2·C_s at z_s gives the net steel resultant)
    return Ts * (top + sec.d / 2.0) - 2.0 * Cs * z_s - Nc * z_c


def transformed_inertia(sec: CompositeSection, n: float) -> float:
    """Second moment of the uncracked transformed section about its elastic neutral
    axis, m⁴: the concrete over the ribs at b_eff/n (n = E_a/E_cm, the short-term
    modular ratio of EN 1994-1-1 §5.4.2.2 — a dropped load is short-term), steel
    Ix at its centroid; parallel axes (Gere §12.5). The concrete is taken
    uncracked over its full depth h_c (stiffer: a higher impact force)."""
    if n <= 0.0:
        raise ValueError(f"modular ratio: {n!r} must be > 0")
    Ac = sec.b_eff * sec.h_c / n
    zc = sec.h_c / 2.0
    zs = sec.h_c + sec.h_p + sec.d / 2.0
    A = Ac + sec.A
    zbar = (Ac * zc + sec.A * zs) / A
    Ic = sec.b_eff * sec.h_c**3 / (12.0 * n)
    return Ic + Ac * (zc - zbar) ** 2 + sec.Ix + sec.A * (zs - zbar) ** 2


def effective_inertia(I_steel: float, I_tr: float, shear_connection: float) -> float:
    """Effective inertia of a partially composite beam, m⁴:
    I_eff = I_s + √η·(I_tr − I_s) (AISC 360-16 Commentary Eq. C-I3-4 with
    η = ΣQn/Cf — from memory). η = 1: the transformed section; η = 0: the steel."""
    if not 0.0 <= shear_connection <= 1.0:
        raise ValueError(f"shear connection degree: {shear_connection!r} must be 0 to 1")
    return I_steel + math.sqrt(shear_connection) * (I_tr - I_steel)


def connection_capacity(V_pl: float, capacity: float | None = None) -> float:
    """End-connection shear capacity, N: the user's figure, or the working value
    :data:`CONNECTION_DEFAULT_FRACTION`·V_pl (V_pl the beam's plastic shear
    resistance, N; not a conservative default — the permit then requires the
    engineer's confirmation, see :data:`CONNECTION_DEFAULT_FRACTION`). The end-shear
    utilisation is V_end/capacity."""
    if capacity is not None:
        if not (math.isfinite(capacity) and capacity > 0.0):
            raise ValueError(f"member connection_capacity: {capacity!r} must be > 0 N")
        return capacity
    return CONNECTION_DEFAULT_FRACTION * V_pl

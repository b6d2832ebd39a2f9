"""Resistances of a doubly symmetric rolled I-section (strong axis) to the actions of
a dropped load: bending, shear and a concentrated force on the top flange.

Two design bases: ``"aisc360"`` (ANSI/AISC 360-16) and ``"en1993"`` (EN 1993-1-1:2005
and EN 1993-1-5:2006). Common arguments:

* ``phi`` — resistance factor applied to every resistance (AISC φ, or 1/γM for EN).
  The accidental situation of a dropped load uses 1.0 by default (common practice,
  no source); pass the code's value (e.g. AISC φb = 0.90) to be stricter.
* ``dif`` — dynamic increase factor multiplying the yield strength (default 1.0;
  UFC 3-340-02 gives values for blast strain rates). Slenderness limits use the
  static yield strength.

The member is taken as laterally restrained (the deck braces the compression
flange), so lateral–torsional buckling is not checked; this is stated in every
report. Resistances in N (forces) and N·m (moments); inputs in SI.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import Grade, Section

Basis = Literal["aisc360", "en1993"]
BASES: tuple[str, ...] = ("aisc360", "en1993")

__all__ = [
    "BASES",
    "flange_slenderness",
    "flexural_resistance",
    "patch_loading_resistance",
    "plastic_hinge_capable",
    "section_class",
    "shear_resistance",
    "web_crippling",
    "web_local_yielding",
    "web_slenderness",
]


def _basis(basis: str) -> None:
    if basis not in BASES:
        raise ValueError(f"design basis: {basis!r} is not allowed; allowed: "
                         + ", ".join(BASES))


def _fy(grade: Grade, section: Section) -> float:
    return grade.section_fy(section)


def _epsilon(fy: float) -> float:
    """ε = √(235 MPa / fy), EN 1993-1-1 Table 5.2."""
    return math.sqrt(235e6 / fy)


def flange_slenderness(section: Section, basis: Basis) -> float:
    """Compression-flange slenderness, dimensionless: AISC λ = bf/(2tf) (Table B4.1b
    case 10); EN c/tf with c = (bf − tw − 2r)/2 (EN 1993-1-1 Table 5.2, outstand)."""
    _basis(basis)
    if basis == "aisc360":
        return section.bf / (2.0 * section.tf)
    return (section.bf - section.tw - 2.0 * section.r) / 2.0 / section.tf


def web_slenderness(section: Section, basis: Basis) -> float:
    """Web slenderness, dimensionless: AISC h/tw with h = d − 2k_des for rolled
    shapes (AISC 360-16 §B4.1b(b)); EN c/tw with c = d − 2tf − 2r (Table 5.2)."""
    _basis(basis)
    if basis == "aisc360":
        return (section.d - 2.0 * section.k_des) / section.tw
    return (section.d - 2.0 * section.tf - 2.0 * section.r) / section.tw


def section_class(section: Section, grade: Grade, basis: Basis) -> str:
    """Cross-section classification in bending about the strong axis.

    AISC 360-16 Table B4.1b cases 10 and 15: flange λp = 0.38√(E/Fy), λr = 1.0√(E/Fy);
    web λp = 3.76√(E/Fy), λr = 5.70√(E/Fy) → ``"compact"``, ``"noncompact"`` or
    ``"slender"`` (worst element). EN 1993-1-1 Table 5.2: flange outstand 9ε/10ε/14ε,
    web in bending 72ε/83ε/124ε → ``"1"`` … ``"4"``.
    """
    _basis(basis)
    fy = _fy(grade, section)
    lf = flange_slenderness(section, basis)
    lw = web_slenderness(section, basis)
    if basis == "aisc360":
        r = math.sqrt(grade.E / fy)
        rank_f = 0 if lf <= 0.38 * r else (1 if lf <= 1.0 * r else 2)
        rank_w = 0 if lw <= 3.76 * r else (1 if lw <= 5.70 * r else 2)
        return ("compact", "noncompact", "slender")[max(rank_f, rank_w)]
    e = _epsilon(fy)
    cls_f = 1 if lf <= 9 * e else 2 if lf <= 10 * e else 3 if lf <= 14 * e else 4
    cls_w = 1 if lw <= 72 * e else 2 if lw <= 83 * e else 3 if lw <= 124 * e else 4
    return str(max(cls_f, cls_w))


def plastic_hinge_capable(section: Section, grade: Grade, basis: Basis) -> bool:
    """Can the section form a plastic hinge with enough rotation capacity for the
    plastic energy balance (droprig's ``plastic`` response)?

    AISC 360-16 Appendix 1 §1.3.2b (design by inelastic analysis, members with no
    axial force): flanges bf/(2tf) ≤ λpd = 0.32√(E/Fy), webs h/tw ≤ 2.45√(E/Fy)
    (from memory). EN 1993-1-1 §5.5.2 and §5.6: Class 1 (rotation capacity for
    plastic analysis). A section that fails this has no assured plastic reserve:
    flexure beyond its resistance is treated as ``exceeds``.
    """
    _basis(basis)
    if basis == "en1993":
        return section_class(section, grade, basis) == "1"
    r = math.sqrt(grade.E / _fy(grade, section))
    return (flange_slenderness(section, basis) <= 0.32 * r
            and web_slenderness(section, basis) <= 2.45 * r)


def flexural_resistance(section: Section, grade: Grade, basis: Basis, phi: float = 1.0,
                        dif: float = 1.0) -> float:
    """Strong-axis bending resistance, N·m, of a laterally restrained member.

    AISC 360-16: compact, F2.1 Mn = Mp = Fy·Zx (Eq. F2-1); noncompact flange, F3.2
    Mn = Mp − (Mp − 0.7·Fy·Sx)(λ − λpf)/(λrf − λpf) (Eq. F3-1); slender flange
    Mn = 0.9·E·kc·Sx/λ² with kc = 4/√(h/tw), 0.35 ≤ kc ≤ 0.76 (Eq. F3-2). Returns
    φ·Mn with Fy → dif·Fy.
    EN 1993-1-1: Class 1 or 2 Mc,Rd = Wpl·fy/γM0 (Eq. 6.13); Class 3 Wel·fy/γM0
    (Eq. 6.14). Returns phi·(…) with fy → dif·fy.
    Noncompact/slender webs (AISC F4/F5) and Class 4 sections (EN 1993-1-5 §4) are
    outside droprig's scope and raise ``ValueError`` naming the section.
    """
    _basis(basis)
    fy = _fy(grade, section)
    fyd = dif * fy
    cls = section_class(section, grade, basis)
    if basis == "aisc360":
        r = math.sqrt(grade.E / fy)
        if web_slenderness(section, basis) > 3.76 * r:
            raise ValueError(f"section {section.name}: noncompact or slender web in bending "
                             "(AISC 360-16 F4/F5) is outside droprig's scope")
        Mp = fyd * section.Zx
        lam = flange_slenderness(section, basis)
        lp, lr = 0.38 * r, 1.0 * r
        if lam <= lp:
            Mn = Mp
        elif lam <= lr:
            Mn = Mp - (Mp - 0.7 * fyd * section.Sx) * (lam - lp) / (lr - lp)
        else:
            kc = min(max(4.0 / math.sqrt(web_slenderness(section, basis)), 0.35), 0.76)
            Mn = 0.9 * grade.E * kc * section.Sx / lam**2
        return phi * Mn
    if cls in ("1", "2"):
        return phi * section.Zx * fyd
    if cls == "3":
        return phi * section.Sx * fyd
    raise ValueError(f"section {section.name}: Class 4 in bending (EN 1993-1-1 Table 5.2) "
                     "is outside droprig's scope")


def shear_resistance(section: Section, grade: Grade, basis: Basis, phi: float = 1.0,
                     dif: float = 1.0) -> float:
    """Strong-axis shear resistance of the web, N.

    AISC 360-16 G2.1: Vn = 0.6·Fy·Aw·Cv1 (Eq. G2-1), Aw = d·tw; Cv1 = 1.0 when
    h/tw ≤ 2.24√(E/Fy) (G2.1(a), rolled I-shapes), otherwise Cv1 = 1.0 for
    h/tw ≤ 1.10√(kv·E/Fy) and 1.10√(kv·E/Fy)/(h/tw) beyond (Eqs. G2-3, G2-4),
    kv = 5.34 (no intermediate stiffeners). Returns φ·Vn with Fy → dif·Fy.
    EN 1993-1-1 §6.2.6: Vpl,Rd = Av·(fy/√3)/γM0 (Eq. 6.18), Av = A − 2b·tf +
    (tw + 2r)·tf ≥ η·hw·tw with η = 1.0 (the conservative value of the note to
    6.2.6(3)). When hw/tw > 72ε/η the web is checked for shear buckling, EN 1993-1-5
    §5: λw = hw/(86.4·tw·ε) (Eq. 5.7, stiffeners at supports only), χw = 0.83/λw
    (Table 5.1, non-rigid end post), Vb,Rd = χw·fyw·hw·tw/√3 (Eq. 5.2, web only).
    """
    _basis(basis)
    fyw_static = grade.yield_strength(section.tw)
    fyw = dif * fyw_static
    if basis == "aisc360":
        Aw = section.d * section.tw
        h_tw = web_slenderness(section, basis)
        r = math.sqrt(grade.E / fyw_static)
        if h_tw <= 2.24 * r:
            cv1 = 1.0
        else:
            lim = 1.10 * math.sqrt(5.34) * r
            cv1 = 1.0 if h_tw <= lim else lim / h_tw
        return phi * 0.6 * fyw * Aw * cv1
    hw = section.h_web
    Av = max(section.A - 2.0 * section.bf * section.tf
             + (section.tw + 2.0 * section.r) * section.tf, hw * section.tw)
    V = Av * fyw / math.sqrt(3.0)
    e = _epsilon(fyw_static)
    if hw / section.tw > 72.0 * e:
        lam_w = hw / (86.4 * section.tw * e)
        chi = 1.0 if lam_w < 0.83 else 0.83 / lam_w
        V = min(V, chi * fyw * hw * section.tw / math.sqrt(3.0))
    return phi * V


def patch_loading_resistance(section: Section, grade: Grade, bearing: ArrayLike,
                             dist_to_end: ArrayLike, phi: float = 1.0,
                             dif: float = 1.0) -> np.ndarray:
    """Resistance of an unstiffened web to a force applied through the top flange, N.

    EN 1993-1-5 §6: F_Rd = fyw·Leff·tw/γM1 (Eq. 6.1); Leff = χF·ly (6.2);
    χF = 0.5/λF ≤ 1 (6.3); λF = √(ly·tw·fyw/Fcr) (6.4); Fcr = 0.9·kF·E·tw³/hw (6.5);
    m1 = fyf·bf/(fyw·tw) (6.8); m2 = 0.02(hw/tf)² if λF > 0.5 else 0 (6.9);
    ss = bearing length (≤ hw, §6.3(2)).
    Type (a) (Fig. 6.1): no transverse stiffeners, hw/a → 0 so kF = 6;
    ly = ss + 2tf(1 + √(m1 + m2)) (6.10).
    Type (c), next to an unstiffened end at distance c (``dist_to_end``):
    kF = 2 + 6(ss + c)/hw ≤ 6; ly = min(le + tf√(m1/2 + (le/tf)² + m2), le + tf√(m1 + m2))
    (6.11, 6.12), le = kF·E·tw²/(2·fyw·hw) ≤ ss + c (6.13). Used where
    2 + 6(ss + c)/hw < 6, taking the lesser of types (a) and (c) there.
    m2 is first taken ≠ 0 and set to 0 where the resulting λF ≤ 0.5.
    Vectorised over ``bearing`` and ``dist_to_end`` (m).
    """
    ss_in, c = np.broadcast_arrays(np.asarray(bearing, float), np.asarray(dist_to_end, float))
    E = grade.E
    tw, tf, bf = section.tw, section.tf, section.bf
    hw = section.h_web
    fyw = dif * grade.yield_strength(tw)
    fyf = dif * grade.yield_strength(tf)
    ss = np.minimum(np.maximum(ss_in, 0.0), hw)
    c = np.maximum(c, 0.0)
    m1 = fyf * bf / (fyw * tw)
    m2_full = 0.02 * (hw / tf) ** 2

    def resist(kF: np.ndarray, ly_of_m2: Callable[[float], np.ndarray]) -> np.ndarray:
        Fcr = 0.9 * kF * E * tw**3 / hw
        ly = ly_of_m2(m2_full)
        lam = np.sqrt(ly * tw * fyw / Fcr)
        ly0 = ly_of_m2(0.0)
        lam0 = np.sqrt(ly0 * tw * fyw / Fcr)
        use0 = lam <= 0.5
        ly = np.where(use0, ly0, ly)
        lam = np.where(use0, lam0, lam)
        chi = np.minimum(0.5 / lam, 1.0)
        return fyw * chi * ly * tw

    kF_a = np.full(ss.shape, 6.0)
    F_a = resist(kF_a, lambda m2: ss + 2.0 * tf * (1.0 + np.sqrt(m1 + m2)))
    kF_c = np.minimum(2.0 + 6.0 * (ss + c) / hw, 6.0)
    le = np.minimum(kF_c * E * tw**2 / (2.0 * fyw * hw), ss + c)
    F_c = resist(kF_c, lambda m2: np.minimum(le + tf * np.sqrt(m1 / 2.0 + (le / tf) ** 2 + m2),
                                             le + tf * np.sqrt(m1 + m2)))
    near_end = 2.0 + 6.0 * (ss + c) / hw < 6.0
    return phi * np.where(near_end, np.minimum(F_a, F_c), F_a)


def web_local_yielding(section: Section, grade: Grade, basis: Basis, bearing: ArrayLike,
                       dist_to_end: ArrayLike, phi: float = 1.0,
                       dif: float = 1.0) -> np.ndarray:
    """Resistance to a concentrated force on the top flange, web local yielding, N.

    AISC 360-16 J10.2: Rn = Fyw·tw·(5k + lb) when the force acts more than d from the
    member end (Eq. J10-2), Rn = Fyw·tw·(2.5k + lb) otherwise (Eq. J10-3); k = k_des,
    lb = ``bearing``. Returns φ·Rn (AISC's φ = 1.00) with Fyw → dif·Fyw.
    EN 1993-1-5 §6 has one check for the whole web under a patch load (yielding,
    crippling and buckling): :func:`patch_loading_resistance`.
    ``dist_to_end``: from the member end to the nearer edge of the bearing, m.
    Vectorised over ``bearing`` and ``dist_to_end`` (m).
    """
    _basis(basis)
    if basis == "en1993":
        return patch_loading_resistance(section, grade, bearing, dist_to_end, phi, dif)
    lb, dist = np.broadcast_arrays(np.asarray(bearing, float), np.asarray(dist_to_end, float))
    fyw = dif * grade.yield_strength(section.tw)
    k = section.k_des
    interior = dist > section.d
    Rn = fyw * section.tw * (np.where(interior, 5.0 * k, 2.5 * k) + np.maximum(lb, 0.0))
    return phi * Rn


def flange_contact_force_bound(section: Section, grade: Grade, bearing: ArrayLike,
                               dist_to_end: ArrayLike) -> np.ndarray:
    """Upper estimate of the force a hard load can pass through a bare top flange
    into the web before the flange and web yield locally under it, N: the web local
    yielding mechanism of AISC 360-16 J10.2 (Eq. J10-2, J10-3: the force spread at
    2.5:1 through the flange and fillet over 5k + lb, or 2.5k + lb within d of the
    end; k = k_des, lb = ``bearing``, m) at the web's tensile strength Fu in place of
    its yield strength (strain hardening: an upper estimate, not a resistance; the
    web local yielding check itself stays at Fy). The contact force cannot pass it by
    more than the hardening the Fu already allows; beyond it the flange dents
    (EN 1993-1-5 §6 states the same mechanism, yielding of the web over the load
    spread s_s + 2t_f(1 + √…), as its patch-load resistance). ``dist_to_end`` from
    the member end to the nearer edge of the bearing, m. Vectorised."""
    lb, dist = np.broadcast_arrays(np.asarray(bearing, float), np.asarray(dist_to_end, float))
    k = section.k_des
    interior = dist > section.d
    return grade.fu * section.tw * (np.where(interior, 5.0 * k, 2.5 * k) + np.maximum(lb, 0.0))


def web_contact_resistance(section: Section, grade: Grade, basis: Basis, bearing: ArrayLike,
                           dist_to_end: ArrayLike, phi: float = 1.0,
                           dif: float = 1.0) -> np.ndarray:
    """Upper estimate of the force a member's web passes under a concentrated load on
    its top flange before it yields locally, N: the larger of
    :func:`flange_contact_force_bound` (AISC 360-16 J10.2's mechanism, Eq. J10-2/J10-3,
    at the tensile strength Fu: Fu·tw·(5k + lb), or 2.5k + lb within d of the end)
    and the web local yielding check's own resistance (:func:`web_local_yielding`
    with the project's φ and DIF on Fy; EN 1993-1-5 §6 on that basis), so that the
    bound is never below what the check allows: wherever a force reaches it, the
    web local yielding check reads U ≥ 1 (the web is locally damaged there, never
    "elastic"). Why Fu and no further DIF: Fu is the strain-hardened flow stress the
    yielded web reaches (Fu/Fy = 1.32 for S355, 1.3 for A992), at or above the
    dynamic yield strength the blast design guides give for mild steel at their
    strain rates (DIF on Fy about 1.1-1.3, UFC 3-340-02 ch. 5 — from memory); the
    rate effect on Fu itself (about 1.05-1.10 there, from memory) and the higher
    strain rates of a hard strike are not counted (README limits). A force above
    this bound is never allowed by any check (the web check's own allowed force
    is at most this bound), so the bound moves no allowable answer. ``bearing``
    and ``dist_to_end`` (m) as :func:`web_local_yielding`. Vectorised."""
    up = flange_contact_force_bound(section, grade, bearing, dist_to_end)
    return np.maximum(up, web_local_yielding(section, grade, basis, bearing, dist_to_end,
                                             phi, dif))


def web_crippling(section: Section, grade: Grade, basis: Basis, bearing: ArrayLike,
                  dist_to_end: ArrayLike, phi: float = 1.0, dif: float = 1.0) -> np.ndarray:
    """Resistance to a concentrated compressive force on the top flange, web
    crippling, N.

    AISC 360-16 J10.3 with Qf = 1 (wide-flange shapes):
    at least d/2 from the end: Rn = 0.80·tw²[1 + 3(lb/d)(tw/tf)^1.5]·√(E·Fyw·tf/tw)
    (Eq. J10-4); closer and lb/d ≤ 0.2: 0.40·tw²[1 + 3(lb/d)(tw/tf)^1.5]·√(…)
    (Eq. J10-5a); closer and lb/d > 0.2: 0.40·tw²[1 + (4lb/d − 0.2)(tw/tf)^1.5]·√(…)
    (Eq. J10-5b). Returns φ·Rn (AISC's own φ is 0.75; ``phi`` is the caller's) with
    Fyw → dif·Fyw.
    EN 1993-1-5: crippling is part of the single patch-loading check returned by
    :func:`web_local_yielding`; this function returns ``inf`` (no separate check).
    Vectorised over ``bearing`` and ``dist_to_end`` (m).
    """
    _basis(basis)
    lb, dist = np.broadcast_arrays(np.asarray(bearing, float), np.asarray(dist_to_end, float))
    if basis == "en1993":
        return np.full(lb.shape, np.inf)
    lb = np.maximum(lb, 0.0)
    tw, tf, d = section.tw, section.tf, section.d
    fyw = dif * grade.yield_strength(tw)
    root = math.sqrt(grade.E * fyw * tf / tw)
    r = (tw / tf) ** 1.5
    interior = 0.80 * tw**2 * (1.0 + 3.0 * (lb / d) * r) * root
    short = 0.40 * tw**2 * (1.0 + 3.0 * (lb / d) * r) * root
    long = 0.40 * tw**2 * (1.0 + (4.0 * lb / d - 0.2) * r) * root
    Rn = np.where(dist >= d / 2.0, interior, np.where(lb / d <= 0.2, short, long))
    return phi * Rn

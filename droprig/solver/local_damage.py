"""Local damage of the struck deck by a hard dropped object: penetration, scabbing
of the soffit, perforation, the drop heights at which each starts and the speed
left after perforation.

Vectorised over drop points (numpy broadcasting). SI units throughout: M in kg,
d (equivalent missile diameter) and thicknesses in m, V in m/s, f_c in Pa,
ρ_c in kg/m³, heights in m.

Formula families (each function names its source; **[mem]** items were recalled
and carry ``from memory`` in their docstring):

* **Modified NDRC penetration** with **Kennedy's scabbing and perforation
  relations** (Kennedy 1976, *Nucl. Eng. Des.* 37, 183–203, as reviewed in SI form
  by Li, Reid, Wen and Telford, "Local impact effects of hard missiles on
  concrete targets", *Int. J. Impact Eng.* 32 (2005) 224–284 — from memory;
  "Li et al. 2005" below). The perforation relation is the Army Corps of Engineers one
  (ACE), e/d = 1.32 + 1.24·x/d for 3 ≤ e/d ≤ 18, as quoted in DOE-STD-3014
  Appendix C.
* **Degen's perforation relation** (Degen 1980, *Nucl. Eng. Des.* 58) on the
  NDRC penetration depth, as quoted in DOE-STD-3014 Appendix C, Eqs. C-613/C-614
  — a family of its own in the verdict (the most onerous family governs).
* **UKAEA penetration** (Barr 1990, UKAEA/R3 impact assessment procedure;
  Li et al. 2005.1 — from memory) and the **Barr (UKAEA, CEA-EDF extended)
  ballistic limit** of a reinforced slab (Li et al. 2005 — from memory).
* **Chang's scabbing and perforation** thicknesses (Chang 1981, *J. Struct. Div.
  ASCE* 107; Li et al. 2005 — from memory), whose test range reaches the
  lowest impact speed of the families here (16.7 m/s).
* **Steel plates and gratings**: the Ballistic Research Laboratory (BRL)
  perforation formula (Li et al. 2005 and DOE-STD-3014 Appendix C — from memory;
  the SI constant 1.4396·10⁹ and the US constant 17 400 give the same thickness,
  checked in the tests) on the deck's steel per plan area, with the DOE margin of
  1.25 (:func:`plate_deck_damage`).

All these formulas were fitted to missile tests at speeds well above a dropped
load's (a 5 m drop strikes at 9.9 m/s). Every result therefore carries an
``extrapolated`` flag: ``True`` where the strike speed lies outside the
calibrated range of the formula that gives the answer. An extrapolated answer is
an estimate to be read with the appointed lifting person and a licensed
engineer, never a pass.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import STRIKE_ORIENTATIONS, Deck, LiftLoad, ModelError

__all__ = [
    "BRL_STEEL",
    "CHANG",
    "DEGEN",
    "DENT_LIMIT",
    "DENT_RUPTURE_STRAIN",
    "DISTINCT_HEIGHTS_KEPT",
    "NDRC_KENNEDY",
    "NOSE_FACTOR",
    "ORIENTATIONS",
    "PERFORATION_FAMILIES",
    "PERFORATION_MARGIN",
    "PERFORATION_MASS_GRID",
    "PLATE_PERFORATION_MARGIN",
    "SCABBING_MARGIN",
    "UKAEA_BARR",
    "ConcreteDamage",
    "G",
    "LoadDamage",
    "PlateDamage",
    "Validity",
    "barr_ballistic_limit",
    "brl_plate_ballistic_limit",
    "brl_plate_perforation_thickness",
    "chang_perforation_thickness",
    "chang_perforation_velocity",
    "chang_scabbing_thickness",
    "chang_scabbing_velocity",
    "check_load_on_grating",
    "concrete_local_damage",
    "degen_perforation_thickness",
    "degen_perforation_velocity",
    "distinct_height_damage",
    "drop_height_for_speed",
    "equivalent_diameter",
    "family_ballistic_limits",
    "impact_speed",
    "is_hard",
    "kennedy_perforation_thickness",
    "kennedy_scabbing_thickness",
    "least_ballistic_limit",
    "load_family_heights",
    "load_local_damage",
    "ndrc_G",
    "ndrc_penetration",
    "ndrc_perforation_velocity",
    "ndrc_scabbing_velocity",
    "perforation_mass",
    "perforation_mass_reference",
    "plate_deck_damage",
    "plate_dent_depth",
    "plate_dent_height",
    "plate_dent_stiffness",
    "plate_dent_strain",
    "plate_dent_valid",
    "plate_local_damage",
    "residual_velocity",
    "slab_reinforcement_percent",
    "strike_geometry",
    "ukaea_penetration",
]

G = 9.80665
"""Standard gravity, m/s² (CGPM 1901; ISO 80000-3)."""

NOSE_FACTOR: dict[str, float] = {"flat": 0.72, "blunt": 0.84, "spherical": 1.0,
                                 "very_sharp": 1.14}
"""Nose shape factor N* of the NDRC formula (Kennedy 1976; Li et al. 2005.1 —
from memory)."""

Orientation = Literal["flat", "edge", "corner"]
ORIENTATIONS: tuple[str, ...] = STRIKE_ORIENTATIONS
"""Strike orientations of a hard item: on its underside, on one edge, on a corner."""


@dataclass(frozen=True)
class Validity:
    """Range of test data a formula was fitted to (SI). ``v_min``/``v_max``: strike
    speed, m/s; ``rel_min``/``rel_max``: range of the thickness ratio (e/d, h_s/d)
    the relation covers. ``source`` names where the range is stated."""

    name: str
    v_min: float
    v_max: float
    rel_min: float
    rel_max: float
    source: str

    def extrapolated(self, v: ArrayLike) -> np.ndarray:
        """``True`` where the strike speed v (m/s) lies outside [v_min, v_max]."""
        v = np.asarray(v, float)
        return (v < self.v_min) | (v > self.v_max)


NDRC_KENNEDY = Validity(
    "modified NDRC + Kennedy", 27.0, 311.8, 3.0, 18.0,
    "Kennedy 1976; Li et al. 2005.1 (speeds from memory); ACE perforation "
    "3 ≤ e/d ≤ 18 as quoted in DOE-STD-3014 App. C")
DEGEN = Validity(
    "Degen", 25.0, 311.8, 1.5, 18.0,
    "Degen 1980 via DOE-STD-3014 App. C (e/d range); speeds from memory")
UKAEA_BARR = Validity(
    "UKAEA / Barr", 25.0, 300.0, 0.33, 5.0,
    "Barr 1990; Li et al. 2005 (from memory)")
CHANG = Validity(
    "Chang", 16.7, 311.8, 0.0, math.inf,
    "Chang 1981; Li et al. 2005 (from memory)")
BRL_STEEL = Validity(
    "BRL steel plate", 60.0, 1000.0, 0.0, math.inf,
    "BRL formula, ballistic test range (from memory)")

SCABBING_MARGIN = 1.1
"""A slab prevents scabbing when at least 1.1 × the scabbing thickness
(DOE-STD-3014 App. C, after Eq. C-66)."""

PERFORATION_MARGIN = 1.2
"""A slab prevents perforation when at least 1.2 × the perforation thickness
(DOE-STD-3014 App. C, after Eq. C-614)."""

PLATE_PERFORATION_MARGIN = 1.25
"""A steel plate prevents perforation when at least 1.25 × the BRL perforation
thickness (DOE-STD-3014 App. C, steel barriers — from memory)."""

_CHANG_U = 60.96
"""Chang's reference speed u = 200 ft/s in m/s (Chang 1981 — from memory)."""


def _arr(*values: ArrayLike) -> list[np.ndarray]:
    return [np.asarray(v, float) for v in np.broadcast_arrays(*values)]


def _require_positive(name: str, value: ArrayLike, unit: str) -> None:
    a = np.asarray(value, float)
    if not np.all(np.isfinite(a)) or np.any(a <= 0.0):
        bad = a[~(np.isfinite(a) & (a > 0.0))].ravel()[0] if a.size else float("nan")
        raise ModelError(name, float(bad), f"> 0 {unit}".strip(), unit)


# --- kinematics -------------------------------------------------------------------

def impact_speed(h: ArrayLike, v0: ArrayLike = 0.0) -> np.ndarray:
    """Strike speed after a free fall h (m) from a downward speed v0 (m/s):
    V = √(v0² + 2gh), m/s (uniform acceleration, any dynamics text)."""
    h, v0 = _arr(h, v0)
    return np.sqrt(v0**2 + 2.0 * G * np.maximum(h, 0.0))


def drop_height_for_speed(v: ArrayLike, v0: ArrayLike = 0.0) -> np.ndarray:
    """Free fall giving the strike speed v (m/s) from a downward speed v0:
    h = (v² − v0²)/(2g), m, ≥ 0; ``inf`` stays ``inf``."""
    v, v0 = _arr(v, v0)
    with np.errstate(invalid="ignore"):
        return np.maximum((v**2 - v0**2) / (2.0 * G), 0.0)


# --- strike geometry -------------------------------------------------------------

def equivalent_diameter(area: ArrayLike) -> np.ndarray:
    """Diameter of the circle of the same contact area, d = √(4A/π), m (A in m²).

    The empirical formulas were fitted to circular missiles; a non-circular
    contact is taken as the circle of equal area (common practice, no source).
    """
    return np.sqrt(4.0 * np.asarray(area, float) / math.pi)


def strike_geometry(orientation: str, length: float, width: float,
                    edge_width: float) -> tuple[float, float, float]:
    """Contact of a hard item striking flat, on an edge or on a corner.

    Returns ``(d_eq, perimeter, N*)``: equivalent diameter (m), contact perimeter
    (m) and NDRC nose factor.

    * flat: the footprint L × W; N* = 0.72 (flat nose).
    * edge: the shorter edge min(L, W) over the bearing width b of the item's
      edge (a flange or plate thickness, ``edge_width``); N* = 0.72 (the edge
      meets the deck with a flat face).
    * corner: two edges of width b meeting, contact b × b; N* = 0.84 (a corner
      indents like a blunt nose).

    The contact areas are plain geometry; the corner's blunt-nose factor and the
    choice of the shorter edge (smaller contact, worse) are common practice,
    no source.
    """
    if orientation not in ORIENTATIONS:
        raise ModelError("strike orientation", orientation, "one of " + ", ".join(ORIENTATIONS))
    for name, v in (("length", length), ("width", width), ("edge_width", edge_width)):
        _require_positive(f"strike {name}", v, "m")
    b = min(edge_width, length, width)
    if orientation == "flat":
        a, c, n = length, width, NOSE_FACTOR["flat"]
    elif orientation == "edge":
        a, c, n = min(length, width), b, NOSE_FACTOR["flat"]
    else:
        a, c, n = b, b, NOSE_FACTOR["blunt"]
    return float(equivalent_diameter(a * c)), 2.0 * (a + c), n


# --- modified NDRC + Kennedy -------------------------------------------------------

def ndrc_G(M: ArrayLike, d: ArrayLike, v: ArrayLike, fc: ArrayLike,
           N: ArrayLike = 0.72) -> np.ndarray:
    """Impact function of the modified NDRC formula, dimensionless:

    G = 3.8·10⁻⁵ · N*·M/(d·√f_c) · (V/d)^1.8

    M kg, d m, V m/s, f_c Pa. Li et al. 2005 (SI form of Kennedy 1976's
    G = K·N·W/d·(V/1000d)^1.8, K = 180/√f_c, in lb, in, ft/s, psi — from memory).
    """
    M, d, v, fc, N = _arr(M, d, v, fc, N)
    return 3.8e-5 * N * M / (d * np.sqrt(fc)) * (np.maximum(v, 0.0) / d) ** 1.8


def _ndrc_x_over_d(Gv: np.ndarray) -> np.ndarray:
    return np.where(Gv <= 1.0, 2.0 * np.sqrt(Gv), Gv + 1.0)


def ndrc_penetration(M: ArrayLike, d: ArrayLike, v: ArrayLike, fc: ArrayLike,
                     N: ArrayLike = 0.72) -> np.ndarray:
    """Penetration depth into thick concrete by the modified NDRC formula, m:

    x/d = 2·√G for G ≤ 1 (x/d ≤ 2); x/d = G + 1 for G > 1 (Kennedy 1976; Li et
    al. 2005 — from memory). G from :func:`ndrc_G`.
    """
    d = np.asarray(d, float)
    return _ndrc_x_over_d(ndrc_G(M, d, v, fc, N)) * d


def kennedy_scabbing_thickness(x: ArrayLike, d: ArrayLike) -> np.ndarray:
    """Least slab thickness that does not scab, m (Kennedy 1976; DOE-STD-3014
    App. C, Eqs. C-65 and C-66):

    h_s/d = 7.91·(x/d) − 5.06·(x/d)² for x/d ≤ 0.65;
    h_s/d = 2.12 + 1.36·(x/d) for 0.65 < x/d ≤ 11.75 (extended beyond).

    The two branches meet at x/d = 0.65 (h_s/d = 3.00).
    """
    x, d = _arr(x, d)
    r = x / d
    return np.where(r <= 0.65, 7.91 * r - 5.06 * r**2, 2.12 + 1.36 * r) * d


def kennedy_perforation_thickness(x: ArrayLike, d: ArrayLike) -> np.ndarray:
    """Least slab thickness that is not perforated, m (Kennedy 1976; Li et al.
    2005 — from memory; the linear branch is the ACE relation quoted in
    DOE-STD-3014 App. C):

    e/d = 3.19·(x/d) − 0.718·(x/d)² for x/d ≤ 1.35;
    e/d = 1.32 + 1.24·(x/d) for 1.35 < x/d ≤ 13.5 (3 ≤ e/d ≤ 18; extended beyond).
    """
    x, d = _arr(x, d)
    r = x / d
    return np.where(r <= 1.35, 3.19 * r - 0.718 * r**2, 1.32 + 1.24 * r) * d


def degen_perforation_thickness(x: ArrayLike, d: ArrayLike) -> np.ndarray:
    """Least slab thickness not perforated by Degen's relation on the NDRC
    penetration, m (DOE-STD-3014 App. C, Eqs. C-613, C-614):

    e/d = 2.2·(x/d) − 0.3·(x/d)² for x/d ≤ 1.52;
    e/d = 0.69 + 1.29·(x/d) for x/d > 1.52 (2.65 ≤ e/d ≤ 18).
    """
    x, d = _arr(x, d)
    r = x / d
    return np.where(r <= 1.52, 2.2 * r - 0.3 * r**2, 0.69 + 1.29 * r) * d


def _x_over_d_for_scabbing(hs_over_d: np.ndarray) -> np.ndarray:
    # inverse of kennedy_scabbing_thickness (the quadratic branch's smaller root)
    disc = np.maximum(7.91**2 - 4.0 * 5.06 * hs_over_d, 0.0)
    quad = (7.91 - np.sqrt(disc)) / (2.0 * 5.06)
    lin = (hs_over_d - 2.12) / 1.36
    return np.where(hs_over_d <= 7.91 * 0.65 - 5.06 * 0.65**2, quad, lin)


def _x_over_d_for_perforation(e_over_d: np.ndarray) -> np.ndarray:
    disc = np.maximum(3.19**2 - 4.0 * 0.718 * e_over_d, 0.0)
    quad = (3.19 - np.sqrt(disc)) / (2.0 * 0.718)
    lin = (e_over_d - 1.32) / 1.24
    return np.where(e_over_d <= 3.19 * 1.35 - 0.718 * 1.35**2, quad, lin)


def _x_over_d_for_degen(e_over_d: np.ndarray) -> np.ndarray:
    # inverse of degen_perforation_thickness (the quadratic branch's smaller root up to
    # x/d = 1.52, e/d = 2.2·1.52 − 0.3·1.52² = 2.6509)
    disc = np.maximum(2.2**2 - 4.0 * 0.3 * e_over_d, 0.0)
    quad = (2.2 - np.sqrt(disc)) / (2.0 * 0.3)
    lin = (e_over_d - 0.69) / 1.29
    return np.where(e_over_d <= 2.2 * 1.52 - 0.3 * 1.52**2, quad, lin)


def _ndrc_speed_for_x(x_over_d: np.ndarray, M: np.ndarray, d: np.ndarray,
                      fc: np.ndarray, N: np.ndarray) -> np.ndarray:
    Gv = np.where(x_over_d <= 2.0, (x_over_d / 2.0) ** 2, x_over_d - 1.0)
    return d * (Gv * d * np.sqrt(fc) / (3.8e-5 * N * M)) ** (1.0 / 1.8)


def ndrc_scabbing_velocity(M: ArrayLike, d: ArrayLike, t: ArrayLike, fc: ArrayLike,
                           N: ArrayLike = 0.72) -> np.ndarray:
    """Strike speed at which a slab of thickness t (m) starts to scab, m/s: the
    modified NDRC penetration (:func:`ndrc_penetration`) solved for the x/d that
    makes Kennedy's h_s equal t (:func:`kennedy_scabbing_thickness`)."""
    M, d, t, fc, N = _arr(M, d, t, fc, N)
    return _ndrc_speed_for_x(_x_over_d_for_scabbing(t / d), M, d, fc, N)


def ndrc_perforation_velocity(M: ArrayLike, d: ArrayLike, t: ArrayLike, fc: ArrayLike,
                              N: ArrayLike = 0.72) -> np.ndarray:
    """Ballistic limit of a slab of thickness t (m) by modified NDRC + Kennedy, m/s:
    the strike speed whose perforation thickness e equals t
    (:func:`kennedy_perforation_thickness` inverted, then :func:`ndrc_G`)."""
    M, d, t, fc, N = _arr(M, d, t, fc, N)
    return _ndrc_speed_for_x(_x_over_d_for_perforation(t / d), M, d, fc, N)


def degen_perforation_velocity(M: ArrayLike, d: ArrayLike, t: ArrayLike, fc: ArrayLike,
                               N: ArrayLike = 0.72) -> np.ndarray:
    """Ballistic limit of a slab of thickness t (m) by Degen's relation on the modified
    NDRC penetration, m/s: the strike speed whose Degen perforation thickness
    (:func:`degen_perforation_thickness`, DOE-STD-3014 App. C Eqs. C-613/C-614)
    equals t, through :func:`ndrc_G` inverted."""
    M, d, t, fc, N = _arr(M, d, t, fc, N)
    return _ndrc_speed_for_x(_x_over_d_for_degen(t / d), M, d, fc, N)


# --- UKAEA / Barr ----------------------------------------------------------------

def ukaea_penetration(M: ArrayLike, d: ArrayLike, v: ArrayLike, fc: ArrayLike,
                      N: ArrayLike = 0.72) -> np.ndarray:
    """Penetration depth by the UKAEA formula, m (Barr 1990; Li et al. 2005
    — from memory), with G of the NDRC formula (:func:`ndrc_G`):

    x/d = 0.275 − √(0.0756 − G) for G ≤ 0.0726;
    x/d = √(4G − 0.242) for 0.0726 ≤ G ≤ 1.0605;
    x/d = G + 0.9395 for G ≥ 1.0605.

    The branches meet at x/d = 0.22 and 2.0. Fitted to 25 ≤ V ≤ 300 m/s.
    """
    d = np.asarray(d, float)
    Gv = ndrc_G(M, d, v, fc, N)
    low = 0.275 - np.sqrt(np.maximum(0.0756 - Gv, 0.0))
    mid = np.sqrt(np.maximum(4.0 * Gv - 0.242, 0.0))
    r = np.where(Gv <= 0.0726, low, np.where(Gv <= 1.0605, mid, Gv + 0.9395))
    # the fit leaves 5·10⁻⁵·d at G = 0; no speed, no crater
    return np.where(Gv > 0.0, np.maximum(r, 0.0), 0.0) * d


def barr_ballistic_limit(M: ArrayLike, perimeter: ArrayLike, t: ArrayLike,
                         fc: ArrayLike, rho_c: ArrayLike,
                         r_percent: ArrayLike) -> np.ndarray:
    """Perforation (ballistic limit) speed of a reinforced concrete slab, m/s
    (Barr 1990, UKAEA extension of the CEA-EDF formula; Li et al. 2005 —
    from memory):

    V_p = 1.3 · ρ_c^(1/6) · f_c^(1/2) · (p·t²/(π·M))^(2/3) · (r + 0.3)^(1/2)

    ρ_c kg/m³, f_c Pa, p contact perimeter m (πd for a round missile), t slab
    thickness m, M kg, r bending reinforcement in percent of the section each
    way each face. The published rebar-spacing factor (≥ 1 for close spacing)
    is left out (conservative).
    """
    M, p, t, fc, rho, r = _arr(M, perimeter, t, fc, rho_c, r_percent)
    return (1.3 * rho ** (1.0 / 6.0) * np.sqrt(fc) * (p * t**2 / (math.pi * M)) ** (2.0 / 3.0)
            * np.sqrt(np.maximum(r, 0.0) + 0.3))


# --- Chang -----------------------------------------------------------------------

def chang_perforation_thickness(M: ArrayLike, d: ArrayLike, v: ArrayLike,
                                fc: ArrayLike) -> np.ndarray:
    """Perforation thickness by Chang's formula, m (Chang 1981; Li et al. 2005
    — from memory):

    e/d = (u/V)^0.25 · (M·V²/(d³·f_c))^0.5, u = 60.96 m/s (200 ft/s).
    """
    M, d, v, fc = _arr(M, d, v, fc)
    w: np.ndarray = np.maximum(v, 1e-12)
    return (_CHANG_U / w) ** 0.25 * np.sqrt(M * w**2 / (d**3 * fc)) * d


def chang_scabbing_thickness(M: ArrayLike, d: ArrayLike, v: ArrayLike,
                             fc: ArrayLike) -> np.ndarray:
    """Scabbing thickness by Chang's formula, m (Chang 1981; Li et al. 2005
    — from memory):

    h_s/d = 1.84 · (u/V)^0.13 · (M·V²/(d³·f_c))^0.4, u = 60.96 m/s.
    """
    M, d, v, fc = _arr(M, d, v, fc)
    w: np.ndarray = np.maximum(v, 1e-12)
    return 1.84 * (_CHANG_U / w) ** 0.13 * (M * w**2 / (d**3 * fc)) ** 0.4 * d


def chang_perforation_velocity(M: ArrayLike, d: ArrayLike, t: ArrayLike,
                               fc: ArrayLike) -> np.ndarray:
    """Speed at which Chang's perforation thickness equals t, m/s:
    V = [(t/d) / (u^0.25·(M/(d³f_c))^0.5)]^(4/3) (:func:`chang_perforation_thickness`
    solved for V)."""
    M, d, t, fc = _arr(M, d, t, fc)
    return ((t / d) / (_CHANG_U**0.25 * np.sqrt(M / (d**3 * fc)))) ** (4.0 / 3.0)


def chang_scabbing_velocity(M: ArrayLike, d: ArrayLike, t: ArrayLike,
                            fc: ArrayLike) -> np.ndarray:
    """Speed at which Chang's scabbing thickness equals t, m/s:
    V = [(t/d) / (1.84·u^0.13·(M/(d³f_c))^0.4)]^(1/0.67)
    (:func:`chang_scabbing_thickness` solved for V)."""
    M, d, t, fc = _arr(M, d, t, fc)
    return ((t / d) / (1.84 * _CHANG_U**0.13 * (M / (d**3 * fc)) ** 0.4)) ** (1.0 / 0.67)


# --- after perforation -----------------------------------------------------------

def residual_velocity(v: ArrayLike, v_bl: ArrayLike) -> np.ndarray:
    """Speed of the object after perforating, m/s:

    V_r = √(V² − V_bl²) for V > V_bl, else 0

    Recht and Ipson (1963), *J. Appl. Mech.* 30, 384–390, energy balance of a
    rigid projectile with the plug's mass neglected (from memory): neglecting the
    plug keeps more speed for the level below (conservative).
    """
    v, vb = _arr(v, v_bl)
    return np.sqrt(np.maximum(v**2 - vb**2, 0.0))


# --- per-point results -----------------------------------------------------------

@dataclass(frozen=True)
class ConcreteDamage:
    """Local damage of a concrete slab at each drop point (arrays of one shape).

    penetration: depth of the crater by the governing family, m (never more than
    the slab). scabbing / perforation: states. h_scabbing / h_perforation: free-
    fall heights at which each starts (m; 0 if already at a standstill start
    speed, ``inf`` never). v_ballistic: perforation speed, m/s. v_residual: speed
    left after perforation, m/s (0 when not perforated). extrapolated: the strike
    speed is outside the calibrated range of a formula that gives the answer.
    governing_family: index into ``families`` of the family with the lowest
    perforation height at each point.
    """

    penetration: np.ndarray
    scabbing: np.ndarray
    perforation: np.ndarray
    h_scabbing: np.ndarray
    h_perforation: np.ndarray
    v_ballistic: np.ndarray
    v_residual: np.ndarray
    extrapolated: np.ndarray
    governing_family: np.ndarray
    families: tuple[str, ...]


def concrete_local_damage(M: ArrayLike, d: ArrayLike, perimeter: ArrayLike,
                          v: ArrayLike, t: ArrayLike, fc: ArrayLike,
                          rho_c: ArrayLike = 2400.0, r_percent: ArrayLike = 0.2,
                          N: ArrayLike = 0.72, v0: ArrayLike = 0.0) -> ConcreteDamage:
    """Local damage of a concrete slab of thickness t by a hard object, the worse
    of three independent families at each point:

    1. modified NDRC penetration with Kennedy's scabbing and perforation relations;
    2. Degen's perforation relation on the same NDRC penetration (DOE-STD-3014
       App. C, Eqs. C-613/C-614);
    3. UKAEA penetration with Barr's ballistic limit (no scabbing relation: it
       takes the scabbing speed of family 4);
    4. Chang's scabbing and perforation thicknesses.

    Scabbing starts at the lowest scabbing speed of families 1 and 4, perforation
    at the lowest ballistic limit of the four (the most onerous family governs;
    :func:`load_family_heights` gives the spread); the penetration is the deepest
    of the NDRC and UKAEA penetrations, capped at t. Heights: h = (V² − v0²)/(2g) with v0 the
    downward speed at release (hoist lowering). Units as in the module docstring.

    The slab counts against scabbing only with t/1.1 and against perforation only
    with t/1.2: DOE-STD-3014 App. C asks for a thickness of at least 1.1·t_s to
    prevent scabbing and 1.2·t_p to prevent perforation (``SCABBING_MARGIN``,
    ``PERFORATION_MARGIN``, applied here to every family). The residual speed is
    taken over the ballistic limit so reduced (more speed for the level below).
    """
    # the start speeds depend on the load and the slab only: computed at the shape of
    # those inputs (often one value for many points), then broadcast against V
    M, d, p, t, fc, rho, r, N = _arr(M, d, perimeter, t, fc, rho_c, r_percent, N)
    for name, a, unit in (("load mass", M, "kg"), ("missile diameter", d, "m"),
                          ("contact perimeter", p, "m"), ("slab thickness", t, "m"),
                          ("concrete strength", fc, "Pa"), ("concrete density", rho, "kg/m³")):
        _require_positive(name, a, unit)
    v, v0 = (np.asarray(a, float) for a in (v, v0))
    x = np.minimum(np.maximum(ndrc_penetration(M, d, v, fc, N),
                              ukaea_penetration(M, d, v, fc, N)), t)
    v = np.broadcast_to(v, x.shape)
    v_scab, v_bl, gov = _start_speeds(M, d, p, t, fc, rho, r, N)
    return _damage(x, v, v0, v_scab, v_bl, gov)


def _start_speeds(M: np.ndarray, d: np.ndarray, p: np.ndarray, t: np.ndarray,
                  fc: np.ndarray, rho: np.ndarray, r: np.ndarray, N: np.ndarray
                  ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Scabbing speed, ballistic limit (m/s) and the index of the governing family of
    :func:`concrete_local_damage` (the slab's DOE margins applied)."""
    ts = t / SCABBING_MARGIN
    v_scab = np.minimum(ndrc_scabbing_velocity(M, d, ts, fc, N),
                        chang_scabbing_velocity(M, d, ts, fc))
    v_perf_all = family_ballistic_limits(M, d, p, t, fc, rho, r, N)
    v_bl = np.min(v_perf_all, axis=0)
    return np.minimum(v_scab, v_bl), v_bl, np.argmin(v_perf_all, axis=0)  # perforated ⇒ scabbed


PERFORATION_MASS_GRID = 256
"""Masses tried at once per round of :func:`perforation_mass`: each round narrows the
bracket on log M by 257×, so 8 rounds narrow it below 2⁻⁶⁰ of its width (257⁸ >
2⁶⁰), as the 60 halvings of :func:`perforation_mass_reference`."""

_PERFORATION_MASS_ROUNDS = math.ceil(60.0 / math.log2(PERFORATION_MASS_GRID + 1.0))
_PERFORATION_MASS_SPAN = 40.0
"""The bracket on log M below ``m_max`` (e⁻⁴⁰ ≈ 4·10⁻¹⁸ of it: no mass that small
perforates a slab)."""


def least_ballistic_limit(load: LiftLoad, deck: Deck, mass: ArrayLike) -> np.ndarray:
    """The least ballistic limit (m/s) over ``load``'s strike orientations and the
    :data:`PERFORATION_FAMILIES` of the concrete ``deck``, for ``load``'s shape at
    each ``mass`` (kg, any shape): min over orientations of
    :func:`family_ballistic_limits` with the slab's DOE margin, as
    :func:`_orientation_speeds` gives it one mass at a time."""
    m = np.asarray(mass, float)
    # one row per orientation: (orientations, *mass.shape), all in one call
    geo = np.array([strike_geometry(o, load.footprint_length, load.footprint_width,
                                    load.edge_width) for o in load.strike_orientations])
    col = (slice(None),) + (None,) * m.ndim
    d, p, n = geo[:, 0][col], geo[:, 1][col], geo[:, 2][col]
    lim = family_ballistic_limits(m, d, p, deck.thickness, deck.concrete.fc,
                                  deck.concrete.density, slab_reinforcement_percent(deck), n)
    return np.min(lim, axis=(0, 1))


@lru_cache(maxsize=1024)
def perforation_mass(load: LiftLoad, deck: Deck, v: float, m_max: float) -> float:
    """The largest mass (kg, at most ``m_max``) of ``load``'s shape that does not
    perforate the concrete ``deck`` when it strikes at ``v`` (m/s) in any of its
    strike orientations (:func:`perforation_mass_reference`, its plain bisection).

    The same bracket [M_lo, M_hi] on log M, with the least ballistic limit
    (:func:`least_ballistic_limit`) above ``v`` at M_lo and not above it at M_hi, is
    narrowed by :data:`PERFORATION_MASS_GRID` masses evaluated in one vectorised
    call per round rather than one mass per halving: the new bracket is the first
    grid mass whose limit is not above ``v`` and the mass before it, so the bracket
    keeps its two ends' property whether or not the limit is monotone in between;
    8 rounds leave it as narrow as 60 halvings. ``m_max`` where that mass stays
    below its ballistic limit (a steel deck: its plate formula is checked by the
    forward run); 0 where every mass perforates. Remembered per (load, deck, v,
    m_max): frozen model objects, so a re-analysis after an edit elsewhere finds it."""
    if deck.is_steel or not (m_max > 0.0) or not (v > 0.0):
        return m_max
    hi = math.log(m_max)
    lo = hi - _PERFORATION_MASS_SPAN
    ends = least_ballistic_limit(load, deck, np.exp(np.array([hi, lo])))
    if ends[0] > v:
        return m_max
    if ends[1] <= v:
        return 0.0
    frac = np.arange(1, PERFORATION_MASS_GRID + 1) / (PERFORATION_MASS_GRID + 1.0)
    for _ in range(_PERFORATION_MASS_ROUNDS):
        grid = lo + (hi - lo) * frac
        below = least_ballistic_limit(load, deck, np.exp(grid)) <= v
        j = int(np.argmax(below)) if below.any() else grid.size
        new_lo = grid[j - 1] if j > 0 else lo
        hi = float(grid[j]) if j < grid.size else hi
        lo = float(new_lo)
    return math.exp(lo)


def perforation_mass_reference(load: LiftLoad, deck: Deck, v: float, m_max: float) -> float:
    """:func:`perforation_mass` by plain bisection: the ballistic limit of every
    family (:func:`family_ballistic_limits`, the least governs) falls as the mass
    grows, so the mass where the least of them equals ``v`` (m/s) is found by
    bisection on log M (60 halvings: a relative width below 1e-9 of the bracket).
    ``m_max`` (kg) where even that mass stays below its ballistic limit; 0 where
    every mass perforates. The calculation trace uses it."""
    if deck.is_steel or not (m_max > 0.0) or not (v > 0.0):
        return m_max

    def v_bl(m: float) -> float:
        return min(row[3] for row in _orientation_speeds(load, deck, m))

    if v_bl(m_max) > v:
        return m_max
    lo, hi = math.log(m_max) - _PERFORATION_MASS_SPAN, math.log(m_max)
    if v_bl(math.exp(lo)) <= v:
        return 0.0
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if v_bl(math.exp(mid)) > v:
            lo = mid
        else:
            hi = mid
    return math.exp(lo)


PERFORATION_FAMILIES: tuple[str, ...] = ("modified NDRC + Kennedy", "Degen",
                                         "UKAEA / Barr", "Chang")
"""The independent perforation families of :func:`concrete_local_damage`, in the
order of :func:`family_ballistic_limits`; the most onerous (lowest ballistic limit)
governs the verdict at every point."""


def family_ballistic_limits(M: ArrayLike, d: ArrayLike, p: ArrayLike, t: ArrayLike,
                            fc: ArrayLike, rho: ArrayLike, r: ArrayLike,
                            N: ArrayLike = 0.72) -> np.ndarray:
    """Ballistic limit of the slab t (m) by each of :data:`PERFORATION_FAMILIES`, m/s,
    stacked on a first axis: modified NDRC + Kennedy/ACE
    (:func:`ndrc_perforation_velocity`), Degen on the NDRC penetration
    (:func:`degen_perforation_velocity`), Barr (:func:`barr_ballistic_limit`) and
    Chang (:func:`chang_perforation_velocity`), each on t/1.2 (DOE-STD-3014 App. C,
    ``PERFORATION_MARGIN``). Their spread is the scatter between published fits;
    the verdict takes the lowest."""
    M, d, p, t, fc, rho, r, N = _arr(M, d, p, t, fc, rho, r, N)
    tp = t / PERFORATION_MARGIN
    return np.stack([ndrc_perforation_velocity(M, d, tp, fc, N),
                     degen_perforation_velocity(M, d, tp, fc, N),
                     barr_ballistic_limit(M, p, tp, fc, rho, r),
                     chang_perforation_velocity(M, d, tp, fc)])


def load_family_heights(load: LiftLoad, deck: Deck, v0: float = 0.0
                        ) -> dict[str, dict[str, float]]:
    """The free-fall height (m, from the downward speed v0 m/s) at which each of
    :data:`PERFORATION_FAMILIES` has ``load`` perforate the concrete ``deck``, per
    strike orientation: ``{orientation: {family: height}}`` — the spread between the
    families, for the calculation trace and the annex (the verdict takes the
    lowest). Empty for a steel deck (one formula, BRL)."""
    if deck.is_steel:
        return {}
    out: dict[str, dict[str, float]] = {}
    for o in load.strike_orientations:
        d, p, n = strike_geometry(o, load.footprint_length, load.footprint_width,
                                  load.edge_width)
        v = family_ballistic_limits(load.mass, d, p, deck.thickness, deck.concrete.fc,
                                    deck.concrete.density, slab_reinforcement_percent(deck),
                                    n)
        h = drop_height_for_speed(np.maximum(v, v0), v0)
        out[o] = {f: float(h[i]) for i, f in enumerate(PERFORATION_FAMILIES)}
    return out


def _damage(x: np.ndarray, v: np.ndarray, v0: ArrayLike, v_scab: ArrayLike,
            v_bl: ArrayLike, gov: ArrayLike) -> ConcreteDamage:
    """:class:`ConcreteDamage` from the penetration x (m) and strike speed v (m/s) at
    each point and the start speeds of :func:`_start_speeds`."""
    gov = np.array(np.broadcast_to(gov, x.shape))
    v_bl = np.array(np.broadcast_to(v_bl, x.shape))
    v_scab = np.broadcast_to(v_scab, x.shape)
    v0 = np.broadcast_to(np.asarray(v0, float), x.shape)
    perforation = v >= v_bl
    scabbing = v >= v_scab
    extrapolated = (NDRC_KENNEDY.extrapolated(v) | DEGEN.extrapolated(v)
                    | UKAEA_BARR.extrapolated(v) | CHANG.extrapolated(v))
    return ConcreteDamage(
        penetration=x, scabbing=scabbing, perforation=perforation,
        h_scabbing=drop_height_for_speed(np.maximum(v_scab, v0), v0),
        h_perforation=drop_height_for_speed(np.maximum(v_bl, v0), v0),
        v_ballistic=v_bl, v_residual=residual_velocity(v, v_bl),
        extrapolated=extrapolated, governing_family=gov,
        families=PERFORATION_FAMILIES)


# --- steel plate -----------------------------------------------------------------

_BRL_SI = 1.4396e9
"""Constant of the BRL formula in SI units (N/m², i.e. J/m³ — from memory)."""


def brl_plate_perforation_thickness(M: ArrayLike, d: ArrayLike, v: ArrayLike,
                                    K: ArrayLike = 1.0) -> np.ndarray:
    """Steel plate thickness just perforated, m, by the BRL formula (Li et al.
    2005; DOE-STD-3014 App. C — from memory):

    e^1.5 = 0.5·M·V² / (1.4396·10⁹ · K² · d^1.5)

    M kg, V m/s, d m; K ≈ 1 a steel-grade coefficient. The US form
    T^1.5 = 0.5·M·V²/(17 400·K²·D^1.5) (slug, ft/s, in) gives the same thickness.
    """
    M, d, v, K = _arr(M, d, v, K)
    return (0.5 * M * v**2 / (_BRL_SI * K**2 * d**1.5)) ** (2.0 / 3.0)


def brl_plate_ballistic_limit(M: ArrayLike, d: ArrayLike, t: ArrayLike,
                              K: ArrayLike = 1.0) -> np.ndarray:
    """Ballistic limit of a steel plate of thickness t (m) by the BRL formula, m/s:
    V_bl = √(2·1.4396·10⁹·K²·d^1.5·t^1.5 / M) (:func:`brl_plate_perforation_thickness`
    solved for V)."""
    M, d, t, K = _arr(M, d, t, K)
    return np.sqrt(2.0 * _BRL_SI * K**2 * d**1.5 * t**1.5 / M)


@dataclass(frozen=True)
class PlateDamage:
    """Perforation of a steel plate deck at each drop point: state, the free-fall
    height at which it starts (m), ballistic limit and residual speed (m/s) and
    the extrapolation flag (BRL test speeds)."""

    perforation: np.ndarray
    h_perforation: np.ndarray
    v_ballistic: np.ndarray
    v_residual: np.ndarray
    extrapolated: np.ndarray


def plate_local_damage(M: ArrayLike, d: ArrayLike, v: ArrayLike, t: ArrayLike,
                       K: ArrayLike = 1.0, v0: ArrayLike = 0.0) -> PlateDamage:
    """Perforation of a steel plate (or the plate of a grating taken as solid) of
    thickness t by a hard object of equivalent diameter d, BRL formula
    (:func:`brl_plate_ballistic_limit`); residual speed by Recht and Ipson
    (:func:`residual_velocity`)."""
    M, d, v, t, K, v0 = _arr(M, d, v, t, K, v0)
    for name, a, unit in (("load mass", M, "kg"), ("missile diameter", d, "m"),
                          ("plate thickness", t, "m")):
        _require_positive(name, a, unit)
    v_bl = brl_plate_ballistic_limit(M, d, t, K)
    return PlateDamage(perforation=v >= v_bl,
                       h_perforation=drop_height_for_speed(np.maximum(v_bl, v0), v0),
                       v_ballistic=v_bl, v_residual=residual_velocity(v, v_bl),
                       extrapolated=BRL_STEEL.extrapolated(v))


# --- steel plate denting -----------------------------------------------------------

DENT_LIMIT = 0.025
"""Dent depth of a steel plate deck that the permit reports the drop height for, m
(25 mm: a plate dented deeper is a trip hazard and is replaced — a serviceability
limit, common practice, no source; the safety limit is perforation, BRL)."""

DENT_RUPTURE_STRAIN = 0.10
"""Membrane strain beyond which a steel plate indented by a hard object may tear (mild
steel under a punch, from memory); a dent past it is flagged outside the method's
validity and perforation (BRL) is the verdict's measure."""


def plate_dent_stiffness(t: ArrayLike, fy: ArrayLike, a: ArrayLike, R: ArrayLike
                         ) -> np.ndarray:
    """Coefficient k (N/m) of the plastic membrane energy of a steel plate dented by a
    rigid flat punch, D(W) = k·W², J (W the dent depth, m):

    k = π·f_y·t·(R + a) / (2·(R − a))

    Rigid–perfectly plastic plate, clamped at radius R (m) around a punch of radius a
    (m), conical mode: the generator of slope β = W/(R − a) stretches by β²/2, the
    membrane force per width is N_0 = f_y·t, over the annulus π(R² − a²). The
    kinematic (mode) method of Jones, *Structural Impact* (1989), ch. 7 approximate
    methods — from memory; bending at the hinge circles is left out (less
    resistance: a deeper dent, conservative: the bending work is t/W of the
    membrane work), while the small-slope strain β²/2 reads the stretch
    √(1 + β²) − 1 high by up to β²/4; the net is conservative where
    t/W ≥ β²/4, which :func:`plate_dent_valid` requires. t m, f_y Pa. NaN where a ≥ R (the
    footprint covers the panel: no dent mode, the framing checks govern)."""
    t, fy, a, R = _arr(t, fy, a, R)
    with np.errstate(divide="ignore", invalid="ignore"):
        k = math.pi * fy * t * (R + a) / (2.0 * (R - a))
    return np.where(R > a, k, np.nan)


def plate_dent_depth(M: ArrayLike, h_e: ArrayLike, k: ArrayLike) -> np.ndarray:
    """Dent depth W (m) of a plate of membrane coefficient k (N/m,
    :func:`plate_dent_stiffness`) struck by a mass M (kg) after an energy height h_e
    (m; the fall plus v_h²/2g): the energy balance M·g·(h_e + W) = k·W² solved,

    W = [M·g + √((M·g)² + 4·k·M·g·h_e)] / (2k)

    (the load's weight keeps working through the dent, as in the framing's energy
    balance, Gere 7th ed. §9.10). Rigid–plastic: valid where the kinetic energy is
    large against the plate's elastic energy."""
    M, h_e, k = _arr(M, h_e, k)
    Mg = M * G
    return (Mg + np.sqrt(Mg**2 + 4.0 * k * Mg * np.maximum(h_e, 0.0))) / (2.0 * k)


def plate_dent_height(M: ArrayLike, W: ArrayLike, k: ArrayLike,
                      v0: ArrayLike = 0.0) -> np.ndarray:
    """Free fall (m, from the downward speed v0 m/s) at which the dent reaches W (m):
    :func:`plate_dent_depth` solved for the energy height, h_e = (k·W² − M·g·W)/(M·g),
    less v0²/(2g); 0 where the weight alone dents it that deep."""
    M, W, k, v0 = _arr(M, W, k, v0)
    Mg = M * G
    return np.maximum((k * W**2 - Mg * W) / Mg - v0**2 / (2.0 * G), 0.0)


def plate_dent_strain(W: ArrayLike, a: ArrayLike, R: ArrayLike) -> np.ndarray:
    """Membrane strain of the conical dent mode, ε = ½·(W/(R − a))² (small slopes;
    :func:`plate_dent_stiffness`), dimensionless."""
    W, a, R = _arr(W, a, R)
    with np.errstate(divide="ignore", invalid="ignore"):
        return 0.5 * (W / (R - a)) ** 2


def plate_dent_valid(W: ArrayLike, t: ArrayLike, a: ArrayLike, R: ArrayLike
                     ) -> np.ndarray:
    """Whether the membrane dent estimate is within its validity: the dent at least
    the plate thickness (membrane action; shallower dents are bending-governed and
    the membrane-only energy over-predicts them, conservative), the membrane
    strain at most :data:`DENT_RUPTURE_STRAIN`, and the bending work left out (t/W
    of the membrane work) at least the small-slope strain's excess (β²/4), so the
    estimate stays on the deep side: t ≥ W³/(4(R − a)²)."""
    W, t, a, R = _arr(W, t, a, R)
    with np.errstate(divide="ignore", invalid="ignore"):
        net = t >= W**3 / (4.0 * (R - a) ** 2)
    return (W >= t) & (plate_dent_strain(W, a, R) <= DENT_RUPTURE_STRAIN) & (R > a) & net


# --- a load on a deck ------------------------------------------------------------

@dataclass(frozen=True)
class LoadDamage:
    """Local damage of a deck by one hard load at each drop point, worst over the
    strike orientations checked.

    orientations: the orientations checked (the load's ``strike_orientations``);
    reason: why some were left out ("" when all three). by_orientation: the
    :class:`ConcreteDamage` of each. The worst-case arrays: penetration (deepest),
    scabbing / perforation (any orientation), h_scabbing / h_perforation (lowest
    start height, m), v_residual (highest, m/s), extrapolated (any), and
    governing: index into ``orientations`` of the orientation with the lowest
    perforation height at each point. On a steel plate or grating deck
    (:func:`plate_local_damage`) the penetration is ``nan`` (not defined), scabbing
    never occurs (``False``, start height ``inf``) and ``by_orientation`` holds
    :class:`PlateDamage`.
    """

    orientations: tuple[str, ...]
    reason: str
    by_orientation: tuple[ConcreteDamage | PlateDamage, ...]
    penetration: np.ndarray
    scabbing: np.ndarray
    perforation: np.ndarray
    h_scabbing: np.ndarray
    h_perforation: np.ndarray
    v_residual: np.ndarray
    extrapolated: np.ndarray
    governing: np.ndarray


def is_hard(load: LiftLoad) -> bool:
    """Whether a load is a hard object for local damage: ``load.hard`` when given;
    otherwise a rigging item (spreader, shackle, hook block) whose underside is not
    declared soft (no ``contact_stiffness``: skid, dunnage, bearers). A load's own
    structure (a unit, a crate, a bundle) crushes before it punches a hole; it is
    judged by the contact and slab checks instead (common practice, no source)."""
    if load.hard is not None:
        return load.hard
    return load.kind == "rigging" and load.contact_stiffness is None


def slab_reinforcement_percent(deck: Deck) -> float:
    """Bending reinforcement of the slab in percent of its section, for Barr's
    formula: 100·A_s/t (A_s bottom bars per metre width, m²/m; t slab depth, m).
    Only the bottom layer is declared, so this undercounts a slab with top bars
    (conservative: a lower ballistic limit)."""
    return 100.0 * deck.rebar_area / deck.thickness


@lru_cache(maxsize=256)
def _load_start_speeds(load: LiftLoad, deck: Deck
                       ) -> tuple[tuple[float, float, float, float, int], ...]:
    """Per strike orientation of ``load``: (d_eq m, N*, scabbing speed m/s, ballistic
    limit m/s, governing family) on ``deck`` — they depend on the load and the slab
    only, so they are worked out once (frozen, hashable model objects)."""
    return _orientation_speeds(load, deck, load.mass)


def _orientation_speeds(load: LiftLoad, deck: Deck, mass: float
                        ) -> tuple[tuple[float, float, float, float, int], ...]:
    """:func:`_load_start_speeds` of ``load``'s shape at ``mass`` (kg), uncached."""
    out = []
    for o in load.strike_orientations:
        d, p, n = strike_geometry(o, load.footprint_length, load.footprint_width,
                                  load.edge_width)
        args = _arr(mass, d, p, deck.thickness, deck.concrete.fc,
                    deck.concrete.density, slab_reinforcement_percent(deck), n)
        v_scab, v_bl, gov = _start_speeds(*args)
        out.append((d, n, float(v_scab), float(v_bl), int(gov)))
    return tuple(out)


def check_load_on_grating(load: LiftLoad, deck: Deck) -> None:
    """Refuse a load that can pass between the bearing bars of a grating deck: its
    smaller plan side min(L, W) not more than the clear gap p − t_b (m). droprig
    cannot assess such a drop on the grating (the load goes through to the level
    below); the user lays a plate or mat, or models the deck as an opening. Raises
    :class:`~droprig.model.ModelError` naming the load's footprint width (plain
    geometry; common practice, no source). Nothing to check on other decks."""
    if deck.kind != "grating":
        return
    gap = deck.bar_pitch - deck.bar_thickness
    small = min(load.footprint_length, load.footprint_width)
    if small <= gap:
        raise ModelError(f"load {load.name}.footprint_width", small,
                         f"> {gap:g} m, the clear gap between the bearing bars of the "
                         "grating (a smaller load passes through it; lay a plate or mat "
                         "over the grating)", "m")


@lru_cache(maxsize=256)
def _load_plate_limits(load: LiftLoad, deck: Deck) -> tuple[tuple[float, float], ...]:
    """Per strike orientation of ``load``: (d_eq m, ballistic limit m/s) of the steel
    plate or grating ``deck`` by BRL (:func:`brl_plate_ballistic_limit`) on
    ``deck.steel_depth`` / :data:`PLATE_PERFORATION_MARGIN`."""
    t = deck.steel_depth / PLATE_PERFORATION_MARGIN
    out = []
    for o in load.strike_orientations:
        d, _, _ = strike_geometry(o, load.footprint_length, load.footprint_width,
                                  load.edge_width)
        out.append((d, float(brl_plate_ballistic_limit(load.mass, d, t))))
    return tuple(out)


def plate_deck_damage(load: LiftLoad, deck: Deck, h: ArrayLike,
                      v0: ArrayLike = 0.0) -> LoadDamage:
    """Perforation of a steel plate or grating deck by ``load`` falling h (m) from a
    downward speed v0 (m/s), worst of its strike orientations: BRL ballistic limit
    (:func:`brl_plate_ballistic_limit`, K = 1) of the deck's steel per plan area
    (``Deck.steel_depth``: the plate thickness; for a grating the bars smeared,
    h·t_b/p — common practice, no source: a small item may pass between bars, which
    no formula here covers) reduced by :data:`PLATE_PERFORATION_MARGIN`; residual
    speed by Recht and Ipson (:func:`residual_velocity`). The BRL fit's test speeds
    lie far above a dropped load's (``extrapolated``)."""
    h = np.asarray(h, float)
    v = impact_speed(h, v0)
    v0a = np.broadcast_to(np.asarray(v0, float), v.shape)
    parts = []
    for _d, v_bl in _load_plate_limits(load, deck):
        vb = np.full(v.shape, v_bl)
        parts.append(PlateDamage(perforation=v >= vb,
                                 h_perforation=drop_height_for_speed(np.maximum(vb, v0a), v0a),
                                 v_ballistic=vb, v_residual=residual_velocity(v, vb),
                                 extrapolated=BRL_STEEL.extrapolated(v)))
    h_perf = np.stack([c.h_perforation for c in parts])
    return LoadDamage(
        orientations=tuple(load.strike_orientations), reason=load.strike_reason,
        by_orientation=tuple(parts),
        penetration=np.full(v.shape, np.nan),
        scabbing=np.zeros(v.shape, dtype=bool),
        perforation=np.any(np.stack([c.perforation for c in parts]), axis=0),
        h_scabbing=np.full(v.shape, np.inf),
        h_perforation=np.min(h_perf, axis=0),
        v_residual=np.max(np.stack([c.v_residual for c in parts]), axis=0),
        extrapolated=np.any(np.stack([c.extrapolated for c in parts]), axis=0),
        governing=np.argmin(h_perf, axis=0))


def load_local_damage(load: LiftLoad, deck: Deck, h: ArrayLike,
                      v0: ArrayLike = 0.0) -> LoadDamage:
    """Local damage of ``deck`` by ``load`` falling h (m, per drop point) from a
    downward speed v0 (m/s): :func:`concrete_local_damage` for each of the load's
    strike orientations (:func:`strike_geometry` from its footprint and edge
    width), the worst governing at each point. The slab is the deck's full
    depth with its concrete and bottom reinforcement. A steel plate or grating deck:
    :func:`plate_deck_damage`."""
    if deck.is_steel:
        return plate_deck_damage(load, deck, h, v0)
    h = np.asarray(h, float)
    v = impact_speed(h, v0)
    fc = deck.concrete.fc
    parts = []
    for d, n, v_scab, v_bl, gov in _load_start_speeds(load, deck):
        x = np.minimum(np.maximum(ndrc_penetration(load.mass, d, v, fc, n),
                                  ukaea_penetration(load.mass, d, v, fc, n)), deck.thickness)
        parts.append(_damage(x, v, v0, v_scab, v_bl, gov))
    h_perf = np.stack([c.h_perforation for c in parts])
    return LoadDamage(
        orientations=tuple(load.strike_orientations), reason=load.strike_reason,
        by_orientation=tuple(parts),
        penetration=np.max(np.stack([c.penetration for c in parts]), axis=0),
        scabbing=np.any(np.stack([c.scabbing for c in parts]), axis=0),
        perforation=np.any(np.stack([c.perforation for c in parts]), axis=0),
        h_scabbing=np.min(np.stack([c.h_scabbing for c in parts]), axis=0),
        h_perforation=np.min(h_perf, axis=0),
        v_residual=np.max(np.stack([c.v_residual for c in parts]), axis=0),
        extrapolated=np.any(np.stack([c.extrapolated for c in parts]), axis=0),
        governing=np.argmin(h_perf, axis=0))


DISTINCT_HEIGHTS_KEPT = 8
""":func:`distinct_height_damage` remembers its answer when the points have at most
this many distinct heights (a zone's planned drops: one or a few)."""


@lru_cache(maxsize=512)
def _damage_at_heights(load: LiftLoad, deck: Deck, heights: tuple[float, ...],
                       v0: float) -> LoadDamage:
    return load_local_damage(load, deck, np.array(heights, dtype=float), v0)


def distinct_height_damage(load: LiftLoad, deck: Deck, h: ArrayLike,
                           v0: float = 0.0) -> tuple[LoadDamage, np.ndarray]:
    """:func:`load_local_damage` of ``load`` on ``deck`` at the distinct values of the
    drop heights h (m, per point; free fall from the downward speed v0, m/s), and the
    index of each point's height among them (``LoadDamage`` field ``[index]`` is the
    point's). The damage depends on the point only through its height, and a zone's
    drop points share a few heights (the planned one), so the formulas run once per
    height, not once per point; the answer is remembered per (load, deck, heights,
    v0) for at most :data:`DISTINCT_HEIGHTS_KEPT` heights (frozen model objects)."""
    hs, index = np.unique(np.asarray(h, float), return_inverse=True)
    if hs.size <= DISTINCT_HEIGHTS_KEPT and np.isfinite(hs).all():
        return _damage_at_heights(load, deck, tuple(hs.tolist()), float(v0)), index.ravel()
    return load_local_damage(load, deck, hs, v0), index.ravel()

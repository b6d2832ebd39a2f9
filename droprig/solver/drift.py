"""Drift of the landing point of a dropped load: how far from the hook's plan
position the load can land when it is let go while the crane moves.

Plain kinematics (no air drag, which would only shorten the drift), SI units:
heights and lengths m, speeds m/s, slew speed rad/s, angles rad, times s.

* Fall time from a downward speed v0 (hoist lowering): h = v0·t + g·t²/2 ⇒
  t = (√(v0² + 2gh) − v0)/g.
* Slew: at radius R the load moves sideways at ω·R and keeps that speed while it
  falls: drift ω·R·t.
* Radial speed (luffing or trolleying) v_r: drift v_r·t.
* Pendulum swing of amplitude θ on a rope of length L: the load may be let go
  anywhere in the swing. Its offset is at most L·sin θ and its speed at most
  √(2gL(1 − cos θ)) (energy); for a harmonic swing the worst combination of
  offset A·sin φ and travel A·ω_p·t·cos φ is A·√(1 + (ω_p·t)²), which is
  √(offset² + (speed·t)²) — used for any θ.
* Total: the sum of the three (they may line up; common practice, no source).

Sources: uniform acceleration and the simple pendulum in any dynamics text
(e.g. Meriam & Kraige, *Engineering Mechanics: Dynamics*, ch. 2 and 8 — from
memory); v = ω·R for the slew.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import LiftZone, Project

__all__ = [
    "Drift",
    "G",
    "fall_time",
    "landing_drift",
    "radial_drift",
    "resolve_drift",
    "slew_drift",
    "swing_drift",
    "zone_drift_margin",
]

G = 9.80665
"""Standard gravity, m/s² (CGPM 1901; ISO 80000-3)."""


def fall_time(h: ArrayLike, v0: ArrayLike = 0.0) -> np.ndarray:
    """Time to fall h (m) from a downward speed v0 (m/s), s:
    t = (√(v0² + 2gh) − v0)/g; v0 = 0 gives √(2h/g)."""
    h, v0 = (np.asarray(a, float) for a in np.broadcast_arrays(h, v0))
    return (np.sqrt(v0**2 + 2.0 * G * np.maximum(h, 0.0)) - v0) / G


def slew_drift(omega: ArrayLike, radius: ArrayLike, t: ArrayLike) -> np.ndarray:
    """Sideways travel of a load let go while slewing, m: ω·R·t (ω rad/s, R m, t s)."""
    return np.abs(np.asarray(omega, float)) * np.asarray(radius, float) * np.asarray(t, float)


def radial_drift(v_radial: ArrayLike, t: ArrayLike) -> np.ndarray:
    """Radial travel of a load let go while luffing or trolleying, m: v_r·t."""
    return np.abs(np.asarray(v_radial, float)) * np.asarray(t, float)


def swing_drift(length: ArrayLike, angle: ArrayLike, t: ArrayLike) -> np.ndarray:
    """Worst landing offset of a load let go anywhere in a pendulum swing, m:

    √((L·sin θ)² + (√(2gL(1 − cos θ))·t)²)

    L rope length from the suspension point, m; θ swing amplitude, rad; t fall
    time, s. For a small harmonic swing this is A·√(1 + (ω_p·t)²) with A = L·θ,
    ω_p = √(g/L), the maximum over the phase of A·sin φ + A·ω_p·t·cos φ.
    """
    L, th, t = (np.asarray(a, float) for a in np.broadcast_arrays(length, angle, t))
    offset = L * np.sin(np.abs(th))
    speed = np.sqrt(2.0 * G * L * (1.0 - np.cos(th)))
    return np.sqrt(offset**2 + (speed * t) ** 2)


@dataclass(frozen=True)
class Drift:
    """Landing drift and its parts, m; fall time, s; strike speed, m/s."""

    total: np.ndarray
    slew: np.ndarray
    radial: np.ndarray
    swing: np.ndarray
    fall_time: np.ndarray
    strike_speed: np.ndarray


def landing_drift(h: ArrayLike, radius: ArrayLike, omega: ArrayLike = 0.0,
                  v_hoist: ArrayLike = 0.0, v_radial: ArrayLike = 0.0,
                  swing_length: ArrayLike = 0.0, swing_angle: ArrayLike = 0.0) -> Drift:
    """Drift margin of the landing point (module docstring): fall time from the
    hoist's lowering speed, then slew + radial + swing drift. Also returns the
    strike speed √(v0² + 2gh) — lowering adds to it."""
    t = fall_time(h, v_hoist)
    s = slew_drift(omega, radius, t)
    r = radial_drift(v_radial, t)
    w = swing_drift(swing_length, swing_angle, t)
    v0 = np.asarray(v_hoist, float)
    return Drift(total=s + r + w, slew=s, radial=r, swing=w, fall_time=t,
                 strike_speed=np.sqrt(v0**2 + 2.0 * G * np.maximum(np.asarray(h, float), 0.0)))


def zone_drift_margin(zone: LiftZone, surface_elevation: float) -> float:
    """Drift margin used for a lift zone, m.

    ``zone.drift_mode == "given"``: the user's ``drift_margin``. ``"computed"``:
    the largest :func:`landing_drift` over the zone's loads, each falling from its
    own height above the surface at ``surface_elevation`` (m), at the outer
    radius r_max with the zone's slew, hoist, radial and swing data.
    """
    if zone.drift_mode == "given":
        return zone.drift_margin
    worst = 0.0
    for ld in zone.loads:
        h = ld.height_above(surface_elevation)
        d = landing_drift(h, zone.r_max, zone.slew_speed or 0.0, zone.hoist_speed,
                          zone.radial_speed, zone.swing_length, zone.swing_angle)
        worst = max(worst, float(d.total))
    if not math.isfinite(worst):
        raise ValueError(f"zone {zone.id}: drift margin is not finite")
    return worst


def resolve_drift(project: Project) -> Project:
    """The project with every ``computed`` zone's ``drift_margin`` replaced by
    :func:`zone_drift_margin` on its own level, so that the drop points, the plan
    and the annex all use the computed margin. Zones in ``given`` mode are left
    as entered. A computed margin beyond the model's range raises the model's
    :class:`~droprig.model.ModelError` naming the zone's ``drift_margin``."""
    zones = []
    changed = False
    for z in project.lift_zones:
        if z.drift_mode == "computed":
            m = zone_drift_margin(z, project.level(z.level_id).elevation)
            if m != z.drift_margin:
                z = dataclasses.replace(z, drift_margin=m)
                changed = True
        zones.append(z)
    return dataclasses.replace(project, lift_zones=tuple(zones)) if changed else project

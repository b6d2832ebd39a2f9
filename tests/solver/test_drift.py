"""Landing drift against hand calculations and a numerical reference.

Sources: uniform acceleration and the simple pendulum (Meriam & Kraige,
*Engineering Mechanics: Dynamics*, ch. 2 and 8 — from memory); v = ω·R for a
point at radius R of a body turning at ω; scipy ``solve_ivp`` as the numerical
reference for the fall and the nonlinear pendulum.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.model import LiftLoad, LiftZone
from droprig.solver import drift

G = 9.80665
HAND = 1e-4  # hand calculations written to 4–5 figures
ODE = 1e-6  # solve_ivp at rtol 1e-10
PENDULUM_SMALL = 0.02  # harmonic closed form vs nonlinear pendulum at ≤ 10°


def test_slew_drift_hand_calculation() -> None:
    # ω = 0.1 rad/s at R = 20 m: 2 m/s sideways. Fall 4.9 m: t = √(2·4.9/9.80665)
    # = 0.99966 s, drift = 2 × 0.99966 = 1.9993 m.
    d = drift.landing_drift(4.9, 20.0, omega=0.1)
    assert float(d.fall_time) == pytest.approx(0.99966, rel=HAND)
    assert float(d.total) == pytest.approx(1.9993, rel=HAND)
    assert float(d.strike_speed) == pytest.approx(math.sqrt(2 * G * 4.9), rel=1e-12)


def test_hoist_lowering_hand_calculation() -> None:
    # v0 = 1 m/s down, h = 4.9 m: t = (√(1 + 2·9.80665·4.9) − 1)/9.80665
    # = (9.85420 − 1)/9.80665 = 0.90287 s; strike speed 9.8542 m/s;
    # slew 0.05 rad/s at 30 m: 1.5 m/s × 0.90287 = 1.3543 m.
    d = drift.landing_drift(4.9, 30.0, omega=0.05, v_hoist=1.0)
    assert float(d.fall_time) == pytest.approx(0.90287, rel=HAND)
    assert float(d.strike_speed) == pytest.approx(9.8542, rel=HAND)
    assert float(d.slew) == pytest.approx(1.3543, rel=HAND)


@pytest.mark.parametrize(("h", "v0"), [(1.0, 0.0), (5.0, 0.5), (30.0, 2.0)])
def test_fall_time_against_integration(h: float, v0: float) -> None:
    def rhs(_t: float, y: list[float]) -> list[float]:
        return [y[1], G]

    def hit(_t: float, y: list[float]) -> float:
        return y[0] - h

    hit.terminal = True  # type: ignore[attr-defined]
    sol = solve_ivp(rhs, (0.0, 100.0), [0.0, v0], events=hit, rtol=1e-10, atol=1e-12)
    assert float(drift.fall_time(h, v0)) == pytest.approx(sol.t_events[0][0], rel=ODE)


@pytest.mark.parametrize(("L", "deg", "h"), [(10.0, 5.0, 3.0), (20.0, 10.0, 8.0),
                                             (5.0, 20.0, 2.0)])
def test_swing_drift_against_nonlinear_pendulum(L: float, deg: float, h: float) -> None:
    # integrate the pendulum φ'' = −(g/L) sin φ over a period; the load let go at
    # any instant lands at L sin φ + L φ' cos φ · t. The closed form must bound the
    # worst of these, and match it closely for small swings.
    th = math.radians(deg)
    t_fall = float(drift.fall_time(h))
    period = 2 * math.pi * math.sqrt(L / G) * 1.1
    sol = solve_ivp(lambda _t, y: [y[1], -G / L * math.sin(y[0])], (0.0, period), [th, 0.0],
                    rtol=1e-10, atol=1e-12, dense_output=True)
    phi, dphi = sol.sol(np.linspace(0.0, period, 20001))
    landing = np.abs(L * np.sin(phi) + L * dphi * np.cos(phi) * t_fall)
    closed = float(drift.swing_drift(L, th, t_fall))
    assert closed >= landing.max() * (1 - 1e-6)
    if deg <= 10.0:
        assert closed == pytest.approx(landing.max(), rel=PENDULUM_SMALL)


def _zone(**kw: object) -> LiftZone:
    loads = (LiftLoad("unit", 2000.0, drop_height=4.9),
             LiftLoad("bar", 100.0, drop_height=None, hook_elevation=30.0,
                      hang_length=2.0))
    return LiftZone("Z1", "zone", "L1", (0.0, 0.0), 5.0, 20.0, loads=loads, **kw)  # type: ignore[arg-type]


def test_zone_drift_margin_given_and_computed() -> None:
    z = _zone(drift_margin=0.7)
    assert drift.zone_drift_margin(z, 10.0) == 0.7
    zc = dataclasses.replace(z, drift_mode="computed", slew_speed=0.1)
    # bar: falls 30 − 2 − 10 = 18 m, t = √(36/9.80665) = 1.91601 s; at r_max = 20 m
    # and 0.1 rad/s: 2 m/s × 1.91601 = 3.8320 m (worse than the unit's 1.9993 m)
    assert drift.zone_drift_margin(zc, 10.0) == pytest.approx(3.8320, rel=HAND)


def test_resolve_drift_fills_computed_zones_only() -> None:
    from droprig.model import ColumnGrid, Level, ModelError, Project

    grid = ColumnGrid((0.0, 6.0), (0.0, 8.0), ("1", "2"), ("A", "B"))
    level = Level("L1", "roof", 10.0, grid, ())
    given = _zone(drift_margin=0.7)
    computed = dataclasses.replace(_zone(), id="Z2", drift_mode="computed", slew_speed=0.1)
    p = Project(levels=(level,), lift_zones=(given, computed))
    r = drift.resolve_drift(p)
    assert r.lift_zones[0] == given
    assert r.lift_zones[1].drift_margin == pytest.approx(3.8320, rel=HAND)  # as above
    only_given = Project(levels=(level,), lift_zones=(given,))
    assert drift.resolve_drift(only_given) is only_given  # nothing to compute
    # a computed margin past the model's 20 m is refused naming the field
    fast = dataclasses.replace(computed, slew_speed=0.35, r_max=150.0)
    with pytest.raises(ModelError, match="drift_margin"):
        drift.resolve_drift(Project(levels=(level,), lift_zones=(fast,)))

"""The floor's mass does not lower the contact-force bound of a light hard item.

Issue 12 asked whether a contact-force bound with the struck deck's and framing's
mass could replace the rigid-base bound the amplified shear uses for light rigid
loads. For a load M striking through a contact spring k_c a struck mass m (on a
framing spring k_2 much softer than k_c), the spike is a two-body collision: in the
centre-of-mass frame ½·μ_r·v² = F²/(2·k_c), F = v·√(k_c·μ_r), μ_r = M·m/(M + m)
(Goldsmith, *Impact*, 1960, ch. 1 — from memory), against the rigid base's
F_r = W·(1 + √(1 + 2h/(W·f_c))) (Gere 7th ed. §9.10, η = 1). With the floor's mass
m ≫ M the two differ by √(m/(M + m)): a few per cent. Checked by hand at the
two-level demo's 4 m spreader beam (bay 1-2/A-B, worst U with amplification on, a
rigid flat base bridging the deck strip onto the girder line), by the two-mass
model of the chain (CEB Bulletin 187 two-mass model — from memory;
``struck_mass.two_mass_peaks``) and by ``scipy.integrate.solve_ivp`` (independent
integration of the same equations). ``scripts/contact_bound_deck_mass.py`` tabulates
every light item's point of the demos.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, struck_mass
from droprig.solver.chain import Compliance, Impact, LoadInputs, StruckMass
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.impact import G

RIGID_SPRING_BACK = 1.011
"""The time history's contact force reached 1.011 × the rigid-base force on the
amplification's calibration members (amplification.RIGID_BASE_MARGIN's docstring)."""


@pytest.fixture(scope="module")
def spreader_point() -> dict[str, float]:
    p = load_project("demo_projects/two_level_rigging.droprig")
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    zone = next(z for z in p.lift_zones
                if any(ld.name == "Spreader beam 4 m" for ld in z.loads))
    load = next(ld for ld in zone.loads if ld.name == "Spreader beam 4 m")
    lv = next(lv for lv in p.levels if lv.id == zone.level_id)
    fm = analysis.build_floor(lv, p.settings)
    geo = analysis.point_geometry(fm, p, np.array([7.0]), np.array([9.0]))
    ch = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
    inp, comp, sm, imp = ch[LoadInputs], ch[Compliance], ch[StruckMass], ch[Impact]
    assert sm.m2 is not None
    return {"M": float(inp.M[0]), "h": float(chain.energy_fall(ch, inp.h)[0]),
            "f_c": float(comp.f_series[0]), "f_s": float(comp.f_s[0]),
            "m2": float(sm.m2[0]), "F_contact": float(imp.contact[0])}


def test_hand_check_two_level_spreader_beam(spreader_point: dict[str, float]) -> None:
    s = spreader_point
    # the chain's inputs at the point, as written into the hand check below
    assert s["M"] == pytest.approx(300.0, rel=1e-9)
    assert s["h"] == pytest.approx(4.80, rel=0.01)
    assert s["f_c"] == pytest.approx(2.37e-11, rel=0.01)
    assert s["m2"] == pytest.approx(2644.0, rel=0.01)
    # by hand: W = 300·9.81 = 2942 N, v = √(2·9.81·4.80) = 9.70 m/s
    # rigid base: 2h/(W·f_c) = 9.60/6.97e-8 = 1.377e8, F_r = 2942·(1 + 11 735) = 34.5 MN
    # collision: μ_r = 300·2644/2944 = 269.4 kg, F = 9.70·√(269.4/2.37e-11) = 32.7 MN
    W, v = s["M"] * G, math.sqrt(2.0 * G * s["h"])
    F_r = W * (1.0 + math.sqrt(1.0 + 2.0 * s["h"] / (W * s["f_c"])))
    mu_r = s["M"] * s["m2"] / (s["M"] + s["m2"])
    F_cm = v * math.sqrt(mu_r / s["f_c"])
    assert F_r == pytest.approx(34.5e6, rel=0.01)
    assert F_cm == pytest.approx(32.7e6, rel=0.01)
    assert F_cm / F_r == pytest.approx(0.948, abs=0.005)
    # the two-mass model (framing spring and gravity in): between the two
    tm = float(struck_mass.two_mass_peaks(s["M"], v, 1.0 / s["f_c"], s["m2"],
                                          1.0 / s["f_s"]).F_contact)
    assert F_cm * 0.999 <= tm <= RIGID_SPRING_BACK * F_r
    # the chain's contact force (the envelope over lower drops, with its margin) is no
    # lower than the model's peak and no higher than the amplification's rigid bound
    assert tm <= s["F_contact"] <= 1.05 * F_r


def test_two_mass_peak_by_solve_ivp(spreader_point: dict[str, float]) -> None:
    from scipy.integrate import solve_ivp

    s = spreader_point
    M, m2, kc, k2 = s["M"], s["m2"], 1.0 / s["f_c"], 1.0 / s["f_s"]
    v = math.sqrt(2.0 * G * s["h"])

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        F = kc * max(y[0] - y[2], 0.0)  # compression-only contact spring
        return [y[1], G - F / M, y[3], (F - k2 * y[2]) / m2]

    w_hi = math.sqrt(kc * (1.0 / M + 1.0 / m2))
    t_end = 3.0 * 2.0 * math.pi / w_hi  # the spike lies in the first fast half-period
    sol = solve_ivp(rhs, (0.0, t_end), [0.0, v, 0.0, 0.0], method="DOP853", rtol=1e-10,
                    atol=1e-14, max_step=t_end / 600.0)
    F_ivp = float(np.max(kc * np.maximum(sol.y[0] - sol.y[2], 0.0)))
    tm = float(struck_mass.two_mass_peaks(M, v, kc, m2, k2).F_contact)
    assert F_ivp == pytest.approx(tm, rel=0.01)
    W = M * G
    F_r = W * (1.0 + math.sqrt(1.0 + 2.0 * s["h"] / (W * s["f_c"])))
    # the floor's mass lowers the contact force by about 5 % only
    assert 0.93 <= F_ivp / F_r <= 1.0


def test_girder_time_history_with_the_floor_mass() -> None:
    """Independent method with distributed mass: the point (7, 9) lies on girder
    GB/1-2 of the two-level demo (simply supported, L = 7.5 m, EI = 121.1 MN·m²,
    155.26 kg/m of steel, struck 7.0 m from its end), where the beams B1.2 and B2 end;
    the spreader beam (300 kg, h = 4.80 m, contact 2.37e-11 m/N) struck through the
    deck's indentation. Euler–Bernoulli modes, each phase exact
    (``exacthistory.exact_time_history``, Blevins 1979 Table 8-1; Chopra §10–12),
    the column taken rigid (a stiffer support: a higher force). With the beams' ends
    (1,219.48 kg/m with their slab, 9 m spans on both sides, 2.5 m apart: half each
    beam's mass, 2·1219.48·9/2/2.5 = 4,389.5 kg/m) smeared onto the girder the contact
    force is 0.88 × the rigid-base force; with the girder's steel alone 0.41."""
    from droprig.solver import exacthistory

    M, h, f_c = 300.0, 4.80, 2.37e-11
    W = M * G
    F_r = W * (1.0 + math.sqrt(1.0 + 2.0 * h / (W * f_c)))
    mu_floor = 155.26 + 2.0 * 1219.48 * 9.0 / 2.0 / 2.5
    t = exacthistory.exact_time_history(["simple", "simple"], [7.5, 7.5],
                                        [121.12569e6] * 2, [155.26, mu_floor],
                                        [7.0, 7.0], [M, M], [h, h], [f_c, f_c])
    steel, floor = (float(x) / F_r for x in t.force)
    assert floor == pytest.approx(0.884, abs=0.02)
    assert floor <= RIGID_SPRING_BACK
    assert steel == pytest.approx(0.413, abs=0.02)

"""``verify_member`` (``droprig verify --section ...``) is a floor of one member: it reads
the struck-member record of ``droprig check``'s one-member chain
(:func:`droprig.solver.member.member_chain`, :func:`droprig.solver.pointhistory.
struck_member`) as the floor's verification does, and its energy column is the chain's
own w·F × unit-load envelopes (:func:`droprig.solver.pointhistory.member_energy_peaks`).

Sources:
* Simply supported member, point load P at a (b = L − a): largest moment P·a·b/L,
  largest shear P·max(a, b)/L, largest deflection
  P·b·(L² − b²)^{3/2} / (9·√3·L·EI) for a ≥ b (AISC *Steel Construction Manual* 15th
  ed., Table 3-23, case 8).
* Fixed-ended member, point load P at a (b = L − a, a ≤ b): end moment P·a·b²/L²,
  end shear P·b²·(3a + b)/L³ (AISC Manual Table 3-23, case 16).
* IPE 300: I_y = 8 356 cm⁴, mass 42.2 kg/m (EN 10365 — from memory, checked against
  droprig's catalogue); S355 E = 210 GPa (EN 1993-1-1 §3.2.6).
The member cases are invented inputs, never expected values.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.io.sections import get_section
from droprig.solver import pointhistory, verify_member
from droprig.solver.chain import Impact
from droprig.solver.member import MemberDrop, member_chain
from droprig.solver.verification import OverSupportError
from tests.permit_projects import S355

SEC = get_section("IPE 300")


def test_catalogue_section_is_the_handbook_one() -> None:
    # EN 10365 IPE 300 (from memory): I_y = 8356 cm⁴, 42.2 kg/m
    assert SEC.Ix == pytest.approx(8356e-8, rel=2e-3)
    assert SEC.mass_per_length == pytest.approx(42.2, rel=2e-3)


@pytest.fixture(scope="module")
def simple_case() -> tuple[object, float]:
    """500 kg from 0.3 m at 2.5 m along a 6 m simply supported IPE 300 on a spring mat
    (η = 1: no struck mass), and the chain's force on the framing (N)."""
    v = verify_member(SEC, S355, "simple", 6.0, 2.5, 500.0, 0.3, cushion_stiffness=2e6)
    c = member_chain(MemberDrop(SEC, S355, "simple", 6.0, 2.5, 500.0, 0.3,
                                basis="aisc360", cushion_stiffness=2e6,
                                dynamic_amplification=True))
    return v, float(c[Impact].F[0])


def test_energy_column_is_the_chains_force_on_the_handbook_envelopes(
        simple_case: tuple[object, float]) -> None:
    v, F = simple_case
    L, a = 6.0, 2.5
    b = L - a
    EI = S355.E * SEC.Ix
    e = v.energy  # type: ignore[attr-defined]
    # the chain's own force, not one the verification works out
    assert e["force"] == pytest.approx(F, rel=1e-12)
    # AISC Manual Table 3-23 case 8
    assert e["moment"] == pytest.approx(F * a * b / L, rel=1e-12)
    assert e["shear"] == pytest.approx(F * max(a, b) / L, rel=1e-12)
    long_, short = max(a, b), min(a, b)
    d_hand = F * short * (L**2 - short**2) ** 1.5 / (9.0 * math.sqrt(3.0) * L * EI)
    # sampled at 400 intervals: never above the closed form, within 1e-5 of it
    assert e["deflection"] <= d_hand * (1.0 + 1e-12)
    assert e["deflection"] == pytest.approx(d_hand, rel=1e-5)
    assert long_ > short  # the formula's case (a ≥ b, measured from the far end)
    # the struck point's own deflection for the plot: F·G(a, a) = F·a²b²/(3·L·EI)
    assert v.energy_deflection_at_point == pytest.approx(  # type: ignore[attr-defined]
        F * a**2 * b**2 / (3.0 * L * EI), rel=1e-12)


def test_fixed_member_energy_column_by_hand() -> None:
    L, a = 4.0, 1.0
    b = L - a
    v = verify_member(SEC, S355, "fixed", L, a, 200.0, 0.2, load_stiffness=3e7)
    F = v.energy["force"]
    # AISC Manual Table 3-23 case 16: the end moment and end shear of the nearer end
    assert v.energy["moment"] == pytest.approx(F * a * b**2 / L**2, rel=1e-12)
    assert v.energy["shear"] == pytest.approx(F * b**2 * (3 * a + b) / L**3, rel=1e-12)


@pytest.mark.parametrize("cond", ["simple", "propped", "cantilever"])
def test_verify_member_reads_the_struck_member_record(cond: str) -> None:
    """Member, stiffness, mass, stroke and crushing force are the record's, the time
    history's contact the record's path compliance beyond the member."""
    md = MemberDrop(SEC, S355, cond, 5.0, 3.0, 800.0, 0.25, basis="en1993",  # type: ignore[arg-type]
                    load_stiffness=4e7, bearing=0.05, dynamic_amplification=True)
    c = member_chain(md)
    s = {k: v[0] for k, v in pointhistory.struck_member(c, np.zeros(1, dtype=np.int64)).items()}
    v = verify_member(SEC, S355, cond, 5.0, 3.0, 800.0, 0.25,  # type: ignore[arg-type]
                      load_stiffness=4e7, bearing=0.05, basis="en1993")
    # E·Ix of the bare steel (EN 1993-1-1 §3.2.6) is the record's EI
    assert float(s["EI"]) == pytest.approx(210e9 * SEC.Ix, rel=1e-12)
    assert float(s["stroke"]) == pytest.approx(SEC.tf, rel=1e-12)
    assert v.crushing_force == float(s["F_yield"])
    assert v.stroke == float(s["stroke"])
    # the contact spring: the load's underside 1/k in series (w = 1 on one member)
    assert v.contact_compliance == pytest.approx(max(1.0 / 4e7, 1e-3 * float(s["g_m"])),
                                                 rel=1e-9)
    assert v.compliance_ratio == pytest.approx(1.0 / 4e7 / float(s["g_m"]), rel=1e-9)


def test_on_a_support_names_the_field() -> None:
    # on a mat the one-member chain runs (a finite force on a rigid support); the
    # member does not move there, so its time history is no check: refused by name
    with pytest.raises(OverSupportError) as e:
        verify_member(SEC, S355, "cantilever", 3.0, 0.0, 100.0, 0.1, cushion_stiffness=2e6)
    assert e.value.field == "at"
    assert "the member" in str(e.value)

"""What the outer layers ask of the solver about framing without a drop: can a level
be analysed, what resistances does a member get, is a point on a rigid support.

SI units (N, N·m, Pa, m).
"""

from __future__ import annotations

from dataclasses import dataclass

from droprig.model import Level, Member, Settings
from droprig.solver import beam, capacity
from droprig.solver.loadpath import build_frame

__all__ = ["Resistances", "check_framing", "member_resistances", "on_rigid_support"]


def check_framing(level: Level) -> None:
    """Raise :class:`~droprig.model.ModelError` when the load path of ``level`` cannot
    be followed (a member end resting on nothing, members resting on each other in a
    loop); return quietly otherwise (:func:`droprig.solver.loadpath.build_frame`)."""
    build_frame(level)


@dataclass(frozen=True)
class Resistances:
    """Member properties and resistances the solver uses (SI; ``None`` where the
    solver rules the section out of scope). ``fy``: static yield strength of the
    governing (thicker) element, Pa; ``EI``: N·m²; ``flexure`` N·m; ``shear`` N."""

    fy: float
    section_class: str
    flexure: float | None
    shear: float | None
    EI: float


def member_resistances(m: Member, settings: Settings) -> Resistances:
    """The resistances the solver uses for ``m`` (:mod:`droprig.solver.capacity`):
    flexure (AISC 360-16 F2/F3; EN 1993-1-1 Eq. 6.13/6.14) and shear (AISC 360-16
    G2.1; EN 1993-1-1 Eq. 6.18 with EN 1993-1-5 §5), with the settings' resistance
    factor and dynamic increase factor on yield."""
    sec, grade, basis = m.section, m.grade, settings.design_basis
    phi, dif = settings.resistance_factor, settings.dynamic_increase_factor
    try:
        cls = capacity.section_class(sec, grade, basis)
    except ValueError:
        cls = "?"
    try:
        flex: float | None = capacity.flexural_resistance(sec, grade, basis, phi, dif)
    except ValueError:
        flex = None
    try:
        shear: float | None = capacity.shear_resistance(sec, grade, basis, phi, dif)
    except ValueError:
        shear = None
    return Resistances(grade.section_fy(sec), cls, flex, shear, grade.E * sec.Ix)


def on_rigid_support(cond: beam.EndCondition, L: float, a: float) -> bool:
    """Does a load at ``a`` (m) of a member of span ``L`` (m) with end condition
    ``cond`` land on a support (zero flexibility: the influence function g(a, a) of
    AISC Manual Table 3-23 / Roark Table 8.1 vanishes there)?"""
    return float(beam.green(cond, L, 1.0, a, a)) <= 0.0

"""Cross-section and steel-grade properties (SI: m, m², m³, m⁴, Pa, kg/m).

The catalogue data live in ``resources/sections`` and are read by
:mod:`droprig.io.sections`; the model only carries resolved properties so the
solver never touches files.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from droprig.model.errors import ModelError, check_positive, check_range, check_text

SectionFamily = Literal["W", "IPE", "HEA", "HEB", "HEM", "custom"]
GradeFamily = Literal["ASTM", "EN"]

E_STEEL = 200e9
"""Young's modulus of structural steel, Pa (AISC 360-16 §B4 uses 29 000 ksi = 199.9 GPa;
EN 1993-1-1 §3.2.6 uses 210 GPa; each grade carries its own value)."""


@dataclass(frozen=True)
class Section:
    """A doubly symmetric I-section bent about its strong axis.

    d: depth, bf: flange width, tw: web thickness, tf: flange thickness,
    r: root radius (k_des − tf for AISC shapes), A: area, Ix: second moment of
    area (strong axis), Sx: elastic modulus, Zx: plastic modulus, Iy: weak-axis
    second moment, mass_per_length in kg/m.
    """

    name: str
    family: SectionFamily
    d: float
    bf: float
    tw: float
    tf: float
    r: float
    A: float
    Ix: float
    Sx: float
    Zx: float
    Iy: float
    mass_per_length: float

    def __post_init__(self) -> None:
        check_text("section.name", self.name, required=True)
        for name in ("d", "bf", "tw", "tf", "A", "Ix", "Sx", "Zx", "Iy", "mass_per_length"):
            check_positive(f"section {self.name}.{name}", getattr(self, name))
        check_range(f"section {self.name}.r", self.r, 0.0, None, unit="m")
        if 2 * self.tf >= self.d:
            raise ModelError(f"section {self.name}.tf", self.tf, f"< d/2 = {self.d / 2:g} m", "m")
        if self.tw >= self.bf:
            raise ModelError(f"section {self.name}.tw", self.tw, f"< bf = {self.bf:g} m", "m")

    @property
    def k_des(self) -> float:
        """Distance from the outer flange face to the web toe of the fillet, m."""
        return self.tf + self.r

    @property
    def h_web(self) -> float:
        """Clear web depth between flanges, m (d − 2tf)."""
        return self.d - 2.0 * self.tf


@dataclass(frozen=True)
class Grade:
    """Structural steel grade.

    ``fy_steps`` is a tuple of (max thickness in m, yield strength in Pa) in
    increasing thickness, as in EN 10025-2 Table 7 or a single step for ASTM
    grades. ``fu`` is the tensile strength for the thinnest step.
    """

    name: str
    family: GradeFamily
    fy_steps: tuple[tuple[float, float], ...]
    fu: float
    E: float = E_STEEL

    def __post_init__(self) -> None:
        check_text("grade.name", self.name, required=True)
        if not self.fy_steps:
            raise ModelError(f"grade {self.name}.fy_steps", self.fy_steps, "at least one step")
        for t, fy in self.fy_steps:
            check_positive(f"grade {self.name} thickness step", t, "m")
            check_range(f"grade {self.name}.fy", fy, 100e6, 1000e6, unit="Pa")
        check_range(f"grade {self.name}.fu", self.fu, 100e6, 2000e6, unit="Pa")
        check_range(f"grade {self.name}.E", self.E, 150e9, 250e9, unit="Pa")

    def yield_strength(self, thickness: float) -> float:
        """Yield strength in Pa for an element of the given thickness (m)."""
        for t_max, fy in self.fy_steps:
            if thickness <= t_max + 1e-12:
                return fy
        return self.fy_steps[-1][1]

    def section_fy(self, section: Section) -> float:
        """Yield strength governing a rolled section: the thicker element (the flange)."""
        return self.yield_strength(max(section.tf, section.tw))


@dataclass(frozen=True)
class Concrete:
    """Deck concrete by characteristic / specified compressive strength (Pa)."""

    fc: float = 30e6
    density: float = 2400.0
    fy_rebar: float = 500e6

    def __post_init__(self) -> None:
        check_range("deck.concrete.fc", self.fc, 15e6, 100e6, unit="Pa")
        check_range("deck.concrete.density", self.density, 1400.0, 2600.0, unit="kg/m³")
        check_range("deck.concrete.fy_rebar", self.fy_rebar, 200e6, 700e6, unit="Pa")


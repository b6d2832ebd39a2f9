"""The common units are converted without loading pint, and give pint's numbers.

Sources: NIST Special Publication 811 (2008 ed.), *Guide for the Use of the
International System of Units*, Appendix B.8 (factors in alphabetical order) and
B.9 (by kind of quantity): the foot, inch and pound (avoirdupois) are exact by
definition, the others are given to 7 significant figures. pint (PyPI, the
reference library droprig reads other units with) is the reference for the table's
bits: every table entry must be the very factor pint multiplies by.
"""

from __future__ import annotations

import math
import random
import subprocess
import sys
import zlib

import pytest

from droprig import units

REL_NIST = 5e-7
"""NIST SP 811 Appendix B gives 7 significant figures: half a unit in the 7th."""

NIST_SP811_B8 = [
    # (quantity, unit, SI value of one unit)           NIST SP 811 (2008) App. B.8
    ("length", "ft", 0.3048),                          # exact
    ("length", "in", 0.0254),                          # exact
    ("mass", "lb", 0.45359237),                        # exact (avoirdupois pound)
    ("force", "lbf", 4.448222),                        # pound-force
    ("force", "kip", 4.448222e3),                      # kip (1000 lbf)
    ("stress", "psi", 6.894757e3),                     # pound-force per square inch
    ("stress", "ksi", 6.894757e6),                     # kip per square inch
    ("pressure", "psf", 4.788026e1),                   # pound-force per square foot
    ("moment", "lbf*ft", 1.355818),                    # pound-force foot
    ("line_load", "lbf/ft", 1.459390e1),               # pound-force per foot
    ("stiffness", "lbf/in", 1.751268e2),               # pound-force per inch
    ("mass_per_length", "lb/ft", 1.488164),            # pound per foot
    ("area", "in**2", 6.4516e-4),                      # exact
    ("modulus", "in**3", 1.6387064e-5),                # exact
    ("inertia", "in**4", 4.162314e-7),                 # (0.0254 m)^4
    ("angle", "deg", 1.745329e-2),                     # degree
    ("force", "kg", 9.80665),                          # kilogram-force, exact (CGPM 1901)
]


@pytest.mark.parametrize(("quantity", "unit", "si"), NIST_SP811_B8)
def test_table_factors_against_nist_sp811(quantity: str, unit: str, si: float) -> None:
    assert units.PARSE_FACTORS[(quantity, unit)] == pytest.approx(si, rel=REL_NIST)
    assert units.parse(f"1 {unit}", quantity) == pytest.approx(si, rel=REL_NIST)


def _random_values(n: int, seed: int) -> list[float]:
    rng = random.Random(seed)
    out = [0.0, 1.0, -1.0, 0.3048, 1e-12, 123456.789]
    out += [rng.uniform(-1.0, 1.0) * 10.0 ** rng.randint(-9, 9) for _ in range(n)]
    return out


@pytest.mark.parametrize("pair", sorted(units.DISPLAY_FACTORS))
def test_display_factors_are_pints_bit_for_bit(pair: tuple[str, str]) -> None:
    ureg = units.registry()
    src, dst = pair
    factor = ureg._get_conversion_factor(ureg.parse_units(src)._units,
                                         ureg.parse_units(dst)._units)
    assert units.DISPLAY_FACTORS[pair] == factor  # pint's own factor, every bit
    for v in _random_values(300, zlib.crc32(repr(pair).encode())):
        assert units.convert(v, src, dst) == float(ureg.Quantity(v, src).to(dst).magnitude)


def _parse_by_pint(text: str, quantity: str, system: units.UnitSystem,
                   monkeypatch: pytest.MonkeyPatch) -> float:
    with monkeypatch.context() as m:
        m.setattr(units, "PARSE_FACTORS", {})
        return units.parse(text, quantity, system)


@pytest.mark.parametrize("key", sorted(units.PARSE_FACTORS))
def test_parse_factors_read_as_pint_reads(key: tuple[str, str],
                                          monkeypatch: pytest.MonkeyPatch) -> None:
    quantity, unit = key
    for v in _random_values(60, zlib.crc32(repr(key).encode())):
        text = f"{v!r} {unit}"
        assert units.parse(text, quantity) == _parse_by_pint(text, quantity, "SI",
                                                             monkeypatch)


@pytest.mark.parametrize("quantity", sorted(units.QUANTITIES))
@pytest.mark.parametrize("system", ["SI", "US"])
def test_every_display_unit_is_in_both_tables(quantity: str, system: units.UnitSystem,
                                              monkeypatch: pytest.MonkeyPatch) -> None:
    """A bare number takes the display unit: read without pint, as pint reads it."""
    base, si_unit, us_unit, _, _ = units.QUANTITIES[quantity]
    unit = si_unit if system == "SI" else us_unit
    assert (quantity, unit) in units.PARSE_FACTORS
    assert not base or (base, unit) in units.DISPLAY_FACTORS or base == unit
    assert units.parse("2.5", quantity, system) == _parse_by_pint("2.5", quantity, system,
                                                                   monkeypatch)


@pytest.mark.parametrize(("text", "quantity", "expected"), [
    ("3 kN / m", "line_load", 3000.0),        # blanks beside the operator
    ("3 kN/m", "line_load", 3000.0),
    ("2 N/mm^2", "stress", 2e6),               # ^ is a power
    ("1,5 m", "length", 1.5),                  # decimal comma (units.normalise_decimal)
])
def test_spelling_variants_use_the_table(text: str, quantity: str, expected: float) -> None:
    assert units.parse(text, quantity) == pytest.approx(expected, rel=1e-12)  # SI, exact


def test_other_units_still_read_through_pint() -> None:
    assert units.parse("2 yd", "length") == pytest.approx(2 * 0.9144, rel=1e-12)  # NIST B.8
    assert units.parse("5 kN m", "moment") == pytest.approx(5000.0, rel=1e-12)  # SI
    with pytest.raises(units.UnitError, match="ambiguous"):
        units.parse("2 ton", "mass")
    with pytest.raises(units.UnitError, match="is not a mass"):
        units.parse("2 kN", "mass")
    with pytest.raises(units.UnitError, match="too large"):
        units.parse("1e300 m", "length")


def test_opening_and_formatting_do_not_load_pint() -> None:
    """pint's definitions cost about a second: a window start, a project opened and
    every display value formatted must not load them (the start-up budget)."""
    code = (
        "import sys\n"
        "from droprig import units\n"
        "from droprig.io.project_file import load_project\n"
        "p = load_project('demo_projects/rooftop_plant_swap.droprig')\n"
        "for q in units.QUANTITIES:\n"
        "    for s in ('SI', 'US'):\n"
        "        units.fmt(1.25, q, s); units.fmt_sig(0.125, q, s)\n"
        "        units.parse('3', q, s)\n"
        "units.parse('12 ft', 'length'); units.parse('4400 lb', 'mass')\n"
        "print('pint' in sys.modules)\n")
    from pathlib import Path

    root = Path(__file__).resolve().parents[1]
    out = subprocess.run([sys.executable, "-c", code], cwd=root, capture_output=True,
                         text=True, check=True)
    assert out.stdout.strip() == "False", out.stderr
    assert math.isfinite(units.parse("12 ft", "length"))

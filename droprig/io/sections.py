"""Section, steel-grade and concrete library.

Reads the catalogue CSVs in ``resources/sections/`` (units in the column names, provenance
in ``resources/sections/README.md``) and returns :class:`droprig.model.sections.Section`,
:class:`~droprig.model.sections.Grade` and :class:`~droprig.model.sections.Concrete` in SI
units (m, m², m³, m⁴, Pa, kg/m). Everything is cached; the first load reads two small CSVs
with the standard library only.

Name matching ignores case, spaces, ``-``/``_`` and accepts ``×``/``x`` in W designations
and both ``HEB200`` and ``HE200B`` (``HE 200 B``) for the European wide-flange series.
"""

from __future__ import annotations

import csv
import difflib
import re
from collections.abc import Iterator
from functools import lru_cache
from pathlib import Path

from droprig.model.sections import Concrete, Grade, Section

__all__ = [
    "FAMILIES",
    "ConcreteNotFound",
    "GradeNotFound",
    "SectionNotFound",
    "get_concrete",
    "get_grade",
    "get_section",
    "list_concretes",
    "list_grades",
    "list_sections",
    "normalise_name",
    "search_sections",
]

RESOURCE_DIR = Path(__file__).resolve().parents[2] / "resources" / "sections"
W_FILE = RESOURCE_DIR / "aisc_w_shapes.csv"
EN_FILE = RESOURCE_DIR / "en10365_i_sections.csv"

FAMILIES: tuple[str, ...] = ("W", "IPE", "HEA", "HEB", "HEM")

# Exact unit conversions to SI.
INCH = 0.0254  # m
LBF_PER_FT_TO_KG_PER_M = 0.45359237 / 0.3048  # lb/ft of weight to kg/m of mass
KSI = 6894.757293168361e3  # Pa
PSI = 6894.757293168361  # Pa
MM = 1e-3
CM = 1e-2

E_ASTM = 29000 * KSI
"""AISC 360-16 §B4 / Table of symbols: E = 29 000 ksi (199.9 GPa)."""
E_EN = 210e9
"""EN 1993-1-1 §3.2.6(1): E = 210 000 N/mm²."""

_MAX_SUGGESTIONS = 5


class SectionNotFound(ValueError):  # noqa: N818 (name fixed by the team API)
    """No catalogue section matches the given name; the message offers close matches."""

    def __init__(self, text: str, suggestions: list[str]) -> None:
        self.text = text
        self.suggestions = suggestions
        hint = f"; did you mean {', '.join(suggestions)}?" if suggestions else ""
        super().__init__(
            f"section {text!r} is not in the library (families {', '.join(FAMILIES)}){hint}"
        )


class GradeNotFound(ValueError):  # noqa: N818 (name fixed by the team API)
    """No steel grade matches the given name; the message lists the known grades."""

    def __init__(self, text: str, known: list[str]) -> None:
        self.text = text
        super().__init__(f"steel grade {text!r} is not known; allowed: {', '.join(known)}")


class ConcreteNotFound(ValueError):  # noqa: N818 (name fixed by the team API)
    """No concrete class matches the given name; the message lists the known classes."""

    def __init__(self, text: str, known: list[str]) -> None:
        self.text = text
        super().__init__(f"concrete class {text!r} is not known; allowed: {', '.join(known)}")


# --------------------------------------------------------------------------- names

_HE_SUFFIX = re.compile(r"^HE(\d+(?:\.\d+)?)(A|B|M)$")
_W_NAME = re.compile(r"^W(\d+(?:\.\d+)?)X(\d+(?:\.\d+)?)$")


def normalise_name(name: str) -> str:
    """Matching key of a section designation: upper case, no spaces, ``HE200B`` → ``HEB200``.

    ``'IPE 300'`` and ``'ipe300'`` → ``'IPE300'``; ``'HEB200'``, ``'HE200B'``, ``'HE 200 B'``
    → ``'HEB200'``; ``'W16x26'``, ``'W 16 × 26'`` → ``'W16X26'``.
    """
    if not isinstance(name, str):
        raise TypeError(f"section name must be text, got {type(name).__name__}")
    key = name.strip().upper().replace("×", "X").replace("*", "X")
    key = re.sub(r"(\d)_(\d)", r"\1.\2", key)  # W6X8_5 → W6X8.5
    key = re.sub(r"[\s\-_]+", "", key)
    m = _HE_SUFFIX.match(key)
    if m:
        key = f"HE{m.group(2)}{m.group(1)}"
    return key


def _display_name(family: str, key: str) -> str:
    """Canonical display name: ``W16X26``, ``IPE 300``, ``HEB 200``."""
    if family == "W":
        return key
    return f"{family} {key[len(family) :]}"


# --------------------------------------------------------------------------- catalogue


def _data_rows(path: Path) -> Iterator[dict[str, str]]:
    with path.open(encoding="utf-8", newline="") as f:
        yield from csv.DictReader(line for line in f if not line.startswith("#"))


def _w_section(row: dict[str, str]) -> Section:
    g = {k: float(v) for k, v in row.items() if k != "name"}
    return Section(
        name=normalise_name(row["name"]),
        family="W",
        d=g["d_in"] * INCH,
        bf=g["bf_in"] * INCH,
        tw=g["tw_in"] * INCH,
        tf=g["tf_in"] * INCH,
        r=(g["k_des_in"] - g["tf_in"]) * INCH,
        A=g["A_in2"] * INCH**2,
        Ix=g["Ix_in4"] * INCH**4,
        Sx=g["Sx_in3"] * INCH**3,
        Zx=g["Zx_in3"] * INCH**3,
        Iy=g["Iy_in4"] * INCH**4,
        mass_per_length=g["W_lbf_per_ft"] * LBF_PER_FT_TO_KG_PER_M,
    )


def _en_section(row: dict[str, str]) -> Section:
    g = {k: float(v) for k, v in row.items() if k not in ("name", "family")}
    family = row["family"]
    key = normalise_name(row["name"])
    return Section(
        name=_display_name(family, key),
        family=family,  # type: ignore[arg-type]  # validated against FAMILIES on load
        d=g["h_mm"] * MM,
        bf=g["b_mm"] * MM,
        tw=g["tw_mm"] * MM,
        tf=g["tf_mm"] * MM,
        r=g["r_mm"] * MM,
        A=g["A_cm2"] * CM**2,
        Ix=g["Iy_cm4"] * CM**4,
        Sx=g["Wel_y_cm3"] * CM**3,
        Zx=g["Wpl_y_cm3"] * CM**3,
        Iy=g["Iz_cm4"] * CM**4,
        mass_per_length=g["mass_kg_per_m"],
    )


@lru_cache(maxsize=1)
def _catalogue() -> dict[str, Section]:
    """All sections keyed by :func:`normalise_name`, in catalogue order (W first, then EN)."""
    out: dict[str, Section] = {}
    for row in _data_rows(W_FILE):
        sec = _w_section(row)
        out[normalise_name(sec.name)] = sec
    for row in _data_rows(EN_FILE):
        if row["family"] not in FAMILIES:
            raise ValueError(f"{EN_FILE.name}: unknown family {row['family']!r}")
        sec = _en_section(row)
        out[normalise_name(sec.name)] = sec
    return out


def get_section(name: str) -> Section:
    """The catalogue section called ``name`` (any spelling accepted by :func:`normalise_name`).

    Raises :class:`SectionNotFound` naming the text and offering up to five close matches
    (also for a name that is not text, e.g. ``None`` from an empty form field).
    """
    if not isinstance(name, str):
        raise SectionNotFound(repr(name), [])
    return _get_section(name)


@lru_cache(maxsize=1024)
def _get_section(name: str) -> Section:
    cat = _catalogue()
    key = normalise_name(name)
    try:
        return cat[key]
    except KeyError:
        raise SectionNotFound(name, _suggestions(key)) from None


_EN_KEY = re.compile(r"^(IPE|HEA|HEB|HEM)(\d+(?:\.\d+)?)$")


def _suggestions(key: str) -> list[str]:
    """Up to five display names close to an unknown key.

    A well-formed designation of a known family gets the nearest sizes of that family
    (same nominal depth first for W shapes); anything else gets :mod:`difflib` matches.
    """
    cat = _catalogue()
    m_w = _W_NAME.match(key)
    m_en = _EN_KEY.match(key)
    if m_w or m_en:
        family = "W" if m_w else m_en.group(1)  # type: ignore[union-attr]
        ranked: list[tuple[tuple[float, float], str]] = []
        for k, s in cat.items():
            if s.family != family:
                continue
            if m_w:
                w = _W_NAME.match(k)
                if w is None:  # pragma: no cover - every W key is well formed
                    continue
                depth, weight = float(m_w.group(1)), float(m_w.group(2))
                score = (abs(float(w.group(1)) - depth), abs(float(w.group(2)) - weight))
            else:
                size = float(m_en.group(2))  # type: ignore[union-attr]
                score = (abs(float(k[len(family) :]) - size), 0.0)
            ranked.append((score, s.name))
        ranked.sort(key=lambda item: item[0])
        return [name for _, name in ranked[:_MAX_SUGGESTIONS]]
    close = difflib.get_close_matches(key, list(cat), n=_MAX_SUGGESTIONS, cutoff=0.6)
    return [cat[k].name for k in close]


@lru_cache(maxsize=16)
def _names(family: str | None) -> tuple[str, ...]:
    return tuple(s.name for s in _catalogue().values() if family is None or s.family == family)


def list_sections(family: str | None = None) -> list[str]:
    """Canonical display names, in catalogue order; ``family`` one of :data:`FAMILIES`."""
    if family is not None:
        fam = family.strip().upper()
        if fam not in FAMILIES:
            raise ValueError(
                f"section family {family!r} is not known; allowed: {', '.join(FAMILIES)}"
            )
        family = fam
    return list(_names(family))


def search_sections(text: str, limit: int = 50) -> list[str]:
    """Display names matching ``text`` for a search box: prefix matches first, then substrings.

    Matching uses :func:`normalise_name` on both sides, so ``'he 200'`` finds ``HEA 200``,
    ``HEB 200`` and ``HEM 200``. Empty text returns the first ``limit`` names.
    """
    if limit <= 0:
        return []
    key = normalise_name(text)
    if key.startswith("HE") and len(key) > 2 and key[2].isdigit():
        # 'HE200' or 'HE 200' should find every HE series of that size.
        pattern = re.compile(r"^HE[ABM]" + re.escape(key[2:]))
        hits = [s.name for k, s in _catalogue().items() if pattern.match(k)]
        return hits[:limit]
    prefix: list[str] = []
    inner: list[str] = []
    for k, s in _catalogue().items():
        if k.startswith(key):
            prefix.append(s.name)
        elif key in k:
            inner.append(s.name)
    return (prefix + inner)[:limit]


# --------------------------------------------------------------------------- grades

_EN10025_STEPS_MM = (16, 40, 63, 80, 100, 150, 200, 250)
"""Upper thickness limits of EN 10025-2:2004 Table 7 (minimum yield strength ReH)."""

_EN10025_FY_MPA = {
    "S235": (235, 225, 215, 215, 215, 195, 185, 175),
    "S275": (275, 265, 255, 245, 235, 225, 215, 205),
    "S355": (355, 345, 335, 325, 315, 295, 285, 275),
}
"""EN 10025-2:2004 Table 7, minimum ReH in MPa for the thickness steps above."""

_EN10025_FU_MPA = {"S235": 360, "S275": 410, "S355": 470}
"""EN 10025-2:2004 Table 7, lower bound of Rm for 3 mm ≤ t ≤ 100 mm (covers every rolled
section here). EN 1993-1-1 Table 3.1 allows 430 / 510 MPa for S275 / S355 at t ≤ 40 mm; the
lower, product-standard value is kept because it is the safe side for a fracture check."""

_ASTM = {
    # name: (minimum Fy ksi, minimum Fu ksi)
    "A36": (36.0, 58.0),  # ASTM A36: Fy 36 ksi for shapes, Fu 58–80 ksi
    "A992": (50.0, 65.0),  # ASTM A992: Fy 50–65 ksi, Fu ≥ 65 ksi
    "A572 Gr 50": (50.0, 65.0),  # ASTM A572 Grade 50: Fy 50 ksi, Fu 65 ksi
}
_ASTM_MAX_T = 0.5
"""m; one thickness step covering every rolled W shape (thickest flange ≈ 5.5 in = 0.14 m)."""


@lru_cache(maxsize=1)
def _grades() -> dict[str, Grade]:
    out: dict[str, Grade] = {}
    for name, (fy, fu) in _ASTM.items():
        out[name] = Grade(
            name=f"ASTM {name}",
            family="ASTM",
            fy_steps=((_ASTM_MAX_T, fy * KSI),),
            fu=fu * KSI,
            E=E_ASTM,
        )
    for name, fys in _EN10025_FY_MPA.items():
        out[name] = Grade(
            name=name,
            family="EN",
            fy_steps=tuple(
                (t * MM, fy * 1e6) for t, fy in zip(_EN10025_STEPS_MM, fys, strict=True)
            ),
            fu=_EN10025_FU_MPA[name] * 1e6,
            E=E_EN,
        )
    return out


def _grade_key(name: str) -> str:
    key = re.sub(r"[\s\-_.]+", "", name.strip().upper())
    key = key.removeprefix("ASTM").removeprefix("EN10025").removeprefix("EN")
    key = key.replace("GRADE", "GR")
    if re.fullmatch(r"A572(GR)?50", key):
        return "A572 Gr 50"
    # S355JR, S355J0, S355J2, S355K2 … all carry the same strength table.
    m = re.fullmatch(r"(S235|S275|S355)(JR|J0|J2|K2)?", key)
    if m:
        return m.group(1)
    return key


def get_grade(name: str) -> Grade:
    """Steel grade by name: ``'A36'``, ``'A992'``, ``'A572 Gr 50'`` (``'A572-50'``,
    ``'A572 Gr50'``), ``'S235'``, ``'S275'``, ``'S355'`` (``'S355JR'`` …)."""
    if not isinstance(name, str):
        raise GradeNotFound(repr(name), list_grades())
    grades = _grades()
    try:
        return grades[_grade_key(name)]
    except KeyError:
        raise GradeNotFound(name, list_grades()) from None


def list_grades() -> list[str]:
    """Display names of the known grades, ASTM first."""
    return [g.name for g in _grades().values()]


# --------------------------------------------------------------------------- concrete

_EN206_CLASSES = ("C20/25", "C25/30", "C30/37", "C35/45", "C40/50", "C45/55", "C50/60")
"""EN 1992-1-1 Table 3.1 strength classes fck/fck,cube (MPa) covered here."""
_US_PSI = (3000, 4000, 5000)
_FY_REBAR_US = 60 * KSI
"""ASTM A615 Grade 60 reinforcement, the common partner of specified f'c in psi."""


@lru_cache(maxsize=1)
def _concretes() -> dict[str, Concrete]:
    out: dict[str, Concrete] = {}
    for cls in _EN206_CLASSES:
        fck = float(cls[1:].split("/")[0])
        out[cls] = Concrete(fc=fck * 1e6)
    for psi in _US_PSI:
        out[f"{psi} psi"] = Concrete(fc=psi * PSI, fy_rebar=_FY_REBAR_US)
    return out


def _concrete_key(name: str) -> str:
    key = re.sub(r"\s+", "", name.strip().upper())
    m = re.fullmatch(r"C(\d+)(?:[/-](\d+))?", key)
    if m:
        for cls in _EN206_CLASSES:
            fck, cube = cls[1:].split("/")
            if m.group(1) == fck and m.group(2) in (None, cube):
                return cls
        return key
    m = re.fullmatch(r"(?:F'?C=?)?(\d+)PSI", key)
    if m:
        return f"{int(m.group(1))} psi"
    m = re.fullmatch(r"(?:F'?C=?)?(\d+(?:\.\d+)?)KSI", key)
    if m:
        return f"{round(float(m.group(1)) * 1000)} psi"
    return key


def get_concrete(name: str) -> Concrete:
    """Deck concrete by class: EN ``'C20/25'`` … ``'C50/60'`` (``'C30'`` also accepted) or
    US specified strength ``'3000 psi'``, ``'4000 psi'``, ``'5000 psi'`` (``"f'c 4000 psi"``,
    ``'4 ksi'``). fc is fck (EN 1992-1-1 Table 3.1) or f'c (ACI 318), in Pa."""
    if not isinstance(name, str):
        raise ConcreteNotFound(repr(name), list_concretes())
    try:
        return _concretes()[_concrete_key(name)]
    except KeyError:
        raise ConcreteNotFound(name, list_concretes()) from None


def list_concretes() -> list[str]:
    """Display names of the known concrete classes, EN first."""
    return list(_concretes())

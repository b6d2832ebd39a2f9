"""Project builders shared by the tests and the benchmarks (invented scenario data,
never expected values; one copy of each builder instead of one per file).

- :func:`tall_frame`: the load-test building of issue 16 — levels of 12 × 10 bays
  (9 m × 8 m, beams at 3 m: 502 members a level), lift zones of two loads per
  level, one crushable pad per level. ``benchmarks/bench_loadtest.py`` (10 levels)
  and ``tests/report/test_annex_large.py`` (1–3 levels) build it.
- :data:`S355`, :data:`BEAM`, :data:`GIRDER`: a grade and two custom sections close
  to IPE 300 / IPE 450 (inputs, not check values) for the solver tests and
  ``benchmarks/equivalence.py``.
- :class:`AtPoints`: the chain of the analysis at some points, by output name.

Section properties of the catalogue shapes come from ``resources/sections`` (EN
10365); S355 yield strengths from EN 10025-2 Table 7.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from droprig.model import (
    Grade,
    LiftLoad,
    LiftZone,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Section,
    Settings,
    generate_level,
)

# EN 10025-2 Table 7: S355 355 MPa (t ≤ 16 mm), 345 MPa (16 < t ≤ 40 mm)
S355 = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=210e9)
# Custom section properties close to an IPE 300 / IPE 450 (inputs, not check values)
BEAM = Section("B300", "custom", d=0.3, bf=0.15, tw=0.0071, tf=0.0107, r=0.015,
               A=5.381e-3, Ix=8.356e-5, Sx=5.57e-4, Zx=6.28e-4, Iy=6.04e-6,
               mass_per_length=42.2)
GIRDER = Section("G450", "custom", d=0.45, bf=0.19, tw=0.0094, tf=0.0146, r=0.021,
                 A=9.88e-3, Ix=3.374e-4, Sx=1.5e-3, Zx=1.702e-3, Iy=1.676e-5,
                 mass_per_length=77.6)


def tall_frame(levels: int = 10, zones_per_level: int = 2,
               title: str = "Load test: ten-storey frame") -> Project:
    """``levels`` levels of 12 × 10 bays (9 m × 8 m, beams at 3 m: 502 members
    each), ``zones_per_level`` lift zones of two loads per level (a pallet by drop
    height, a rebar bundle by hook elevation with a given underside stiffness),
    one crushable pad per level; grid resolution 0.5 m (invented data)."""
    from droprig.io.sections import get_grade, get_section

    lvls, zones, pads = [], [], []
    for i in range(levels):
        lv = generate_level(
            level_id=f"L{i + 1:02d}", name=f"Level {i + 1}", elevation=4.0 * (i + 1),
            x_spacings=(9.0,) * 12, y_spacings=(8.0,) * 10, girder_direction="x",
            beam_spacing=3.0, girder_section=get_section("IPE 500"),
            beam_section=get_section("IPE 300"), girder_grade=get_grade("S355"),
            beam_grade=get_grade("S275"))
        lvls.append(lv)
        for j in range(zones_per_level):
            zones.append(LiftZone(
                f"Z{i + 1:02d}{'ab'[j]}", f"crane {j + 1}", lv.id, (27.0 + 54.0 * j, 40.0),
                2.0, 25.0, math.radians(-100.0 + 30 * j), math.radians(150.0 + 30 * j),
                0.5, (),
                (LiftLoad("pallet of blocks", 1800.0, 1.2, 1.0, 2.5),
                 LiftLoad("rebar bundle", 3200.0, 6.0, 0.6, None, lv.elevation + 9.0, 4.0,
                          contact_stiffness=2e7))))
        pads.append(ProtectionArea(f"P{i + 1:02d}", "landing pad", lv.id,
                                   Rect(45.0, 32.0, 63.0, 48.0), "crushable", 0.3, None,
                                   1.2e5, 0.2))
    return Project(ProjectInfo(title), Settings(grid_resolution=0.5), tuple(lvls),
                   tuple(zones), tuple(pads))


class AtPoints:
    """The chain of the analysis at some points: public outputs by field name
    (``r["peak_force"]``), step results on ``r.chain`` (``r.chain[Compliance].f_s``)."""

    def __init__(self, chain: object) -> None:
        from droprig.solver.chain import outputs

        self.chain = chain
        self.out = outputs(chain)  # type: ignore[arg-type]

    def __getitem__(self, key: str) -> np.ndarray:
        return self.out[key]


def same_arrays(a: object, b: object, skip: frozenset[str] = frozenset()) -> None:
    """Every field of two case dataclasses but those in ``skip`` equal, arrays bit for
    bit (NaN equal NaN)."""
    for f in dataclasses.fields(a):  # type: ignore[arg-type]
        if f.name in skip:
            continue
        va, vb = getattr(a, f.name), getattr(b, f.name)
        if isinstance(va, np.ndarray):
            assert va.dtype == vb.dtype and va.shape == vb.shape, f.name
            assert np.array_equal(va, vb, equal_nan=va.dtype.kind == "f"), f.name
        else:
            assert va == vb, f.name


def same_results(a: object, b: object, *, warnings: bool = True) -> None:
    """Two analyses' results equal bit for bit: every case array and bay summary, the
    warnings (unless ``warnings`` is false) and every fall to a level below with its
    case (NaN equal NaN)."""
    if warnings:
        assert a.warnings == b.warnings  # type: ignore[attr-defined]
    assert a.bays == b.bays  # type: ignore[attr-defined]
    assert len(a.cases) == len(b.cases)  # type: ignore[attr-defined]
    assert len(a.cascade) == len(b.cascade)  # type: ignore[attr-defined]
    for ca, cb in zip(a.cases, b.cases, strict=True):  # type: ignore[attr-defined]
        same_arrays(ca, cb)
    for fa, fb in zip(a.cascade, b.cascade, strict=True):  # type: ignore[attr-defined]
        assert fa.bays == fb.bays
        assert (fa.zone_id, fa.load_name, fa.from_level, fa.level_id,
                fa.equivalent_height) == (fb.zone_id, fb.load_name, fb.from_level,
                                          fb.level_id, fb.equivalent_height)
        same_arrays(fa.case, fb.case)

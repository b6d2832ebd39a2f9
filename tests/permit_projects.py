"""Random small projects for the permit tests (invented inputs for property tests,
never expected values): a one- or two-level framed floor, a lift zone with one or
two loads given by drop height or by hook elevation, and sometimes a crushable pad
or a spring mat. Sections come from the EN 10365 catalogue shipped in
``resources/sections``; S355 yield strengths from EN 10025-2 Table 7."""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from droprig.io.sections import get_section
from droprig.model import (
    Deck,
    Grade,
    LiftLoad,
    LiftZone,
    Project,
    ProtectionArea,
    Rect,
    Settings,
    generate_level,
)

# EN 10025-2 Table 7: S355 355 MPa (t ≤ 16 mm), 345 MPa (16 < t ≤ 40 mm)
S355 = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=210e9)
BEAMS = ("IPE 200", "IPE 240", "IPE 300", "IPE 360")
GIRDERS = ("IPE 400", "IPE 450", "IPE 500", "IPE 600")


def random_project(seed: int, *, pads: bool = True) -> Project:
    rng = np.random.default_rng(seed)
    nx, ny = int(rng.integers(1, 3)), int(rng.integers(1, 3))
    xs = tuple(float(v) for v in np.round(rng.uniform(5.0, 9.0, nx), 2))
    ys = tuple(float(v) for v in np.round(rng.uniform(5.0, 8.0, ny), 2))
    elevation = float(np.round(rng.uniform(3.0, 20.0), 2))
    level = generate_level(
        level_id="L1", name="roof", elevation=elevation, x_spacings=xs, y_spacings=ys,
        girder_direction="x" if rng.random() < 0.5 else "y",
        beam_spacing=float(rng.uniform(2.0, 3.2)),
        girder_section=get_section(GIRDERS[int(rng.integers(len(GIRDERS)))]),
        beam_section=get_section(BEAMS[int(rng.integers(len(BEAMS)))]),
        girder_grade=S355, beam_grade=S355,
        deck=Deck(thickness=float(rng.choice([0.12, 0.15, 0.2]))),
        superimposed_dead=float(rng.uniform(0.0, 1500.0)))
    levels = [level]
    if rng.random() < 0.3:
        levels.insert(0, replace(level, id="L0", name="below", elevation=elevation - 4.0))
    W, H = sum(xs), sum(ys)
    loads = []
    for j in range(int(rng.integers(1, 3))):
        mass = float(np.round(rng.uniform(50.0, 1500.0)))
        h = float(np.round(rng.uniform(0.2, 1.2), 3))
        fl, fw = (float(v) for v in np.round(rng.uniform(0.3, 2.5, 2), 2))
        k = None if rng.random() < 0.5 else float(rng.uniform(5e6, 5e7))
        if rng.random() < 0.5:
            hang = float(np.round(rng.uniform(0.5, 6.0), 2))
            loads.append(LiftLoad(f"load {j}", mass, fl, fw, drop_height=None,
                                  hook_elevation=elevation + hang + h, hang_length=hang,
                                  contact_stiffness=k))
        else:
            loads.append(LiftLoad(f"load {j}", mass, fl, fw, drop_height=h,
                                  contact_stiffness=k))
    # a corridor over the deck, its drift margin inside the deck edge
    corridor = ((0.6, 0.6), (W - 0.6, 0.6), (W - 0.6, H - 0.6), (0.6, H - 0.6))
    zone = LiftZone("Z1", "zone", "L1", (W / 2, -5.0), 0.0, 5.0 + H + 1.0,
                    math.radians(30.0), math.radians(150.0), 0.5, corridor=corridor,
                    loads=tuple(loads))
    prot = []
    if pads and rng.random() < 0.5:
        x0 = float(np.round(rng.uniform(0.0, W / 2), 2))
        y0 = float(np.round(rng.uniform(0.0, H / 2), 2))
        rect = Rect(x0, y0, x0 + float(np.round(rng.uniform(1.0, W / 2), 2)),
                    y0 + float(np.round(rng.uniform(1.0, H / 2), 2)))
        t = float(np.round(rng.uniform(0.05, 0.18), 3))
        if rng.random() < 0.5:
            prot.append(ProtectionArea("PAD", "pad", "L1", rect, "crushable", t, None,
                                       crush_force=float(rng.uniform(3e4, 2e5)),
                                       crush_stroke=float(rng.uniform(0.05, 0.3))))
        else:
            prot.append(ProtectionArea("MAT", "mat", "L1", rect, "spring", t,
                                       float(rng.uniform(2e6, 5e7))))
    # every third project in US units on the AISC basis (the words and rounding of the
    # other unit system)
    settings = Settings(grid_resolution=1.0, unit_system="US", design_basis="aisc360") \
        if seed % 3 == 0 else Settings(grid_resolution=1.0)
    return Project(settings=settings, levels=tuple(levels),
                   lift_zones=(zone,), protection_areas=tuple(prot))

"""Record, and compare against a recording, every output of the solver on the two demo
projects and on 200 random projects (random framing, end conditions, sections, loads,
mats, crushable pads, openings and settings), plus the calculation trace at a few points
of each and ``assess_member`` on random single members.

Not a test of the physics (that is checked against published sources in ``tests/``):
this guards that a refactoring of the solver changes no number.

    python benchmarks/equivalence.py record out.npz     # before a change
    python benchmarks/equivalence.py compare out.npz    # after: max relative difference

With ``DROPRIG_EQ_AMPLIFIED=1`` in the environment every project is analysed with the
setting ``dynamic_amplification`` on (``=0``: off), whatever its file or the default.
``DROPRIG_EQ_N`` sets the number of random projects (200), ``DROPRIG_EQ_REL`` the
relative tolerance (1e-9; a speed change that reorders no arithmetic keeps 1e-12).

Compared within 1e-9 relative (NaN equal NaN; integers and strings exactly). Invented
data only (random inputs): nothing here is an expected value of the physics.
"""

from __future__ import annotations

import math
import os
import sys
from dataclasses import fields, replace
from pathlib import Path

import numpy as np

from droprig.model import (
    Deck,
    LiftLoad,
    LiftZone,
    ModelError,
    Project,
    ProtectionArea,
    Rect,
    Section,
    Settings,
    generate_level,
)
from droprig.solver import analyse, assess_member, trace_point

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from tests.builders import BEAM, GIRDER, S355  # noqa: E402

REL = float(os.environ.get("DROPRIG_EQ_REL", "1e-9"))
N_RANDOM = int(os.environ.get("DROPRIG_EQ_N", "200"))

GRADE = S355
SLENDER = Section("S400", "custom", d=0.4, bf=0.25, tw=0.007, tf=0.012, r=0.01,
                  A=8.7e-3, Ix=2.5e-4, Sx=1.25e-3, Zx=1.38e-3, Iy=3.1e-5,
                  mass_per_length=68.3)


def _scaled(sec: Section, s: float, name: str) -> Section:
    return replace(sec, name=name, d=sec.d * s, bf=sec.bf * s, tw=sec.tw * s, tf=sec.tf * s,
                   r=sec.r * s, A=sec.A * s**2, Ix=sec.Ix * s**4, Sx=sec.Sx * s**3,
                   Zx=sec.Zx * s**3, Iy=sec.Iy * s**4, mass_per_length=sec.mass_per_length * s**2)


def random_project(seed: int) -> Project:
    """A random, valid project (invented data)."""
    rng = np.random.default_rng(seed)
    nx, ny = int(rng.integers(1, 4)), int(rng.integers(1, 4))
    xs = tuple(float(v) for v in rng.uniform(4.0, 10.0, nx).round(2))
    ys = tuple(float(v) for v in rng.uniform(4.0, 10.0, ny).round(2))
    beam_sec = SLENDER if rng.random() < 0.2 else _scaled(BEAM, float(rng.uniform(0.8, 1.3)),
                                                          "B")
    openings: tuple[Rect, ...] = ()
    if rng.random() < 0.3:
        ox, oy = float(rng.uniform(0.5, xs[0] - 1.5)), float(rng.uniform(0.5, ys[0] - 1.5))
        openings = (Rect(ox, oy, ox + 0.8, oy + 0.6),)
    level = generate_level(
        level_id="L1", name="random", elevation=float(rng.uniform(3.0, 20.0)),
        x_spacings=xs, y_spacings=ys, girder_direction="x" if rng.random() < 0.5 else "y",
        beam_spacing=float(rng.uniform(1.5, 3.5)),
        girder_section=_scaled(GIRDER, float(rng.uniform(0.8, 1.3)), "G"),
        beam_section=beam_sec, girder_grade=GRADE, beam_grade=GRADE,
        deck=Deck(thickness=float(rng.uniform(0.1, 0.25)), openings=openings),
        superimposed_dead=float(rng.uniform(0.0, 2000.0)),
        live_in_place=float(rng.uniform(0.0, 1000.0)))
    if rng.random() < 0.4:  # some fixed / propped ends
        members = []
        for m in level.members:
            c = str(rng.choice(["simple", "fixed", "propped"], p=[0.6, 0.2, 0.2]))
            members.append(replace(m, end_condition=c))
        level = replace(level, members=tuple(members))
    W, H = sum(xs), sum(ys)
    loads = []
    for i in range(int(rng.integers(1, 4))):
        fl, fw = float(rng.uniform(0.2, 2.5)), float(rng.uniform(0.2, 2.5))
        k_load = float(rng.uniform(1e6, 1e9)) if rng.random() < 0.3 else None
        if rng.random() < 0.7:
            loads.append(LiftLoad(f"load{i}", float(rng.uniform(50.0, 8000.0)), fl, fw,
                                  drop_height=float(rng.uniform(0.05, 3.0)),
                                  contact_stiffness=k_load))
        else:
            loads.append(LiftLoad(f"load{i}", float(rng.uniform(50.0, 8000.0)), fl, fw,
                                  drop_height=None,
                                  hook_elevation=level.elevation + float(rng.uniform(4, 9)),
                                  hang_length=float(rng.uniform(0.5, 3.5)),
                                  contact_stiffness=k_load))
    r_max = float(rng.uniform(8.0, 30.0))
    zones = [LiftZone("Z1", "zone", "L1", (float(rng.uniform(-5, W + 5)),
                                           float(rng.uniform(-5, H + 5))),
                      float(rng.uniform(0.0, 3.0)), r_max, loads=tuple(loads))]
    if rng.random() < 0.3:
        zones.append(LiftZone("Z2", "corridor", "L1", (W / 2, -10.0), 2.0, 40.0,
                              drift_margin=0.5,
                              corridor=((0.5, 0.5), (W * 0.7, 0.5), (W * 0.7, H * 0.6),
                                        (0.5, H * 0.6)), loads=tuple(loads[:1])))
    prot = []
    for i in range(int(rng.integers(0, 3))):
        x0, y0 = float(rng.uniform(0, W - 2)), float(rng.uniform(0, H - 2))
        r = Rect(x0, y0, x0 + float(rng.uniform(1, 4)), y0 + float(rng.uniform(1, 4)))
        if rng.random() < 0.5:
            prot.append(ProtectionArea(f"M{i}", "mat", "L1", r, "spring",
                                       float(rng.uniform(0.05, 0.3)),
                                       float(rng.uniform(1e6, 1e8))))
        else:
            prot.append(ProtectionArea(f"P{i}", "pad", "L1", r, "crushable",
                                       float(rng.uniform(0.05, 0.3)), None,
                                       crush_force=float(rng.uniform(2e4, 3e5)),
                                       crush_stroke=float(rng.uniform(0.02, 0.3))))
    settings = Settings(
        design_basis=str(rng.choice(["en1993", "aisc360"])),  # type: ignore[arg-type]
        grid_resolution=float(rng.choice([0.75, 1.0, 1.5])),
        include_member_mass=bool(rng.random() < 0.8),
        include_existing_loads=bool(rng.random() < 0.8),
        ductility_limit=float(rng.uniform(2.0, 20.0)),
        rotation_limit=math.radians(float(rng.uniform(1.0, 8.0))))
    return Project(settings=settings, levels=(level,), lift_zones=tuple(zones),
                   protection_areas=tuple(prot))


def projects() -> list[tuple[str, Project]]:
    from droprig.io.project_file import load_project

    out = [(p.stem, load_project(p)) for p in sorted((ROOT / "demo_projects").glob("*.droprig"))]
    for s in range(N_RANDOM):
        try:
            out.append((f"random{s}", random_project(s)))
        except ModelError:
            continue
    amp = os.environ.get("DROPRIG_EQ_AMPLIFIED")
    if amp in ("0", "1"):
        out = [(n, replace(p, settings=replace(p.settings, dynamic_amplification=amp == "1")))
               for n, p in out]
    return out


def _put(rec: dict[str, np.ndarray], key: str, value: object) -> None:
    rec[key] = np.asarray(value if value is not None else np.nan)


def record_project(name: str, project: Project, rec: dict[str, np.ndarray]) -> None:
    try:
        res = analyse(project)
    except ModelError as exc:
        rec[f"{name}/error"] = np.asarray(str(exc))
        return
    rec[f"{name}/warnings"] = np.asarray("\n".join(res.warnings))
    for i, c in enumerate(res.cases):
        for f in fields(c):
            _put(rec, f"{name}/case{i}/{f.name}", getattr(c, f.name))
    for i, b in enumerate(res.bays):
        for f in fields(b):
            _put(rec, f"{name}/bay{i}/{f.name}", getattr(b, f.name))
    rng = np.random.default_rng(len(name))
    for i, c in enumerate(res.cases):
        if c.n == 0:
            continue
        for j in rng.choice(c.n, size=min(3, c.n), replace=False):
            try:
                t = trace_point(project, c.zone_id, c.load_name, float(c.x[j]), float(c.y[j]))
            except ModelError as exc:
                rec[f"{name}/trace{i}.{j}/error"] = np.asarray(str(exc))
                continue
            key = f"{name}/trace{i}.{j}"
            rec[key + "/verdict"] = np.asarray(f"{t.response}|{t.governing_member}|"
                                               f"{t.governing_check}")
            rec[key + "/titles"] = np.asarray("\n".join(f"{s.title}|{s.symbol}|{s.formula}|"
                                                        f"{s.quantity}|{s.source}"
                                                        for s in t.steps))
            rec[key + "/values"] = np.asarray([s.value for s in t.steps], float)
            rec[key + "/inputs"] = np.asarray([v for s in t.steps
                                               for v, _ in s.inputs.values()], float)


def record_members(rec: dict[str, np.ndarray]) -> None:
    rng = np.random.default_rng(5)
    for i in range(200):
        cond = str(rng.choice(["simple", "fixed", "propped", "cantilever"]))
        L = float(rng.uniform(2.0, 12.0))
        kw: dict[str, object] = {}
        r = rng.random()
        if r < 0.2:
            kw["cushion_stiffness"] = float(rng.uniform(1e6, 1e8))
        elif r < 0.35:
            kw["crush_force"] = float(rng.uniform(2e4, 3e5))
            kw["crush_stroke"] = float(rng.uniform(0.02, 0.3))
        if rng.random() < 0.3:
            kw["load_stiffness"] = float(rng.uniform(1e6, 1e9))
        try:
            out = assess_member(_scaled(BEAM, float(rng.uniform(0.7, 1.5)), "B"), GRADE,
                                cond, L, float(rng.uniform(0.05, 0.95)) * L,
                                float(rng.uniform(100.0, 6000.0)),
                                float(rng.uniform(0.0, 2.0)),
                                basis=str(rng.choice(["en1993", "aisc360"])),
                                bearing=float(rng.uniform(0.0, 0.5)),
                                udl=float(rng.uniform(0.0, 8000.0)),
                                beam_mass=bool(rng.random() < 0.8), **kw)  # type: ignore[arg-type]
        except (ModelError, ArithmeticError) as exc:
            rec[f"member{i}/error"] = np.asarray(f"{type(exc).__name__}: {exc}")
            continue
        for k, v in out.items():
            _put(rec, f"member{i}/{k}", v)


def record() -> dict[str, np.ndarray]:
    rec: dict[str, np.ndarray] = {}
    for name, project in projects():
        record_project(name, project, rec)
    record_members(rec)
    return rec


def compare(ref: dict[str, np.ndarray], got: dict[str, np.ndarray],
            skip: tuple[str, ...] = ()) -> list[str]:
    """Differences beyond :data:`REL` (relative; NaN equals NaN), one line each."""
    bad = []
    for k in sorted(set(ref) | set(got)):
        if any(s in k for s in skip):
            continue
        if k not in ref or k not in got:
            bad.append(f"{k}: only in {'recording' if k in ref else 'this run'}")
            continue
        a, b = ref[k], got[k]
        if a.shape != b.shape:
            bad.append(f"{k}: shape {a.shape} != {b.shape}")
        elif a.dtype.kind in "fc":
            aa, bb = a.astype(float), b.astype(float)
            same = (aa == bb) | (np.isnan(aa) & np.isnan(bb))
            with np.errstate(invalid="ignore"):
                close = np.abs(aa - bb) <= REL * np.maximum(np.abs(aa), np.abs(bb))
            if not np.all(same | close):
                i = int(np.flatnonzero(~(same | close))[0])
                bad.append(f"{k}: {aa.ravel()[i]!r} != {bb.ravel()[i]!r} "
                           f"({int(np.sum(~(same | close)))} values)")
        elif not np.array_equal(a, b):
            bad.append(f"{k}: {a!r} != {b!r}"[:300])
    return bad


def main(argv: list[str]) -> int:
    if len(argv) < 3 or argv[1] not in ("record", "compare"):
        print(__doc__)
        return 2
    rec = record()
    if argv[1] == "record":
        np.savez_compressed(argv[2], **rec)  # type: ignore[arg-type]
        print(f"recorded {len(rec)} arrays to {argv[2]}")
        return 0
    with np.load(argv[2]) as z:
        ref = {k: z[k] for k in z.files}
    skip = tuple(argv[3:])
    bad = compare(ref, rec, skip)
    for line in bad[:40]:
        print(line)
    print(f"{len(rec)} arrays compared, {len(bad)} differ beyond {REL:g} relative")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))

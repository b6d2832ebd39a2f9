"""Speed of the floor-system solver (prints figures and ratios; not part of ``make test``).

Run: ``.venv/bin/python benchmarks/bench_solver.py [--quick]``

1. drop-point × member evaluations per second (load path + compliance + Rayleigh
   mass; and the full per-point analysis with every check);
2. the demo projects' full ``analyse`` (median; cold = floor prepared afresh,
   warm = prepared floor reused as in live re-analysis);
3. 10⁶ drop points: time and peak traced memory (tracemalloc);
4. against a naive per-point Python loop over the same code;
5. against building and solving a PyNiteFEA grillage per drop point.

Targets from issue 9: demo warm ≤ 35 ms median, 10⁶ points ≤ 1.2 s and ≤ 500 MB,
≥ 200× a naive loop, ≥ 10⁴× PyNiteFEA per point.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
import tracemalloc
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from droprig.io.project_file import load_project  # noqa: E402
from droprig.solver import analysis, evaluate, floor, loadpath, parallel  # noqa: E402

DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _median_time(fn, runs: int) -> float:
    ts = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        ts.append(time.perf_counter() - t)
    return statistics.median(ts)


def _median_times(fn, runs: int) -> tuple[float, float]:
    """Median wall-clock and median CPU time (``time.process_time``: less disturbed
    by other work on a shared machine) of ``runs`` calls, s."""
    wall, cpu = [], []
    for _ in range(runs):
        t, c = time.perf_counter(), time.process_time()
        fn()
        wall.append(time.perf_counter() - t)
        cpu.append(time.process_time() - c)
    return statistics.median(wall), statistics.median(cpu)


def bench_amplification(projects: list, runs: int) -> dict[str, dict[str, float]]:
    """Warm ``analyse()`` of each demo with the project setting
    ``dynamic_amplification`` off and on: median wall and CPU time, s."""
    out: dict[str, dict[str, float]] = {}
    for name, proj in projects:
        r: dict[str, float] = {}
        for flag in (False, True):
            p_f = replace(proj, settings=replace(proj.settings, dynamic_amplification=flag))
            analysis.analyse(p_f)
            key = "on" if flag else "off"
            r[key], r[key + "_cpu"] = _median_times(lambda p_f=p_f: analysis.analyse(p_f),
                                                    runs)
        out[name] = r
    return out


def _random_points(level, n: int, seed: int = 0) -> tuple[np.ndarray, np.ndarray]:
    ext = level.grid.extent
    rng = np.random.default_rng(seed)
    return rng.uniform(ext.x0, ext.x1, n), rng.uniform(ext.y0, ext.y1, n)


def _members_per_point(fm, geo) -> float:
    pairs = geo.path.pair[geo.path.pair >= 0]
    counts = np.array([len(loadpath.path_members(fm.frame, int(p)))
                       for p in range(fm.frame.n_pairs)])
    return float(np.mean(counts[pairs]))


def bench_reference(runs: int = 7) -> float:
    """A fixed numpy workload (s, median): the machine's own speed at the time of the
    run, to read the other figures against (shared machines vary by tens of % from
    one minute to the next)."""
    rng = np.random.default_rng(0)
    a, b = rng.random(1 << 15), rng.random(1 << 15)

    def work() -> None:
        for _ in range(300):
            c = a * b
            c += a
            np.abs(c, out=c)
            np.sqrt(c, out=c)
            c.max()

    return _median_time(work, runs)


def bench_throughput(project, n: int) -> dict[str, float]:
    zone = project.lift_zones[0]
    fm = analysis.floor_model(project.level(zone.level_id), project.settings)
    x, y = _random_points(fm.level, n)
    analysis.point_geometry(fm, project, x[:1000], y[:1000])  # warm the tables
    t = time.perf_counter()
    geo = analysis.point_geometry(fm, project, x, y)
    t_geo = time.perf_counter() - t
    t = time.perf_counter()
    evaluate.evaluate_case(fm, project, zone.loads[0], geo)
    t_case = time.perf_counter() - t
    mpp = _members_per_point(fm, geo)
    return {"points": n, "members_per_point": mpp, "t_path": t_geo, "t_checks": t_case,
            "evals_per_s_path": n * mpp / t_geo, "evals_per_s_full": n * mpp / (t_geo + t_case)}


def bench_million(project, n: int, runs: int = 3) -> dict[str, float]:
    """10⁶ random drop points of the first load of the first zone: the load path
    alone, and the full analysis as ``analyse`` runs a large zone
    (:func:`evaluate.evaluate_points`: geometry and checks block by block on all
    cores); median of ``runs`` after one warm-up; peak traced memory of one run."""
    zone = project.lift_zones[0]
    load = zone.loads[0]
    fm = analysis.floor_model(project.level(zone.level_id), project.settings)
    x, y = _random_points(fm.level, n, seed=1)
    evaluate.evaluate_points(fm, project, [load], x[:100_000], y[:100_000])  # warm-up
    t_path = _median_time(lambda: analysis.point_geometry(fm, project, x, y), runs)
    t_full = _median_time(lambda: evaluate.evaluate_points(fm, project, [load], x, y), runs)
    tracemalloc.start()
    analysis.point_geometry(fm, project, x, y)
    _, peak_geo = tracemalloc.get_traced_memory()
    tracemalloc.reset_peak()
    evaluate.evaluate_points(fm, project, [load], x, y)
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    return {"points": n, "t_path": t_path, "t_full": t_full,
            "peak_MB_path": peak_geo / 1e6, "peak_MB_full": peak / 1e6,
            "threads": parallel.workers()}


def bench_tilted(projects, runs: int) -> dict[str, dict[str, float]]:
    """Cost of the second landing case: each demo's warm ``analyse`` (median) with the
    setting ``tilted_landing`` off and on."""
    from dataclasses import replace

    out: dict[str, dict[str, float]] = {}
    for name, proj in projects:
        t = {}
        for on in (False, True):
            p = replace(proj, settings=replace(proj.settings, tilted_landing=on))
            analysis.analyse(p)
            t["on" if on else "off"] = _median_time(lambda p=p: analysis.analyse(p), runs)
        out[name] = t
    return out


_STAGES = (
    ("analysis points (base + refinement)", "refine", "zone_points_geometry"),
    ("confirm: each point's plastic height", "confirm", "confirm_point_heights"),
    ("confirm: the bays' limits (rounds)", "confirm", "confirm_bay_limits"),
    ("cascade to the level below", "analysis", "cascade_down"),
    ("bay summaries", "summary", "summarise"),
    ("geometry of new points", "geometry", "point_geometry"),
    ("geometry taken for trials", "geometry", "take_geo"),
    ("member actions of new points", "unit_actions", "unit_actions"),
)
"""(label, module under droprig.solver, function) of the warm analyse() timed by
:func:`bench_steps` besides the chain's steps (nested: a stage includes the chain runs
and steps inside it)."""


def bench_steps(projects, runs: int) -> dict[str, dict[str, float]]:
    """Where each demo's warm ``analyse()`` goes: the wall time of every step of the
    chain (:data:`droprig.solver.chain.STEPS`, summed over its runs, with the runs
    and points per analysis) and of the stages of :data:`_STAGES`, by wrapping them
    for ``runs`` analyses (mean per analysis; the wrappers add ~1 µs a call). Also
    the cost of one chain run on 10 points (the fixed cost of a run: some thousand
    numpy calls) and per point beyond that (10 → 3,000 points)."""
    import importlib

    from droprig.solver import chain, geometry, unit_actions

    out: dict[str, dict[str, float]] = {}
    T: dict[str, float] = {}
    N: dict[str, float] = {}
    saved: list[tuple[object, str, object]] = []

    rows_in: dict[str, float] = {}

    def timed(label: str, fn):
        def w(*a, **k):
            if label.startswith("step "):  # the points each step works on
                rows_in[label] = rows_in.get(label, 0.0) + a[0].drop.n
            t = time.perf_counter()
            try:
                return fn(*a, **k)
            finally:
                T[label] = T.get(label, 0.0) + time.perf_counter() - t
                N[label] = N.get(label, 0.0) + 1
        w.__name__ = getattr(fn, "__name__", label)  # chain.HEIGHT_FREE finds steps by name
        return w

    def patch(obj: object, name: str, new: object) -> None:
        saved.append((obj, name, getattr(obj, name)))
        setattr(obj, name, new)

    steps = chain.STEPS
    pts = {"n": 0}

    def count_points(c):
        pts["n"] += c.drop.n
        return c
    try:
        patch(chain, "STEPS", tuple(timed("step " + s.__name__, s) for s in steps))
        for label, mod, fn in _STAGES:
            m = importlib.import_module(f"droprig.solver.{mod}")
            f = timed(label, getattr(m, fn))
            # every module that imported the function by name
            for other in ("analysis", "refine", "confirm", "evaluate", "chain",
                          "geometry", "unit_actions", "summary"):
                om = importlib.import_module(f"droprig.solver.{other}")
                if getattr(om, fn, None) is getattr(m, fn):
                    patch(om, fn, f)
        run = chain.run_chain
        patch(chain, "run_chain", timed("chain runs",
                                         lambda d, given=None: count_points(run(d, given))))
        from droprig.solver import evaluate as ev_mod
        patch(ev_mod, "run_chain", chain.run_chain)
        for name, proj in projects:
            analysis.analyse(proj)
            T.clear()
            N.clear()
            rows_in.clear()
            pts["n"] = 0
            t = time.perf_counter()
            for _ in range(runs):
                analysis.analyse(proj)
            total = (time.perf_counter() - t) / runs
            res = {k: v / runs for k, v in T.items()}
            res["total"] = total
            res["chain runs per analysis"] = N.get("chain runs", 0.0) / runs
            res["points per analysis"] = pts["n"] / runs
            res["step points"] = {k: v / runs for k, v in rows_in.items()}
            out[name] = res
    finally:
        for obj, name, old in reversed(saved):
            setattr(obj, name, old)
    # the fixed cost of a chain run and the cost per point
    for name, proj in projects:
        zone = proj.lift_zones[0]
        fm = analysis.floor_model(proj.level(zone.level_id), proj.settings)
        x, y = _random_points(fm.level, 3000, seed=4)
        per = {}
        for n in (10, 3000):
            geo = geometry.point_geometry(fm, proj, x[:n], y[:n])
            unit_actions.unit_actions(fm, geo)
            per[n] = _median_time(lambda geo=geo, fm=fm, proj=proj, zone=zone:
                                  evaluate.evaluate_case(fm, proj, zone.loads[0], geo,
                                                         v_hoist=zone.hoist_speed), 15)
        out[name]["run_10_points"] = per[10]
        out[name]["per_point_beyond"] = (per[3000] - per[10]) / 2990
    return out


def bench_naive(project, n_loop: int, n_vec: int) -> dict[str, float]:
    """The same code called once per drop point from a Python loop."""
    zone = project.lift_zones[0]
    load = zone.loads[0]
    fm = analysis.floor_model(project.level(zone.level_id), project.settings)
    x, y = _random_points(fm.level, max(n_loop, n_vec), seed=2)
    t = time.perf_counter()
    for i in range(n_loop):
        g = analysis.point_geometry(fm, project, x[i:i + 1], y[i:i + 1])
        evaluate.evaluate_case(fm, project, load, g)
    per_loop = (time.perf_counter() - t) / n_loop
    t = time.perf_counter()
    g = analysis.point_geometry(fm, project, x[:n_vec], y[:n_vec])
    evaluate.evaluate_case(fm, project, load, g)
    per_vec = (time.perf_counter() - t) / n_vec
    return {"per_point_loop_us": per_loop * 1e6, "per_point_vectorised_us": per_vec * 1e6,
            "ratio": per_loop / per_vec}


def _pynite_compliance(level, loads) -> float:
    """Build and solve a PyNiteFEA grillage of ``level`` for unit point loads
    [(member index, position, magnitude)]; return Σ P·δ (same model as
    tests/solver/test_grillage_pynite.py)."""
    from Pynite import FEModel3D

    m = FEModel3D()
    names: dict[tuple[float, float], str] = {}

    def node(px: float, py: float) -> str:
        key = (round(px, 6), round(py, 6))
        if key not in names:
            names[key] = f"N{len(names)}"
            m.add_node(names[key], px, 0.0, py)
        return names[key]

    splits = {k: {0.0, mb.span} for k, mb in enumerate(level.members)}
    for k, mb in enumerate(level.members):
        ax = 0 if mb.axis == "x" else 1
        for j, other in enumerate(level.members):
            if j == k or other.axis == mb.axis:
                continue
            for p in (other.start, other.end):
                if abs(p[1 - ax] - mb.start[1 - ax]) < 1e-6:
                    s = abs(p[ax] - mb.start[ax])
                    if 1e-6 < s < mb.span - 1e-6:
                        splits[k].add(s)
    for k, s, _ in loads:
        splits[k].add(s)
    cols = {(round(px, 6), round(py, 6)) for px, py in level.grid.columns}
    loaded = []
    for k, mb in enumerate(level.members):
        mat = f"E{mb.grade.E:.6g}"
        if mat not in m.materials:
            m.add_material(mat, mb.grade.E, mb.grade.E / 2.6, 0.3, 7850.0)
        m.add_section(f"S{k}", mb.section.A, mb.section.Iy, mb.section.Ix, 1e-6)
        ss = sorted(splits[k])
        (x0, y0), (x1, y1) = mb.start, mb.end
        for i in range(len(ss) - 1):
            a, b = ss[i] / mb.span, ss[i + 1] / mb.span
            nm = f"M{k}_{i}"
            m.add_member(nm, node(x0 + (x1 - x0) * a, y0 + (y1 - y0) * a),
                         node(x0 + (x1 - x0) * b, y0 + (y1 - y0) * b), mat, f"S{k}")
            m.def_releases(nm, Rxi=i == 0, Rzi=i == 0, Rzj=i == len(ss) - 2)
        for kk, s, P in loads:
            if kk == k:
                t = s / mb.span
                loaded.append((node(x0 + (x1 - x0) * t, y0 + (y1 - y0) * t), P))
    for key, nm in names.items():
        if key in cols:
            m.def_support(nm, True, True, True, True, True, True)
    for nm, P in loaded:
        m.add_node_load(nm, "FY", -P)
    m.analyze_linear(check_statics=False)
    return sum(-P * m.nodes[nm].DY["Combo 1"] for nm, P in loaded)


def bench_pynite(project, n_fe: int, n_vec: int) -> dict[str, float]:
    zone = project.lift_zones[0]
    fm = analysis.floor_model(project.level(zone.level_id), project.settings)
    x, y = _random_points(fm.level, n_vec, seed=3)
    res = loadpath.evaluate(fm.frame, x, y)
    ok = np.flatnonzero(res.pair >= 0)[:n_fe]
    t = time.perf_counter()
    worst = 0.0
    for i in ok:
        loads = [(int(res.members[i, k]), float(res.a[i, k]), float(res.share[i, k]))
                 for k in range(2) if res.share[i, k] > 0]
        f_fe = _pynite_compliance(fm.level, loads)
        worst = max(worst, abs(f_fe - res.f[i]) / f_fe)
    per_fe = (time.perf_counter() - t) / ok.size
    t = time.perf_counter()
    loadpath.evaluate(fm.frame, x, y)
    per_vec = (time.perf_counter() - t) / n_vec
    return {"per_point_pynite_ms": per_fe * 1e3, "per_point_vectorised_us": per_vec * 1e6,
            "ratio": per_fe / per_vec, "max_rel_difference": worst}


def bench_two_forces(projects: list, runs: int) -> dict[str, dict[str, float]]:
    """Warm ``analyse()`` of each demo with two forces per point off and on
    (``chain.TWO_FORCES``), the two timed in turn so that a busy machine weighs on
    both alike; median seconds."""
    from droprig.solver import chain

    was = chain.TWO_FORCES
    out: dict[str, dict[str, float]] = {}
    try:
        for name, proj in projects:
            ts: dict[bool, list[float]] = {False: [], True: []}
            for flag in (False, True):
                chain.TWO_FORCES = flag
                analysis.analyse(proj)
            for _ in range(runs):
                for flag in (False, True):
                    chain.TWO_FORCES = flag
                    t = time.perf_counter()
                    analysis.analyse(proj)
                    ts[flag].append(time.perf_counter() - t)
            out[name] = {"off": statistics.median(ts[False]),
                         "on": statistics.median(ts[True])}
    finally:
        chain.TWO_FORCES = was
    return out


def _print_amplification(name: str, amp: dict[str, float]) -> None:
    print(f"   {name}: amplification off {amp['off'] * 1e3:.1f} ms, on "
          f"{amp['on'] * 1e3:.1f} ms — ratio {amp['on'] / amp['off']:.2f}; CPU time "
          f"{amp['off_cpu'] * 1e3:.1f} / {amp['on_cpu'] * 1e3:.1f} ms — ratio "
          f"{amp['on_cpu'] / amp['off_cpu']:.2f} (target ≤ 2)")


def main(argv: list[str] | None = None) -> dict[str, object]:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="small sizes (smoke run)")
    ap.add_argument("--amplification", action="store_true",
                    help="only the demos' analyse() with amplification off / on")
    args = ap.parse_args(argv)
    q = args.quick
    out: dict[str, object] = {}
    projects = [(p.name, load_project(p)) for p in DEMOS]
    if not projects:
        print("no demo projects found in demo_projects/")
        return out
    if args.amplification:
        print("demo projects, warm analyse() with dynamic amplification off / on (median)")
        for name, proj in projects:
            amp = bench_amplification([(name, proj)], 5 if q else 11)[name]
            out[f"amplification:{name}"] = amp
            _print_amplification(name, amp)
        return out
    name0, proj0 = projects[0]
    print(f"droprig solver benchmarks — {'quick' if q else 'full'} run")
    ref = bench_reference()
    out["reference_s"] = ref
    print(f"\n0. machine reference (fixed numpy workload, one thread): {ref * 1e3:.1f} ms")
    tp = bench_throughput(proj0, 20_000 if q else 200_000)
    out["throughput"] = tp
    print(f"\n1. throughput on {name0} ({tp['points']} points, "
          f"{tp['members_per_point']:.2f} members per path)")
    print(f"   load path + compliance + mass: {tp['evals_per_s_path']:.3g} point×member/s")
    print(f"   full analysis with all checks: {tp['evals_per_s_full']:.3g} point×member/s")
    print("\n2. demo projects, full analyse() (median)")
    for name, proj in projects:
        def cold(proj=proj):
            floor._FLOORS.clear()
            analysis.analyse(proj)

        analysis.analyse(proj)
        warm = _median_time(lambda proj=proj: analysis.analyse(proj), 5 if q else 21)
        t_cold = _median_time(cold, 3 if q else 11)
        npts = analysis.analyse(proj).n_points
        print(f"   {name}: {warm * 1e3:.1f} ms warm, {t_cold * 1e3:.1f} ms cold "
              f"({npts} drop points × loads)  target ≤ 35 ms")
        # dynamic amplification off / on (the project setting; warm, median)
        amp = bench_amplification([(name, proj)], 5 if q else 11)[name]
        out[f"demo:{name}"] = {"warm_s": warm, "cold_s": t_cold, "points": npts,
                               "amplification_off_s": amp["off"],
                               "amplification_on_s": amp["on"],
                               "amplification_off_cpu_s": amp["off_cpu"],
                               "amplification_on_cpu_s": amp["on_cpu"]}
        _print_amplification(name, amp)
    two = bench_two_forces(projects, 5 if q else 15)
    out["two_forces"] = two
    print("\n2a. two forces per point (chain.TWO_FORCES) off / on (warm analyse(), median, "
          "interleaved)")
    for name, t in two.items():
        print(f"   {name}: off {t['off'] * 1e3:.1f} ms, on {t['on'] * 1e3:.1f} ms "
              f"(× {t['on'] / t['off']:.2f}, target ≤ 1.5)")
    tilt = bench_tilted(projects, 5 if q else 21)
    out["tilted"] = tilt
    print("\n2b. the tilted landing as a second case (warm analyse(), median)")
    for name, t in tilt.items():
        print(f"   {name}: flat only {t['off'] * 1e3:.1f} ms, flat + tilted "
              f"{t['on'] * 1e3:.1f} ms (× {t['on'] / t['off']:.2f})")
    steps = bench_steps(projects, 3 if q else 11)
    out["steps"] = steps
    print("\n2c. where each demo's warm analyse() goes (mean of the runs; stages include "
          "the chain runs inside them)")
    for name, r in steps.items():
        print(f"   {name}: {r['total'] * 1e3:.1f} ms, {r['chain runs per analysis']:.0f} "
              f"chain runs, {r['points per analysis']:.0f} points × loads; one run "
              f"{r['run_10_points'] * 1e3:.1f} ms on 10 points + "
              f"{r['per_point_beyond'] * 1e6:.2f} µs a point")
        sp = r.get("step points", {})
        rows = sorted(((k, v) for k, v in r.items() if k not in (
            "total", "chain runs per analysis", "points per analysis", "run_10_points",
            "per_point_beyond", "step points")), key=lambda kv: -kv[1])
        for k, v in rows:
            pts_k = f"  ({sp[k]:.0f} points)" if k in sp else ""
            print(f"      {k:40s} {v * 1e3:7.2f} ms{pts_k}")
    n = 100_000 if q else 1_000_000
    mil = bench_million(proj0, n)
    out["million"] = mil
    print(f"\n3. {n} drop points on {name0} ({mil['threads']} threads, median of 3)")
    print(f"   load path + compliance + mass: {mil['t_path']:.2f} s, "
          f"peak {mil['peak_MB_path']:.0f} MB")
    print(f"   full analysis with all checks: {mil['t_full']:.2f} s, "
          f"peak {mil['peak_MB_full']:.0f} MB  target ≤ 1.2 s, ≤ 500 MB")
    nv = evaluate.loadpath_chunk()
    naive = bench_naive(proj0, 100 if q else 500, nv)
    out["naive"] = naive
    print(f"\n4. naive per-point loop: {naive['per_point_loop_us']:.0f} µs/point vs "
          f"{naive['per_point_vectorised_us']:.2f} µs/point vectorised → "
          f"{naive['ratio']:.0f}×  target ≥ 200×")
    try:
        fe = bench_pynite(proj0, 3 if q else 10, 100_000)
    except ImportError:
        print("\n5. PyNiteFEA not installed: skipped")
    else:
        out["pynite"] = fe
        print(f"\n5. PyNiteFEA grillage per point: {fe['per_point_pynite_ms']:.0f} ms vs "
              f"{fe['per_point_vectorised_us']:.2f} µs/point vectorised compliance → "
              f"{fe['ratio']:.3g}×  target ≥ 1e4× (largest difference "
              f"{fe['max_rel_difference']:.1e})")
    return out


if __name__ == "__main__":
    main()

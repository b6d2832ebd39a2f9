"""The after-bottoming model (droprig.solver.chain.after_bottoming, with the crushing
branch's floor, chain.bottoming_floor, as chain._bottomed_forces takes it) against the
exact two-mass history (droprig.solver.crushhistory.crush_history, the window's peak):
contact and framing forces ÷ the history's, median / 90th percentile / largest / least,
on every row the chain meets while analysing the three demo projects (a sample of them)
and on random bottoming systems; which of the model's terms sets the framing force, and
the history's own all-time bound (``F_all``) beside it. An engineer's measurement of
where a bound is loose; invented demos, no expected values.

Run: ``PYTHONPATH=. .venv/bin/python scripts/bottoming_ratios.py [N_RANDOM]``.

The random systems (seed 20261205 + 1): load 100–10 000 kg, framing 10⁶–10⁸ N/m,
μ = m2/M 0.3–300, κ = k_c/k2 0.003–3000, ρ = F_c/W 1.1–33, stroke 1–3000 × the
floor's static deflection under F_c, and the energy height 1.001–1.2 × (two in five:
just bottoming) or 1.2–32 × the one-mass bottoming height (deep); only those the
one-mass balance bottoms out (where the chain takes this model). No deck crushing
(F_crush infinite): the history has none.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
SEED = 20261206
DEMO_SAMPLE = 1500


def random_systems(n: int, seed: int = SEED) -> dict[str, np.ndarray]:
    """Random bottoming systems (module docstring), SI units."""
    from droprig.solver import impact

    G = impact.G
    rng = np.random.default_rng(seed)
    M = 1000.0 * 10 ** rng.uniform(-1, 1, n)
    mu = 10 ** rng.uniform(np.log10(0.3), np.log10(300), n)
    ka = 10 ** rng.uniform(np.log10(0.003), np.log10(3000), n)
    k2 = 1e7 * 10 ** rng.uniform(-1, 1, n)
    rho = 1 + 10 ** rng.uniform(-1, 1.5, n)
    la = 10 ** rng.uniform(0, 3.5, n)
    W = M * G
    F_c = rho * W
    s_c = la * F_c / k2
    f_s, f_se = 1 / k2, 1 / (ka * k2)
    f = f_s + f_se
    hb = ((F_c - W) * s_c - W * F_c * f + 0.5 * F_c ** 2 * f) / W
    fac = np.where(rng.random(n) < 0.4, 10 ** rng.uniform(0.0004, 0.08, n),
                   10 ** rng.uniform(0.08, 1.5, n))
    h = hb * fac
    d = {"W": W, "h": h, "F_c": F_c, "s_c": s_c, "f": f, "f_series": f_se, "f_s": f_s,
         "m2": mu * M, "F_crush": np.full(n, np.inf), "depth": np.full(n, 0.01)}
    ok = (hb > 0) & impact.impact_crushable(W, np.maximum(h, 0), f, np.ones(n), F_c, s_c)[2]
    return {k: v[ok] for k, v in d.items()}


def demo_rows() -> dict[str, dict[str, np.ndarray]]:
    """Every after_bottoming row the analyses of the demos meet (inputs)."""
    from droprig.io.project_file import load_project
    from droprig.solver import analysis, chain

    rec: list[dict[str, np.ndarray]] = []
    orig = chain.after_bottoming

    def spy(W, h, F_c, s_c, f, f_series, f_s, m2, F_crush, depth, envelope=None):  # type: ignore[no-untyped-def]
        rec.append({"W": W.copy(), "h": h.copy(), "F_c": F_c.copy(), "s_c": s_c.copy(),
                    "f": f.copy(), "f_series": f_series.copy(), "f_s": f_s.copy(),
                    "m2": m2.copy(), "F_crush": np.broadcast_to(F_crush, W.shape).copy(),
                    "depth": np.full(W.shape, depth)})
        return orig(W, h, F_c, s_c, f, f_series, f_s, m2, F_crush, depth, envelope)

    chain.after_bottoming = spy  # type: ignore[assignment]
    out = {}
    try:
        for path in sorted((ROOT / "demo_projects").glob("*.droprig")):
            rec.clear()
            analysis.analyse(load_project(path))
            if rec:
                out[path.stem] = {k: np.concatenate([r[k] for r in rec]) for k in rec[0]}
    finally:
        chain.after_bottoming = orig  # type: ignore[assignment]
    return out


def model(d: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The chain's framing and contact forces (N) at the rows, and the term that sets
    the framing force."""
    from droprig.solver import chain, impact, struck_mass

    W, h, F_c, s_c, f = d["W"], d["h"], d["F_c"], d["s_c"], d["f"]
    fse, fs, m2 = d["f_series"], d["f_s"], d["m2"]
    ab = chain.after_bottoming(W, h, F_c, s_c, f, fse, fs, m2, d["F_crush"],
                               float(d["depth"][0]))
    floor = chain.bottoming_floor(W, F_c, s_c, f, np.ones(W.shape), fse, fs, m2)
    F = np.maximum(ab.F_frame, floor)
    h0 = np.maximum(h - (F_c / W - 1.0) * s_c, 0.0)
    _, Bf = struck_mass.energy_bounds(W, h0, fse, fs)
    _, Ff2 = struck_mass.envelope_two_forces(W, ab.h_r, fse, fs, m2)
    _, F1, _ = impact.impact_elastic(W, ab.h_r, f, np.ones(W.shape))
    A = np.minimum(Ff2, 2.0 * np.maximum(d["F_crush"], F1)) + 2.0 * F_c
    term = np.select([F == floor, np.isclose(F, Bf, rtol=1e-12), np.isclose(F, A, rtol=1e-12)],
                     ["crushing branch", "energy bound", "envelope + 2·F_c"], "2·F_c or F_c")
    return F, ab.F_contact, term


def exact(d: dict[str, np.ndarray]):  # type: ignore[no-untyped-def]
    from droprig.solver.crushhistory import crush_history
    from droprig.solver.impact import G

    return crush_history(d["W"] / G, np.sqrt(2 * G * d["h"]), d["F_c"], d["s_c"],
                         1 / d["f_series"], d["m2"], 1 / d["f_s"])


def _stats(r: np.ndarray) -> str:
    return (f"median {np.median(r):.3f}  p90 {np.percentile(r, 90):.3f}  "
            f"max {r.max():.2f}  min {r.min():.4f}  below 1: {(r < 1).sum()}")


def report(name: str, d: dict[str, np.ndarray]) -> None:
    t = time.perf_counter()
    ex = exact(d)
    dt = time.perf_counter() - t
    F, Fc, term = model(d)
    ok = ~ex.bounded
    print(f"{name}: {ok.sum()} rows (history {1e3 * dt / F.size:.2f} ms a row in one call; "
          f"bottomed in the history {ex.bottomed.mean():.1%})")
    print(f"  framing ÷ history  {_stats((F / ex.F_frame)[ok])}")
    print(f"  contact ÷ history  {_stats((Fc / ex.F_contact)[ok])}")
    for t_ in np.unique(term):
        s = ok & (term == t_)
        r = F[s] / ex.F_frame[s]
        print(f"    set by {t_:18s} {s.sum():5d} rows: framing ÷ history median "
              f"{np.median(r):.3f} p90 {np.percentile(r, 90):.3f}; ÷ the history's all-time "
              f"bound median {np.median(F[s] / ex.F_all[s]):.3f}")


def main(argv: list[str]) -> None:
    n = int(argv[0]) if argv else 3000
    rng = np.random.default_rng(SEED)
    for name, d in demo_rows().items():
        i = rng.choice(d["W"].size, size=min(d["W"].size, DEMO_SAMPLE), replace=False)
        print(f"{name}: {d['W'].size} after-bottoming rows in one analysis")
        report(name, {k: v[i] for k, v in d.items()})
    report("random systems", random_systems(n))


if __name__ == "__main__":
    main(sys.argv[1:])

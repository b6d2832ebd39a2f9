"""Build droprig/solver/crush_table_data.py: the framing's peak under a crushable layer
that crushes (stroke not spent), ψ = F_frame/F_c of the exact two-mass history
(droprig.solver.crushhistory.crush_history, the window's peak), on a grid of the
groups μ = m2/M, κ = k_c/k2, ρ = F_c/W, θ = M·v0·√(k2/m2)/F_c
(droprig.solver.crush_table's docstring). Reproducible: the grid below, no random
draws for the table; the margin is calibrated on CAL_N random systems off the grid
(seed CAL_SEED, uniform in the logs of the groups over the grid's box) as the largest
exact ÷ unit-margin read, rounded up to 0.01 (at least 1).

Along θ each node holds the running maximum of ψ over every θ sampled at or below it
(SUB samples per cell, and the decade below the first node), so the read in a
cell, from its upper θ node's value to the next one's, covers the cell.

Run: ``PYTHONPATH=. .venv/bin/python scripts/build_crush_table.py [--workers N |
--psi FILE]`` (about 15 min on one core for the grid, 3 min for the calibration;
``--psi`` reuses a grid saved by an earlier run, /tmp/crush_table_psi.npy).
"""

from __future__ import annotations

import math
import sys
import time
from pathlib import Path

import numpy as np

from droprig.solver.crushhistory import crush_history
from droprig.solver.impact import G

LOG_MU = (-0.5, 3.0, 0.5)  # μ 0.32 – 1000
LOG_KAPPA = (-3.0, 4.0, 0.35)  # κ 0.001 – 10 000
LOG_RHO1 = (-2.0, 2.0, 0.5)  # ρ − 1: 0.01 – 100
LOG_THETA = (-2.0, 2.5, 1.0 / 12.0)  # θ 0.01 – 316, 12 nodes a decade
SUB = 1
"""θ samples per cell (the upper node and SUB − 1 between; 1: the nodes alone, a
twelfth of a decade apart)."""
BELOW = (-3.0, -2.5, -2.25)
"""log10 θ sampled below the first node (folded into its running maximum)."""
CAL_N, CAL_SEED = 4500, 20261205
KAPPA_SPLIT = 1.0
"""κ below which a contact counts as soft (its own margin: the load bouncing on it
pumps the floor, and ψ varies sharply between the nodes)."""


def axis(spec: tuple[float, float, float]) -> np.ndarray:
    lo, hi, step = spec
    return np.round(lo + step * np.arange(round((hi - lo) / step) + 1), 6)


def psi_exact(mu: np.ndarray, kappa: np.ndarray, rho: np.ndarray,
              theta: np.ndarray) -> np.ndarray:
    """ψ = F_frame/F_c of the exact history at the groups (M = 1 kg, k2 = 1 N/m)."""
    M, k2 = 1.0, 1.0
    F_c = rho * M * G
    m2 = mu * M
    v0 = theta * F_c / (M * np.sqrt(k2 / m2))
    r = crush_history(M, v0, F_c, np.inf, kappa * k2, m2, k2)
    return r.F_frame / F_c


def _row(args: tuple[float, float, float, np.ndarray, np.ndarray]) -> np.ndarray:
    """The running maximum of ψ over the θ samples, at the θ nodes, for one
    (μ, κ, ρ − 1)."""
    mu, ka, r1, fine, node_at = args
    n = fine.size
    p = psi_exact(np.full(n, mu), np.full(n, ka), np.full(n, 1.0 + r1), 10.0 ** fine)
    return np.maximum.accumulate(p)[node_at]


def build(workers: int = 1) -> tuple[list[np.ndarray], np.ndarray]:
    ax = [axis(s) for s in (LOG_MU, LOG_KAPPA, LOG_RHO1, LOG_THETA)]
    lt = ax[3]
    step = lt[1] - lt[0]
    fine = np.concatenate([np.array(BELOW), lt[0] + step / SUB * np.arange(
        (lt.size - 1) * SUB + 1)])
    node_at = len(BELOW) + SUB * np.arange(lt.size)  # the nodes among the samples
    mu, ka, r1 = np.meshgrid(*(10.0 ** a for a in ax[:3]), indexing="ij")
    jobs = [(float(mu.flat[i]), float(ka.flat[i]), float(r1.flat[i]), fine, node_at)
            for i in range(mu.size)]
    t0 = time.time()
    rows = []
    if workers > 1:
        from multiprocessing import Pool

        with Pool(workers) as pool:
            for i, r in enumerate(pool.imap(_row, jobs, chunksize=8)):
                rows.append(r)
                if i % 100 == 0:
                    print(f"{i}/{len(jobs)} {time.time() - t0:.0f} s", file=sys.stderr)
    else:
        for i, job in enumerate(jobs):
            rows.append(_row(job))
            if i % 100 == 0:
                print(f"{i}/{len(jobs)} {time.time() - t0:.0f} s", file=sys.stderr)
    return ax, np.array(rows).reshape((*mu.shape, lt.size))


def calibrate(ax: list[np.ndarray], psi: np.ndarray
              ) -> tuple[tuple[float, float], np.ndarray, np.ndarray]:
    """The margins (soft, stiff; module docstring), the calibration's exact ÷
    max(1, read) ratios and its κ."""
    import droprig.solver.crush_table_data as data
    from droprig.solver import crush_table

    rng = np.random.default_rng(CAL_SEED)
    g = [10.0 ** rng.uniform(a[0], a[-1], CAL_N) for a in ax]
    g[2] = 1.0 + g[2]
    ex = psi_exact(*g)
    data.AXES = tuple(tuple(float(v) for v in a) for a in ax)  # type: ignore[assignment]
    crush_table._use(psi, ax)
    crush_table.MARGIN = (1.0, 1.0)  # type: ignore[attr-defined]
    read, _ = crush_table.table_psi(*g)
    ratio = ex / np.maximum(read, 1.0)
    soft = g[1] < KAPPA_SPLIT
    m = tuple(max(1.0, math.ceil(100.0 * float(ratio[b].max())) / 100.0)
              for b in (soft, ~soft))
    return (m[0], m[1]), ratio, g[1]


def _wrapped(items: list[str], indent: str, per_line: int = 10) -> list[str]:
    """A tuple literal of ``items`` over lines of at most ``per_line`` items."""
    rows = [", ".join(items[i:i + per_line]) for i in range(0, len(items), per_line)]
    return ([indent + "("] + [indent + " " + r + "," for r in rows] + [indent + "),"])


def write(ax: list[np.ndarray], psi: np.ndarray, margin: tuple[float, float],
          ratio: np.ndarray, kappa: np.ndarray) -> None:
    out = Path(__file__).resolve().parents[1] / "droprig" / "solver" / "crush_table_data.py"
    q = [np.percentile(ratio[b], [50, 99, 100]) for b in (kappa < KAPPA_SPLIT,
                                                          kappa >= KAPPA_SPLIT)]
    lines = [
        '"""The exact framing peak under a crushing layer, ψ = F_frame/F_c (generated by',
        'scripts/build_crush_table.py; do not edit; read by droprig.solver.crush_table).',
        "",
        "PSI[μ][κ][ρ][θ] on the AXES (log10 μ, log10 κ, log10(ρ − 1), log10 θ), the",
        f"running maximum along θ ({SUB} sample(s) a cell). MARGIN (soft contacts,",
        f"κ < {KAPPA_SPLIT:g}; stiff): the largest exact ÷ max(1, read) of {CAL_N} random",
        f"systems off the grid (seed {CAL_SEED}) in the band, rounded up; there soft:",
        f"median {q[0][0]:.3f}, 99th percentile {q[0][1]:.3f}, largest {q[0][2]:.3f};",
        f"stiff: {q[1][0]:.3f}, {q[1][1]:.3f}, {q[1][2]:.3f}.",
        '"""',
        "",
        f"KAPPA_SPLIT = {KAPPA_SPLIT!r}",
        f"MARGIN = ({margin[0]:.2f}, {margin[1]:.2f})",
        "AXES = (",
    ]
    for a in ax:
        lines.extend(_wrapped([f"{v:.6f}" for v in a], " ", 8))
    lines.append(")")
    lines.append("PSI = (")
    for i in range(psi.shape[0]):
        lines.append(" (")
        for j in range(psi.shape[1]):
            lines.append("  (")
            for k in range(psi.shape[2]):
                lines.extend(_wrapped([f"{v:.4f}" for v in
                                       np.ceil(psi[i, j, k] * 1e4) / 1e4], "   "))
            lines.append("  ),")
        lines.append(" ),")
    lines.append(")")
    out.write_text("\n".join(lines) + "\n")
    print(f"wrote {out}; margins {margin}; exact ÷ read {q}")


def main(argv: list[str]) -> None:
    if argv[:1] == ["--psi"]:
        ax = [axis(s) for s in (LOG_MU, LOG_KAPPA, LOG_RHO1, LOG_THETA)]
        psi = np.load(argv[1])
    else:
        workers = int(argv[1]) if argv[:1] == ["--workers"] else 1
        ax, psi = build(workers)
        np.save("/tmp/crush_table_psi.npy", psi)
    margin, ratio, kappa = calibrate(ax, psi)
    write(ax, psi, margin, ratio, kappa)


if __name__ == "__main__":
    main(sys.argv[1:])

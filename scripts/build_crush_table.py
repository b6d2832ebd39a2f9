"""Build droprig/solver/crush_table_data.py: the framing's peak under a crushable layer
that crushes (stroke not spent), ψ = F_frame/F_c of the exact two-mass history
(droprig.solver.crushhistory.crush_history, the window's peak), on grids of the
groups μ = m2/M, κ = k_c/k2, ρ = F_c/W, θ = M·v0·√(k2/m2)/F_c
(droprig.solver.crush_table's docstring): one for soft contacts (κ < KAPPA_SPLIT,
where the load bounces on its contact and ψ varies sharply: steps of 0.25, 0.175,
0.25 decades in μ, κ, ρ − 1) and one for stiff ones (0.5, 0.35, 0.25). Reproducible:
the grids below, no random draws for the tables; the margins are calibrated on CAL_N
random systems off the grids (seed CAL_SEED, uniform in the logs of the groups over
the box) as the largest exact ÷ unit-margin read in each band of κ (KAPPA_BANDS),
plus HEADROOM, rounded up to 0.01 (at least 1).

Along θ each node holds the running maximum of ψ over every θ sampled at or below it
(SUB samples per cell, and the decade below the first node), so the read in a
cell, from its upper θ node's value to the next one's, covers the cell.

Very soft contacts (κ < LONG_KAPPA, the load chattering on its contact for hundreds of
phases) are followed with a phase budget of LONG_PHASES (crushhistory's stopping rule
3), both in the grid and in the calibration: with the default budget some of their
histories ran out of phases and held the energy bound (ψ up to 9.2 where the history
closed with a larger budget gives 2.0).

Run: ``PYTHONPATH=. nice .venv/bin/python scripts/build_crush_table.py [--workers N]
[--soft FILE --stiff FILE | --stored yes]`` (about 11 min on one quiet core for the
soft grid, 24 min for the stiff one, plus the long rows, 1 min for the calibration; the
grids are saved to /tmp/crush_table_soft.npy and /tmp/crush_table_stiff.npy, and
``--soft``/``--stiff`` reuse them; ``--stored yes`` takes both grids from the stored
crush_table_data and works out again only the soft grid's rows with κ < LONG_KAPPA,
the same numbers a full build gives there).
"""

from __future__ import annotations

import base64
import math
import sys
import time
import zlib
from pathlib import Path

import numpy as np

from droprig.solver import crush_table
from droprig.solver.crushhistory import MAX_PHASES, crush_history
from droprig.solver.impact import G

LOG_THETA = (-2.0, 2.5, 1.0 / 12.0)  # θ 0.01 – 316, 12 nodes a decade (both grids)
STIFF_LOG_MU = (-0.5, 3.0, 0.5)  # μ 0.32 – 1000
STIFF_LOG_KAPPA = (-0.2, 4.0, 0.35)  # κ 0.63 – 10 000 (read for κ ≥ KAPPA_SPLIT)
STIFF_LOG_RHO1 = (-2.0, 2.0, 0.25)  # ρ − 1: 0.01 – 100
SUB = 1
"""θ samples per cell (the upper node and SUB − 1 between; 1: the nodes alone, a
twelfth of a decade apart)."""
BELOW = (-3.0, -2.5, -2.25)
"""log10 θ sampled below the first node (folded into its running maximum)."""
SOFT_LOG_MU = (-0.5, 3.0, 0.25)  # μ 0.32 – 1000
SOFT_LOG_KAPPA = (-3.0, 0.15, 0.175)  # κ 0.001 – 1.41 (read for κ < KAPPA_SPLIT)
SOFT_LOG_RHO1 = (-2.0, 2.0, 0.25)  # ρ − 1: 0.01 – 100
SOFT = (SOFT_LOG_MU, SOFT_LOG_KAPPA, SOFT_LOG_RHO1, LOG_THETA)
STIFF = (STIFF_LOG_MU, STIFF_LOG_KAPPA, STIFF_LOG_RHO1, LOG_THETA)
BOX = ((-0.5, 3.0), (-3.0, 4.0), (-2.0, 2.0), (-2.0, 2.5))
"""The calibration's box (log10 μ, κ, ρ − 1, θ): both grids' union."""
CAL_N, CAL_SEED = 4500, 20261205
KAPPA_SPLIT = 1.0
"""κ below which a contact counts as soft (its own grid: the load bouncing on it
pumps the floor, and ψ varies sharply between the nodes)."""
HEADROOM = 0.005
"""Added to a band's largest calibration ratio before rounding up to 0.01: another
sample's largest lies a little above (crush30: 0.999 of the history on 1,500 other
systems with the bare rounding, in the band whose largest ratio was 1.000)."""
KAPPA_BANDS = (0.1, KAPPA_SPLIT)
"""κ at the edges of the margins' bands: very soft contacts (the load chattering on
them, ψ roughest), soft ones, stiff ones."""


def axis(spec: tuple[float, float, float]) -> np.ndarray:
    lo, hi, step = spec
    return np.round(lo + step * np.arange(round((hi - lo) / step) + 1), 6)


LONG_KAPPA, LONG_PHASES = crush_table.LONG_KAPPA, crush_table.LONG_PHASES
"""κ below which the histories get the larger phase budget LONG_PHASES (crush_table's)."""


def phases_for(kappa: float) -> int:
    """The phase budget of the histories at contact stiffness ratio κ."""
    return LONG_PHASES if kappa < LONG_KAPPA else MAX_PHASES


def psi_exact(mu: np.ndarray, kappa: np.ndarray, rho: np.ndarray,
              theta: np.ndarray) -> np.ndarray:
    """ψ = F_frame/F_c of the exact history at the groups (M = 1 kg, k2 = 1 N/m),
    each with the phase budget of its κ (:func:`phases_for`)."""
    M, k2 = 1.0, 1.0
    mu, kappa, rho, theta = np.broadcast_arrays(*(np.asarray(v, float)
                                                  for v in (mu, kappa, rho, theta)))
    F_c = rho * M * G
    m2 = mu * M
    v0 = theta * F_c / (M * np.sqrt(k2 / m2))
    out = np.empty(mu.shape)
    long = kappa < LONG_KAPPA
    for sel, phases in ((long, LONG_PHASES), (~long, MAX_PHASES)):
        if sel.any():
            r = crush_history(M, v0[sel], F_c[sel], np.inf, kappa[sel] * k2, m2[sel], k2,
                              max_phases=phases)
            out[sel] = r.F_frame / F_c[sel]
    return out


def _row(args: tuple[float, float, float, np.ndarray, np.ndarray]) -> np.ndarray:
    """The running maximum of ψ over the θ samples, at the θ nodes, for one
    (μ, κ, ρ − 1)."""
    mu, ka, r1, fine, node_at = args
    n = fine.size
    p = psi_exact(np.full(n, mu), np.full(n, ka), np.full(n, 1.0 + r1), 10.0 ** fine)
    return np.maximum.accumulate(p)[node_at]


def build(specs: tuple[tuple[float, float, float], ...], workers: int = 1,
          only: np.ndarray | None = None, base: np.ndarray | None = None
          ) -> tuple[list[np.ndarray], np.ndarray]:
    """ψ's running maximum along θ at the nodes of the grid ``specs`` (log10 μ, κ,
    ρ − 1, θ: lowest, highest, step); ``only`` (bool over the κ axis): work out only
    those rows, the others taken from ``base``."""
    ax = [axis(s) for s in specs]
    lt = ax[3]
    step = lt[1] - lt[0]
    fine = np.concatenate([np.array(BELOW), lt[0] + step / SUB * np.arange(
        (lt.size - 1) * SUB + 1)])
    node_at = len(BELOW) + SUB * np.arange(lt.size)  # the nodes among the samples
    mu, ka, r1 = np.meshgrid(*(10.0 ** a for a in ax[:3]), indexing="ij")
    todo = (np.ones(mu.size, bool) if only is None
            else np.broadcast_to(only[None, :, None], mu.shape).ravel())
    jobs = [(float(mu.flat[i]), float(ka.flat[i]), float(r1.flat[i]), fine, node_at)
            for i in range(mu.size) if todo[i]]
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
    if only is None:
        return ax, np.array(rows).reshape((*mu.shape, lt.size))
    assert base is not None
    out = np.array(base, float).reshape(mu.size, lt.size)
    out[todo] = np.array(rows)
    return ax, out.reshape((*mu.shape, lt.size))


def calibrate(soft: tuple[list[np.ndarray], np.ndarray],
              stiff: tuple[list[np.ndarray], np.ndarray]
              ) -> tuple[tuple[float, ...], np.ndarray, np.ndarray, np.ndarray]:
    """The margins (one per band of KAPPA_BANDS), the calibration's exact ÷
    max(1, read) ratios, its κ and its exact ψ."""
    rng = np.random.default_rng(CAL_SEED)
    g = [10.0 ** rng.uniform(lo, hi, CAL_N) for lo, hi in BOX]
    g[2] = 1.0 + g[2]
    ex = psi_exact(*g)
    crush_table._use((soft[1], soft[0]), (stiff[1], stiff[0]))
    crush_table.KAPPA_BANDS = KAPPA_BANDS
    crush_table.MARGIN = (1.0,) * (len(KAPPA_BANDS) + 1)  # type: ignore[assignment]
    read, inside = crush_table.table_psi(*g)
    assert inside.all()
    ratio = ex / np.maximum(read, 1.0)
    band = np.searchsorted(KAPPA_BANDS, g[1], side="right")
    m = tuple(max(1.0, math.ceil(100.0 * (float(ratio[band == b].max()) + HEADROOM))
                  / 100.0) for b in range(len(KAPPA_BANDS) + 1))
    return m, ratio, g[1], ex


def _wrapped(items: list[str], indent: str, per_line: int = 10) -> list[str]:
    """A tuple literal of ``items`` over lines of at most ``per_line`` items."""
    rows = [", ".join(items[i:i + per_line]) for i in range(0, len(items), per_line)]
    return ([indent + "("] + [indent + " " + r + "," for r in rows] + [indent + "),"])


def _blob(psi: np.ndarray) -> list[str]:
    """ψ rounded up to 1e-4, as unsigned 32-bit counts of 1e-4 (little-endian, C
    order), zlib-compressed (level 9), base64: lines of a string literal."""
    counts = np.ceil(np.round(psi * 1e4, 6)).astype("<u4")
    assert np.all(counts / 1e4 >= psi - 1e-12)
    text = base64.b64encode(zlib.compress(counts.tobytes(), 9)).decode("ascii")
    return [f'    "{text[i:i + 76]}"' for i in range(0, len(text), 76)]


def write(soft: tuple[list[np.ndarray], np.ndarray],
          stiff: tuple[list[np.ndarray], np.ndarray], margin: tuple[float, ...],
          ratio: np.ndarray, kappa: np.ndarray) -> None:
    out = Path(__file__).resolve().parents[1] / "droprig" / "solver" / "crush_table_data.py"
    band = np.searchsorted(KAPPA_BANDS, kappa, side="right")
    q = [np.percentile(ratio[band == b], [50, 99, 100])
         for b in range(len(KAPPA_BANDS) + 1)]
    stats = "; ".join(f"{q[b][0]:.3f}, {q[b][1]:.3f}, {q[b][2]:.3f}" for b in range(len(q)))
    lines = [
        '"""The exact framing peak under a crushing layer, ψ = F_frame/F_c (generated by',
        'scripts/build_crush_table.py; do not edit; read by droprig.solver.crush_table).',
        "",
        "SOFT_PSI (contacts κ < KAPPA_SPLIT) and STIFF_PSI [μ][κ][ρ][θ] on their AXES",
        "(log10 μ, log10 κ, log10(ρ − 1), log10 θ), the running maximum along θ",
        f"({SUB} sample(s) a cell), rounded up to 1e-4 and stored as counts of 1e-4",
        "(unsigned 32-bit little-endian, zlib, base64). MARGIN (one per band of κ",
        "split at KAPPA_BANDS): the largest exact ÷ max(1, read) of the band's share",
        f"of {CAL_N} random systems off the grids (seed {CAL_SEED}), plus {HEADROOM},",
        "rounded up to 0.01; there (median, 99th percentile, largest) per band:",
        f"{stats}.",
        '"""',
        "",
        "import base64",
        "import zlib",
        "",
        "import numpy as np",
        "",
        f"KAPPA_SPLIT = {KAPPA_SPLIT!r}",
        f"KAPPA_BANDS = {KAPPA_BANDS!r}",
        "MARGIN = (" + ", ".join(f"{m:.2f}" for m in margin) + ")",
        "",
        "",
        "def _grid(shape: tuple[int, ...], text: str) -> np.ndarray:",
        '    """ψ at the nodes from its stored counts of 1e-4."""',
        '    counts = np.frombuffer(zlib.decompress(base64.b64decode(text)), "<u4")',
        "    return (counts.astype(float) / 1e4).reshape(shape)",
        "",
        "",
    ]
    for name, (ax, psi) in (("SOFT", soft), ("STIFF", stiff)):
        lines.append(f"{name}_AXES = (")
        for a in ax:
            lines.extend(_wrapped([f"{v:.6f}" for v in a], " ", 8))
        lines.append(")")
        lines.append(f"{name}_PSI = _grid({tuple(int(n) for n in psi.shape)!r}, (")
        lines.extend(_blob(psi))
        lines.append("))")
    out.write_text("\n".join(lines) + "\n")
    print(f"wrote {out}; margins {margin}; exact ÷ read {q}")


def main(argv: list[str]) -> None:
    opts = dict(zip(argv[::2], argv[1::2], strict=True))
    workers = int(opts.get("--workers", "1"))
    grids = []
    for name, specs in (("soft", SOFT), ("stiff", STIFF)):
        if opts.get("--stored") == "yes":
            from droprig.solver import crush_table_data as stored

            psi = np.asarray(getattr(stored, f"{name.upper()}_PSI"), float)
            ax = [axis(s) for s in specs]
            if name == "soft":
                long = 10.0 ** ax[1] < LONG_KAPPA
                grid = build(specs, workers, only=long, base=psi)
                np.save(f"/tmp/crush_table_{name}.npy", grid[1])
            else:
                grid = (ax, psi)
        elif f"--{name}" in opts:
            grid = ([axis(s) for s in specs], np.load(opts[f"--{name}"]))
        else:
            grid = build(specs, workers)
            np.save(f"/tmp/crush_table_{name}.npy", grid[1])
        assert grid[1].shape == tuple(a.size for a in grid[0]), name
        grids.append(grid)
    margin, ratio, kappa, _ = calibrate(grids[0], grids[1])
    write(grids[0], grids[1], margin, ratio, kappa)


if __name__ == "__main__":
    main(sys.argv[1:])

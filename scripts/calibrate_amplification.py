"""Calibrate droprig's dynamic amplification table against the time history.

For every end condition, band of struck position ξ (the distance of the struck point
to the nearer support over the span; a cantilever's from its fixed end), cell of load
mass ÷ the member's effective mass r = M/mₑ (mₑ = β·μ·L, Rayleigh) and cell of
contact compliance ÷ the member's compliance at the struck point κ = f_c/G(a, a),
random members (span, EI, μ, struck point, drop height) are run through the verdict's
time history :func:`droprig.solver.exacthistory.exact_time_history` (its settings
:data:`droprig.solver.pointhistory.TH_OPTIONS`) and the energy method
:func:`droprig.solver.timehistory.energy_method_peaks` — with the chain's struck-mass
share (``scaled_mass``, droprig.solver.chain.struck_mass) and with η = 1 (droprig's
rule under mats and crushable layers). A table value is the largest ratio time
history ÷ energy method seen in the cell and its neighbouring r and κ cells (same
condition and position band), times a margin for the time history's convergence
(:data:`MARGINS`), never below 1. Writes ``droprig/solver/amplification_table.py``;
tests/solver/test_amplification.py re-checks the table on random cases not used here.
Run: ``.venv/bin/python scripts/calibrate_amplification.py [samples per cell]``.
"""

from __future__ import annotations

import math
import sys
import time
from multiprocessing import Pool
from pathlib import Path

import numpy as np

from droprig.solver import beam, exacthistory, pointhistory, timehistory

R_EDGES = (0.0, 0.03, 0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0, math.inf)
K_EDGES = (0.0, 0.003, 0.01, 0.03, 0.1, 0.3, 1.0, 3.0, math.inf)
XI_EDGES = (0.0, 0.08, 0.25, math.inf)
"""Bands of ξ = min(a, L − a)/L (0–0.08 near a support, 0.08–0.25, 0.25–0.5 mid-span);
a cantilever's ξ = a/L from the fixed end uses CANTILEVER_XI_EDGES."""
CANTILEVER_XI_EDGES = (0.0, 0.3, 0.6, math.inf)
CONDS = ("simple", "fixed", "propped", "cantilever")
XI_SAMPLE = {False: ((0.003, 0.08), (0.08, 0.25), (0.25, 0.5)),
             True: ((0.02, 0.3), (0.3, 0.6), (0.6, 1.0))}
MARGINS = (1.10, 1.15, 1.30, 1.10)
"""Margins on force, moment, shear, deflection for the time history's convergence with
the verdict's settings on an elastic contact (``scripts/convergence_point_history.py``,
its first 120 cases: refined ÷ verdict run at most 1.026, 1.106, 1.250, 1.018, + ~5 %);
the study's worst case (1.66) is a crushing contact, where the tables are not used
(droprig.solver.amplification.amplified_forces)."""


def _case_params(ic: int, ix: int, ir: int, ik: int, seed: int) -> tuple:
    rng = np.random.default_rng(seed)
    cond = CONDS[ic]
    r_lo = R_EDGES[ir] if R_EDGES[ir] > 0 else 0.01
    r_hi = R_EDGES[ir + 1] if math.isfinite(R_EDGES[ir + 1]) else 1000.0
    k_lo = K_EDGES[ik] if K_EDGES[ik] > 0 else 0.001
    k_hi = K_EDGES[ik + 1] if math.isfinite(K_EDGES[ik + 1]) else 10.0
    r = math.exp(rng.uniform(math.log(r_lo), math.log(r_hi)))
    kap = math.exp(rng.uniform(math.log(k_lo), math.log(k_hi)))
    L = rng.uniform(2.0, 15.0)
    EI = 2e11 * math.exp(rng.uniform(math.log(1e-6), math.log(1e-3)))
    mu = math.exp(rng.uniform(math.log(10.0), math.log(300.0)))
    lo, hi = XI_SAMPLE[cond == "cantilever"][ix]
    xi = rng.uniform(lo, hi)
    a = L * (xi if cond == "cantilever" or rng.uniform() < 0.5 else 1.0 - xi)
    h = math.exp(rng.uniform(math.log(0.02), math.log(3.0)))
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    return cond, L, EI, mu, a, r * m_e, h, kap * f_s


def _batch(jobs: list[tuple[int, int, int, int, int]]) -> list[tuple]:
    """One condition's cases together (the integrator is vectorised)."""
    p = [_case_params(*j) for j in jobs]
    cond = p[0][0]
    L, EI, mu, a, M, h, f_c = (np.array([q[i] for q in p]) for i in range(1, 8))
    t = exacthistory.exact_time_history(cond, L, EI, mu, a, M, h, f_c,
                                        **pointhistory.TH_OPTIONS)
    e = timehistory.energy_method_peaks(cond, L, EI, mu, a, M, h, f_c, scaled_mass=True)
    e1 = timehistory.energy_method_peaks(cond, L, EI, mu, a, M, h, f_c, struck_mass=False)
    W = M * 9.80665
    F_base = W * (1.0 + np.sqrt(1.0 + 2.0 * h / (W * f_c)))
    out = []
    for i, j in enumerate(jobs):
        th = [float(getattr(t, q)[i]) for q in ("force", "moment", "shear", "deflection")]
        en = [float(getattr(e, q)[i]) for q in ("force", "moment", "shear", "deflection")]
        en1 = [float(getattr(e1, q)[i]) for q in ("force", "moment", "shear", "deflection")]
        out.append((j[:4], [x / y for x, y in zip(th, en, strict=True)],
                    [x / y for x, y in zip(th, en1, strict=True)], th[0] / float(F_base[i])))
    return out


def main() -> int:
    samples = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    nc, nx, nr, nk = len(CONDS), 3, len(R_EDGES) - 1, len(K_EDGES) - 1
    jobs = [(ic, ix, ir, ik, 7919 * (((ic * nx + ix) * nr + ir) * nk + ik) + s + 20261204)
            for ic in range(nc) for ix in range(nx) for ir in range(nr) for ik in range(nk)
            for s in range(samples)]
    batches = [jobs[i:i + 24] for i in range(0, len(jobs), 24)]  # one condition each
    raw = {k: np.ones((4, nc, nx, nr, nk)) for k in ("eta", "one")}
    worst_base = 0.0
    t0 = time.perf_counter()
    with Pool(2) as pool:
        for n, res in enumerate(pool.imap_unordered(_batch, batches)):
            for (ic, ix, ir, ik), q, q1, b in res:
                raw["eta"][:, ic, ix, ir, ik] = np.maximum(raw["eta"][:, ic, ix, ir, ik], q)
                raw["one"][:, ic, ix, ir, ik] = np.maximum(raw["one"][:, ic, ix, ir, ik], q1)
                worst_base = max(worst_base, b)
            if n % 20 == 0:
                print(f"{n}/{len(batches)} batches, {time.perf_counter() - t0:.0f} s",
                      file=sys.stderr)
    margin = np.array(MARGINS)[:, None, None, None, None]
    tables = {}
    for key, rw in raw.items():
        tab = np.ones_like(rw)
        for ir in range(nr):
            for ik in range(nk):
                sl = rw[:, :, :, max(ir - 1, 0):ir + 2, max(ik - 1, 0):ik + 2]
                tab[:, :, :, ir, ik] = np.max(sl, axis=(3, 4))
        tables[key] = np.ceil(np.maximum(tab * margin, 1.0) * 100.0) / 100.0
    lines = ['"""Dynamic amplification table (generated by scripts/calibrate_amplification.py '
             f'{samples}; do not edit).',
             "",
             "TABLE[variant][quantity][condition][position band][r cell][κ cell]: variant",
             "0 against the energy method with the chain's struck-mass share, 1 with η = 1;",
             "quantities force, moment, shear, deflection; conditions simple, fixed, propped,",
             "cantilever. Largest time history ÷ energy method of the cell and its r, κ",
             f"neighbours × margins {MARGINS}; {len(jobs)} random members. Largest time-history",
             f"contact force ÷ rigid-base value: {worst_base:.4f}.",
             '"""', "", "TABLE = ("]
    for key in ("eta", "one"):
        lines.append(" (")
        for q in range(4):
            lines.append("  (")
            for ic in range(nc):
                lines.append("   (")
                for ix in range(nx):
                    lines.append("    (")
                    for ir in range(nr):
                        vals = ", ".join(f"{v:.2f}" for v in tables[key][q, ic, ix, ir])
                        lines.append(f"     ({vals}),")
                    lines.append("    ),")
                lines.append("   ),")
            lines.append("  ),")
        lines.append(" ),")
    lines.append(")")
    out = Path(__file__).resolve().parents[1] / "droprig" / "solver" / "amplification_table.py"
    out.write_text("\n".join(lines) + "\n", encoding="utf-8")
    print(f"wrote {out}; rigid-base ratio {worst_base:.4f}; {time.perf_counter() - t0:.0f} s")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

"""Convergence of the time history in modes and time step: the margin on the
per-point time history the verdict uses (``droprig.solver.pointhistory.TH_MARGIN``).

Random members and contacts (the ranges of ``calibrate_contact_bound.py``: simple,
fixed, propped and cantilever members, span 2–15 m, EI 0.2–200 MN·m², μ 10–300 kg/m,
load ÷ struck mass 0.02–300, contact ÷ member compliance 0.001–10, drops 0.02–3 m,
70 % with an elastic–perfectly plastic contact) are run twice through the phase-exact
integrator :func:`droprig.solver.exacthistory.exact_time_history`: with the settings
the verdict uses (``pointhistory.TH_OPTIONS``) and refined (80 modes, a cut-off of 32
× the cut-off frequency, 16 samples per period, 64 sections). Each phase is solved in
closed form, so the difference is the modal truncation and the sampling of the peaks
in time and along the member. Prints, per peak (contact force, member moment, shear,
deflection, end shear), the refined ÷ verdict-setting ratio's median, 90th percentile
and largest — the verdict's run may read low by at most the largest — the margin it
implies (largest ratio of the four the factors take + 5 %, rounded up to 5 %; the end
shear is printed, the shear factor takes the larger section shear), the cases that read lowest and,
with ``--why``, which of the refinements alone (cut-off 32, 80 modes, 16 samples, 64
sections) takes each of them to within 1 % of the refined run.

``--no-rise``: the model before stop 32 (the cut-off set by the contact frequency
alone, :func:`droprig.solver.timehistory.rise_frequency`), for the record.

Run: ``nice .venv/bin/python scripts/convergence_point_history.py [N] [SEED] [--why]
[--no-rise]``.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path
from typing import Any

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
sys.path.insert(0, str(Path(__file__).resolve().parent))

from calibrate_contact_bound import random_cases

from droprig.solver import exacthistory, impact, pointhistory

REFINED = {"n_modes": 80, "cutoff": 32.0, "samples_per_period": 16, "sections": 64}
"""The refined run (modes, cut-off and time step each several times the verdict's)."""
ALONE = {"cut-off 32": {"cutoff": 32.0}, "80 modes": {"n_modes": 80},
         "16 samples": {"samples_per_period": 16}, "64 sections": {"sections": 64}}
"""One refinement at a time (``--why``)."""

QUANTITIES = ("force", "moment", "shear", "deflection", "reaction")


def run(c: dict[str, np.ndarray], options: dict[str, Any], rise: bool = True
        ) -> dict[str, np.ndarray]:
    """The peaks of the cases ``c`` with ``options`` (by :data:`QUANTITIES`, and the
    modes kept)."""
    args = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    t = exacthistory.exact_time_history(*args, F_yield=c["F_y"], stroke=c["s_y"],
                                        rise=rise, **options)
    out = {q: np.asarray(getattr(t, q), float) for q in QUANTITIES}
    out["modes"] = np.asarray(t.modes)
    return out


def study(n: int, seed: int, rise: bool = True, why: bool = False) -> dict[str, Any]:
    """Refined ÷ verdict-setting peaks per quantity over ``n`` random cases: the ratios
    (``ratio``), the cases, and with ``why`` the ratios of the refined run to each
    refinement alone (``alone``)."""
    c = random_cases(np.random.default_rng(seed), n)
    base = run(c, pointhistory.TH_OPTIONS, rise)
    ref = run(c, REFINED, rise)
    out: dict[str, Any] = {"cases": c, "base": base, "ref": ref,
                           "ratio": {q: ref[q] / base[q] for q in QUANTITIES}}
    if why:
        out["alone"] = {name: run(c, {**pointhistory.TH_OPTIONS, **opt}, rise)
                        for name, opt in ALONE.items()}
    return out


def margin(worst: float) -> float:
    """Largest refined ÷ verdict ratio + 5 %, rounded up to the next 5 %."""
    return math.ceil((worst + 0.05) * 20.0 - 1e-9) / 20.0


def main() -> None:
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    n = int(args[0]) if args else 240
    seed = int(args[1]) if len(args) > 1 else 20261203
    rise, why = "--no-rise" not in sys.argv, "--why" in sys.argv
    s = study(n, seed, rise, why)
    print(f"{n} cases, seed {seed}, cut-off by {'contact and rise' if rise else 'contact'}")
    print("| peak | median | p90 | max | case |")
    print("|---|---|---|---|---|")
    for q in QUANTITIES:
        r = s["ratio"][q]
        print(f"| {q} | {np.median(r):.4f} | {np.percentile(r, 90):.4f} | {r.max():.4f} "
              f"| {int(r.argmax())} |")
    # the factors take the force, moment, the largest section's shear and deflection
    # (the end shear lies below the refined section shear, which the shear's covers)
    worst = max(float(s["ratio"][q].max()) for q in QUANTITIES[:4])
    print(f"margin: {margin(worst):.2f}")
    c = s["cases"]
    lowest = np.max(np.stack([s["ratio"][q] for q in QUANTITIES]), axis=0)
    for i in np.argsort(-lowest)[:8]:
        W = c["M"][i] * impact.G
        line = (f"case {i}: {c['cond'][i]} L {c['L'][i]:.2f} m, a/L {c['a'][i] / c['L'][i]:.2f}, "
                f"M/m_e {c['M'][i] / c['m_e'][i]:.3g}, f_c/f_s {c['f_c'][i] / c['f_s'][i]:.3g}, "
                f"F_y/W {c['F_y'][i] / W:.3g}, modes {s['base']['modes'][i]}/"
                f"{s['ref']['modes'][i]}: " + ", ".join(
                    f"{q} {s['ratio'][q][i]:.3f}" for q in QUANTITIES))
        if why:
            fixes = [name for name, a in s["alone"].items()
                     if all(s["ref"][q][i] / a[q][i] <= 1.01 for q in QUANTITIES)]
            line += f"; within 1 % by: {', '.join(fixes) or 'none alone'}"
        print(line)


if __name__ == "__main__":
    main()

"""Build the two-mass envelope table (droprig/solver/data/two_mass_envelope.npz).

The running maxima over the drop height of the two-mass peaks in units of the load's
weight, on the grid of ``struck_mass.ENVELOPE_GRID``, as nodes whose interpolation
covers every sample of a grid twice as fine (:func:`droprig.solver.struck_mass.
build_envelope`, :func:`~droprig.solver.struck_mass.covering_nodes`), stored as
float32 rounded up. Deterministic; about 20–90 s on one core. Run:
``.venv/bin/python scripts/build_two_mass_envelope.py``.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from droprig.solver import struck_mass


def main() -> None:
    t = time.perf_counter()
    lm, lk, lh = struck_mass.envelope_grid()
    Ff, Fc = struck_mass.build_envelope(lm, lk, lh)
    out = struck_mass.ENVELOPE_FILE
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = out.with_suffix(".tmp.npz")
    np.savez_compressed(tmp, lg_mu=lm, lg_kappa=lk, lg_h=lh,
                        frame=struck_mass.round_up_f32(Ff),
                        contact=struck_mass.round_up_f32(Fc))
    tmp.replace(out)
    print(f"{out}: {Ff.shape}, {out.stat().st_size / 1e6:.2f} MB, "
          f"{time.perf_counter() - t:.1f} s")


if __name__ == "__main__":
    main()

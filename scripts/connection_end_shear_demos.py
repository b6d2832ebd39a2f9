"""The end shear at the demos' verified points with the struck member's end connections
as springs (issue 12): for each distinct verified point (each bay's governing point,
:func:`droprig.solver.verification_table`), its struck member as the verification
models it (span, position, EI, the mass with the slab's, κGA, ρI; the load through
the member's share w: mass w²·M, speed v/w; the contact spring the verification's
history used, elastic — crushing left out on both sides of the comparison), run in
the independent model (``tests/solver/connection_reference``) with rigid ends (the
pinned Timoshenko reference) and on connections of 10×, 3× and 1× the stated default
(:func:`droprig.solver.amplification_connection.default_connection_stiffness` of
the member's section); printed: the ratios to the rigid end, and √(2kE) over the
connection's force. Simply supported members only (the default is a shear
connection). Run: ``PYTHONPATH=. .venv/bin/python scripts/connection_end_shear_demos.py``.
"""

from __future__ import annotations

import math

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import amplification, analyse, impact, verification, verification_table
from droprig.solver import amplification_connection as ac
from tests.solver.connection_reference import connection_drop
from tests.solver.timoshenko_reference import timoshenko_drop

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")
MULTIPLES = (10.0, 3.0, 1.0)

_records: list[dict] = []
_orig = verification._chain_verification


def _capture(chain, **kw):  # type: ignore[no-untyped-def]
    from droprig.solver.chain import LoadInputs, energy_fall

    ver, s = _orig(chain, **kw)
    member = chain.drop.fm.level.members[int(s["member"])]
    inp = chain[LoadInputs]
    _records.append({**s, "section": member.section, "grade": member.grade,
                     "M_load": float(inp.M[0]),
                     "h_load": float(energy_fall(chain, inp.h)[0])})
    return ver, s


def main() -> None:
    verification._chain_verification = _capture  # type: ignore[assignment]
    print("| demo | bay | load | member | M·w² kg | pulse ms | Z/k ms | V_rigid kN | "
          + " | ".join(f"{m:g}k ÷ rigid" for m in MULTIPLES) + " | √(2kE) ÷ V_k |")
    print("|" + "---|" * (9 + len(MULTIPLES)))
    seen = set()
    for name in DEMOS:
        p = load_project(demo_dir() / f"{name}.droprig")
        _records.clear()
        rows = verification_table(p, analyse(p))
        for pv, s in zip(rows, _records[-len(rows):], strict=True):
            v = pv.verification
            if pv.cond != "simple":
                continue
            w = min(max(float(s["share"]), 0.5), 1.0)
            M = w * w * s["M_load"]
            h = s["h_load"] / (w * w)  # the speed v/w (pointhistory.shared_load)
            key = (round(pv.L, 4), round(pv.a, 4), round(M, 3), round(h, 4),
                   round(v.contact_compliance, 15))
            if key in seen:
                continue
            seen.add(key)
            sec, gr = s["section"], s["grade"]
            args = (pv.L, pv.EI, float(s["mu"]), float(s["kGA"]), float(s["rhoI"]), pv.a, M,
                    h, v.contact_compliance)
            rig = timoshenko_drop(*args, n_modes=40)
            k = float(ac.default_connection_stiffness(sec.d, sec.tf, sec.tw, gr.fu, sec.r))
            Vk = {m: connection_drop(*args, m * k, n_modes=40).connection for m in MULTIPLES}
            xi = pv.a / pv.L
            f_s = float(s["g_m"]) + ((1 - xi) ** 2 + xi**2) / k
            F_E = float(amplification.member_energy_force(M * impact.G, h, f_s,
                                                          v.contact_compliance))
            bound = float(ac.connection_force_bound(k, 0.5 * F_E**2 * f_s))
            Z = float(ac.shear_impedance(float(s["kGA"]), float(s["mu"])))
            pulse = math.pi * math.sqrt(M * v.contact_compliance) * 1e3
            print(f"| {name} | {pv.bay_id} | {pv.load_name[:20]} | {pv.member_id} | {M:.1f} | "
                  f"{pulse:.3f} | {Z / k * 1e3:.3f} | {rig.reaction / 1e3:.1f} | "
                  + " | ".join(f"{Vk[m] / rig.reaction:.2f}" for m in MULTIPLES)
                  + f" | {bound / Vk[1.0]:.2f} |", flush=True)


if __name__ == "__main__":
    main()

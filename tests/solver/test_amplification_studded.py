"""Studded (composite) members with dynamic amplification on: the verdict never below
the point's own time history at the verified bays.

Sources: the time history (droprig.solver.exacthistory; Blevins 1979 Table 8-1 modes,
Chopra 4th ed. §10–12) on the chain's own struck member, with its composite EI (EN
1994-1-1 §5.4.2.2 transformed section, checked by hand in
tests/solver/test_verify_struck_member.py), through droprig.solver.verification; the
light items' impulse bound (droprig.solver.amplification_impulse) reads the same EI.
The demo with every simply supported member studded is an invented variant (input
only): before the impulse bound its spreader beam read verdict ÷ history 0.93 on
deflection (the amplification table, calibrated on bare members, A_δ 3.41).
"""

from __future__ import annotations

from dataclasses import replace

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analyse, verification_table

QUANTITIES = ("force", "moment", "shear", "deflection")


def test_studded_variant_never_below_its_time_history() -> None:
    p = load_project(demo_dir() / "two_level_rigging.droprig")
    levels = tuple(replace(lv, members=tuple(replace(m, composite=m.end_condition == "simple")
                                             for m in lv.members)) for lv in p.levels)
    p = replace(p, levels=levels, settings=replace(p.settings, dynamic_amplification=True))
    assert any(m.composite for lv in p.levels for m in lv.members)
    rows = verification_table(p, analyse(p), skipped=[])
    assert rows  # the spreader beam's and the hook block's bays
    assert any(r.load_name.startswith("Spreader") for r in rows)
    for r in rows:
        v = r.verification
        for q in QUANTITIES:
            if v.time_history[q] > 0.0:
                assert v.verdict[q] >= v.time_history[q] * (1 - 1e-9), (
                    r.bay_id, r.load_name, q, v.verdict[q] / v.time_history[q])

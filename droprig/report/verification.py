"""The annex's verification table: for each bay's governing point, the energy method
beside the time history (Qt-free, no reportlab: rows of text the annex lays out).

Numbers from :func:`droprig.solver.verification_table` (the struck member alone with
the whole load, the rest of the path as a spring in series; a Timoshenko member —
Blevins 1979 Table 8-1 mode shapes with Timoshenko's frequencies and shears,
:func:`droprig.solver.timehistory.timoshenko_modes` — carrying its steel and the deck
over its tributary width; each phase solved in closed form; the energy method
of Gere 7th ed. §9.10 with the Rayleigh struck mass). Units: the project's system.
"""

from __future__ import annotations

from typing import Any

from droprig.units import fmt

__all__ = ["FORCE_ROW_WORDS", "VERIFICATION_HEADER", "VERIFICATION_NOTE", "VERIFICATION_OFF",
           "pad_edge_words", "verification_rows"]

VERIFICATION_HEADER: tuple[str, ...] = (
    "zone", "bay", "load", "member", "r = M/mₑ", "κ = f_c/f_s",
    "F energy", "F time history", "M energy", "M time history",
    "F ratio", "M ratio", "δ ratio", "F verdict ratio", "M verdict ratio",
    "V verdict ratio")
"""Column titles; the ratios are energy method ÷ time history (below 1: the energy
method reads low there), the verdict ratios the demand the verdict uses (dynamic
amplification) ÷ time history (1 or more: the verdict covers the time history)."""

VERIFICATION_NOTE = (
    "Time-history check of the energy method at each bay's governing point (impact alone): "
    "the struck member as a Timoshenko beam (shear deformation and rotary inertia; the "
    "mode shapes of Blevins Table 8-1) carrying its steel and the deck and superimposed "
    "dead load over its tributary width, the load on a "
    "compression-only contact spring capped as the verdict caps it (the deck "
    "concrete's crushing, the crushable layer, or the struck beam's web yielding locally "
    "under the load), each phase solved in closed form by modal "
    "superposition through the rebound. The energy method is the analysis's own: its "
    "force on the framing on the struck member's unit-load envelopes. A ratio "
    "below 1 means the energy method reads lower than the time history; the verdict "
    "ratios compare the demands the checks use (dynamic amplification: the larger of the "
    "energy method and the calibrated time-history bounds) with the time history — 1 or "
    "more means the verdict covers it. F is the force at the contact: the force the "
    "analysis's checks take there (the deck's flexure and punching; the webs' where there "
    "is no deck) beside the time history's contact force. Under a hard load on a bare deck "
    "the analysis's two-mass contact spike is taken by no strength check (the local-damage "
    "checks judge that strike by its speed) and is not compared; V is the member's end "
    "shear (its support reactions) on both sides. "
    "Check aid only: "
    "review against local codes with the appointed lifting person and a licensed "
    "structural engineer.")


FORCE_ROW_WORDS = (
    "The force compared is the force the checks take at the contact (the deck's flexure "
    "and punching; the webs' under the load where there is no deck).")
"""Said beside every verification table: what its force row compares."""


VERIFICATION_OFF = (
    "Dynamic amplification is off in this project's settings: the verdict uses the energy "
    "method, so its ratios equal the energy method's, and below 1 the time history reads "
    "higher than the verdict at that point — for the engineer to review, or switch "
    "amplification on.")
"""Said beside the table when the project's checks use the energy method alone."""


def pad_edge_words(pv: Any, system: str) -> str:
    """What the verification of a point at a crushable pad's edge verifies, in words
    ("" elsewhere): where the tip-off over the pad's edge governs
    (``PointVerification.pad_edge``), the deck contact as a landing on the bare deck
    from the energy bound's height H − Δ; the tipping motion itself is not in the
    time history."""
    if pv.pad_edge != "tip_off":
        return ""
    return (f"{pv.zone_id}, {pv.load_name}, bay {pv.bay_id or '—'}: the tip-off over a "
            "pad's edge governs this point; verified is its deck contact as a landing on "
            "the bare deck from the energy bound's height h = H − Δ = "
            f"{fmt(pv.fall, 'length', system)} ("
            + (f"Δ = {fmt(pv.tip_delta, 'length', system)}" if pv.tip_delta >= 1e-3 else
               "Δ under 1 mm: the footprint barely reaches the pad, a fall onto the bare deck")
            + "). "
            "The tipping motion itself (the turn about the pad's edge, the pad crushing "
            "under it) is not in the time history: the bound stands for it.")


def verification_rows(project: Any, results: Any, *, zone_id: str | None = None,
                      skipped: list[tuple[Any, str]] | None = None,
                      notes: list[str] | None = None) -> list[tuple[str, ...]]:
    """One row of text per verified bay summary, in :data:`VERIFICATION_HEADER` order;
    bays whose governing point cannot be verified (over a support of the modelled
    member, off a deck panel) are left out and appended to ``skipped`` (bay summary,
    why; :func:`droprig.solver.verification_table`). ``zone_id`` keeps one lift zone;
    ``notes`` (when given) gets :func:`pad_edge_words` of each row that has them."""
    from droprig.solver import verification_table

    system = project.settings.unit_system
    rows: list[tuple[str, ...]] = []
    for pv in verification_table(project, results, zone_id=zone_id, skipped=skipped):
        v = pv.verification
        words = pad_edge_words(pv, system)
        if words and notes is not None:
            notes.append(words)

        def ratio(key: str, v: Any = v) -> str:
            r = v.ratio(key)
            return "none" if r is None else f"{r:.2f}"

        rows.append((pv.zone_id, pv.bay_id, pv.load_name, pv.member_id,
                     _ratio_cell(v.mass_ratio), _ratio_cell(v.compliance_ratio),
                     fmt(v.energy["force"], "force", system),
                     fmt(v.time_history["force"], "force", system),
                     fmt(v.energy["moment"], "moment", system),
                     fmt(v.time_history["moment"], "moment", system),
                     ratio("force"), ratio("moment"), ratio("deflection"),
                     _verdict_ratio(v, "force"), _verdict_ratio(v, "moment"),
                     _verdict_ratio(v, "shear")))
    return rows


def _ratio_cell(r: float) -> str:
    """A ratio for the table's narrow r and κ columns: 3 significant figures, 2 below
    0.01 ("0.000631" broke over two lines in the steel demo's annex; "0.00063" fits),
    whole numbers from 1,000 up ("1.23e+03" did not fit; "1234" does)."""
    if abs(r) >= 1000:
        return f"{r:.0f}"
    return f"{r:.3g}" if abs(r) >= 0.01 else f"{r:.2g}"


def skipped_words(skipped: list[tuple[Any, str]]) -> list[str]:
    """One sentence per lift zone and load of the bays left out of the verification
    table, with where their governing point is and why it was not verified, e.g.
    "Not verified: MC1, Spreader beam 4 m, bays 1-2/A-B, 2-3/A-B (governing point
    over a column or a support of the modelled member)"."""
    from droprig.solver import SKIP_OVER_SUPPORT

    groups: dict[tuple[str, str, str], list[str]] = {}
    for b, why in skipped:
        kind = ("over a column or a support of the modelled member"
                if why == SKIP_OVER_SUPPORT else "not over a deck panel")
        ids = groups.setdefault((b.zone_id, b.load_name, kind), [])
        if b.bay_id not in ids:
            ids.append(b.bay_id)
    return [f"Not verified: {z}, {load}, bay{'s' if len(ids) > 1 else ''} "
            f"{', '.join(ids)} (governing point {kind}; the trace and the bay's other "
            "points are for the engineer to judge)."
            for (z, load, kind), ids in groups.items()]


def _verdict_ratio(v: Any, key: str) -> str:
    """The verdict's demand ÷ the time history's peak, as text ("none" where 0)."""
    t = v.time_history[key]
    d = (v.verdict or {}).get(key)
    return "none" if d is None or t <= 0 else f"{d / t:.2f}"

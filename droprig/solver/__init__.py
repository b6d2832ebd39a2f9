"""Impact solver: pure numpy, vectorised over drop points, SI units inside.

This package's one face for the outer layers (GUI, CLI, report): they import these
names from ``droprig.solver`` and nothing from its modules
(``tests/test_layers.py`` enforces it).

* :func:`analyse` — every drop point of every load of every lift zone of a project;
  :class:`ZoneCache` — the same with each zone's results remembered by the model
  objects that feed it (the window's live re-analysis); :func:`analyse_outcomes` —
  the same up to, not including, the confirmation of limits (the window paints the
  outcomes first and shows the limits once confirmed);
* :func:`trace_point` — the calculation trace of one drop point;
* :func:`planned_height` — a load's drop height on droprig's one datum (load
  underside above the finished surface of the level);
* :func:`assess_member` — one member struck by one dropped load (``droprig check``);
* :func:`member_resistances`, :func:`check_framing`, :func:`on_rigid_support` —
  framing questions without a drop;
* :func:`verify_member`, :func:`verify_point`, :func:`verification_table` — the
  time history beside the energy method (``droprig verify``, the annex's table);
* :func:`resolve_drift`, :func:`zone_drift_margin` — the landing drift margin of a
  lift zone (computed from the crane's motion, or as entered); :func:`is_hard` —
  whether a load is checked for local damage of the deck;
* the result types and their code tables.
"""

from droprig.model import Project
from droprig.solver.analysis import ZoneCache, analyse, floor_model
from droprig.solver.cancel import AnalysisCancelledError, CancelToken, cancellable
from droprig.solver.cascade import level_below
from droprig.solver.chain import pad_crush_stress, planned_height
from droprig.solver.drift import resolve_drift, zone_drift_margin
from droprig.solver.framing import (
    Resistances,
    check_framing,
    member_resistances,
    on_rigid_support,
)
from droprig.solver.local_damage import check_load_on_grating, is_hard
from droprig.solver.member import DEFAULT_DEFLECTION_LIMIT_RATIO, RESULT_KEYS, assess_member
from droprig.solver.pointhistory import TH_MARGIN
from droprig.solver.results import (
    ADVICE_KINDS,
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
    LIMIT_MARGIN,
    PERFORATES,
    PLASTIC,
    RESPONSES,
    AdviceKind,
    BaySummary,
    Cascade,
    CaseResult,
    Results,
    Trace,
    TraceStep,
)
from droprig.solver.summary import MIN_USEFUL_HEIGHT
from droprig.solver.timehistory import History
from droprig.solver.trace import trace_point
from droprig.solver.verification import (
    SKIP_OFF_PANEL,
    SKIP_OVER_SUPPORT,
    OverSupportError,
    PointVerification,
    Verification,
    verification_table,
    verify_member,
    verify_point,
)


def analyse_outcomes(project: Project, cache: ZoneCache | None = None) -> Results | None:
    """The outcomes of :func:`analyse` before its limits are confirmed, or ``None``
    when ``cache`` holds the confirmed results of every zone (then
    ``cache.analyse(project)`` returns them at once).

    Each zone ``cache`` does not hold runs the forward analysis only — the drop points
    and their refinement (:func:`droprig.solver.refine.zone_points_geometry`), each
    load's case and bay summaries (:func:`droprig.solver.summary.summarise`) and the
    falls to the levels below (:func:`droprig.solver.analysis.cascade_down`) — and
    stops before :func:`droprig.solver.confirm.confirm_zone`, the costly part. The
    zones it holds are taken from it, confirmed. What the confirmation never changes
    is final here: every point's response, utilisation and governing check, each
    bay's response, greatest utilisation and its point, the falls
    (``tests/solver/test_analyse_outcomes.py`` compares them with :func:`analyse`).
    What it does change is not: each bay's limits and advice (allowable heights,
    height limit, mat) and every point's plastic allowable height are the inverse
    answers as found, untried, so they must never be shown or printed as final; every
    point's plastic allowable height and allowable mass (and so each bay's) are not
    worked out at all (NaN, None: ``Drop.outcomes_only`` — they are the costliest
    inverse answers and only the confirmation reads them); and the unconfirmed zones
    carry no warnings. With ``cache``, the points' rows an earlier call worked out
    for the same zone inputs but the zone's region are taken from ``cache.rows``
    (:class:`droprig.solver.outcome_rows.OutcomeRows`: the same values). The permit,
    the annex and ``droprig`` take :func:`analyse` only. SI units.
    """
    from droprig.solver import analysis
    from droprig.solver.floor import floor_cache

    project = resolve_drift(project)
    floor = floor_cache(project)
    cases: list[CaseResult] = []
    summaries: list[BaySummary] = []
    warnings: list[str] = []
    falls: list[Cascade] = []
    forward = False
    for zone in project.lift_zones:
        held = cache.peek(project, zone) if cache is not None else None
        if held is not None:
            cases.extend(held.cases)
            summaries.extend(held.bays)
            falls.extend(held.cascade)
            warnings.extend(w for w in held.warnings if w not in warnings)
            continue
        forward = True
        r = analysis.analyse_zone(project, zone.id, floor, confirm=False,
                                  rows=cache.rows if cache is not None else None,
                                  fall_rows=cache.forward_rows if cache is not None else None)
        cases.extend(r.cases)
        summaries.extend(r.bays)
        falls.extend(r.cascade)
    if not forward:
        return None
    return Results(tuple(cases), tuple(summaries), tuple(warnings), tuple(falls))


__all__ = [
    "ADVICE_KINDS",
    "CHECKS",
    "DECK",
    "DEFAULT_DEFLECTION_LIMIT_RATIO",
    "ELASTIC",
    "EXCEEDS",
    "LIMIT_MARGIN",
    "MIN_USEFUL_HEIGHT",
    "PERFORATES",
    "PLASTIC",
    "RESPONSES",
    "RESULT_KEYS",
    "SKIP_OFF_PANEL",
    "SKIP_OVER_SUPPORT",
    "TH_MARGIN",
    "AdviceKind",
    "AnalysisCancelledError",
    "BaySummary",
    "CancelToken",
    "Cascade",
    "CaseResult",
    "History",
    "OverSupportError",
    "PointVerification",
    "Resistances",
    "Results",
    "Trace",
    "TraceStep",
    "Verification",
    "ZoneCache",
    "analyse",
    "analyse_outcomes",
    "assess_member",
    "cancellable",
    "check_framing",
    "check_load_on_grating",
    "floor_model",
    "is_hard",
    "level_below",
    "member_resistances",
    "on_rigid_support",
    "pad_crush_stress",
    "planned_height",
    "resolve_drift",
    "trace_point",
    "verification_table",
    "verify_member",
    "verify_point",
    "zone_drift_margin",
]

"""Impact solver: pure numpy, vectorised over drop points, SI units inside.

This package's one face for the outer layers (GUI, CLI, report): they import these
names from ``droprig.solver`` and nothing from its modules
(``tests/test_layers.py`` enforces it).

* :func:`analyse` — every drop point of every load of every lift zone of a project;
  :class:`ZoneCache` — the same with each zone's results remembered by the model
  objects that feed it (the window's live re-analysis);
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
from droprig.solver.timehistory import History
from droprig.solver.trace import trace_point
from droprig.solver.verification import (
    PointVerification,
    Verification,
    verification_table,
    verify_member,
    verify_point,
)

__all__ = [
    "ADVICE_KINDS",
    "CHECKS",
    "DECK",
    "DEFAULT_DEFLECTION_LIMIT_RATIO",
    "ELASTIC",
    "EXCEEDS",
    "LIMIT_MARGIN",
    "PERFORATES",
    "PLASTIC",
    "RESPONSES",
    "RESULT_KEYS",
    "TH_MARGIN",
    "AdviceKind",
    "AnalysisCancelledError",
    "BaySummary",
    "CancelToken",
    "Cascade",
    "CaseResult",
    "History",
    "PointVerification",
    "Resistances",
    "Results",
    "Trace",
    "TraceStep",
    "Verification",
    "ZoneCache",
    "analyse",
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

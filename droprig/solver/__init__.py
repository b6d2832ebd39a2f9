"""Impact solver: pure numpy, vectorised over drop points, SI units inside.

This package's one face for the outer layers (GUI, CLI, report): they import these
names from ``droprig.solver`` and nothing from its modules
(``tests/test_layers.py`` enforces it).

* :func:`analyse` — every drop point of every load of every lift zone of a project;
* :func:`trace_point` — the calculation trace of one drop point;
* :func:`assess_member` — one member struck by one dropped load (``droprig check``);
* :func:`member_resistances`, :func:`check_framing`, :func:`on_rigid_support` —
  framing questions without a drop;
* :func:`resolve_drift`, :func:`zone_drift_margin` — the landing drift margin of a
  lift zone (computed from the crane's motion, or as entered); :func:`is_hard` —
  whether a load is checked for local damage of the deck;
* the result types and their code tables.
"""

from droprig.solver.analysis import analyse, floor_model
from droprig.solver.cancel import AnalysisCancelledError, CancelToken, cancellable
from droprig.solver.drift import resolve_drift, zone_drift_margin
from droprig.solver.framing import (
    Resistances,
    check_framing,
    member_resistances,
    on_rigid_support,
)
from droprig.solver.local_damage import is_hard
from droprig.solver.member import DEFAULT_DEFLECTION_LIMIT_RATIO, RESULT_KEYS, assess_member
from droprig.solver.results import (
    ADVICE_KINDS,
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
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
from droprig.solver.trace import trace_point

__all__ = [
    "ADVICE_KINDS",
    "CHECKS",
    "DECK",
    "DEFAULT_DEFLECTION_LIMIT_RATIO",
    "ELASTIC",
    "EXCEEDS",
    "PERFORATES",
    "PLASTIC",
    "RESPONSES",
    "RESULT_KEYS",
    "AdviceKind",
    "AnalysisCancelledError",
    "BaySummary",
    "CancelToken",
    "Cascade",
    "CaseResult",
    "Resistances",
    "Results",
    "Trace",
    "TraceStep",
    "analyse",
    "assess_member",
    "cancellable",
    "check_framing",
    "floor_model",
    "is_hard",
    "member_resistances",
    "on_rigid_support",
    "resolve_drift",
    "trace_point",
    "zone_drift_margin",
]

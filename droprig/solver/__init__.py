"""Impact solver: pure numpy, vectorised over drop points, SI units inside.

This package's one face for the outer layers (GUI, CLI, report): they import these
names from ``droprig.solver`` and nothing from its modules
(``tests/test_layers.py`` enforces it).

* :func:`analyse` — every drop point of every load of every lift zone of a project;
* :func:`trace_point` — the calculation trace of one drop point;
* :func:`assess_member` — one member struck by one dropped load (``droprig check``);
* :func:`member_resistances`, :func:`check_framing`, :func:`on_rigid_support` —
  framing questions without a drop;
* the result types and their code tables.
"""

from droprig.solver.analysis import analyse
from droprig.solver.framing import (
    Resistances,
    check_framing,
    member_resistances,
    on_rigid_support,
)
from droprig.solver.member import DEFAULT_DEFLECTION_LIMIT_RATIO, RESULT_KEYS, assess_member
from droprig.solver.results import (
    ADVICE_KINDS,
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
    PLASTIC,
    RESPONSES,
    AdviceKind,
    BaySummary,
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
    "PLASTIC",
    "RESPONSES",
    "RESULT_KEYS",
    "AdviceKind",
    "BaySummary",
    "CaseResult",
    "Resistances",
    "Results",
    "Trace",
    "TraceStep",
    "analyse",
    "assess_member",
    "check_framing",
    "member_resistances",
    "on_rigid_support",
    "trace_point",
]

"""Project model: plain frozen dataclasses in SI units. No Qt, no I/O, no numpy."""

from droprig.model.errors import ModelError
from droprig.model.framing import (
    Bay,
    bays,
    default_labels,
    generate_level,
    resting_on,
    without_members,
)
from droprig.model.permit_data import (
    LIFT_POINT_KINDS,
    MASS_SOURCE_WORDS,
    MASS_SOURCES,
    LiftPoint,
    lift_point_tags,
)
from droprig.model.polygon import CORRIDOR_ALLOWED, check_corridor, corridor_problem
from droprig.model.project import (
    CONTACT_STIFFNESS_RANGE,
    END_CONDITIONS,
    STRIKE_ORIENTATIONS,
    ColumnGrid,
    Deck,
    Level,
    LiftLoad,
    LiftZone,
    Member,
    Point,
    Project,
    ProjectInfo,
    ProtectionArea,
    Rect,
    Settings,
)
from droprig.model.sections import E_STEEL, Concrete, Grade, Section

__all__ = [
    "CONTACT_STIFFNESS_RANGE",
    "CORRIDOR_ALLOWED",
    "END_CONDITIONS",
    "E_STEEL",
    "LIFT_POINT_KINDS",
    "MASS_SOURCES",
    "MASS_SOURCE_WORDS",
    "STRIKE_ORIENTATIONS",
    "Bay",
    "ColumnGrid",
    "Concrete",
    "Deck",
    "Grade",
    "Level",
    "LiftLoad",
    "LiftPoint",
    "LiftZone",
    "Member",
    "ModelError",
    "Point",
    "Project",
    "ProjectInfo",
    "ProtectionArea",
    "Rect",
    "Section",
    "Settings",
    "bays",
    "check_corridor",
    "corridor_problem",
    "default_labels",
    "generate_level",
    "lift_point_tags",
    "resting_on",
    "without_members",
]

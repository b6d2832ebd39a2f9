"""resting_on() and without_members(): which members are left on nothing when one
is removed, and the level without them.

The support rule checked here is droprig's own load-path convention (a member end
rests on a column at a grid intersection, or on a perpendicular member whose line
passes through it; a cantilever's free end rests on nothing): common practice, no
source. The cross-check against ``droprig.solver.loadpath.build_frame`` makes sure
the model and the solver apply the same rule. Framing and sections are invented
scenarios; no engineering value is asserted.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.model import (
    ColumnGrid,
    Grade,
    Level,
    Member,
    ModelError,
    Section,
    generate_level,
    resting_on,
    without_members,
)
from droprig.model.framing import SUPPORT_TOL

DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_projects"

SEC = Section("B", "custom", 0.30, 0.15, 0.0071, 0.0107, 0.015, 5.38e-3, 8.356e-5,
              5.57e-4, 6.28e-4, 6.04e-6, 42.2)
GRADE = Grade("G355", "EN", ((0.016, 355e6),), 470e6, 210e9)


@pytest.fixture
def floor() -> Level:
    """Two 6 m bays along x, one 8 m bay along y, girders along x, beams ≤ 3 m apart
    (scenario): girders GA/1-2, GA/2-3, GB/1-2, GB/2-3; column-line beams B1, B2, B3
    and infill beams B1.1, B2.1 at mid-bay."""
    return generate_level(
        level_id="L1", name="", elevation=0.0, x_spacings=(6.0, 6.0), y_spacings=(8.0,),
        girder_direction="x", beam_spacing=3.0, girder_section=SEC, beam_section=SEC,
        girder_grade=GRADE, beam_grade=GRADE)


def test_the_fixture_is_what_the_docstring_says(floor: Level) -> None:
    assert [m.id for m in floor.members] == [
        "GA/1-2", "GA/2-3", "GB/1-2", "GB/2-3", "B1/A-B", "B1.1/A-B", "B2/A-B",
        "B2.1/A-B", "B3/A-B"]


@pytest.mark.parametrize(("removed", "left_on_nothing"), [
    # a girder carries the infill beam that frames into its span
    (["GA/1-2"], ("B1.1/A-B",)),
    (["GB/2-3"], ("B2.1/A-B",)),
    (["GA/1-2", "GA/2-3"], ("B1.1/A-B", "B2.1/A-B")),
    # column-line beams run column to column: nothing rests on them, nor on infill beams
    (["B2/A-B"], ()),
    (["B1.1/A-B"], ()),
])
def test_resting_on(floor: Level, removed: list[str], left_on_nothing: tuple[str, ...]) -> None:
    # common practice, no source: the framing convention of the module docstring
    assert resting_on(floor, removed) == left_on_nothing


def test_resting_on_follows_the_chain(floor: Level) -> None:
    """A short trimmer on the infill beam B1.1: removing girder GA/1-2 takes B1.1 and
    then the trimmer (scenario geometry; common practice, no source)."""
    trimmer = Member("T1", "beam", (3.0, 4.0), (6.0, 4.0), SEC, GRADE)
    lv = replace(floor, members=(*floor.members, trimmer))
    assert resting_on(lv, ["B1.1/A-B"]) == ("T1",)
    assert resting_on(lv, ["GA/1-2"]) == ("B1.1/A-B", "T1")


def test_a_second_carrier_keeps_the_end_supported(floor: Level) -> None:
    """An end at a point where two collinear girders meet rests on either (scenario)."""
    g = floor.grid
    grid = ColumnGrid((0.0, 6.0, 12.0), g.y_lines, g.x_labels, g.y_labels)
    split = (Member("G1", "girder", (0.0, 0.0), (3.0, 0.0), SEC, GRADE),
             Member("G2", "girder", (3.0, 0.0), (6.0, 0.0), SEC, GRADE),
             Member("G3", "girder", (0.0, 8.0), (6.0, 8.0), SEC, GRADE),
             Member("B", "beam", (3.0, 0.0), (3.0, 8.0), SEC, GRADE))
    lv = Level("L9", "", 0.0, grid, split)
    # the splice point (3, 0) is not a column: G1 and G2 rest there on B, and B on them
    assert resting_on(lv, ["G1"]) == ()
    assert resting_on(lv, ["G1", "G2"]) == ("B",)


def test_a_cantilever_free_end_needs_nothing(floor: Level) -> None:
    """A cantilever fixed on girder GB/1-2 with its free end on girder GA/1-2's line:
    removing GA/1-2 leaves it standing (common practice, no source: a free end carries
    nothing)."""
    c = Member("C1", "beam", (4.5, 8.0), (4.5, 0.0), SEC, GRADE, "cantilever")
    lv = replace(floor, members=(*floor.members, c))
    assert "C1" not in resting_on(lv, ["GA/1-2"])
    assert "C1" in resting_on(lv, ["GB/1-2"])


def test_without_members_refuses_and_names_what_rests_on_it(floor: Level) -> None:
    with pytest.raises(ModelError) as err:
        without_members(floor, ["GA/1-2"])
    assert err.value.value == "B1.1/A-B"
    assert "GA/1-2" in err.value.allowed


def test_without_members_keeps_the_order_of_the_rest(floor: Level) -> None:
    lv = without_members(floor, ["GA/1-2", "B1.1/A-B"])
    assert [m.id for m in lv.members] == [
        "GA/2-3", "GB/1-2", "GB/2-3", "B1/A-B", "B2/A-B", "B2.1/A-B", "B3/A-B"]
    kept = {m.id: m for m in floor.members}
    assert all(m is kept[m.id] for m in lv.members)  # the others untouched
    assert replace(lv, members=floor.members) == floor  # everything else unchanged


@pytest.mark.parametrize("ids", [["nope"], ["GA/1-2", "nope"]])
def test_unknown_member_is_refused(floor: Level, ids: list[str]) -> None:
    with pytest.raises(ModelError, match="nope"):
        resting_on(floor, ids)


def test_the_last_member_cannot_go(floor: Level) -> None:
    with pytest.raises(ModelError, match="at least one member"):
        without_members(floor, [m.id for m in floor.members])


# ------------------------------------------------------- the same rule as the solver


def test_same_support_tolerance_as_the_load_path() -> None:
    from droprig.solver.loadpath import SUPPORT_TOL as SOLVER_TOL

    assert SUPPORT_TOL == SOLVER_TOL


def _levels() -> list[Level]:
    out = []
    for path in sorted(DEMO_DIR.glob("*.droprig")):
        out.extend(load_project(path).levels)
    return out


@pytest.mark.parametrize("level", _levels(), ids=lambda lv: lv.id)
def test_removal_with_what_rests_on_it_leaves_an_analysable_level(level: Level) -> None:
    """For every member of the demo floors: the solver refuses the level without the
    member alone exactly when resting_on() names members, and always accepts it
    without the member and those members."""
    from droprig.solver.loadpath import build_frame

    for m in level.members:
        carried = resting_on(level, [m.id])
        alone = replace(level, members=tuple(o for o in level.members if o.id != m.id))
        if carried:
            with pytest.raises(ModelError):
                build_frame(alone)
        else:
            build_frame(alone)
        build_frame(without_members(level, [m.id, *carried]))

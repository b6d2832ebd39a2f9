"""generate_level, bays() and grid labels.

The framing convention checked here (girders on the column lines one way,
beams on every column line the other way plus equally spaced infill beams no
farther apart than the requested spacing, all simply supported) is common
practice, no source. Member counts are counted by hand in the comments.
"""

from __future__ import annotations

import itertools
from collections import Counter

import pytest

from droprig.model import (
    Grade,
    Level,
    Rect,
    Section,
    bays,
    default_labels,
    generate_level,
)

SPAN_TOL = 1e-9  # m, float round-off on summed grid spacings

SEC_G = Section("G", "custom", 0.45, 0.19, 0.0094, 0.0146, 0.021, 9.88e-3, 3.374e-4,
                1.5e-3, 1.702e-3, 1.676e-5, 77.6)
SEC_B = Section("B", "custom", 0.30, 0.15, 0.0071, 0.0107, 0.015, 5.38e-3, 8.356e-5,
                5.57e-4, 6.28e-4, 6.04e-6, 42.2)
GRADE = Grade("G355", "EN", ((0.016, 355e6),), 470e6, 210e9)


@pytest.fixture
def two_by_one_x() -> Level:
    """Two 6 m bays along x, one 8 m bay along y, girders along x, beams ≤ 3 m apart."""
    return generate_level(
        level_id="L1", name="", elevation=0.0, x_spacings=(6.0, 6.0), y_spacings=(8.0,),
        girder_direction="x", beam_spacing=3.0, girder_section=SEC_G, beam_section=SEC_B,
        girder_grade=GRADE, beam_grade=GRADE)


@pytest.fixture
def three_by_two_y() -> Level:
    """Three 7.5 m bays along x, two 9 m bays along y, girders along y, beams ≤ 2.5 m."""
    return generate_level(
        level_id="R", name="Roof", elevation=18.0, x_spacings=(7.5, 7.5, 7.5),
        y_spacings=(9.0, 9.0), girder_direction="y", beam_spacing=2.5, girder_section=SEC_G,
        beam_section=SEC_B, girder_grade=GRADE, beam_grade=GRADE)


def test_two_by_one_member_count_and_spans(two_by_one_x: Level) -> None:
    # Hand count (common practice, no source):
    #   girders along x on the 2 y-lines (A, B), 2 bays each               -> 4, span 6 m
    #   beams along y on the 3 x-lines (1, 2, 3)                           -> 3, span 8 m
    #   infill: 6 m / 3 m = 2 spaces per bay -> 1 infill beam × 2 bays     -> 2, span 8 m
    #   total 9
    lv = two_by_one_x
    roles = Counter(m.role for m in lv.members)
    assert roles == {"girder": 4, "beam": 5}
    for m in lv.members:
        expected = 6.0 if m.role == "girder" else 8.0
        assert m.span == pytest.approx(expected, abs=SPAN_TOL), m.id
        assert m.axis == ("x" if m.role == "girder" else "y")
        assert m.end_condition == "simple"
        assert m.section is (SEC_G if m.role == "girder" else SEC_B)
    assert sorted(m.id for m in lv.members) == sorted([
        "GA/1-2", "GA/2-3", "GB/1-2", "GB/2-3",
        "B1/A-B", "B1.1/A-B", "B2/A-B", "B2.1/A-B", "B3/A-B"])
    # infill beams sit at mid-bay: x = 3 m and 9 m
    infill_x = sorted(m.start[0] for m in lv.members if "." in m.id)
    assert infill_x == pytest.approx([3.0, 9.0], abs=SPAN_TOL)


def test_three_by_two_member_count_and_spans(three_by_two_y: Level) -> None:
    # Hand count (common practice, no source):
    #   girders along y on the 4 x-lines, 2 bays each                      -> 8, span 9 m
    #   beams along x on the 3 y-lines, 3 bays each                        -> 9, span 7.5 m
    #   infill: 9 m / 2.5 m = 3.6 -> 4 spaces of 2.25 m -> 3 infill beams
    #           in each of 3 × 2 = 6 bays                                  -> 18, span 7.5 m
    #   total 35
    lv = three_by_two_y
    assert len(lv.members) == 35
    spans = Counter((m.role, round(m.span, 9)) for m in lv.members)
    assert spans == {("girder", 9.0): 8, ("beam", 7.5): 27}
    # infill spacing within one bay does not exceed the requested 2.5 m
    ys = sorted({m.start[1] for m in lv.members if m.role == "beam" and m.start[0] == 0.0})
    gaps = [b - a for a, b in itertools.pairwise(ys)]
    assert max(gaps) <= 2.5 + SPAN_TOL
    assert gaps == pytest.approx([2.25] * 8, abs=SPAN_TOL)


def test_beam_spacing_that_divides_the_bay_gives_that_spacing() -> None:
    # 9 m / 3 m = 3 spaces exactly -> 2 infill beams, not 3 (no larger than the spacing)
    lv = generate_level(
        level_id="L", name="", elevation=0.0, x_spacings=(9.0,), y_spacings=(6.0,),
        girder_direction="x", beam_spacing=3.0, girder_section=SEC_G, beam_section=SEC_B,
        girder_grade=GRADE, beam_grade=GRADE)
    assert Counter(m.role for m in lv.members) == {"girder": 2, "beam": 4}


def test_members_end_on_grid_lines_or_girders(three_by_two_y: Level) -> None:
    lv = three_by_two_y
    g = lv.grid
    for m in lv.members:
        if m.role == "girder":
            # girders run column to column
            for p in (m.start, m.end):
                assert p[0] in g.x_lines and p[1] in g.y_lines
        else:
            # beams frame into girders: their ends lie on an x-line
            assert m.start[0] in g.x_lines and m.end[0] in g.x_lines


def test_origin_and_labels() -> None:
    lv = generate_level(
        level_id="L", name="", elevation=0.0, x_spacings=(6.0,), y_spacings=(8.0,),
        girder_direction="x", beam_spacing=6.0, girder_section=SEC_G, beam_section=SEC_B,
        girder_grade=GRADE, beam_grade=GRADE, x_labels=("10", "11"), y_labels=("P", "Q"),
        origin=(100.0, -20.0))
    assert lv.grid.x_lines == (100.0, 106.0) and lv.grid.y_lines == (-20.0, -12.0)
    assert sorted(m.id for m in lv.members) == ["B10/P-Q", "B11/P-Q", "GP/10-11", "GQ/10-11"]


def test_bays_labels_and_order(three_by_two_y: Level) -> None:
    b = bays(three_by_two_y)
    # row by row: y outer, x inner; id = x labels then y labels
    assert [x.id for x in b] == ["1-2/A-B", "2-3/A-B", "3-4/A-B",
                                 "1-2/B-C", "2-3/B-C", "3-4/B-C"]
    assert [(x.i, x.j) for x in b] == [(0, 0), (1, 0), (2, 0), (0, 1), (1, 1), (2, 1)]
    assert b[4].rect == Rect(7.5, 9.0, 15.0, 18.0)
    assert all(x.level_id == "R" for x in b)
    # the bays tile the grid extent: total area = 22.5 m × 18 m
    assert sum(x.rect.width * x.rect.height for x in b) == pytest.approx(22.5 * 18.0)


@pytest.mark.parametrize("n, style, expected", [
    (3, "numbers", ("1", "2", "3")),
    # I and O are skipped so they are not read as 1 and 0 (common practice, no source)
    (10, "letters", ("A", "B", "C", "D", "E", "F", "G", "H", "J", "K")),
])
def test_default_labels(n: int, style: str, expected: tuple[str, ...]) -> None:
    assert default_labels(n, style) == expected  # type: ignore[arg-type]


def test_letters_continue_with_doubled_letters() -> None:
    # 24 letters without I and O, then AA, AB … (common practice, no source)
    labels = default_labels(27, "letters")
    assert labels[23] == "Z" and labels[24:] == ("AA", "AB", "AC")
    assert "I" not in labels and "O" not in labels
    assert len(set(default_labels(60, "letters"))) == 60

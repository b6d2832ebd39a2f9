"""Bay lists condensed to grid ranges (droprig.model.bay_ranges) and id lists to
first–last runs (droprig.model.id_ranges).

The wording is droprig's own ("2-5/A-C": every bay between grid lines 2 and 5 and
lines A and C); no published source applies (common practice, no source). The
checks are that nothing is lost or doubled: expanding the ranges by this file's
own reading of the grid labels gives back exactly the bays asked for, each once.
The framing is invented test data.
"""

from __future__ import annotations

import random

import pytest

from droprig.model import Grade, Section, bay_ranges, bays, generate_level, id_ranges

IPE = Section("IPE 300", "IPE", 0.300, 0.150, 0.0071, 0.0107, 0.015, 53.8e-4, 8356e-8,
              557e-6, 628e-6, 604e-8, 42.2)
S355 = Grade("S355", "EN", ((0.016, 355e6), (0.040, 345e6)), 470e6, 210e9)
LEVEL = generate_level(level_id="L1", name="L1", elevation=4.0, x_spacings=(9.0,) * 12,
                       y_spacings=(8.0,) * 10, girder_direction="x", beam_spacing=3.0,
                       girder_section=IPE, beam_section=IPE, girder_grade=S355,
                       beam_grade=S355)
IDS = [b.id for b in bays(LEVEL)]


def expand(text: str) -> list[str]:
    """The bays a range "x0-x1/y0-y1" names, from the level's grid labels."""
    g = LEVEL.grid
    xs, ys = list(g.x_labels), list(g.y_labels)
    xr, yr = text.split("/")
    x0, x1 = xr.split("-")
    y0, y1 = yr.split("-")
    return [f"{xs[i]}-{xs[i + 1]}/{ys[j]}-{ys[j + 1]}"
            for j in range(ys.index(y0), ys.index(y1))
            for i in range(xs.index(x0), xs.index(x1))]


def test_examples() -> None:
    assert bay_ranges(LEVEL, IDS) == ("1-13/A-L",)  # 12 × 10 bays, A-L skips I
    assert bay_ranges(LEVEL, ["3-4/B-C"]) == ("3-4/B-C",)
    assert bay_ranges(LEVEL, ["2-3/A-B", "3-4/A-B", "4-5/A-B", "2-3/B-C", "3-4/B-C",
                              "4-5/B-C", "7-8/B-C"]) == ("2-5/A-C", "7-8/B-C")
    assert bay_ranges(LEVEL, []) == ()
    assert bay_ranges(LEVEL, ["1-2/A-B", "elsewhere"]) == ("1-2/A-B", "elsewhere")


@pytest.mark.parametrize("seed", range(40))
def test_ranges_name_every_bay_once(seed: int) -> None:
    rng = random.Random(seed)
    share = rng.choice((0.1, 0.5, 0.9))
    wanted = [b for b in IDS if rng.random() < share]
    rng.shuffle(wanted)
    ranges = bay_ranges(LEVEL, wanted + wanted[:3])  # repeats are named once
    named = [b for r in ranges for b in expand(r)]
    assert sorted(named) == sorted(set(wanted))
    assert len(named) == len(set(named))
    assert len(ranges) <= len(set(wanted))


def test_id_ranges() -> None:
    order = [f"L{k:02d}" for k in range(1, 11)]
    assert id_ranges(order, order) == ("L01–L10",)
    assert id_ranges(order, ["L05", "L01", "L02", "L04", "L03", "L09"]) == ("L01–L05", "L09")
    assert id_ranges(order, ["L01", "L02", "L07"]) == ("L01", "L02", "L07")
    assert id_ranges(order, ["X", "L02"]) == ("L02", "X")


def test_condition_sentence_names_bays_as_ranges_given_its_level() -> None:
    from droprig.permit import Condition

    bays_ = ("2-3/A-B", "3-4/A-B", "4-5/A-B", "2-3/B-C", "3-4/B-C", "4-5/B-C", "7-8/B-C")
    c = Condition("exclude_area", "Z1", "pallet", "L1", bays_)
    assert "bays 2-5/A-C and 7-8/B-C of level L1" in c.sentence("SI", LEVEL)
    # without the level (window, command line): every bay as given
    assert "bays 2-3/A-B, 3-4/A-B" in c.sentence("SI")
    assert c.where(LEVEL).count("/") == 2

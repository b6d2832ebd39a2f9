"""Permit data in the model: permit number, lift-plan revision, validity window,
crane and configuration, pick-up and set-down points, mass source.

References:
- ISO 8601-1:2019, §5.2.2 (calendar date YYYY-MM-DD, extended format) and §5.4.2
  (local time hh:mm): the accepted date forms.
- The Unicode Standard 15.0, §4.5 General Category, Table 4-4: Cc (control),
  Cf (format: zero-width and bidirectional controls), Co (private use) — the
  refused characters.
- Mass-source categories (weighed, data plate, drawing, estimate): common
  practice, no source.
"""

from __future__ import annotations

import dataclasses

import pytest

from droprig.model import (
    LiftLoad,
    LiftPoint,
    LiftZone,
    ModelError,
    ProjectInfo,
    lift_point_tags,
)
from droprig.model.permit_data import MAX_LIFT_POINTS, parse_permit_date


def _zone(**kw: object) -> LiftZone:
    return LiftZone("Z1", "crane", "R", (0.0, 0.0), 2.0, 20.0, **kw)  # type: ignore[arg-type]


# ----------------------------------------------------------------- defaults


def test_everything_defaults_to_not_recorded() -> None:
    info = ProjectInfo("Roof")
    assert (info.permit_number, info.lift_plan_revision, info.valid_from,
            info.valid_to) == ("", "", "", "")
    zone = _zone()
    assert (zone.crane_description, zone.crane_configuration, zone.lift_points) == ("", "", ())
    assert LiftLoad("unit", 1000.0).mass_source is None


# ----------------------------------------------------------------- text fields


@pytest.mark.parametrize("field", ["permit_number", "lift_plan_revision"])
@pytest.mark.parametrize("value, why", [
    ("PTW\x07118", "U+0007"),        # BEL, Cc
    ("PTW-118\n", "U+000A"),         # line feed: one line only
    ("PTW\t118", "U+0009"),          # tab, Cc
    ("PTW\u200b118", "U+200B"),      # zero-width space, Cf
    ("PTW\u202e811", "U+202E"),      # right-to-left override, Cf
    ("PTW\ue000", "U+E000"),         # private use, Co
])
def test_control_and_format_characters_are_refused(field: str, value: str, why: str) -> None:
    with pytest.raises(ModelError) as err:
        ProjectInfo("Roof", **{field: value})
    assert err.value.field == f"info.{field}"
    assert why in err.value.allowed


@pytest.mark.parametrize("value", [" PTW-118", "PTW-118 "])
def test_padding_spaces_are_refused(value: str) -> None:
    with pytest.raises(ModelError, match=r"info.permit_number"):
        ProjectInfo("Roof", permit_number=value)


def test_long_text_is_refused_with_its_limit() -> None:
    with pytest.raises(ModelError, match=r"at most 200 characters"):
        ProjectInfo("Roof", permit_number="P" * 201)
    ProjectInfo("Roof", permit_number="P" * 200)


@pytest.mark.parametrize("field, limit", [("crane_description", 200),
                                          ("crane_configuration", 600)])
def test_crane_text_is_checked(field: str, limit: int) -> None:
    _zone(**{field: "x" * limit})
    with pytest.raises(ModelError, match=rf"zone Z1.{field}.*at most {limit}"):
        _zone(**{field: "x" * (limit + 1)})
    with pytest.raises(ModelError, match=rf"zone Z1.{field}.*U\+000D"):
        _zone(**{field: "boom 40 m\rjib"})


def test_unicode_text_that_prints_is_kept() -> None:
    info = ProjectInfo("Roof", permit_number="Genehmigung Nr. 118/Ä", lift_plan_revision="Δ2")
    assert info.permit_number.endswith("Ä") and info.lift_plan_revision == "Δ2"


# ----------------------------------------------------------------- validity window


@pytest.mark.parametrize("text, iso", [
    ("2026-12-06", "2026-12-06T00:00:00"),
    ("2026-12-06 06:30", "2026-12-06T06:30:00"),
    ("2026-12-06T18:00", "2026-12-06T18:00:00"),
    ("2028-02-29", "2028-02-29T00:00:00"),   # leap year (ISO 8601 Gregorian calendar)
])
def test_iso_dates_are_read(text: str, iso: str) -> None:
    got = parse_permit_date("info.valid_from", text)
    assert got is not None and got.isoformat() == iso


@pytest.mark.parametrize("text", [
    "06/12/2026", "2026-12-6", "next Monday", "2026-13-01", "2026-02-30", "2027-02-29",
    "2026-12-06 24:00", "2026-12-06 6:00", "2026-12-06T06:00:00Z",
])
def test_other_date_forms_are_refused(text: str) -> None:
    with pytest.raises(ModelError) as err:
        ProjectInfo("Roof", valid_from=text)
    assert err.value.field == "info.valid_from"
    assert "YYYY-MM-DD" in err.value.allowed


def test_window_must_not_end_before_it_starts() -> None:
    with pytest.raises(ModelError) as err:
        ProjectInfo("Roof", valid_from="2026-12-06 06:00", valid_to="2026-12-05")
    assert err.value.field == "info.valid_to"
    with pytest.raises(ModelError, match=r"info.valid_to"):
        ProjectInfo("Roof", valid_from="2026-12-06 18:00", valid_to="2026-12-06 06:00")
    # a bare end date runs to the end of its day
    ProjectInfo("Roof", valid_from="2026-12-06 18:00", valid_to="2026-12-06")
    ProjectInfo("Roof", valid_from="2026-12-06", valid_to="2026-12-06")
    # one end alone is allowed (the other is flagged as not recorded)
    ProjectInfo("Roof", valid_to="2026-12-06")


# ----------------------------------------------------------------- lift points


def test_lift_points_are_validated_with_their_field() -> None:
    with pytest.raises(ModelError, match=r"lift_point.kind"):
        LiftPoint("drop_off", (1.0, 2.0))  # type: ignore[arg-type]
    with pytest.raises(ModelError, match=r"lift_point.at.x"):
        LiftPoint("pick_up", (float("nan"), 2.0))
    with pytest.raises(ModelError, match=r"lift_point.at.y"):
        LiftPoint("pick_up", (1.0, 2e4))
    with pytest.raises(ModelError, match=r"lift_point.at"):
        LiftPoint("pick_up", (1.0,))  # type: ignore[arg-type]
    with pytest.raises(ModelError, match=r"lift_point.label"):
        LiftPoint("set_down", (1.0, 2.0), "plinth\x00")
    with pytest.raises(ModelError, match=r"lift_point.label.*64"):
        LiftPoint("set_down", (1.0, 2.0), "p" * 65)


def test_zone_holds_at_most_the_allowed_number_of_points() -> None:
    pts = tuple(LiftPoint("pick_up", (float(i), 0.0)) for i in range(MAX_LIFT_POINTS + 1))
    with pytest.raises(ModelError, match=rf"zone Z1.lift_points.*at most {MAX_LIFT_POINTS}"):
        _zone(lift_points=pts)
    with pytest.raises(ModelError, match=r"zone Z1.lift_points"):
        _zone(lift_points=((1.0, 2.0),))  # type: ignore[arg-type]


def test_tags_number_pick_ups_and_set_downs_separately() -> None:
    z = _zone(lift_points=(LiftPoint("pick_up", (0.0, 0.0)), LiftPoint("set_down", (1.0, 0.0)),
                           LiftPoint("pick_up", (2.0, 0.0)), LiftPoint("set_down", (3.0, 0.0))))
    assert lift_point_tags(z) == ["P1", "S1", "P2", "S2"]


# ----------------------------------------------------------------- mass source


@pytest.mark.parametrize("source", ["weighed", "data_plate", "drawing", "estimate", None])
def test_mass_sources(source: str | None) -> None:
    assert LiftLoad("unit", 1000.0, mass_source=source).mass_source == source  # type: ignore[arg-type]


@pytest.mark.parametrize("source", ["guess", "", "Weighed"])
def test_unknown_mass_source_is_refused(source: str) -> None:
    with pytest.raises(ModelError) as err:
        LiftLoad("unit", 1000.0, mass_source=source)  # type: ignore[arg-type]
    assert err.value.field == "load unit.mass_source"
    assert err.value.allowed == "one of weighed, data_plate, drawing, estimate"


def test_edits_are_validated_too() -> None:
    info = ProjectInfo("Roof", permit_number="PTW-1")
    with pytest.raises(ModelError, match=r"info.valid_from"):
        dataclasses.replace(info, valid_from="tomorrow")

"""Inspector: model -> widget and widget -> model for each kind of selection,
in both unit systems; refused inputs leave the project and the widget as they
were and name the allowed range.

Unit conversions are checked against exact definitions: 1 ft = 0.3048 m and
1 lb = 0.45359237 kg (NIST SP 811, 2008 ed., Appendix B.8).
"""

from __future__ import annotations

import math
from dataclasses import replace

import pytest
from PySide6.QtWidgets import QComboBox, QLabel, QLineEdit

from droprig.gui import edits as ed
from droprig.gui.document import Document, Selection
from droprig.gui.inspector import FormDialog, Inspector, describe_refusal, protection_form
from droprig.io.sections import get_grade, get_section
from droprig.model import (
    LiftLoad,
    LiftZone,
    ModelError,
    Project,
    ProtectionArea,
    Rect,
    Settings,
    generate_level,
)

pytestmark = pytest.mark.gui

FT = 0.3048  # m, exact (NIST SP 811 B.8)
LB = 0.45359237  # kg, exact (NIST SP 811 B.8)
REL = 1e-9


def _roof(system: str = "SI") -> Project:
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.0, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Mobile crane", level_id="L1", crane=(-3.0, 2.5),
                    r_min=2.0, r_max=9.0,
                    loads=(LiftLoad(name="Pump skid", mass=1500.0, drop_height=0.8),))
    mat = ProtectionArea(id="P1", name="Mat", level_id="L1", area=Rect(0.0, 0.0, 3.0, 2.0))
    return Project(settings=Settings(unit_system=system), levels=(level,),
                   lift_zones=(zone,), protection_areas=(mat,))


@pytest.fixture
def doc(qtbot) -> Document:  # qtbot: the QApplication
    return Document(_roof())


@pytest.fixture
def inspector(qtbot, doc: Document) -> Inspector:
    w = Inspector(doc)
    qtbot.addWidget(w)
    return w


def _enter(w: QLineEdit, text: str) -> None:
    w.setText(text)
    w.editingFinished.emit()


# ------------------------------------------------------------------ model -> widget


def test_selection_shows_the_object_in_user_units(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("zone", ("Z1",)))
    edit = inspector.editor("r_max")
    assert isinstance(edit, QLineEdit)
    assert edit.text() == "9.000 m"
    doc.edit(ed.with_settings(doc.project, replace(doc.project.settings, unit_system="US")),
             "US")
    assert inspector.editor("r_max").text() == f"{9.0 / FT:.2f} ft"


def test_an_edit_elsewhere_refreshes_the_form(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("zone", ("Z1",)))
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_max=12.0)), "e")
    assert inspector.editor("r_max").text() == "12.000 m"
    doc.undo_stack.undo()
    assert inspector.editor("r_max").text() == "9.000 m"


def test_nothing_selected_shows_no_form(inspector: Inspector, doc: Document) -> None:
    doc.select(None)
    assert inspector.form is None


# ------------------------------------------------------------------ widget -> model


@pytest.mark.parametrize(("system", "text", "expected_m"), [
    ("SI", "12", 12.0),
    ("SI", "12.5 m", 12.5),
    ("SI", "40 ft", 40 * FT),
    ("US", "40", 40 * FT),
    ("US", "12 m", 12.0),
])
def test_typed_radius_reaches_the_model_in_si(qtbot, system: str, text: str,
                                              expected_m: float) -> None:
    doc = Document(_roof(system))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("zone", ("Z1",)))
    _enter(w.editor("r_max"), text)
    assert math.isclose(doc.project.zone("Z1").r_max, expected_m, rel_tol=REL)
    assert doc.undo_stack.count() == 1
    assert w.message == ""


def test_load_mass_in_pounds(qtbot) -> None:
    doc = Document(_roof("US"))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("load", ("Z1", "Pump skid")))
    _enter(w.editor("mass"), "4400")
    assert math.isclose(doc.project.zone("Z1").loads[0].mass, 4400 * LB, rel_tol=REL)


def test_unchanged_display_text_does_not_round_the_stored_value(inspector: Inspector,
                                                               doc: Document) -> None:
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_max=9.00049)),
             "fine value")
    doc.select(Selection("zone", ("Z1",)))
    inspector.editor("r_max").editingFinished.emit()
    assert doc.project.zone("Z1").r_max == 9.00049
    assert doc.undo_stack.count() == 1


# ------------------------------------------------------------------ refusals


@pytest.mark.parametrize(("system", "text", "allowed_fragment"), [
    ("SI", "250 m", "≤ 200.000 m"),                 # LiftZone: r_max ≤ 200 m
    ("SI", "1 m", "> r_min = 2.000 m"),             # r_max > r_min
    ("US", "700 ft", f"≤ {200 / FT:.2f} ft"),
])
def test_out_of_range_radius_is_refused_with_the_range(qtbot, system: str, text: str,
                                                       allowed_fragment: str) -> None:
    doc = Document(_roof(system))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("zone", ("Z1",)))
    before = doc.project
    shown = w.editor("r_max").text()
    _enter(w.editor("r_max"), text)
    assert doc.project is before
    assert doc.undo_stack.count() == 0
    assert "Allowed" in w.message and allowed_fragment in w.message
    assert "Nothing was changed" in w.message
    assert w.editor("r_max").text() == shown


@pytest.mark.parametrize("text", ["abc", "12 kg", "", "nan m"])
def test_unreadable_text_is_refused(inspector: Inspector, doc: Document, text: str) -> None:
    doc.select(Selection("zone", ("Z1",)))
    before = doc.project
    _enter(inspector.editor("r_max"), text)
    assert doc.project is before
    assert "Nothing was changed" in inspector.message
    assert inspector.editor("r_max").text() == "9.000 m"


def test_a_good_value_after_a_refusal_clears_the_message(inspector: Inspector,
                                                         doc: Document) -> None:
    doc.select(Selection("zone", ("Z1",)))
    _enter(inspector.editor("r_max"), "-4 m")
    assert inspector.message
    _enter(inspector.editor("r_max"), "10 m")
    assert inspector.message == ""
    assert doc.project.zone("Z1").r_max == 10.0


def test_refusal_message_reexpresses_the_model_range_in_us_units() -> None:
    exc = ModelError("load X.mass", 0.5, "≥ 1 kg and ≤ 500000 kg", "kg")
    msg = describe_refusal(exc, "Mass", "US", "mass")
    assert f"{500000 / LB:,.0f} lb".replace(",", "") in msg
    assert "kg" not in msg


# ------------------------------------------------------------------ members


def test_member_section_from_the_library_and_undo(inspector: Inspector, doc: Document) -> None:
    mid = doc.project.levels[0].members[0].id
    doc.select(Selection("member", ("L1", mid)))
    _enter(inspector.editor("section"), "ipe450")
    assert doc.project.level("L1").member(mid).section == get_section("IPE 450")
    doc.undo_stack.undo()
    assert doc.project.level("L1").member(mid).section == get_section("IPE 400")


def test_unknown_section_is_refused(inspector: Inspector, doc: Document) -> None:
    mid = doc.project.levels[0].members[0].id
    doc.select(Selection("member", ("L1", mid)))
    before = doc.project
    _enter(inspector.editor("section"), "IPE 999")
    assert doc.project is before
    assert "Section" in inspector.message


def test_member_grade_and_end_condition_choices(inspector: Inspector, doc: Document) -> None:
    mid = doc.project.levels[0].members[0].id
    doc.select(Selection("member", ("L1", mid)))
    grade = inspector.editor("grade")
    ends = inspector.editor("end_condition")
    assert isinstance(grade, QComboBox) and isinstance(ends, QComboBox)
    grade.setCurrentIndex(grade.findData("S275"))
    grade.activated.emit(grade.currentIndex())
    ends.setCurrentIndex(ends.findData("fixed"))
    ends.activated.emit(ends.currentIndex())
    m = doc.project.level("L1").member(mid)
    assert m.grade == get_grade("S275") and m.end_condition == "fixed"
    assert doc.undo_stack.count() == 2


# ------------------------------------------------------------------ loads and protection


def test_switching_a_load_to_hook_elevation_keeps_its_drop(inspector: Inspector,
                                                           doc: Document) -> None:
    doc.select(Selection("load", ("Z1", "Pump skid")))
    mode = inspector.editor("mode")
    assert isinstance(mode, QComboBox)
    mode.setCurrentIndex(mode.findData("hook"))
    mode.activated.emit(mode.currentIndex())
    ld = doc.project.zone("Z1").loads[0]
    assert ld.drop_height is None
    assert math.isclose(ld.height_above(doc.project.level("L1").elevation), 0.8, rel_tol=REL)
    assert "hook_elevation" in [f.key for f in inspector.form.fields]


def test_renaming_a_load_keeps_it_selected(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("load", ("Z1", "Pump skid")))
    _enter(inspector.editor("name"), "Chiller")
    assert doc.selection == Selection("load", ("Z1", "Chiller"))
    assert inspector.editor("name").text() == "Chiller"


def test_crushable_layer_shows_its_own_fields(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("protection", ("P1",)))
    assert "stiffness" in inspector.form_editor._editors
    kind = inspector.editor("kind")
    kind.setCurrentIndex(kind.findData("crushable"))
    kind.activated.emit(kind.currentIndex())
    assert doc.project.protection_areas[0].kind == "crushable"
    assert {"crush_force", "crush_stroke"} <= set(inspector.form_editor._editors)
    assert "stiffness" not in inspector.form_editor._editors


def test_protection_rectangle_edge_must_stay_east_of_west(inspector: Inspector,
                                                          doc: Document) -> None:
    doc.select(Selection("protection", ("P1",)))
    before = doc.project
    _enter(inspector.editor("x1"), "-1 m")
    assert doc.project is before
    assert "Allowed" in inspector.message


def test_new_protection_dialog_validates_its_working_copy(qtbot, doc: Document) -> None:
    area = ProtectionArea(id="P2", name="New mat", level_id="L1", area=Rect(0, 0, 2, 2))
    dlg = FormDialog("New", area, lambda a: protection_form(a, doc.project, None), "SI")
    qtbot.addWidget(dlg)
    _enter(dlg.editor.editor("thickness"), "150 mm")
    assert math.isclose(dlg.value().thickness, 0.15, rel_tol=REL)
    _enter(dlg.editor.editor("thickness"), "5 m")
    assert math.isclose(dlg.value().thickness, 0.15, rel_tol=REL)
    assert "Allowed" in dlg.editor.message
    assert doc.project.protection_areas[-1].id == "P1"  # the project is not touched


# ------------------------------------------------------------------ results in the inspector


def test_settings_form_is_read_only_with_a_button(qtbot, doc: Document) -> None:
    from PySide6.QtGui import QAction

    act = QAction("Analysis settings…")
    w = Inspector(doc, {"settings": act})
    qtbot.addWidget(w)
    doc.select(Selection("settings"))
    assert isinstance(w.editor("u"), QLabel)
    assert w.form.buttons == ["settings"]


# ------------------------------------------------------------------ quantities droprig.units lacks

LBF = 0.45359237 * 9.80665  # N, exact: lb × standard gravity (NIST SP 811 B.8)
PSF = LBF / FT**2  # Pa
IN2_PER_FT = 0.0254**2 / FT  # m²/m


@pytest.mark.parametrize(("system", "text", "expected_pa"), [
    ("SI", "1.5 kPa", 1500.0),
    ("US", "25", 25 * PSF),
    ("US", "25 psf", 25 * PSF),
    ("SI", "25 psf", 25 * PSF),
])
def test_level_loads_in_kpa_and_psf(qtbot, system: str, text: str, expected_pa: float) -> None:
    doc = Document(_roof(system))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("level", ("L1",)))
    _enter(w.editor("superimposed_dead"), text)
    assert math.isclose(doc.project.level("L1").superimposed_dead, expected_pa, rel_tol=REL)


@pytest.mark.parametrize(("system", "text", "expected"), [
    ("SI", "300", 300e-6),
    ("SI", "3 cm2/m", 300e-6),
    ("US", "0.2", 0.2 * IN2_PER_FT),
    ("US", "0.2 in²/ft", 0.2 * IN2_PER_FT),
])
def test_deck_bars_per_width(qtbot, system: str, text: str, expected: float) -> None:
    doc = Document(_roof(system))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("deck", ("L1",)))
    _enter(w.editor("rebar_area"), text)
    assert math.isclose(doc.project.level("L1").deck.rebar_area, expected, rel_tol=REL)


KIP_PER_IN = 4448.2216152605 / 0.0254  # N/m per kip/in (NIST SP 811 B.8, exact)


@pytest.mark.parametrize(("system", "text", "expected"), [
    ("SI", "50", 50e6),          # bare number: kN/mm, the SI display unit
    ("SI", "50 kN/mm", 50e6),
    ("US", "300", 300 * KIP_PER_IN),
    ("US", "2e7 N/m", 2e7),
])
def test_load_underside_stiffness_edit_empty_and_undo(qtbot, system: str, text: str,
                                                      expected: float) -> None:
    doc = Document(_roof(system))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("load", ("Z1", "Pump skid")))
    box = w.editor("contact_stiffness")
    assert isinstance(box, QLineEdit)
    assert box.text() == "" and "rigid" in box.placeholderText()  # None: a rigid load
    _enter(box, text)
    assert math.isclose(doc.project.zone("Z1").loads[0].contact_stiffness, expected,
                        rel_tol=REL)
    assert w.message == ""
    _enter(w.editor("contact_stiffness"), "")  # empty again: rigid
    assert doc.project.zone("Z1").loads[0].contact_stiffness is None
    assert doc.undo_stack.count() == 2
    doc.undo_stack.undo()
    assert math.isclose(doc.project.zone("Z1").loads[0].contact_stiffness, expected,
                        rel_tol=REL)
    doc.undo_stack.undo()
    assert doc.project.zone("Z1").loads[0].contact_stiffness is None
    assert w.editor("contact_stiffness").text() == ""


def test_load_underside_stiffness_out_of_range_is_refused(inspector: Inspector,
                                                          doc: Document) -> None:
    doc.select(Selection("load", ("Z1", "Pump skid")))
    _enter(inspector.editor("contact_stiffness"), "1 N/m")
    assert doc.project.zone("Z1").loads[0].contact_stiffness is None
    assert doc.undo_stack.count() == 0
    assert "Underside stiffness" in inspector.message and "Allowed" in inspector.message
    assert inspector.editor("contact_stiffness").text() == ""


def test_deck_kind_switches_to_a_steel_plate_and_back(qtbot) -> None:
    # the thickness ranges of a slab and a plate do not overlap: a change of kind takes
    # a typical thickness of the new kind (droprig's own editing rule, no source)
    doc = Document(_roof("SI"))
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("deck", ("L1",)))
    kind = w.editor("kind")
    assert isinstance(kind, QComboBox)
    kind.setCurrentIndex(kind.findData("steel_plate"))
    kind.activated.emit(kind.currentIndex())
    dk = doc.project.level("L1").deck
    assert dk.kind == "steel_plate" and dk.thickness == 0.01
    _enter(w.editor("steel_fy"), "355 MPa")
    assert math.isclose(doc.project.level("L1").deck.steel_fy, 355e6, rel_tol=REL)
    kind = w.editor("kind")
    kind.setCurrentIndex(kind.findData("composite"))
    kind.activated.emit(kind.currentIndex())
    dk = doc.project.level("L1").deck
    assert dk.kind == "composite" and dk.thickness == 0.13

"""Inspector: the permit fields as plain text boxes and a mass-source choice —
model -> widget and widget -> model, undo, and refusals that leave the project
as it was.

References: ISO 8601-1:2019 §5.2.2 / §5.4.2 for the date forms; the Unicode
Standard 15.0 §4.5 (general category Cc) for the refused control character.
"""

from __future__ import annotations

from dataclasses import replace

import pytest
from PySide6.QtWidgets import QComboBox, QLabel, QLineEdit

from droprig.gui.document import Document, Selection
from droprig.gui.inspector import Inspector
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftLoad, LiftPoint, LiftZone, Project, generate_level

pytestmark = pytest.mark.gui


def _roof() -> Project:
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.0, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Mobile crane", level_id="L1", crane=(-3.0, 2.5),
                    r_min=2.0, r_max=9.0,
                    loads=(LiftLoad(name="Pump skid", mass=1500.0, drop_height=0.8),),
                    lift_points=(LiftPoint("pick_up", (-6.0, 1.0), "truck"),
                                 LiftPoint("set_down", (4.0, 2.0))))
    return Project(levels=(level,), lift_zones=(zone,))


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


def test_permit_number_and_window_reach_the_model_and_undo(inspector: Inspector,
                                                           doc: Document) -> None:
    doc.select(Selection("info", ()))
    box = inspector.editor("permit_number")
    assert isinstance(box, QLineEdit) and box.text() == ""
    assert "not recorded" in box.placeholderText()
    _enter(box, "PTW-9")
    _enter(inspector.editor("valid_from"), "2027-01-04 07:00")
    _enter(inspector.editor("valid_to"), "2027-01-04")
    info = doc.project.info
    assert (info.permit_number, info.valid_from, info.valid_to) == (
        "PTW-9", "2027-01-04 07:00", "2027-01-04")
    doc.undo_stack.undo()
    assert doc.project.info.valid_to == ""


@pytest.mark.parametrize("key, text", [("valid_to", "4 Jan 2027"),
                                       ("permit_number", "PTW\x079")])
def test_bad_permit_text_is_refused_and_changes_nothing(inspector: Inspector, doc: Document,
                                                        key: str, text: str) -> None:
    doc.select(Selection("info", ()))
    before = doc.project
    _enter(inspector.editor(key), text)
    assert doc.project is before
    assert doc.undo_stack.count() == 0


def test_window_end_before_start_is_refused(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("info", ()))
    _enter(inspector.editor("valid_from"), "2027-01-04")
    before = doc.project
    _enter(inspector.editor("valid_to"), "2027-01-03")
    assert doc.project is before


def test_crane_fields_and_points(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("zone", ("Z1",)))
    _enter(inspector.editor("crane_description"), "50 t mobile crane")
    _enter(inspector.editor("crane_configuration"), "boom 28 m; outriggers full")
    z = doc.project.zone("Z1")
    assert (z.crane_description, z.crane_configuration) == ("50 t mobile crane",
                                                            "boom 28 m; outriggers full")
    pts = inspector.editor("lift_points")
    assert isinstance(pts, QLabel)
    assert pts.text().startswith("P1 pick-up (-6.000 m, 1.000 m) truck; S1 set-down")


def test_mass_source_choice_both_ways(inspector: Inspector, doc: Document) -> None:
    doc.select(Selection("load", ("Z1", "Pump skid")))
    box = inspector.editor("mass_source")
    assert isinstance(box, QComboBox) and box.currentText() == "not recorded"
    box.setCurrentIndex(box.findData("data_plate"))
    box.activated.emit(box.currentIndex())
    assert doc.project.zone("Z1").loads[0].mass_source == "data_plate"
    # model -> widget: an edit made elsewhere shows in the box
    z = doc.project.zone("Z1")
    doc.edit(replace(doc.project, lift_zones=(replace(z, loads=(replace(
        z.loads[0], mass_source="weighed"),)),)), "mass source")
    assert box.currentData() == "weighed"
    box.setCurrentIndex(box.findData(""))
    box.activated.emit(box.currentIndex())
    assert doc.project.zone("Z1").loads[0].mass_source is None
    assert doc.undo_stack.count() == 3

"""Settings dialog: applied live, one undo step per change, refused values
name the model's range and leave the project unchanged.

The model's ranges and defaults are those of :class:`droprig.model.Settings`
(φ in [0.5, 1.0], DIF in [1, 2], rotation limit 0.1° to 15°, NAVFAC DM-2.08
θ = 2° default). 1 ft = 0.3048 m exactly (NIST SP 811, 2008 ed., B.8).
"""

from __future__ import annotations

import math

import pytest
from PySide6.QtCore import Qt

from droprig.gui.document import Document
from droprig.gui.settings_dialog import SettingsDialog
from droprig.model import Project

pytestmark = pytest.mark.gui

FT = 0.3048  # m (NIST SP 811 B.8)
REL = 1e-9


@pytest.fixture
def doc(qtbot) -> Document:  # qtbot: the QApplication
    return Document(Project())


@pytest.fixture
def dialog(qtbot, doc: Document) -> SettingsDialog:
    d = SettingsDialog(doc)
    qtbot.addWidget(d)
    return d


def _enter(dialog: SettingsDialog, key: str, text: str) -> None:
    e = dialog.edits[key]
    e.setText(text)
    e.editingFinished.emit()


def test_model_defaults_are_shown(dialog: SettingsDialog) -> None:
    assert dialog.edits["resistance_factor"].text() == "1"
    assert dialog.edits["rotation_limit"].text() == "2 deg"  # NAVFAC DM-2.08 θ = 2°
    assert dialog.edits["grid_resolution"].text() == "0.500 m"
    assert dialog.units.currentData() == "SI"
    assert dialog.basis.currentData() == "en1993"


@pytest.mark.parametrize(("key", "text", "attr", "expected"), [
    ("resistance_factor", "0.9", "resistance_factor", 0.9),
    ("dynamic_increase_factor", "1.2", "dynamic_increase_factor", 1.2),
    ("deflection_limit_ratio", "360", "deflection_limit_ratio", 360.0),
    ("ductility_limit", "3", "ductility_limit", 3.0),
    ("rotation_limit", "4 deg", "rotation_limit", math.radians(4.0)),
    ("grid_resolution", "250 mm", "grid_resolution", 0.25),
])
def test_each_value_applies_live_and_undoes(dialog: SettingsDialog, doc: Document, key: str,
                                            text: str, attr: str, expected: float) -> None:
    before = doc.project
    shown = dialog.edits[key].text()
    _enter(dialog, key, text)
    assert math.isclose(getattr(doc.project.settings, attr), expected, rel_tol=REL)
    assert doc.undo_stack.count() == 1
    doc.undo_stack.undo()
    assert doc.project is before
    assert dialog.edits[key].text() == shown


@pytest.mark.parametrize(("key", "text", "fragment"), [
    ("resistance_factor", "0.3", "≥ 0.5"),
    ("dynamic_increase_factor", "2.5", "≤ 2"),
    ("rotation_limit", "30 deg", "≤ 15.00 deg"),
    ("grid_resolution", "10 m", "≤ 5.000 m"),
    ("grid_resolution", "fine", "as a length"),
])
def test_out_of_range_values_are_refused(dialog: SettingsDialog, doc: Document, key: str,
                                         text: str, fragment: str) -> None:
    before = doc.project
    shown = dialog.edits[key].text()
    _enter(dialog, key, text)
    assert doc.project is before
    assert doc.undo_stack.count() == 0
    assert fragment.lower() in dialog.message.text().lower()
    assert "Nothing was changed" in dialog.message.text()
    assert dialog.edits[key].text() == shown


def test_unit_switch_redisplays_and_is_undoable(dialog: SettingsDialog, doc: Document) -> None:
    dialog.units.setCurrentIndex(dialog.units.findData("US"))
    dialog.units.activated.emit(dialog.units.currentIndex())
    assert doc.project.settings.unit_system == "US"
    assert dialog.edits["grid_resolution"].text() == f"{0.5 / FT:.2f} ft"
    _enter(dialog, "grid_resolution", "2")  # a bare number is in feet now
    assert math.isclose(doc.project.settings.grid_resolution, 2 * FT, rel_tol=REL)
    doc.undo_stack.undo()
    doc.undo_stack.undo()
    assert doc.project.settings.unit_system == "SI"
    assert dialog.units.currentData() == "SI"
    assert dialog.edits["grid_resolution"].text() == "0.500 m"


def test_design_basis_and_switches(dialog: SettingsDialog, doc: Document) -> None:
    dialog.basis.setCurrentIndex(dialog.basis.findData("aisc360"))
    dialog.basis.activated.emit(dialog.basis.currentIndex())
    dialog.member_mass.setChecked(False)
    assert doc.project.settings.design_basis == "aisc360"
    assert doc.project.settings.include_member_mass is False
    doc.undo_stack.undo()
    assert dialog.member_mass.isChecked()


@pytest.mark.parametrize(("box", "key"), [("amplification", "dynamic_amplification"),
                                          ("tilted", "tilted_landing")])
def test_amplification_and_tilted_landing_switch_and_undo(
        dialog: SettingsDialog, doc: Document, box: str, key: str) -> None:
    # the verification and the annex tell the engineer to "switch amplification on";
    # before, only the project file could (common practice, no source: a setting a
    # text names is one the window can change)
    widget = getattr(dialog, box)
    before = getattr(doc.project.settings, key)
    assert widget.isChecked() is before
    widget.setChecked(not before)
    assert getattr(doc.project.settings, key) is (not before)
    doc.undo_stack.undo()
    assert getattr(doc.project.settings, key) is before
    assert widget.isChecked() is before


def test_design_tilt_follows_the_tilted_landing_and_undoes(dialog: SettingsDialog,
                                                           doc: Document) -> None:
    # the design tilt (default 5°: a load hung for a lift is levelled within a few
    # degrees; common practice, no source) is read only with the tilted landing
    # checked, so it is editable only then; an edit is one undo step like the others,
    # and a tilt past 15° is refused with the range in degrees (the model's range)
    e = dialog.edits["design_tilt"]
    assert e.text() == "5 deg"
    assert not e.isEnabled()
    dialog.tilted.setChecked(True)
    assert e.isEnabled()
    # keyboard reachable: in the dialog's focus chain, after the tilted-landing box
    assert e.focusPolicy() & Qt.FocusPolicy.TabFocus
    assert dialog.tilt_label.buddy() is e
    chain, w = [], dialog.tilted.nextInFocusChain()
    while w is not dialog.tilted and len(chain) < 50:
        chain.append(w)
        w = w.nextInFocusChain()
    assert e in chain
    with_tilted = doc.project
    _enter(dialog, "design_tilt", "2 deg")
    assert math.isclose(doc.project.settings.design_tilt, math.radians(2.0), rel_tol=REL)
    assert doc.undo_stack.count() == 2
    _enter(dialog, "design_tilt", "0")  # no tilt: the edge strike without the far edge's
    assert doc.project.settings.design_tilt == 0.0
    _enter(dialog, "design_tilt", "20 deg")
    assert "≤ 15.00 deg" in dialog.message.text()
    assert "Nothing was changed" in dialog.message.text()
    assert doc.project.settings.design_tilt == 0.0
    assert e.text() == "0 deg"
    doc.undo_stack.undo()
    doc.undo_stack.undo()
    assert doc.project is with_tilted
    assert e.text() == "5 deg"
    doc.undo_stack.undo()  # the tilted landing off again: the tilt greyed out
    assert not e.isEnabled()

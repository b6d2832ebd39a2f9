"""Analysis settings dialog: applied live, each change one undo step.

Every field commits when it is left (or Return is pressed); the new
:class:`~droprig.model.Settings` is built with :func:`dataclasses.replace`, so
the model's ranges apply. A refused value shows a message naming the allowed
range in the user's units, and the project is unchanged.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import replace
from typing import Any

from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QLabel,
    QLineEdit,
    QVBoxLayout,
    QWidget,
)

from droprig import units
from droprig.gui import edits as ed
from droprig.gui.document import Document
from droprig.gui.inspector import describe_refusal
from droprig.model import ModelError, Project, Settings

# (key, label, quantity, help). quantity "ratio" is a bare number.
_NUMBERS: tuple[tuple[str, str, str, str], ...] = (
    ("resistance_factor", "Resistance factor φ", "dimensionless",
     "Multiplies every resistance. 1.0 is usual for an accidental situation."),
    ("dynamic_increase_factor", "Dynamic increase factor on yield", "dimensionless",
     "Multiplies the yield strength for the strain rate of the impact (1.0 = none)."),
    ("deflection_limit_ratio", "Deflection limit, span /", "dimensionless",
     "Peak deflection is reported against span / N (information only)."),
    ("ductility_limit", "Ductility limit μ", "dimensionless",
     "Largest plastic / yield deflection accepted for a 'yields, within limits' outcome."),
    ("rotation_limit", "Support rotation limit θ", "angle",
     "Largest plastic support rotation accepted."),
    ("grid_resolution", "Drop-point spacing", "length",
     "Spacing of the drop-point grid over each lift zone. Smaller is finer and slower; "
     "the governing points on every member are added whatever the spacing."),
)

_TILT: tuple[str, str, str, str] = (
    "design_tilt", "Design tilt of the tilted landing", "angle",
    "The tilted landing is checked for any tilt up to this: the tilt the lift plan allows "
    "the load to hang out of level (0 to 15 deg; default 5 deg). Read only with the tilted "
    "landing checked.")

_BASES = (("en1993", "EN 1993-1-1 (Eurocode 3)"), ("aisc360", "AISC 360-16"))
_SYSTEMS = (("SI", "SI — m, kN, kg, MPa"), ("US", "US customary — ft, kip, lb, ksi"))


def basis_note(unit_system: str, design_basis: str) -> str:
    """A reminder when the units are not the ones the design basis is usually
    used with: units change only how values are shown and typed, never which
    code's checks are made. Empty when they go together."""
    usual = {"en1993": "SI", "aisc360": "US"}
    if usual.get(design_basis, unit_system) == unit_system:
        return ""
    name = dict(_BASES).get(design_basis, design_basis)
    return (f"Units change only how values are shown and typed: the checks still "
            f"follow {name}. Choose the design basis your local code requires.")


class SettingsDialog(QDialog):
    """Edit ``document.project.settings``. Takes the document; holds no copy."""

    def __init__(self, document: Document, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Analysis settings")
        self.setModal(False)
        self._doc = document
        self.edits: dict[str, QLineEdit] = {}

        self.units = QComboBox()
        for v, lab in _SYSTEMS:
            self.units.addItem(lab, v)
        self.units.activated.connect(
            lambda _i: self._commit("unit_system", self.units.currentData(), "Units"))
        self.basis = QComboBox()
        for v, lab in _BASES:
            self.basis.addItem(lab, v)
        self.basis.activated.connect(
            lambda _i: self._commit("design_basis", self.basis.currentData(), "Design basis"))

        form = QFormLayout()
        form.addRow("Units", self.units)
        form.addRow("Design basis", self.basis)
        self.basis_note = QLabel()
        self.basis_note.setObjectName("basisNote")
        self.basis_note.setWordWrap(True)
        self.basis_note.setStyleSheet("color: #555;")
        form.addRow(self.basis_note)
        for key, label, quantity, tip in _NUMBERS:
            e = QLineEdit()
            e.setToolTip(tip)
            e.editingFinished.connect(self._make_commit(key, label, quantity))
            lab = QLabel(label)
            lab.setToolTip(tip)
            form.addRow(lab, e)
            self.edits[key] = e
        self.member_mass = QCheckBox("Include the struck members' own mass (inertia)")
        self.member_mass.toggled.connect(
            lambda on: self._commit("include_member_mass", bool(on), "Member mass"))
        self.existing = QCheckBox("Add the loads already on the floor (dead + live left)")
        self.existing.toggled.connect(
            lambda on: self._commit("include_existing_loads", bool(on), "Existing loads"))
        # the two switches the verification and the annex name ("switch amplification
        # on"): before, only the project file could set them
        self.amplification = QCheckBox("Dynamic amplification (time-history bounds)")
        self.amplification.setToolTip(
            "The checks take the larger of the energy method and the time-history-calibrated "
            "bounds. Off, the energy method reads low for loads light against the framing "
            "they strike (see the time-history verification); on, its bounds can lie far "
            "above the structure's own response for light items, and the analysis is slower.")
        self.amplification.toggled.connect(
            lambda on: self._commit("dynamic_amplification", bool(on),
                                    "Dynamic amplification"))
        self.tilted = QCheckBox("Also check a landing tilted on one edge")
        self.tilted.setToolTip(
            "Every drop point is also checked for the load landing on one edge with its "
            "whole mass through a narrow edge strip; the worse of the two governs.")
        self.tilted.toggled.connect(
            lambda on: self._commit("tilted_landing", bool(on), "Tilted landing"))
        form.addRow(self.member_mass)
        form.addRow(self.existing)
        form.addRow(self.amplification)
        form.addRow(self.tilted)
        key, label, quantity, tip = _TILT
        e = QLineEdit()
        e.setToolTip(tip)
        e.editingFinished.connect(self._make_commit(key, label, quantity))
        self.tilt_label = QLabel(label)
        self.tilt_label.setToolTip(tip)
        self.tilt_label.setBuddy(e)
        form.addRow(self.tilt_label, e)
        self.edits[key] = e

        self.message = QLabel()
        self.message.setObjectName("settingsMessage")
        self.message.setWordWrap(True)
        self.message.setStyleSheet("background: #FBE9EC; color: #6B0F24; "
                                   "border: 1px solid #C98292; padding: 4px;")
        self.message.hide()
        note = QLabel("Changes apply at once and re-run the analysis; Edit › Undo reverts "
                      "them. Defaults follow the sources named in the user guide.")
        note.setWordWrap(True)
        note.setStyleSheet("color: #555;")
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close)
        buttons.rejected.connect(self.close)
        buttons.accepted.connect(self.close)

        lay = QVBoxLayout(self)
        lay.addLayout(form)
        lay.addWidget(self.message)
        lay.addWidget(note)
        lay.addWidget(buttons)
        self.setMinimumWidth(460)

        document.project_changed.connect(self._on_project_changed)
        self._on_project_changed(document.project)

    # -------------------------------------------------------------- model -> widgets

    def _on_project_changed(self, project: Project) -> None:
        s = project.settings
        sys_ = s.unit_system
        self.units.setCurrentIndex(self.units.findData(s.unit_system))
        self.basis.setCurrentIndex(self.basis.findData(s.design_basis))
        note = basis_note(s.unit_system, s.design_basis)
        self.basis_note.setVisible(bool(note))
        if note != self.basis_note.text():
            self.basis_note.setText(note)
            self.layout().activate()
            self.resize(self.width(), self.sizeHint().height())  # room for the note
        for key, _label, quantity, _tip in (*_NUMBERS, _TILT):
            e = self.edits[key]
            text = self._text(getattr(s, key), quantity, sys_)
            if e.text() != text:
                e.setText(text)
        for box, key in ((self.member_mass, "include_member_mass"),
                         (self.existing, "include_existing_loads"),
                         (self.amplification, "dynamic_amplification"),
                         (self.tilted, "tilted_landing")):
            box.blockSignals(True)
            box.setChecked(getattr(s, key))
            box.blockSignals(False)
        # the design tilt is read only with the tilted landing checked
        self.edits[_TILT[0]].setEnabled(s.tilted_landing)
        self.tilt_label.setEnabled(s.tilted_landing)

    @staticmethod
    def _text(value: float, quantity: str, system: units.UnitSystem) -> str:
        if quantity == "dimensionless":
            return f"{value:g}"
        if quantity == "angle":
            return f"{math.degrees(value):g} deg"
        return units.fmt(value, quantity, system).replace(",", "")

    # -------------------------------------------------------------- widgets -> model

    def _make_commit(self, key: str, label: str, quantity: str) -> Callable[[], None]:
        def commit() -> None:
            e = self.edits[key]
            s = self._doc.project.settings
            sys_ = s.unit_system
            if e.text().strip() == self._text(getattr(s, key), quantity, sys_):
                return
            try:
                value = units.parse(e.text(), quantity, sys_, field=label)
            except units.UnitError as exc:
                self._refuse(describe_refusal(exc, label, sys_, quantity))
                return
            self._commit(key, value, label, quantity)
        return commit

    def _commit(self, key: str, value: Any, label: str,
                quantity: str | None = None) -> None:
        p = self._doc.project
        try:
            new: Settings = replace(p.settings, **{key: value})
            after = ed.with_settings(p, new)  # a work budget may refuse the whole project
        except ModelError as exc:
            self._refuse(describe_refusal(exc, label, p.settings.unit_system, quantity))
            return
        self.message.hide()
        self.message.clear()
        self._doc.edit(after, f"Settings: {label.lower()}")

    def _refuse(self, text: str) -> None:
        self.message.setText(text)
        self.message.show()
        self._on_project_changed(self._doc.project)



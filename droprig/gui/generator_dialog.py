"""Framing generator dialog: a regular level from a few numbers.

Spacing syntax (one axis per field; the same in SI and US units):

* a comma- or semicolon-separated list of bay widths, west to east (x) or
  south to north (y): ``7.5 m, 7.5 m, 9 m``;
* ``n@width`` repeats a width n times: ``3@7.5 m, 9 m`` is the same as above;
  ``n×width`` and ``n*width`` are accepted too;
* a bare number takes the display unit of the project (m, or ft in US units):
  ``3@25, 30``; any length unit pint understands may be written
  (``24 ft``, ``7500 mm``). No thousands separators (the comma separates bays).
* each width 0.5 m to 60 m, at most 59 bays each way (60 grid lines).

Labels: leave empty for automatic labels (numbers along x, letters along y, or
the style chosen beside the field) or give one label per grid line,
comma-separated (``A, B, C`` …), at most 8 characters each, all different.

Every field is parsed with :func:`droprig.units.parse` in the project's unit
system; a field that cannot be used shows why underneath, naming the allowed
range in the same units, and OK stays disabled until every field is usable.
"""

from __future__ import annotations

import itertools
import math
import re
from collections.abc import Callable
from dataclasses import dataclass

from PySide6.QtCore import QStringListModel, Qt
from PySide6.QtGui import QResizeEvent
from PySide6.QtWidgets import (
    QComboBox,
    QCompleter,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QVBoxLayout,
    QWidget,
)

from droprig import units
from droprig.io import sections as lib
from droprig.model import (
    STEEL_DECK_KINDS,
    Deck,
    Level,
    ModelError,
    default_labels,
    generate_level,
)
from droprig.model.sections import Grade, Section
from droprig.texts import CAUTION

SPACING_RANGE = (0.5, 60.0)
"""Bay width limits, m (ColumnGrid and generate_level validation)."""
MAX_BAYS = 59
"""At most 60 grid lines each way (ColumnGrid validation)."""
BEAM_SPACING_RANGE = (0.5, 10.0)
"""m (generate_level validation)."""
THICKNESS_RANGE = (0.05, 0.6)
"""Deck thickness, m (Deck validation)."""
STEEL_THICKNESS_RANGE = (0.003, 0.1)
"""Steel plate thickness or grating bar depth, m (Deck validation narrows it per kind)."""
PRESSURE_RANGE = (0.0, 50e3)
"""Superimposed dead and live-in-place loads, Pa (Level validation)."""
ELEVATION_RANGE = (-500.0, 1000.0)
"""m (Level validation)."""
MAX_LABEL = 8

_ITEM = re.compile(r"^\s*(?:(\d+)\s*[@×x*]\s*)?(.+?)\s*$")


class FieldError(ValueError):
    """A field's text cannot be used; the message is shown under the field."""


PSF = 47.88025898033584
"""Pa per lbf/ft² (NIST SP 811, App. B.8: 1 lbf/ft² = 47.880 26 Pa)."""
_PSF_WORD = re.compile(r"\bpsf\b")


def fmt_value(value: float, quantity: str, system: str) -> str:
    """:func:`droprig.units.fmt`, except that US pressures are written in psf
    here: the shared unit registry has no ``psf`` unit (reported to the owner of
    droprig/units.py); this keeps the dialog usable in US units meanwhile."""
    try:
        return units.fmt(value, quantity, system)  # type: ignore[arg-type]
    except Exception:
        if quantity == "pressure" and system == "US":
            return f"{value / PSF:,.1f} psf"
        raise


def _parse(text: str, quantity: str, system: str, field: str) -> float:
    if quantity == "pressure":
        t = _PSF_WORD.sub("lbf/ft**2", text.strip())
        try:
            float(t)
            bare = True
        except ValueError:
            bare = False
        if bare and system == "US":
            t += " lbf/ft**2"
        text = t
    return units.parse(text, quantity, system, field=field)  # type: ignore[arg-type]


def _range_text(lo: float, hi: float, quantity: str, system: str) -> str:
    return f"{fmt_value(lo, quantity, system)} to {fmt_value(hi, quantity, system)}"


def parse_quantity(text: str, quantity: str, system: str, lo: float, hi: float,
                   field: str) -> float:
    """User text -> SI float within [lo, hi] or FieldError naming the range."""
    try:
        v = _parse(text, quantity, system, field)
    except units.UnitError as exc:
        raise FieldError(str(exc)) from None
    if not lo <= v <= hi:
        raise FieldError(f"{field}: {fmt_value(v, quantity, system)} is outside the "
                         f"allowed range {_range_text(lo, hi, quantity, system)}")
    return v


def parse_spacings(text: str, system: str = "SI", field: str = "spacings"
                   ) -> tuple[float, ...]:
    """Parse the spacing syntax of the module docstring -> bay widths in m."""
    if not text or not text.strip():
        raise FieldError(f"{field}: enter bay widths, e.g. '3@7.5 m, 9 m'")
    out: list[float] = []
    for raw in re.split(r"[;,]", text):
        if not raw.strip():
            raise FieldError(f"{field}: an empty item between separators in {text!r}")
        m = _ITEM.match(raw)
        if m is None:  # pragma: no cover - the pattern matches any non-empty text
            raise FieldError(f"{field}: cannot read {raw.strip()!r}")
        count = int(m.group(1)) if m.group(1) else 1
        if count < 1 or count > MAX_BAYS:
            raise FieldError(f"{field}: repeat count {count} is outside 1 to {MAX_BAYS}")
        width = parse_quantity(m.group(2), "length", system, *SPACING_RANGE,
                               field=f"{field} '{raw.strip()}'")
        out.extend([width] * count)
        if len(out) > MAX_BAYS:
            raise FieldError(f"{field}: {len(out)} bays; at most {MAX_BAYS} "
                             f"({MAX_BAYS + 1} grid lines)")
    return tuple(out)


def format_spacings(widths: tuple[float, ...], system: str = "SI") -> str:
    """Bay widths -> spacing text with runs collapsed (``3@7.5 m, 9 m``)."""
    parts: list[str] = []
    i = 0
    while i < len(widths):
        j = i
        while j + 1 < len(widths) and math.isclose(widths[j + 1], widths[i], abs_tol=1e-9):
            j += 1
        w = units.fmt(widths[i], "length", system,  # type: ignore[arg-type]
                      decimals=4).replace(",", "")
        num, unit = w.split(" ", 1)
        num = num.rstrip("0").rstrip(".") if "." in num else num
        w = f"{num} {unit}"
        parts.append(f"{j - i + 1}@{w}" if j > i else w)
        i = j + 1
    return ", ".join(parts)


def parse_labels(text: str, n: int, auto: tuple[str, ...], field: str) -> tuple[str, ...]:
    """Empty -> ``auto``; otherwise exactly ``n`` comma-separated unique labels."""
    if not text.strip():
        return auto
    labels = tuple(t.strip() for t in re.split(r"[;,]", text))
    if len(labels) != n:
        raise FieldError(f"{field}: {len(labels)} labels for {n} grid lines; give one per "
                         "line or leave empty for automatic labels")
    for lab in labels:
        if not lab:
            raise FieldError(f"{field}: an empty label")
        if len(lab) > MAX_LABEL:
            raise FieldError(f"{field}: {lab!r} is longer than {MAX_LABEL} characters")
    dup = sorted({lab for lab in labels if labels.count(lab) > 1})
    if dup:
        raise FieldError(f"{field}: {dup[0]!r} is used twice; labels must differ")
    return labels


@dataclass
class _Field:
    widget: QWidget
    error: QLabel
    read: Callable[[], object]


class GeneratorDialog(QDialog):
    """Build a regular level: spacings, labels, girder direction, beam spacing,
    sections and grades, deck and existing loads.

    ``level()`` returns the :func:`droprig.model.generate_level` output for the
    current inputs, or None while any input is unusable (OK is disabled then).
    """

    def __init__(self, parent: QWidget | None = None, *, unit_system: str = "SI",
                 level_id: str = "L1", level_name: str = "Level 1",
                 existing_level_ids: tuple[str, ...] = ()) -> None:
        super().__init__(parent)
        self.setWindowTitle("Generate floor framing")
        self.setMinimumWidth(860)
        self.system = unit_system if unit_system in ("SI", "US") else "SI"
        self._existing = tuple(existing_level_ids)
        self._level: Level | None = None
        self._deck_base = Deck()
        """The deck being edited (a steel deck's grade and bars are kept)."""
        self._fields: dict[str, _Field] = {}
        us = self.system == "US"
        s = self.system

        def length(v: float, q: str = "length") -> str:
            return units.fmt(v, q, s).replace(",", "")  # type: ignore[arg-type]

        # ---- level
        self.level_id = QLineEdit(level_id)
        self.level_name = QLineEdit(level_name)
        self.elevation = QLineEdit(length(0.0))
        # ---- grid
        self.x_spacings = QLineEdit("3@25 ft, 30 ft" if us else "3@7.5 m, 9 m")
        self.y_spacings = QLineEdit("2@25 ft" if us else "6 m, 8 m")
        for w in (self.x_spacings, self.y_spacings):
            w.setToolTip("Bay widths, e.g. '3@7.5 m, 9 m' (n@width repeats; a bare number "
                         f"is in {units.display_unit('length', s)})")  # type: ignore[arg-type]
        self.x_labels = QLineEdit()
        self.y_labels = QLineEdit()
        self.x_label_style = QComboBox()
        self.y_label_style = QComboBox()
        for combo, default in ((self.x_label_style, 0), (self.y_label_style, 1)):
            combo.addItem("1, 2, 3 …", "numbers")
            combo.addItem("A, B, C …", "letters")
            combo.setCurrentIndex(default)
        self.x_labels.setPlaceholderText("automatic")
        self.y_labels.setPlaceholderText("automatic")
        # ---- framing
        self.girder_direction = QComboBox()
        self.girder_direction.addItem("Girders along x (east–west), beams along y", "x")
        self.girder_direction.addItem("Girders along y (north–south), beams along x", "y")
        self.beam_spacing = QLineEdit("8 ft" if us else "2.5 m")
        self.girder_section = QLineEdit("W21X44" if us else "IPE 450")
        self.beam_section = QLineEdit("W16X26" if us else "IPE 300")
        for w in (self.girder_section, self.beam_section):
            model = QStringListModel(lib.search_sections(w.text(), 30), w)
            comp = QCompleter(model, w)
            comp.setCaseSensitivity(Qt.CaseSensitivity.CaseInsensitive)
            comp.setFilterMode(Qt.MatchFlag.MatchContains)
            w.setCompleter(comp)
            w.textEdited.connect(lambda text, m=model: m.setStringList(
                lib.search_sections(text, 30)))
            w.setToolTip("Type part of a name: 'W16', 'IPE 3', 'HE 200' …")
        self.girder_grade = QComboBox()
        self.beam_grade = QComboBox()
        for combo in (self.girder_grade, self.beam_grade):
            combo.addItems(lib.list_grades())
            combo.setCurrentText("ASTM A992" if us else "S355")
        # ---- deck
        self.deck_kind = QComboBox()
        self.deck_kind.addItem("Composite deck (slab on profiled sheet)", "composite")
        self.deck_kind.addItem("Solid slab", "solid_slab")
        self.deck_kind.addItem("Steel plate (thickness = plate)", "steel_plate")
        self.deck_kind.addItem("Steel grating (thickness = bar depth)", "grating")
        self.deck_thickness = QLineEdit(length(0.13, "small_length"))
        self.concrete = QComboBox()
        self.concrete.addItems(lib.list_concretes())
        self.concrete.setCurrentText("4000 psi" if us else "C30/37")
        # ---- existing loads
        self.superimposed_dead = QLineEdit(fmt_value(1000.0, "pressure", s))
        self.live_in_place = QLineEdit(fmt_value(0.0, "pressure", s))

        self.summary = QLabel()
        self.summary.setWordWrap(True)
        self.general_error = self._error_label()
        caution = QLabel(CAUTION)
        caution.setWordWrap(True)
        caution.setStyleSheet("color:#3D2800;background:#FFF6D6;padding:4px")
        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok
                                        | QDialogButtonBox.StandardButton.Cancel)
        self.buttons.button(QDialogButtonBox.StandardButton.Ok).setText("Generate")
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)

        # ---- layout
        lay = QVBoxLayout(self)
        groups = [
            ("Level", [("Level id", "level_id", self.level_id, None),
                       ("Name", "level_name", self.level_name, None),
                       ("Top of deck elevation", "elevation", self.elevation, None)]),
            ("Column grid", [("Bays along x", "x_spacings", self.x_spacings, None),
                             ("Bays along y", "y_spacings", self.y_spacings, None),
                             ("Labels of x-lines", "x_labels", self.x_labels,
                              self.x_label_style),
                             ("Labels of y-lines", "y_labels", self.y_labels,
                              self.y_label_style)]),
            ("Framing", [("Girder direction", "girder_direction", self.girder_direction, None),
                         ("Beam spacing (at most)", "beam_spacing", self.beam_spacing, None),
                         ("Girder section", "girder_section", self.girder_section,
                          self.girder_grade),
                         ("Beam section", "beam_section", self.beam_section, self.beam_grade)]),
            ("Deck", [("Kind", "deck_kind", self.deck_kind, None),
                      ("Thickness", "deck_thickness", self.deck_thickness, None),
                      ("Concrete", "concrete", self.concrete, None)]),
            ("Loads already on the floor", [
                ("Superimposed dead", "superimposed_dead", self.superimposed_dead, None),
                ("Live load left in place", "live_in_place", self.live_in_place, None)]),
        ]
        readers = self._readers()
        columns = QHBoxLayout()
        left, right = QVBoxLayout(), QVBoxLayout()
        columns.addLayout(left, 1)
        columns.addLayout(right, 1)
        lay.addLayout(columns)
        for title, rows in groups:
            box = QGroupBox(title)
            form = QFormLayout(box)
            form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
            if title == "Column grid":
                hint = QLabel("Bay widths west→east and south→north, e.g. "
                              "<b>3@7.5 m, 9 m</b> (n@width repeats a width; a bare "
                              "number is in " + units.display_unit("length", s)  # type: ignore[arg-type]
                              + "). Labels: leave empty for automatic ones, or give one "
                              "per grid line: <b>A, B, C</b>.")
                hint.setWordWrap(True)
                hint.setStyleSheet("color:#555")
                form.addRow(hint)
            for label, key, widget, extra in rows:
                err = self._error_label()
                cell = QWidget()
                v = QVBoxLayout(cell)
                v.setContentsMargins(0, 0, 0, 0)
                v.setSpacing(1)
                if extra is not None:
                    h = QHBoxLayout()
                    h.addWidget(widget, 3)
                    h.addWidget(extra, 1)
                    v.addLayout(h)
                else:
                    v.addWidget(widget)
                v.addWidget(err)
                widget.setMinimumHeight(widget.sizeHint().height())
                if extra is not None:
                    extra.setMinimumHeight(extra.sizeHint().height())
                form.addRow(label, cell)
                self._fields[key] = _Field(widget, err, readers[key])
            (left if title in ("Level", "Column grid") else right).addWidget(box)
        left.addStretch(1)
        right.addStretch(1)
        lay.addWidget(self.summary)
        lay.addWidget(self.general_error)
        lay.addWidget(caution)
        lay.addWidget(self.buttons)

        for f in self._fields.values():
            w = f.widget
            if isinstance(w, QLineEdit):
                w.textChanged.connect(self._revalidate)
            elif isinstance(w, QComboBox):
                w.currentIndexChanged.connect(self._revalidate)
        for combo in (self.x_label_style, self.y_label_style, self.girder_grade,
                      self.beam_grade):
            combo.currentIndexChanged.connect(self._revalidate)
        self._revalidate()

    def resizeEvent(self, event: QResizeEvent) -> None:
        """Never shorter than the layout needs at this width: the wrapped hint
        and caution made the dialog's least height too small, and under X the
        framing rows were drawn 1–3 px short (boxes cut at the bottom)."""
        super().resizeEvent(event)
        lay = self.layout()
        need = lay.totalHeightForWidth(self.width()) if lay.hasHeightForWidth() else \
            lay.totalMinimumSize().height()
        if need > self.minimumHeight():
            self.setMinimumHeight(need)

    # ------------------------------------------------------------ parsing

    @staticmethod
    def _error_label() -> QLabel:
        lab = QLabel()
        lab.setWordWrap(True)
        lab.setStyleSheet("color:#A4003A")
        lab.setVisible(False)
        return lab

    def _readers(self) -> dict[str, Callable[[], object]]:
        s = self.system

        def level_id() -> str:
            t = self.level_id.text().strip()
            if not t:
                raise FieldError("Level id: enter a short id, e.g. L2")
            if len(t) > 32:
                raise FieldError("Level id: at most 32 characters")
            if t in self._existing:
                raise FieldError(f"Level id: {t!r} is already used by another level")
            return t

        def section(edit: QLineEdit, name: str) -> Callable[[], Section]:
            def read() -> Section:
                try:
                    return lib.get_section(edit.text())
                except lib.SectionNotFound as exc:
                    hint = ", ".join(exc.suggestions) if hasattr(exc, "suggestions") else ""
                    raise FieldError(f"{name}: {edit.text().strip()!r} is not in the section "
                                     "library" + (f"; did you mean {hint}?" if hint else "")
                                     ) from None
            return read

        def grade(combo: QComboBox) -> Callable[[], Grade]:
            return lambda: lib.get_grade(combo.currentText())

        return {
            "level_id": level_id,
            "level_name": lambda: self.level_name.text().strip() or self.level_id.text(),
            "elevation": lambda: parse_quantity(self.elevation.text(), "length", s,
                                                *ELEVATION_RANGE, field="Elevation"),
            "x_spacings": lambda: parse_spacings(self.x_spacings.text(), s, "Bays along x"),
            "y_spacings": lambda: parse_spacings(self.y_spacings.text(), s, "Bays along y"),
            "x_labels": lambda: None,  # read after the spacings (needs the line count)
            "y_labels": lambda: None,
            "girder_direction": lambda: self.girder_direction.currentData(),
            "beam_spacing": lambda: parse_quantity(self.beam_spacing.text(), "length", s,
                                                   *BEAM_SPACING_RANGE, field="Beam spacing"),
            "girder_section": section(self.girder_section, "Girder section"),
            "beam_section": section(self.beam_section, "Beam section"),
            "deck_kind": lambda: self.deck_kind.currentData(),
            "deck_thickness": lambda: parse_quantity(
                self.deck_thickness.text(), "small_length", s,
                *(STEEL_THICKNESS_RANGE if self.deck_kind.currentData() in STEEL_DECK_KINDS
                  else THICKNESS_RANGE), field="Deck thickness"),
            "concrete": lambda: lib.get_concrete(self.concrete.currentText()),
            "superimposed_dead": lambda: parse_quantity(
                self.superimposed_dead.text(), "pressure", s, *PRESSURE_RANGE,
                field="Superimposed dead"),
            "live_in_place": lambda: parse_quantity(
                self.live_in_place.text(), "pressure", s, *PRESSURE_RANGE,
                field="Live load left in place"),
        }

    def _revalidate(self) -> None:
        values: dict[str, object] = {}
        ok = True
        for key, f in self._fields.items():
            try:
                values[key] = f.read()
                self._show_error(key, "")
            except (FieldError, ValueError) as exc:
                ok = False
                self._show_error(key, str(exc))
        for axis in ("x", "y"):
            sp = values.get(f"{axis}_spacings")
            if sp is None:
                continue
            n = len(sp) + 1  # type: ignore[arg-type]
            combo = self.x_label_style if axis == "x" else self.y_label_style
            try:
                values[f"{axis}_labels"] = parse_labels(
                    getattr(self, f"{axis}_labels").text(), n,
                    default_labels(n, combo.currentData()), f"Labels of {axis}-lines")
                self._show_error(f"{axis}_labels", "")
            except FieldError as exc:
                ok = False
                self._show_error(f"{axis}_labels", str(exc))
        self._level = None
        self.general_error.setText("")
        self.general_error.setVisible(False)
        if ok:
            try:
                self._level = self._build(values)
            except ModelError as exc:
                ok = False
                self.general_error.setText(str(exc))
                self.general_error.setVisible(True)
        self.buttons.button(QDialogButtonBox.StandardButton.Ok).setEnabled(ok)
        self._update_summary()

    def _build(self, v: dict[str, object]) -> Level:
        b = self._deck_base  # a steel deck keeps its grade and bars
        deck = Deck(kind=v["deck_kind"], thickness=v["deck_thickness"],  # type: ignore[arg-type]
                    concrete=v["concrete"], steel_fy=b.steel_fy,  # type: ignore[arg-type]
                    bar_thickness=b.bar_thickness, bar_pitch=b.bar_pitch)
        return generate_level(
            level_id=v["level_id"],  # type: ignore[arg-type]
            name=v["level_name"],  # type: ignore[arg-type]
            elevation=v["elevation"],  # type: ignore[arg-type]
            x_spacings=v["x_spacings"],  # type: ignore[arg-type]
            y_spacings=v["y_spacings"],  # type: ignore[arg-type]
            girder_direction=v["girder_direction"],  # type: ignore[arg-type]
            beam_spacing=v["beam_spacing"],  # type: ignore[arg-type]
            girder_section=v["girder_section"],  # type: ignore[arg-type]
            beam_section=v["beam_section"],  # type: ignore[arg-type]
            girder_grade=lib.get_grade(self.girder_grade.currentText()),
            beam_grade=lib.get_grade(self.beam_grade.currentText()),
            deck=deck,
            superimposed_dead=v["superimposed_dead"],  # type: ignore[arg-type]
            live_in_place=v["live_in_place"],  # type: ignore[arg-type]
            x_labels=v["x_labels"],  # type: ignore[arg-type]
            y_labels=v["y_labels"],  # type: ignore[arg-type]
        )

    def _show_error(self, key: str, text: str) -> None:
        f = self._fields[key]
        f.error.setText(text)
        f.error.setVisible(bool(text))
        if isinstance(f.widget, QLineEdit):
            f.widget.setStyleSheet("border:1px solid #A4003A" if text else "")
            if f.widget.property("help") is None:
                f.widget.setProperty("help", f.widget.toolTip())
            f.widget.setToolTip(text or str(f.widget.property("help")))

    def _update_summary(self) -> None:
        lv = self._level
        if lv is None:
            self.summary.setText("Fix the fields with a message under them to generate the "
                                 "framing.")
            return
        g = lv.grid
        n_g = sum(m.role == "girder" for m in lv.members)
        n_b = len(lv.members) - n_g
        s = self.system
        self.summary.setText(
            f"{len(g.x_lines) - 1} × {len(g.y_lines) - 1} bays, "
            f"{units.fmt(g.extent.width, 'length', s, decimals=2)} × "  # type: ignore[arg-type]
            f"{units.fmt(g.extent.height, 'length', s, decimals=2)}; "  # type: ignore[arg-type]
            f"{len(g.columns)} columns, {n_g} girders, {n_b} beams.")

    # ------------------------------------------------------------- public

    def prefill(self, level: Level) -> None:
        """Fill the fields from an existing level (to regenerate its framing):
        spacings (runs collapsed), labels, girder direction, the sections and
        grades of its first girder and beam, deck and existing loads. The beam
        spacing is the widest gap between parallel beams inside a bay."""
        s = self.system
        g = level.grid
        xs = tuple(b - a for a, b in zip(g.x_lines[:-1], g.x_lines[1:], strict=True))
        ys = tuple(b - a for a, b in zip(g.y_lines[:-1], g.y_lines[1:], strict=True))
        self.level_id.setText(level.id)
        self.level_name.setText(level.name)
        self.elevation.setText(fmt_value(level.elevation, "length", s).replace(",", ""))
        self.x_spacings.setText(format_spacings(xs, s))
        self.y_spacings.setText(format_spacings(ys, s))
        self.x_labels.setText(", ".join(g.x_labels))
        self.y_labels.setText(", ".join(g.y_labels))
        girders = [m for m in level.members if m.role == "girder"]
        beams = [m for m in level.members if m.role == "beam"]
        if girders:
            self.girder_direction.setCurrentIndex(0 if girders[0].axis == "x" else 1)
            self.girder_section.setText(girders[0].section.name)
            self.girder_grade.setCurrentText(girders[0].grade.name)
        if beams:
            self.beam_section.setText(beams[0].section.name)
            self.beam_grade.setCurrentText(beams[0].grade.name)
            along = "x" if beams[0].axis == "y" else "y"
            pos = sorted({round(m.start[0] if along == "x" else m.start[1], 6) for m in beams})
            gaps = [b - a for a, b in itertools.pairwise(pos)]
            if gaps:
                spacing = min(max(max(gaps), BEAM_SPACING_RANGE[0]), BEAM_SPACING_RANGE[1])
                # rounded up in the shown unit: a shown value a hair under the gap
                # would add a beam when the framing is regenerated
                d = 3 if s == "SI" else 2
                mag = units.to_display(spacing, "length", s)  # type: ignore[arg-type]
                mag = math.ceil(mag * 10 ** d - 1e-6) / 10 ** d
                unit = units.display_unit("length", s)  # type: ignore[arg-type]
                self.beam_spacing.setText(f"{mag:.{d}f} {unit}")
        d = level.deck
        self._deck_base = d
        self.deck_kind.setCurrentIndex(max(self.deck_kind.findData(d.kind), 0))
        self.deck_thickness.setText(fmt_value(d.thickness, "small_length", s).replace(",", ""))
        for name in lib.list_concretes():
            if lib.get_concrete(name) == d.concrete:
                self.concrete.setCurrentText(name)
                break
        self.superimposed_dead.setText(fmt_value(level.superimposed_dead, "pressure", s))
        self.live_in_place.setText(fmt_value(level.live_in_place, "pressure", s))
        self._revalidate()

    def errors(self) -> dict[str, str]:
        """Field key -> message for every field that cannot be used."""
        out = {k: f.error.text() for k, f in self._fields.items() if f.error.text()}
        if self.general_error.text():
            out["level"] = self.general_error.text()
        return out

    def is_valid(self) -> bool:
        return self._level is not None

    def level(self) -> Level | None:
        """The generated level for the current inputs (None while invalid)."""
        return self._level

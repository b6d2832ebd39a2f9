"""The main window's editing commands: edits made on the plan (zone handles,
corridors, drawn mats) and from the menus (framing, zones, loads, mats, openings,
deletion), each one undo step through :meth:`Document.edit`.

A part of :class:`droprig.gui.main_window.MainWindow` (a mixin)."""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING

from PySide6.QtCore import QPoint
from PySide6.QtGui import QAction
from PySide6.QtWidgets import (
    QMenu,
    QMessageBox,
)

from droprig.gui import edits as ed
from droprig.gui.document import Selection
from droprig.gui.inspector import (
    FormDialog,
    describe_refusal,
    opening_form,
    protection_form,
)
from droprig.gui.settings_dialog import SettingsDialog
from droprig.gui.window_base import WindowParts, describe
from droprig.model import (
    LiftLoad,
    LiftZone,
    ModelError,
    Project,
    ProtectionArea,
    Rect,
    bays,
    resting_on,
)

if TYPE_CHECKING:
    from droprig.gui.generator_dialog import GeneratorDialog

MAX_LISTED = 12
"""Members named one by one in the delete question; the rest are counted."""


def placeholder_load(name: str) -> LiftLoad:
    """The load a new zone or "Add load" starts with: 1 t falling 1 m, rigid,
    1 m × 1 m footprint. Round numbers to be replaced, never a recommendation."""
    return LiftLoad(name=name, mass=1000.0, drop_height=1.0)


def is_placeholder(load: LiftLoad) -> bool:
    """True while ``load`` still has every value of :func:`placeholder_load`."""
    return load == placeholder_load(load.name)


def _check_framing(before: Project, after: Project, level_id: str) -> None:
    """Raise the solver's ModelError if level ``level_id`` could be analysed in
    ``before`` but not in ``after`` (a framing the load path cannot follow)."""
    from droprig.solver import check_framing

    try:
        check_framing(before.level(level_id))
    except ModelError:
        return  # not analysable before this edit either: not this edit's doing
    check_framing(after.level(level_id))


class EditsMixin(WindowParts):
    """The main window's editing commands."""

    def _on_zone_changed(self, zone_id: str, new_zone: LiftZone) -> None:
        try:
            after = ed.with_zone(self.doc.project, zone_id, new_zone)
        except ModelError as exc:
            self.statusBar().showMessage(f"Zone change refused: {exc}", 10_000)
            self.plan.set_project(self.doc.project, self.doc.level_id)
            return
        self.doc.edit(after, f"Reshape lift zone {zone_id}")

    def plan_context_actions(self) -> list[QAction]:
        """What a right click on the plan offers for the current selection."""
        sel = self.doc.selection
        names = ["delete", "apply_like"] if sel is not None and sel.kind == "member" else []
        return [self.actions[n] for n in names]

    def _on_plan_context(self, global_pos: QPoint, member_id: str) -> None:
        acts = self.plan_context_actions() if member_id else []
        if not acts:
            return
        if self.plan_menu is None:
            self.plan_menu = QMenu(self)
        self.plan_menu.clear()
        self.plan_menu.addActions(acts)
        self.plan_menu.popup(global_pos)

    def _on_hover_text(self, text: str) -> None:
        if text:
            self.statusBar().showMessage(text)
        else:
            self.statusBar().clearMessage()

    def _on_protection_drawn(self, rect: Rect) -> None:
        self.actions["draw_protection"].setChecked(False)
        self.plan.set_mode("select")
        self.add_protection(rect)

    def _on_draw_toggled(self, on: bool) -> None:
        self.plan.set_mode("draw_protection" if on else "select")
        if on:
            self.plan.setFocus()  # so Esc reaches the plan at once
            self.statusBar().showMessage("Drag a rectangle on the plan where the mat goes "
                                         "(Esc, or Draw protection area again, to stop)", 8000)

    def _on_plan_mode_changed(self, mode: str) -> None:
        for name in ("draw_protection", "draw_corridor"):
            act = self.actions[name]
            if act.isChecked() != (mode == name):
                act.blockSignals(True)
                act.setChecked(mode == name)
                act.blockSignals(False)

    def _selected_zone(self) -> LiftZone | None:
        sel = self.doc.selection
        if sel is None or sel.kind not in ("zone", "load"):
            return None
        try:
            return self.doc.project.zone(sel.ids[0])
        except KeyError:
            return None

    def _on_corridor_toggled(self, on: bool) -> None:
        if not on:
            self.plan.set_mode("select")
            return
        zone = self._selected_zone()
        if zone is not None and zone.level_id != self.doc.level_id:
            self.doc.set_level(zone.level_id)
        try:
            self.plan.set_mode("draw_corridor")
        except ValueError as exc:
            self._on_plan_mode_changed(self.plan.mode)
            self.statusBar().showMessage(f"Draw lift corridor: {exc}", 8000)
            return
        self.plan.setFocus()  # so Enter, Backspace and Esc reach the plan at once
        self.statusBar().showMessage(
            f"Click the corners of zone {zone.id if zone else ''}'s corridor on the plan; "
            "double-click or Enter to finish, Backspace removes the last corner, "
            "Esc cancels", 10_000)

    def _on_corridor_drawn(self, zone_id: str, points: tuple) -> None:
        self._edit(lambda p: ed.with_corridor(p, zone_id, points),
                   f"Draw corridor of lift zone {zone_id}")

    def _on_corridor_dragged(self, zone_id: str, points: tuple) -> bool:
        """A corridor corner dragged on the plan: one undo step, validated as the
        typed corridor is; a refusal leaves the corridor as it was and says why in the
        status bar and beside the corner."""
        p = self.doc.project
        try:
            after = ed.with_corridor(p, zone_id, points)
        except (ModelError, KeyError) as exc:
            msg = describe_refusal(exc, "Corridor corner", p.settings.unit_system, "length") \
                if isinstance(exc, ModelError) else f"Corridor corner: {exc}"
            self.statusBar().showMessage(msg, 15_000)
            try:
                old = p.zone(zone_id).corridor
                moved = next((q for q, o in zip(points, old, strict=False) if q != o),
                             points[0])
                problem = exc.value if isinstance(exc, ModelError) else str(exc)
                self.plan.show_note(f"refused: {problem}", *moved)
            except (KeyError, IndexError):
                pass
            return False
        return self.doc.edit(after, f"Move corridor corner of lift zone {zone_id}")

    def clear_corridor(self) -> bool:
        """Remove the selected zone's corridor (one undo step)."""
        zone = self._selected_zone()
        if zone is None or not zone.corridor:
            self.statusBar().showMessage("Select a lift zone with a corridor first", 5000)
            return False
        return self._edit(lambda p: ed.with_corridor(p, zone.id, ()),
                          f"Clear corridor of lift zone {zone.id}")

    def _current_level_id(self) -> str | None:
        return self.doc.level_id or None

    def _selected_bay_rect(self) -> Rect | None:
        sel = self.doc.selection
        lv = self.doc.level
        if lv is None:
            return None
        if sel is not None and sel.kind == "bay" and sel.ids[0] == lv.id:
            for b in bays(lv):
                if b.id == sel.ids[1]:
                    return b.rect
        return None

    def _zone_bay_rect(self) -> Rect | None:
        """The bay under the crane of the selected lift zone (or of the first
        zone on the level shown): where a new mat is most likely needed."""
        lv = self.doc.level
        if lv is None:
            return None
        sel = self.doc.selection
        zones = [z for z in self.doc.project.lift_zones if z.level_id == lv.id]
        if sel is not None and sel.kind in ("zone", "load"):
            zones = [z for z in zones if z.id == sel.ids[0]] or zones
        for z in zones:
            x, y = z.crane
            for b in bays(lv):
                r = b.rect
                if r.x0 <= x <= r.x1 and r.y0 <= y <= r.y1:
                    return r
        return None

    def generate_framing(self) -> None:
        """Generate floor framing. With a level on the plan, first ask whether to
        replace its framing (the dialog then opens filled from that level) or to
        add a new level; the dialog works in the project's unit system."""
        p = self.doc.project
        ids = [lv.id for lv in p.levels]
        current = self.doc.level_id
        choice = "add"
        if current:
            choice = self.ask_replace_or_add(p.level(current).name) or ""
            if choice not in ("replace", "add"):
                return
        dlg = self.generator_dialog(replace_level=current if choice == "replace" else None)
        if not dlg.exec():
            return
        level = dlg.level()
        if level is None:
            return
        if choice == "replace" and current:
            self.replace_level_framing(current, level)
            return
        if level.id in ids:
            level = replace(level, id=ed.unique_id("L", ids))
        self._edit(lambda p: ed.add_level(p, level), f"Add level {level.name}")
        self.doc.set_level(level.id)

    def generator_dialog(self, replace_level: str | None = None) -> GeneratorDialog:
        """The framing generator in the project's unit system: filled from level
        ``replace_level`` (to regenerate it), or for a new level with a free id."""
        from droprig.gui.generator_dialog import GeneratorDialog

        p = self.doc.project
        ids = [lv.id for lv in p.levels]
        if replace_level is not None:
            cur = p.level(replace_level)
            dlg = GeneratorDialog(self, unit_system=p.settings.unit_system, level_id=cur.id,
                                  level_name=cur.name,
                                  existing_level_ids=tuple(i for i in ids if i != cur.id))
            dlg.prefill(cur)
            return dlg
        return GeneratorDialog(self, unit_system=p.settings.unit_system,
                               level_id=ed.unique_id("L", ids),
                               level_name=f"Level {len(ids) + 1}",
                               existing_level_ids=tuple(ids))

    def ask_replace_or_add(self, level_name: str) -> str | None:
        """"replace", "add" or None (cancelled)."""
        box = QMessageBox(QMessageBox.Icon.Question, "Generated framing",
                          f"Replace the framing of level {level_name} (its lift zones and "
                          "protection areas stay), or add the generated framing as a new "
                          "level?", parent=self)
        rep = box.addButton("Replace this level", QMessageBox.ButtonRole.AcceptRole)
        add = box.addButton("Add a new level", QMessageBox.ButtonRole.ActionRole)
        box.addButton(QMessageBox.StandardButton.Cancel)
        box.exec()
        clicked = box.clickedButton()
        return "replace" if clicked is rep else "add" if clicked is add else None

    def replace_level_framing(self, level_id: str, level: object) -> bool:
        """Swap in generated framing for ``level_id`` (zones and mats stay)."""
        new = replace(level, id=level_id)  # type: ignore[type-var]
        return self._edit(lambda p: ed.with_level(p, level_id, new),
                          f"Regenerate framing of level {level_id}")

    def _edit(self, fn: object, text: str) -> bool:
        try:
            after = fn(self.doc.project)  # type: ignore[operator]
        except (ModelError, ValueError, KeyError) as exc:
            QMessageBox.warning(self, "droprig", f"{text}: {describe(exc)}")
            return False
        return self.doc.edit(after, text)

    def add_zone(self) -> LiftZone | None:
        lv = self.doc.level
        if lv is None:
            return None
        p = self.doc.project
        ext = lv.grid.extent
        zid = ed.unique_id("Z", [z.id for z in p.lift_zones])
        r = max(1.0, round(min(ext.width, ext.height) * 0.35, 1))
        zone = LiftZone(id=zid, name=f"Lift {zid[1:]}", level_id=lv.id,
                        crane=(ext.x0 + ext.width / 2, ext.y0 + ext.height / 2),
                        r_min=0.0, r_max=r,
                        loads=(placeholder_load("Load 1"),))
        if self._edit(lambda p: ed.add_zone(p, zone), f"Add lift zone {zid}"):
            self.doc.select(Selection("zone", (zid,)))
            return zone
        return None

    def add_load(self) -> LiftLoad | None:
        p = self.doc.project
        sel = self.doc.selection
        zid = None
        if sel is not None and sel.kind in ("zone", "load"):
            zid = sel.ids[0]
        elif p.lift_zones:
            here = [z for z in p.lift_zones if z.level_id == self.doc.level_id]
            zid = (here or list(p.lift_zones))[0].id
        if zid is None:
            self.statusBar().showMessage("Add a lift zone first", 5000)
            return None
        name = ed.unique_name("Load 1", [ld.name for ld in p.zone(zid).loads])
        load = placeholder_load(name)
        if self._edit(lambda p: ed.add_load(p, zid, load), f"Add load to zone {zid}"):
            self.doc.select(Selection("load", (zid, name)))
            return load
        return None

    def add_protection(self, rect: Rect | None = None) -> ProtectionArea | None:
        lv = self.doc.level
        if lv is None:
            return None
        p = self.doc.project
        if not isinstance(rect, Rect):
            rect = self._selected_bay_rect() or self._zone_bay_rect() or bays(lv)[0].rect
        pid = ed.unique_id("P", [a.id for a in p.protection_areas])
        area = ProtectionArea(id=pid, name=f"Mat {pid[1:]}", level_id=lv.id, area=rect)
        dlg = FormDialog("New protection area", area,
                         lambda a: protection_form(a, self.doc.project, None),
                         p.settings.unit_system,
                         "A crane mat (elastic) or a crushable layer laid on the deck. "
                         "Edit the rectangle and the mat properties, then OK.", self)
        if not dlg.exec():
            return None
        area = dlg.value()
        if self._edit(lambda p: ed.add_protection(p, area), f"Add protection area {pid}"):
            self.doc.select(Selection("protection", (pid,)))
            return area
        return None

    def add_opening(self) -> Rect | None:
        lv = self.doc.level
        if lv is None:
            return None
        b = self._selected_bay_rect() or bays(lv)[0].rect
        w, h = b.width / 3, b.height / 3
        rect = Rect(b.x0 + w, b.y0 + h, b.x1 - w, b.y1 - h)
        dlg = FormDialog("New deck opening", rect,
                         lambda r: opening_form(r, lv.id, None, None),
                         self.doc.project.settings.unit_system,
                         "A hole in the deck (shaft, hatch, removed panel). A load over it "
                         "falls through: those points are reported as exceeding.", self)
        if not dlg.exec():
            return None
        rect = dlg.value()
        n = len(lv.deck.openings)
        if self._edit(lambda p: ed.add_opening(p, lv.id, rect), "Add deck opening"):
            self.doc.select(Selection("opening", (lv.id, str(n))))
            return rect
        return None

    def apply_like(self) -> bool:
        sel = self.doc.selection
        if sel is None or sel.kind != "member":
            return False
        lv = self.doc.project.level(sel.ids[0])
        m = lv.member(sel.ids[1])
        changed = {o.id: replace(o, section=m.section, grade=m.grade,
                                 end_condition=m.end_condition)
                   for o in lv.members if o.role == m.role and o.id != m.id}
        return self._edit(lambda p: ed.with_members(p, lv.id, changed),
                          f"{m.section.name} {m.grade.name} for every {m.role} on {lv.name}")

    def delete_selection(self) -> bool:
        sel = self.doc.selection
        if sel is None:
            return False
        k, ids = sel.kind, sel.ids
        p = self.doc.project
        if k == "zone":
            return self._edit(lambda p: ed.remove_zone(p, ids[0]), f"Delete lift zone {ids[0]}")
        if k == "load":
            return self._edit(lambda p: ed.remove_load(p, ids[0], ids[1]),
                              f"Delete load {ids[1]}")
        if k == "protection":
            return self._edit(lambda p: ed.remove_protection(p, ids[0]),
                              f"Delete protection area {ids[0]}")
        if k == "opening":
            return self._edit(lambda p: ed.remove_opening(p, ids[0], int(ids[1])),
                              "Delete deck opening")
        if k == "level":
            n = sum(z.level_id == ids[0] for z in p.lift_zones)
            if n and QMessageBox.question(
                    self, "Delete level", f"Delete level {p.level(ids[0]).name} and the {n} "
                    "lift zone(s) and protection areas on it?") != \
                    QMessageBox.StandardButton.Yes:
                return False
            return self._edit(lambda p: ed.remove_level(p, ids[0]), f"Delete level {ids[0]}")
        if k == "member":
            return self.delete_member(ids[0], ids[1])
        return False

    def delete_member(self, level_id: str, member_id: str) -> bool:
        """Delete a girder or beam (one undo step). Members that rest on it (their
        ends on nothing once it is gone) are named, and deleted with it only if the
        user agrees; otherwise nothing changes. A deletion that would leave the level
        unanalysable is refused with the solver's reason."""
        p = self.doc.project
        try:
            lv = p.level(level_id)
            m = lv.member(member_id)
            carried = resting_on(lv, [member_id])
        except (KeyError, ModelError) as exc:
            self.statusBar().showMessage(f"Delete member: {describe(exc)}", 8000)
            return False
        what = f"{m.role} {m.id}"
        text = f"Delete {what}"
        if carried:
            n = len(carried)
            shown = ", ".join(carried[:MAX_LISTED]) + (
                f" and {n - MAX_LISTED} more" if n > MAX_LISTED else "")
            ans = QMessageBox.question(
                self, "Delete member",
                f"{n} member(s) rest on {what}: {shown}.\n\nWithout {m.id} their ends "
                "would rest on nothing, so droprig cannot keep them. Delete "
                f"{m.id} and these {n} member(s) together? (One step: Edit › Undo "
                "brings them all back.)\n\nCancel leaves the framing as it is.",
                QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.Cancel,
                QMessageBox.StandardButton.Cancel)
            if ans != QMessageBox.StandardButton.Yes:
                self.statusBar().showMessage(f"Nothing deleted: {shown} rest on {m.id}", 8000)
                return False
            text += f" and the {n} member(s) resting on it"
        try:
            after = ed.remove_members(p, level_id, [member_id, *carried])
            _check_framing(p, after, level_id)
        except ModelError as exc:
            QMessageBox.warning(self, "Delete member",
                                f"{text}: refused. {describe(exc)}\nNothing was changed.")
            return False
        if not self.doc.edit(after, text):
            return False
        self.statusBar().showMessage(f"{text} (Edit › Undo restores)", 8000)
        return True

    def show_settings(self) -> SettingsDialog:
        if self._settings_dialog is None:
            self._settings_dialog = SettingsDialog(self.doc, self)
        self._settings_dialog.show()
        self._settings_dialog.raise_()
        return self._settings_dialog

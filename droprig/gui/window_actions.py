"""The main window's actions and menus: every command with its shortcut (the
platform's standard keys), the menu bar, and which actions the selection enables.

A part of :class:`droprig.gui.main_window.MainWindow` (a mixin: the window holds
the state, see :class:`~droprig.gui.window_base.WindowParts`)."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QAction, QKeySequence

from droprig.gui import style
from droprig.gui.document import Selection
from droprig.gui.window_base import WindowParts


def redo_keys() -> list[QKeySequence]:
    """The platform's redo keys plus the other common one: Ctrl+Y and
    Ctrl+Shift+Z both redo on Linux and Windows (macOS: Cmd+Shift+Z)."""
    keys = QKeySequence.keyBindings(QKeySequence.StandardKey.Redo)
    for extra in ("Ctrl+Y", "Ctrl+Shift+Z"):
        k = QKeySequence(extra)
        if k not in keys:
            keys.append(k)
    return keys


def quit_keys() -> list[QKeySequence]:
    """The platform's quit keys, with Ctrl+Q where the platform has none (Windows)."""
    keys = QKeySequence.keyBindings(QKeySequence.StandardKey.Quit)
    return keys or [QKeySequence("Ctrl+Q")]


class ActionsMixin(WindowParts):
    """The main window's actions and menus."""

    def _act(self, name: str, text: str, slot: object, shortcut: object = None,
             tip: str = "") -> QAction:
        a = QAction(text, self)
        a.setObjectName(f"action_{name}")
        if isinstance(shortcut, QKeySequence.StandardKey):
            a.setShortcuts(shortcut)  # every platform binding (Close: Ctrl+F4 and Ctrl+W)
        elif shortcut is not None:
            a.setShortcut(shortcut)  # type: ignore[arg-type]
        if tip:
            a.setToolTip(tip)
            a.setStatusTip(tip)
        a.triggered.connect(slot)  # type: ignore[arg-type]
        self.actions[name] = a
        return a

    def _make_actions(self) -> None:
        self.actions: dict[str, QAction] = {}
        K = QKeySequence.StandardKey
        self._act("new", "&New", self._on_new, K.New, "Start a new, empty project")
        self._act("open", "&Open…", self._on_open, K.Open, "Open a .droprig project")
        self._act("save", "&Save", self.save, K.Save, "Save the project")
        self._act("save_as", "Save &As…", self.save_as, K.SaveAs,
                  "Save the project under a new name")
        self._act("export_annex", "&Export permit annex…", self.export_annex, "Ctrl+E",
                  "Write the lift-permit annex PDF (the same as 'droprig report')")
        self._act("close", "&Close", self.close_project, K.Close,
                  "Close this project (asks first if it has unsaved changes)")
        self._act("quit", "&Quit", self.close, K.Quit)
        self.actions["quit"].setShortcuts(quit_keys())
        undo = self.doc.undo_stack.createUndoAction(self, "&Undo")
        undo.setShortcuts(K.Undo)
        redo = self.doc.undo_stack.createRedoAction(self, "&Redo")
        redo.setShortcuts(redo_keys())
        self.actions["undo"], self.actions["redo"] = undo, redo
        self._act("delete", "&Delete", self.delete_selection, K.Delete,
                  "Delete the selected girder or beam, lift zone, load, protection area, "
                  "opening or level")
        self._act("settings", "Analysis &settings…", self.show_settings, "Ctrl+,",
                  "Units, design basis, factors and limits")
        self._act("info", "Project &title block…", lambda: self.doc.select(Selection("info")))
        self._act("generate", "&Generate framing…", self.generate_framing, "Ctrl+G",
                  "Build a level's grid, girders, beams and deck from a few numbers")
        self._act("apply_like", "Use this section for all like members", self.apply_like,
                  tip="Give every member of the same role on this level the selected "
                      "member's section, grade and end conditions")
        self._act("add_opening", "Add deck &opening…", self.add_opening,
                  tip="A hole in the deck: a load over it falls to the level below")
        self._act("add_zone", "Add lift &zone", self.add_zone, "Ctrl+L",
                  "A crane position and the region its load swings over")
        self._act("add_load", "Add &load to zone", self.add_load, "Ctrl+Shift+L",
                  "A load or rigging item that could drop inside the zone")
        self._act("edit_load", "Enter the load", self.edit_placeholder_load,
                  tip="Show the load that still has its starting values in the inspector")
        self._act("add_protection", "Add &protection area…", self.add_protection,
                  tip="A crane mat or crushable layer over a rectangle")
        draw = self._act("draw_protection", "&Draw protection area", self._on_draw_toggled,
                         "Ctrl+D", "Drag a rectangle on the plan to lay a mat there")
        draw.setCheckable(True)
        corr = self._act("draw_corridor", "Draw lift &corridor", self._on_corridor_toggled,
                         "Ctrl+Shift+D",
                         "Click the corners of the selected zone's corridor on the plan; "
                         "double-click or Enter to finish")
        corr.setCheckable(True)
        self._act("clear_corridor", "Clear lift co&rridor", self.clear_corridor,
                  tip="Remove the selected zone's corridor (the whole swing sector counts)")
        self._act("fit", "Zoom to &fit", lambda: self.plan.fit(), "Ctrl+0",
                  "Show the whole level")
        for mode, label in style.OVERLAYS.items():
            a = self._act(f"overlay_{mode}", f"Colour by {label.lower()}",
                          lambda _c=False, m=mode: self.set_overlay(m))
            a.setCheckable(True)
        self._act("about", "&About droprig", self._on_about)
        self._act("caution", "&Limits of use", self._on_caution)
        self._act("help", "droprig &user guide", self.show_help, K.HelpContents,
                  "The user guide, at the section of the panel you are in")
        # F1 also in the settings and generator dialogs
        self.actions["help"].setShortcutContext(Qt.ShortcutContext.ApplicationShortcut)

    def _make_menus(self) -> None:
        a = self.actions
        mb = self.menuBar()
        m = mb.addMenu("&File")
        m.addActions([a["new"], a["open"]])
        self.recent_menu = m.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)
        m.addSeparator()
        m.addActions([a["save"], a["save_as"]])
        m.addSeparator()
        m.addAction(a["info"])
        m.addAction(a["export_annex"])
        m.addSeparator()
        m.addActions([a["close"], a["quit"]])
        m = mb.addMenu("&Edit")
        m.addActions([a["undo"], a["redo"]])
        m.addSeparator()
        m.addAction(a["delete"])
        m.addSeparator()
        m.addAction(a["settings"])
        m = mb.addMenu("F&raming")
        m.addActions([a["generate"], a["add_opening"], a["apply_like"]])
        m = mb.addMenu("&Lift")
        m.addActions([a["add_zone"], a["add_load"]])
        m.addSeparator()
        m.addActions([a["draw_corridor"], a["clear_corridor"]])
        m.addSeparator()
        m.addActions([a["add_protection"], a["draw_protection"]])
        m = mb.addMenu("&View")
        m.addAction(a["fit"])
        m.addSeparator()
        for mode in style.OVERLAYS:
            m.addAction(a[f"overlay_{mode}"])
        m.addSeparator()
        for d in (self.tree_dock, self.inspector_dock, self.results_dock, self.trace_dock):
            m.addAction(d.toggleViewAction())
        m = mb.addMenu("&Help")
        m.addActions([a["help"], a["caution"], a["about"]])

    def _update_actions(self) -> None:
        sel = self.doc.selection
        kind = sel.kind if sel else ""
        self.actions["delete"].setEnabled(kind in ("member", "zone", "load", "protection",
                                                   "opening", "level"))
        self.actions["apply_like"].setEnabled(kind == "member")
        has_level = bool(self.doc.project.levels)
        for n in ("add_zone", "add_opening", "add_protection", "draw_protection"):
            self.actions[n].setEnabled(has_level)
        self.actions["add_load"].setEnabled(bool(self.doc.project.lift_zones))
        zone = self._selected_zone()
        self.actions["draw_corridor"].setEnabled(zone is not None)
        self.actions["clear_corridor"].setEnabled(zone is not None and bool(zone.corridor))
        self.actions["overlay_" + self.plan.overlay].setChecked(True)

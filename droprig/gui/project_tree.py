"""Project tree: levels with their framing and deck, lift zones with their
loads, protection areas. Selecting an item selects it in the document (and
so in the plan and the inspector), and the other way round."""

from __future__ import annotations

from PySide6.QtCore import QPoint, Qt
from PySide6.QtGui import QAction
from PySide6.QtWidgets import (
    QAbstractItemView,
    QHeaderView,
    QMenu,
    QTreeWidget,
    QTreeWidgetItem,
    QWidget,
)

from droprig import units
from droprig.gui.document import Document, Selection
from droprig.model import Project

_SEL_ROLE = Qt.ItemDataRole.UserRole
_GROUP_ROLE = Qt.ItemDataRole.UserRole + 1


class ProjectTree(QTreeWidget):
    """Tree view of ``document.project``. ``actions`` are offered in the context
    menu (``add_zone``, ``add_load``, ``add_protection``, ``add_opening``,
    ``generate``, ``apply_like``, ``delete``)."""

    def __init__(self, document: Document, actions: dict[str, QAction] | None = None,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._doc = document
        self._actions = actions or {}
        self._items: dict[Selection, QTreeWidgetItem] = {}
        self._syncing = False
        self.setHeaderHidden(True)
        # rows are never cut to "…": the column is as wide as its longest row and a
        # narrow panel scrolls sideways (issue 15: names and sections were elided)
        self.header().setStretchLastSection(False)
        self.header().setSectionResizeMode(0, QHeaderView.ResizeMode.ResizeToContents)
        self.setTextElideMode(Qt.TextElideMode.ElideNone)
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAsNeeded)
        self.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.setUniformRowHeights(True)
        self.setContextMenuPolicy(Qt.ContextMenuPolicy.CustomContextMenu)
        self.customContextMenuRequested.connect(self._on_context_menu)
        self.itemSelectionChanged.connect(self._on_item_selection_changed)
        document.project_changed.connect(self._on_project_changed)
        document.selection_changed.connect(self._on_selection_changed)
        self._sig = _shown(document.project)
        self._rebuild(document.project)

    # -------------------------------------------------------------- building

    def item_for(self, sel: Selection) -> QTreeWidgetItem | None:
        return self._items.get(sel)

    def _expanded_keys(self) -> set[str]:
        keys: set[str] = set()

        def walk(it: QTreeWidgetItem) -> None:
            for i in range(it.childCount()):
                c = it.child(i)
                if c.isExpanded():
                    keys.add(self._key(c))
                walk(c)

        walk(self.invisibleRootItem())
        return keys

    @staticmethod
    def _key(it: QTreeWidgetItem) -> str:
        sel = it.data(0, _SEL_ROLE)
        return repr(sel) if sel is not None else str(it.data(0, _GROUP_ROLE))

    def _add(self, parent: QTreeWidgetItem | QTreeWidget, text: str,
             sel: Selection | None = None, group: str = "", tip: str = "") -> QTreeWidgetItem:
        it = QTreeWidgetItem(parent, [text])
        if sel is not None:
            it.setData(0, _SEL_ROLE, sel)
            self._items[sel] = it
        else:
            it.setData(0, _GROUP_ROLE, group or text)
            f = it.font(0)
            f.setBold(True)
            it.setFont(0, f)
        if tip:
            it.setToolTip(0, tip)
        return it

    def _rebuild(self, p: Project) -> None:
        first = self.topLevelItemCount() == 0
        expanded = self._expanded_keys()
        scroll = self.verticalScrollBar().value()
        self._syncing = True
        self.clear()
        self._items.clear()
        system = p.settings.unit_system
        self._add(self, f"Project: {p.info.name}", Selection("info"))
        self._add(self, f"Settings ({system}, {_BASIS.get(p.settings.design_basis, '')})",
                  Selection("settings"))
        levels = self._add(self, f"Levels ({len(p.levels)})", group="levels")
        for lv in p.levels:
            li = self._add(levels, f"{lv.name}  ·  {units.fmt(lv.elevation, 'length', system)}",
                           Selection("level", (lv.id,)), tip=f"level id {lv.id}")
            deck = self._add(li, f"Deck ({len(lv.deck.openings)} openings)",
                             Selection("deck", (lv.id,)))
            for i, r in enumerate(lv.deck.openings):
                self._add(deck, f"Opening {i + 1}: {units.fmt(r.width, 'length', system)} × "
                          f"{units.fmt(r.height, 'length', system)}",
                          Selection("opening", (lv.id, str(i))))
            for role, title in (("girder", "Girders"), ("beam", "Beams")):
                ms = [m for m in lv.members if m.role == role]
                g = self._add(li, f"{title} ({len(ms)})", group=f"{lv.id}/{role}")
                for m in ms:
                    self._add(g, f"{m.id}  {m.section.name}  {m.grade.name}"
                              + ("" if m.end_condition == "simple" else f"  [{m.end_condition}]"),
                              Selection("member", (lv.id, m.id)))
        zones = self._add(self, f"Lift zones ({len(p.lift_zones)})", group="zones")
        for z in p.lift_zones:
            zi = self._add(zones, f"{z.id}  {z.name}".rstrip(), Selection("zone", (z.id,)),
                           tip=f"on level {z.level_id}")
            for ld in z.loads:
                h = (f"drop {units.fmt(ld.drop_height, 'length', system)}"
                     if ld.drop_height is not None else
                     f"hook at {units.fmt(ld.hook_elevation, 'length', system)}")
                text = f"{ld.name}  ·  {units.fmt(ld.mass, 'mass', system)}  ·  {h}"
                # the dock is narrow and cuts this line: the tip gives it whole
                foot = (f"{units.fmt(ld.footprint_length, 'length', system)} × "
                        f"{units.fmt(ld.footprint_width, 'length', system)}")
                self._add(zi, text, Selection("load", (z.id, ld.name)),
                          tip=f"{text}  ·  footprint {foot}")
        prots = self._add(self, f"Protection areas ({len(p.protection_areas)})",
                          group="protection")
        for a in p.protection_areas:
            kind = "mat" if a.kind == "spring" else "crushable layer"
            self._add(prots, f"{a.id}  {a.name}  ({kind})".replace("  (", " (").strip(),
                      Selection("protection", (a.id,)))

        def restore(it: QTreeWidgetItem) -> None:
            for i in range(it.childCount()):
                c = it.child(i)
                key = self._key(c)
                if first:
                    grp = c.data(0, _GROUP_ROLE)
                    sel = c.data(0, _SEL_ROLE)
                    c.setExpanded(grp in ("levels", "zones", "protection") or (
                        sel is not None and sel.kind in ("level", "zone")))
                else:
                    c.setExpanded(key in expanded)
                restore(c)

        restore(self.invisibleRootItem())
        self._select_item(self._doc.selection)
        self.verticalScrollBar().setValue(scroll)
        self._syncing = False

    # -------------------------------------------------------------- document events

    def _on_project_changed(self, project: Project) -> None:
        sig = _shown(project)
        if sig == self._sig:
            return  # nothing the tree shows has changed (a zone dragged, a radius)
        self._sig = sig
        self._rebuild(project)

    def _on_selection_changed(self, sel: Selection | None) -> None:
        self._syncing = True
        self._select_item(sel)
        self._syncing = False

    def _select_item(self, sel: Selection | None) -> None:
        it = self._items.get(sel) if sel is not None else None
        if it is None:
            self.clearSelection()
            return
        parent = it.parent()
        while parent is not None:
            parent.setExpanded(True)
            parent = parent.parent()
        self.setCurrentItem(it)
        self.scrollToItem(it)

    # -------------------------------------------------------------- user events

    def _on_item_selection_changed(self) -> None:
        if self._syncing:
            return
        items = self.selectedItems()
        sel = items[0].data(0, _SEL_ROLE) if items else None
        self._doc.select(sel)

    def _on_context_menu(self, pos: QPoint) -> None:
        it = self.itemAt(pos)
        sel = it.data(0, _SEL_ROLE) if it is not None else None
        grp = it.data(0, _GROUP_ROLE) if it is not None else None
        if sel is not None and sel != self._doc.selection:
            self._doc.select(sel)
        names: list[str] = []
        if grp == "zones":
            names = ["add_zone"]
        elif grp == "protection":
            names = ["add_protection"]
        elif grp == "levels":
            names = ["generate"]
        elif sel is not None:
            names = {"zone": ["add_load", "delete"], "load": ["delete"],
                     "protection": ["delete"], "opening": ["delete"],
                     "level": ["generate", "add_opening", "delete"],
                     "deck": ["add_opening"], "member": ["apply_like", "delete"]}.get(sel.kind, [])
        acts = [self._actions[n] for n in names if n in self._actions]
        if not acts:
            return
        menu = QMenu(self)
        for a in acts:
            menu.addAction(a)
        menu.exec(self.viewport().mapToGlobal(pos))


_BASIS = {"aisc360": "AISC 360", "en1993": "EN 1993"}


def _shown(p: Project) -> tuple:
    """What the tree's rows are made of, as the project's frozen objects (equal
    objects, equal rows; the comparison stops at the first object that differs and
    takes an unchanged one by identity)."""
    return (p.info.name, p.settings.unit_system, p.settings.design_basis, p.levels,
            tuple((z.id, z.name, z.level_id, z.loads) for z in p.lift_zones),
            p.protection_areas)

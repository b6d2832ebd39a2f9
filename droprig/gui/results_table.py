"""Results table: one row per column bay per load of a lift zone, sortable.

Selecting a row selects the bay in the document (so the plan highlights it)
and asks for the calculation trace of that bay's governing point; selecting a
bay elsewhere selects its worst row here.
"""

from __future__ import annotations

import math
from typing import Any

from PySide6.QtCore import (
    QAbstractTableModel,
    QItemSelectionModel,
    QModelIndex,
    QPersistentModelIndex,
    QRectF,
    QSize,
    QSortFilterProxyModel,
    Qt,
    Signal,
)
from PySide6.QtGui import QColor, QFont, QFontMetrics, QIcon, QPainter, QPixmap
from PySide6.QtWidgets import (
    QAbstractItemView,
    QComboBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QTableView,
    QVBoxLayout,
    QWidget,
)

from droprig import units
from droprig.advice import advice_text
from droprig.gui import style
from droprig.gui.document import Document, Selection
from droprig.model import Project
from droprig.outcomes import fmt_utilisation
from droprig.solver import BaySummary, Results

SORT_ROLE = Qt.ItemDataRole.UserRole + 1
ROW_ROLE = Qt.ItemDataRole.UserRole + 2

COLUMNS: tuple[tuple[str, str], ...] = (
    ("bay", "Bay"),
    ("zone", "Zone"),
    ("load", "Load"),
    ("outcome", "Outcome"),
    ("util", "Max U"),
    ("allow", "Allowable drop: elastic (yielding)"),
    ("planned", "Planned drop"),
    ("governing", "Governing member · check"),
    ("advice", "Advice"),
)
COL = {key: i for i, (key, _) in enumerate(COLUMNS)}

_TIPS = {
    "outcome": "Worst response of any drop point in the bay. E: stays elastic, "
               "Y: yields within limits, X: exceeds limits.",
    "util": "Maximum utilisation U = demand / resistance of any check at any drop point "
            "in the bay, as a ratio: above 1.00 a check is exceeded; '> 99' beyond 99",
    "allow": "Greatest free fall that keeps every point of the bay elastic; in brackets "
             "the greatest that keeps it within the ductility and rotation limits, where "
             "that is more",
    "planned": "Free-fall height of the load as planned (onto the deck or mat top)",
}


HEADER_PADDING_PX = 40
"""Room beside a column title for the section padding and the sort arrow."""


def header_font(hh: QHeaderView) -> QFont:
    """The font the header draws its titles in (Fusion draws them bold)."""
    f = QFont(hh.font())
    f.setBold(True)
    return f


def outcome_icon(key: str, size: int = 14) -> QIcon:
    """A square swatch: outcome fill, hatch and edge (same look as the plan)."""
    st = style.outcome(key)
    pm = QPixmap(size, size)
    pm.fill(Qt.GlobalColor.transparent)
    p = QPainter(pm)
    r = QRectF(0.5, 0.5, size - 1, size - 1)
    p.fillRect(r, st.fill_brush())
    if st.hatch != Qt.BrushStyle.NoBrush:
        p.fillRect(r, st.hatch_brush(230))
    p.setPen(st.edge_pen(1.0))
    p.drawRect(r)
    p.end()
    return QIcon(pm)


def _fin(v: float | None) -> float | None:
    return None if v is None or (isinstance(v, float) and math.isnan(v)) else v


class BayResultsModel(QAbstractTableModel):
    """Rows = ``results.bays`` (the solver's per-bay summaries)."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._rows: tuple[BaySummary, ...] = ()
        self._planned: dict[tuple[str, str], float] = {}
        self._system: units.UnitSystem = "SI"
        self._level_names: dict[str, str] = {}
        self._stale = False

    def set_data(self, results: Results | None, project: Project, stale: bool = False) -> None:
        self.beginResetModel()
        self._rows = results.bays if results is not None else ()
        self._planned = {(c.zone_id, c.load_name): c.planned_drop_height
                         for c in (results.cases if results is not None else ())}
        self._system = project.settings.unit_system
        self._level_names = {lv.id: lv.name for lv in project.levels} \
            if len(project.levels) > 1 else {}
        self._stale = stale
        self.endResetModel()

    def set_stale(self, stale: bool) -> None:
        if stale != self._stale:
            self._stale = stale
            if self._rows:
                self.dataChanged.emit(self.index(0, 0),
                                      self.index(len(self._rows) - 1, len(COLUMNS) - 1))

    def row(self, i: int) -> BaySummary:
        return self._rows[i]

    def rowCount(self, parent: QModelIndex | QPersistentModelIndex = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self._rows)

    def columnCount(self, parent: QModelIndex | QPersistentModelIndex = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(COLUMNS)

    def headerData(self, section: int, orientation: Qt.Orientation,
                   role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if orientation != Qt.Orientation.Horizontal:
            return None
        key = COLUMNS[section][0]
        if role == Qt.ItemDataRole.DisplayRole:
            return COLUMNS[section][1]
        if role == Qt.ItemDataRole.ToolTipRole:
            return _TIPS.get(key)
        return None

    def data(self, index: QModelIndex | QPersistentModelIndex,
             role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid():
            return None
        b = self._rows[index.row()]
        key = COLUMNS[index.column()][0]
        if role == ROW_ROLE:
            return index.row()
        if role == Qt.ItemDataRole.DisplayRole:
            return self._text(b, key)
        if role == SORT_ROLE:
            return self._sort(b, key)
        if role == Qt.ItemDataRole.DecorationRole and key == "outcome":
            return outcome_icon(b.response)
        if role == Qt.ItemDataRole.ToolTipRole:
            if key == "util":
                return _TIPS["util"]
            # the advice column is often scrolled out of view: every other cell
            # of the row gives it on hover
            advice = advice_text(b, self._system)
            if key == "outcome":
                return f"{style.outcome(b.response).meaning}\n{advice}"
            return advice
        if role == Qt.ItemDataRole.FontRole and key in ("outcome", "util") and (
                b.response == "exceeds" or b.max_utilisation > 1.0):
            f = QFont()
            f.setBold(True)
            return f
        if role == Qt.ItemDataRole.ForegroundRole and self._stale:
            return QColor("#9A9A9A")
        if role == Qt.ItemDataRole.TextAlignmentRole and key in ("util", "allow", "planned"):
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    def _text(self, b: BaySummary, key: str) -> str:
        s = self._system
        if key == "bay":
            lv = self._level_names.get(b.level_id)
            return f"{lv}: {b.bay_id}" if lv else b.bay_id
        if key == "zone":
            return b.zone_id
        if key == "load":
            return b.load_name
        if key == "outcome":
            st = style.outcome(b.response)
            return f"{st.tag}  {st.label}"
        if key == "util":
            return fmt_utilisation(b.max_utilisation)
        if key == "allow":
            el = style.fmt_drop(_fin(b.allowable_drop_height), s)
            pl = _fin(b.allowable_drop_height_plastic)
            pl_text = style.fmt_drop(pl, s)
            if pl is None or pl_text == el:
                return el
            return f"{el}  ({pl_text})"
        if key == "planned":
            return units.fmt(self._planned.get((b.zone_id, b.load_name)), "length", s)
        if key == "governing":
            return f"{b.governing_member} · {b.governing_check.replace('_', ' ')}"
        if key == "advice":
            return advice_text(b, s)
        return ""

    def _sort(self, b: BaySummary, key: str) -> Any:
        if key == "outcome":
            return style.OUTCOME_ORDER.index(b.response) if b.response in \
                style.OUTCOME_ORDER else -1
        if key == "util":
            return _fin(b.max_utilisation) if _fin(b.max_utilisation) is not None else -1.0
        if key == "allow":
            v = _fin(b.allowable_drop_height)
            return -1.0 if v is None else v
        if key == "planned":
            v = self._planned.get((b.zone_id, b.load_name))
            return -1.0 if v is None else v
        return self._text(b, key)


class _LiftFilter(QSortFilterProxyModel):
    """Shows the rows of one (zone, load), or all when ``key`` is None."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.key: tuple[str, str] | None = None

    def set_key(self, key: tuple[str, str] | None) -> None:
        if hasattr(self, "beginFilterChange"):  # Qt ≥ 6.9
            self.beginFilterChange()
            self.key = key
            self.endFilterChange(QSortFilterProxyModel.Direction.Rows)
        else:
            self.key = key
            self.invalidateFilter()

    def filterAcceptsRow(self, source_row: int,
                         source_parent: QModelIndex | QPersistentModelIndex) -> bool:
        if self.key is None:
            return True
        model = self.sourceModel()
        assert isinstance(model, BayResultsModel)
        b = model.row(source_row)
        return (b.zone_id, b.load_name) == self.key


class ResultsTable(QWidget):
    """Sortable table of bay outcomes with a lift filter. Emits
    ``trace_requested(zone_id, load_name, x, y)`` for the governing point of the
    row the user selects."""

    trace_requested = Signal(str, str, float, float)

    def __init__(self, document: Document, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._doc = document
        self._syncing = False
        self.model = BayResultsModel(self)
        self.proxy = _LiftFilter(self)
        self.proxy.setSourceModel(self.model)
        self.proxy.setSortRole(SORT_ROLE)
        self.view = QTableView()
        self.view.setModel(self.proxy)
        self.view.setSortingEnabled(True)
        self.view.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.view.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.view.setAlternatingRowColors(True)
        self.view.verticalHeader().setVisible(False)
        self.view.verticalHeader().setDefaultSectionSize(22)
        self.view.setIconSize(QSize(14, 14))
        self.view.setWordWrap(False)
        hh = self.view.horizontalHeader()
        hh.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        hh.setStretchLastSection(True)
        hh.setMinimumSectionSize(48)
        hfm = QFontMetrics(header_font(hh))
        for key, w in (("bay", 64), ("zone", 48), ("load", 130), ("outcome", 170),
                       ("util", 80), ("allow", 120), ("planned", 80), ("governing", 200)):
            header = COLUMNS[COL[key]][1]
            # the header's own (bold) font, its padding and the sort arrow
            self.view.setColumnWidth(COL[key], max(w, hfm.horizontalAdvance(header)
                                                   + HEADER_PADDING_PX))
        self.view.sortByColumn(COL["outcome"], Qt.SortOrder.DescendingOrder)
        self.view.selectionModel().selectionChanged.connect(self._on_row_selection_changed)

        self.filter = QComboBox()
        self.filter.setMinimumContentsLength(18)
        self.filter.currentIndexChanged.connect(self._on_filter_changed)
        self.summary = QLabel()
        self.summary.setObjectName("resultsSummary")
        top = QHBoxLayout()
        top.setContentsMargins(4, 2, 4, 2)
        top.addWidget(QLabel("Show:"))
        top.addWidget(self.filter)
        top.addSpacing(12)
        top.addWidget(self.summary, 1)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.setSpacing(0)
        lay.addLayout(top)
        lay.addWidget(self.view)

        document.results_changed.connect(self._on_results_changed)
        document.project_changed.connect(self._on_project_changed)
        document.selection_changed.connect(self._on_selection_changed)
        self._on_results_changed(document.results)

    # -------------------------------------------------------------- document events

    def _on_results_changed(self, results: Results | None) -> None:
        self._syncing = True
        self.model.set_data(results, self._doc.project)
        self._fill_filter(results)
        self._update_summary()
        self._select_rows_for(self._doc.selection)
        self._syncing = False

    def _on_project_changed(self, project: Project) -> None:
        self.model.set_stale(not self._doc.results_current)
        self._update_summary()

    def _on_selection_changed(self, sel: Selection | None) -> None:
        self._syncing = True
        self._select_rows_for(sel)
        self._syncing = False

    def _fill_filter(self, results: Results | None) -> None:
        current = self.filter.currentData()
        self.filter.blockSignals(True)
        self.filter.clear()
        self.filter.addItem("All lifts and loads", None)
        seen = []
        for b in results.bays if results is not None else ():
            if (b.zone_id, b.load_name) not in seen:
                seen.append((b.zone_id, b.load_name))
        for z, ld in seen:
            self.filter.addItem(f"{z} · {ld}", f"{z}\x1f{ld}")
        i = self.filter.findData(current)
        self.filter.setCurrentIndex(max(0, i))
        self.filter.blockSignals(False)
        self._apply_filter()

    def _on_filter_changed(self, _i: int) -> None:
        self._apply_filter()
        self._update_summary()

    def _apply_filter(self) -> None:
        data = self.filter.currentData()
        key = tuple(data.split("\x1f")) if data else None
        self.proxy.set_key(key)  # type: ignore[arg-type]

    def _update_summary(self) -> None:
        res = self._doc.results
        if self._doc.analysis_error:
            self.summary.setText(f"<span style='color:#6B0F24'>Analysis failed: "
                                 f"{self._doc.analysis_error}</span>")
            return
        if res is None:
            self.summary.setText("No results yet.")
            return
        counts: dict[str, int] = {}
        for b in res.bays:
            counts[b.response] = counts.get(b.response, 0) + 1
        if not res.bays:
            self.summary.setText("No drop points: add a lift zone with a load.")
            return
        parts = [f"{style.outcome(k).label}: {counts[k]}"
                 for k in reversed(style.OUTCOME_ORDER) if counts.get(k)]
        stale = "  (updating…)" if not self._doc.results_current else ""
        self.summary.setText(f"{len(res.bays)} rows, one per bay and load — "
                             + " · ".join(parts) + stale)

    # -------------------------------------------------------------- selection sync

    def selected_row(self) -> BaySummary | None:
        idx = self.view.selectionModel().selectedRows()
        if not idx:
            return None
        return self.model.row(self.proxy.mapToSource(idx[0]).row())

    def _select_rows_for(self, sel: Selection | None) -> None:
        sm = self.view.selectionModel()
        if sel is None or sel.kind != "bay":
            sm.clearSelection()
            return
        cur = self.selected_row()
        if cur is not None and (cur.level_id, cur.bay_id) == sel.ids:
            return
        # the worst row of the bay: worst outcome, then the highest utilisation (the
        # same order as the plan and the screenshot's trace use)
        best, best_key = None, (-2, -math.inf)
        for r in range(self.model.rowCount()):
            b = self.model.row(r)
            if (b.level_id, b.bay_id) != sel.ids:
                continue
            rank = style.OUTCOME_ORDER.index(b.response) if b.response in \
                style.OUTCOME_ORDER else -1
            u = b.max_utilisation if b.max_utilisation == b.max_utilisation else -math.inf
            if (rank, u) > best_key:
                best, best_key = r, (rank, u)
        if best is None:
            sm.clearSelection()
            return
        pidx = self.proxy.mapFromSource(self.model.index(best, 0))
        sm.select(pidx, QItemSelectionModel.SelectionFlag.ClearAndSelect
                  | QItemSelectionModel.SelectionFlag.Rows)
        self.view.scrollTo(pidx)

    def _on_row_selection_changed(self, *_: object) -> None:
        if self._syncing:
            return
        b = self.selected_row()
        if b is None:
            return
        self._doc.select(Selection("bay", (b.level_id, b.bay_id)))
        if math.isfinite(b.governing_x) and math.isfinite(b.governing_y):
            self.trace_requested.emit(b.zone_id, b.load_name, b.governing_x, b.governing_y)

    def select_row(self, row: int) -> None:
        """Select the view row ``row`` (as a click would)."""
        pidx = self.proxy.index(row, 0)
        self.view.selectionModel().select(
            pidx, QItemSelectionModel.SelectionFlag.ClearAndSelect
            | QItemSelectionModel.SelectionFlag.Rows)

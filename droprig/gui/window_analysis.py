"""The main window's side of the live analysis: the status of the runner, results
installed in the panels, and the calculation trace of a drop point.

A part of :class:`droprig.gui.main_window.MainWindow` (a mixin)."""

from __future__ import annotations

import math

from PySide6.QtCore import QTimer

from droprig.gui import style
from droprig.gui.document import Selection
from droprig.gui.window_base import WindowParts, describe
from droprig.model import Project
from droprig.solver import Results, ZoneCache, analyse_outcomes


class AnalysisMixin(WindowParts):
    """The main window's side of the live analysis."""

    def _live_cache(self) -> ZoneCache:
        cache: ZoneCache | None = getattr(self, "_zone_cache", None)
        if cache is None:
            cache = self._zone_cache = ZoneCache()
        return cache

    def analyse_live(self, project: Project) -> Results:
        """The runner's analysis: :func:`droprig.solver.analyse` with each zone's
        results remembered by the frozen model objects that feed it
        (:class:`droprig.solver.ZoneCache`), so an edit to one zone or its loads
        re-analyses that zone only — the same results as a full analysis, bit for
        bit. One cache per window; the runner's single worker thread and its
        synchronous runs share it (the cache holds a lock)."""
        return self._live_cache().analyse(project)

    def analyse_live_outcomes(self, project: Project) -> Results | None:
        """The runner's first stage: the outcomes of the zones the cache does not
        hold, before their limits are confirmed (:func:`droprig.solver.analyse_outcomes`);
        ``None`` when it holds them all (an undo, a redo: the confirmed results come
        at once)."""
        return analyse_outcomes(project, self._live_cache())

    def _on_results_changed(self, results: Results | None) -> None:
        self._refresh_trace()
        self._fill_case_combo()
        self._update_state_label()
        self._update_heading()

    def _refresh_trace(self) -> None:
        """The trace on show follows the project: re-worked for the same point once
        new results are in, cleared when its lift or load is gone."""
        t = self.trace_panel.trace
        if t is None or not self.doc.results_current:
            return
        p = self.doc.project
        if getattr(self, "_traced_project", None) is p:
            return  # the outcomes came first: the trace of this project is on show
        self._traced_project = p
        if not any(z.id == t.zone_id and any(ld.name == t.load_name for ld in z.loads)
                   for z in p.lift_zones):
            self.trace_panel.show_trace(None)
            return
        try:
            from droprig.solver import trace_point

            new = trace_point(p, t.zone_id, t.load_name, t.x, t.y)
        except Exception:  # the point may have left the zone: nothing stale stays
            self.trace_panel.show_trace(None)
            return
        self.trace_panel.show_trace(new, p.settings.unit_system)

    def _on_busy_changed(self, busy: bool) -> None:
        self.busy.setVisible(busy)
        self._update_state_label()

    def _on_analysis_finished(self, seconds: float) -> None:
        self._update_state_label()

    def _update_state_label(self) -> None:
        if self.runner.busy:
            if self.doc.results_current and not self.doc.results_confirmed:
                # the outcomes are in; the limits are still being tried
                self.state_label.setText("Outcomes shown · confirming limits…")
            else:
                self.state_label.setText("Analysing…")
            self.state_label.setStyleSheet("color: #173F66;")
            return
        if self.doc.analysis_error:
            self.state_label.setText("Analysis failed — see the results panel")
            self.state_label.setToolTip(self.doc.analysis_error)
            self.state_label.setStyleSheet("color: #6B0F24; font-weight: 600;")
            return
        res = self.doc.results
        self.state_label.setStyleSheet("")
        self.state_label.setToolTip("")
        if res is None:
            self.state_label.setText("Not analysed")
        elif not res.cases:
            self.state_label.setText("Nothing to analyse")
        else:
            secs = self.runner.last_seconds
            t = f" in {fmt_seconds(secs)}" if math.isfinite(secs) else ""
            text = f"Up to date · {res.n_points:,} drop points{t}"
            if res.warnings:
                # what the analysis could not assess or found already over capacity:
                # said on screen, listed on hover (also in the annex and the CLI)
                n = len(res.warnings)
                text += f" · ⚠ {n} warning{'s' if n > 1 else ''}"
                self.state_label.setStyleSheet("color: #6B4A00; font-weight: 600;")
                self.state_label.setToolTip("\n".join(f"• {w}" for w in res.warnings))
            self.state_label.setText(text)

    def _on_point_clicked(self, zone_id: str, load_name: str, x: float, y: float) -> None:
        self.show_trace(zone_id, load_name, x, y)

    def show_trace(self, zone_id: str, load_name: str, x: float, y: float) -> bool:
        """Compute and show the calculation trace of one drop point."""
        try:
            from droprig.solver import trace_point

            trace = trace_point(self.doc.project, zone_id, load_name, x, y)
        except Exception as exc:  # a message in the status bar, never a crash
            self.statusBar().showMessage(f"Calculation trace: {describe(exc)}", 10_000)
            return False
        self.trace_panel.show_trace(trace, self.doc.project.settings.unit_system)
        self.trace_dock.show()
        self.trace_dock.raise_()
        return True

    def prepare_screenshot(self) -> None:
        """Synchronous analysis, select the worst bay and show its governing
        point's trace (so a grab shows every panel filled). Results already current
        (the window analysed the file as it opened) are kept, so the status bar shows
        that analysis's time, not a re-run from the remembered rows ("in 0.00 s" in
        the README's screenshot)."""
        if not (self.doc.results_current and self.doc.results_confirmed):
            self.runner.run_now()
        res = self.doc.results
        if res is not None and res.bays:
            order = {k: i for i, k in enumerate(style.OUTCOME_ORDER)}
            worst = max(res.bays, key=lambda b: (order.get(b.response, -1),
                                                 b.max_utilisation))
            self.doc.select(Selection("bay", (worst.level_id, worst.bay_id)))
            if math.isfinite(worst.governing_x):
                self.show_trace(worst.zone_id, worst.load_name, worst.governing_x,
                                worst.governing_y)
        QTimer.singleShot(0, self.plan.fit)


def fmt_seconds(secs: float) -> str:
    """An analysis's wall time for the status bar: milliseconds below a second (rows
    remembered from the last run come back in a few: "0.00 s" read as if nothing had
    run), seconds with two decimals above."""
    if secs < 0.0005:
        return "under 1 ms"
    if secs < 1.0:
        return f"{round(secs * 1000)} ms"
    return f"{secs:.2f} s"

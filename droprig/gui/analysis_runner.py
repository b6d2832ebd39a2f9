"""Live re-analysis off the UI thread.

After every project change the runner analyses the new project on a worker
thread and installs the results in the document. Edits are throttled at both
edges: the first edit after a quiet spell starts at once (a finished handle drag
repaints without waiting), further edits inside ``debounce_ms`` (150 ms) are
coalesced into one run at the end of the window. Each run carries a generation
number; results of a run overtaken by a newer edit are discarded, never shown.

A run in two stages (``outcomes``): the outcomes of the edit first — every point's
and bay's response and utilisation, the forward analysis alone
(:func:`droprig.solver.analyse_outcomes`) — installed at once as *not confirmed*
(``Document.results_confirmed`` False: the panels show limits, conditions and
verdicts as "confirming…"), then, on the same worker thread, the analysis whose
limits are confirmed, which replaces them. The worker starts the confirmation once
the window has drawn the outcomes (or after :data:`PAINT_WAIT_S`): both hold the
interpreter lock in turns, and the drawing comes first. A newer edit cancels the run
in either stage; neither stage of a stale run is ever installed.
"""

from __future__ import annotations

import threading
import time
import traceback
from collections.abc import Callable

from PySide6.QtCore import QObject, QRunnable, QThreadPool, QTimer, Signal

from droprig.gui.document import Document
from droprig.model import Project
from droprig.solver import AnalysisCancelledError, CancelToken, Results, cancellable

AnalyseFn = Callable[[Project], Results]
OutcomesFn = Callable[[Project], "Results | None"]
"""The first stage: the outcomes before the limits are confirmed, or ``None`` when
the confirmed results are at hand (a zone cache holds them)."""
PAINT_WAIT_S = 0.25
"""s: the longest the worker waits for the window to draw the outcomes before it
confirms their limits."""


def _default_analyse(project: Project) -> Results:
    from droprig.solver import analyse

    return analyse(project)


def describe_analysis_error(exc: BaseException) -> str:
    """One line for the status bar / results panel."""
    from droprig.texts import describe_error

    return describe_error(exc)


class _JobSignals(QObject):
    done = Signal(int, object, str, float)  # generation, results | None, error, seconds
    outcomes = Signal(int, object, float)  # generation, unconfirmed results, seconds


class _Job(QRunnable):
    def __init__(self, fn: AnalyseFn, project: Project, generation: int,
                 signals: _JobSignals, token: CancelToken | None = None,
                 outcomes: OutcomesFn | None = None,
                 drawn: threading.Event | None = None) -> None:
        super().__init__()
        self.setAutoDelete(True)
        self._token = token or CancelToken()
        self._fn = fn
        self._outcomes = outcomes
        self._drawn = drawn
        self._project = project
        self._generation = generation
        self._signals = signals

    def run(self) -> None:
        t0 = time.perf_counter()
        results, error = None, ""
        try:
            with cancellable(self._token):
                if self._outcomes is not None:
                    early = self._outcomes(self._project)
                    if early is not None:
                        self._signals.outcomes.emit(self._generation, early,
                                                    time.perf_counter() - t0)
                        if self._drawn is not None:
                            self._drawn.wait(PAINT_WAIT_S)
                results = self._fn(self._project)
        except AnalysisCancelledError:  # overtaken by an edit or the window closing
            results, error = None, ""
        except Exception as exc:  # reported in the window, never raised in the worker
            error = describe_analysis_error(exc)
            if "unexpected error" in error:
                error += "\n" + "".join(traceback.format_exception_only(exc)).strip()
        self._signals.done.emit(self._generation, results, error, time.perf_counter() - t0)


class AnalysisRunner(QObject):
    """Keeps ``document.results`` up to date with ``document.project``.

    Signals: ``busy_changed(bool)``; ``outcomes_shown(float seconds)`` after the
    outcomes of the current project were installed, not yet confirmed (``outcomes``
    given); ``finished(float seconds)`` after results (or an error) for the current
    project were installed, confirmed. The runner stays busy until then.
    """

    busy_changed = Signal(bool)
    outcomes_shown = Signal(float)
    finished = Signal(float)

    def __init__(self, document: Document, *, analyse: AnalyseFn | None = None,
                 outcomes: OutcomesFn | None = None,
                 debounce_ms: int = 150, threaded: bool = True,
                 parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._document = document
        self._analyse = analyse or _default_analyse
        self._outcomes = outcomes
        self._threaded = threaded
        self._generation = 0
        self._running = False
        self._pending = False
        self._busy = False
        self._stopped = False
        self._token = CancelToken()
        self.last_seconds = float("nan")
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._signals = _JobSignals(self)
        self._signals.done.connect(self._on_job_done)
        self._signals.outcomes.connect(self._on_outcomes)
        self._drawn: threading.Event | None = None
        self.outcomes_seconds = float("nan")
        self._cooldown = QTimer(self)
        self._cooldown.setSingleShot(True)
        self._cooldown.setInterval(debounce_ms)
        self._cooldown.timeout.connect(self._on_cooldown_timeout)
        document.project_changed.connect(self._on_project_changed)

    # -------------------------------------------------------------- state

    @property
    def busy(self) -> bool:
        """True while an analysis runs or an edit waits to be analysed."""
        return self._busy

    @property
    def generation(self) -> int:
        return self._generation

    def _set_busy(self, busy: bool) -> None:
        if busy != self._busy:
            self._busy = busy
            self.busy_changed.emit(busy)

    # -------------------------------------------------------------- requests

    def _on_project_changed(self, project: Project) -> None:
        if not self._stopped:
            self.request()

    def request(self) -> None:
        """Analyse the current project soon (throttled as described above)."""
        self._generation += 1
        self._pending = True
        self._set_busy(True)
        if self._running:
            self._token.cancel()  # the running analysis is stale: stop it (< 1 s)
            if self._drawn is not None:
                self._drawn.set()
        if not self._running and not self._cooldown.isActive():
            self._launch()

    def _launch(self) -> None:
        doc = self._document
        project = doc.project
        gen = self._generation
        self._pending = False
        self._cooldown.start()
        if not project.lift_zones or not project.levels:
            # Nothing to drop: an empty result is the true answer, no thread needed.
            doc.set_results(Results(), "", project)
            self._after_install(0.0)
            return
        self._running = True
        self._token = CancelToken()
        self._drawn = threading.Event() if self._threaded else None
        job = _Job(self._analyse, project, gen, self._signals, self._token, self._outcomes,
                   self._drawn)
        if self._threaded:
            self._pool.start(job)
        else:
            job.run()

    def _on_outcomes(self, generation: int, results: Results, seconds: float) -> None:
        """The first stage of the current run: shown at once, not confirmed. A stale
        run's (overtaken by an edit) is dropped, as its final results are."""
        drawn = self._drawn
        if generation != self._generation:
            if drawn is not None:
                drawn.set()  # a stale run: on to its cancellation at once
            return
        self.outcomes_seconds = seconds
        self._document.set_results(results, "", self._document.project, confirmed=False)
        self.outcomes_shown.emit(seconds)
        if drawn is not None:
            # after the repaints the installation posted (Qt delivers posted events
            # before it fires a zero timer)
            QTimer.singleShot(0, drawn.set)

    def _on_job_done(self, generation: int, results: Results | None, error: str,
                     seconds: float) -> None:
        self._running = False
        self.last_seconds = seconds
        if generation == self._generation:
            self._document.set_results(results, error, self._document.project)
            self._after_install(seconds)
        elif not self._cooldown.isActive() and self._pending:
            self._launch()

    def _after_install(self, seconds: float) -> None:
        if not self._pending:
            self._set_busy(False)
            self.finished.emit(seconds)

    def _on_cooldown_timeout(self) -> None:
        if self._pending and not self._running:
            self._launch()

    # -------------------------------------------------------------- synchronous use

    def run_now(self) -> None:
        """Analyse the current project on this thread and install the results
        (screenshots, benchmarks, tests). Overrides any queued run."""
        self.wait_idle()
        self._cooldown.stop()
        self._generation += 1
        self._pending = False
        project = self._document.project
        t0 = time.perf_counter()
        if not project.lift_zones or not project.levels:
            self._document.set_results(Results(), "", project)
        else:
            try:
                self._document.set_results(self._analyse(project), "", project)
            except Exception as exc:
                self._document.set_results(None, describe_analysis_error(exc), project)
        self.last_seconds = time.perf_counter() - t0
        self._set_busy(False)
        self.finished.emit(self.last_seconds)

    def wait_idle(self, timeout_ms: int = 60_000) -> bool:
        """Block until the worker thread is idle (does not process queued results).

        Polls with :func:`time.sleep`, which releases the GIL: a blocking
        ``QThreadPool.waitForDone`` would hold it and deadlock a worker that is
        still running Python code.
        """
        deadline = time.monotonic() + timeout_ms / 1000
        while self._pool.activeThreadCount() > 0:
            if time.monotonic() > deadline:
                return False
            time.sleep(0.002)
        return True

    def shutdown(self) -> None:
        """Stop timers and wait for a running job (call before the window goes)."""
        self._stopped = True
        self._cooldown.stop()
        self._token.cancel()  # a running analysis stops at its next block (< 1 s)
        if self._drawn is not None:
            self._drawn.set()
        self.wait_idle(5_000)

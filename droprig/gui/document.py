"""The open project: current :class:`Project`, file path, undo stack, selection,
latest results, and the autosave / crash-recovery files.

Widgets take a :class:`Document` and subscribe to its signals; they never keep a
copy of the project. Every edit goes through :meth:`Document.edit`, which pushes a
:class:`~droprig.gui.commands.ProjectEdit` (undoable); the edits themselves are
pure functions in :mod:`droprig.gui.edits`.
"""

from __future__ import annotations

import contextlib
import json
import os
import time
import uuid
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from PySide6.QtCore import QLockFile, QObject, QTimer, Signal
from PySide6.QtGui import QUndoStack

from droprig.gui.commands import ProjectEdit
from droprig.model import Level, Project, bays
from droprig.solver import Results

if TYPE_CHECKING:
    from droprig.permit import PermitConditions

# ------------------------------------------------------------------ selection

SELECTION_KINDS = ("info", "settings", "level", "deck", "opening", "member", "zone", "load",
                   "protection", "bay")


@dataclass(frozen=True)
class Selection:
    """What the user has selected, by ids (never by object, so it survives edits).

    ``ids`` by kind: info/settings: (); level/deck: (level_id,);
    opening: (level_id, index); member: (level_id, member_id); zone: (zone_id,);
    load: (zone_id, load_name); protection: (protection_id,);
    bay: (level_id, bay_id).
    """

    kind: str
    ids: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        if self.kind not in SELECTION_KINDS:
            raise ValueError(f"selection kind {self.kind!r}; allowed: {SELECTION_KINDS}")


def resolve(project: Project, sel: Selection | None) -> object | None:
    """The model object ``sel`` points at in ``project``, or ``None`` if gone."""
    if sel is None:
        return None
    try:
        k, ids = sel.kind, sel.ids
        if k == "info":
            return project.info
        if k == "settings":
            return project.settings
        if k == "level":
            return project.level(ids[0])
        if k == "deck":
            return project.level(ids[0]).deck
        if k == "opening":
            return project.level(ids[0]).deck.openings[int(ids[1])]
        if k == "member":
            return project.level(ids[0]).member(ids[1])
        if k == "zone":
            return project.zone(ids[0])
        if k == "load":
            z = project.zone(ids[0])
            return next(ld for ld in z.loads if ld.name == ids[1])
        if k == "protection":
            return next(a for a in project.protection_areas if a.id == ids[0])
        if k == "bay":
            return next(b for b in bays(project.level(ids[0])) if b.id == ids[1])
    except (KeyError, IndexError, ValueError, StopIteration):
        return None
    return None


def level_of(project: Project, sel: Selection | None) -> str | None:
    """The level a selection lives on (to show it in the plan), if any."""
    obj = resolve(project, sel)
    if sel is None or obj is None:
        return None
    if sel.kind in ("level", "deck", "opening", "member", "bay"):
        return sel.ids[0]
    if sel.kind in ("zone", "load"):
        return project.zone(sel.ids[0]).level_id
    if sel.kind == "protection":
        return obj.level_id  # type: ignore[attr-defined]
    return None


# ------------------------------------------------------------------ document


class Document(QObject):
    """One open project.

    Signals: ``project_changed(Project)`` after every swap (edit, undo, redo,
    open, new); ``results_changed(Results | None)`` when analysis results (or an
    analysis error) arrive; ``selection_changed(Selection | None)``;
    ``level_changed(str)`` when the level shown in the plan changes;
    ``path_changed(Path | None)``; ``dirty_changed(bool)``.
    """

    project_changed = Signal(object)
    results_changed = Signal(object)
    selection_changed = Signal(object)
    level_changed = Signal(str)
    path_changed = Signal(object)
    dirty_changed = Signal(bool)
    case_changed = Signal(object)
    """The lift and load the plan and the results table show: ``(zone_id,
    load_name)``, or ``None`` for all lifts (worst per bay)."""

    def __init__(self, project: Project | None = None, path: Path | None = None,
                 parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._project = project if project is not None else Project()
        self._path = Path(path) if path else None
        self._selection: Selection | None = None
        self._level_id = self._project.levels[0].id if self._project.levels else ""
        self._case: tuple[str, str] | None = None
        self._results: Results | None = None
        self._results_project: Project | None = None
        self._confirmed = True
        self._analysis_error = ""
        self._permit: tuple[Project, Results, PermitConditions] | None = None
        self.revision = 0
        """Incremented on every swap (autosave writes only when it moved)."""
        self.undo_stack = QUndoStack(self)
        self.undo_stack.cleanChanged.connect(self._on_clean_changed)
        self._force_dirty = False

    # -------------------------------------------------------------- state

    @property
    def project(self) -> Project:
        return self._project

    @property
    def path(self) -> Path | None:
        return self._path

    @property
    def is_dirty(self) -> bool:
        return self._force_dirty or not self.undo_stack.isClean()

    @property
    def title(self) -> str:
        name = self._path.name if self._path else "untitled.droprig"
        return name

    @property
    def selection(self) -> Selection | None:
        return self._selection

    @property
    def level_id(self) -> str:
        """The level shown in the plan ('' when the project has no level)."""
        return self._level_id

    @property
    def level(self) -> Level | None:
        try:
            return self._project.level(self._level_id)
        except KeyError:
            return None

    @property
    def results(self) -> Results | None:
        """Latest results, or ``None`` (not run yet, or the analysis failed)."""
        return self._results

    @property
    def results_current(self) -> bool:
        """True when :attr:`results` belong to the current project."""
        return self._results is not None and self._results_project is self._project

    @property
    def results_confirmed(self) -> bool:
        """True when :attr:`results` belong to the current project and their limits
        are confirmed (:func:`droprig.solver.analyse`). False while only the outcomes
        of an edit are in (:func:`droprig.solver.analyse_outcomes`: every point's and
        bay's response and utilisation final, the limits still being tried): panels
        then show limits, conditions and verdicts as "confirming…", never the
        untried values, and the annex waits for the confirmed results."""
        return self.results_current and self._confirmed

    @property
    def limits_pending(self) -> bool:
        """True when the installed :attr:`results` (current or not) are outcomes
        whose limits were still being confirmed when they were installed."""
        return self._results is not None and not self._confirmed

    @property
    def analysis_error(self) -> str:
        return self._analysis_error

    # -------------------------------------------------------------- edits

    def edit(self, after: Project, text: str, *, select: Selection | None = None) -> bool:
        """Push an undoable swap to ``after``. Returns False (and pushes
        nothing) if ``after`` equals the current project.

        ``select``: the selection that goes with ``after`` when the edit changes
        the selected object's ids (a load renamed). It is installed before any
        panel hears of the new project, so no panel sees a selection that points
        at nothing; undo brings the old selection back with the old project."""
        if after == self._project:
            return False
        before_sel = self._selection if select is not None else None
        self.undo_stack.push(ProjectEdit(self, self._project, after, text,
                                         before_sel, select))
        return True

    def _swap(self, project: Project, selection: object = None) -> None:
        """Install ``project`` (called by undo commands only), with ``selection``
        when given (see :meth:`edit`)."""
        self._project = project
        old_sel = self._selection
        if isinstance(selection, Selection) and resolve(project, selection) is not None:
            self._selection = selection
        self.revision += 1
        if project.levels and self._level_id not in {lv.id for lv in project.levels}:
            self._level_id = project.levels[0].id
            self.level_changed.emit(self._level_id)
        elif not project.levels and self._level_id:
            self._level_id = ""
            self.level_changed.emit("")
        if self._case is not None:
            zones = {z.id: {ld.name for ld in z.loads} for z in project.lift_zones}
            if self._case[1] not in zones.get(self._case[0], set()):
                self._case = None
                self.case_changed.emit(None)
        self.project_changed.emit(project)
        if self._selection is not None and resolve(project, self._selection) is None:
            self.select(None)
        elif self._selection != old_sel:
            self.selection_changed.emit(self._selection)

    def reset(self, project: Project, path: Path | None = None, *, dirty: bool = False) -> None:
        """Replace the whole document (open, new, recover): clears undo history."""
        if path is None or (self._path is not None and Path(path) != self._path):
            self.release_lock()
            self._disk = None
        self.undo_stack.clear()
        self.open_notes = ()
        self._force_dirty = dirty
        self._path = Path(path) if path else None
        self._results = None
        self._results_project = None
        self._confirmed = True
        self._analysis_error = ""
        self._selection = None
        self._level_id = project.levels[0].id if project.levels else ""
        self._swap(project)
        self.level_changed.emit(self._level_id)
        self.selection_changed.emit(None)
        self.results_changed.emit(None)
        self.path_changed.emit(self._path)
        self.dirty_changed.emit(self.is_dirty)

    # -------------------------------------------------------------- files

    open_notes: tuple[str, ...] = ()
    """What the conversion of the file last opened from an older format changed in
    meaning, in words for the user (``load_project(notes=…)``); empty for a file of
    the current format and after new, close or recovery."""

    def open(self, path: str | Path) -> None:
        """Load ``path``; raises ``ProjectFileError`` and leaves the document
        unchanged if the file cannot be read. A file of an older format is converted
        and :attr:`open_notes` says what that changed in meaning."""
        from droprig.io.project_file import load_project

        notes: list[str] = []
        project = load_project(Path(path), notes=notes)
        self.reset(project, Path(path))
        self.open_notes = tuple(notes)
        self._guard_opened(Path(path))

    def save(self, path: str | Path | None = None, *, force: bool = False) -> Path:
        """Atomic save to ``path`` (default: the current path); marks clean. Refuses
        (:class:`droprig.gui.file_guard.SaveGuardError`) a read-only file or one that
        changed on disk since it was opened or saved here, unless ``force``."""
        from droprig.io.project_file import save_project

        target = Path(path) if path is not None else self._path
        if target is None:
            raise ValueError("no file name: use save as")
        if not force:  # changed on disk since opened, or read-only: refused (file_guard)
            from droprig.gui.file_guard import save_problem

            same = self._path is not None and target.resolve() == self._path.resolve()
            problem = save_problem(target, self._disk if same else None)
            if problem is not None:
                raise problem
        save_project(self._project, target)
        self._guard_opened(target)
        changed = target != self._path
        self._path = target
        self._force_dirty = False
        self.undo_stack.setClean()
        if changed:
            self.path_changed.emit(target)
        self.dirty_changed.emit(False)
        return target

    def _on_clean_changed(self, clean: bool) -> None:
        self.dirty_changed.emit(self.is_dirty)

    # -------------------------------------------------------------- file guard hooks
    _disk = None
    _lock = None
    lock_warning = ""

    def _guard_opened(self, path: Path) -> None:
        """Remember the file as on disk now, hold its lock (a second window is warned:
        ``lock_warning``) and remove temporary files a killed save left beside it."""
        from droprig.gui.file_guard import ProjectLock, clean_stale_temps, disk_stamp

        self._disk = disk_stamp(path)
        if self._lock is None or self._lock.path != ProjectLock(path).path:
            self.release_lock()
            self._lock = ProjectLock(path)
            self.lock_warning = self._lock.acquire() or ""
        clean_stale_temps(path.parent)

    def release_lock(self) -> None:
        """Let go of the open file's lock (window closed, another file opened)."""
        if self._lock is not None:
            self._lock.release()
            self._lock = None
        self.lock_warning = ""

    # -------------------------------------------------------------- view state

    def select(self, sel: Selection | None) -> None:
        if sel is not None and resolve(self._project, sel) is None:
            sel = None
        if sel == self._selection:
            return
        self._selection = sel
        lv = level_of(self._project, sel)
        if lv and lv != self._level_id:
            self.set_level(lv)
        self.selection_changed.emit(sel)

    @property
    def results_project(self) -> Project | None:
        """The project the results on hand were worked out for."""
        return self._results_project

    @property
    def case(self) -> tuple[str, str] | None:
        """The one lift / load filter shared by the plan and the results table."""
        return self._case

    def set_case(self, case: tuple[str, str] | None) -> None:
        """Show ``(zone_id, load_name)`` only, or every lift (``None``). A case
        that is not in the project falls back to ``None``."""
        if case is not None:
            zones = {z.id: {ld.name for ld in z.loads} for z in self._project.lift_zones}
            if case[1] not in zones.get(case[0], set()):
                case = None
        if case == self._case:
            return
        self._case = case
        self.case_changed.emit(case)

    def set_level(self, level_id: str) -> None:
        if level_id == self._level_id:
            return
        self._project.level(level_id)  # KeyError if unknown
        self._level_id = level_id
        self.level_changed.emit(level_id)

    def set_results(self, results: Results | None, error: str = "",
                    project: Project | None = None, *, confirmed: bool = True) -> None:
        """Install analysis results for ``project`` (default: the current one);
        ``confirmed=False`` for outcomes whose limits are still being confirmed
        (:attr:`results_confirmed`)."""
        self._results = results
        self._results_project = project if project is not None else self._project
        self._confirmed = confirmed
        self._analysis_error = error
        self._permit = None
        self.results_changed.emit(results)

    def permit(self, project: Project, results: Results) -> PermitConditions:
        """:func:`droprig.permit.derive_conditions` of ``project`` and ``results``,
        derived once for the results installed and shared by the panels that show it
        (the results table, the inspector): the same object for the same two."""
        got = self._permit
        if got is not None and got[0] is project and got[1] is results:
            return got[2]
        from droprig.permit import derive_conditions

        permit = derive_conditions(project, results)
        self._permit = (project, results, permit)
        return permit


# ------------------------------------------------------------------ autosave


def recovery_dir(settings_dir: Path) -> Path:
    return settings_dir / "recovery"


@dataclass(frozen=True)
class RecoveryCandidate:
    """An autosave left behind by a session that did not close cleanly."""

    project_file: Path
    meta_file: Path
    original_path: Path | None
    saved_at: float


class Autosaver(QObject):
    """Writes the document to ``<settings>/recovery/<session>.droprig`` every
    ``interval_ms`` (2 minutes) when it changed, plus a small JSON note with the
    original file name. A lock file marks the session alive; a clean close
    removes all three. A session that crashed leaves its autosave with a stale
    lock, which :func:`find_recoverable` reports on the next start.
    """

    INTERVAL_MS = 120_000

    def __init__(self, document: Document, settings_dir: Path,
                 interval_ms: int = INTERVAL_MS, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._document = document
        self._dir = recovery_dir(settings_dir)
        self._session = uuid.uuid4().hex[:12]
        self._lock: QLockFile | None = None
        self._written_revision = -1
        self.last_error = ""
        self.timer = QTimer(self)
        self.timer.setInterval(interval_ms)
        self.timer.timeout.connect(self._on_timeout)
        self.timer.start()

    @property
    def project_file(self) -> Path:
        return self._dir / f"{self._session}.droprig"

    @property
    def meta_file(self) -> Path:
        return self._dir / f"{self._session}.json"

    @property
    def lock_file(self) -> Path:
        return self._dir / f"{self._session}.lock"

    def _ensure_lock(self) -> None:
        if self._lock is None:
            self._dir.mkdir(parents=True, exist_ok=True)
            self._lock = QLockFile(str(self.lock_file))
            self._lock.setStaleLockTime(0)
            self._lock.tryLock(0)

    def _on_timeout(self) -> None:
        self.write()

    def write(self, *, force: bool = False) -> bool:
        """Write the autosave if the document changed since the last one and has
        unsaved changes. Returns True if a file was written."""
        doc = self._document
        if not force and (doc.revision == self._written_revision or not doc.is_dirty):
            return False
        from droprig.io.atomic import atomic_write_bytes
        from droprig.io.project_file import save_project

        try:
            self._ensure_lock()
            save_project(doc.project, self.project_file, backup=False)
            meta = {"original_path": str(doc.path) if doc.path else None,
                    "saved_at": time.time(), "pid": os.getpid()}
            atomic_write_bytes(self.meta_file, json.dumps(meta).encode("utf-8"))
        except Exception as exc:  # autosave must never take the application down
            self.last_error = f"autosave failed: {exc}"
            return False
        self._written_revision = doc.revision
        self.last_error = ""
        return True

    def discard(self) -> None:
        """Remove this session's autosave (after a save or a clean close)."""
        for f in (self.project_file, self.meta_file, self.project_file.with_suffix(".droprig.bak")):
            with contextlib.suppress(FileNotFoundError):
                f.unlink()
        self._written_revision = -1

    def close(self) -> None:
        """Clean shutdown: stop the timer, remove the files and release the lock."""
        self.timer.stop()
        self.discard()
        if self._lock is not None:
            self._lock.unlock()
            self._lock = None

    def abandon(self) -> None:
        """Stop without cleaning up, as a crash would (tests only)."""
        self.timer.stop()
        if self._lock is not None:
            self._lock.unlock()  # a dead process's lock counts as stale anyway
            self._lock = None


def find_recoverable(settings_dir: Path) -> list[RecoveryCandidate]:
    """Autosaves of sessions that are no longer running, newest first."""
    d = recovery_dir(settings_dir)
    out: list[RecoveryCandidate] = []
    if not d.is_dir():
        return out
    for meta in d.glob("*.json"):
        proj = meta.with_suffix(".droprig")
        if not proj.is_file():
            continue
        lock = QLockFile(str(meta.with_suffix(".lock")))
        lock.setStaleLockTime(0)  # stale only when its process is gone, never by age
        if not lock.tryLock(0):  # held by a live session (this or another process)
            continue
        lock.unlock()
        try:
            info = json.loads(meta.read_text(encoding="utf-8"))
            orig = info.get("original_path")
            saved = float(info.get("saved_at", proj.stat().st_mtime))
        except (OSError, ValueError, TypeError):
            orig, saved = None, proj.stat().st_mtime
        out.append(RecoveryCandidate(proj, meta, Path(orig) if orig else None, saved))
    out.sort(key=lambda c: c.saved_at, reverse=True)
    return out


def discard_recoverable(c: RecoveryCandidate) -> None:
    for f in (c.project_file, c.meta_file, c.project_file.with_suffix(".droprig.bak"),
              c.meta_file.with_suffix(".lock")):
        with contextlib.suppress(FileNotFoundError):
            f.unlink()

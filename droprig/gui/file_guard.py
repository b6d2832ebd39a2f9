"""Saving like a trusted editor (issue 16, item 7): the window never silently
overwrites a project that changed on disk or is read-only, warns when a second
window opens the same file, autosaves soon after the first edit and then
periodically with failures shown, and cleans temporary files a killed save left.

Qt-light: the checks are plain functions on paths (tested without a window); the
window calls them through small hooks in ``document.py`` and ``main_window.py``.
Rules are droprig's own (common practice for desktop editors, no source).
"""

from __future__ import annotations

import hashlib
import os
import socket
import stat
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QLockFile, QObject, QTimer

__all__ = [
    "DiskStamp",
    "FileChangedError",
    "ProjectLock",
    "ReadOnlyError",
    "SaveGuardError",
    "clean_stale_temps",
    "disk_stamp",
    "save_problem",
]

STALE_TEMP_SECONDS = 600.0
"""A temporary file of an atomic save older than this (s) was left by a killed
process (a save takes well under a second) and is removed."""


class SaveGuardError(OSError):
    """A save refused to protect a file on disk; the message says why and what to do."""


class FileChangedError(SaveGuardError):
    """The file changed on disk since it was opened or last saved."""


class ReadOnlyError(SaveGuardError):
    """The file (or its folder) is marked read-only."""


@dataclass(frozen=True)
class DiskStamp:
    """What a file was when droprig read or wrote it: modification time (ns), size
    (bytes) and SHA-256 of its bytes."""

    mtime_ns: int
    size: int
    sha256: str


def disk_stamp(path: str | os.PathLike[str]) -> DiskStamp | None:
    """The stamp of ``path`` now, or None when it does not exist."""
    p = Path(path)
    try:
        st = p.stat()
        digest = hashlib.sha256(p.read_bytes()).hexdigest()
    except FileNotFoundError:
        return None
    return DiskStamp(st.st_mtime_ns, st.st_size, digest)


def _changed(path: Path, known: DiskStamp) -> bool:
    try:
        st = path.stat()
    except FileNotFoundError:
        return False  # deleted meanwhile: saving recreates it, nothing is lost
    if st.st_mtime_ns == known.mtime_ns and st.st_size == known.size:
        return False
    now = disk_stamp(path)
    return now is not None and now.sha256 != known.sha256


def save_problem(path: str | os.PathLike[str], known: DiskStamp | None) -> SaveGuardError | None:
    """Why saving to ``path`` must not go ahead without asking, or None.

    * the file is read-only (no write permission bit for anyone, or not writable by
      this user): :class:`ReadOnlyError` — an atomic replace would otherwise swap
      a new, writable file in;
    * ``known`` (the stamp when this window opened or last saved it) no longer
      matches: modification time or size differ *and* the bytes differ —
      :class:`FileChangedError` (another window or program saved it)."""
    p = Path(os.path.realpath(os.fspath(path)))
    try:
        st = p.stat()
    except FileNotFoundError:
        return None
    if not (st.st_mode & (stat.S_IWUSR | stat.S_IWGRP | stat.S_IWOTH)) or \
            not os.access(p, os.W_OK):
        return ReadOnlyError(f"{p.name} is read-only; droprig does not replace it. Save under "
                             "another name (File › Save As) or make the file writable.")
    if known is not None and _changed(p, known):
        return FileChangedError(
            f"{p.name} changed on disk since this window opened or saved it (another window "
            "or program wrote it). Saving now would lose those changes: save under another "
            "name (File › Save As), or reopen the file.")
    return None


class ProjectLock:
    """A lock file beside an open project (``.<name>.lock``) naming the process and
    host that hold it. :meth:`acquire` returns None when this window holds it, or a
    sentence naming the live holder (a second window on the same file); a lock whose
    process is gone is stale and taken over."""

    def __init__(self, path: str | os.PathLike[str]) -> None:
        p = Path(os.path.realpath(os.fspath(path)))
        self.path = p.with_name(f".{p.name}.lock")
        self._lock = QLockFile(str(self.path))
        self._lock.setStaleLockTime(0)  # stale only when its process is gone

    def acquire(self) -> str | None:
        try:
            if self._lock.tryLock(0):
                return None
        except Exception:  # a folder without write permission: no lock, no warning
            return None
        info = self._lock.getLockInfo()  # PySide6: (pid, hostname, appname)
        if not isinstance(info, tuple) or len(info) < 2 or not info[0]:
            return None
        pid, host = info[-3], info[-2]
        where = "this computer" if host == socket.gethostname() else f"computer {host}"
        return (f"{self.path.name[1:-5]} is already open in another droprig window "
                f"(process {pid} on {where}). Edits in both windows would overwrite each "
                "other; close one of them.")

    def release(self) -> None:
        if self._lock.isLocked():
            self._lock.unlock()


def clean_stale_temps(folder: str | os.PathLike[str], *, older_than: float = STALE_TEMP_SECONDS,
                      now: float | None = None) -> list[Path]:
    """Remove temporary files of atomic saves (``.<name>.<hex>.tmp``, written by
    :mod:`droprig.io.atomic`) older than ``older_than`` seconds from ``folder``;
    returns the paths removed. Other files are never touched."""
    now = time.time() if now is None else now
    removed: list[Path] = []
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return removed
    for e in entries:
        name = e.name
        parts = name.split(".")
        if not (name.startswith(".") and name.endswith(".tmp") and len(parts) >= 4
                and len(parts[-2]) == 12 and all(c in "0123456789abcdef" for c in parts[-2])):
            continue
        try:
            if e.is_file(follow_symlinks=False) and now - e.stat().st_mtime > older_than:
                os.unlink(e.path)
                removed.append(Path(e.path))
        except OSError:
            continue
    return removed


class AutosaveNudge(QObject):
    """Autosave soon after the first edit (``first_ms``, 5 s) and then every
    ``interval_ms`` (60 s) while there are unsaved changes; each failure is passed to
    ``report`` (the status bar) and retried at the next tick.

    ``write`` is the autosaver's write (returns True when a file was written) and
    ``error`` reads its last failure text."""

    FIRST_MS = 5_000
    INTERVAL_MS = 60_000

    def __init__(self, project_changed: object, write: Callable[[], bool],
                 error: Callable[[], str], report: Callable[[str], None], *,
                 first_ms: int = FIRST_MS, interval_ms: int = INTERVAL_MS,
                 parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._write = write
        self._error = error
        self._report = report
        self._first = QTimer(self)
        self._first.setSingleShot(True)
        self._first.setInterval(first_ms)
        self._first.timeout.connect(self.tick)
        self.timer = QTimer(self)
        self.timer.setInterval(interval_ms)
        self.timer.timeout.connect(self.tick)
        self.timer.start()
        self.failures = 0
        project_changed.connect(self._on_edit)  # type: ignore[attr-defined]

    def _on_edit(self, *_args: object) -> None:
        if not self._first.isActive():
            self._first.start()

    def tick(self) -> None:
        self._write()
        err = self._error()
        if err:
            self.failures += 1
            self._report(f"Autosave failed — your changes are not yet backed up: {err}")

    def stop(self) -> None:
        self._first.stop()
        self.timer.stop()


"""Saving like a trusted editor (issue 16, item 7): changed-on-disk and read-only
files are not overwritten, a second window on a file is warned, autosave comes soon
after the first edit with failures reported, stale temporary files are cleaned.

Source: the rules are droprig's own (droprig/gui/file_guard.py; common practice for
desktop editors, no source); file identity by modification time, size and SHA-256
(FIPS 180-4) of the bytes. The demo project is an invented input.
"""

from __future__ import annotations

import os
import shutil
import time
from dataclasses import replace
from pathlib import Path

import pytest

from droprig.gui.document import Document
from droprig.gui.file_guard import (
    AutosaveNudge,
    FileChangedError,
    ReadOnlyError,
    clean_stale_temps,
    disk_stamp,
    save_problem,
)

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


@pytest.fixture
def project_file(tmp_path: Path) -> Path:
    p = tmp_path / "p.droprig"
    shutil.copyfile(DEMO, p)
    return p


def _edit(doc: Document) -> None:
    p = doc.project
    doc.edit(replace(p, info=replace(p.info, revision="Z9")), "revision")
    assert doc.is_dirty


def test_a_file_changed_on_disk_is_not_overwritten(qtbot, project_file: Path) -> None:
    """Before: two windows on one file — the later save silently won."""
    doc = Document()
    doc.open(project_file)
    _edit(doc)
    other = project_file.read_text(encoding="utf-8").replace("Harrowgate", "Elsewhere")
    time.sleep(0.01)
    project_file.write_text(other, encoding="utf-8")
    with pytest.raises(FileChangedError, match="changed on disk"):
        doc.save()
    assert project_file.read_text(encoding="utf-8") == other
    assert doc.is_dirty
    doc.save(force=True)  # the user chose to overwrite
    assert "Harrowgate" in project_file.read_text(encoding="utf-8")
    doc.release_lock()


def test_same_bytes_with_a_new_time_are_not_a_change(qtbot, project_file: Path) -> None:
    doc = Document()
    doc.open(project_file)
    _edit(doc)
    st = project_file.stat()
    os.utime(project_file, ns=(st.st_atime_ns, st.st_mtime_ns + 5_000_000_000))
    doc.save()  # only touched: saving goes ahead
    assert not doc.is_dirty
    doc.release_lock()


def test_a_read_only_project_is_not_replaced(qtbot, project_file: Path) -> None:
    """Before: a 0444 project was replaced on save."""
    doc = Document()
    doc.open(project_file)
    _edit(doc)
    before = project_file.read_bytes()
    project_file.chmod(0o444)
    try:
        with pytest.raises(ReadOnlyError, match="read-only"):
            doc.save()
        assert project_file.read_bytes() == before
        assert oct(project_file.stat().st_mode & 0o777) == "0o444"
    finally:
        project_file.chmod(0o644)
        doc.release_lock()


def test_a_second_window_on_the_same_file_is_warned(qtbot, project_file: Path) -> None:
    first, second = Document(), Document()
    first.open(project_file)
    assert first.lock_warning == ""
    second.open(project_file)
    assert "already open in another droprig window" in second.lock_warning
    first.release_lock()
    second.release_lock()
    third = Document()
    third.open(project_file)
    assert third.lock_warning == ""
    third.release_lock()


def test_stale_temp_files_are_cleaned_and_nothing_else(tmp_path: Path) -> None:
    """Before: temp files left by a kill were never cleaned."""
    stale = tmp_path / ".p.droprig.0123456789ab.tmp"
    fresh = tmp_path / ".p.droprig.ba9876543210.tmp"
    other = tmp_path / ".notes.tmp"
    for f in (stale, fresh, other):
        f.write_text("x", encoding="utf-8")
    old = time.time() - 3600
    os.utime(stale, (old, old))
    os.utime(other, (old, old))
    assert clean_stale_temps(tmp_path) == [stale]
    assert not stale.exists() and fresh.exists() and other.exists()


def test_opening_a_project_cleans_its_folder(qtbot, project_file: Path) -> None:
    stale = project_file.with_name(".p.droprig.0123456789ab.tmp")
    stale.write_text("half a save", encoding="utf-8")
    old = time.time() - 3600
    os.utime(stale, (old, old))
    doc = Document()
    doc.open(project_file)
    assert not stale.exists()
    doc.release_lock()


def test_save_problem_without_a_stamp_checks_only_read_only(tmp_path: Path) -> None:
    f = tmp_path / "x.droprig"
    assert save_problem(f, None) is None  # a new file
    f.write_text("{}", encoding="utf-8")
    assert save_problem(f, None) is None
    stamp = disk_stamp(f)
    assert stamp is not None and save_problem(f, stamp) is None


def test_autosave_soon_after_the_first_edit_and_failures_reported(qtbot) -> None:
    """Before: autosave only every 120 s and its failures were never shown."""
    doc = Document()
    writes: list[int] = []
    reports: list[str] = []
    error = {"text": ""}

    def write() -> bool:
        writes.append(doc.revision)
        return not error["text"]

    nudge = AutosaveNudge(doc.project_changed, write, lambda: error["text"], reports.append,
                          first_ms=50, interval_ms=10_000)
    _edit(doc)
    qtbot.waitUntil(lambda: len(writes) == 1, timeout=2000)
    assert reports == []
    error["text"] = "No space left on device"
    nudge.tick()
    assert reports and "Autosave failed" in reports[-1] and "No space" in reports[-1]
    nudge.stop()

"""A file converted from format 1 tells the user, in the window, which loads' drop
heights were re-based to the one datum (issue 13 leftover): a notice above the plan
until dismissed, the status bar and the log; nothing of it stays after new, close
or opening a current file.

The format-1 file is the stored example ``tests/io/data/format1_rooftop.droprig``
(an invented scenario) with one load given by drop height over a mat, as format 1
allowed. Behaviour of the window only: no published source applies (common practice,
no source).
"""

from __future__ import annotations

import json
import logging
from pathlib import Path

import pytest
from PySide6.QtCore import Qt

pytestmark = pytest.mark.gui

ROOT = Path(__file__).resolve().parents[2]
FORMAT1 = ROOT / "tests" / "io" / "data" / "format1_rooftop.droprig"
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def _format1_with_drop_heights(tmp_path: Path, n: int) -> tuple[Path, list[str]]:
    """The stored format-1 file with its first ``n`` loads given by drop height
    (their underside above the deck or a pad's top, as format 1 measured it)."""
    doc = json.loads(FORMAT1.read_text(encoding="utf-8"))
    assert doc["format_version"] == 1 and doc["protection_areas"]
    names = []
    for ld in doc["lift_zones"][0]["loads"][:n]:
        ld.pop("hook_elevation_m", None)
        ld.pop("hang_length_m", None)
        ld["drop_height_m"] = 1.2
        names.append(ld["name"])
    path = tmp_path / "old_site.droprig"
    path.write_text(json.dumps(doc), encoding="utf-8")
    return path, names


def test_converted_file_shows_the_notice_status_and_log(qtbot, open_window, tmp_path,
                                                        caplog) -> None:
    path, names = _format1_with_drop_heights(tmp_path, 1)
    win = open_window((1280, 720))
    with caplog.at_level(logging.WARNING, logger="droprig.gui"):
        assert win.open_path(path, ask=False)
    assert win.doc.open_notes and len(win.doc.open_notes) == 1
    assert win.notice.isVisible()
    text = win.notice_text.text()
    assert "old_site.droprig" in text and "older droprig file format" in text
    assert "then save" in text
    assert names[0] in text and "finished surface" in text
    assert "converted from an older file format" in win.statusBar().currentMessage()
    logged = [r.getMessage() for r in caplog.records if r.name == "droprig.gui"]
    assert len(logged) == 1 and names[0] in logged[0]
    # the plan keeps most of its room at 1280 x 720 with the notice on show
    assert win.plan.viewport().height() >= 0.4 * win.height()
    qtbot.mouseClick(win.notice_dismiss, Qt.MouseButton.LeftButton)
    assert not win.notice.isVisible()
    assert win.notice_text.text() == ""


def test_many_notes_are_counted_and_listed_on_hover(open_window, tmp_path) -> None:
    path, names = _format1_with_drop_heights(tmp_path, 3)
    doc = json.loads(path.read_text(encoding="utf-8"))
    loads = doc["lift_zones"][0]["loads"]
    for i in range(4):  # seven loads in all, every one by drop height
        extra = dict(loads[0], name=f"Extra item {i}")
        loads.append(extra)
    path.write_text(json.dumps(doc), encoding="utf-8")
    win = open_window((1280, 720))
    assert win.open_path(path, ask=False)
    n = len(win.doc.open_notes)
    assert n == 7
    text = win.notice_text.text()
    assert f"… and {n - win.NOTICE_ITEMS} more" in text
    tip = win.notice_text.toolTip()
    for name in [*names, "Extra item 3"]:
        assert name in tip


def test_nothing_stays_after_new_close_or_a_current_file(open_window, tmp_path) -> None:
    path, _ = _format1_with_drop_heights(tmp_path, 1)
    win = open_window()
    for leave in ("open current", "new", "close"):
        assert win.open_path(path, ask=False) and win.notice.isVisible()
        if leave == "open current":
            assert win.open_path(DEMO, ask=False)
        elif leave == "new":
            win.actions["new"].trigger()
        else:
            win.actions["close"].trigger()
        assert not win.notice.isVisible(), leave
        assert win.doc.open_notes == (), leave


def test_a_format1_file_without_such_loads_opens_quietly(open_window) -> None:
    # the stored file gives every load by hook elevation: same meaning in both
    # formats, nothing to tell
    win = open_window()
    assert win.open_path(FORMAT1, ask=False)
    assert win.doc.open_notes == ()
    assert not win.notice.isVisible()

"""Scripted sessions of the real application under an X server (Xvfb),
driven with xdotool by keyboard and mouse as a user would (``xvfb_driver.py``):
select a load in the project tree, rename it in the inspector and leave the box
with Tab, Shift+Tab or a click — 12 times —, Tab down the inspector after a
rename, undo and both redo keys, save, F1 from the inspector, Ctrl+E and Escape,
a click on the status bar's caution (the limits of use) and its Close button,
quit. The process must live through it, Tab must follow the form, undo and redo
must give the names they imply and the saved file must hold the last name. A
second session opens a format-1 file: the conversion notice shows above the plan
and its Dismiss button hides it.

Every target is found from the widgets' geometry (mapToGlobal in the driver), so
a layout change does not break the script. Skipped, with the reason, when Xvfb or
xdotool is not installed (``make test`` installs them when apt is there).
Behaviour only; the demo is invented.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

import json
import os
import shutil
import signal
import subprocess
import sys
from pathlib import Path

import pytest

pytestmark = [pytest.mark.gui, pytest.mark.slow]

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"

if not (shutil.which("Xvfb") and shutil.which("xdotool")):
    pytest.skip("Xvfb and xdotool are not installed (apt-get install xvfb xdotool, or "
                "make test as root with apt): the scripted X session is skipped",
                allow_module_level=True)


DRIVER = Path(__file__).with_name("xvfb_driver.py")


@pytest.fixture
def xserver(tmp_path: Path):
    read_fd, write_fd = os.pipe()  # Xvfb picks a free display and writes its number
    xvfb = subprocess.Popen(["Xvfb", "-displayfd", str(write_fd), "-screen", "0",
                             "1280x800x24", "-nolisten", "tcp"], pass_fds=(write_fd,),
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    os.close(write_fd)
    with os.fdopen(read_fd) as f:
        number = f.readline().strip()
    if xvfb.poll() is not None or not number:
        pytest.skip("Xvfb could not start")
    display = f":{number}"
    env = dict(os.environ, DISPLAY=display, QT_QPA_PLATFORM="xcb",
               DROPRIG_SETTINGS_DIR=str(tmp_path / "settings"))
    env.pop("WAYLAND_DISPLAY", None)
    yield env
    xvfb.send_signal(signal.SIGTERM)
    xvfb.wait(timeout=10)


def _drive(env: dict[str, str], scenario: str, project: Path, tmp_path: Path
           ) -> tuple[int, dict, str]:
    """Run the driver on ``project``: (exit code, its report, its stderr)."""
    report = tmp_path / f"{scenario}.json"
    log = tmp_path / f"{scenario}.log"
    with log.open("w") as err:
        r = subprocess.run([sys.executable, str(DRIVER), scenario, str(project),
                            str(report)], env=env, stdout=subprocess.DEVNULL, stderr=err,
                           timeout=600)
    data = json.loads(report.read_text()) if report.exists() else {}
    return r.returncode, data, log.read_text()


def test_edit_session_under_a_real_x_server(xserver: dict[str, str],
                                            tmp_path: Path) -> None:
    project = tmp_path / "site.droprig"
    shutil.copy(DEMO, project)
    code, rep, log = _drive(xserver, "edit", project, tmp_path)
    # the process lived through every rename and quit by Ctrl+Q with code 0
    assert "error" not in rep, rep.get("error")
    assert code == 0, (code, log[-2000:])
    assert rep["window"][0] <= 1280, rep["window"]
    assert rep["selected"][0] == "load"
    assert "Unit 12" in rep["names_after_renames"], rep["names_after_renames"]
    # Tab went down the inspector's form, box after box
    assert rep["tab_same"] and all(rep["tab_same"]), (rep["tab_seen"], rep["tab_expected"])
    # Ctrl+Z, Ctrl+Y, Ctrl+Z, Ctrl+Shift+Z: the names each implies
    steps = {k: names for k, names in rep["undo_redo"]}
    assert "Unit 11" in rep["undo_redo"][0][1] and "Unit 12" not in rep["undo_redo"][0][1]
    assert "Unit 12" in steps["ctrl+y"] and "Unit 12" in steps["ctrl+shift+z"]
    assert "Unit 11" in rep["undo_redo"][2][1]
    # F1 from the inspector opened the guide at the inspector's section
    shown, section, panel = rep["help"]
    assert shown and panel == "inspector" and section == "inspector", rep["help"]
    assert rep["export_dialog"] and rep["export_dialog_closed"]
    assert all(rep["caution_fits"]), rep["caution_fits"]
    assert rep["limits"] and rep["limits_closed"]
    saved = [ld["name"] for z in json.loads(project.read_text())["lift_zones"]
             for ld in z["loads"]]
    assert "Unit 12" in saved, saved


NOTICE_RGB = (0xFF, 0xF1, 0xCC)
"""The notice bar's background (droprig.gui.window_panels)."""


def test_conversion_notice_under_a_real_x_server(xserver: dict[str, str],
                                                 tmp_path: Path) -> None:
    pytest.importorskip("PIL.ImageGrab")
    doc = json.loads((ROOT / "tests" / "io" / "data" / "format1_rooftop.droprig")
                     .read_text(encoding="utf-8"))
    for ld in doc["lift_zones"][0]["loads"][:2]:  # given by drop height, as format 1 could
        ld.pop("hook_elevation_m", None)
        ld.pop("hang_length_m", None)
        ld["drop_height_m"] = 1.2
    project = tmp_path / "old_site.droprig"
    project.write_text(json.dumps(doc), encoding="utf-8")
    code, rep, log = _drive(xserver, "notice", project, tmp_path)
    assert "error" not in rep, rep.get("error")
    assert code == 0, (code, log[-2000:])
    assert rep["notice_shown"], rep
    assert "converted from an older format" in log
    assert tuple(rep["notice_pixel"]) == NOTICE_RGB, rep["notice_pixel"]
    assert rep["notice_after_dismiss"] is False

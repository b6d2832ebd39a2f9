"""Scripted sessions of the real application under an X server (Xvfb),
driven with xdotool by keyboard and mouse as a user would: select a load in
the project tree, rename it in the inspector and leave the box with Tab,
Shift+Tab or a click — 12 times —, then save, F1, the annex dialog, a click on
the status bar's caution (the limits of use), undo and both redo keys, and quit.
The process must live through it and the saved file must hold the last name.
A second session opens a format-1 file: the conversion notice shows above the
plan and its Dismiss button hides it.

Skipped, with the reason, when Xvfb or xdotool is not installed (``make test``
installs them when apt is there). Coordinates are those of the default layout
at 1280 × 720 (fresh settings). Behaviour only; the demo is invented.
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
import time
from pathlib import Path

import pytest

pytestmark = [pytest.mark.gui, pytest.mark.slow]

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"

if not (shutil.which("Xvfb") and shutil.which("xdotool")):
    pytest.skip("Xvfb and xdotool are not installed (apt-get install xvfb xdotool, or "
                "make test as root with apt): the scripted X session is skipped",
                allow_module_level=True)


def _xdo(env: dict[str, str], *args: str) -> str:
    r = subprocess.run(["xdotool", *args], env=env, capture_output=True, text=True,
                       timeout=30)
    return r.stdout.strip()


def _pace() -> float:
    """Seconds between two user actions: a quarter of a second, longer while other
    work loads the machine (a user waits for the window; a script must too, or its
    keys reach a form that is still being rebuilt)."""
    busy = os.getloadavg()[0] / max(os.cpu_count() or 1, 1)
    return 0.25 * min(max(busy, 1.0), 4.0)


def _wait_window(env: dict[str, str], name: str, timeout: float = 30.0) -> str:
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        ids = _xdo(env, "search", "--name", name).split()
        if ids:
            return ids[0]
        time.sleep(0.2)
    raise AssertionError(f"no window named {name!r} within {timeout} s")


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


def test_rename_and_tab_under_a_real_x_server(xserver: dict[str, str],
                                              tmp_path: Path) -> None:
    env = xserver
    project = tmp_path / "site.droprig"
    shutil.copy(DEMO, project)
    log = tmp_path / "app.log"
    log_file = log.open("w")
    app = subprocess.Popen([sys.executable, "-m", "droprig", "gui", str(project)], env=env,
                           stdout=subprocess.DEVNULL, stderr=log_file)
    try:
        try:
            win = _wait_window(env, "site.droprig")
        except AssertionError:
            app.kill()
            app.wait(timeout=10)
            raise AssertionError(f"the window did not appear: {log.read_text()}") from None
        _xdo(env, "windowmove", win, "0", "0")
        _xdo(env, "windowsize", win, "1280", "720")
        time.sleep(1.5)

        def key(*keys: str) -> None:
            _xdo(env, "key", *keys)
            time.sleep(_pace())

        def click(x: int, y: int) -> None:
            _xdo(env, "mousemove", str(x), str(y), "click", "1")
            time.sleep(_pace())

        # the project tree: its first row, then down to the lift zone, open it, first load
        click(60, 52)
        key("Home")
        key(*["Down"] * 5)
        key("Right")
        key("Down")
        for i in range(1, 13):
            click(1150, 147)  # the inspector's Name box of the load form
            key("ctrl+a")
            _xdo(env, "type", "--delay", "5", f"Unit {i}")
            if i % 3 == 0:
                key("Tab")
            elif i % 3 == 1:
                key("shift+Tab")
            else:
                click(1150, 250)  # another box of the form
            assert app.poll() is None, f"the window died after rename {i}: {log.read_text()}"
            if os.environ.get("DROPRIG_XVFB_SHOTS"):
                from PIL import ImageGrab

                ImageGrab.grab(xdisplay=env["DISPLAY"]).save(
                    Path(os.environ["DROPRIG_XVFB_SHOTS"]) / f"rename{i}.png")
        click(900, 420)  # the plan
        key("ctrl+s")

        def names() -> list[str]:
            return [ld["name"] for z in json.loads(project.read_text())["lift_zones"]
                    for ld in z["loads"]]

        # under a loaded machine the last edit can reach the document after the first
        # save's keystroke: save again (up to three times) before judging the file
        for _attempt in range(3):
            end = time.monotonic() + 8
            while "Unit 12" not in names() and time.monotonic() < end:
                time.sleep(0.3)
            if "Unit 12" in names():
                break
            click(900, 420)
            key("ctrl+s")
        zones = [z["name"] for z in json.loads(project.read_text())["lift_zones"]]
        assert "Unit 12" in names(), (names(), zones)
        key("F1")
        _wait_window(env, "user guide", 10)
        click(900, 420)
        key("ctrl+e")
        dlg = _wait_window(env, "Export permit annex", 10)
        # no window manager: the keyboard goes to the window under the pointer
        _xdo(env, "mousemove", "--window", dlg, "20", "20")
        key("Escape")
        time.sleep(0.3)
        assert not _xdo(env, "search", "--onlyvisible", "--name", "Export permit annex")
        # the status-bar caution is whole at 1280 x 720 and a click on it opens the
        # limits of use (it was cut at the window's right edge)
        click(1000, 708)
        limits = _wait_window(env, "Limits of use", 10)
        time.sleep(0.5)
        geo = dict(line.strip().split(": ", 1) for line in
                   _xdo(env, "getwindowgeometry", limits).splitlines()[1:])
        gx, gy = (int(v) for v in geo["Position"].split()[0].split(","))
        gw, gh = (int(v) for v in geo["Geometry"].split("x"))
        click(gx + gw - 50, gy + gh - 22)  # its Close button, bottom right
        time.sleep(0.5)
        assert not _xdo(env, "search", "--onlyvisible", "--name", "Limits of use")
        click(900, 420)
        key("ctrl+z")
        key("ctrl+y")
        key("ctrl+z")
        key("ctrl+shift+z")
        assert app.poll() is None
        key("ctrl+s")
        key("ctrl+q")
        app.wait(timeout=20)
        assert app.returncode == 0, log.read_text()
    finally:
        if app.poll() is None:
            app.kill()
            app.wait(timeout=10)
        log_file.close()


def _grab(env: dict[str, str]):
    from PIL import ImageGrab

    return ImageGrab.grab(xdisplay=env["DISPLAY"]).convert("RGB")


NOTICE_RGB = (0xFF, 0xF1, 0xCC)
"""The notice bar's background (droprig.gui.window_panels)."""


def test_conversion_notice_under_a_real_x_server(xserver: dict[str, str],
                                                 tmp_path: Path) -> None:
    pytest.importorskip("PIL.ImageGrab")
    env = xserver
    doc = json.loads((ROOT / "tests" / "io" / "data" / "format1_rooftop.droprig")
                     .read_text(encoding="utf-8"))
    for ld in doc["lift_zones"][0]["loads"][:2]:  # given by drop height, as format 1 could
        ld.pop("hook_elevation_m", None)
        ld.pop("hang_length_m", None)
        ld["drop_height_m"] = 1.2
    project = tmp_path / "old_site.droprig"
    project.write_text(json.dumps(doc), encoding="utf-8")
    log = tmp_path / "app.log"
    with log.open("w") as log_file:
        app = subprocess.Popen([sys.executable, "-m", "droprig", "gui", str(project)],
                               env=env, stdout=subprocess.DEVNULL, stderr=log_file)
        try:
            win = _wait_window(env, "old_site.droprig")
            _xdo(env, "windowmove", win, "0", "0")
            _xdo(env, "windowsize", win, "1280", "720")
            time.sleep(2.0)
            # the band under the view bar: the notice's colour across the plan's width
            band = [_grab(env).getpixel((x, 75)) for x in range(300, 900, 50)]
            assert sum(px == NOTICE_RGB for px in band) >= len(band) - 2, band
            assert "converted from an older format" in log.read_text()
            _xdo(env, "mousemove", "973", "69", "click", "1")  # Dismiss
            time.sleep(1.0)
            band = [_grab(env).getpixel((x, 75)) for x in range(300, 900, 50)]
            assert sum(px == NOTICE_RGB for px in band) <= 2, band
            assert app.poll() is None, log.read_text()
            _xdo(env, "mousemove", "900", "420", "click", "1")
            _xdo(env, "key", "ctrl+q")
            app.wait(timeout=20)
            assert app.returncode == 0, log.read_text()
        finally:
            if app.poll() is None:
                app.kill()
                app.wait(timeout=10)

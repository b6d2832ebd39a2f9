"""``droprig gui [FILE] [--screenshot PNG]``: the desktop application.

With ``--screenshot`` the project is opened, analysed synchronously, rendered
and a grab of the main window is saved; the command exits without an event
loop and works without a display (Qt's offscreen platform). Without a display
and without ``--screenshot`` it explains what to do instead.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from droprig.cli import EXIT_BAD_INPUT, EXIT_OK


def has_display() -> bool:
    """True when Qt can open a window on screen."""
    if os.environ.get("QT_QPA_PLATFORM", "").startswith(("offscreen", "minimal")):
        return False
    if sys.platform in ("win32", "darwin"):
        return True
    return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))


def run(args: argparse.Namespace) -> int:
    file = getattr(args, "file", None)
    shot = getattr(args, "screenshot", None)
    if file and not Path(file).is_file():
        print(f"droprig gui: file not found: {file}", file=sys.stderr)
        return EXIT_BAD_INPUT
    if shot:
        if not has_display():
            os.environ["QT_QPA_PLATFORM"] = "offscreen"
        from droprig.gui.app import screenshot

        try:
            rc = screenshot(file, shot)
        except Exception as exc:  # a message, never a traceback
            from droprig.commands import describe_error

            print(f"droprig gui: {describe_error(exc)}", file=sys.stderr)
            return EXIT_BAD_INPUT
        if rc == EXIT_OK:
            print(f"droprig gui: window saved to {shot}")
        else:
            print(f"droprig gui: could not write {shot}", file=sys.stderr)
        return rc
    if not has_display():
        print("droprig gui: no display found (DISPLAY / WAYLAND_DISPLAY not set, or "
              "QT_QPA_PLATFORM is offscreen), so the window cannot open.\n"
              "  - to see the results without a window: droprig analyse FILE, "
              "droprig report FILE -o annex.pdf\n"
              "  - to render the window to an image: droprig gui FILE --screenshot out.png",
              file=sys.stderr)
        return EXIT_BAD_INPUT
    from droprig.gui.app import run as run_app

    return run_app(file)

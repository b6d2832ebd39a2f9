"""``droprig demo``: the main job on the bundled demo project.

With a display (``DISPLAY`` / ``WAYLAND_DISPLAY``) it opens the desktop
application on the demo project. Without one (or with ``--headless``) it runs the
same job headless: validates the project, analyses every lift zone, writes the
per-bay table (JSON + CSV), the PDF annex and an offscreen screenshot of the main
window, and prints where each output went.
"""

from __future__ import annotations

import argparse
import os
import pathlib
import subprocess
import sys

DEMO = "rooftop_plant_swap.droprig"


def demo_dir() -> pathlib.Path:
    """The bundled ``demo_projects`` folder (source checkout or installed)."""
    here = pathlib.Path(__file__).resolve()
    for base in (here.parents[2], pathlib.Path.cwd()):
        cand = base / "demo_projects"
        if cand.is_dir():
            return cand
    raise FileNotFoundError("demo_projects folder not found next to the droprig package")


def has_display() -> bool:
    if os.environ.get("QT_QPA_PLATFORM", "") == "offscreen":
        return False
    return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))


def run(args: argparse.Namespace) -> int:
    from droprig.cli import main

    demos = sorted(demo_dir().glob("*.droprig"))
    primary = demo_dir() / DEMO
    if has_display() and not args.headless:
        print(f"droprig demo: opening {primary} in the desktop application")
        return main(["gui", str(primary)])

    out = pathlib.Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    print("droprig demo: no display found, running the same job headless.\n")
    status = 0
    written: list[pathlib.Path] = []
    for path in demos:
        stem = path.stem
        print(f"== {path.name}")
        rc = main(["validate", str(path)])
        if rc:
            return rc
        rc = main(["analyse", str(path), "--json", str(out / f"{stem}.json"),
                   "--csv", str(out / f"{stem}.csv")])
        written += [out / f"{stem}.json", out / f"{stem}.csv"]
        status = status or rc
        rc = main(["analyse", str(path)])
        status = status or rc
        rc = main(["report", str(path), "-o", str(out / f"{stem}_annex.pdf")])
        written.append(out / f"{stem}_annex.pdf")
        status = status or rc
        # The screenshot runs in a child process so Qt renders offscreen cleanly.
        env = dict(os.environ, QT_QPA_PLATFORM="offscreen", QT_LOGGING_RULES="qt.qpa.*=false")
        shot = out / f"{stem}_window.png"
        rc = subprocess.call([sys.executable, "-m", "droprig", "gui", str(path),
                              "--screenshot", str(shot)], env=env)
        written.append(shot)
        status = status or rc
        print()
    print(f"droprig demo: outputs written to {out.resolve()}:")
    # Only this run's outputs: an earlier run's files are kept beside them as
    # ``.bak`` (droprig.io.atomic.keep_backup) and are not outputs of this run.
    for f in written:
        if f.is_file():
            print(f"  {f.name:45s} {f.stat().st_size:>10,d} bytes")
        else:
            print(f"  {f.name:45s} {'not written':>16s}")
            status = status or 1
    if any(out.glob("*.bak")):
        print("  (files of an earlier run are kept beside them as .bak)")
    return status

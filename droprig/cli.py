"""Command line: the same job headless.

Each sub-command's work lives in ``droprig/commands/<name>.py`` (imported only
when that command runs, so ``droprig --version`` stays fast and Qt is loaded
only by ``gui``/``demo``). Bad input prints one clear message and exits 2;
never a traceback.
"""

from __future__ import annotations

import argparse
import importlib
import sys
from collections.abc import Sequence

from droprig import __version__
from droprig.texts import CAUTION

EXIT_OK = 0
EXIT_BAD_INPUT = 2



def _member_options(s: argparse.ArgumentParser, required: bool = True) -> None:
    """The member and load options shared by ``check`` and ``verify`` (``verify``
    takes them only without a project file, so there they are checked by hand)."""
    s.add_argument("--section", required=required, help="library name, e.g. W16X26 or IPE 300")
    s.add_argument("--grade", required=required, help="e.g. A992, S355")
    s.add_argument("--span", required=required, help="member span, e.g. 6m or 24 ft")
    s.add_argument("--at", required=required, help="struck point measured from the origin end")
    s.add_argument("--mass", required=required, help="dropped mass, e.g. 1500lb or 2 t")
    s.add_argument("--drop", required=required, help="free-fall height, e.g. 300mm")
    s.add_argument("--support", default="simple",
                   choices=["simple", "fixed", "propped", "cantilever"])
    s.add_argument("--code", choices=["aisc360", "en1993"], default=None,
                   help="design basis (default: from the grade's family)")
    s.add_argument("--bearing", default=None,
                   help="bearing length along the member (default 0: a point contact, "
                   "conservative for the web checks)")
    s.add_argument("--cushion-stiffness", default=None, help="spring mat stiffness, e.g. 2e6 N/m")
    s.add_argument("--load-stiffness", default=None,
                   help="stiffness of the load's own underside (skid, base frame, dunnage) "
                   "in series, e.g. 50 kN/mm (default: rigid load, the highest contact "
                   "force)")
    s.add_argument("--crush-force", default=None, help="crushable layer force, e.g. 50 kN")
    s.add_argument("--crush-stroke", default=None, help="crushable layer stroke, e.g. 50mm")
    s.add_argument("--udl", default=None, help="existing uniform load besides self-weight, "
                   "e.g. 5 kN/m")
    s.add_argument("--no-self-weight", action="store_true")
    s.add_argument("--no-beam-mass", action="store_true",
                   help="ignore the member's inertia (η = 1)")
    s.add_argument("--units", choices=["SI", "US"], default=None,
                   help="units of the printed table (default: from the grade's family)")
    s.add_argument("--json", action="store_true", help="print one JSON object in SI units")


def build_parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="droprig",
        description="Dropped-load assessment of floor framing under crane swing zones.",
        epilog=CAUTION,
    )
    p.add_argument("--version", action="version", version=f"droprig {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    s = sub.add_parser("validate", help="check a .droprig project file")
    s.add_argument("file")

    s = sub.add_parser("check", help="one member struck by one dropped load")
    _member_options(s)
    s.add_argument("--amplified", action="store_true",
                   help="make every check at the time-history-calibrated amplified force "
                   "(as the project setting dynamic_amplification; off by default)")

    s = sub.add_parser("verify", help="time history beside the energy method: a project's "
                       "governing points (FILE), or one member (check's options)")
    s.add_argument("file", nargs="?", help="a .droprig project: verify the governing point "
                   "of each bay (narrow with --lift, --bay, --load)")
    s.add_argument("--lift", default=None, help="only this lift zone id")
    s.add_argument("--bay", default=None, help="only this bay, e.g. 2-3/B-C")
    s.add_argument("--load", default=None, help="only this load name")
    _member_options(s, required=False)
    s.add_argument("--plots", default=None, metavar="DIR",
                   help="write force-, deflection- and moment-time plots (PNG) here")
    s.add_argument("--slab-mass", dest="slab_mass", action="store_const", const=True,
                   default=None,
                   help="with FILE (the default): the struck member carries its steel and "
                   "the deck's and superimposed dead load's mass over its tributary width")
    s.add_argument("--steel-mass", dest="slab_mass", action="store_const", const=False,
                   help="with FILE: the struck member carries its steel's mass alone (to "
                   "see how far the slab's mass moves the comparison)")

    s = sub.add_parser("analyse", aliases=["analyze"], help="every drop point of every lift zone")
    s.add_argument("file")
    s.add_argument("--json", dest="json_out", default=None, metavar="OUT",
                   help="write the results as JSON to OUT ('-' for stdout)")
    s.add_argument("--csv", dest="csv_out", default=None, metavar="OUT",
                   help="write one row per drop point to OUT")
    s.add_argument("--bays-csv", dest="bays_csv_out", default=None, metavar="OUT",
                   help="write one row per bay and load (permit verdict, heights, hook "
                        "elevation, conditions) to OUT")
    s.add_argument("--force", action="store_true",
                   help="allow an output name ending in .droprig (never the project itself)")

    s = sub.add_parser("report", help="the PDF annex for a lift permit")
    s.add_argument("file")
    s.add_argument("-o", "--output", required=True)
    s.add_argument("--lift", default=None, help="only this lift zone id")
    s.add_argument("--force", action="store_true",
                   help="allow an output name ending in .droprig (never the project itself)")

    s = sub.add_parser("gui", help="open the desktop application")
    s.add_argument("file", nargs="?")
    s.add_argument("--screenshot", default=None, metavar="PNG",
                   help="render, save a grab of the main window and exit")

    s = sub.add_parser("demo", help="run the bundled demo (GUI when a display exists)")
    s.add_argument("--headless", action="store_true")
    s.add_argument("--out", default="out/demo", help="folder for headless outputs")
    return p


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if not args.command:
        parser.print_help()
        return EXIT_OK
    name = {"analyze": "analyse"}.get(args.command, args.command)
    from droprig import units

    units.set_decimal_mark(units.system_decimal_mark())  # "1,5 m" where ',' is decimal
    try:
        module = importlib.import_module(f"droprig.commands.{name}")
        return int(module.run(args))
    except BrokenPipeError:
        return EXIT_OK
    except KeyboardInterrupt:
        print("droprig: interrupted", file=sys.stderr)
        return 130
    except Exception as exc:  # last line of defence: a message, never a traceback
        from droprig.texts import describe_error

        print(f"droprig {name}: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT


if __name__ == "__main__":
    raise SystemExit(main())

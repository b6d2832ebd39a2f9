"""Fonts for the annex: DejaVu Sans (embedded, subset), so Greek symbols, ≤, √, ²
and other characters of the calculation sheets print as themselves.

The TrueType files are taken from the system (Debian ``fonts-dejavu-core``) or
from the copy matplotlib ships in ``mpl-data`` (found without importing
matplotlib). Registration happens once per process.
"""

from __future__ import annotations

import importlib.util
import pathlib
from functools import lru_cache

REGULAR = "DroprigSans"
BOLD = "DroprigSans-Bold"
ITALIC = "DroprigSans-Oblique"
MONO = "DroprigMono"

_FILES = {
    REGULAR: "DejaVuSans.ttf",
    BOLD: "DejaVuSans-Bold.ttf",
    ITALIC: "DejaVuSans-Oblique.ttf",
    MONO: "DejaVuSansMono.ttf",
}


class FontNotFoundError(RuntimeError):
    """No DejaVu font could be found to embed in the PDF."""


def _search_dirs() -> list[pathlib.Path]:
    dirs = [pathlib.Path("/usr/share/fonts/truetype/dejavu"),
            pathlib.Path("/usr/share/fonts/dejavu"),
            pathlib.Path("/usr/local/share/fonts")]
    spec = importlib.util.find_spec("matplotlib")
    if spec is not None and spec.submodule_search_locations:
        for loc in spec.submodule_search_locations:
            dirs.append(pathlib.Path(loc) / "mpl-data" / "fonts" / "ttf")
    return dirs


def _find(filename: str) -> pathlib.Path:
    for d in _search_dirs():
        p = d / filename
        if p.is_file():
            return p
    raise FontNotFoundError(f"font file {filename} not found (install fonts-dejavu-core)")


@lru_cache(maxsize=1)
def register() -> None:
    """Register the four annex fonts and the bold/italic family with reportlab."""
    from reportlab.lib.fonts import addMapping
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    for name, filename in _FILES.items():
        pdfmetrics.registerFont(TTFont(name, str(_find(filename))))
    addMapping(REGULAR, 0, 0, REGULAR)
    addMapping(REGULAR, 1, 0, BOLD)
    addMapping(REGULAR, 0, 1, ITALIC)
    addMapping(REGULAR, 1, 1, BOLD)

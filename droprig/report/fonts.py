"""Fonts for the annex: DejaVu Sans (embedded, subset), so Greek symbols, ≤, √, ²
and other characters of the calculation sheets print as themselves.

The TrueType files ship with droprig in ``resources/fonts`` (DejaVu 2.37 from the
Debian package ``fonts-dejavu-core``; Bitstream Vera licence, which allows
redistribution — ``resources/fonts/LICENSE-DejaVu.txt``), so every annex embeds
the same font on every machine. Registration happens once per process.
"""

from __future__ import annotations

import pathlib
from functools import lru_cache

REGULAR = "DroprigSans"
BOLD = "DroprigSans-Bold"
ITALIC = "DroprigSans-Oblique"
MONO = "DroprigMono"

FONT_DIR = pathlib.Path(__file__).resolve().parents[2] / "resources" / "fonts"
"""Where the shipped TrueType files are."""

_FILES = {
    REGULAR: "DejaVuSans.ttf",
    BOLD: "DejaVuSans-Bold.ttf",
    ITALIC: "DejaVuSans-Oblique.ttf",
    MONO: "DejaVuSansMono.ttf",
}


class FontNotFoundError(RuntimeError):
    """A shipped font file is missing from ``resources/fonts``."""


def font_path(filename: str) -> pathlib.Path:
    p = FONT_DIR / filename
    if not p.is_file():
        raise FontNotFoundError(f"font file {p} is missing: droprig's resources/fonts "
                                "folder is incomplete; reinstall droprig")
    return p


@lru_cache(maxsize=1)
def register() -> None:
    """Register the four annex fonts and the bold/italic family with reportlab."""
    from reportlab.lib.fonts import addMapping
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    for name, filename in _FILES.items():
        pdfmetrics.registerFont(TTFont(name, str(font_path(filename))))
    addMapping(REGULAR, 0, 0, REGULAR)
    addMapping(REGULAR, 1, 0, BOLD)
    addMapping(REGULAR, 0, 1, ITALIC)
    addMapping(REGULAR, 1, 1, BOLD)
    # reportlab.graphics starts every drawing in Helvetica (not embedded); droprig
    # draws nothing but its own embedded fonts
    from reportlab.graphics import shapes

    shapes.STATE_DEFAULTS["fontName"] = REGULAR



def unsupported(text: str) -> str:
    """The characters of ``text`` the annex font cannot draw ('' when all are fine)."""
    from reportlab.pdfbase import pdfmetrics

    register()
    face = pdfmetrics.getFont(REGULAR).face
    widths = face.charWidths
    out = []
    for ch in text:
        if ch in "\n\t" or ord(ch) in widths:
            continue
        if ch not in out:
            out.append(ch)
    return "".join(out)

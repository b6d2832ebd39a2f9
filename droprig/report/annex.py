"""The lift-permit annex: the PDF a lift permit is signed with.

Body (at most six pages; each section starts on a new page):

1. Verdict and permit conditions, with the sign-off block (what each signature
   means, accept / accept with conditions / reject, permit number, lift-plan
   reference and revision, crane and configuration, validity and what
   invalidates the annex, actions after a drop).
2. Conditions plan, one per level carrying a lift zone.
3. Bays and loads: one compact table, a row per bay, columns per load.
4. Inputs, design criteria, assumptions and what is not checked.

Appendices: contents; A members; B calculation sheets, de-duplicated, citing
the numbered references; C references; D revision history.

The annex grows with the distinct governing cases, not with levels × bays: one
calculation sheet per distinct case over all levels and lift zones (listing
where it applies), one member row per distinct member, one bay × load row per
distinct outcome with an index of bays, and bay lists as grid ranges
("2-5/A-C on levels L03–L08").

Tables flow across pages with their header repeated (never shrunk); nothing is
printed below 7 pt; every page carries the title block and "page x of y". The
fonts (DejaVu, shipped in ``resources/fonts``) are embedded. reportlab's open
source edition writes neither PDF/A nor tagged PDF.
"""

from __future__ import annotations

import dataclasses
import datetime as _dt
import functools
import hashlib
import math
import os
import unicodedata
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

from droprig import __version__, units
from droprig.io.atomic import atomic_path
from droprig.model import (
    Deck,
    Level,
    LiftZone,
    ModelError,
    Project,
    ProtectionArea,
    bays,
    id_ranges,
)
from droprig.outcomes import NOT_ASSESSED, ORDER, OUTCOMES, fmt_worst_point
from droprig.permit import (
    CLASH_ADVICE,
    ENERGY_ONLY,
    LIMIT_NOTE,
    SIG_HEIGHT,
    derive_conditions,
    fmt_height,
    pad_words,
)
from droprig.permit import VERDICT_WORDS as _PERMIT_WORDS
from droprig.report import content, fonts, permit_fields, references
from droprig.report.formula import SIG, evaluate, fmt_sig, printed_tolerance
from droprig.report.text import esc, fmt_util, fmt_value, is_none
from droprig.solver import (
    CHECKS,
    DECK,
    CaseResult,
    Results,
    Trace,
    TraceStep,
    is_hard,
    member_resistances,
    pad_crush_stress,
)
from droprig.units import UnitSystem

Progress = Callable[[float, str], None]


def outcome_key_words() -> str:
    """The tags of the bay table in words, every outcome droprig can print
    (:data:`droprig.outcomes.ORDER`) and the dash of a bay not reached: "E stays
    elastic, Y yields within limits, X exceeds limits, P may go through, – not
    reached" (it had no P while the table printed P rows)."""
    words = [f"{o.tag} {o.label.lower().replace(',', '')}"
             for o in (OUTCOMES[k] for k in ORDER)]
    return ", ".join([*words, f"{OUTCOMES[NOT_ASSESSED].tag} not reached"])

MIN_PT = 7.0
IN_ROW_MIN = 26.0
"""Least part height, pt, when a table row splits across pages (3 lines of 8.4 pt)."""
"""Smallest text size anywhere in the annex, pt."""
LOADS_PER_TABLE = 3
"""Loads side by side in the bay × load table (more loads: a further table)."""

HEADINGS = {
    "verdict": "1 Verdict and permit conditions",
    "plan": "2 Conditions plan",
    "bays": "3 Bays and loads",
    "inputs": "4 Inputs, assumptions and what is not checked",
    "contents": "Contents",
    "members": "Appendix A Members",
    "sheets": "Appendix B Calculation sheets",
    "references": "Appendix C References",
    "revisions": "Appendix D Revision history",
    "verification": "Appendix B2 Time-history verification",
}
BODY_SECTIONS = ("verdict", "plan", "bays", "inputs")

ASSUMPTIONS: tuple[str, ...] = (
    "Energy method: the peak contact force acts quasi-statically (member actions = peak "
    "force × the actions of a unit load at the drop point, [{gere}]); {amplification}",
    "Perfectly inelastic contact: η = M/(M + mₑ), mₑ the members' Rayleigh mass in their "
    "static shape ([{timoshenko}]).",
    "Free fall from the drop height (underside above the finished surface; onto a pad, "
    "less its thickness), landing flat (and on an edge where tilted landing is on); the "
    "framing takes the force at the footprint's centre, the deck's checks use the "
    "footprint cut at edges and openings.",
    "The contact force is bounded by crushing under the footprint (concrete bearing, a "
    "steel deck plate or a beam's web yielding), the energy it absorbs counted; a "
    "crushable pad acts by its crush stress over the part of the footprint on it "
    "([{johnson}]).",
    "Load path deck → beams → girders → columns by statics; columns as axial springs "
    "E·A/L.",
    "The deck strip is continuous over the beams and shares the load with the cross strip "
    "to the girders; a load over a support bears on the steel (a soft or padded "
    "footprint: where over the flange), no sagging or punching there; within 2d, "
    "β = a_v/2d of it punches. Composite members act "
    "with the slab. No membrane action; members laterally restrained and compact.",
    "Existing loads as given in the project are added to the impact actions.",
    "Beyond yield: elastic–perfectly plastic within the ductility and rotation limits "
    "([{biggs}], [{ufc}]), in series with the yield lines of the struck slab panel where "
    "the slab is ductile (support rotation ≤ 2°); shear, web and punching failures and "
    "the flexure of an over-reinforced slab are brittle (no plastic reserve).",
    "Deflection limits (span/N) are information only, not pass criteria.",
)

AMPLIFICATION_ON = ("dynamic amplification on: the larger of this and the time-history "
                    "bounds (Appendix B2).")
AMPLIFICATION_OFF = ("dynamic amplification off: this reads low for a load light against "
                     "the struck framing (Appendix B2 gives the ratios).")
"""The end of the first assumption, by the project's setting (Gere §9.10's limitation
of the energy method for a light load; droprig.solver.amplification)."""

NOT_CHECKED: tuple[str, ...] = (
    "connections other than for their end shear, and their bolts or welds in detail "
    "(a connection whose capacity is not entered is checked against the web's shear "
    "resistance and is a sign-off condition above)",
    "columns, their bases and the foundations",
    "the level below and anything on or under it",
    "secondary impacts, rebound and a load that tips or rolls after landing",
    "fragments, spilled contents and debris",
    "the crane, its rigging, its outrigger or mat bearing and its own stability",
    "vibration, fatigue and damage from earlier drops",
)

INVALIDATES: tuple[str, ...] = (
    "any change to the framing, the loads, their masses or rigging, the hook elevations, "
    "the crane position or configuration, the swing zone, or the pads and mats — the "
    "SHA-256 in the footer then no longer matches the project file",
    "a pad or mat not laid as specified, moved, or damaged",
    "damage to the framing found before the lift, or a drop during the lift",
    "the end of the validity window written above",
)

AFTER_A_DROP: tuple[str, ...] = (
    "Stop all lifting; keep everyone out of the struck bay and off the level below it.",
    "Clear and barricade the level below the struck bay until the engineer releases it.",
    "Have the framing, deck, connections and any pad inspected by a competent person "
    "before any further load is carried over it; record the drop and the findings.",
    "A new assessment is needed before lifting resumes over a damaged or repaired bay.",
)

SIGNATURES: tuple[tuple[str, str, str], ...] = (
    ("Prepared by", "prepared_by",
     "The inputs (framing, loads with their mass source, hook elevations, crane, pads) "
     "match the lift plan and the site."),
    ("Checked by", "checked_by",
     "Engineer: the method, the inputs and the results are checked and the conditions "
     "below are sufficient for this framing."),
    ("Approved by", "approved_by",
     "Appointed lifting person: the conditions will be set up and kept on site for the "
     "whole lift."),
)


# --------------------------------------------------------------- permit conditions


VERDICT_WORDS = _PERMIT_WORDS
"""The verdict words (droprig.permit)."""
_VERDICT_RANK = ("acceptable", "acceptable_with_conditions", "not_acceptable")
_VERDICT_STYLE = {"acceptable": "elastic", "acceptable_with_conditions": "plastic",
                  "not_acceptable": "exceeds"}


def permit_conditions(project: Project, results: Results) -> object:
    """THE ONE PLACE the annex gets its verdict and permit conditions from:
    ``droprig.permit.derive_conditions`` (the conditions engine shared with the
    window and the command line). The annex prints the objects'
    ``sentence(system)`` and composes no condition sentence of its own.
    """
    return derive_conditions(project, results)


def _merge_key(c: object) -> tuple:
    """A condition without its bays: conditions equal in all else merge."""
    if dataclasses.is_dataclass(c):
        d = {f.name: getattr(c, f.name) for f in dataclasses.fields(c)
             if f.name not in ("bays", "region")}
        return tuple(sorted((k, repr(v)) for k, v in d.items()))
    return (repr(c),)


def merge_conditions(conds: Sequence[object]) -> tuple[list[object], dict[tuple, int]]:
    """The permit's conditions with those that differ only in their bays merged
    into one (its ``bays`` the union, in order), so a rule that holds for ten bays
    is printed once; and merge key -> printed number (1-based). The sentence of a
    merged condition is still the conditions engine's own
    (``Condition.sentence``)."""
    # bays gathered per key first and the merged condition built once: replacing
    # the dataclass at every merge copied the growing bay tuple each time
    # (quadratic in the bays of a large project)
    first: dict[tuple, object] = {}
    bays_of: dict[tuple, dict[str, None]] = {}
    count: dict[tuple, int] = {}
    for c in conds:
        k = _merge_key(c)
        if k not in first:
            first[k] = c
            bays_of[k] = dict.fromkeys(getattr(c, "bays", ()))
            count[k] = 1
            continue
        bays_of[k].update(dict.fromkeys(c.bays))  # type: ignore[attr-defined]
        count[k] += 1
    merged: dict[tuple, object] = {}
    for k, m in first.items():
        if count[k] == 1 or not dataclasses.is_dataclass(m):
            merged[k] = m
            continue
        bays_ = tuple(bays_of[k])
        if "region" in {f.name for f in dataclasses.fields(m)}:
            merged[k] = dataclasses.replace(m, bays=bays_, region=None)  # type: ignore
        else:
            merged[k] = dataclasses.replace(m, bays=bays_)  # type: ignore
    out = list(merged.values())
    return out, {k: n + 1 for n, k in enumerate(merged)}


# ----------------------------------------------------------------------- data


@dataclass(frozen=True)
class Fingerprint:
    sha256: str
    label: str
    source: str


def fingerprint(project: Project, project_path: str | os.PathLike[str] | None) -> Fingerprint:
    """SHA-256 naming the exact input.

    With ``project_path``: the SHA-256 of the file's bytes, provided the file
    still holds ``project`` (it is read back and compared); a project edited
    since it was saved must not be signed under the old file's name, so then,
    as without a file, the SHA-256 of droprig's canonical serialisation of the
    project is printed and labelled as such.
    """
    from droprig.io.project_file import dumps_project, load_project, project_fingerprint

    canonical = "SHA-256 of the canonical serialisation"
    if project_path is not None:
        name = os.path.basename(os.fspath(project_path))
        try:
            same = load_project(project_path) == project
        except (OSError, ValueError):
            same = False
        if same:
            return Fingerprint(project_fingerprint(project_path),
                               "SHA-256 of the project file", name)
        label = (f"{canonical} of the project as analysed — it differs from the saved "
                 f"file {name}; save the project and print the annex again to name the file")
        source = f"{name} (edited since saved)"
    else:
        label = f"{canonical} (project not read from a file)"
        source = "(unsaved project)"
    data = dumps_project(project).encode("utf-8")
    return Fingerprint(hashlib.sha256(data).hexdigest(), label, source)


def check_printable(project: Project) -> None:
    """Refuse text the annex cannot print faithfully: control characters (other
    than line breaks in the description) and characters the embedded font lacks.
    Raises :class:`ModelError` naming the field."""
    info = project.info
    fields: list[tuple[str, str, bool]] = [
        (f"info.{k}", getattr(info, k), k == "description")
        for k in ("name", "site", "lift_reference", "revision", "date", "prepared_by",
                  "checked_by", "approved_by", "description")]
    for lv in project.levels:
        fields.append((f"level {lv.id}.name", lv.name, False))
    for z in project.lift_zones:
        fields.append((f"zone {z.id}.name", z.name, False))
        for ld in z.loads:
            fields.append((f"zone {z.id}.load name", ld.name, False))
    for p in project.protection_areas:
        fields.append((f"protection {p.id}.name", p.name, False))
    fields += _permit_text_fields(project)
    for name, text, multiline in fields:
        for ch in text:
            if ch in "\n\r\t" and multiline:
                continue
            if unicodedata.category(ch) in ("Cc", "Cf", "Cs", "Co"):
                raise ModelError(name, text, "printable text without control characters "
                                 f"(found U+{ord(ch):04X})")
        bad = fonts.unsupported(text)
        if bad:
            raise ModelError(name, text, "characters the annex font (DejaVu Sans: Latin, "
                             f"Greek, Cyrillic) can print; cannot print {bad!r}")


def _permit_text_fields(project: Project) -> list[tuple[str, str, bool]]:
    """The permit data's text for :func:`check_printable` (single-line fields)."""
    info = project.info
    out = [(f"info.{k}", getattr(info, k), False)
           for k in ("permit_number", "lift_plan_revision", "valid_from", "valid_to")]
    for z in project.lift_zones:
        out += [(f"zone {z.id}.crane_description", z.crane_description, False),
                (f"zone {z.id}.crane_configuration", z.crane_configuration, False)]
        out += [(f"zone {z.id}.lift_points[{i}].label", p.label, False)
                for i, p in enumerate(z.lift_points)]
    return out


# ----------------------------------------------------------------------- styles


class _Styles:
    _shared: _Styles | None = None

    @classmethod
    def shared(cls) -> _Styles:
        if cls._shared is None:
            cls._shared = cls()
        return cls._shared

    def __init__(self) -> None:
        from reportlab.lib import colors
        from reportlab.lib.styles import ParagraphStyle

        base = ParagraphStyle("base", fontName=fonts.REGULAR, bulletFontName=fonts.REGULAR,
                              fontSize=8.5, leading=10.6,
                              textColor=colors.HexColor("#111111"))
        self.body = base
        self.small = ParagraphStyle("small", parent=base, fontSize=7.5, leading=9.2)
        self.cell = ParagraphStyle("cell", parent=base, fontSize=MIN_PT, leading=8.4)
        self.cell_b = ParagraphStyle("cellb", parent=self.cell, fontName=fonts.BOLD)
        self.head = ParagraphStyle("head", parent=self.cell, fontName=fonts.BOLD,
                                   textColor=colors.white)
        self.h1 = ParagraphStyle("h1", parent=base, fontName=fonts.BOLD, fontSize=13,
                                 leading=16, spaceAfter=4)
        self.h2 = ParagraphStyle("h2", parent=base, fontName=fonts.BOLD, fontSize=9.5,
                                 leading=12, spaceBefore=5, spaceAfter=2.5)
        self.verdict = ParagraphStyle("verdict", parent=base, fontName=fonts.BOLD,
                                      fontSize=14, leading=17)
        self.mono = ParagraphStyle("mono", parent=base, fontName=fonts.MONO, fontSize=7.5,
                                   leading=9.5)
        self.bullet = ParagraphStyle("bullet", parent=base, fontSize=8, leading=10,
                                     leftIndent=11, bulletIndent=1, spaceAfter=1.5)
        self.cond = ParagraphStyle("cond", parent=base, fontSize=8.5, leading=10.6,
                                   leftIndent=24, firstLineIndent=-24, spaceAfter=2.5)
        self.caution = ParagraphStyle("caution", parent=base, fontName=fonts.BOLD,
                                      fontSize=8, leading=10)


HEAD_BG = "#2E2E2E"
ZEBRA = "#F1F1EE"


def _table(rows: list[list[object]], widths: Sequence[float], *, header_rows: int = 1,
           extra: Sequence[tuple] = (), zebra: bool = True, wrap: bool = True) -> object:
    from reportlab.lib import colors
    from reportlab.platypus import Table, TableStyle

    if wrap:  # plain strings do not wrap by themselves: break them to the column
        rows = [[wrap_text(c, fonts.REGULAR, MIN_PT, widths[k] - 6)
                 if isinstance(c, str) and c and r >= header_rows else c
                 for k, c in enumerate(row)] for r, row in enumerate(rows)]

    if header_rows:
        from reportlab.platypus import Paragraph

        hs = _Styles.shared().head
        rows = [[Paragraph(esc(c), hs) if isinstance(c, str) and c else c for c in row]
                if r < header_rows else row for r, row in enumerate(rows)]
    # rows split between rows first; a row taller than what is left of the page
    # (a long cell on a large project) splits inside itself, at least three
    # lines a part, instead of stopping the layout (reportlab LayoutError)
    t = Table(rows, colWidths=list(widths), repeatRows=header_rows, splitByRow=1,
              splitInRow=IN_ROW_MIN)
    style = [
        ("FONTNAME", (0, 0), (-1, -1), fonts.REGULAR),
        ("FONTSIZE", (0, 0), (-1, -1), MIN_PT),
        ("LEADING", (0, 0), (-1, -1), 8.4),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("LINEBELOW", (0, header_rows), (-1, -1), 0.25, colors.HexColor("#9A9A95")),
        ("BOX", (0, 0), (-1, -1), 0.6, colors.black),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ("TOPPADDING", (0, 0), (-1, -1), 2),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
    ]
    if header_rows:
        style += [("BACKGROUND", (0, 0), (-1, header_rows - 1), colors.HexColor(HEAD_BG)),
                  ("TEXTCOLOR", (0, 0), (-1, header_rows - 1), colors.white),
                  ("FONTNAME", (0, 0), (-1, header_rows - 1), fonts.BOLD),
                  ("LINEBELOW", (0, header_rows - 1), (-1, header_rows - 1), 0.8,
                   colors.black)]
    if zebra:
        for r in range(header_rows, len(rows)):
            if (r - header_rows) % 2 == 1:
                style.append(("BACKGROUND", (0, r), (-1, r), colors.HexColor(ZEBRA)))
    style.extend(extra)
    t.setStyle(TableStyle(style))
    return t


def _outcome_bg(response: str, col: int, row: int) -> tuple:
    from reportlab.lib import colors

    o = content.OUTCOMES.get(response, content.OUTCOMES[content.NOT_ASSESSED])
    return ("BACKGROUND", (col, row), (col, row), colors.HexColor(o.fill))


def _outcome_ink(response: str, col: int, row: int) -> tuple:
    from reportlab.lib import colors

    o = content.OUTCOMES.get(response, content.OUTCOMES[content.NOT_ASSESSED])
    return ("TEXTCOLOR", (col, row), (col, row), colors.HexColor(o.ink))


# ----------------------------------------------------------------------- canvas


MARGIN_X = 40.0
MARGIN_TOP = 26.0
MARGIN_BOTTOM = 20.0
HEADER_H = 50.0
FOOTER_H = 44.0


@dataclass(frozen=True)
class _Header:
    project: str
    site: str
    lift: str
    revision: str
    date: str
    version: str
    sha: str
    units: str


@dataclass
class _Book:
    """What the canvas learns while drawing: the first page of each section and
    the places where the contents page wants those page numbers."""

    marks: dict[str, int] = field(default_factory=dict)
    wanted: list[tuple[int, float, float, str]] = field(default_factory=list)
    pages: int = 0


NOT_GIVEN = "NOT GIVEN"


@functools.lru_cache(maxsize=1024)
def _title_lines(text: str, font: str, size: float, width: float) -> tuple[str, ...]:
    """``text`` broken into lines of at most ``width`` pt for a title-block cell
    (greedy, at spaces; a word longer than a line is broken inside), remembered: the
    same header and footer texts are drawn on every page."""
    from reportlab.pdfbase.pdfmetrics import stringWidth

    words, lines, cur = text.split(" "), [], ""
    for w in words:
        trial = f"{cur} {w}".strip()
        if cur and stringWidth(trial, font, size) > width:
            lines.append(cur)
            cur = w
        else:
            cur = trial
        while stringWidth(cur, font, size) > width and len(cur) > 1:
            k = len(cur)
            while k > 1 and stringWidth(cur[:k], font, size) > width:
                k -= 1
            lines.append(cur[:k])
            cur = cur[k:]
    if cur:
        lines.append(cur)
    return tuple(lines)


def _canvas_class(header: _Header, book: _Book,
                  on_page: Callable[[int], None] | None = None) -> type:
    from reportlab.lib import colors
    from reportlab.pdfgen.canvas import Canvas

    def wrap(c: Canvas, text: str, font: str, size: float, width: float) -> list[str]:
        # every page's title block wraps the same texts: each worked out once
        return list(_title_lines(text, font, size, width))

    class AnnexCanvas(Canvas):
        """Defers the title block until the page count is known ("page x of y")."""

        def __init__(self, *a: object, **k: object) -> None:
            k["initialFontName"] = fonts.REGULAR
            k["initialFontSize"] = 8.5
            super().__init__(*a, **k)
            self._pages: list[dict] = []
            self._droprig_section = ""
            self.setLineCap(0)

        def droprig_page(self) -> int:
            return len(self._pages) + 1

        def showPage(self) -> None:
            self._pages.append(dict(self.__dict__))
            self._startPage()
            if on_page is not None:
                on_page(len(self._pages))

        def save(self) -> None:
            total = len(self._pages)
            book.pages = total
            for k, state in enumerate(self._pages):
                self.__dict__.update(state)
                self._title_block(k + 1, total)
                for page, x, y, key in book.wanted:
                    if page == k + 1:
                        self.setFont(fonts.REGULAR, 8.5)
                        self.setFillColor(colors.black)
                        self.drawRightString(x, y, str(book.marks.get(key, "–")))
                super().showPage()
            super().save()

        def _cell(self, x: float, y: float, w: float, h: float, label: str, value: str,
                  *, size: float = 8.0, bold: bool = False, font: str | None = None
                  ) -> None:
            self.setStrokeColor(colors.black)
            self.setLineWidth(0.5)
            missing = not value.strip()
            self.rect(x, y, w, h, stroke=1, fill=0)
            self.setFont(fonts.REGULAR, MIN_PT)
            self.setFillColor(colors.HexColor("#4A4A4A"))
            self.drawString(x + 2.5, y + h - 8.0, label.upper())
            self.setFillColor(colors.black)
            if missing:
                self.setFont(fonts.BOLD, 8.0)
                self.drawString(x + 2.5, y + 3.5, NOT_GIVEN)
                return
            fnt = font or (fonts.BOLD if bold else fonts.REGULAR)
            room = h - 10.0
            for sz in (size, 7.5, MIN_PT):
                lines = wrap(self, value, fnt, sz, w - 5)
                if len(lines) * (sz + 1.0) <= room:
                    break
            lead = sz + 1.0
            n_fit = max(1, int(room // lead))
            if len(lines) > n_fit:  # would need more room: last line says so
                lines = lines[:n_fit]
                lines[-1] = lines[-1][: max(1, len(lines[-1]) - 14)] + " (continued)"
            self.setFont(fnt, sz)
            top = y + h - 10.0 - sz + 0.5
            for i, ln in enumerate(lines):
                self.drawString(x + 2.5, top - i * lead, ln)

        def _title_block(self, page: int, total: int) -> None:
            W, H = self._pagesize
            m = MARGIN_X
            w = W - 2 * m
            top = H - MARGIN_TOP
            self.setFillColor(colors.black)
            self.rect(m, top - 2.5, w, 2.5, stroke=0, fill=1)
            self.setFont(fonts.BOLD, MIN_PT)
            self.drawString(m, top - 11, "LIFT-PERMIT ANNEX · DROPPED-LOAD ASSESSMENT")
            self.setFont(fonts.REGULAR, MIN_PT)
            sec = getattr(self, "_droprig_section", "")
            self.drawRightString(m + w, top - 11, sec)
            cw = [0.31 * w, 0.27 * w, 0.2 * w, 0.1 * w]
            cw.append(w - sum(cw))
            cells = [("Project", header.project, True), ("Site", header.site, False),
                     ("Lift plan, revision", header.lift, True),
                     ("Annex rev", header.revision, True),
                     ("Date", header.date, False)]
            x = m
            for (label, value, bold), cwi in zip(cells, cw, strict=True):
                self._cell(x, top - HEADER_H, cwi, HEADER_H - 14, label, value, size=8.0,
                           bold=bold)
                x += cwi
            y = MARGIN_BOTTOM + 18
            fw = [0.17 * w, 0.56 * w, 0.12 * w]
            fw.append(w - sum(fw))
            foot = [("Software", f"droprig {header.version}", False, None),
                    ("Input SHA-256", header.sha, False, fonts.MONO),
                    ("Units", header.units, False, None),
                    ("Sheet", f"page {page} of {total}", True, None)]
            x = m
            for (label, value, bold, font), fwi in zip(foot, fw, strict=True):
                self._cell(x, y, fwi, FOOTER_H - 20, label, value, size=MIN_PT if font
                           else 8.0, bold=bold, font=font)
                x += fwi
            self.setFont(fonts.REGULAR, MIN_PT)
            self.setFillColor(colors.HexColor("#333333"))
            lines = wrap(self, "Aid only: check against local codes with the appointed "
                         "lifting person and a licensed engineer. Keep people out from "
                         "under the load.", fonts.REGULAR, MIN_PT, w)
            for i, ln in enumerate(lines[:2]):
                self.drawString(m, y - 8 - i * 8, ln)

    return AnnexCanvas


def _marker(key: str, title: str, book: _Book) -> object:
    from reportlab.platypus import Flowable

    class Marker(Flowable):
        """Zero-size: names the section in the title block and records its page."""

        def wrap(self, aw: float, ah: float) -> tuple[float, float]:
            return (0, 0)

        def draw(self) -> None:
            self.canv._droprig_section = title
            book.marks.setdefault(key, self.canv.droprig_page())

    return Marker()


def _contents(entries: Sequence[tuple[str, str]], width: float, book: _Book) -> object:
    """The contents list; page numbers are written by the canvas once known.

    The list splits across pages (one 13 pt line per entry): a project with
    hundreds of calculation sheets has a contents list longer than a page, which a
    flowable that cannot split stops the layout with (reportlab ``LayoutError``).
    """
    from reportlab.platypus import Flowable

    class Contents(Flowable):
        line = 13.0

        def __init__(self, items: Sequence[tuple[str, str]]) -> None:
            super().__init__()
            self.items = list(items)

        def wrap(self, aw: float, ah: float) -> tuple[float, float]:
            return (width, self.line * len(self.items))

        def split(self, aw: float, ah: float) -> list[Flowable]:
            n = int(ah // self.line)
            if n < 1 or n >= len(self.items):
                return []
            return [Contents(self.items[:n]), Contents(self.items[n:])]

        def draw(self) -> None:
            c = self.canv
            page = c.droprig_page()
            c.setFont(fonts.REGULAR, 8.5)
            ox, oy = c.absolutePosition(0, 0)
            for k, (key, title) in enumerate(self.items):
                y = self.line * (len(self.items) - k - 1) + 3
                c.drawString(0, y, title)
                tw = c.stringWidth(title, fonts.REGULAR, 8.5)
                c.setDash(1, 2)
                c.setLineWidth(0.4)
                c.line(tw + 4, y + 1, width - 24, y + 1)
                c.setDash()
                book.wanted.append((page, ox + width, oy + y, key))

    return Contents(entries)


# ----------------------------------------------------------------------- builder


def _deg(rad: float) -> str:
    return f"{math.degrees(rad):.1f}°"


def _basis(project: Project) -> str:
    return {"aisc360": "AISC 360-16 (US)", "en1993": "EN 1993-1-1 / EN 1993-1-5 (EU)"}[
        project.settings.design_basis]


def _units(system: str) -> str:
    return "SI" if system == "SI" else "US customary"


def _caution() -> str:
    from droprig.texts import CAUTION

    return CAUTION


def _check_name(k: int) -> str:
    return CHECKS[k].replace("_", " ") if 0 <= k < len(CHECKS) else "none"


def pad_label(p: object, system: str, project: Project) -> str:
    """A pad's specification short enough for its label on the conditions plan: kind,
    thickness, the crush stress the analysis uses and the stroke, or the mat's
    modulus / stiffness (the full wording is in :func:`pad_spec`, inputs section)."""
    # thickness and stroke in the small-length unit, as the permit condition and
    # the inputs table print them (permit.pad_words): one pad, one unit
    th = fmt_value(p.thickness, "small_length", system)  # type: ignore[attr-defined,arg-type]
    if p.kind == "crushable":  # type: ignore[attr-defined]
        return (f"crushable, {th} thick; crushes at "
                f"{fmt_sig(pad_crush_stress(project, p), 'pressure', system, 3)}, stroke "
                f"{fmt_sig(p.crush_stroke, 'small_length', system, 3)}")  # type: ignore[attr-defined,arg-type]
    if p.modulus is not None:  # type: ignore[attr-defined]
        return (f"spring mat, {th} thick; modulus "
                f"{fmt_sig(p.modulus, 'pressure', system, 3)}")  # type: ignore[attr-defined,arg-type]
    return (f"spring mat, {th} thick; stiffness "
            f"{fmt_sig(p.stiffness, 'stiffness', system, 3)}")  # type: ignore[attr-defined,arg-type]


def pad_spec(p: ProtectionArea, system: UnitSystem, project: Project | None = None) -> str:
    """A pad's or mat's specification in words for the inputs table: the permit's
    wording (:func:`droprig.permit.pad_words`, with the crush stress the analysis reads
    for an older file's crush force) and its extent."""
    a = p.area
    ext = f"{fmt_value(a.x1 - a.x0, 'length', system)} × {fmt_value(a.y1 - a.y0, 'length', system)}"
    stress = (pad_crush_stress(project, p)
              if project is not None and p.kind == "crushable" else None)
    return f"{pad_words(p, system, stress)}; extent {ext}"


def _deck_words(dk: Deck, v: Callable[[float | None, str], str]) -> str:
    """A deck's data for the members appendix: concrete depth, strength and bars; a
    steel plate's thickness and yield strength; a grating's bars and the steel per
    plan area its perforation check uses (``v`` formats a value in project units)."""
    if dk.kind == "steel_plate":
        return (f"{v(dk.thickness, 'small_length')} steel plate, yield strength "
                f"{v(dk.steel_fy, 'stress')}; perforation by a hard item by the BRL "
                "formula with a 1.25 thickness margin")
    if dk.kind == "grating":
        return (f"bearing bars {v(dk.thickness, 'small_length')} deep × "
                f"{v(dk.bar_thickness, 'small_length')} at {v(dk.bar_pitch, 'small_length')}"
                f" centres spanning between the beams, yield strength "
                f"{v(dk.steel_fy, 'stress')}; perforation by a hard item by the BRL "
                f"formula on {v(dk.steel_depth, 'small_length')} of steel per plan area "
                "(bars smeared) with a 1.25 thickness margin")
    return (f"{v(dk.thickness, 'length')} thick, concrete {v(dk.concrete.fc, 'stress')}, "
            f"bottom bars {v(dk.rebar_area, 'area')} per m width at "
            f"{v(dk.cover, 'length')} cover")


VERIFICATION_WIDTHS = (0.06, 0.08, 0.15, 0.09, 0.08, 0.08, 0.076, 0.076, 0.076, 0.076,
                       0.076, 0.076)
"""Columns of appendix B2's table as fractions of the frame's width (zone, bays, load,
member, r, κ, then the six ratios). r and κ have 0.08: r's "0.00081" (7 characters)
broke over two lines at 0.07 in the rooftop demo's annex."""


def verification_table(rows: Sequence[Sequence[str]], w: float, st: _Styles) -> object:
    """Appendix B2's table of ratios (the peaks are in droprig verify and the window's
    dialog) on a frame ``w`` pt wide: rows with the same load, member and figures
    share one row listing their zones and bays (a tall building repeats its floors:
    the table grows with distinct cases, not with levels). The header is plain text,
    set in the tables' white-on-dark head style by :func:`_table` (as Paragraphs in
    the body style it printed dark grey on the dark band, seen with pdftoppm)."""
    from droprig.report.verification import VERIFICATION_HEADER

    keep = (0, 1, 2, 3, 4, 5, 10, 11, 12, 13, 14, 15)
    heads = ("Zone", "Bay", "Load", "Member", "r = M/mₑ", "κ", "F energy ÷ history",
             "M energy ÷ history", "δ energy ÷ history", "F verdict ÷ history",
             "M verdict ÷ history", "V verdict ÷ history")
    assert len(VERIFICATION_HEADER) == 16
    where: dict[tuple[str, ...], dict[str, list[str]]] = {}
    for r in rows:
        bays_of = where.setdefault(tuple(r[i] for i in keep[2:]), {})
        ids = bays_of.setdefault(r[0], [])
        if r[1] not in ids:
            ids.append(r[1])
    body: list[list[object]] = [list(heads)]
    for cells, bays_of in where.items():
        zones = ", ".join(bays_of)
        bay_text = "; ".join(", ".join(ids) for ids in bays_of.values())
        body.append([_para(zones, st.small), _para(bay_text, st.small),
                     *(_para(c, st.small) for c in cells)])
    return _table(body, [f * w for f in VERIFICATION_WIDTHS],
                  extra=[("ALIGN", (4, 1), (-1, -1), "RIGHT")])


def _para(text: str, style: object) -> object:
    from reportlab.platypus import Paragraph

    return Paragraph(esc(text), style)


class _Builder:
    def __init__(self, project: Project, results: Results, zones: tuple[LiftZone, ...],
                 fp: Fingerprint, permit: object, frame_w: float, frame_h: float,
                 book: _Book) -> None:
        self.p = project
        self.r = results
        self.zones = zones
        self.fp = fp
        self.permit = permit
        self.sys = project.settings.unit_system
        self.w = frame_w
        self.h = frame_h
        self.book = book
        self.st = _Styles()
        self.story: list[object] = []
        self.refs = references.numbers(project)
        zone_ids = {z.id for z in zones}
        conds = [c for c in permit.conditions  # type: ignore[attr-defined]
                 if c.zone_id in zone_ids]
        self.conditions, self._merged_no = merge_conditions(conds)
        self.sheet_titles: list[str] = []

    # helpers
    def _level(self, c: object) -> Level | None:
        """The level of a condition, for its bays as grid ranges."""
        try:
            return self.p.level(c.level_id)  # type: ignore[attr-defined]
        except (KeyError, AttributeError):
            return None

    def P(self, text: str, style: object | None = None, bulletText: str | None = None
          ) -> object:
        from reportlab.platypus import Paragraph

        return Paragraph(text, style or self.st.cell, bulletText=bulletText)

    def v(self, value: float | None, quantity: str) -> str:
        """A value in the project's units; an exact zero prints as ``0 m`` (never
        ``0.000 m``, which reads as a rounded small number)."""
        if value is not None and value == 0:
            return "0 " + fmt_value(1.0, quantity, self.sys).split(" ", 1)[-1]
        return fmt_value(value, quantity, self.sys)

    def coord(self, value: float) -> str:
        """A plan coordinate in m / ft whatever its size (the small-length switch of
        :meth:`v` printed "x = 3.00 in, y = 29.70 ft" for one point); zero as
        ``0 m``."""
        if value == 0:
            return self.v(0.0, "length")
        return units.fmt(value, "length", self.sys)

    def ref(self, key: str) -> str:
        return str(self.refs.get(key, "?"))

    def section(self, key: str, title: str | None = None, *, new_page: bool = True,
                short: str | None = None) -> None:
        from reportlab.platypus import PageBreak

        if new_page and self.story:
            self.story.append(PageBreak())
        title = title or HEADINGS[key]
        self.story.append(_marker(key, short or title, self.book))
        self.story.append(self.P(esc(title), self.st.h1))

    def cond_numbers(self, conds: Sequence[object]) -> list[int]:
        return sorted({self._merged_no[_merge_key(c)] for c in conds
                       if _merge_key(c) in self._merged_no})

    def load_verdicts(self) -> list[object]:
        zone_ids = {z.id for z in self.zones}
        return [lv for lv in self.permit.loads  # type: ignore[attr-defined]
                if lv.zone_id in zone_ids]

    # ------------------------------------------------------------ 1 verdict
    def verdict_page(self) -> None:
        from reportlab.lib import colors
        from reportlab.platypus import KeepTogether, Spacer

        st = self.st
        self.section("verdict")
        lvs = self.load_verdicts()
        verdict = max((lv.verdict for lv in lvs), key=_VERDICT_RANK.index,
                      default="acceptable")
        style = content.OUTCOMES[_VERDICT_STYLE[verdict]]
        n_cond = len(self.conditions)
        words = VERDICT_WORDS[verdict].upper()
        if verdict == "acceptable_with_conditions":
            words += f" — {n_cond} CONDITION{'S' if n_cond != 1 else ''} BELOW"
        elif verdict == "not_acceptable" and not any(lv.kept_off for lv in lvs) and any(
                c.zone_id in {z.id for z in self.zones}
                for c in getattr(self.permit, "clashes", ())):
            # every load has a bay it may be carried over, but the plan's own pick-up
            # or set-down point lies where a load must not be (droprig.permit.
            # plan_clashes; the points are listed below); a load kept off every bay
            # it can reach reads as "no practical condition" (the rooftop demo since
            # the crushing pad's framing force follows the crush's duration)
            words += (" AS PLANNED — THE LIFT PLAN CANNOT KEEP THE CONDITIONS "
                      "(SEE BELOW)")
        elif verdict == "not_acceptable":
            words += " AS PLANNED — NO PRACTICAL CONDITION MAKES IT ACCEPTABLE"
        vstyle = self.P(esc(words), st.verdict)
        self.story.append(_table([[vstyle]], [self.w], header_rows=0, zebra=False, extra=[
            ("BACKGROUND", (0, 0), (-1, -1), colors.HexColor(style.fill)),
            ("BOX", (0, 0), (-1, -1), 2.0, colors.HexColor(style.edge)),
            ("TOPPADDING", (0, 0), (-1, -1), 6), ("BOTTOMPADDING", (0, 0), (-1, -1), 6)]))
        vstyle.style = vstyle.style.clone("v2", textColor=colors.HexColor(style.ink))
        info = self.p.info
        self.story.append(Spacer(1, 4))
        ref = esc(info.lift_reference) or NOT_GIVEN
        plan_rev = esc(info.lift_plan_revision) or permit_fields.NOT_RECORDED
        rev = esc(info.revision) or NOT_GIVEN
        self.story.append(self.P(
            f"Dropped-load assessment, revision <b>{rev}</b>, of the framing under lift plan "
            f"<b>{ref}</b> revision <b>{plan_rev}</b>: "
            f"{len(self.zones)} lift zone(s), {sum(len(z.loads) for z in self.zones)} "
            f"load(s), {self.r.n_points:,} drop points. Design basis {esc(_basis(self.p))}. "
            "Drop heights are the load's underside above the finished surface of the "
            "level.", st.small))
        # per load
        big = "ft" if self.sys == "US" else "m"
        mass_u = "lb" if self.sys == "US" else "kg"
        hdr = ["Zone", "Load", f"Mass, {mass_u}", f"Planned drop height, {big}", "Verdict",
               "Max U", f"Least allowable drop height, {big}", "Conditions"]
        rows: list[list[object]] = [hdr]
        extra = []
        verdicts = {(cv.zone_id, cv.load_name): cv
                    for zv in content.zone_verdicts(self.p, self.r, self.zones)
                    for cv in zv.cases}
        for i, lv in enumerate(lvs):
            cv = verdicts.get((lv.zone_id, lv.load_name))
            nums = self.cond_numbers(lv.conditions)
            rows.append([
                lv.zone_id, self.P(esc(lv.load_name)),
                self.v(cv.mass, "mass").split(" ")[0] if cv else "",
                _h_planned(cv.planned_drop_height, self.sys) if cv else "",
                self.P(f"<b>{esc(VERDICT_WORDS[lv.verdict])}</b>"),
                fmt_util(cv.max_utilisation) if cv else "",
                _h_allow(cv.least_allowable_drop_height, self.sys) if cv else "",
                self.P(", ".join(f"C{n}" for n in nums) or "none"),
            ])
            extra.append(_outcome_bg(_VERDICT_STYLE[lv.verdict], 4, i + 1))
            extra.append(_outcome_ink(_VERDICT_STYLE[lv.verdict], 4, i + 1))
        w = self.w
        self.story.append(Spacer(1, 3))
        self.story.append(_table(rows, [0.07 * w, 0.2 * w, 0.09 * w, 0.11 * w, 0.16 * w,
                                        0.07 * w, 0.13 * w, 0.17 * w], extra=extra))
        # what stops a signature first, whatever the length of the conditions below:
        # with 16 conditions the lift plan's clash and the caution went to page 2 (the
        # format-1 roof once a pad's lip no longer kept the drained unit off two bays)
        flags = self.title_flags()
        if flags:
            self.story.append(self.P("Title block incomplete: " + esc("; ".join(flags))
                                     + ". Complete it by hand before signing.", st.caution))
        self.story.extend(self.permit_flags())
        self.story.append(Spacer(1, 3))
        self.story.append(self.P(esc(_caution()), st.caution))
        # conditions (how a bay range reads, before the first one: on page 1)
        self.story.append(self.P("Permit conditions", st.h2))
        example = self._range_example()
        if example:
            self.story.append(self.P(
                f"A bay range such as {esc(example)} stands for every bay within those "
                "grid lines, not for one bay; section 3 lists the bays one by one.",
                st.cell))
        if not self.conditions:
            self.story.append(self.P("None: every assessed bay stays elastic on the bare "
                                     "deck for every load.", st.body))
        for k, c in enumerate(self.conditions):
            self.story.append(self.P(f"<b>C{k + 1}</b>&nbsp;&nbsp;"
                                     + esc(c.sentence(self.sys, self._level(c))),
                                     st.cond))
        if any(getattr(c, "kind", "") == "cap_hook" for c in self.conditions):
            self.story.append(self.P(esc(LIMIT_NOTE), st.cell))
        self.story.append(KeepTogether(self.signoff()))

    def _range_example(self) -> str:
        """The first bay range (:func:`droprig.model.bay_ranges`) the conditions use
        that is not itself a bay id, or "" when every condition names single bays."""
        from droprig.model import bay_ranges

        for c in self.conditions:
            lv = self._level(c)
            if lv is None or not c.bays:
                continue
            for name in bay_ranges(lv, c.bays):
                if name not in c.bays:
                    return name
        return ""

    def title_flags(self) -> list[str]:
        info = self.p.info
        out = []
        for label, value in (("lift-plan reference", info.lift_reference),
                             ("revision", info.revision), ("date", info.date),
                             ("project name", info.name), ("site", info.site)):
            if not value.strip():
                out.append(f"{label} not given")
        return out

    def permit_flags(self) -> list[object]:
        """Page 1: the permit data the project file does not record (never filled in),
        and any pick-up or set-down point inside an exclusion area."""
        out = []
        missing = permit_fields.not_recorded(self.p, self.zones)
        if missing:
            out.append(self.P(
                f"<b>{permit_fields.NOT_RECORDED}</b> in the project file: "
                + esc("; ".join(missing)) + ". Write each in by hand in the sign-off block "
                "and confirm it before signing.", self.st.caution))
        ended = permit_fields.window_ended(self.p, _dt.datetime.now(_dt.UTC))
        if ended:
            out.append(self.P("<b>VALIDITY ENDED</b>: " + esc(ended) + ". Do not sign; "
                              "renew the permit and print the annex again.",
                              self.st.caution))
        zone_ids = {z.id for z in self.zones}
        clash = permit_fields.points_in_exclusions(
            [c for c in getattr(self.permit, "clashes", ()) if c.zone_id in zone_ids],
            self.conditions)
        if clash:
            out.append(self.P(
                "<b>LIFT PLAN AND CONDITIONS DISAGREE</b>: " + esc("; ".join(clash))
                + ". " + esc(CLASH_ADVICE), self.st.caution))
        return out

    def signoff_rows(self) -> list[list[str]]:
        """Permit number, lift plan, crane, validity: recorded values or write-ins."""
        info = self.p.info
        fmt = (lambda x: self.v(x, "length"))  # noqa: E731
        return [
            ["Permit number", info.permit_number or permit_fields.WRITE_IN],
            ["Lift-plan reference and revision", permit_fields.lift_plan_text(self.p)],
            ["Crane and configuration", " ".join(
                permit_fields.crane_text(z, fmt) + "." for z in self.zones)],
            ["Valid from / to", f"{permit_fields.validity_text(self.p)}, and only for the "
             f"input whose SHA-256 is printed in the footer of every page "
             f"({self.fp.source})"],
        ]

    def signoff(self) -> list[object]:
        from reportlab.lib import colors
        from reportlab.platypus import Spacer

        st = self.st
        info = self.p.info
        w = self.w
        flow: list[object] = [self.P("Sign-off", st.h2)]
        rows = [
            *self.signoff_rows(),
            ["This annex is void after", "; ".join(INVALIDATES) + "."],
            ["After a drop", " ".join(AFTER_A_DROP)],
        ]
        flow.append(_table([[self.P(f"<b>{esc(a)}</b>"), self.P(esc(b))] for a, b in rows],
                           [0.2 * w, 0.8 * w], header_rows=0, zebra=False))
        flow.append(Spacer(1, 4))
        box = "☐"
        hdr = ["Role", "What this signature means", "Name", "Decision", "Signature / date"]
        srows: list[list[object]] = [hdr]
        for role, attr, meaning in SIGNATURES:
            name = getattr(info, attr)
            srows.append([self.P(f"<b>{role}</b>"), self.P(esc(meaning)),
                          self.P(esc(name) if name.strip() else f"<b>{NOT_GIVEN}</b>"),
                          self.P(f"{box} accept<br/>{box} accept with the conditions<br/>"
                                 f"{box} reject"), ""])
        flow.append(_table(srows, [0.12 * w, 0.34 * w, 0.18 * w, 0.18 * w, 0.18 * w],
                           zebra=False,
                           extra=[("GRID", (0, 0), (-1, -1), 0.5, colors.black),
                                  ("BOTTOMPADDING", (0, 1), (-1, -1), 16)]))
        return flow

    # ------------------------------------------------------------ 2 plan
    def plan_pages(self) -> None:
        from reportlab.platypus import Spacer

        from droprig.report.figures import BayMark, plan_drawing

        for k, level in enumerate(content.levels_of(self.p, self.zones)):
            title = f"{HEADINGS['plan']} — level {level.id}: {level.name}"
            self.section("plan" if k == 0 else f"plan:{level.id}", title,
                         short=f"{HEADINGS['plan']} — level {level.id}")
            zones = [z for z in self.zones if z.level_id == level.id]
            prot = [p for p in self.p.protection_areas if p.level_id == level.id]
            marks: dict[str, BayMark] = {}
            # bay -> conditions in one pass over the conditions' bay lists (not
            # bays × conditions × a tuple search: cubic on a large level)
            nums_of: dict[str, list[str]] = {}
            excl: set[str] = set()
            for n, c in enumerate(self.conditions):
                if c.level_id != level.id:
                    continue
                for bay_id in dict.fromkeys(c.bays):
                    nums_of.setdefault(bay_id, []).append(f"C{n + 1}")
                    if c.kind == "exclude_area":
                        excl.add(bay_id)
            scab = content.scabbing_bays(self.r, level, self.zones)
            for b in bays(level):
                marks[b.id] = BayMark(b.id in excl,
                                      tuple(dict.fromkeys(nums_of.get(b.id, []))),
                                      b.id in scab)
            desc = [f"Level elevation {self.v(level.elevation, 'length')}."]
            for z in zones:
                desc.append(
                    f"Lift zone <b>{esc(z.id)}</b> ({esc(z.name)}): crane at "
                    f"({self.v(z.crane[0], 'length')}, {self.v(z.crane[1], 'length')}), "
                    f"radius {self.v(z.r_min, 'length')} to {self.v(z.r_max, 'length')}, "
                    f"slew {_deg(z.slew_start)} to {_deg(z.slew_start + z.slew_sweep)}, "
                    f"drift margin {self.v(z.drift_margin, 'length')}"
                    + (" (computed from the slew, hoist and radial speeds and the "
                       "swing)" if z.drift_mode == "computed" else "") + ".")
            desc.append("Each bay: id, worst outcome over the loads, highest U and the "
                        "numbers of the permit conditions that apply (page 1). Plan north "
                        "is +y; angles counter-clockwise from +x.")
            self.story.append(self.P(" ".join(desc), self.st.small))
            self.story.append(Spacer(1, 3))
            outcomes = content.bay_outcomes(self.r, level, self.zones)
            specs = {p.id: pad_label(p, self.sys, self.p) for p in prot}
            self.story.append(plan_drawing(level, zones, prot, outcomes, self.sys, self.w,
                                           self.h - 95, marks=marks, pad_specs=specs))

    # ------------------------------------------------------------ 3 bays × loads
    def bay_table(self) -> None:
        from reportlab.platypus import Spacer

        from droprig.model import bay_ranges

        st = self.st
        self.section("bays")
        big = "ft" if self.sys == "US" else "m"
        self.story.append(self.P(
            "Per bay and load: outcome of a drop from the planned height with the pads "
            f"as laid out ({outcome_key_words()}), "
            "highest utilisation U and the check that sets it, the "
            f"least allowable drop height in {big} (above the finished surface, rounded "
            "down; 'none': not even a load set down is within the limits; 'no limit': no "
            "height reaches a limit) and the permit conditions that apply. Bays whose "
            "rows would be the same share one row, numbered R1, R2, …; a bay range such "
            "as 2-5/A-C stands for every bay between grid lines 2 and 5 and lines A and "
            "C. The index after the tables gives every bay's rows.", st.small))
        cases = [(z, ld) for z in self.zones for ld in z.loads]
        by = {(b.zone_id, b.load_name, b.level_id, b.bay_id): b for b in self.r.bays}
        conds_of: dict[tuple[str, str, str], list[int]] = {}
        for n, c in enumerate(self.conditions):
            for bay_id in c.bays:
                conds_of.setdefault((c.zone_id, c.load_name or "", bay_id), []).append(n + 1)
        # the loads of one level side by side, at most LOADS_PER_TABLE a table
        groups: list[list[tuple[LiftZone, object]]] = []
        for lv in content.levels_of(self.p, self.zones):
            on = [(z, ld) for z, ld in cases if z.level_id == lv.id]
            groups += [on[k:k + LOADS_PER_TABLE] for k in range(0, len(on), LOADS_PER_TABLE)]
        rows_of_bay: dict[tuple[str, str], list[int]] = {}
        row_no = 0
        for group in groups:
            lv = self.p.level(group[0][0].level_id)
            hdr1: list[object] = ["Row", f"Bays of level {lv.id}"]
            hdr2: list[object] = ["", ""]
            spans = []
            for k, (z, ld) in enumerate(group):
                hdr1 += [self.P(f"<b>{esc(z.id)}: {esc(ld.name)}</b>",  # type: ignore
                                st.head), "", "", ""]
                hdr2 += ["", "U · check", f"h allow, {big}", "Cond."]
                spans.append(("SPAN", (2 + 4 * k, 0), (5 + 4 * k, 0)))
            # one row per distinct set of cells, listing its bays
            distinct: dict[tuple, list[str]] = {}
            looks: dict[tuple, list[tuple[str, object]]] = {}
            for bay in bays(lv):
                key: list[object] = []
                look: list[tuple[str, object]] = []
                any_result = False
                for z, ld in group:
                    b = by.get((z.id, ld.name, lv.id, bay.id))  # type: ignore[attr-defined]
                    if b is None:
                        key.append(("–",))
                        look.append(("–", None))
                        continue
                    any_result = True
                    o = content.OUTCOMES.get(b.response,
                                             content.OUTCOMES[content.NOT_ASSESSED])
                    nums = sorted(set(conds_of.get((z.id, ld.name, bay.id), [])))  # type: ignore
                    # max U with its own check (the worst point's check can
                    # differ: droprig.solver.results.BaySummary)
                    u_chk = b.utilisation_check or b.governing_check
                    cells = (o.tag, f"{fmt_util(b.max_utilisation)} "
                             f"{u_chk.replace('_', ' ')}",
                             _h_allow(b.allowable_drop_height, self.sys),
                             " ".join(f"C{n}" for n in nums))
                    key.append(cells)
                    look.append((b.response, cells))
                if not any_result:
                    continue
                distinct.setdefault(tuple(key), []).append(bay.id)
                looks[tuple(key)] = look
            rows: list[list[object]] = [hdr1, hdr2]
            extra: list[tuple] = list(spans)
            for key_, bay_ids in distinct.items():
                row_no += 1
                for bay_id in bay_ids:
                    rows_of_bay.setdefault((lv.id, bay_id), []).append(row_no)
                r = len(rows)
                row: list[object] = [f"R{row_no}", self.P(
                    "<b>" + esc(", ".join(bay_ranges(lv, bay_ids))) + "</b>")]
                for k, (response, cells) in enumerate(looks[key_]):
                    if cells is None:
                        row += ["–", "", "", ""]
                        continue
                    tag, util, h, cond = cells  # type: ignore[misc]
                    row += [tag, self.P(esc(util)), h, self.P(cond)]
                    extra.append(_outcome_bg(response, 2 + 4 * k, r))
                    extra.append(_outcome_ink(response, 2 + 4 * k, r))
                rows.append(row)
            w = self.w
            cw = [0.05 * w, 0.13 * w]
            for _ in group:
                cw += [0.035 * w, 0.11 * w, 0.075 * w, 0.06 * w]
            scale = w / sum(cw) if sum(cw) > w else 1.0
            cw = [c * scale for c in cw]
            extra += [("ALIGN", (2, 1), (-1, -1), "CENTER"),
                      ("BACKGROUND", (0, 0), (-1, 1), "#2E2E2E")]
            self.story.append(_table(rows, cw, header_rows=2, extra=extra))
            self.story.append(Spacer(1, 6))
        self.story.extend(self.bay_index(rows_of_bay))
        self.story.append(self.P(
            "Governing points and every step of the calculation: appendix B. The least "
            "allowable height of a bay is the least over its drop points, each with its "
            "own governing check.", st.small))

    def bay_index(self, rows_of_bay: dict[tuple[str, str], list[int]]) -> list[object]:
        """Every bay of every level with a result, by its grid lines: the rows of the
        bay × load table that give its outcome (the table lists bays in ranges)."""
        from reportlab.platypus import Spacer

        if not rows_of_bay:
            return []
        flow: list[object] = [
            self.P("Index of bays: the rows that give each bay", self.st.h2),
            self.P("A column is the bays between two x grid lines, a line the bays between "
                   "two y grid lines; the cell names the rows of the tables above that give "
                   "the bay's outcome for each load ('–': no load reaches the bay).",
                   self.st.small)]
        for lv in content.levels_of(self.p, self.zones):
            g = lv.grid
            nx, ny = len(g.x_lines) - 1, len(g.y_lines) - 1
            if not any((lv.id, b.id) in rows_of_bay for b in bays(lv)):
                continue
            head = [f"Level {lv.id}"] + [f"{g.x_labels[i]}-{g.x_labels[i + 1]}"
                                         for i in range(nx)]
            rows: list[list[object]] = [head]
            for j in range(ny):
                y_id = f"{g.y_labels[j]}-{g.y_labels[j + 1]}"
                row: list[object] = [y_id]
                for i in range(nx):
                    bay_id = f"{g.x_labels[i]}-{g.x_labels[i + 1]}/{y_id}"
                    nums = rows_of_bay.get((lv.id, bay_id), [])
                    row.append(" ".join(f"R{n}" for n in nums) or "–")
                rows.append(row)
            # columns of the bays along x; a level wider than a page splits them
            per = max(1, min(nx, 14))
            for c0 in range(0, nx, per):
                sub = [[r[0], *r[1 + c0:1 + c0 + per]] for r in rows]
                cw = [0.1 * self.w] + [0.9 * self.w / per] * (len(sub[0]) - 1)
                flow.append(_table(sub, cw, header_rows=1,
                                   extra=[("ALIGN", (1, 1), (-1, -1), "CENTER")]))
                flow.append(Spacer(1, 4))
        return flow

    # ------------------------------------------------------------ 4 inputs
    def inputs(self) -> None:
        from reportlab.platypus import Spacer

        st = self.st
        w = self.w
        self.section("inputs")
        self.story.append(self.P("Loads", st.h2))
        hdr = ["Zone", "Load", "Kind", "Mass", "Mass source", "Footprint L × W",
               "Hook elevation", "Hang length", "Drop height", "Underside"]
        rows: list[list[object]] = [hdr]
        for z in self.zones:
            lv = self.p.level(z.level_id)
            for ld in z.loads:
                try:
                    h = self.v(ld.height_above(lv.elevation), "length")
                except ModelError:
                    h = "below the surface"
                rows.append([
                    z.id, self.P(esc(ld.name)), ld.kind, self.v(ld.mass, "mass"),
                    self.P(_mass_source_cell(ld)),
                    f"{self.v(ld.footprint_length, 'length')} × "
                    f"{self.v(ld.footprint_width, 'length')}",
                    self.v(ld.hook_elevation, "length") if ld.hook_elevation is not None
                    else "not given (drop height given)",
                    self.v(ld.hang_length, "length"), h,
                    self.P("rigid" if ld.contact_stiffness is None else
                           fmt_sig(ld.contact_stiffness, "stiffness", self.sys, 3)),
                ])
        self.story.append(_table(rows, [0.06 * w, 0.14 * w, 0.07 * w, 0.08 * w, 0.15 * w,
                                        0.12 * w, 0.11 * w, 0.08 * w, 0.09 * w, 0.1 * w]))
        hard = [(z, ld) for z in self.zones for ld in z.loads if is_hard(ld)]
        if hard:
            self.story.append(self.P("Hard items: local damage of the deck", st.h2))
            for z, ld in hard:
                left = [o for o in ("flat", "edge", "corner")
                        if o not in ld.strike_orientations]
                why = (f"; {', '.join(left)} left out: {esc(ld.strike_reason)}"
                       if left else "")
                self.story.append(self.P(
                    f"{esc(z.id)} / {esc(ld.name)}: checked striking "
                    f"{', '.join(ld.strike_orientations)}{why}; edge bearing width "
                    f"{self.v(ld.edge_width, 'small_length')}."))
        prot = [p for p in self.p.protection_areas
                if p.level_id in {z.level_id for z in self.zones}]
        self.story.append(self.P("Pads and mats", st.h2))
        if prot:
            rows = [["Id", "Name", "Level", "Extent x (from–to)", "Extent y (from–to)",
                     "Specification"]]
            for p in prot:
                a = p.area
                rows.append([p.id, self.P(esc(p.name)), p.level_id,
                             f"{self.v(a.x0, 'length')} – {self.v(a.x1, 'length')}",
                             f"{self.v(a.y0, 'length')} – {self.v(a.y1, 'length')}",
                             self.P(esc(pad_spec(p, self.sys, self.p)))])
            self.story.append(_table(rows, [0.07 * w, 0.2 * w, 0.07 * w, 0.14 * w, 0.14 * w,
                                            0.38 * w]))
        else:
            self.story.append(self.P("None.", st.body))
        self.story.append(self.P("Crane zones", st.h2))
        rows = [["Zone", "Crane", "Level", "Crane at (x, y)", "Radius", "Slew arc",
                 "Drift margin", "Corridor"]]
        for z in self.zones:
            rows.append([z.id, self.P(esc(z.name)), z.level_id,
                         f"{self.v(z.crane[0], 'length')}, {self.v(z.crane[1], 'length')}",
                         f"{self.v(z.r_min, 'length')} – {self.v(z.r_max, 'length')}",
                         f"{_deg(z.slew_start)} – {_deg(z.slew_start + z.slew_sweep)}",
                         self.v(z.drift_margin, "length"),
                         f"{len(z.corridor)} points" if z.corridor else "none"])
            rows.append(self.crane_row(z))
        extra = [("SPAN", (1, r), (-1, r)) for r in range(2, len(rows), 2)]
        self.story.append(_table(rows, [0.06 * w, 0.25 * w, 0.06 * w, 0.15 * w, 0.14 * w,
                                        0.13 * w, 0.1 * w, 0.11 * w], extra=extra))
        self.story.extend(self.point_inputs())
        self.story.append(self.P("Design criteria and settings", st.h2))
        s = self.p.settings
        crit = [
            ("Design basis", _basis(self.p)),
            ("Resistance factor (accidental situation)", f"{s.resistance_factor:.2f}"),
            ("Dynamic increase factor on yield", f"{s.dynamic_increase_factor:.2f}"),
            ("Ductility limit μ; support rotation limit θ",
             f"{s.ductility_limit:g}; {_deg(s.rotation_limit)}"),
            ("Deflection limit (information only)", f"span / {s.deflection_limit_ratio:g}"),
            ("Drop-point grid", self.v(s.grid_resolution, "length")),
            ("Member mass in the struck mass; existing loads",
             ("included" if s.include_member_mass else "ignored") + "; "
             + ("included" if s.include_existing_loads else "ignored")),
            ("Dynamic amplification; tilted landing",
             ("on" if s.dynamic_amplification else "off") + "; "
             + (f"checked, any tilt up to {_deg(s.design_tilt)}" if s.tilted_landing
                else "not checked")),
        ]
        half = (len(crit) + 1) // 2
        rows2 = []
        for k in range(half):
            a = crit[k]
            b = crit[k + half] if k + half < len(crit) else ("", "")
            rows2.append([self.P(esc(a[0])), self.P(f"<b>{esc(a[1])}</b>"),
                          self.P(esc(b[0])), self.P(f"<b>{esc(b[1])}</b>")])
        self.story.append(_table(rows2, [0.3 * w, 0.2 * w, 0.3 * w, 0.2 * w], header_rows=0))
        self.story.append(self.P("Assumptions", st.h2))
        amp = (AMPLIFICATION_ON if self.p.settings.dynamic_amplification
               else AMPLIFICATION_OFF)
        for a in ASSUMPTIONS:
            self.story.append(self.P(esc(a.format(amplification=amp,
                                                  **{k: self.ref(k) for k in self.refs})),
                                     st.bullet, bulletText="•"))
        self.story.append(self.P("Not checked by droprig (needs a separate check and "
                                 "sign-off)", st.h2))
        # the energy-method-only statement is the first assumption's (no second copy)
        items = [n for n in (getattr(self.permit, "not_checked", ()) or ())
                 if n != ENERGY_ONLY]
        if not items:
            items = [n[0].upper() + n[1:] + "." for n in NOT_CHECKED]
        else:
            items += [n[0].upper() + n[1:] + "." for n in NOT_CHECKED[2:3]]
        for n in dict.fromkeys(items):
            self.story.append(self.P(esc(n), st.bullet, bulletText="•"))
        if self.r.warnings:
            self.story.append(self.P("Analysis warnings", st.h2))
            for wmsg in self.r.warnings:
                self.story.append(self.P(esc(wmsg[0].upper() + wmsg[1:]), st.bullet,
                                         bulletText="•"))
        self.story.append(Spacer(1, 3))
        self.story.append(self.P(esc(_caution()), st.caution))

    def crane_row(self, z: LiftZone) -> list[object]:
        """A row under the zone's row (spanning the table): crane and configuration."""
        crane = esc(z.crane_description) or _NOT_RECORDED_CELL
        conf = esc(z.crane_configuration) or _NOT_RECORDED_CELL
        return ["", self.P(f"Crane: {crane}. Configuration: {conf}."), "", "", "", "", "", ""]

    def point_inputs(self) -> list[object]:
        """The zones' pick-up and set-down points (none recorded: page 1 says so)."""
        w = self.w
        pts = permit_fields.point_rows(self.p, self.zones)
        if not pts:
            return []
        flow: list[object] = [self.P("Pick-up and set-down points (symbols on the "
                                     "conditions plan)", self.st.h2)]
        big = "ft" if self.sys == "US" else "m"
        rows = [["Zone", "Point", "Kind", "Description", f"x, {big}", f"y, {big}", "Bay"]]
        for r in pts:
            rows.append([r.zone_id, r.tag, r.kind, self.P(esc(r.label) or "–"),
                         self.v(r.x, "length").split(" ")[0],
                         self.v(r.y, "length").split(" ")[0], self.P(esc(r.bay))])
        flow.append(_table(rows, [0.06 * w, 0.07 * w, 0.09 * w, 0.4 * w, 0.11 * w,
                                  0.11 * w, 0.16 * w]))
        return flow

    # ------------------------------------------------------------ contents
    def contents(self, sheets: Sequence[SheetDoc]) -> None:
        entries = [(k, HEADINGS[k]) for k in BODY_SECTIONS]
        entries += [(k, HEADINGS[k]) for k in ("members", "sheets")]
        entries += [(f"sheet:{n + 1}", f"      {title}") for n, title in
                    enumerate(self.sheet_titles)]
        entries += [(k, HEADINGS[k]) for k in ("verification", "references", "revisions")]
        self.section("contents")
        self.story.append(_contents(entries, self.w, self.book))

    # ------------------------------------------------------------ A members
    def members(self, levels: Sequence[Level]) -> None:
        st = self.st
        self.section("members")
        self.story.append(self.P(_resistance_note(self.p) + " Members with the same role, "
                                 "section, grade, span and ends share a row, which lists "
                                 "them all.", st.small))
        decks: dict[str, list[str]] = {}  # the same deck on several levels: once
        for lv in levels:
            dk = lv.deck
            text = (f"{esc(dk.kind.replace('_', ' '))}, "
                    f"{_deck_words(dk, self.v)}; {len(dk.openings)} opening(s). "
                    f"Superimposed dead {self.v(lv.superimposed_dead, 'pressure')}, live "
                    f"left in place {self.v(lv.live_in_place, 'pressure')}. Level "
                    "below " + ("occupied or open to people during the lift."
                                if lv.occupied_below else
                                "recorded as unoccupied during the lift (the user's "
                                "entry): scabbing of the soffit is a note, not an "
                                "exclusion."))
            decks.setdefault(text, []).append(lv.id)
        for text, ids in decks.items():
            names = id_ranges([lv.id for lv in levels], ids)
            word = "level" if len(ids) == 1 else "levels"
            self.story.append(self.P(
                f"Deck of {word} <b>{esc(', '.join(names))}</b>: {text}", st.small))
        su = {"SI": ("m", "MPa", "kN·m", "kN", "kN·m²"),
              "US": ("ft", "ksi", "kip·ft", "kip", "10⁶ kip·in²")}[self.sys]
        hdr = ["Members", "Role", "Section", "Grade", f"Span, {su[0]}", "Ends",
               f"fy, {su[1]}", "Class", f"Flexure resistance, {su[2]}",
               f"Shear resistance, {su[3]}", f"EI, {su[4]}"]
        # one row per distinct member as printed (the same section, grade, span,
        # ends and resistances), listing every member it stands for: a tall
        # building repeats its floors, and its table grows with distinct members
        rows_of: dict[tuple[str, ...], dict[str, list[str]]] = {}
        memo: dict[tuple, tuple[str, ...]] = {}
        for lv in levels:
            for m in lv.members:
                mk = (m.role, m.section, m.grade, m.span, m.end_condition)
                cells = memo.get(mk)
                if cells is None:
                    res = member_resistances(m, self.p.settings)
                    cells = memo[mk] = (
                        m.role, m.section.name, m.grade.name,
                        self.v(m.span, "length").split(" ")[0], m.end_condition,
                        self.v(res.fy, "stress").split(" ")[0],
                        _CLASS_TAG.get(res.section_class, res.section_class),
                        self.v(res.flexure, "moment").split(" ")[0]
                        if res.flexure is not None else "out of scope",
                        self.v(res.shear, "force").split(" ")[0] if res.shear is not None
                        else "out of scope",
                        _ei(res.EI, self.sys))
                rows_of.setdefault(cells, {}).setdefault(lv.id, []).append(m.id)
        order = [lv.id for lv in levels]
        many = len(levels) > 1
        rows: list[list[object]] = [hdr]
        for cells, by_level in rows_of.items():
            where: dict[str, list[str]] = {}
            for lv_id, ids in by_level.items():
                where.setdefault(", ".join(ids), []).append(lv_id)
            text = "; ".join(
                (f"{ids} on level{'s' if len(lvs) > 1 else ''} "
                 f"{', '.join(id_ranges(order, lvs))}" if many else ids)
                for ids, lvs in where.items())
            rows.append([text, *cells])
        w = self.w
        self.story.append(_table(rows, [0.25 * w, 0.06 * w, 0.08 * w, 0.06 * w, 0.06 * w,
                                        0.07 * w, 0.06 * w, 0.06 * w, 0.1 * w, 0.1 * w,
                                        0.1 * w],
                                 extra=[("ALIGN", (4, 1), (4, -1), "RIGHT"),
                                        ("ALIGN", (6, 1), (6, -1), "RIGHT"),
                                        ("ALIGN", (8, 1), (-1, -1), "RIGHT")]))

    # ------------------------------------------------------------ B sheets
    def sheets(self, docs: Sequence[SheetDoc]) -> None:
        from reportlab.platypus import CondPageBreak, Spacer

        st = self.st
        self.section("sheets")
        self.story.append(self.P(
            "One sheet per distinct governing case: drop points whose results print the "
            f"same to {SIG} significant figures share a sheet, which lists every load, bay "
            "and reason it stands for. Every substituted formula gives the printed result "
            "from the printed numbers; where a step's result does not follow from its "
            "formula alone, the sheet says so. Sources are cited by their number in "
            "appendix C. A sheet is worked at one drop point and lists every level, "
            "lift zone and bay where the same calculation holds; a bay range such as "
            "2-5/A-C stands for every bay between grid lines 2 and 5 and lines A and C.",
            st.small))
        for n, doc in enumerate(docs):
            g = doc.group
            if n:
                self.story.append(CondPageBreak(0.45 * self.h))
                self.story.append(Spacer(1, 8))
            title = self.sheet_titles[n]
            self.story.append(_marker(f"sheet:{n + 1}",
                                      f"{HEADINGS['sheets']} — B.{n + 1}", self.book))
            self.story.append(self.P(esc(title), st.h2))
            covers = covers_text(g.covers, self.p)
            zones = id_ranges([z.id for z in self.p.lift_zones],
                              [c.zone_id for c in g.covers])
            where = (f"lift zone {zones[0]}" if len(zones) == 1 and "–" not in zones[0]
                     else f"lift zones {', '.join(zones)}")
            self.story.append(self.P(
                f"Worked at: lift zone <b>{esc(g.zone_id)}</b> · load "
                f"<b>{esc(g.load_name)}</b> · level {esc(self.p.zone(g.zone_id).level_id)}"
                f" · drop point x = {self.coord(g.x)}, y = {self.coord(g.y)} "
                f"(bay {esc(g.bay_id)}). <b>Covers</b>: in {esc(where)} — {esc(covers)}. "
                "The same numbers hold at every place listed.", st.small))
            self.story.extend(self._sheet_inputs(doc))
            self.story.append(self._sheet_steps(doc))
            self.story.extend(self._sheet_outcome(doc))

    def _sheet_inputs(self, doc: SheetDoc) -> list[object]:
        g = doc.group
        z = self.p.zone(g.zone_id)
        load = next(ld for ld in z.loads if ld.name == g.load_name)
        level = self.p.level(z.level_id)
        c, i = doc.case, doc.index
        parts = [f"Level {level.id}: {level.name}",
                 f"load mass {fmt_sig(load.mass, 'mass', self.sys)}, weight W = "
                 f"{fmt_sig(load.weight, 'force', self.sys)}, footprint "
                 f"{self.v(load.footprint_length, 'length')} × "
                 f"{self.v(load.footprint_width, 'length')}"]
        if c is not None and i is not None:
            prot = int(c.protection[i])
            if prot >= 0 and doc.trace.pad_edge == "tip_off":
                # the tip-off governs: the deck beside the pad is struck (trace_point)
                pa = self.p.protection_areas[prot]
                parts.append(f"struck surface: bare deck beside the edge of pad {pa.id} "
                             f"({pad_spec(pa, self.sys, self.p)}), the load tipping over "
                             "that edge (the tip-off governs; steps below)")
            else:
                parts.append("struck surface: bare deck" if prot < 0 else
                             f"struck surface: pad {self.p.protection_areas[prot].id} "
                             f"({pad_spec(self.p.protection_areas[prot], self.sys, self.p)})"
                             + ("; the tip-off over its edge checked too, landing on the "
                                "pad governs" if doc.trace.pad_edge == "on_pad" else ""))
            gm = int(c.governing_member[i])
            if gm != DECK and 0 <= gm < len(level.members):
                m = level.members[gm]
                parts.append(f"governing member {m.id}: {m.section.name} {m.grade.name}, "
                             f"span {self.v(m.span, 'length')}, {m.end_condition}")
            else:
                parts.append("governing element: deck")
        return [self.P(esc("; ".join(parts)) + ".", self.st.small)]

    def _sheet_steps(self, doc: SheetDoc) -> object:
        w = self.w
        cw = [0.04 * w, 0.2 * w, 0.44 * w, 0.14 * w, 0.18 * w]
        R, B = fonts.REGULAR, fonts.BOLD

        def fit(text: str, font: str, k: int) -> str:
            return wrap_text(text, font, MIN_PT, cw[k] - 6)

        rows: list[list[object]] = [["No.", "Step", "Formula = numbers = result",
                                     "Result", "Source"]]
        for k, ln in enumerate(doc.lines):
            rows.append([str(k + 1), fit(ln.title, B, 1),
                         "\n".join(fit(t, R, 2) for t in ln.lines), fit(ln.result, B, 3),
                         fit(ln.source, R, 4)])
        if doc.omitted:
            rows.append(["", "", fit("Not applicable under " + _basis(self.p) + ": "
                                     + ", ".join(doc.omitted) + ".", R, 2), "", ""])
        return _table(rows, cw, wrap=False, extra=[("FONTNAME", (1, 1), (1, -1), B),
                                                   ("FONTNAME", (3, 1), (3, -1), B)])

    def _sheet_outcome(self, doc: SheetDoc) -> list[object]:
        c, i = doc.case, doc.index
        tr = doc.trace
        vals: list[tuple[str, str]] = []
        if c is not None and i is not None:
            vals = [
                ("Utilisation U", fmt_util(float(c.utilisation[i]))
                 + (f" ({tr.utilisation_check.replace('_', ' ')})"
                    if tr.utilisation_check else "")),
                ("Governing member · check",
                 fmt_worst_point(tr.governing_member, tr.governing_check, tr.response)),
                ("Response", content.OUTCOMES.get(tr.response,
                                                  content.OUTCOMES["none"]).label),
                ("Allowable drop height (elastic), above the finished surface",
                 _allow_sig(float(c.allowable_drop_height[i]), self.sys)),
                ("Allowable drop height (beyond yield)",
                 _allow_sig(float(c.allowable_drop_height_plastic[i]), self.sys)),
                ("Allowable mass at the planned height",
                 _allow_sig(float(c.allowable_mass[i]), self.sys, "mass")),
            ]
        rows = [[self.P(esc(a)), self.P(f"<b>{esc(b)}</b>")] for a, b in vals]
        extra = []
        for k, (a, _) in enumerate(vals):
            if a == "Response":
                extra += [_outcome_bg(tr.response, 1, k), _outcome_ink(tr.response, 1, k)]
        return [_table(rows, [0.5 * self.w, 0.5 * self.w], header_rows=0, extra=extra)]

    # ------------------------------------------------------------ B2 verification
    def verification(self, rows: Sequence[Sequence[str]],
                     skipped: list[tuple[object, str]] | None = None,
                     notes: Sequence[str] = ()) -> None:
        """The time history beside the energy method and the verdict at each bay's
        governing point (:mod:`droprig.report.verification`); the bays whose
        governing point could not be verified are named, with why, and ``notes`` say
        what is verified where the tip-off over a pad's edge governs
        (:func:`droprig.report.verification.pad_edge_words`)."""
        from droprig.report.verification import (
            VERIFICATION_NOTE,
            VERIFICATION_OFF,
            skipped_words,
        )

        self.section("verification")
        self.story.append(self.P(esc(VERIFICATION_NOTE), self.st.small))
        if not self.p.settings.dynamic_amplification:
            self.story.append(self.P(f"<b>{esc(VERIFICATION_OFF)}</b>", self.st.small))
        for line in [*skipped_words(list(skipped or [])), *notes]:
            self.story.append(self.P(esc(line), self.st.small))
        if not rows:
            self.story.append(self.P("No governing point could be verified (points on a "
                                     "support or off the deck).", self.st.small))
            return
        self.story.append(verification_table(rows, self.w, self.st))

    # ------------------------------------------------------------ C, D
    def references_page(self) -> None:
        self.section("references")
        self.story.append(self.P(
            "Cited on the calculation sheets and in the assumptions by number. Clauses of "
            "the design basis the project does not use are not listed.", self.st.small))
        for k, r in enumerate(references.applicable(self.p)):
            self.story.append(self.P(f"[{k + 1}]&nbsp;&nbsp;" + esc(r.text), self.st.cond))

    def revisions(self) -> None:
        from reportlab.platypus import Spacer

        self.section("revisions")
        info = self.p.info
        now = _dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC")
        rows = [["Rev", "Date", "Description", "Prepared by"],
                [info.revision or NOT_GIVEN, info.date or NOT_GIVEN,
                 self.P(esc(f"This annex, generated {now} by droprig {__version__} from "
                            f"{self.fp.source}.")), self.P(esc(info.prepared_by or NOT_GIVEN))]]
        for _ in range(3):
            rows.append(["", "", "", ""])
        w = self.w
        self.story.append(_table(rows, [0.08 * w, 0.14 * w, 0.56 * w, 0.22 * w],
                                 extra=[("BOTTOMPADDING", (0, 2), (-1, -1), 10)]))
        self.story.append(Spacer(1, 4))
        self.story.append(self.P(
            "Earlier revisions are not recorded in the project file: enter them by hand. "
            f"{esc(self.fp.label)}:", self.st.small))
        self.story.append(self.P(self.fp.sha256, self.st.mono))
        if info.description.strip():
            self.story.append(self.P("Description of the lift (as entered)", self.st.h2))
            self.story.append(self.P(esc(info.description).replace("\n", "<br/>"),
                                     self.st.small))


# ----------------------------------------------------------------------- sheets


_NOT_RECORDED_CELL = f"<b>{permit_fields.NOT_RECORDED}</b>"


def _mass_source_cell(ld: object) -> str:
    """The mass source in words, or NOT RECORDED with what to confirm."""
    words = permit_fields.mass_source_text(ld)  # type: ignore[arg-type]
    if words == permit_fields.NOT_RECORDED:
        return f"{_NOT_RECORDED_CELL}: confirm (weighed, data plate, drawing)"
    return esc(words)


def covers_text(covers: Sequence[content.Covered], project: Project | None = None) -> str:
    """What a calculation sheet stands for, one clause per (load, reason).

    With ``project``, each clause's bays are condensed per level to grid ranges
    (:func:`droprig.model.bay_ranges`) and levels with the same ranges are named
    together: "pallet: 3-5/B-D, 6-7/C-D on levels L01–L10; 2-3/F-G on level L02
    (highest utilisation)". Without it (or for a cover whose level is unknown),
    the bays are listed as given: "pallet: bays A-B/1-2, B-C/1-2 (governing
    point)". Each (load, bay, reason) is named once; linear in the covers (a sheet
    of a large project stands for hundreds of bays).
    """
    from droprig.model import bay_ranges

    groups: dict[tuple[str, str], dict[str, dict[str, None]]] = {}
    for c in covers:
        lv = c.level_id if project is not None else ""
        groups.setdefault((c.load_name, c.reason), {}).setdefault(lv, {})[c.bay_id] = None
    level_order = [lv.id for lv in project.levels] if project is not None else []
    known = set(level_order)
    parts = []
    for (load, reason), by_level in groups.items():
        places: dict[str, list[str]] = {}  # ranges text -> levels, in first-seen order
        plain: dict[str, None] = {}
        for lv_id, bay_ids in by_level.items():
            if project is None or lv_id not in known:
                plain.update(bay_ids)
                continue
            ranges = ", ".join(bay_ranges(project.level(lv_id), bay_ids))
            places.setdefault(ranges, []).append(lv_id)
        clauses = []
        for ranges, lvs in places.items():
            names = id_ranges(level_order, lvs)
            word = "level" if len(lvs) == 1 else "levels"
            clauses.append(f"{ranges} on {word} {', '.join(names)}")
        if plain:
            word = "bay" if len(plain) == 1 else "bays"
            clauses.append(f"{word} {', '.join(plain)}")
        parts.append(f"{load}: {'; '.join(clauses)} ({reason})")
    return "; ".join(parts)


@functools.lru_cache(maxsize=8192)
def wrap_text(text: str, font: str, size: float, width: float) -> str:
    """``text`` broken into lines of at most ``width`` pt (greedy, at spaces; a word
    longer than a line is broken inside). Plain strings in table cells draw far
    faster than paragraphs, and a sheet has hundreds of them; remembered (a third of a
    rooftop annex's 6,830 calls are distinct: the sheets repeat their titles, sources
    and words)."""
    from reportlab.pdfbase.pdfmetrics import stringWidth

    out: list[str] = []
    for para in text.split("\n"):
        cur = ""
        for word in para.split(" "):
            trial = f"{cur} {word}" if cur else word
            if stringWidth(trial, font, size) <= width:
                cur = trial
                continue
            if cur:
                out.append(cur)
            cur = word
            while stringWidth(cur, font, size) > width and len(cur) > 1:
                k = len(cur) - 1
                while k > 1 and stringWidth(cur[:k], font, size) > width:
                    k -= 1
                out.append(cur[:k])
                cur = cur[k:]
        out.append(cur)
    return "\n".join(out)



@dataclass(frozen=True)
class SheetLine:
    """One printed step: title, lines (formula = numbers), result, cited source."""

    title: str
    lines: tuple[str, ...]
    result: str
    source: str
    checked: bool


@dataclass(frozen=True)
class SheetDoc:
    group: content.SheetGroup
    trace: Trace
    case: CaseResult | None
    index: int | None
    lines: tuple[SheetLine, ...]
    omitted: tuple[str, ...]


_REWRITE = {
    # trace formulas written so the printed numbers can be put straight in
    "h_allow": "h_allow = δ_st·((F_allow/W − 1)² − 1)/(2η)",
    "δ_max/δ_lim": "δ_max/δ_lim = δ_max/(L/N)",
}

REL_TOL = 3e-3
"""A substituted formula must give the printed result within this relative
difference plus half a unit of the result's last printed digit: 4 significant
figures on every input (common practice, no source)."""


def step_text(step: TraceStep, system: str, project: Project) -> SheetLine:
    """The lines of one step as a sheet prints them, each substituted formula
    re-evaluated from its printed numbers before it is printed."""
    from droprig import tracefmt

    formula = references.strip_internal(_REWRITE.get(step.symbol, step.formula)).strip()
    sym = step.symbol
    if sym and formula.startswith(f"{sym} ="):
        lhs, rhs = f"{sym} = ", formula[len(sym) + 2:].strip()
    elif sym and "=" not in formula:
        lhs, rhs = f"{sym} = ", formula
    elif " = " in formula:  # the formula's own left side (U = … for U_flexure)
        head, rhs = formula.split(" = ", 1)
        lhs = f"{head} = "
    else:
        lhs, rhs = "", formula
    result = fmt_sig(step.value, step.quantity, system)  # type: ignore[arg-type]
    lines = [lhs + rhs]
    checked = False
    inputs = dict(step.inputs)

    def listed(keys: Sequence[str]) -> str:
        return "with " + ", ".join(
            f"{k} = {fmt_sig(inputs[k][0], inputs[k][1], system)}"  # type: ignore[arg-type]
            for k in keys)

    if inputs:
        subst, unused = tracefmt.substitute_all(
            rhs, inputs, lambda v, q: fmt_sig(v, q, system))  # type: ignore[arg-type]
        val = evaluate(subst) if subst != rhs else None
        ok = False
        if val is not None and math.isfinite(step.value):
            tol = REL_TOL + printed_tolerance(result)
            ok = abs(val - step.value) <= tol * max(abs(step.value), 1e-300) or (
                step.value == 0 and abs(val) < 1e-12)
        if ok:
            lines = [f"{lhs}{rhs} = {subst} = {result}"]
            if unused:
                lines.append(listed(unused))
            checked = True
        else:
            lines.append(listed(list(inputs)))
            if val is not None:
                lines.append("The result comes from the analysis at this point: another "
                             "branch of the method governs here (a crushable layer, a "
                             "limit of another check), so the formula above does not "
                             "give it from these numbers.")
    return SheetLine(references.strip_internal(step.title), tuple(lines),
                     f"{sym} = {result}" if sym else result,
                     references.cite(step.source, project), checked)


def sheet_doc(project: Project, results: Results, group: content.SheetGroup) -> SheetDoc:
    from droprig.solver import trace_point

    tr = trace_point(project, group.zone_id, group.load_name, group.x, group.y)
    case = content._case(results, group.zone_id, group.load_name)
    idx = None
    if case is not None and case.n:
        import numpy as np

        d2 = (case.x - group.x) ** 2 + (case.y - group.y) ** 2
        k = int(np.argmin(d2))
        idx = k if d2[k] <= 1e-12 else None
    system = project.settings.unit_system
    lines, omitted = [], []
    for s in tr.steps:
        r = s.inputs.get("R")
        if s.symbol.startswith("U_") and r is not None and math.isinf(r[0]):
            omitted.append(s.symbol[2:].replace("_", " "))
            continue
        if s.symbol == "k_req" and not math.isfinite(s.value):
            continue
        lines.append(step_text(s, system, project))
    return SheetDoc(group, tr, case, idx, tuple(lines), tuple(omitted))


def _h_allow(h: float | None, system: str) -> str:
    """An allowable drop height in the project's length unit (m / ft), without the
    unit, to :data:`droprig.permit.SIG_HEIGHT` significant figures rounded down: the
    digits and unit of the permit conditions and of the window's table
    (:func:`droprig.permit.fmt_height`). Page 1 printed it in mm / in beside a
    planned height in m / ft ("3.00" ft beside "1.25" in), which a signer must
    convert to compare (common practice, no source: one quantity, one unit)."""
    if is_none(h):
        return "none"
    assert h is not None
    if math.isinf(h):
        return "no limit"
    if h <= 0:
        return "0"
    return fmt_height(h, system, unit=False)  # type: ignore[arg-type]


def _h_planned(h: float, system: str) -> str:
    """A planned drop height as :func:`_h_allow` prints an allowable one, rounded to
    the nearest shown digit (a planned value, not a limit)."""
    return fmt_height(h, system, rounding="nearest", unit=False)  # type: ignore[arg-type]


def _allow_sig(v: float, system: str, quantity: str = "length") -> str:
    """An allowable height or mass of a point sheet, rounded down. A height reads as
    the permit conditions print it (:func:`droprig.permit.fmt_height`: m / ft, three
    significant figures); the sheet printed "1.566 in" where page 1 and the
    conditions read feet (common practice, no source: one quantity, one unit)."""
    if is_none(v):
        return "none"
    if math.isinf(v):
        return "no limit"
    if quantity == "length":
        return fmt_height(v, system)  # type: ignore[arg-type]
    return units.fmt_sig(v, quantity, system, sig=SIG_HEIGHT,  # type: ignore[arg-type]
                         rounding="down")


# ----------------------------------------------------------------------- members


def _resistance_note(project: Project) -> str:
    s = project.settings
    n = references.numbers(project)
    if s.design_basis == "aisc360":
        src = (f"flexure Mn [{n['aisc360']}] F2.1 Eq. F2-1, noncompact flanges F3.2; shear "
               f"Vn = 0.6·Fy·Aw·Cv1 [{n['aisc360']}] Eq. G2-1; class: compact (C), "
               "noncompact (N), slender (S) flange per Table B4.1b")
    else:
        src = (f"flexure Mc,Rd = Wpl·fy (Class 1, 2; [{n['en1993_1_1']}] Eq. 6.13) or "
               f"Wel·fy (Class 3, Eq. 6.14); shear Vpl,Rd = Av·fy/√3 ([{n['en1993_1_1']}] "
               f"Eq. 6.18, shear buckling [{n['en1993_1_5']}] §5); class per "
               f"[{n['en1993_1_1']}] Table 5.2")
    return (f"Resistances used in the analysis, with the resistance factor "
            f"{s.resistance_factor:.2f} and the dynamic increase factor "
            f"{s.dynamic_increase_factor:.2f} on yield: {src}. 'out of scope': the section "
            "is outside what droprig assesses. Web and deck checks depend on the drop "
            "point and are on the calculation sheets (appendix B).")


_CLASS_TAG = {"compact": "C", "noncompact": "N", "slender": "S"}


def _ei(value: float, system: str) -> str:
    """Flexural rigidity E·I: kN·m² (SI) or 10⁶ kip·in² (US; 1 kip = 4448.2216 N,
    1 in = 0.0254 m, NIST SP 811 B.8), number only (the unit is in the header)."""
    if system == "US":
        return f"{value / 4448.2216152605 / 0.0254 ** 2 / 1e6:.1f}"
    return f"{value / 1e3:.0f}"


# ----------------------------------------------------------------------- entry

PAPER = {"A4": None, "Letter": None}


def write_annex(project: Project, results: Results, path: str | os.PathLike[str], *,
                project_path: str | os.PathLike[str] | None = None, lift: str | None = None,
                paper: str | None = None, progress: Progress | None = None) -> int:
    """Write the lift-permit annex PDF for ``project`` and its ``results`` to ``path``.

    ``project_path``: the ``.droprig`` file the project was read from (its SHA-256
    is printed); ``lift``: only this lift zone id (``ModelError`` naming the ids
    otherwise); ``paper``: ``"A4"`` or ``"Letter"`` (default: Letter for US units,
    A4 otherwise); ``progress(fraction, text)`` is called as the work advances
    (safe to call from a worker thread: no Qt, no shared state). The file is
    written atomically (temporary file in the same folder, then
    :func:`os.replace`); on any error no file is left behind. Returns the page
    count.
    """
    from reportlab.lib.pagesizes import A4, LETTER
    from reportlab.platypus import BaseDocTemplate, Frame, PageTemplate

    def tick(f: float, text: str) -> None:
        if progress is not None:
            progress(min(max(f, 0.0), 1.0), text)

    system = project.settings.unit_system
    if paper is None:
        paper = "Letter" if system == "US" else "A4"
    if paper not in PAPER:
        raise ModelError("paper", paper, "A4 or Letter")
    tick(0.0, "Preparing the annex")
    fonts.register()
    check_printable(project)
    zones = content.select_zones(project, lift)
    fp = fingerprint(project, project_path)
    permit = permit_conditions(project, results)
    groups = content.sheet_groups(project, results, zones)
    # traced level by level: a prepared floor is remembered for a few levels only,
    # and sheets in severity order would prepare the floors of a tall building
    # again and again
    level_pos = {lv.id: n for n, lv in enumerate(project.levels)}
    order = sorted(range(len(groups)),
                   key=lambda n: level_pos.get(project.zone(groups[n].zone_id).level_id, 0))
    by_index: dict[int, SheetDoc] = {}
    for k, n in enumerate(order):
        tick(0.05 + 0.3 * k / max(1, len(groups)), f"Calculation sheet {k + 1} of "
             f"{len(groups)}")
        by_index[n] = sheet_doc(project, results, groups[n])
    docs = [by_index[n] for n in range(len(groups))]
    levels = content.levels_of(project, zones)

    pagesize = LETTER if paper == "Letter" else A4
    fw = pagesize[0] - 2 * MARGIN_X
    fy0 = MARGIN_BOTTOM + FOOTER_H
    fh = pagesize[1] - MARGIN_TOP - HEADER_H - 6 - fy0
    tick(0.35, "Laying out pages")
    book = _Book()
    b = _Builder(project, results, zones, fp, permit, fw, fh, book)
    b.sheet_titles = [f"B.{n + 1}  {d.group.load_name}, bay {d.group.bay_id}: "
                      f"{content.OUTCOMES[d.trace.response].label.lower()}, U "
                      f"{fmt_util(d.group.utilisation)}" for n, d in enumerate(docs)]
    b.verdict_page()
    b.plan_pages()
    b.bay_table()
    b.inputs()
    b.contents(docs)
    if levels and any(lv.members for lv in levels):
        b.members(levels)
    b.sheets(docs)
    tick(0.4, "Time-history verification")
    from droprig.report.verification import verification_rows

    vrows: list[tuple[str, ...]] = []
    vskipped: list[tuple[object, str]] = []
    vnotes: list[str] = []
    for z in zones:
        vrows += verification_rows(project, results, zone_id=z.id, skipped=vskipped,
                                   notes=vnotes)
    b.verification(vrows, vskipped, vnotes)
    b.references_page()
    b.revisions()

    info = project.info
    lift = info.lift_reference
    if lift and info.lift_plan_revision:
        lift = f"{lift} rev {info.lift_plan_revision}"
    header = _Header(info.name, info.site, lift, info.revision, info.date,
                     __version__, fp.sha256, _units(system))
    with atomic_path(path) as tmp:
        doc = BaseDocTemplate(
            str(tmp), pagesize=pagesize, leftMargin=MARGIN_X, rightMargin=MARGIN_X,
            topMargin=MARGIN_TOP + HEADER_H + 6, bottomMargin=fy0,
            title=f"Lift-permit annex — {info.name}", author=info.prepared_by,
            subject=f"Dropped-load assessment, lift {info.lift_reference}",
            creator=f"droprig {__version__}", lang="en")
        frame = Frame(MARGIN_X, fy0, fw, fh, leftPadding=0, rightPadding=0, topPadding=0,
                      bottomPadding=0, id="body")
        doc.addPageTemplates([PageTemplate(id="page", frames=[frame])])
        tick(0.4, "Rendering PDF")
        doc.build(b.story, canvasmaker=_canvas_class(
            header, book, lambda k: tick(min(0.98, 0.4 + 0.012 * k), f"Rendering page {k}")))
    tick(1.0, f"Annex written: {book.pages} pages")
    return book.pages

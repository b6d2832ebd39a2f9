"""The lift-permit annex: a PDF that goes with the permit.

Pages, each section starting on a new page (every page carries the title block
and "page x of y"):

1. Summary — overall verdict, verdict per lift zone and load, caution.
2. Summary by bay — every assessed bay, worst first (as many pages as rows need).
3. Plan — one per level carrying a lift zone: grid, framing, cranes, swing
   regions, drift margins, corridors, protection, bays by outcome, legend.
4. Members — the member table (as many pages as rows need).
5. Calculation sheets — one per governing drop point (continued on a further
   page when the trace is long).
6. Assumptions and limits of the method; hazard cautions.
7. Input identification and sign-off.

Each logical page is one :class:`_Page` (shrunk to fit) followed by a page break,
so the page count follows from the content alone (rows per page are the
constants below) and no table ever spills onto a page that the title block does
not name.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
import math
import os
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from droprig import __version__
from droprig.io.atomic import atomic_path
from droprig.model import Level, LiftZone, Member, Project
from droprig.permit import VERDICT_WORDS, PermitConditions, derive_conditions
from droprig.report import content, fonts
from droprig.report.text import esc, fmt_allow, fmt_util, fmt_value, is_none, substitute_all
from droprig.solver.results import CHECKS, DECK, CaseResult, Results, Trace

Progress = Callable[[float, str], None]

LIFT_ROWS_PER_PAGE = 10
"""Zone × load verdict rows on a summary page."""
BAY_ROWS_PER_PAGE = 20
"""Bay rows on a 'Summary by bay' page."""
MEMBER_ROWS_PER_PAGE = 34
"""Member rows on a 'Members' page."""
STEPS_PER_PAGE = 16
"""Trace steps on one page of a calculation sheet."""

HEADINGS = {
    "summary": "Summary",
    "bays": "Summary by bay",
    "plan": "Plan",
    "members": "Members",
    "sheet": "Calculation sheet",
    "assumptions": "Assumptions and limits of the method",
    "cautions": "Hazard cautions",
    "identification": "Input identification",
    "signoff": "Sign-off",
}

ASSUMPTIONS: tuple[str, ...] = (
    "The peak contact force is applied to the framing quasi-statically: member actions "
    "are the peak force times the static actions of a unit load at the drop point "
    "(energy method, Gere, Mechanics of Materials §9.10).",
    "Contact is perfectly inelastic: the load and the struck framing move together after "
    "contact; the share of kinetic energy left is η = M/(M + mₑ) with mₑ the Rayleigh "
    "effective mass of the load path in its static deflected shape.",
    "The load falls freely from the stated height (no drag, no hoist braking); the whole "
    "load lands on one point of the deck.",
    "Columns are rigid supports; the load path is deck → beams → girders → columns by "
    "statics.",
    "No membrane (catenary) action and no composite action of the deck with the steel is "
    "counted; the deck spans one way between beams.",
    "Members are taken as laterally restrained and compact: lateral-torsional buckling "
    "and local buckling are not checked.",
    "Existing loads (self-weight, superimposed dead and the live load left in place) are "
    "as given in the project and are added to the impact actions.",
    "Beyond yield, flexure is idealised elastic–perfectly plastic with the limits of "
    "ductility and support rotation shown under Settings; shear, web and punching "
    "failures are brittle and have no plastic reserve.",
    "Deflection limits (span/N) are serviceability information, not pass criteria for "
    "an accidental impact.",
)

NOT_CHECKED: tuple[str, ...] = (
    "connections and their bolts or welds",
    "columns, their bases and the foundations",
    "the level below and anything on or under it",
    "secondary impacts, rebound and a load that tips or rolls after landing",
    "fragments, spilled contents and debris",
    "the crane, its rigging, its outrigger or mat bearing and its own stability",
    "vibration, fatigue and damage from earlier drops",
)

CAUTIONS: tuple[str, ...] = (
    "Keep people out from under the load path and out of every swing zone shown in this "
    "annex during the lift, whatever the result: a drop the framing survives can still "
    "kill a person beneath it.",
    "This annex supports the lift plan; it does not replace it. The lift plan, the "
    "pre-lift meeting, the exclusion zones and the emergency arrangements remain the "
    "responsibility of the appointed lifting person / appointed person.",
    "Results are an aid to a competent person only. Defer to local codes and regulations, "
    "the appointed lifting person and a licensed structural engineer, who must review "
    "and accept them before the permit is signed.",
    "Where a bay is marked 'Exceeds limits', do not carry the load over it as planned: "
    "protect it, exclude it from the swing zone or lower the drop height, then re-run "
    "the assessment. Where it is marked 'Yields', expect permanent damage and plan an "
    "inspection after any drop.",
    "The result holds only for the input named by the fingerprint on the last page. Any "
    "change to the framing, the loads, the heights or the zones needs a new annex.",
)


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


@dataclass(frozen=True)
class Sheet:
    """A calculation sheet: the point, its trace and the solver's arrays there."""

    ref: content.SheetRef
    trace: Trace
    case: CaseResult | None
    index: int | None


def _point_index(case: CaseResult, x: float, y: float) -> int | None:
    if case.n == 0:
        return None
    import numpy as np

    d2 = (case.x - x) ** 2 + (case.y - y) ** 2
    k = int(np.argmin(d2))
    return k if d2[k] <= 1e-12 else None


def _case(results: Results, zone_id: str, load_name: str) -> CaseResult | None:
    for c in results.cases:
        if c.zone_id == zone_id and c.load_name == load_name:
            return c
    return None


def build_sheets(project: Project, results: Results, zones: Sequence[LiftZone],
                 progress: Progress | None = None, span: tuple[float, float] = (0.0, 1.0)
                 ) -> list[Sheet]:
    """Trace every governing point (:func:`content.calc_sheets`)."""
    from droprig.solver.trace import trace_point

    refs = content.calc_sheets(results, tuple(zones))
    out = []
    for k, ref in enumerate(refs):
        if progress:
            progress(span[0] + (span[1] - span[0]) * k / max(1, len(refs)),
                     f"Tracing drop point {k + 1} of {len(refs)}")
        tr = trace_point(project, ref.zone_id, ref.load_name, ref.x, ref.y)
        case = _case(results, ref.zone_id, ref.load_name)
        idx = _point_index(case, ref.x, ref.y) if case is not None else None
        out.append(Sheet(ref, tr, case, idx))
    return out


# ----------------------------------------------------------------------- layout


def _chunks(seq: Sequence, n: int) -> list[Sequence]:
    return [seq[i:i + n] for i in range(0, len(seq), n)] or [seq[:0]]


class _Styles:
    def __init__(self) -> None:
        from reportlab.lib import colors
        from reportlab.lib.styles import ParagraphStyle

        base = ParagraphStyle("base", fontName=fonts.REGULAR, fontSize=8.5, leading=10.8,
                              textColor=colors.HexColor("#111111"))
        self.body = base
        self.small = ParagraphStyle("small", parent=base, fontSize=7, leading=8.6)
        self.tiny = ParagraphStyle("tiny", parent=base, fontSize=6.3, leading=7.6)
        self.cell = ParagraphStyle("cell", parent=base, fontSize=7, leading=8.4)
        self.cell_b = ParagraphStyle("cellb", parent=self.cell, fontName=fonts.BOLD)
        self.head = ParagraphStyle("head", parent=self.cell, fontName=fonts.BOLD,
                                   textColor=colors.white)
        self.h1 = ParagraphStyle("h1", parent=base, fontName=fonts.BOLD, fontSize=14,
                                 leading=17, spaceAfter=4)
        self.h2 = ParagraphStyle("h2", parent=base, fontName=fonts.BOLD, fontSize=10,
                                 leading=13, spaceBefore=6, spaceAfter=3)
        self.verdict = ParagraphStyle("verdict", parent=base, fontName=fonts.BOLD,
                                      fontSize=13, leading=16)
        self.mono = ParagraphStyle("mono", parent=base, fontName=fonts.MONO, fontSize=8.5,
                                   leading=11)
        self.bullet = ParagraphStyle("bullet", parent=base, leftIndent=12, bulletIndent=2,
                                     spaceAfter=2.5)
        self.caution = ParagraphStyle("caution", parent=base, fontName=fonts.BOLD,
                                      fontSize=8.5, leading=11)


HEAD_BG = "#2E2E2E"
ZEBRA = "#F1F1EE"


def _table(rows: list[list[object]], widths: Sequence[float], *, header_rows: int = 1,
           extra: Sequence[tuple] = ()) -> object:
    from reportlab.lib import colors
    from reportlab.platypus import Table, TableStyle

    t = Table(rows, colWidths=list(widths), repeatRows=header_rows)
    style = [
        ("FONTNAME", (0, 0), (-1, -1), fonts.REGULAR),
        ("FONTSIZE", (0, 0), (-1, -1), 7),
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
                  ("LINEBELOW", (0, header_rows - 1), (-1, header_rows - 1), 0.8, colors.black)]
    for r in range(header_rows, len(rows)):
        if (r - header_rows) % 2 == 1:
            style.append(("BACKGROUND", (0, r), (-1, r), colors.HexColor(ZEBRA)))
    style.extend(extra)
    t.setStyle(TableStyle(style))
    return t


def _outcome_cell(response: str, st: _Styles, *, big: bool = False) -> object:
    """Outcome word with its one-letter tag, on the outcome colour."""
    from reportlab.lib.styles import ParagraphStyle
    from reportlab.platypus import Paragraph

    o = content.OUTCOMES.get(response, content.OUTCOMES[content.NOT_ASSESSED])
    style = ParagraphStyle("o", parent=st.verdict if big else st.cell_b, textColor=o.ink)
    return Paragraph(f"[{o.tag}] {esc(o.label)}", style)


def _outcome_bg(response: str, col: int, row: int) -> tuple:
    from reportlab.lib import colors

    o = content.OUTCOMES.get(response, content.OUTCOMES[content.NOT_ASSESSED])
    return ("BACKGROUND", (col, row), (col, row), colors.HexColor(o.fill))


class _Page:
    """One annex page: its flowables laid out top-down once, scaled down as a
    whole if they are taller than the frame (so a page never spills over).

    Like reportlab's ``KeepInFrame(mode="shrink")`` but each child is wrapped
    only once (tables of paragraphs are the bulk of the annex's run time).
    """

    def __new__(cls, content: list[object], width: float, height: float) -> object:
        from reportlab.platypus import Flowable

        class Page(Flowable):
            def __init__(self) -> None:
                super().__init__()
                self._content = content
                self._box = (width, height)
                self._laid: list[tuple[object, float, float, float]] | None = None
                self._natural = 0.0

            def _layout(self) -> None:
                w_max = self._box[0]
                y = 0.0
                prev_after = 0.0
                laid = []
                for k, c in enumerate(self._content):
                    cw, ch = c.wrapOn(self.canv, w_max, 0xFFFFFFF)
                    if k:
                        y += max(prev_after, c.getSpaceBefore())
                    align = getattr(c, "hAlign", "LEFT")
                    dx = {"CENTER": 0.5, "CENTRE": 0.5, "RIGHT": 1.0}.get(align, 0.0)
                    laid.append((c, (w_max - cw) * dx, y, ch))
                    y += ch
                    prev_after = c.getSpaceAfter()
                self._laid = laid
                self._natural = y

            def wrap(self, aw: float, ah: float) -> tuple[float, float]:
                if self._laid is None:
                    self._layout()
                self.scale = min(1.0, self._box[1] / self._natural) if self._natural else 1.0
                return (self._box[0], self._natural * self.scale)

            def draw(self) -> None:
                assert self._laid is not None
                c = self.canv
                c.saveState()
                c.translate(0, self._natural * self.scale)
                c.scale(self.scale, self.scale)
                for f, x, y, h in self._laid:
                    f.drawOn(c, x, -y - h)
                c.restoreState()

        return Page()


class _Marker:
    """Zero-size flowable that tells the canvas which section the page is in."""

    def __new__(cls, section: str) -> object:
        from reportlab.platypus import Flowable

        class Marker(Flowable):
            def __init__(self, text: str) -> None:
                super().__init__()
                self.text = text
                self.width = self.height = 0

            def wrap(self, aw: float, ah: float) -> tuple[float, float]:
                return (0, 0)

            def draw(self) -> None:
                self.canv._droprig_section = self.text

        return Marker(section)


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


def _canvas_class(header: _Header, counter: list[int],
                  on_page: Callable[[int], None] | None = None) -> type:
    from reportlab.lib import colors
    from reportlab.pdfgen.canvas import Canvas

    def clip(c: Canvas, text: str, font: str, size: float, width: float) -> str:
        if c.stringWidth(text, font, size) <= width:
            return text
        while text and c.stringWidth(text + "…", font, size) > width:
            text = text[:-1]
        return text + "…"

    class AnnexCanvas(Canvas):
        """Defers the title block until the page count is known ("page x of y")."""

        def __init__(self, *a: object, **k: object) -> None:
            super().__init__(*a, **k)
            self._pages: list[dict] = []
            self._droprig_section = ""

        def showPage(self) -> None:
            self._pages.append(dict(self.__dict__))
            self._startPage()
            if on_page is not None:
                on_page(len(self._pages))

        def save(self) -> None:
            total = len(self._pages)
            counter[0] = total
            for k, state in enumerate(self._pages):
                self.__dict__.update(state)
                self._title_block(k + 1, total)
                super().showPage()
            super().save()

        def _cell(self, x: float, y: float, w: float, h: float, label: str, value: str,
                  *, size: float = 8.0, bold: bool = False) -> None:
            self.setStrokeColor(colors.black)
            self.setLineWidth(0.5)
            self.rect(x, y, w, h, stroke=1, fill=0)
            self.setFont(fonts.REGULAR, 5.2)
            self.setFillColor(colors.HexColor("#555555"))
            self.drawString(x + 2.5, y + h - 6.2, label.upper())
            self.setFillColor(colors.black)
            font = fonts.BOLD if bold else fonts.REGULAR
            while size > 6.5 and self.stringWidth(value, font, size) > w - 5:
                size -= 0.25
            if self.stringWidth(value, font, size) <= w - 5:
                self.setFont(font, size)
                self.drawString(x + 2.5, y + 3.2, value)
                return
            # two lines at a smaller size, the second clipped if it must be
            size = min(size, 6.0)
            words = value.split(" ")
            first = ""
            while words and self.stringWidth((first + " " + words[0]).strip(), font,
                                             size) <= w - 5:
                first = (first + " " + words.pop(0)).strip()
            if not first:  # one very long word
                first, words = clip(self, value, font, size, w - 5), []
            self.setFont(font, size)
            self.drawString(x + 2.5, y + 3.0 + size + 1.0, first)
            self.drawString(x + 2.5, y + 3.0, clip(self, " ".join(words), font, size, w - 5))

        def _title_block(self, page: int, total: int) -> None:
            W, H = self._pagesize
            m = MARGIN_X
            w = W - 2 * m
            top = H - MARGIN_TOP
            # header band: a heavy rule, the document name, project, site
            self.setFillColor(colors.black)
            self.rect(m, top - 2.5, w, 2.5, stroke=0, fill=1)
            self.setFont(fonts.BOLD, 6.5)
            self.drawString(m, top - 11, "LIFT-PERMIT ANNEX · DROPPED-LOAD ASSESSMENT")
            self.setFont(fonts.REGULAR, 6.5)
            sec = getattr(self, "_droprig_section", "")
            self.drawRightString(m + w, top - 11, clip(self, sec, fonts.REGULAR, 6.5, w / 2))
            cw = [0.36 * w, 0.28 * w, 0.18 * w, 0.07 * w]
            cw.append(w - sum(cw))
            cells = [("Project", header.project, True), ("Site", header.site, False),
                     ("Lift reference", header.lift, True), ("Rev", header.revision, True),
                     ("Date", header.date, False)]
            x = m
            for (label, value, bold), cwi in zip(cells, cw, strict=True):
                self._cell(x, top - 39, cwi, 24, label, value, size=8.5, bold=bold)
                x += cwi
            # footer band
            y = MARGIN_BOTTOM
            fw = [0.2 * w, 0.47 * w, 0.13 * w]
            fw.append(w - sum(fw))
            foot = [("Software", f"droprig {header.version}", False),
                    ("Input SHA-256", header.sha, False),
                    ("Units", header.units, False),
                    ("Sheet", f"page {page} of {total}", True)]
            x = m
            for (label, value, bold), fwi in zip(foot, fw, strict=True):
                self._cell(x, y, fwi, 18, label, value, size=7.5 if label != "Input SHA-256"
                           else 5.6, bold=bold)
                x += fwi
            self.setFont(fonts.REGULAR, 5.2)
            self.setFillColor(colors.HexColor("#444444"))
            self.drawString(m, y - 7, clip(self, "Aid only — check against local codes with "
                                           "the appointed lifting person and a licensed "
                                           "engineer. Keep people out from under the load.",
                                           fonts.REGULAR, 5.2, w))

    return AnnexCanvas


MARGIN_X = 40.0
MARGIN_TOP = 30.0
MARGIN_BOTTOM = 30.0
HEADER_H = 48.0
FOOTER_H = 26.0


# ----------------------------------------------------------------------- pages


class _Builder:
    def __init__(self, project: Project, results: Results, zones: tuple[LiftZone, ...],
                 fp: Fingerprint, frame_w: float, frame_h: float,
                 permit: PermitConditions | None = None) -> None:
        self.p = project
        self.r = results
        self.permit = permit if permit is not None else _permit_for(project, results, zones)
        self.bay_verdicts = {(v.zone_id, v.load_name, v.bay_id): v
                             for v in self.permit.bays}
        self.zones = zones
        self.fp = fp
        self.sys = project.settings.unit_system
        self.w = frame_w
        self.h = frame_h
        self.st = _Styles()
        self.pages: list[tuple[str, list[object]]] = []

    def P(self, text: str, style: object | None = None, bulletText: str | None = None
          ) -> object:
        from reportlab.platypus import Paragraph

        return Paragraph(text, style or self.st.cell, bulletText=bulletText)

    def v(self, value: float | None, quantity: str) -> str:
        return fmt_value(value, quantity, self.sys)

    def add(self, section: str, flow: list[object]) -> None:
        self.pages.append((section, flow))

    # -- summary
    def summary(self, verdicts: Sequence[content.ZoneVerdict]) -> None:
        from reportlab.lib import colors
        from reportlab.platypus import Spacer

        st = self.st
        overall = content.overall_response(verdicts)
        cases = [(zv, cv) for zv in verdicts for cv in zv.cases]
        chunks = _chunks(cases, LIFT_ROWS_PER_PAGE)
        for k, chunk in enumerate(chunks):
            head = HEADINGS["summary"] + (f" (continued, {k + 1} of {len(chunks)})" if k else "")
            flow: list[object] = [self.P(esc(head), st.h1)]
            if k == 0:
                # the permit's verdict (droprig.permit), drawn in the outcome colour
                # of the same severity
                overall = VERDICT_OUTCOME[self.permit.verdict] if cases else overall
                o = content.OUTCOMES.get(overall, content.OUTCOMES[content.NOT_ASSESSED])
                word = self.permit.verdict_words.upper() if cases else "NOTHING ASSESSED"
                rows = [[_outcome_cell(overall, st, big=True),
                         self.P(f"Permit verdict: {esc(word)}", st.verdict)]]
                flow.append(_table(rows, [0.36 * self.w, 0.64 * self.w], header_rows=0, extra=[
                    _outcome_bg(overall, 0, 0), ("VALIGN", (0, 0), (-1, -1), "MIDDLE"),
                    ("BOX", (0, 0), (-1, -1), 1.5, colors.HexColor(o.edge)),
                    ("TOPPADDING", (0, 0), (-1, -1), 6), ("BOTTOMPADDING", (0, 0), (-1, -1), 6)]))
                flow.append(Spacer(1, 6))
                n_zones = len(verdicts)
                n_bays = sum(cv.n_bays for _, cv in cases)
                flow.append(self.P(
                    f"{n_zones} lift zone(s), {len(cases)} load case(s), {n_bays} bay "
                    f"result(s), {self.r.n_points:,} drop points assessed. Design basis: "
                    f"{esc(_basis(self.p))}. Units: {esc(_units(self.sys))}.", st.body))
                flow.append(Spacer(1, 4))
                flow.append(self.P(esc(_caution()), st.caution))
                flow.append(Spacer(1, 6))
                flow.extend(self._conditions())
            flow.append(self.P("Verdict per lift zone and load", st.h2))
            hdr = ["Lift zone", "Load", "Verdict", "Max U", "Least allowable drop height",
                   "Permit conditions for this load"]
            rows = [[self.P(h, st.head) for h in hdr]]
            extra = []
            loads = {(lv.zone_id, lv.load_name): lv for lv in self.permit.loads}
            for i, (zv, cv) in enumerate(chunk):
                z = zv.zone
                lv = loads.get((cv.zone_id, cv.load_name))
                zo = content.OUTCOMES.get(zv.response, content.OUTCOMES[content.NOT_ASSESSED])
                rows.append([
                    self.P(f"<b>{esc(z.id)}</b><br/>{esc(z.name)}<br/><i>lift zone: "
                           f"{esc(zo.label.lower())}</i>"),
                    self.P(f"<b>{esc(cv.load_name)}</b><br/>{self.v(cv.mass, 'mass')}; planned "
                           f"drop {self.v(cv.planned_drop_height, 'length')}"),
                    self.P(esc(VERDICT_WORDS[lv.verdict]) if lv is not None
                           else esc(content.OUTCOMES[content.NOT_ASSESSED].label)),
                    self.P(fmt_util(cv.max_utilisation) + (
                        f"<br/>worst bay {esc(cv.worst_bay.bay_id)}" if cv.worst_bay else "")),
                    self.P(fmt_allow(cv.least_allowable_drop_height, "length", self.sys)),
                    self.P(esc(" ".join(c.sentence(self.sys) for c in lv.conditions)
                               if lv is not None and lv.conditions else cv.advice), st.tiny),
                ])
                extra.append(_outcome_bg(VERDICT_OUTCOME[lv.verdict] if lv is not None
                                         else cv.response, 2, i + 1))
            w = self.w
            flow.append(_table(rows, [0.12 * w, 0.17 * w, 0.15 * w, 0.1 * w, 0.12 * w,
                                      0.34 * w], extra=extra))
            self.add(head, flow)

    def bay_pages(self, rows: list) -> None:
        st = self.st
        chunks = _chunks(rows, BAY_ROWS_PER_PAGE)
        for k, chunk in enumerate(chunks):
            head = HEADINGS["bays"] + (f" (continued, {k + 1} of {len(chunks)})" if k else "")
            flow: list[object] = [self.P(esc(head), st.h1)]
            if k == 0:
                flow.append(self.P(
                    "Every bay reached by a drop point, per lift zone and load, worst first. "
                    "U: highest utilisation of any check at the bay's drop points, with that "
                    "check. Heights are the load's underside above the finished surface of "
                    "the level; a fall onto a pad is that less its thickness. Allowable drop "
                    "height: least over the bay that keeps it elastic, with the check that "
                    "sets it. Max hook elevation: the hook limit over the bay. 'none': no "
                    "height is acceptable — the limit is passed even when the load is set "
                    "down.", st.small))
            hdr = ["Zone / load", "Bay", "Verdict", "Response", "Max U (check)",
                   "Allowable drop height, elastic (check)", "Max hook elevation",
                   "Permit conditions"]
            trs = [[self.P(h, st.head) for h in hdr]]
            extra = []
            if not chunk:
                trs.append([self.P("No bay of any level is reached by a drop point.")] +
                           [""] * 7)
            for i, b in enumerate(chunk):
                cells = self.bay_cells(b)
                trs.append([
                    self.P(f"{esc(b.zone_id)}<br/>{esc(b.load_name)}"),
                    self.P(f"<b>{esc(b.bay_id)}</b>"),
                    self.P(esc(cells["verdict"])),
                    _outcome_cell(b.response, st),
                    self.P(esc(cells["utilisation"])),
                    self.P(esc(cells["allowable"])),
                    self.P(esc(cells["hook"])),
                    self.P(esc(cells["conditions"]), st.tiny),
                ])
                extra.append(_outcome_bg(b.response, 3, i + 1))
            w = self.w
            flow.append(_table(trs, [0.1 * w, 0.07 * w, 0.1 * w, 0.1 * w, 0.09 * w,
                                     0.14 * w, 0.09 * w, 0.31 * w], extra=extra))
            self.add(head, flow)

    def bay_cells(self, b: object) -> dict[str, str]:
        """The permit cells of a bay summary (droprig.permit; the same text as the
        window's table and the command line)."""
        key = (b.zone_id, b.load_name, b.bay_id)  # type: ignore[attr-defined]
        v = self.bay_verdicts.get(key)
        if v is None:
            return {k: "none" for k in ("verdict", "planned", "allowable", "hook",
                                        "utilisation", "conditions")}
        return v.cells(self.sys)

    def _conditions(self) -> list[object]:
        """The permit conditions in reading order, and what is not checked."""
        st = self.st
        flow: list[object] = [self.P("Permit conditions", st.h2)]
        sentences = self.permit.sentences(self.sys)
        if not sentences:
            flow.append(self.P("None: every assessed bay stays elastic on bare deck as "
                               "planned.", st.body))
        for k, sentence in enumerate(sentences, 1):
            flow.append(self.P(esc(sentence), st.bullet, bulletText=f"{k}."))
        flow.append(self.P("Not checked; needs a separate sign-off", st.h2))
        for item in self.permit.not_checked:
            flow.append(self.P(esc(item), st.bullet, bulletText="•"))
        return flow

    # -- plan
    def plan(self, level: Level) -> None:
        from reportlab.platypus import Spacer

        from droprig.report.figures import plan_drawing

        st = self.st
        zones = [z for z in self.zones if z.level_id == level.id]
        prot = [p for p in self.p.protection_areas if p.level_id == level.id]
        head = f"{HEADINGS['plan']} — level {level.id}"
        flow: list[object] = [self.P(esc(f"{head}: {level.name}"), st.h1)]
        desc = [f"Elevation {self.v(level.elevation, 'length')}"]
        for z in zones:
            desc.append(
                f"zone <b>{esc(z.id)}</b> ({esc(z.name)}): crane at "
                f"({self.v(z.crane[0], 'length')}, {self.v(z.crane[1], 'length')}), radius "
                f"{self.v(z.r_min, 'length')} to {self.v(z.r_max, 'length')}, slew "
                f"{_deg(z.slew_start)} to {_deg(z.slew_start + z.slew_sweep)}"
                f"{' (full circle)' if z.slew_sweep >= 2 * math.pi - 1e-9 else ''}, drift "
                f"margin {self.v(z.drift_margin, 'length')}"
                f"{', corridor of ' + str(len(z.corridor)) + ' points' if z.corridor else ''}")
        for p in prot:
            desc.append(f"mat <b>{esc(p.id)}</b> ({esc(p.name)}, {esc(p.kind)}, "
                        f"{self.v(p.thickness, 'length')} thick)")
        flow.append(self.P("; ".join(desc) + ". Each bay shows its id, its worst outcome "
                           "over the zones and loads of this annex, and its highest "
                           "utilisation U. Plan north is +y; angles counter-clockwise from +x.",
                           st.small))
        flow.append(Spacer(1, 4))
        outcomes = content.bay_outcomes(self.r, level, self.zones)
        flow.append(plan_drawing(level, zones, prot, outcomes, self.sys, self.w,
                                 self.h - 80))
        self.add(head, flow)

    # -- members
    def members(self, levels: Sequence[Level]) -> None:
        st = self.st
        rows = [(lv, m) for lv in levels for m in lv.members]
        if not rows:
            return
        chunks = _chunks(rows, MEMBER_ROWS_PER_PAGE)
        many = len(levels) > 1
        for k, chunk in enumerate(chunks):
            head = HEADINGS["members"] + (f" (continued, {k + 1} of {len(chunks)})" if k else "")
            flow: list[object] = [self.P(esc(head), st.h1)]
            if k == 0:
                flow.append(self.P(_resistance_note(self.p), st.small))
                for lv in levels:
                    dk = lv.deck
                    flow.append(self.P(
                        f"Deck of level <b>{esc(lv.id)}</b>: {esc(dk.kind.replace('_', ' '))}, "
                        f"{self.v(dk.thickness, 'length')} thick, concrete "
                        f"{self.v(dk.concrete.fc, 'stress')}, bottom bars "
                        f"{self.v(dk.rebar_area, 'area')} per m width at "
                        f"{self.v(dk.cover, 'length')} cover; {len(dk.openings)} opening(s). "
                        f"Superimposed dead {self.v(lv.superimposed_dead, 'pressure')}, live "
                        f"left in place {self.v(lv.live_in_place, 'pressure')}.", st.small))
            hdr = ["Member", "Role", "Section", "Grade", "Span", "Ends", "fy", "Class",
                   "Flexure resistance", "Shear resistance", "EI"]
            trs = [[self.P(h, st.head) for h in hdr]]
            for lv, m in chunk:
                res = member_resistances(m, self.p)
                trs.append([
                    self.P(esc(f"{lv.id}: {m.id}" if many else m.id)),
                    m.role,
                    self.P(esc(m.section.name)),
                    self.P(esc(m.grade.name)),
                    self.v(m.span, "length"),
                    m.end_condition,
                    self.v(res.fy, "stress"),
                    _CLASS_TAG.get(res.section_class, res.section_class),
                    self.P(self.v(res.flexure, "moment") if res.flexure is not None
                           else "out of scope"),
                    self.P(self.v(res.shear, "force") if res.shear is not None
                           else "out of scope"),
                    self.P(_ei(res.EI, self.sys)),
                ])
            w = self.w
            flow.append(_table(trs, [0.12 * w, 0.06 * w, 0.1 * w, 0.1 * w, 0.08 * w,
                                     0.07 * w, 0.08 * w, 0.06 * w, 0.11 * w, 0.1 * w,
                                     0.12 * w]))
            self.add(head, flow)

    # -- calculation sheets
    def sheets(self, sheets: Sequence[Sheet]) -> None:
        st = self.st
        for n, sh in enumerate(sheets):
            steps = sh.trace.steps
            parts = _chunks(steps, STEPS_PER_PAGE)
            ref = sh.ref
            for k, part in enumerate(parts):
                head = (f"{HEADINGS['sheet']} {n + 1} of {len(sheets)}"
                        + (f" (continued, {k + 1} of {len(parts)})" if k else ""))
                flow: list[object] = [self.P(esc(head), st.h1)]
                flow.append(self.P(
                    f"Lift zone <b>{esc(ref.zone_id)}</b> · load <b>{esc(ref.load_name)}</b> "
                    f"· bay <b>{esc(ref.bay_id)}</b> · drop point x = "
                    f"{self.v(ref.x, 'length')}, y = {self.v(ref.y, 'length')}", st.body))
                if k == 0:
                    flow.append(self.P("Why this point: " + esc("; ".join(ref.reasons)) + ".",
                                       st.small))
                    flow.extend(self._sheet_inputs(sh))
                flow.append(self.P("Calculation", st.h2))
                hdr = ["No.", "Step, formula and numbers", "Result", "Source"]
                trs = [[self.P(h, st.head) for h in hdr]]
                base = k * STEPS_PER_PAGE
                for i, s in enumerate(part):
                    lines = [f"<b>{esc(s.title)}</b>"] + [
                        esc(t) for t in step_lines(s.symbol, s.formula, s.inputs, self.sys)]
                    lhs = f"{esc(s.symbol)} = " if s.symbol else ""
                    result = esc(self.v(s.value, s.quantity))
                    trs.append([
                        str(base + i + 1),
                        self.P("<br/>".join(lines)),
                        self.P(f"<b>{lhs}{result}</b>"),
                        self.P(esc(s.source), st.tiny),
                    ])
                w = self.w
                flow.append(_table(trs, [0.05 * w, 0.55 * w, 0.18 * w, 0.22 * w]))
                if k == len(parts) - 1:
                    flow.extend(self._sheet_outcome(sh))
                self.add(head, flow)

    def _sheet_inputs(self, sh: Sheet) -> list[object]:
        st = self.st
        z = self.p.zone(sh.ref.zone_id)
        load = next(ld for ld in z.loads if ld.name == sh.ref.load_name)
        level = self.p.level(z.level_id)
        c, i = sh.case, sh.index
        rows = [["Level", f"{level.id}: {level.name}"],
                ["Load", f"{load.name} ({load.kind}), mass {self.v(load.mass, 'mass')}, "
                 f"weight {self.v(load.weight, 'force')}, footprint "
                 f"{self.v(load.footprint_length, 'length')} × "
                 f"{self.v(load.footprint_width, 'length')}"]]
        if c is not None and i is not None:
            prot = int(c.protection[i])
            rows.append(["Drop height at this point", self.v(float(c.drop_height[i]), "length")
                         + f" (planned {self.v(c.planned_drop_height, 'length')})"])
            rows.append(["Struck surface", "bare deck" if prot < 0 else
                         f"mat {self.p.protection_areas[prot].id} "
                         f"({self.p.protection_areas[prot].name})"])
            gm = int(c.governing_member[i])
            if gm != DECK and 0 <= gm < len(level.members):
                m = level.members[gm]
                rows.append(["Governing member", f"{m.id}: {m.section.name} {m.grade.name}, "
                             f"span {self.v(m.span, 'length')}, {m.end_condition}"])
            else:
                rows.append(["Governing element", "deck"])
        s = self.p.settings
        rows.append(["Settings", f"{_basis(self.p)}; resistance factor "
                     f"{s.resistance_factor:.2f}; dynamic increase on yield "
                     f"{s.dynamic_increase_factor:.2f}; ductility limit {s.ductility_limit:g}; "
                     f"rotation limit {_deg(s.rotation_limit)}; member mass "
                     f"{'included' if s.include_member_mass else 'ignored'}; existing loads "
                     f"{'included' if s.include_existing_loads else 'ignored'}"])
        trs = [[self.P(f"<b>{esc(a)}</b>"), self.P(esc(b))] for a, b in rows]
        return [self.P("Inputs", st.h2), _table(trs, [0.22 * self.w, 0.78 * self.w],
                                                 header_rows=0)]

    def _sheet_outcome(self, sh: Sheet) -> list[object]:
        st = self.st
        c, i = sh.case, sh.index
        tr = sh.trace
        rows = [[self.P(h, st.head) for h in ("Result at this point (solver)", "Value")]]
        extra = []
        if c is not None and i is not None:
            vals = [
                ("Dynamic factor K", fmt_value(float(c.dynamic_factor[i]), "dimensionless",
                                               self.sys)),
                ("Peak force F", self.v(float(c.peak_force[i]), "force")),
                ("Peak deflection δmax", self.v(float(c.max_deflection[i]), "length")),
                ("Utilisation U", fmt_util(float(c.utilisation[i]))),
                ("Governing check", _check_name(int(c.governing_check[i]))),
                ("Allowable drop height, elastic",
                 fmt_allow(float(c.allowable_drop_height[i]), "length", self.sys)),
                ("Allowable drop height, plastic",
                 fmt_allow(float(c.allowable_drop_height_plastic[i]), "length", self.sys)),
                ("Allowable mass at the planned height",
                 fmt_allow(float(c.allowable_mass[i]), "mass", self.sys)),
            ]
            if not is_none(float(c.ductility[i])):
                vals.append(("Ductility μ", fmt_value(float(c.ductility[i]), "dimensionless",
                                                       self.sys)))
            if not is_none(float(c.required_mat_stiffness[i])):
                vals.append(("Spring mat needed to stay elastic",
                             self.v(float(c.required_mat_stiffness[i]), "stiffness")))
            if not is_none(float(c.required_crush_stroke[i])):
                vals.append(("Crush stroke needed",
                             self.v(float(c.required_crush_stroke[i]), "length")))
            rows += [[self.P(a), self.P(f"<b>{esc(b)}</b>")] for a, b in vals]
        rows.append([self.P("Response"), _outcome_cell(tr.response, st)])
        extra.append(_outcome_bg(tr.response, 1, len(rows) - 1))
        rows.append([self.P("Governing member · check"),
                     self.P(esc(f"{tr.governing_member} · {tr.governing_check}"))])
        rows.append([self.P("Permit conditions for the bay"),
                     self.P(esc(self.bay_cells(sh.ref.summary)["conditions"]))])
        return [self.P("Outcome", st.h2),
                _table(rows, [0.4 * self.w, 0.6 * self.w], extra=extra)]

    # -- assumptions, cautions
    def assumptions(self) -> None:
        from reportlab.platypus import Spacer

        st = self.st
        head = f"{HEADINGS['assumptions']}; {HEADINGS['cautions'].lower()}"
        flow: list[object] = [self.P(esc(HEADINGS["assumptions"]), st.h1)]
        for a in ASSUMPTIONS:
            flow.append(self.P(esc(a), st.bullet, bulletText="•"))
        flow.append(self.P("Not checked", st.h2))
        flow.append(self.P(esc("droprig does not check: " + "; ".join(NOT_CHECKED) + "."),
                           st.body))
        flow.append(self.P("Settings used", st.h2))
        s = self.p.settings
        rows = [
            ("Design basis", _basis(self.p)),
            ("Resistance factor (accidental situation)", f"{s.resistance_factor:.2f}"),
            ("Dynamic increase factor on yield", f"{s.dynamic_increase_factor:.2f}"),
            ("Ductility limit μ", f"{s.ductility_limit:g}"),
            ("Support rotation limit θ", _deg(s.rotation_limit)),
            ("Deflection limit (information only)", f"span / {s.deflection_limit_ratio:g}"),
            ("Drop-point grid resolution", self.v(s.grid_resolution, "length")),
            ("Member mass in the struck mass", "included" if s.include_member_mass
             else "ignored (conservative for the force)"),
            ("Existing loads", "included" if s.include_existing_loads else "ignored"),
        ]
        flow.append(_table([[self.P(esc(a)), self.P(esc(b))] for a, b in rows],
                           [0.5 * self.w, 0.5 * self.w], header_rows=0))
        if self.r.warnings:
            flow.append(self.P("Analysis warnings", st.h2))
            shown = self.r.warnings[:8]
            for wmsg in shown:
                flow.append(self.P(esc(wmsg), st.bullet, bulletText="•"))
            if len(self.r.warnings) > len(shown):
                flow.append(self.P(f"… and {len(self.r.warnings) - len(shown)} more.", st.small))
        flow.append(Spacer(1, 6))
        flow.append(self.P(esc(HEADINGS["cautions"]), st.h1))
        for c in CAUTIONS:
            flow.append(self.P(esc(c), st.bullet, bulletText="•"))
        self.add(head, flow)

    # -- identification, sign-off
    def signoff(self) -> None:
        from reportlab.platypus import Spacer

        st = self.st
        info = self.p.info
        head = f"{HEADINGS['identification']} and {HEADINGS['signoff'].lower()}"
        flow: list[object] = [self.P(esc(HEADINGS["identification"]), st.h1)]
        now = _dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC")
        rows = [
            ("Project", info.name), ("Site", info.site), ("Lift reference", info.lift_reference),
            ("Revision", info.revision), ("Date", info.date),
            ("Project file", self.fp.source),
            ("Lift zones in this annex", ", ".join(z.id for z in self.zones) or "none"),
            ("Software", f"droprig {__version__}"),
            ("Annex generated", now),
        ]
        flow.append(_table([[self.P(f"<b>{esc(a)}</b>"), self.P(esc(b))] for a, b in rows],
                           [0.3 * self.w, 0.7 * self.w], header_rows=0))
        flow.append(Spacer(1, 6))
        flow.append(self.P(esc(self.fp.label) + ":", st.body))
        flow.append(self.P(self.fp.sha256, st.mono))
        flow.append(self.P("Check the fingerprint before signing: any change to the input "
                           f"changes it (e.g. <font name='{fonts.MONO}'>sha256sum FILE</font>).",
                           st.small))
        if info.description.strip():
            flow.append(self.P("Description", st.h2))
            flow.append(self.P(esc(info.description).replace("\n", "<br/>"), st.small))
        flow.append(self.P(esc(HEADINGS["signoff"]), st.h1))
        flow.append(self.P(esc(_caution()), st.caution))
        flow.append(Spacer(1, 6))
        hdr = ["Role", "Name", "Signature", "Date"]
        srows = [[self.P(h, st.head) for h in hdr]]
        for role, name in (("Prepared by", info.prepared_by), ("Checked by", info.checked_by),
                           ("Approved by", info.approved_by)):
            srows.append([self.P(f"<b>{role}</b>"), self.P(esc(name)), "", ""])
        from reportlab.lib import colors

        flow.append(_table(srows, [0.18 * self.w, 0.32 * self.w, 0.32 * self.w, 0.18 * self.w],
                           extra=[("ROWBACKGROUNDS", (0, 1), (-1, -1), [colors.white]),
                                  ("BOTTOMPADDING", (0, 1), (-1, -1), 22),
                                  ("GRID", (0, 0), (-1, -1), 0.5, colors.black)]))
        self.add(head, flow)


@dataclass(frozen=True)
class Resistances:
    """Member properties and resistances shown in the member table (SI; ``None``
    where the solver rules the section out of scope)."""

    fy: float
    section_class: str
    flexure: float | None
    shear: float | None
    EI: float


def member_resistances(m: Member, project: Project) -> Resistances:
    """The resistances the solver uses for ``m`` (:mod:`droprig.solver.capacity`):
    flexure (AISC 360-16 F2/F3; EN 1993-1-1 Eq. 6.13/6.14) and shear (AISC 360-16
    G2.1; EN 1993-1-1 Eq. 6.18 with EN 1993-1-5 §5), with the project's resistance
    factor and dynamic increase factor on yield; fy is the static yield strength
    of the governing (thicker) element, Pa."""
    from droprig.solver import capacity

    s = project.settings
    sec, grade, basis = m.section, m.grade, s.design_basis
    kw = {"phi": s.resistance_factor, "dif": s.dynamic_increase_factor}
    try:
        cls = capacity.section_class(sec, grade, basis)
    except ValueError:
        cls = "?"
    try:
        flex: float | None = capacity.flexural_resistance(sec, grade, basis, **kw)
    except ValueError:
        flex = None
    try:
        shear: float | None = capacity.shear_resistance(sec, grade, basis, **kw)
    except ValueError:
        shear = None
    return Resistances(grade.section_fy(sec), cls, flex, shear, grade.E * sec.Ix)


def _resistance_note(project: Project) -> str:
    s = project.settings
    if s.design_basis == "aisc360":
        src = ("flexure Mn (AISC 360-16 F2.1 Eq. F2-1, noncompact flanges F3.2); shear "
               "Vn = 0.6·Fy·Aw·Cv1 (AISC 360-16 Eq. G2-1); class: compact (C), "
               "noncompact (N), slender (S) flange per Table B4.1b")
    else:
        src = ("flexure Mc,Rd = Wpl·fy (Class 1, 2; EN 1993-1-1 Eq. 6.13) or Wel·fy "
               "(Class 3, Eq. 6.14); shear Vpl,Rd = Av·fy/√3 (EN 1993-1-1 Eq. 6.18, "
               "shear buckling EN 1993-1-5 §5); class per EN 1993-1-1 Table 5.2")
    return (f"Resistances used by the solver, with the resistance factor "
            f"{s.resistance_factor:.2f} and the dynamic increase factor "
            f"{s.dynamic_increase_factor:.2f} on yield: {src}. 'out of scope': the section "
            "is outside what droprig assesses. Web yielding, web crippling / patch "
            "loading and the deck checks depend on the drop point and are shown on the "
            "calculation sheets.")


_CLASS_TAG = {"compact": "C", "noncompact": "N", "slender": "S"}


def _ei(value: float, system: str) -> str:
    """Flexural rigidity E·I: kN·m² (SI) or 10⁶ kip·in² (US; 1 kip = 4448.2216 N,
    1 in = 0.0254 m, NIST SP 811 B.8)."""
    if system == "US":
        return f"{value / 4448.2216152605 / 0.0254 ** 2 / 1e6:,.1f}×10⁶ kip·in²"
    return f"{value / 1e3:,.0f} kN·m²"


def step_lines(symbol: str, formula: str, inputs: dict[str, tuple[float, str]],
               system: str) -> list[str]:
    """Plain-text lines of one calculation step: the formula, the formula with
    the numbers put in (when it has inputs), and the inputs it does not name.

    A formula that begins with ``symbol =`` or has no ``=`` is shown as
    ``symbol = …``; a formula with its own left side (``U = |F·u + E| / R`` for
    the step ``U_flexure``) is shown as written.
    """
    f = formula.strip()
    head = f"{symbol} ="
    if symbol and f.startswith(head):
        lhs, rhs = f"{symbol} = ", f[len(head):].strip()
    elif symbol and "=" not in f:
        lhs, rhs = f"{symbol} = ", f
    else:
        lhs, rhs = "", f
    lines = [lhs + rhs]
    if inputs:
        subst, unused = substitute_all(rhs, inputs, system)  # type: ignore[arg-type]
        if subst != rhs:
            lines.append(lhs + subst)
        if unused:
            lines.append("with " + ", ".join(
                f"{k} = {fmt_value(inputs[k][0], inputs[k][1], system)}"  # type: ignore[arg-type]
                for k in unused))
    return lines


def _check_name(k: int) -> str:
    return CHECKS[k].replace("_", " ") if 0 <= k < len(CHECKS) else "none"


def _deg(rad: float) -> str:
    return f"{math.degrees(rad):.1f}°"


def _basis(project: Project) -> str:
    return {"aisc360": "AISC 360-16 (US)", "en1993": "EN 1993-1-1 / EN 1993-1-5 (EU)"}[
        project.settings.design_basis]


def _units(system: str) -> str:
    return "SI" if system == "SI" else "US customary"


def _caution() -> str:
    from droprig.cli import CAUTION

    return CAUTION


# ----------------------------------------------------------------------- entry
VERDICT_OUTCOME = {"acceptable": "elastic", "acceptable_with_conditions": "plastic",
                   "not_acceptable": "exceeds"}
"""The outcome colour a permit verdict is drawn in (the same severity)."""


def _permit_for(project: Project, results: Results,
                zones: tuple[LiftZone, ...]) -> PermitConditions:
    """The permit (droprig.permit) of the zones this annex covers."""
    from dataclasses import replace

    ids = {z.id for z in zones}
    permit = derive_conditions(project, results)
    if ids == {z.id for z in project.lift_zones}:
        return permit
    loads = tuple(lv for lv in permit.loads if lv.zone_id in ids)
    from droprig.permit import worst_verdict

    conds = tuple(c for c in permit.conditions if c.zone_id in ids)
    verdict = worst_verdict(lv.verdict for lv in loads)
    if verdict == "acceptable" and conds:
        verdict = "acceptable_with_conditions"
    return replace(permit, verdict=verdict, loads=loads, conditions=conds)



def write_annex(project: Project, results: Results, path: str | os.PathLike[str], *,
                project_path: str | os.PathLike[str] | None = None, lift: str | None = None,
                progress: Progress | None = None) -> int:
    """Write the lift-permit annex PDF for ``project`` and its ``results`` to ``path``.

    ``project_path``: the ``.droprig`` file the project was read from (its SHA-256
    is printed); ``lift``: only this lift zone id (``ModelError`` naming the ids
    otherwise); ``progress(fraction, text)`` is called as the work advances.
    The file is written atomically (temporary file in the same folder, then
    :func:`os.replace`); on any error no file is left behind. Returns the page
    count.
    """
    from reportlab.lib.pagesizes import A4, LETTER
    from reportlab.platypus import BaseDocTemplate, Frame, PageBreak, PageTemplate

    def tick(f: float, text: str) -> None:
        if progress is not None:
            progress(min(max(f, 0.0), 1.0), text)

    tick(0.0, "Preparing the annex")
    fonts.register()
    zones = content.select_zones(project, lift)
    fp = fingerprint(project, project_path)
    verdicts = content.zone_verdicts(project, results, zones)
    rows = content.bay_rows(results, zones)
    sheets = build_sheets(project, results, zones, progress=progress, span=(0.05, 0.55))
    levels = content.levels_of(project, zones)

    system = project.settings.unit_system
    pagesize = LETTER if system == "US" else A4
    fw = pagesize[0] - 2 * MARGIN_X
    fy0 = MARGIN_BOTTOM + FOOTER_H
    fh = pagesize[1] - MARGIN_TOP - HEADER_H - fy0
    tick(0.55, "Laying out pages")
    b = _Builder(project, results, zones, fp, fw, fh, _permit_for(project, results, zones))
    b.summary(verdicts)
    b.bay_pages(rows)
    for lv in levels:
        b.plan(lv)
    b.members(levels)
    b.sheets(sheets)
    b.assumptions()
    b.signoff()

    story: list[object] = []
    for k, (section, flow) in enumerate(b.pages):
        story.append(_Marker(section))
        story.append(_Page(flow, fw, fh - 2))
        if k < len(b.pages) - 1:
            story.append(PageBreak())

    info = project.info
    header = _Header(info.name, info.site, info.lift_reference, info.revision, info.date,
                     __version__, fp.sha256, _units(system))
    counter = [0]
    with atomic_path(path) as tmp:
        doc = BaseDocTemplate(
            str(tmp), pagesize=pagesize, leftMargin=MARGIN_X, rightMargin=MARGIN_X,
            topMargin=MARGIN_TOP + HEADER_H, bottomMargin=fy0,
            title=f"Lift-permit annex — {info.name}", author=info.prepared_by,
            subject=f"Dropped-load assessment, lift {info.lift_reference}",
            creator=f"droprig {__version__}")
        frame = Frame(MARGIN_X, fy0, fw, fh, leftPadding=0, rightPadding=0, topPadding=0,
                      bottomPadding=0, id="body")
        doc.addPageTemplates([PageTemplate(id="page", frames=[frame])])
        tick(0.6, "Rendering PDF")
        n_planned = len(b.pages)
        doc.build(story, canvasmaker=_canvas_class(
            header, counter,
            lambda k: tick(0.6 + 0.38 * k / n_planned, f"Rendering page {k} of {n_planned}")))
        if counter[0] != len(b.pages):  # one _Page per page: should not happen
            raise RuntimeError(f"annex layout: {counter[0]} pages rendered for "
                               f"{len(b.pages)} planned; please report this with the "
                               "project file")
    tick(1.0, f"Annex written: {counter[0]} pages")
    return counter[0]

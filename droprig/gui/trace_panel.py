"""Calculation trace of one drop point, as a readable sheet.

Each :class:`droprig.solver.results.TraceStep` becomes one row: what is
computed, the formula in symbols, the same formula with the numbers put in
(in the user's units, :func:`droprig.units.fmt`), the result and the source.
The verdict closes the sheet with the outcome words, tag and colour from
:mod:`droprig.gui.style` and the standard caution. All text that comes from
the project or the solver is escaped before it reaches the rich-text widget.
"""

from __future__ import annotations

import html
import math
import re
from collections.abc import Callable
from typing import TYPE_CHECKING

from PySide6.QtCore import Qt
from PySide6.QtGui import QGuiApplication, QResizeEvent
from PySide6.QtWidgets import (
    QApplication,
    QDialog,
    QHBoxLayout,
    QMessageBox,
    QPushButton,
    QTextBrowser,
    QVBoxLayout,
    QWidget,
)

from droprig import tracefmt, units
from droprig.gui import style
from droprig.outcomes import outcome_check
from droprig.solver import Trace, TraceStep
from droprig.texts import CAUTION

if TYPE_CHECKING:
    from droprig.model import Project

PLACEHOLDER = "Click a drop point in the plan to see how its result was worked out."


def format_value(value: float, quantity: str, system: str) -> str:
    """A number in the user's units; unknown quantities fall back to 4
    significant figures; nan -> ``none``, ±inf -> ``unlimited``. Lengths under
    0.1 m (deflections, thicknesses) are shown in mm / in so they keep their
    digits."""
    if (quantity == "length" and isinstance(value, int | float) and math.isfinite(value)
            and 0 < abs(value) < 0.1):
        quantity = "small_length"
    if quantity in units.QUANTITIES:
        return units.fmt(value, quantity, system)  # type: ignore[arg-type]
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "none"
    if math.isinf(value):
        return "unlimited"
    return f"{value:.4g}"


def _substitute(formula: str, inputs: dict[str, tuple[float, str]], system: str
                ) -> tuple[str, list[str]]:
    """(formula with the numbers put in, input symbols that were not found)."""
    return tracefmt.substitute_all(formula, inputs,
                                   lambda v, q: format_value(v, q, system))


def substitute(formula: str, inputs: dict[str, tuple[float, str]], system: str) -> str:
    """``formula`` with every input symbol replaced by its value in the user's
    units (values with a unit bracketed); runs written without operators such
    as ``2ηh`` are split when they consist only of numbers and input symbols.
    Inputs that do not appear in the formula are listed after it ("with …").
    Plain text; escape before showing it as HTML."""
    out, missing = _substitute(formula, inputs, system)
    if missing:
        where = ", ".join(
            f"{k} = {format_value(inputs[k][0], inputs[k][1], system)}" for k in missing)
        out = f"{out}   with {where}"
    return out


def split_formula(step: TraceStep) -> tuple[str, str]:
    """(left side shown, right side) of a step's formula.

    ``"K = 1 + …"`` for symbol ``K`` gives ``("K", "1 + …")``; a formula whose
    left side is the symbol's base (``U = …`` for ``U_flexure``) is shown with
    the full symbol; any other formula (an equation to solve, or a definition
    in words) is kept whole with no left side. A formula without "=" is the
    right side of the symbol.
    """
    f = step.formula.strip()
    if "=" in f:
        lhs, rhs = f.split("=", 1)
        lhs = lhs.strip()
        base = re.split(r"[_,]", step.symbol, maxsplit=1)[0] if step.symbol else ""
        if lhs and lhs in (step.symbol, base):
            return step.symbol, rhs.strip()
        return "", f
    return step.symbol, f


def step_rows(trace: Trace, system: str) -> list[tuple[str, str, str, str, str]]:
    """(title, formula, with numbers, result, source) per step, plain text."""
    rows = []
    for s in trace.steps:
        lhs, rhs = split_formula(s)
        head = f"{lhs} = " if lhs else ""
        result = f"{s.symbol} = " if s.symbol else ""
        rows.append((s.title, head + rhs, head + substitute(rhs, s.inputs, system),
                     result + format_value(s.value, s.quantity, system), s.source))
    return rows


COLUMN_HEADS = ("#", "Step", "Formula", "With numbers", "Result", "Source")
"""The heads of the sheet's columns (the wide layout; the narrow one writes them as
labels in front of each value)."""

WIDE_MIN_EM = 64
"""Narrower than this many average character widths, the sheet is written step by
step (each value on a line of its own behind its label) instead of as a table of six
columns, whose heads and values a narrow panel (about 250 px at 1280 × 720) would
otherwise break in the middle of a word."""


def trace_html(trace: Trace, system: str, *, narrow: bool = False) -> str:
    """The whole sheet as HTML (every project/solver string escaped): a table of
    :data:`COLUMN_HEADS`, or with ``narrow`` one block per step with the same heads
    as labels (the same words and values either way)."""
    e = html.escape
    st = style.outcome(trace.response)
    where = (f"({units.fmt(trace.x, 'length', system, decimals=2)}, "  # type: ignore[arg-type]
             f"{units.fmt(trace.y, 'length', system, decimals=2)})")  # type: ignore[arg-type]
    out = [
        "<html><body style='font-family:sans-serif'>",
        f"<h3 style='margin:2px 0'>Drop point {e(where)}</h3>",
        f"<p style='margin:2px 0 8px 0;color:#444'>Load <b>{e(trace.load_name)}</b> in lift "
        f"zone <b>{e(trace.zone_id)}</b> · units: {e(system)}</p>",
    ]
    rows = step_rows(trace, system)
    if narrow:
        _, _, h_formula, h_numbers, h_result, h_source = COLUMN_HEADS
        for i, (title, formula, numbers, result, source) in enumerate(rows, 1):
            bg = "#FFFFFF" if i % 2 else "#F6F6F2"
            out.append(
                f"<table cellspacing='0' cellpadding='3' width='100%' "
                f"style='background:{bg};border-top:1px solid #CCC'><tr><td>"
                f"<b>{i}. {e(title)}</b><br>"
                f"<span style='color:#555'>{h_formula}:</span> <code>{e(formula)}</code><br>"
                f"<span style='color:#555'>{h_numbers}:</span> <code>{e(numbers)}</code><br>"
                f"<span style='color:#555'>{h_result}:</span> <b>{e(result)}</b><br>"
                f"<span style='color:#555'>{h_source}: {e(source)}</span></td></tr></table>")
        if not trace.steps:
            out.append("<p><i>The solver returned no steps for this point.</i></p>")
    else:
        out.append("<table cellspacing='0' cellpadding='4' width='100%' "
                   "style='border-collapse:collapse;border:1px solid #BBB'>")
        out.append("<tr style='background:#ECECE8'>"
                   + "".join(f"<th align='left'>{h}</th>" for h in COLUMN_HEADS) + "</tr>")
        for i, (title, formula, numbers, result, source) in enumerate(rows, 1):
            bg = "#FFFFFF" if i % 2 else "#F6F6F2"
            out.append(
                f"<tr style='background:{bg}'><td valign='top'>{i}</td>"
                f"<td valign='top'>{e(title)}</td>"
                f"<td valign='top'><code>{e(formula)}</code></td>"
                f"<td valign='top'><code>{e(numbers)}</code></td>"
                f"<td valign='top'><b>{e(result)}</b></td>"
                f"<td valign='top' style='color:#555'>{e(source)}</td></tr>")
        if not trace.steps:
            out.append("<tr><td colspan='6'><i>The solver returned no steps for this point."
                       "</i></td></tr>")
        out.append("</table>")
    ink = style.ink_on(st.fill_color()).name()
    gov = []
    if trace.governing_member:
        gov.append(f"governing member <b>{e(trace.governing_member)}</b>")
    if trace.governing_check:
        words = outcome_check(trace.governing_check, trace.response)
        gov.append(f"governing check <b>{e(words)}</b>")
    out.append(
        "<table cellspacing='0' cellpadding='6' width='100%' style='margin-top:8px'><tr>"
        f"<td width='34' align='center' style='background:{st.fill};color:{ink};"
        f"border:1px solid {st.edge}'><b>{e(st.tag)}</b></td>"
        f"<td style='border:1px solid {st.edge}'><b>Verdict: {e(st.label)}</b>"
        f"{' — ' + ', '.join(gov) if gov else ''}<br>"
        f"<span style='color:#444'>{e(st.meaning)}</span></td></tr></table>")
    out.append(f"<p style='margin-top:8px;padding:4px;background:#FFF6D6;color:#3D2800'>"
               f"{e(CAUTION)}</p>")
    out.append("</body></html>")
    return "".join(out)


def trace_text(trace: Trace, system: str) -> str:
    """The same sheet as plain text (for the clipboard)."""
    st = style.outcome(trace.response)
    lines = [f"Drop point ({units.fmt(trace.x, 'length', system)}, "  # type: ignore[arg-type]
             f"{units.fmt(trace.y, 'length', system)}), "  # type: ignore[arg-type]
             f"load {trace.load_name}, zone {trace.zone_id}"]
    for i, (title, formula, numbers, result, source) in enumerate(step_rows(trace, system), 1):
        lines += [f"{i}. {title}", f"   {formula}", f"   {numbers}", f"   {result}",
                  f"   [{source}]"]
    lines.append(f"Verdict: {st.label} ({st.tag}); governing member "
                 f"{trace.governing_member or 'none'}, check "
                 f"{outcome_check(trace.governing_check, trace.response) or 'none'}")
    lines.append(CAUTION)
    return "\n".join(lines)


class TracePanel(QWidget):
    """Shows one calculation trace; ``show_trace(None, …)`` clears it."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._trace: Trace | None = None
        self._system = "SI"
        self._narrow = False
        self._copy = QPushButton("Copy as text")
        self._copy.setToolTip("Copy the steps, the verdict and the caution to the clipboard")
        self._copy.clicked.connect(self._on_copy)
        self._copy.setEnabled(False)
        self._verify = QPushButton("Verify by time history…")
        self._verify.setToolTip("Run the time history of this drop point and show its "
                                "force, deflection and moment against time beside the "
                                "energy method's numbers")
        self._verify.clicked.connect(self.open_verification)
        self._verify.setEnabled(False)
        self._project_source: Callable[[], Project | None] | None = None
        self.last_dialog: QDialog | None = None
        self.browser = QTextBrowser()
        self.browser.setOpenLinks(False)
        self.browser.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse
                                             | Qt.TextInteractionFlag.TextSelectableByKeyboard)
        # the dock's own title names the panel: the row holds the two actions only, so
        # the panel stays narrow enough for a 1280 × 720 screen
        top = QHBoxLayout()
        top.addStretch(1)
        top.addWidget(self._verify)
        top.addWidget(self._copy)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(4, 4, 4, 4)
        lay.addLayout(top)
        lay.addWidget(self.browser, 1)
        self.show_trace(None)

    @property
    def trace(self) -> Trace | None:
        return self._trace

    def show_trace(self, trace: Trace | None, unit_system: str = "SI") -> None:
        """Render ``trace`` in ``unit_system`` ("SI" or "US"), as a table or step by
        step as the panel's width allows (:data:`WIDE_MIN_EM`)."""
        self._trace = trace
        self._system = unit_system if unit_system in ("SI", "US") else "SI"
        self._narrow = self.is_narrow()
        if trace is None:
            self.browser.setHtml(f"<p style='color:#666'>{html.escape(PLACEHOLDER)}</p>")
            self._copy.setEnabled(False)
            self._verify.setEnabled(False)
            return
        self.browser.setHtml(trace_html(trace, self._system, narrow=self._narrow))
        self._copy.setEnabled(True)
        self._verify.setEnabled(self._project_source is not None)

    def set_project_source(self, source: Callable[[], Project | None]) -> None:
        """Where "Verify by time history…" reads the project the trace belongs to."""
        self._project_source = source
        self._verify.setEnabled(self._trace is not None)

    @property
    def verify_button(self) -> QPushButton:
        return self._verify

    def open_verification(self) -> QDialog | None:
        """Run the time history of the traced point and show it in a dialog
        (:class:`droprig.gui.verify_dialog.VerifyDialog`); a point that cannot be
        verified gives a message naming why, never a crash."""
        trace = self._trace
        project = self._project_source() if self._project_source else None
        if trace is None or project is None:
            return None
        from droprig.gui.verify_dialog import VerifyDialog
        from droprig.report.verify_plots import point_verification_figures

        QApplication.setOverrideCursor(Qt.CursorShape.WaitCursor)
        try:
            pv, figs = point_verification_figures(project, trace.zone_id, trace.load_name,
                                                  trace.x, trace.y)
        except Exception as exc:  # a message, never a crash
            QApplication.restoreOverrideCursor()
            QMessageBox.warning(self, "Time-history verification",
                                refusal_text(exc, trace.x, trace.y,
                                             project.settings.unit_system))
            return None
        QApplication.restoreOverrideCursor()
        dlg = VerifyDialog(pv, figs, project.settings.unit_system, self,
                           amplified=project.settings.dynamic_amplification)
        self.last_dialog = dlg
        dlg.show()
        return dlg

    def is_narrow(self) -> bool:
        """True when the sheet is written step by step (the panel is narrower than
        :data:`WIDE_MIN_EM` average characters)."""
        em = self.browser.fontMetrics().averageCharWidth()
        return self.browser.viewport().width() < WIDE_MIN_EM * em

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        if self._trace is not None and self.is_narrow() != self._narrow:
            self.show_trace(self._trace, self._system)  # the other layout fits now

    @property
    def unit_system(self) -> str:
        return self._system

    def plain_text(self) -> str:
        return trace_text(self._trace, self._system) if self._trace else ""

    def _on_copy(self) -> None:
        cb = QGuiApplication.clipboard()
        if cb is not None and self._trace is not None:
            cb.setText(self.plain_text())


def refusal_text(exc: BaseException, x: float, y: float, system: str) -> str:
    """Why the traced point (x, y in m) cannot be verified, in the project's units.
    Over a support of the modelled member the verification's own field and raw point
    ("verify.point: (27.432000000000002, 22.86) … 9.144 m along it" in a US project,
    seen under Xvfb on the steel demo's welder) become words a signer reads: the
    point and the member, and what to do instead (common practice, no source)."""
    from droprig import units
    from droprig.solver import OverSupportError
    from droprig.texts import describe_error

    where = f"({units.fmt(x, 'length', system)}, {units.fmt(y, 'length', system)})"
    if isinstance(exc, OverSupportError) and exc.member_id:
        return (f"The point {where} lies over a support of member {exc.member_id} "
                f"({units.fmt(exc.along, 'length', system)} along it), where the "
                "modelled member does not move: its time history is no check of this "
                "point. The calculation trace and the bay's other points are for the "
                "engineer to judge.")
    return f"The point {where} cannot be verified: {describe_error(exc)}"

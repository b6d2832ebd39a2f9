"""Plots of a time-history verification (Qt-free; matplotlib loaded lazily).

Three figures for one struck point — contact force, deflection at the struck point and
the largest member moment, each against time — with the energy method's peak drawn as
a dashed line beside the time history, so a reader sees at a glance where the energy
method reads low. Used by ``droprig verify`` (PNG files) and callable by the window's
trace panel (:func:`verification_figures` returns matplotlib ``Figure`` objects that a
Qt canvas can show; nothing here imports Qt or pyplot).
"""

from __future__ import annotations

import io
import os
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from droprig.units import UnitSystem, display_unit, to_display

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from droprig.model import Project
    from droprig.solver import History, PointVerification

__all__ = ["PLOTS", "VerificationPlotData", "point_verification_figures",
           "verification_figures", "write_verification_pngs"]

PLOTS: tuple[tuple[str, str, str], ...] = (
    ("force", "contact force", "force"),
    ("deflection", "deflection at the struck point", "small_length"),
    ("moment", "largest member moment", "moment"),
)
"""(key, title, unit quantity) of each figure, in order; files are ``verify_<key>.png``."""

CAUTION_SHORT = ("Check aid only: review against local codes with the appointed lifting "
                 "person and a licensed structural engineer.")


@dataclass(frozen=True)
class VerificationPlotData:
    """What the plots show: the recorded history and the energy method's peaks
    (SI: N, m, N·m) and a one-line title of the case."""

    history: History
    energy_force: float
    energy_deflection: float
    energy_moment: float
    title: str


def verification_figures(data: VerificationPlotData,
                         system: UnitSystem = "SI") -> list[Figure]:
    """One matplotlib Figure per entry of :data:`PLOTS` (Agg-compatible, no pyplot)."""
    from matplotlib.figure import Figure

    h = data.history
    t_ms = h.t * 1e3
    series = {"force": (h.contact_force, data.energy_force),
              "deflection": (h.deflection, data.energy_deflection),
              "moment": (h.moment, data.energy_moment)}
    figs: list[Figure] = []
    for key, title, quantity in PLOTS:
        y, e = series[key]
        fig = Figure(figsize=(6.4, 3.8), dpi=100, layout="constrained")
        # leave a strip at the bottom for the caution
        fig.get_layout_engine().set(rect=(0.0, 0.05, 1.0, 0.95))  # type: ignore[union-attr]
        ax = fig.add_subplot()
        yd = [to_display(float(v), quantity, system) for v in y]
        ed = to_display(float(e), quantity, system)
        ax.plot(t_ms, yd, color="#1f4e79", lw=1.2, label="time history")
        ax.axhline(ed, color="#b03a2e", ls="--", lw=1.0, label="energy method peak")
        ax.set_xlabel("time after contact (ms)")
        ax.set_ylabel(f"{title} ({display_unit(quantity, system)})")
        ax.set_title(f"{title} — {data.title}", fontsize=9)
        ax.grid(True, lw=0.3)
        ax.legend(fontsize=8, loc="upper right")
        fig.text(0.01, 0.012, CAUTION_SHORT, fontsize=6.5, color="#555555")
        figs.append(fig)
    return figs


def write_verification_pngs(data: VerificationPlotData, folder: str | os.PathLike[str],
                            system: UnitSystem = "SI") -> list[Path]:
    """Write ``verify_force.png``, ``verify_deflection.png`` and ``verify_moment.png``
    into ``folder`` (created if missing), each atomically; returns the paths."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    from droprig.io.atomic import atomic_write_bytes

    out = Path(os.fspath(folder))
    out.mkdir(parents=True, exist_ok=True)
    paths: list[Path] = []
    for (key, _, _), fig in zip(PLOTS, verification_figures(data, system), strict=True):
        FigureCanvasAgg(fig)
        buf = io.BytesIO()
        fig.savefig(buf, format="png")
        target = out / f"verify_{key}.png"
        atomic_write_bytes(target, buf.getvalue())
        paths.append(target)
    return paths


def point_verification_figures(project: Project, zone_id: str, load_name: str, x: float,
                               y: float) -> tuple[PointVerification, list[Figure]]:
    """For the window's trace panel: the time-history verification of a drop point
    (:func:`droprig.solver.verify_point`) and its three figures in the project's unit
    system. Raises :class:`~droprig.model.ModelError` naming the zone, load or point
    when the point cannot be verified (no deck panel, an opening, a crushable layer)."""
    from droprig.solver import verify_point

    pv = verify_point(project, zone_id, load_name, x, y)
    v = pv.verification
    data = VerificationPlotData(
        history=v.history, energy_force=v.energy["force"],
        energy_deflection=v.energy_deflection_at_point, energy_moment=v.energy["moment"],
        title=f"{pv.zone_id} {pv.bay_id}, {pv.load_name} on {pv.member_id}")
    return pv, verification_figures(data, project.settings.unit_system)

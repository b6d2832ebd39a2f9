"""What the analysis would refuse, found before it runs: one validator for
``droprig validate``, ``droprig analyse``, ``droprig report`` and the window.

A project file can be readable (:func:`droprig.io.project_file.load_project`
builds it) and still hold framing the method cannot assess: a member end resting
on nothing, members resting on each other in a loop, a level with a lift zone
(or the level below one) but no members, a section the capacity checks cannot
take, a hook or a drop height below the struck surface (the top of a pad or mat).
The analysis refuses those with a
:class:`~droprig.model.ModelError`; :func:`analysis_problems` runs the same
checks — the same solver functions, so the same messages — and gives each with
the JSON path of the value to change. Every command that analyses runs it first,
so ``validate`` says "ok" exactly when ``analyse`` accepts the file.
"""

from __future__ import annotations

import re

from droprig.model import Level, LiftZone, ModelError, Project, bounds

__all__ = ["analysis_problems", "json_path_of"]

_MEMBER = re.compile(r"^level (?P<level>.+?)\.members\[(?P<member>.+)\](?:\.(?P<tail>\w+))?$")
_LEVEL = re.compile(r"^level (?P<level>.+?)(?:\.(?P<tail>[\w.]+))?$")
_KEYS = {"start": "start_m", "end": "end_m", "section": "section", "grade": "grade",
         "members": "members", "deck.openings": "deck.openings"}


def json_path_of(project: Project, field: str, zone: LiftZone | None = None,
                 load_index: int | None = None) -> str:
    """The JSON path (``$.levels[0].members[12].end_m``) of a :class:`ModelError`
    field of ``project`` as the analysis names it (``level L2.members[B7].end``);
    ``zone`` and ``load_index`` place a load's field. ``$`` when unknown."""
    if zone is not None:
        zi = project.lift_zones.index(zone)
        if load_index is not None:
            tail = field.rsplit(".", 1)[-1]
            key = {"hook_elevation": "hook_elevation_m", "drop_height": "drop_height_m",
                   "hang_length": "hang_length_m",
                   "footprint_width": "footprint_width_m"}.get(tail)
            base = f"$.lift_zones[{zi}].loads[{load_index}]"
            return f"{base}.{key}" if key else base
        return f"$.lift_zones[{zi}]"
    levels = {lv.id: i for i, lv in enumerate(project.levels)}
    m = _MEMBER.match(field)
    if m and m.group("level") in levels:
        li = levels[m.group("level")]
        members = project.levels[li].members
        for j, mem in enumerate(members):
            if mem.id == m.group("member"):
                tail = m.group("tail")
                key = _KEYS.get(tail or "")
                return f"$.levels[{li}].members[{j}]" + (f".{key}" if key else "")
        return f"$.levels[{li}].members"
    m = _LEVEL.match(field)
    if m and m.group("level") in levels:
        li = levels[m.group("level")]
        key = _KEYS.get(m.group("tail") or "")
        return f"$.levels[{li}]" + (f".{key}" if key else "")
    return "$"


def _surface_top(project: Project, level: Level, zone: LiftZone) -> float:
    """Highest struck surface a load of ``zone`` can meet on ``level``: the deck top
    plus the thickest protection area whose rectangle meets the zone's plan box
    (m; conservative: a mat anywhere near the zone counts)."""
    x0, y0, x1, y1 = bounds.zone_bbox(zone)
    top = level.elevation
    for pa in project.protection_areas:
        r = pa.area
        if (pa.level_id == level.id and r.x0 <= x1 and r.x1 >= x0 and r.y0 <= y1
                and r.y1 >= y0):
            top = max(top, level.elevation + pa.thickness)
    return top


def analysis_problems(project: Project) -> list[str]:
    """Every refusal the analysis of ``project`` would raise, each as
    ``"<JSON path>: <message>"`` (empty: the analysis accepts the project).
    Builds the prepared floors the analysis then reuses (same cache), so running
    it first costs nothing extra."""
    from droprig.solver import check_load_on_grating, floor_model, level_below

    out: list[str] = []
    seen: set[str] = set()
    # the zones' levels, and every level under each: a load that perforates a deck
    # is assessed on the level below in the same run, and further down while it
    # still perforates (droprig.solver.analysis.cascade_down)
    wanted: list[Level] = []
    for zone in project.lift_zones:
        lv: Level | None = project.level(zone.level_id)
        while lv is not None and lv.id not in seen:
            seen.add(lv.id)
            wanted.append(lv)
            lv = level_below(project, lv.id)
    for level in wanted:
        try:
            floor_model(level, project.settings)
        except ModelError as exc:
            out.append(f"{json_path_of(project, exc.field)}: {exc}")
    for zone in project.lift_zones:
        level = project.level(zone.level_id)
        top = _surface_top(project, level, zone)
        for j, load in enumerate(zone.loads):
            try:
                check_load_on_grating(load, level.deck)
            except ModelError as exc:
                out.append(f"{json_path_of(project, exc.field, zone, j)}: {exc}")
            try:
                if load.hook_elevation is None:
                    # one datum (issue 13): a drop height is measured from the finished
                    # surface, and must reach the top of a pad the load passes over
                    pad = top - level.elevation
                    if load.drop_height is not None and load.drop_height < pad:
                        raise ModelError(
                            f"load {load.name}.drop_height", load.drop_height,
                            f"≥ {pad:g} m (the load's underside above the top of a pad "
                            f"or mat on level {level.id})", "m")
                    continue
                load.height_above(top)
            except ModelError as exc:
                out.append(f"{json_path_of(project, exc.field, zone, j)}: {exc}")
    return out

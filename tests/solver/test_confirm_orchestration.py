"""The confirmation's bookkeeping worked out for every trial at once, against its plain
trial-by-trial form (droprig.solver.confirm; issue 9: the same answers, less Python).

Source of every check: common practice, no source — a fast path must give its plain
reference's answers; here exactly (tolerance 0: the same elementwise arithmetic, or
booleans and integers). The floors and values are random or the invented demos'.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import Rect
from droprig.solver import confirm, droppoints
from droprig.solver.confirm import _danger, _holds, _holds_all, _Stretches, _Trial
from droprig.solver.floor import floor_model
from droprig.solver.loadpath import locate
from droprig.solver.results import ELASTIC, PLASTIC, RESPONSES

ROOT = Path(__file__).resolve().parents[2]
RECT = Rect(0.0, 0.0, 6.0, 6.0)


@pytest.fixture(scope="module")
def steel():
    project = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    zone = project.lift_zones[0]
    return floor_model(project.level(zone.level_id), project.settings), zone


def _random_trials(rng: np.random.Generator, nt: int) -> list[_Trial]:
    allowed = (frozenset({ELASTIC}), frozenset({ELASTIC, PLASTIC}))
    return [_Trial(t, str(rng.choice(["elastic", "plastic", "mat", "mass"])), 0, RECT,
                   float(rng.uniform(0.05, 3.0)), 1.0, allowed[int(rng.integers(2))])
            for t in range(nt)]


def _random_rows(rng: np.random.Generator, nt: int, n: int) -> dict[str, np.ndarray]:
    u = rng.uniform(0.0, 1.2, n)
    u[rng.random(n) < 0.1] = np.nan  # a point with no U (an opening's row reads inf)
    u[rng.random(n) < 0.02] = np.inf
    return {"owner": rng.integers(0, nt, n),
            "response": rng.choice(len(RESPONSES), n, p=[0.7, 0.15, 0.1, 0.05]),
            "utilisation": u,
            "peak_force": np.where(rng.random(n) < 0.1, np.nan, rng.uniform(1e3, 1e6, n))}


@pytest.mark.parametrize("seed", range(5))
def test_every_trial_at_once_holds_as_trial_by_trial(seed: int) -> None:
    rng = np.random.default_rng(seed)
    nt = 40
    trials = _random_trials(rng, nt)
    r = _random_rows(rng, nt, 600)
    # a trial with only U 0.98 < U ≤ 1 rows: elastic by its response, yet not held
    r["utilisation"][r["owner"] == 0] = 0.99
    r["response"][r["owner"] == 0] = ELASTIC
    got = _holds_all(trials, r)
    want = [(_holds(tr, r, r["owner"] == t) if (r["owner"] == t).any() else True)
            for t, tr in enumerate(trials)]
    assert got.tolist() == want
    assert not got[0] or trials[0].allowed != frozenset({ELASTIC})
    assert 0 < int(got.sum()) < nt  # both answers met: the comparison can fail


def test_a_response_outside_the_known_ones_is_refused() -> None:
    trials = _random_trials(np.random.default_rng(0), 2)
    r = {"owner": np.array([0, 1]), "response": np.array([0, len(RESPONSES)]),
         "utilisation": np.array([0.5, 0.5])}
    with pytest.raises(ValueError, match="response outside"):
        _holds_all(trials, r)


def _split_trial_by_trial(st: _Stretches, trials: list[_Trial]) -> np.ndarray:
    """The danger of every stretch as the split worked it out before: trial by trial,
    the stopped trials' stretches none (inf)."""
    d = np.full(st.own.size, np.inf)
    for t in np.unique(st.own).tolist():
        if t in st.stopped:
            continue
        h = st.own == t
        d[h] = _danger(trials[t].value, st.v0[h], st.v1[h])
    return d


@pytest.mark.parametrize("seed", range(5))
def test_the_stretches_cut_as_trial_by_trial(seed: int, steel) -> None:
    fm, zone = steel
    e = fm.level.grid.extent
    rng = np.random.default_rng(10 + seed)
    nt, n = 12, 800
    trials = _random_trials(rng, nt)
    value = np.array([tr.value for tr in trials])
    own = rng.integers(0, nt, n)
    # answers about the trial values, some far, some missing (NaN: nothing allowed)
    v0 = value[own] * rng.uniform(0.2, 4.0, n)
    v1 = value[own] * rng.uniform(0.2, 4.0, n)
    v1[rng.random(n) < 0.05] = np.nan
    x0, y0 = rng.uniform(e.x0, e.x1, n), rng.uniform(e.y0, e.y1, n)
    x1, y1 = x0 + rng.uniform(-0.5, 0.5, n), y0 + rng.uniform(-0.5, 0.5, n)
    stopped = {int(t) for t in rng.choice(nt, 3, replace=False)}
    st = _Stretches(x0, y0, v0, x1, y1, v1, own, set(stopped))
    want = _split_trial_by_trial(st, trials)
    assert np.isfinite(want).any() and np.isinf(want).any()
    top = confirm._most_dangerous(want, own, own.size)
    sx, sy, sown = st.split(fm, zone, trials)
    assert st.cut is not None
    assert np.array_equal(st.cut[0], top)
    mx, my = x0[top] + 0.5 * (x1 - x0)[top], y0[top] + 0.5 * (y1 - y0)[top]
    ok = droppoints.in_zone(zone, mx, my) & (locate(fm.frame, mx, my) >= 0)
    assert 0 < int(ok.sum()) < ok.size
    assert np.array_equal(sx, mx[ok]) and np.array_equal(sy, my[ok])
    assert np.array_equal(sown, own[top][ok])


def test_cell_keys_number_the_cells_as_unique_rows_do() -> None:
    rng = np.random.default_rng(3)
    cx = np.round(rng.uniform(-40.0, 300.0, 5000) / 0.0625)
    cy = np.round(rng.uniform(-10.0, 90.0, 5000) / 0.0625)
    cx[::7], cy[::7] = cx[1::7][:cx[::7].size], cy[1::7][:cy[::7].size]  # repeats
    _, want = np.unique(np.c_[cx, cy], axis=0, return_index=True)
    _, got = np.unique(confirm._cell_keys(cx, cy), return_index=True)
    assert np.array_equal(np.sort(got), np.sort(want))
    assert confirm._cell_keys(np.zeros(0), np.zeros(0)).size == 0


def test_points_moved_into_the_zone_once_per_distinct_point(steel) -> None:
    """The lattices' points, with repeats, moved into the zone (a corridor: the
    steel demo's) and kept over the deck: as each point on its own."""
    fm, zone = steel
    assert zone.corridor
    e = fm.level.grid.extent
    rng = np.random.default_rng(8)
    x = rng.uniform(e.x0 - 2.0, e.x1 + 2.0, 1500)
    y = rng.uniform(e.y0 - 2.0, e.y1 + 2.0, 1500)
    x, y = np.r_[x, x[:500]], np.r_[y, y[:500]]  # the trials of one bay: repeats
    px, py, keep = droppoints.into_zone_over_deck(fm.frame, zone, x, y)
    wx, wy, inside = droppoints.into_zone(zone, x, y)
    assert np.array_equal(px, wx) and np.array_equal(py, wy)
    assert np.array_equal(keep, inside & (locate(fm.frame, wx, wy) >= 0))
    assert 0 < int(keep.sum()) < keep.size and (px != x).any()

"""The standing fuzz harness (issue 16, item 9): mutated demo files and random
valid projects through ``droprig validate`` and ``droprig analyse``.

Every case must end in one of two clean outcomes:

* accepted: ``validate`` exit 0 and ``analyse --json`` exit 0 with a JSON document
  holding no NaN or infinity (``null`` where no value exists), or
* refused: ``validate`` and ``analyse`` both exit 2 with a message, no traceback and
  no "unexpected error",

within :data:`CASE_SECONDS`. Anything else is a failure: a crash, a hang, a NaN,
or validate and analyse disagreeing. Used by ``tests/fuzz/test_fuzz_quick.py``
(``make test``, a few hundred cases) and ``benchmarks/bench_fuzz.py`` (≥ 10⁴ cases).

The mutations are droprig's own (common practice for mutation fuzzing, no
source): numbers replaced by edge values, types swapped, keys removed or added,
list items dropped or repeated, text replaced by hostile characters, bytes of the
file text flipped or cut. Demo files and random projects are invented inputs.
"""

from __future__ import annotations

import contextlib
import copy
import dataclasses
import io
import json
import math
import random
import signal
import tempfile
import time
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parents[2]
DEMOS = tuple(sorted((ROOT / "demo_projects").glob("*.droprig")))
CASE_SECONDS = 10.0
"""A case running longer than this is a hang (issue 16: every outcome within 10 s)."""

EDGE_NUMBERS: tuple[Any, ...] = (
    0, -1, 1, 0.5, -0.0, 1e-300, 5e-324, 1e308, -1e308, 10**400, 2**63, 1e6, 1e12, 200.0,
    0.05, 3.0, 360.0, -720.0, 59.99, 60.0001, 1e-7, 123456789,
)
EDGE_TEXT: tuple[str, ...] = (
    "", " ", "\ud800", "a\u202eb", "\x07", "x" * 5000, "../../etc/passwd", "<b>bold</b>",
    "9**9**9", "NaN", "null", "W16X26", "IPE 300", "S355", "ton", "\u0000", "é" * 40,
)


@dataclass
class Outcome:
    """What one case did."""

    kind: str  # "accepted", "refused" or "failure"
    seconds: float
    detail: str = ""


@dataclass
class Tally:
    """Counts over many cases."""

    cases: int = 0
    accepted: int = 0
    refused: int = 0
    failures: list[str] = field(default_factory=list)
    hangs: int = 0
    nans: int = 0
    crashes: int = 0
    disagreements: int = 0
    slowest: float = 0.0
    total_seconds: float = 0.0

    def add(self, label: str, o: Outcome) -> None:
        self.cases += 1
        self.total_seconds += o.seconds
        self.slowest = max(self.slowest, o.seconds)
        if o.kind == "accepted":
            self.accepted += 1
        elif o.kind == "refused":
            self.refused += 1
        else:
            self.failures.append(f"{label}: {o.detail}")
            if o.detail.startswith("hang"):
                self.hangs += 1
            elif o.detail.startswith("nan"):
                self.nans += 1
            elif o.detail.startswith("disagree"):
                self.disagreements += 1
            else:
                self.crashes += 1

    def summary(self) -> str:
        return (f"{self.cases} cases: {self.accepted} accepted, {self.refused} refused, "
                f"{len(self.failures)} failures ({self.crashes} crashes, {self.hangs} hangs, "
                f"{self.nans} NaN, {self.disagreements} validate/analyse disagreements); "
                f"slowest case {self.slowest:.2f} s, mean "
                f"{self.total_seconds / max(self.cases, 1):.3f} s")


class _TimeoutError(Exception):
    pass


@contextlib.contextmanager
def _deadline(seconds: float) -> Iterator[None]:
    """Raise :class:`_TimeoutError` in the main thread after ``seconds`` (SIGALRM)."""
    def handler(signum: int, frame: object) -> None:
        raise _TimeoutError

    old = signal.signal(signal.SIGALRM, handler)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0.0)
        signal.signal(signal.SIGALRM, old)


def _cli(argv: list[str]) -> tuple[int, str]:
    from droprig.cli import main

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(argv)
    return code, out.getvalue() + err.getvalue()


def _bad_text(text: str) -> str | None:
    for needle in ("Traceback", "unexpected error"):
        if needle in text:
            return needle
    return None


def _has_non_finite(obj: Any) -> bool:
    stack = [obj]
    while stack:
        v = stack.pop()
        if isinstance(v, float) and not math.isfinite(v):
            return True
        if isinstance(v, dict):
            stack.extend(v.values())
        elif isinstance(v, list):
            stack.extend(v)
    return False


def run_case(data: bytes, folder: Path, limit: float = CASE_SECONDS) -> Outcome:
    """Write ``data`` as a project file in ``folder``, run validate and analyse on it,
    and judge the outcome (a case over ``limit`` seconds is a hang)."""
    path = folder / "case.droprig"
    out = folder / "case.json"
    path.write_bytes(data)
    out.unlink(missing_ok=True)
    t0 = time.perf_counter()
    try:
        with _deadline(limit):
            v_code, v_text = _cli(["validate", str(path)])
            a_code, a_text = _cli(["analyse", str(path), "--json", str(out)])
    except _TimeoutError:
        return Outcome("failure", time.perf_counter() - t0, "hang (over the case time limit)")
    except BaseException as exc:
        return Outcome("failure", time.perf_counter() - t0,
                       f"crash: {type(exc).__name__}: {str(exc)[:200]}")
    dt = time.perf_counter() - t0
    if dt > limit:
        return Outcome("failure", dt, "hang (over the case time limit)")
    for name, code, text in (("validate", v_code, v_text), ("analyse", a_code, a_text)):
        if code not in (0, 2):
            return Outcome("failure", dt, f"crash: {name} exit {code}: {text[-300:]}")
        bad = _bad_text(text)
        if bad:
            return Outcome("failure", dt, f"crash: {name} printed {bad}: {text[-400:]}")
        if code == 2 and not text.strip():
            return Outcome("failure", dt, f"crash: {name} refused without a message")
    if v_code != a_code:
        return Outcome("failure", dt, f"disagree: validate {v_code}, analyse {a_code}: "
                       f"{(v_text + a_text)[-400:]}")
    if a_code == 2:
        return Outcome("refused", dt)
    try:
        doc = json.loads(out.read_text(encoding="utf-8"))
    except (OSError, ValueError) as exc:
        return Outcome("failure", dt, f"crash: results not readable: {exc}")
    if _has_non_finite(doc):
        return Outcome("failure", dt, "nan in the results")
    return Outcome("accepted", dt)


# --------------------------------------------------------------------------- mutation

def _paths(doc: Any) -> list[tuple[Any, Any]]:
    """Every (container, key) in ``doc`` (iterative)."""
    out: list[tuple[Any, Any]] = []
    stack = [doc]
    while stack:
        c = stack.pop()
        items = c.items() if isinstance(c, dict) else enumerate(c) if isinstance(c, list) \
            else ()
        for k, v in items:
            out.append((c, k))
            if isinstance(v, dict | list):
                stack.append(v)
    return out


def mutate(doc: dict[str, Any], rng: random.Random, n: int = 1) -> bytes:
    """``doc`` with ``n`` random mutations, as file bytes."""
    d = copy.deepcopy(doc)
    raw_ops = 0
    for _ in range(n):
        paths = _paths(d)
        if not paths:
            break
        c, k = rng.choice(paths)
        v = c[k]
        op = rng.random()
        if isinstance(v, bool):
            c[k] = rng.choice([not v, 0, "true", None])
        elif isinstance(v, int | float):
            if op < 0.45:
                c[k] = rng.choice(EDGE_NUMBERS)
            elif op < 0.75:
                try:
                    c[k] = v * rng.choice([-1, 0.1, 0.5, 2, 10, 1000, 1e-6])
                except OverflowError:  # an earlier mutation left a huge integer
                    c[k] = rng.choice(EDGE_NUMBERS)
            elif op < 0.85:
                try:
                    c[k] = v + rng.uniform(-3, 3)
                except OverflowError:
                    c[k] = rng.choice(EDGE_NUMBERS)
            else:
                c[k] = rng.choice([None, "12", [], {}, True])
        elif isinstance(v, str):
            c[k] = rng.choice(EDGE_TEXT) if op < 0.7 else v + rng.choice(EDGE_TEXT)
        elif isinstance(v, list):
            if v and op < 0.3:
                del v[rng.randrange(len(v))]
            elif v and op < 0.6:
                v.insert(rng.randrange(len(v) + 1), copy.deepcopy(rng.choice(v)))
            elif op < 0.7:
                c[k] = []
            elif v and op < 0.8:
                v.reverse()
            else:
                c[k] = rng.choice([None, {}, "list", 3])
        elif isinstance(v, dict):
            keys = list(v)
            if keys and op < 0.4:
                del v[rng.choice(keys)]
            elif op < 0.55:
                v["unexpected_key"] = rng.choice(EDGE_NUMBERS)
            elif op < 0.7:
                c[k] = rng.choice([None, [], "object"])
            else:
                raw_ops += 1
        else:
            c[k] = rng.choice(EDGE_NUMBERS)
    text = json.dumps(d, ensure_ascii=rng.random() < 0.5, indent=rng.choice([None, 2]))
    if raw_ops or rng.random() < 0.05:  # byte-level damage
        b = bytearray(text.encode("utf-8", "surrogatepass"))
        if rng.random() < 0.5 and len(b) > 10:
            del b[rng.randrange(len(b) // 2, len(b)):]
        else:
            for _ in range(rng.randint(1, 4)):
                b[rng.randrange(len(b))] = rng.randrange(256)
        return bytes(b)
    return text.encode("utf-8", "surrogatepass")


# --------------------------------------------------------------------------- random projects

def random_project(rng: random.Random) -> bytes:
    """A random valid project (invented data): one or two levels framed by
    :func:`droprig.model.generate_level`, zones and loads inside droprig's ranges, a
    coarse grid so a case runs quickly."""
    from droprig.io.project_file import dumps_project
    from droprig.io.sections import get_grade, get_section
    from droprig.model import (
        Deck,
        LiftLoad,
        LiftZone,
        Project,
        ProjectInfo,
        ProtectionArea,
        Rect,
        Settings,
        generate_level,
    )

    secs = ["IPE 300", "IPE 450", "HEB 400", "W16X26", "W21X44", "W12X26", "HEA 300"]
    grades = ["S275", "S355", "ASTM A992"]
    levels = []
    for i in range(rng.randint(1, 2)):
        xs = tuple(rng.choice([6.0, 7.5, 9.0]) for _ in range(rng.randint(1, 3)))
        ys = tuple(rng.choice([6.0, 8.0, 9.0]) for _ in range(rng.randint(1, 2)))
        levels.append(generate_level(
            level_id=f"L{i}", name=f"Level {i}", elevation=4.0 * (i + 1), x_spacings=xs,
            y_spacings=ys, girder_direction=rng.choice(["x", "y"]),
            beam_spacing=rng.choice([2.0, 2.5, 3.0]),
            girder_section=get_section(rng.choice(secs)),
            beam_section=get_section(rng.choice(secs)),
            girder_grade=get_grade(rng.choice(grades)),
            beam_grade=get_grade(rng.choice(grades)),
            # steel plate and grating decks now and then (their own file keys)
            deck=rng.choice([Deck(), Deck(), Deck(kind="steel_plate",
                                                  thickness=rng.uniform(0.004, 0.03),
                                                  steel_fy=rng.choice([235e6, 355e6])),
                             Deck(kind="grating", thickness=rng.uniform(0.025, 0.06),
                                  bar_thickness=0.005, bar_pitch=rng.choice([0.03, 0.041]))])))
        # a level below recorded as unoccupied now and then (its own file key, which the
        # mutations then reach), chosen from values already drawn: the random stream of
        # the existing seeds is unchanged
        if len(xs) == 2:
            levels[-1] = dataclasses.replace(levels[-1], occupied_below=False)
    zones, prots = [], []
    for j in range(rng.randint(1, 2)):
        lv = rng.choice(levels)
        ext = lv.grid.extent
        crane = (rng.uniform(ext.x0 - 10, ext.x1 + 10), rng.uniform(ext.y0 - 10, ext.y1 + 10))
        r_min = rng.uniform(0.0, 8.0)
        loads = []
        for k in range(rng.randint(0, 3)):
            if rng.random() < 0.5:
                loads.append(LiftLoad(f"load {k}", rng.uniform(50, 20_000), rng.uniform(0.2, 3),
                                      rng.uniform(0.2, 3), rng.uniform(0.0, 5.0),
                                      contact_stiffness=rng.choice([None, 1e7, 5e8])))
            else:
                loads.append(LiftLoad(f"load {k}", rng.uniform(50, 20_000), 1.0, 1.0, None,
                                      lv.elevation + rng.uniform(4, 12), rng.uniform(0, 3),
                                      kind=rng.choice(["load", "rigging"])))
        corridor: tuple[tuple[float, float], ...] = ()
        if rng.random() < 0.3:
            corridor = ((ext.x0, ext.y0), (ext.x1, ext.y0 + 1), (ext.x1 - 1, ext.y1),
                        (ext.x0 + 1, ext.y1 - 1))
        zones.append(LiftZone(f"Z{j}", "", lv.id, crane, r_min, r_min + rng.uniform(3, 25),
                              rng.uniform(-3, 3), rng.uniform(-3, 3), rng.uniform(0, 1.5),
                              corridor, tuple(loads)))
        if rng.random() < 0.5:
            x0 = rng.uniform(ext.x0, ext.x1 - 1)
            y0 = rng.uniform(ext.y0, ext.y1 - 1)
            area = Rect(x0, y0, x0 + rng.uniform(0.5, 6), y0 + rng.uniform(0.5, 6))
            if rng.random() < 0.5:
                prots.append(ProtectionArea(f"P{j}", "", lv.id, area, "spring",
                                            rng.uniform(0.05, 0.4), rng.uniform(1e5, 1e9)))
            else:
                prots.append(ProtectionArea(f"P{j}", "", lv.id, area, "crushable",
                                            rng.uniform(0.05, 0.4), None,
                                            rng.uniform(1e3, 2e5), rng.uniform(0.01, 0.4)))
    settings = Settings(unit_system=rng.choice(["SI", "US"]),
                        design_basis=rng.choice(["en1993", "aisc360"]),
                        grid_resolution=rng.choice([0.5, 0.75, 1.0]))
    project = Project(ProjectInfo("fuzz project"), settings, tuple(levels), tuple(zones),
                      tuple(prots))
    return dumps_project(project).encode("utf-8")


def cases(n: int, seed: int, random_share: float = 0.25) -> Iterator[tuple[str, bytes]]:
    """``n`` (label, file bytes) cases: mutants of the demo files (1–3 mutations,
    sometimes of a random project) and random valid projects."""
    rng = random.Random(seed)
    demos = [json.loads(p.read_text(encoding="utf-8")) for p in DEMOS]
    for i in range(n):
        r = rng.random()
        if r < random_share:
            yield f"random project #{i}", random_project(rng)
        elif r < random_share + 0.1:
            base = json.loads(random_project(rng))
            yield f"mutant of a random project #{i}", mutate(base, rng, rng.randint(1, 3))
        else:
            d = rng.randrange(len(demos))
            yield (f"mutant of {DEMOS[d].name} #{i}",
                   mutate(demos[d], rng, rng.choice([1, 1, 1, 2, 3])))


def run(n: int, seed: int, limit: float = CASE_SECONDS,
        on_case: Callable[[Tally], None] | None = None) -> Tally:
    """Run ``n`` cases from ``seed`` and tally them (``limit``: seconds before a case
    counts as a hang; ``on_case(tally)`` after every case, for progress)."""
    tally = Tally()
    with tempfile.TemporaryDirectory(prefix="droprig-fuzz-") as tmp:
        folder = Path(tmp)
        for label, data in cases(n, seed):
            tally.add(label, run_case(data, folder, limit))
            if on_case is not None:
                on_case(tally)
    return tally

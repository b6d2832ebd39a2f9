"""Quick form of the standing fuzz harness (issue 16, item 9), run by ``make test``:
300 mutated demo files and random valid projects, plus Hypothesis-built documents,
through ``droprig validate`` and ``droprig analyse``. Every outcome is a clean result
(no NaN or infinity) or a clean refusal (exit 2, a message, no traceback), within
10 s, and validate agrees with analyse. The long form is ``benchmarks/bench_fuzz.py``.

Source: the outcome contract is droprig's own (droprig/cli.py: 0 ok, 2 bad input,
never a traceback; issue 16). Inputs are invented or mutated demo scenarios.
"""

from __future__ import annotations

import importlib.util
import json
import sys
from pathlib import Path
from typing import Any

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "droprig_fuzz_harness", Path(__file__).with_name("harness.py"))
assert _spec is not None and _spec.loader is not None
harness = importlib.util.module_from_spec(_spec)
sys.modules[_spec.name] = harness
_spec.loader.exec_module(harness)

QUICK_CASES = 300
HANG_SECONDS = 60.0
"""A hang guard, not a speed figure (speed is measured in benchmarks/bench_fuzz.py
against the 10 s per case of issue 16): generous so a loaded machine never fails it."""


@pytest.mark.slow
def test_quick_fuzz_has_no_crash_hang_nan_or_disagreement() -> None:
    tally = harness.run(QUICK_CASES, seed=16, limit=HANG_SECONDS)
    assert tally.cases == QUICK_CASES
    assert tally.failures == [], tally.summary() + "\n" + "\n".join(tally.failures[:10])
    # the harness exercises both outcomes (a fuzzer that only ever refuses tests little)
    assert tally.accepted >= QUICK_CASES // 10, tally.summary()
    assert tally.refused >= QUICK_CASES // 10, tally.summary()


_json = st.recursive(
    st.none() | st.booleans() | st.integers(-10**20, 10**20)
    | st.floats(allow_nan=False, allow_infinity=False) | st.text(max_size=12),
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(max_size=8), inner,
                                                                max_size=4),
    max_leaves=20)

_DEMO = json.loads(harness.DEMOS[0].read_text(encoding="utf-8"))
_KEYS = ("info", "settings", "levels", "lift_zones", "protection_areas", "format_version")


@settings(max_examples=60, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(key=st.sampled_from(_KEYS), value=_json)
def test_any_json_value_in_a_top_level_slot_is_handled_cleanly(
        key: str, value: Any, tmp_path: Path) -> None:
    doc = dict(_DEMO)
    doc[key] = value
    data = json.dumps(doc).encode("utf-8", "surrogatepass")
    outcome = harness.run_case(data, tmp_path, HANG_SECONDS)
    assert outcome.kind != "failure", outcome.detail

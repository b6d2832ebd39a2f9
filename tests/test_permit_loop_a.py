"""Permit conditions that work when followed, random projects 0–49 (half of the
closed loop of tests/test_permit.py, whose module docstring gives the sources: Gere
7th ed. §9.10 Eq. 9-94, the forward model every inverse answer must reproduce; the
projects are random invented inputs, never expected values). Split in two files so
that the suite's two workers share the loop (``--dist loadfile``)."""

from __future__ import annotations

import pytest

from tests.test_permit import N_LOOP, every_condition_works_when_followed


@pytest.mark.parametrize("chunk", [c for c in range(0, N_LOOP, 10) if c < 50])
def test_every_condition_works_when_followed(chunk: int) -> None:
    every_condition_works_when_followed(chunk)

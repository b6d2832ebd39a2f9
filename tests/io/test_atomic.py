"""Atomic replacement (temp file beside the target + os.replace; POSIX rename(2)
replaces the name in one step — common practice, no source)."""

from __future__ import annotations

from pathlib import Path

import pytest

from droprig.io.atomic import atomic_path, atomic_write_bytes


def test_write_replaces_and_leaves_no_temp(tmp_path: Path) -> None:
    target = tmp_path / "out.json"
    target.write_bytes(b"old")
    atomic_write_bytes(target, b"new")
    assert target.read_bytes() == b"new"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out.json"]


def test_failure_inside_the_block_keeps_the_original(tmp_path: Path) -> None:
    target = tmp_path / "annex.pdf"
    target.write_bytes(b"original")
    with pytest.raises(RuntimeError), atomic_path(target) as tmp:
        tmp.write_bytes(b"half")
        raise RuntimeError("renderer died")
    assert target.read_bytes() == b"original"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["annex.pdf"]

"""``droprig demo`` headless: the listing at the end names this run's outputs only.

Seen by using it (common practice, no source): a second ``make demo`` listed
the ``.bak`` copies of the first run's files as if they were outputs. The real
commands are replaced by stand-ins that write files, so the test costs
milliseconds; the full demo runs in ``make demo``.
"""

from __future__ import annotations

import argparse
import pathlib
from typing import Any

import pytest

import droprig.cli
from droprig.commands import demo


def _fake_runs(monkeypatch: pytest.MonkeyPatch) -> None:
    def fake_main(argv: list[str]) -> int:
        for flag in ("--json", "--csv", "-o"):
            if flag in argv:
                target = pathlib.Path(argv[argv.index(flag) + 1])
                if target.exists():  # as droprig.io.atomic.keep_backup does
                    target.with_name(target.name + ".bak").write_bytes(target.read_bytes())
                target.write_text("x")
        return 0

    def fake_call(cmd: list[str], **_: Any) -> int:
        pathlib.Path(cmd[cmd.index("--screenshot") + 1]).write_bytes(b"png")
        return 0

    monkeypatch.setattr(droprig.cli, "main", fake_main)
    monkeypatch.setattr(demo.subprocess, "call", fake_call)


def test_second_run_lists_no_backups(tmp_path: pathlib.Path, monkeypatch: pytest.MonkeyPatch,
                                     capsys: pytest.CaptureFixture[str]) -> None:
    _fake_runs(monkeypatch)
    args = argparse.Namespace(out=str(tmp_path), headless=True)
    assert demo.run(args) == 0
    assert demo.run(args) == 0
    listing = capsys.readouterr().out.split("outputs written to")[-1]
    listed = [ln.split()[0] for ln in listing.splitlines()[1:]
              if ln.startswith("  ") and "bytes" in ln]
    stems = [p.stem for p in sorted(demo.demo_dir().glob("*.droprig"))]
    expected = [f"{s}{suffix}" for s in stems
                for suffix in (".json", ".csv", "_annex.pdf", "_window.png")]
    assert sorted(listed) == sorted(expected)
    assert not any(name.endswith(".bak") for name in listed)
    assert "kept beside them as .bak" in listing
    assert any(tmp_path.glob("*.bak"))  # the backups are still there, only not listed


def test_missing_output_is_named(tmp_path: pathlib.Path, monkeypatch: pytest.MonkeyPatch,
                                 capsys: pytest.CaptureFixture[str]) -> None:
    _fake_runs(monkeypatch)
    monkeypatch.setattr(demo.subprocess, "call", lambda cmd, **_: 0)  # no screenshot written
    assert demo.run(argparse.Namespace(out=str(tmp_path), headless=True)) == 1
    assert "not written" in capsys.readouterr().out

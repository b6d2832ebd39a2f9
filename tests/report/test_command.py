"""``droprig report``: exit codes, messages and the atomic write.

Exit codes are droprig's command-line contract (``droprig.cli``: 0 ok, 2 bad
input, never a traceback; common practice, no source).
"""

from __future__ import annotations

import contextlib
import io
import pathlib

import pytest

from droprig.cli import main
from droprig.texts import CAUTION

pytest.importorskip("droprig.solver.analysis")
pytest.importorskip("droprig.solver.trace")

ROOT = pathlib.Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory: pytest.TempPathFactory) -> tuple[int, str, pathlib.Path]:
    if not DEMO.exists():
        pytest.skip("demo project not present")
    out = tmp_path_factory.mktemp("cli") / "annex.pdf"
    buf = io.StringIO()
    with contextlib.redirect_stdout(buf):
        rc = main(["report", str(DEMO), "-o", str(out)])
    return rc, buf.getvalue(), out


def test_report_writes_the_pdf_and_prints_path_and_verdict(
        demo_run: tuple[int, str, pathlib.Path]) -> None:
    rc, text, out = demo_run
    assert rc == 0
    assert out.read_bytes()[:5] == b"%PDF-"  # ISO 32000-1 §7.5.2 file header
    assert str(out.resolve()) in text
    assert "overall verdict:" in text
    assert CAUTION in text
    # no temporary file left next to the output
    assert [p.name for p in out.parent.iterdir()] == ["annex.pdf"]


@pytest.mark.parametrize(("argv", "message"), [
    (["report", "missing.droprig", "-o", "{tmp}/a.pdf"], "file not found"),
    (["report", "{bad}", "-o", "{tmp}/a.pdf"], "cannot read the project"),
    (["report", "{demo}", "-o", "{tmp}/no/such/folder/a.pdf"], "does not exist"),
    (["report", "{demo}", "-o", "{tmp}"], "is a folder"),
    (["report", "{demo}", "-o", "{tmp}/a.pdf", "--lift", "NOPE"], "--lift"),
    (["report", "{demo}", "-o", "{demo}"], "project file itself"),
])
def test_bad_input_exits_2_with_a_message(argv: list[str], message: str,
                                         tmp_path: pathlib.Path,
                                         capsys: pytest.CaptureFixture[str]) -> None:
    if not DEMO.exists():
        pytest.skip("demo project not present")
    bad = tmp_path / "bad.droprig"
    bad.write_text("{ not json", encoding="utf-8")
    demo = tmp_path / "demo.droprig"
    demo.write_bytes(DEMO.read_bytes())
    args = [a.format(tmp=tmp_path, bad=bad, demo=demo) for a in argv]
    rc = main(args)
    err = capsys.readouterr().err
    assert rc == 2
    assert message in err
    assert "Traceback" not in err
    assert not (tmp_path / "a.pdf").exists()
    assert demo.read_bytes() == DEMO.read_bytes()

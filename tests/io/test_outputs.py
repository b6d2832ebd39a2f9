"""Outputs never clobber inputs (issue 16, item 3).

Source: the contract is droprig's own (droprig/io/atomic.py): an output is never
the project itself (same file after resolving symbolic and hard links, POSIX
``stat`` st_dev/st_ino identity as used by :func:`os.path.samefile`), never a
``.droprig`` file without ``--force``, and the file an output replaces is kept
as ``.bak``. The demo project is an invented scenario used as an input only.
"""

from __future__ import annotations

import os
import shutil
from pathlib import Path

import pytest

from droprig.cli import main
from droprig.io.atomic import OutputRefusedError, check_output, keep_backup, write_output

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


@pytest.fixture
def project(tmp_path: Path) -> Path:
    p = tmp_path / "p.droprig"
    shutil.copyfile(DEMO, p)
    return p


def _cli(capsys: pytest.CaptureFixture[str], *argv: str) -> tuple[int, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    return code, out + err


def test_analyse_json_over_its_own_project_is_refused(project: Path,
                                                      capsys: pytest.CaptureFixture[str]) -> None:
    """Before: `analyse p.droprig --json p.droprig` replaced the project, no backup."""
    before = project.read_bytes()
    for extra in ([], ["--force"]):
        code, out = _cli(capsys, "analyse", str(project), "--json", str(project), *extra)
        assert code == 2
        assert "--json" in out and "project file itself" in out
        assert project.read_bytes() == before
        assert not project.with_name("p.droprig.bak").exists()


def test_links_to_the_project_are_the_project(project: Path, tmp_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    before = project.read_bytes()
    sym = tmp_path / "results.json"
    sym.symlink_to(project)
    hard = tmp_path / "hard.csv"
    os.link(project, hard)
    for opt, target in (("--json", sym), ("--csv", hard)):
        code, out = _cli(capsys, "analyse", str(project), opt, str(target))
        assert code == 2, out
        assert "project file itself" in out
    code, out = _cli(capsys, "report", str(project), "-o", str(sym))
    assert code == 2 and "project file itself" in out
    assert project.read_bytes() == before


def test_other_project_files_need_force(project: Path, tmp_path: Path,
                                        capsys: pytest.CaptureFixture[str]) -> None:
    other = tmp_path / "other.droprig"
    shutil.copyfile(DEMO, other)
    before = other.read_bytes()
    code, out = _cli(capsys, "analyse", str(project), "--csv", str(other))
    assert code == 2 and "--force" in out
    assert other.read_bytes() == before
    code, out = _cli(capsys, "analyse", str(project), "--csv", str(other), "--force")
    assert code == 0, out
    assert other.with_name("other.droprig.bak").read_bytes() == before
    assert other.read_text(encoding="utf-8").startswith("lift,load,level")


def test_a_replaced_output_is_kept_as_bak(project: Path, tmp_path: Path,
                                          capsys: pytest.CaptureFixture[str]) -> None:
    out = tmp_path / "r.json"
    out.write_text("previous results\n", encoding="utf-8")
    code, text = _cli(capsys, "analyse", str(project), "--json", str(out))
    assert code == 0, text
    assert (tmp_path / "r.json.bak").read_text(encoding="utf-8") == "previous results\n"
    assert out.read_text(encoding="utf-8").lstrip().startswith("{")


def test_same_name_for_json_and_csv_is_refused(project: Path, tmp_path: Path,
                                               capsys: pytest.CaptureFixture[str]) -> None:
    out = str(tmp_path / "both.txt")
    code, text = _cli(capsys, "analyse", str(project), "--json", out, "--csv", out)
    assert code == 2 and "same file" in text


def test_unit_functions(tmp_path: Path) -> None:
    src = tmp_path / "a.droprig"
    src.write_text("{}", encoding="utf-8")
    with pytest.raises(OutputRefusedError):
        check_output(src, (src,), force=True)
    with pytest.raises(OutputRefusedError):
        check_output(tmp_path / "new.DROPRIG", (src,))
    check_output(tmp_path / "new.droprig", (src,), force=True)
    assert keep_backup(tmp_path / "missing.txt") is None
    target = tmp_path / "out.txt"
    write_output(target, b"one", (src,))
    write_output(target, b"two", (src,))
    assert target.read_bytes() == b"two"
    assert (tmp_path / "out.txt.bak").read_bytes() == b"one"
    assert sorted(p.name for p in tmp_path.iterdir()) == [
        "a.droprig", "out.txt", "out.txt.bak"]  # no temporary file left

"""scripts/sysdeps.sh: on Debian the venv package matching the interpreter is
installed with the others when the interpreter cannot make a venv; without apt
(or without root) the script says plainly what to install.

Run against stub commands on a private PATH (nothing is installed). Debian
ships ``ensurepip`` apart from the interpreter, in ``python3.X-venv`` (Debian
Python policy, python3-venv package description; common practice, no source).
"""

from __future__ import annotations

import os
import shutil
import subprocess
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
SCRIPT = ROOT / "scripts" / "sysdeps.sh"


def _stub(folder: Path, name: str, body: str) -> None:
    p = folder / name
    p.write_text("#!/bin/sh\n" + body + "\n")
    p.chmod(0o755)


@pytest.fixture
def path_dir(tmp_path: Path) -> Path:
    bin_dir = tmp_path / "bin"
    bin_dir.mkdir()
    for tool in ("grep", "sh", "cat", "echo"):
        found = shutil.which(tool)
        if found:
            os.symlink(found, bin_dir / tool)
    return bin_dir


def _run(bin_dir: Path, *args: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(["/bin/sh", str(SCRIPT), *args], capture_output=True, text=True,
                          env={"PATH": str(bin_dir)}, timeout=60)


def _no_ensurepip_python(bin_dir: Path) -> str:
    _stub(bin_dir, "fakepy", 'case "$2" in *ensurepip*) exit 1;; esac; echo 3.11')
    return str(bin_dir / "fakepy")


def test_debian_as_root_installs_the_matching_venv_package(path_dir: Path,
                                                           tmp_path: Path) -> None:
    log = tmp_path / "apt.log"
    _stub(path_dir, "dpkg-query", "exit 1")  # nothing installed
    _stub(path_dir, "id", "echo 0")
    _stub(path_dir, "apt-get", f'echo "$@" >> {log}')
    r = _run(path_dir, _no_ensurepip_python(path_dir), "libgl1")
    assert r.returncode == 0, r.stderr
    installed = log.read_text()
    assert "install" in installed and "libgl1" in installed and "python3.11-venv" in installed


def test_debian_without_root_names_the_packages_and_stops(path_dir: Path) -> None:
    _stub(path_dir, "dpkg-query", "exit 1")
    _stub(path_dir, "id", "echo 1000")
    r = _run(path_dir, _no_ensurepip_python(path_dir), "libgl1")
    assert r.returncode != 0  # no venv, no droprig: make stops with the message
    assert "apt-get install libgl1 python3.11-venv" in r.stderr


def test_no_apt_says_what_to_install(path_dir: Path) -> None:
    r = _run(path_dir, _no_ensurepip_python(path_dir), "libgl1")
    assert r.returncode != 0
    assert "ensurepip" in r.stderr and "python3.11-venv" in r.stderr


def test_nothing_missing_is_silent(path_dir: Path) -> None:
    _stub(path_dir, "dpkg-query", "echo 'install ok installed'")
    _stub(path_dir, "fakepy", "exit 0")
    r = _run(path_dir, str(path_dir / "fakepy"), "libgl1")
    assert r.returncode == 0 and r.stdout == "" and r.stderr == ""


def test_pyproject_licence_is_an_spdx_string() -> None:
    import tomllib

    meta = tomllib.loads((ROOT / "pyproject.toml").read_text())
    assert isinstance(meta["project"]["license"], str)  # PEP 639; no table form
    req = meta["build-system"]["requires"]
    assert any(r.replace(" ", "").startswith("setuptools>=77") for r in req)


def test_editable_install_is_a_plain_pth_with_no_warning() -> None:
    """setuptools (84, ``command/editable_wheel.py``, ``_select_strategy``) makes an
    editable install a plain ``.pth`` entry when ``package-dir`` is ``{"": …}`` and
    the packages lie under that folder; otherwise an import hook, whose
    "Editable installation." warning pip prints even with ``--quiet`` (the `make`
    output showed it)."""
    import tomllib

    meta = tomllib.loads((ROOT / "pyproject.toml").read_text())
    assert meta["tool"]["setuptools"]["package-dir"] == {"": "."}
    assert (ROOT / "droprig" / "__init__.py").is_file()
    assert meta["tool"]["setuptools"]["packages"]["find"]["include"] == ["droprig*"]

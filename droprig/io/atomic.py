"""Atomic file replacement: write beside the target, then one ``os.replace``.

A failure at any point (including an interrupt) leaves the previous file as it
was and removes the temporary file; nobody ever sees a half-written file.
Used by project saves, autosaves, the CLI's JSON/CSV outputs and the PDF annex.
"""

from __future__ import annotations

import os
import secrets
import shutil
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

__all__ = ["OutputRefusedError", "atomic_path", "atomic_write_bytes", "check_output",
           "keep_backup", "write_output"]


def _temp_beside(target: Path) -> Path:
    folder = target.parent if str(target.parent) else Path(".")
    return folder / f".{target.name}.{secrets.token_hex(6)}.tmp"


@contextmanager
def atomic_path(target: str | os.PathLike[str], *, like: Path | None = None) -> Iterator[Path]:
    """Yield a temporary path beside ``target``; when the block ends normally the
    file written there replaces ``target`` (mode copied from ``like`` if given) and
    the folder entry is made durable. On any exception the temporary file is
    removed and ``target`` is untouched."""
    target = Path(os.fspath(target))
    tmp = _temp_beside(target)
    try:
        yield tmp
        if like is not None:
            shutil.copymode(like, tmp)
        os.replace(tmp, target)
    except BaseException:
        try:
            tmp.unlink()
        except FileNotFoundError:
            pass
        raise
    _fsync_dir(target.parent if str(target.parent) else Path("."))


def atomic_write_bytes(target: str | os.PathLike[str], data: bytes, *,
                       like: Path | None = None) -> None:
    """Write ``data`` to ``target`` atomically, flushed and fsync'ed first."""
    with atomic_path(target, like=like) as tmp:
        # os.open with 0o666 lets the umask decide a new file's mode, like open() would.
        fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0),
                     0o666)
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())


def _fsync_dir(folder: Path) -> None:
    """Make the rename durable (POSIX); a no-op where folders cannot be opened."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


class OutputRefusedError(ValueError):
    """An output path that would overwrite an input or a project file."""


PROJECT_SUFFIX = ".droprig"


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.realpath(a) == os.path.realpath(b)


def check_output(target: str | os.PathLike[str], inputs: tuple[str | os.PathLike[str], ...],
                 *, force: bool = False, option: str = "output") -> None:
    """Refuse (:class:`OutputRefusedError`) an output ``target`` that is one of the
    ``inputs`` (the same file after resolving links, hard links included) — always —
    or, unless ``force``, any existing or new ``.droprig`` file: results must never
    replace a project. ``option`` names the command-line option in the message."""
    t = Path(os.fspath(target))
    for src in inputs:
        if _same_file(t, Path(os.fspath(src))):
            raise OutputRefusedError(
                f"{option}: {os.fspath(target)} is the project file itself; the results "
                "would replace the project. Choose another name")
    if not force and os.path.realpath(t).lower().endswith(PROJECT_SUFFIX):
        raise OutputRefusedError(
            f"{option}: {os.fspath(target)} is a {PROJECT_SUFFIX} project file name; results "
            "are not written over a project (give --force to do it anyway)")


def keep_backup(target: str | os.PathLike[str]) -> Path | None:
    """Copy an existing regular file ``target`` to ``<target>.bak`` (atomically,
    replacing an older backup) before it is replaced; returns the backup path or
    None when there was nothing to keep."""
    t = Path(os.path.realpath(os.fspath(target)))
    if not t.is_file():
        return None
    bak = t.with_name(t.name + ".bak")
    atomic_write_bytes(bak, t.read_bytes(), like=t)
    return bak


def write_output(target: str | os.PathLike[str], data: bytes,
                 inputs: tuple[str | os.PathLike[str], ...] = (), *, force: bool = False,
                 option: str = "output") -> None:
    """:func:`check_output`, then :func:`keep_backup`, then
    :func:`atomic_write_bytes`: an output never clobbers an input, and the file it
    replaces is kept as ``.bak``."""
    check_output(target, inputs, force=force, option=option)
    keep_backup(target)
    atomic_write_bytes(target, data)

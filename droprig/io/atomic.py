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

__all__ = ["atomic_path", "atomic_write_bytes"]


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

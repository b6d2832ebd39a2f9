"""Sub-command implementations for :mod:`droprig.cli` (one module per command).

Each module exposes ``run(args) -> int``.
"""

from __future__ import annotations


def describe_error(exc: BaseException) -> str:
    """One readable line for an error reaching the command line."""
    from droprig.model.errors import ModelError
    from droprig.units import UnitError

    if isinstance(exc, ModelError | UnitError):
        return str(exc)
    if isinstance(exc, FileNotFoundError):
        return f"file not found: {exc.filename}"
    if isinstance(exc, PermissionError):
        return f"permission denied: {exc.filename}"
    if isinstance(exc, OSError):
        return f"{exc.strerror or exc}: {getattr(exc, 'filename', '') or ''}".strip()
    name = type(exc).__name__
    if name in ("ProjectFileError", "SectionNotFound", "GradeNotFound"):
        return str(exc)
    return f"unexpected error ({name}): {exc}. Please report this with the input file."

"""User-facing texts shared by the command line, the window and the annex (Qt-free,
stdlib only): the caution every verdict carries, and one readable line per error."""

from __future__ import annotations

__all__ = ["CAUTION", "describe_error"]

CAUTION = (
    "CAUTION: droprig is an aid to a competent person. Results must be reviewed against "
    "local codes by the appointed lifting person and a licensed structural engineer; keep "
    "people out from under the load path whatever the result."
)
"""Carried by every verdict screen, report and command output."""


def describe_error(exc: BaseException) -> str:
    """One readable line for an error reaching the user (command line or window)."""
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

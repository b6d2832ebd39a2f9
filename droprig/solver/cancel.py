"""Cooperative cancellation of a running analysis (issue 16: an edit or closing the
window stops a running analysis within a second).

The caller runs the analysis inside :func:`cancellable` with a
:class:`CancelToken`; the solver calls :func:`check` between blocks of drop points
(:func:`droprig.solver.parallel.for_blocks`), between members while a floor is
prepared and between zones, and :class:`AnalysisCancelledError` unwinds the run
once the token is cancelled. Without a token :func:`check` costs one context
lookup. The token travels in a :mod:`contextvars` variable, which the block
threads inherit (``for_blocks`` runs each block in a copy of the caller's context).
"""

from __future__ import annotations

import threading
from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar

__all__ = ["AnalysisCancelledError", "CancelToken", "cancellable", "check"]


class AnalysisCancelledError(Exception):
    """The analysis was cancelled (an edit made it stale, or the window closes)."""


class CancelToken:
    """Set once with :meth:`cancel`; read from any thread."""

    def __init__(self) -> None:
        self._event = threading.Event()

    def cancel(self) -> None:
        self._event.set()

    @property
    def cancelled(self) -> bool:
        return self._event.is_set()


_TOKEN: ContextVar[CancelToken | None] = ContextVar("droprig_cancel_token", default=None)


@contextmanager
def cancellable(token: CancelToken) -> Iterator[CancelToken]:
    """Run the block with ``token`` as the current cancel token."""
    reset = _TOKEN.set(token)
    try:
        yield token
    finally:
        _TOKEN.reset(reset)


def check() -> None:
    """Raise :class:`AnalysisCancelledError` when the current token is cancelled."""
    token = _TOKEN.get()
    if token is not None and token.cancelled:
        raise AnalysisCancelledError

"""Sub-command implementations for :mod:`droprig.cli` (one module per command).

Each module exposes ``run(args) -> int``.
"""

from __future__ import annotations

from droprig.texts import describe_error

__all__ = ["describe_error"]

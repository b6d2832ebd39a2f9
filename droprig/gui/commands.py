"""The one undo command: swap one immutable :class:`Project` for another.

The pure edit functions that build the new project live in
:mod:`droprig.gui.edits` (no Qt, no document). This module knows the document
only through the small :class:`Swapper` protocol, so ``document`` imports
``commands`` and nothing imports back.
"""

from __future__ import annotations

from typing import Protocol

from PySide6.QtGui import QUndoCommand

from droprig.model import Project


class Swapper(Protocol):
    """What :class:`ProjectEdit` needs of the document."""

    def _swap(self, project: Project, selection: object = None) -> None: ...


class ProjectEdit(QUndoCommand):
    """Swap ``before`` for ``after`` in ``document`` (redo) and back (undo).

    ``selection_before`` / ``selection_after``: when an edit changes what a
    selection's ids point at (a load renamed), the selection to install together
    with each project, before any panel hears of the change; ``None`` keeps the
    current selection.
    """

    def __init__(self, document: Swapper, before: Project, after: Project, text: str,
                 selection_before: object = None, selection_after: object = None) -> None:
        super().__init__(text)
        self._document = document
        self.before = before
        self.after = after
        self.selection_before = selection_before
        self.selection_after = selection_after

    def redo(self) -> None:
        self._document._swap(self.after, self.selection_after)

    def undo(self) -> None:
        self._document._swap(self.before, self.selection_before)


__all__ = ["ProjectEdit", "Swapper"]

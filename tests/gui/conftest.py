"""Shared set-up for the desktop-application tests (offscreen Qt, see tests/conftest.py)."""

from __future__ import annotations

from collections.abc import Callable

import pytest
from PySide6.QtWidgets import QMessageBox


@pytest.fixture(autouse=True)
def _no_modal_dialogs(monkeypatch: pytest.MonkeyPatch) -> None:
    """A modal message box would wait forever offscreen: fail instead. Tests that
    expect one patch it again with their answer."""
    def unexpected(*args: object, **kwargs: object) -> None:
        pytest.fail(f"unexpected message box: {args[1:3]}")

    for name in ("warning", "question", "critical", "information"):
        monkeypatch.setattr(QMessageBox, name, unexpected)


@pytest.fixture
def open_window(qtbot) -> Callable[..., object]:
    """Factory: a shown main window (optionally resized) that closes without the
    unsaved-changes prompt (the tests answer that prompt themselves)."""
    from droprig.gui.main_window import MainWindow

    def make(size: tuple[int, int] | None = None, *, exposed: bool = True) -> MainWindow:
        win = MainWindow(debounce_ms=30)

        def no_prompt(w: MainWindow = win) -> None:
            w._closing = True

        qtbot.addWidget(win, before_close_func=no_prompt)
        if size is not None:
            win.resize(*size)
        win.show()
        if exposed:
            qtbot.waitExposed(win)
        return win

    return make

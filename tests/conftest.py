"""Test set-up shared by the whole suite.

Qt must be told to render offscreen *before* it is imported anywhere, or a
headless pytest run aborts silently.
"""

from __future__ import annotations

import os

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
os.environ.setdefault("MPLBACKEND", "Agg")

import pytest


@pytest.fixture(autouse=True)
def _isolated_user_settings(tmp_path_factory: pytest.TempPathFactory,
                            monkeypatch: pytest.MonkeyPatch) -> None:
    """Never read or write the real user's settings, recent files or autosaves."""
    home = tmp_path_factory.mktemp("home")
    monkeypatch.setenv("HOME", str(home))
    monkeypatch.setenv("XDG_CONFIG_HOME", str(home / ".config"))
    monkeypatch.setenv("XDG_DATA_HOME", str(home / ".local" / "share"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(home / ".cache"))
    monkeypatch.setenv("DROPRIG_SETTINGS_DIR", str(home / "droprig-settings"))

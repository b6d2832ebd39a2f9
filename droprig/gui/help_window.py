"""Help: the user guide (``docs/user_guide.md``) in a window, opened by F1 at
the section of the focused panel, and Help › Limits of use with the text.

The guide is found relative to the source tree (like ``resources/``); its
screenshots sit in ``docs/guide/`` and are made by ``scripts/guide_screenshots.py``.
"""

from __future__ import annotations

import re
from functools import lru_cache
from pathlib import Path

from PySide6.QtCore import Qt, QUrl
from PySide6.QtGui import QKeyEvent, QKeySequence, QShortcut, QTextCursor, QTextDocument
from PySide6.QtWidgets import (
    QDialog,
    QDialogButtonBox,
    QTextBrowser,
    QVBoxLayout,
    QWidget,
)

from droprig.texts import CAUTION

GUIDE = Path(__file__).resolve().parents[2] / "docs" / "user_guide.md"

SECTIONS: dict[str, str] = {
    "start": "The job step by step",
    "plan": "The plan",
    "project": "The project tree",
    "inspector": "The inspector",
    "results": "Results by bay",
    "trace": "The calculation trace",
    "settings": "Analysis settings",
    "generator": "Generate framing",
    "annex": "The permit annex",
    "method": "Method",
    "limits": "Limits of use",
}
"""Panel or topic -> heading of its section in the guide."""


@lru_cache(maxsize=1)
def guide_text() -> str:
    """The guide's markdown; a short note naming the file when it is missing."""
    try:
        return GUIDE.read_text(encoding="utf-8")
    except OSError:
        return (f"# droprig user guide\n\nThe guide ({GUIDE}) is not installed with this "
                f"copy of droprig.\n\n## Limits of use\n\n{CAUTION}\n")


def section_text(key: str) -> str:
    """The markdown of one ``## `` section of the guide (heading included)."""
    heading = SECTIONS.get(key, key)
    text = guide_text()
    m = re.search(rf"^## {re.escape(heading)}\s*$", text, flags=re.MULTILINE)
    if m is None:
        return ""
    end = re.search(r"^## ", text[m.end():], flags=re.MULTILINE)
    return text[m.start(): m.end() + end.start() if end else len(text)].strip()


class HelpWindow(QWidget):
    """The guide in a browser; :meth:`show_section` scrolls to a section."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("droprig user guide")
        self.setObjectName("helpWindow")
        self.browser = QTextBrowser()
        self.browser.setOpenExternalLinks(True)
        self.browser.setSearchPaths([str(GUIDE.parent)])
        self.browser.document().setBaseUrl(QUrl.fromLocalFile(str(GUIDE.parent) + "/"))
        self.browser.setMarkdown(guide_text())
        self._fit_images(700)
        lay = QVBoxLayout(self)
        lay.setContentsMargins(0, 0, 0, 0)
        lay.addWidget(self.browser)
        self.resize(760, 640)
        self.section = "start"
        # a reader closes the guide from the keyboard as any other window (Esc;
        # the platform's Close, Ctrl+W on Linux/Windows); common practice, no source
        QShortcut(QKeySequence(QKeySequence.StandardKey.Close), self, activated=self.close)

    def keyPressEvent(self, event: QKeyEvent) -> None:
        if event.key() == Qt.Key.Key_Escape:
            self.close()
            return
        super().keyPressEvent(event)

    def _fit_images(self, width: int) -> None:
        """Screenshots at most ``width`` px wide (aspect kept), so the guide reads
        without sideways scrolling."""
        from PySide6.QtGui import QImage

        doc = self.browser.document()
        block = doc.begin()
        while block.isValid():
            it = block.begin()
            while not it.atEnd():
                frag = it.fragment()
                fmt = frag.charFormat()
                if fmt.isImageFormat():
                    img_fmt = fmt.toImageFormat()
                    img = QImage(str(GUIDE.parent / img_fmt.name()))
                    if not img.isNull() and img.width() > width:
                        img_fmt.setWidth(width)
                        img_fmt.setHeight(img.height() * width / img.width())
                        cur = QTextCursor(doc)
                        cur.setPosition(frag.position())
                        cur.setPosition(frag.position() + frag.length(),
                                        QTextCursor.MoveMode.KeepAnchor)
                        cur.setCharFormat(img_fmt)
                it += 1
            block = block.next()

    def show_section(self, key: str) -> bool:
        """Scroll so the heading of section ``key`` is at the top. False if the
        guide has no such heading (the guide then opens at its start)."""
        heading = SECTIONS.get(key, key)
        doc = self.browser.document()
        cur = doc.find(heading, 0, QTextDocument.FindFlag.FindCaseSensitively)
        while not cur.isNull() and cur.block().text().strip() != heading:
            cur = doc.find(heading, cur, QTextDocument.FindFlag.FindCaseSensitively)
        bar = self.browser.verticalScrollBar()
        if cur.isNull():
            bar.setValue(0)
            return False
        self.section = key
        cur.movePosition(QTextCursor.MoveOperation.StartOfBlock)
        # to the end first, then back: the heading ends up at the top of the view
        end = QTextCursor(doc)
        end.movePosition(QTextCursor.MoveOperation.End)
        self.browser.setTextCursor(end)
        self.browser.ensureCursorVisible()
        self.browser.setTextCursor(cur)
        self.browser.ensureCursorVisible()
        return True


class LimitsDialog(QDialog):
    """Help › Limits of use: the caution and the limits of the method, as text."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Limits of use")
        self.text = QTextBrowser()
        self.text.setMarkdown(f"**{CAUTION}**\n\n" + section_text("limits"))
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close)
        buttons.rejected.connect(self.reject)
        buttons.accepted.connect(self.accept)
        lay = QVBoxLayout(self)
        lay.addWidget(self.text)
        lay.addWidget(buttons)
        self.resize(640, 480)

    def plain_text(self) -> str:
        return self.text.toPlainText()


__all__ = ["SECTIONS", "HelpWindow", "LimitsDialog", "guide_text", "section_text"]

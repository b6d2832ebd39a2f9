"""A layout that places its items left to right and starts a new row when the
width runs out: the plan's view bar on a narrow window (1280 × 720 at 150–200 %
scaling) wraps onto two rows instead of setting a window wider than the screen.
"""

from __future__ import annotations

from PySide6.QtCore import QMargins, QPoint, QRect, QSize, Qt
from PySide6.QtWidgets import QLayout, QLayoutItem, QWidget


class FlowLayout(QLayout):
    """Items in rows, each row as wide as the layout allows; the height follows
    the width (``heightForWidth``); rows are left-aligned."""

    def __init__(self, parent: QWidget | None = None, spacing: int = 6) -> None:
        super().__init__(parent)
        self._items: list[QLayoutItem] = []
        self._spacing = spacing

    # the QLayout interface
    def addItem(self, item: QLayoutItem) -> None:
        self._items.append(item)

    def count(self) -> int:
        return len(self._items)

    def itemAt(self, index: int) -> QLayoutItem | None:  # type: ignore[override]
        return self._items[index] if 0 <= index < len(self._items) else None

    def takeAt(self, index: int) -> QLayoutItem | None:  # type: ignore[override]
        return self._items.pop(index) if 0 <= index < len(self._items) else None

    def expandingDirections(self) -> Qt.Orientation:
        return Qt.Orientation(0)

    def hasHeightForWidth(self) -> bool:
        return True

    def heightForWidth(self, width: int) -> int:
        return self._place(QRect(0, 0, width, 0), apply=False)

    def setGeometry(self, rect: QRect) -> None:
        super().setGeometry(rect)
        self._place(rect, apply=True)

    def sizeHint(self) -> QSize:
        """One row of every visible item."""
        m = self.contentsMargins()
        shown = [it for it in self._items if not it.isEmpty()]
        w = sum(it.sizeHint().width() for it in shown) + self._spacing * max(len(shown) - 1, 0)
        h = max((it.sizeHint().height() for it in shown), default=0)
        return QSize(w + m.left() + m.right(), h + m.top() + m.bottom())

    def minimumSize(self) -> QSize:
        """The widest single item: anything narrower wraps."""
        m = self.contentsMargins()
        size = QSize()
        for it in self._items:
            if not it.isEmpty():
                size = size.expandedTo(it.minimumSize())
        return size + QSize(m.left() + m.right(), m.top() + m.bottom())

    def _place(self, rect: QRect, *, apply: bool) -> int:
        m: QMargins = self.contentsMargins()
        area = rect.adjusted(m.left(), m.top(), -m.right(), -m.bottom())
        rows: list[list[QLayoutItem]] = [[]]
        x = 0
        for it in self._items:
            if it.isEmpty():
                continue
            w = it.sizeHint().width()
            if rows[-1] and x + w > area.width():
                rows.append([])
                x = 0
            rows[-1].append(it)
            x += w + self._spacing
        y = area.y()
        for row in rows:
            if not row:
                continue
            height = max(it.sizeHint().height() for it in row)
            x = area.x()
            for it in row:
                w = min(it.sizeHint().width(), area.width())
                if apply:
                    h = it.sizeHint().height()
                    it.setGeometry(QRect(QPoint(x, y + (height - h) // 2), QSize(w, h)))
                x += w + self._spacing
            y += height + self._spacing
        return y - self._spacing - rect.y() + m.bottom() if y > area.y() else m.top() + m.bottom()

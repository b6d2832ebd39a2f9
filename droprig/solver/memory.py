"""Memory of the vectorised evaluation: keep freed blocks for reuse.

Each block of drop points allocates and frees a few hundred temporary arrays of
0.1–3 MB. With the C library's default policy (glibc) arrays of that size are mapped
afresh from the operating system and handed back when freed, so every temporary pays
one page fault per 4 KiB page on first touch — in practice as much time as the
arithmetic itself, and more on virtual machines. :func:`keep_freed_memory` asks the
allocator to serve such arrays from its heap and to keep freed memory for the next
block (``mallopt``: mmap threshold 32 MiB, its largest value; trim threshold 1 GiB);
:func:`release_memory` hands the unused part back after a large job
(``malloc_trim``). Elsewhere than glibc both do nothing.
"""

from __future__ import annotations

import ctypes
import ctypes.util
import sys
import threading

__all__ = ["keep_freed_memory", "release_memory"]

_M_TRIM_THRESHOLD = -1
_M_MMAP_THRESHOLD = -3
_MMAP_THRESHOLD = 32 << 20
_TRIM_THRESHOLD = 1 << 30

_lock = threading.Lock()
_state: dict[str, object] = {}


def _libc() -> ctypes.CDLL | None:
    if "libc" not in _state:
        lib = None
        if sys.platform.startswith("linux"):
            try:
                cand = ctypes.CDLL(ctypes.util.find_library("c") or "libc.so.6")
                if hasattr(cand, "mallopt") and hasattr(cand, "malloc_trim"):
                    lib = cand
            except OSError:
                lib = None
        _state["libc"] = lib
    return _state["libc"]  # type: ignore[return-value]


def keep_freed_memory() -> bool:
    """Configure the allocator once per process (see the module docstring). Returns
    True where it took effect."""
    with _lock:
        if "tuned" in _state:
            return bool(_state["tuned"])
        lib = _libc()
        ok = False
        if lib is not None:
            ok = bool(lib.mallopt(_M_MMAP_THRESHOLD, _MMAP_THRESHOLD)) and bool(
                lib.mallopt(_M_TRIM_THRESHOLD, _TRIM_THRESHOLD))
        _state["tuned"] = ok
        return ok


def release_memory() -> None:
    """Return the heap's free memory to the operating system (after a large job)."""
    lib = _libc()
    if lib is not None and _state.get("tuned"):
        lib.malloc_trim(0)

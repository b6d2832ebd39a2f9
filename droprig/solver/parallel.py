"""Blocks of drop points evaluated on several cores.

numpy releases the interpreter lock inside its array loops, so independent blocks of
drop points run in parallel on plain threads (no processes, no copies of the floor
model). Each block is computed by the same code as a single-threaded run and written
to its own rows of the output, so the results do not depend on the number of threads.
"""

from __future__ import annotations

import contextvars
import os
import threading
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor

from droprig.solver import cancel

__all__ = ["MIN_PARALLEL_BLOCKS", "for_blocks", "workers"]

MIN_PARALLEL_BLOCKS = 4
"""Fewer blocks than this run on the calling thread (thread start-up would cost more
than it saves)."""

_POOL: ThreadPoolExecutor | None = None
_POOL_SIZE = 0
_POOL_LOCK = threading.Lock()
_LOCAL = threading.local()


def workers() -> int:
    """Threads used for large evaluations: ``DROPRIG_THREADS`` if set (1 = serial),
    else the cores this process may use, at most 8."""
    env = os.environ.get("DROPRIG_THREADS", "").strip()
    if env:
        try:
            return max(1, int(env))
        except ValueError:
            pass
    try:
        n = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        n = os.cpu_count() or 1
    return max(1, min(n, 8))


def _pool(n: int) -> ThreadPoolExecutor:
    global _POOL, _POOL_SIZE
    with _POOL_LOCK:
        if _POOL is None or _POOL_SIZE != n:
            if _POOL is not None:
                _POOL.shutdown(wait=False)
            _POOL = ThreadPoolExecutor(max_workers=n, thread_name_prefix="droprig-block")
            _POOL_SIZE = n
        return _POOL


def for_blocks(fn: Callable[[int, int], None], n: int, block: int) -> None:
    """Call ``fn(start, stop)`` for consecutive blocks of ``range(n)`` of ``block``
    items, on :func:`workers` threads when there are enough blocks. ``fn`` must only
    write its own rows; the first exception raised by any block is re-raised here.
    Calls made from inside a block run serially (no nested pools)."""
    starts = range(0, n, block)
    nw = workers()
    if nw == 1 or len(starts) < MIN_PARALLEL_BLOCKS or getattr(_LOCAL, "inside", False):
        for s in starts:
            cancel.check()
            fn(s, min(s + block, n))
        return

    def run(s: int) -> None:
        cancel.check()  # a cancelled analysis stops between blocks (solver/cancel.py)
        _LOCAL.inside = True
        try:
            fn(s, min(s + block, n))
        finally:
            _LOCAL.inside = False

    # each block runs in a copy of the caller's context, so np.errstate and the like
    # hold in the worker threads as they do here
    pool = _pool(nw)
    futures = [pool.submit(contextvars.copy_context().run, run, s) for s in starts]
    for f in futures:
        f.result()

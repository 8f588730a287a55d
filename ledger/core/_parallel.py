"""Sharing a range of points or cases between threads.

The compiled kernels (:mod:`ledger.core._jit`) and numpy's loops release the GIL, so a range
split in whole grains runs on several cores. One pool serves the process: starting threads on
every call costs a few percent of a million-case sweep. The calling thread runs the first share
itself.
"""

from __future__ import annotations

import os
from functools import lru_cache

from ledger.errors import InputError

__all__ = ["cores", "thread_count", "split"]


def cores() -> int:
    """The cores this process may use."""
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:              # not on every platform
        return os.cpu_count() or 1


@lru_cache(maxsize=1)
def _pool():
    # Imported here: concurrent.futures costs the CLI about 5 ms on every command that
    # imports the envelope module, and only large sweeps use the pool.
    from concurrent.futures import ThreadPoolExecutor

    return ThreadPoolExecutor(max_workers=max(1, cores() - 1), thread_name_prefix="ledger")


if hasattr(os, "register_at_fork"):     # a forked child has none of the pool's threads
    os.register_at_fork(after_in_child=_pool.cache_clear)


def thread_count(threads, n: int, grain: int) -> int:
    """Threads for ``n`` items: ``threads`` (None: the cores), at most the cores and one per
    ``grain`` items; raises InputError unless ``threads`` is None or a whole number, 1 or more."""
    if threads is not None:
        try:
            value = int(threads)
        except (TypeError, ValueError):
            value = 0
        if value != threads or value < 1:
            raise InputError("threads", threads, "a whole number of threads, 1 or more")
    limit = cores() if threads is None else min(value, cores())
    return max(1, min(limit, -(-n // grain)))


def split(run, n: int, k: int, grain: int) -> list:
    """``[run(lo, hi), ...]`` over ``0:n`` in ``k`` shares of whole grains, in order."""
    if k <= 1 or n <= grain:
        return [run(0, n)]
    grains = -(-n // grain)                              # ceil(n / grain)
    per = -(-grains // k) * grain                        # whole grains per share
    bounds = [(lo, min(n, lo + per)) for lo in range(0, n, per)]
    futures = [_pool().submit(run, lo, hi) for lo, hi in bounds[1:]]
    return [run(*bounds[0])] + [f.result() for f in futures]

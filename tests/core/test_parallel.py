"""Sharing a range between threads (ledger.core._parallel): every index once, in order, in
whole grains; a bad thread count named; a forked child can still share work (common practice
for a thread pool that outlives a fork)."""

from __future__ import annotations

import os
import time

import numpy as np
import pytest

from ledger.core._parallel import cores, split, thread_count
from ledger.errors import InputError


@pytest.mark.parametrize("n", [0, 1, 9, 10, 11, 25, 100, 101])
@pytest.mark.parametrize("k", [1, 2, 3, 8])
def test_split_covers_every_index_once_in_order_in_whole_grains(n, k):
    parts = split(lambda lo, hi: (lo, hi), n, k, 10)
    assert parts[0][0] == 0 and parts[-1][1] == n
    assert all(a[1] == b[0] for a, b in zip(parts, parts[1:]))      # contiguous, in order
    assert all(lo % 10 == 0 for lo, _ in parts)                     # whole grains
    assert len(parts) <= max(1, k)


def test_thread_count_limits_and_refusals():
    assert thread_count(None, 1, 10) == 1
    assert thread_count(None, 10**6, 10) == cores()
    assert thread_count(64, 10**6, 10) == cores()
    assert thread_count(1, 10**6, 10) == 1
    for bad in (0, -1, 1.5, "two", "2"):
        with pytest.raises(InputError) as err:
            thread_count(bad, 100, 10)
        assert str(err.value).startswith(f"threads = {bad!r}")


@pytest.mark.skipif(not hasattr(os, "fork"), reason="no fork on this platform")
def test_a_forked_child_can_still_share_work():
    # The pool's threads do not survive a fork: the child must get a new pool, not wait for
    # threads it does not have.
    split(lambda lo, hi: np.arange(lo, hi).sum(), 100, 2, 10)     # the parent's pool exists
    pid = os.fork()
    if pid == 0:                                                    # the child
        ok = sum(split(lambda lo, hi: int(np.arange(lo, hi).sum()), 100, 2, 10)) == 4950
        os._exit(0 if ok else 3)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        done, status = os.waitpid(pid, os.WNOHANG)
        if done:
            assert os.waitstatus_to_exitcode(status) == 0
            return
        time.sleep(0.05)
    os.kill(pid, 9)
    os.waitpid(pid, 0)
    pytest.fail("the forked child is still waiting for the pool after 30 s")

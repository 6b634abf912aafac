"""BLAS thread cap for small dense problems.

On a 2-core machine, OpenBLAS threads on small matrices can run a hundred
times slower when another process keeps a core busy; one thread is as fast on
an idle machine for these sizes. Compute functions wrap their dense algebra in
:func:`blas_threads_for` so small problems run single-threaded.
"""

from __future__ import annotations

import contextlib
from collections.abc import Iterator

from threadpoolctl import ThreadpoolController

__all__ = ["SMALL_PROBLEM_SIZE", "blas_threads_for"]

# Below this matrix order one BLAS thread is at least as fast (measured with
# benchmarks/receptance_speed.py on 2 cores).
SMALL_PROBLEM_SIZE = 300

_controller: ThreadpoolController | None = None


@contextlib.contextmanager
def blas_threads_for(order: int) -> Iterator[None]:
    """Run the block with one BLAS thread when the matrix order is small.

    Parameters
    ----------
    order : int
        Size of the dense problem about to be solved.

    Returns
    -------
    context manager
        Inside it, BLAS runs on one thread when ``order`` is small.

    Raises
    ------
    Nothing
        Without threadpoolctl's support the limit is simply not applied.
    """
    global _controller
    if order >= SMALL_PROBLEM_SIZE:
        yield
        return
    if _controller is None:
        _controller = ThreadpoolController()
    with _controller.limit(limits=1, user_api="blas"):
        yield

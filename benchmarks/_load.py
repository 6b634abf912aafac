"""A second process that keeps one core busy while a benchmark measures "under load"."""

from __future__ import annotations

import contextlib
import multiprocessing
import time
from collections.abc import Iterator


def _burn(stop) -> None:
    x = 0
    while not stop.is_set():
        x = (x * 31 + 7) % 1000003


@contextlib.contextmanager
def one_core_busy() -> Iterator[None]:
    """Run the block while another process spins on one core."""
    stop = multiprocessing.Event()
    burner = multiprocessing.Process(target=_burn, args=(stop,), daemon=True)
    burner.start()
    try:
        time.sleep(0.5)
        yield
    finally:
        stop.set()
        burner.join(5)

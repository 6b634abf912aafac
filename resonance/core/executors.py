"""Where independent pieces of work run: this process, local worker processes, or a Dask cluster.

Uncertainty studies (chunks of variants) and fleets (scenario files) are lists of independent items mapped
through a module-level function. An executor runs them and returns the results in the items' order, so a
result never depends on where it ran; seeds are drawn before the work is split.

* :class:`SerialExecutor`: in this process (the default for small work and for tests);
* :class:`ProcessExecutor`: local worker processes (:class:`concurrent.futures.ProcessPoolExecutor`);
* :class:`DaskExecutor`: a ``dask.distributed`` cluster, from a scheduler address (``tcp://host:8786``) or a
  ``Client`` already open in a notebook; the way to go past one machine. Dask is optional
  (``pip install "resonance[cluster]"``).
"""

from __future__ import annotations

import contextlib
import os
import re
from collections.abc import Callable, Iterator, Sequence
from concurrent.futures import ProcessPoolExecutor, as_completed
from typing import Any, Protocol

from .errors import InputValueError

__all__ = [
    "MAX_WORKERS",
    "DaskExecutor",
    "Executor",
    "ProcessExecutor",
    "SerialExecutor",
    "executor_for",
    "progress_bar",
]


class Executor(Protocol):
    """Runs ``function(item)`` for every item and returns the results in the items' order."""

    def map(
        self, function: Callable[[Any], Any], items: Sequence[Any], done: Callable[[], None] | None = None
    ) -> list[Any]:
        """Run every item; call ``done()`` as each finishes."""


#: The most local worker processes this tool starts (each imports numpy and scipy: about 100 MB apiece).
MAX_WORKERS = 64


class SerialExecutor:
    """Every item in this process, one after the other."""

    def map(
        self, function: Callable[[Any], Any], items: Sequence[Any], done: Callable[[], None] | None = None
    ) -> list[Any]:
        """Run every item here (see :class:`Executor`)."""
        out = []
        for item in items:
            out.append(function(item))
            if done is not None:
                done()
        return out


class ProcessExecutor:
    """Local worker processes.

    Parameters
    ----------
    workers : int
        Number of processes (>= 1; 1 runs in this process).
    """

    def __init__(self, workers: int):
        if not (isinstance(workers, int) and workers >= 1):
            raise InputValueError(f"workers: got {workers!r}; expected a whole number >= 1")
        self.workers = workers

    def map(
        self, function: Callable[[Any], Any], items: Sequence[Any], done: Callable[[], None] | None = None
    ) -> list[Any]:
        """Run every item in the worker processes (see :class:`Executor`)."""
        if self.workers == 1 or len(items) <= 1:
            return SerialExecutor().map(function, items, done)
        out: list[Any] = [None] * len(items)
        # Each worker uses one BLAS thread: the processes share the cores.
        with ProcessPoolExecutor(self.workers, initializer=_one_blas_thread) as pool:
            futures = {pool.submit(function, item): i for i, item in enumerate(items)}
            for future in as_completed(futures):
                out[futures[future]] = future.result()
                if done is not None:
                    done()
        return out


def _one_blas_thread() -> None:
    from threadpoolctl import threadpool_limits

    threadpool_limits(1)


class DaskExecutor:
    """A ``dask.distributed`` cluster.

    Parameters
    ----------
    client : str or distributed.Client
        A scheduler address (``"tcp://10.0.0.5:8786"``) or an open ``Client``.
    """

    def __init__(self, client: Any):
        try:
            from distributed import Client
        except ImportError:  # pragma: no cover - depends on the installation
            raise InputValueError(
                "scheduler: dask.distributed is not installed; install it with pip install 'resonance[cluster]'"
            ) from None
        if isinstance(client, Client):
            self.client = client
        elif isinstance(client, str) and client:
            if not re.fullmatch(r"(tcp|tls|inproc|ucx)://[^\s:/]+:\d{1,5}", client):
                raise InputValueError(
                    f"scheduler: got {client!r}; expected an address with its port, like tcp://127.0.0.1:8786"
                )
            try:
                self.client = Client(client, timeout="10s")
            except (OSError, TimeoutError, ValueError) as error:
                raise InputValueError(f"scheduler: cannot reach {client!r} ({error})") from None
        else:
            raise InputValueError(f"scheduler: got {client!r}; expected an address like tcp://host:8786 or a Client")

    def map(
        self, function: Callable[[Any], Any], items: Sequence[Any], done: Callable[[], None] | None = None
    ) -> list[Any]:
        """Run every item on the cluster (see :class:`Executor`)."""
        from distributed import as_completed as finished

        futures = self.client.map(function, list(items), pure=False)
        for _ in finished(futures):
            if done is not None:
                done()
        return list(self.client.gather(futures))


def executor_for(where: Any = None) -> Executor:
    """The executor for a choice: None (this process), a number of local workers, an address or a Client.

    Parameters
    ----------
    where : None, int, str or distributed.Client
        None or 1: this process; an int > 1: that many local processes (0: one per core); a scheduler address
        or a ``Client``: that Dask cluster.

    Returns
    -------
    Executor

    Raises
    ------
    InputValueError
        A negative number of workers, an unreachable scheduler, Dask not installed.
    """
    if where is None:
        return SerialExecutor()
    if isinstance(where, int) and not isinstance(where, bool):
        cores = os.cpu_count() or 1
        if not 0 <= where <= MAX_WORKERS:
            raise InputValueError(
                f"workers: got {where}; expected 0 (one per core, {cores} here) to {MAX_WORKERS} local processes "
                "(a larger cluster: --scheduler)"
            )
        return ProcessExecutor(where or cores)
    return DaskExecutor(where)


@contextlib.contextmanager
def progress_bar(total: int, description: str, enabled: bool = True) -> Iterator[Callable[[], None]]:
    """A progress bar (tqdm: text in a terminal, an ipywidgets bar in a notebook) and its tick.

    Parameters
    ----------
    total : int
        Number of pieces of work.
    description : str
        Its label.
    enabled : bool
        False: no bar (the tick does nothing).

    Returns
    -------
    contextlib.AbstractContextManager
        Yields a callable: call it once per finished piece.

    Raises
    ------
    Nothing
        Display only.
    """
    if not enabled:
        yield lambda: None
        return
    from tqdm.auto import tqdm

    with tqdm(total=total, desc=description, unit="piece") as bar:
        yield lambda: bar.update(1)

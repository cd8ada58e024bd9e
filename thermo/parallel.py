"""Independent jobs on several workers: this process, a local process pool, or any executor.

:func:`run_jobs` hands chunks of jobs to a :class:`concurrent.futures.Executor`
(a process or thread pool, a Dask distributed client's
``Client.get_executor()``, or any other implementation of the interface) and
returns the results in job order.  A chunk whose worker is lost (a broken
process pool, a killed Dask worker, a cancelled future) gives each of its jobs
the result of ``lost(job, reason)``; the other chunks go on.

:func:`scheduler_executor` connects to a running Dask scheduler; Dask is an
optional dependency (``pip install 'modeheat[cluster]'``), imported only here.

The job function must be a module-level function (executors pickle it by
reference) and every worker must be able to import :mod:`thermo`; for a
cluster, input and output paths must be on storage the workers share.

Examples
--------
>>> from concurrent.futures import ThreadPoolExecutor
>>> with ThreadPoolExecutor(2) as pool:
...     run_jobs(abs, [-3, 2, -1], executor=pool)
[3, 2, 1]
"""

from __future__ import annotations

import contextlib
import os

from .errors import OptionError

#: Most jobs handed to a worker at once (fewer when there are few jobs per worker).
MAX_CHUNK = 16
#: Seconds to wait for a Dask scheduler to answer.
CONNECT_TIMEOUT_S = 10


def chunks(jobs, workers):
    """Jobs in consecutive groups: about four groups per worker, at most :data:`MAX_CHUNK` jobs each.

    Examples
    --------
    >>> [len(c) for c in chunks(list(range(10)), 2)]
    [1, 1, 1, 1, 1, 1, 1, 1, 1, 1]
    >>> [len(c) for c in chunks(list(range(100)), 2)]
    [12, 12, 12, 12, 12, 12, 12, 12, 4]
    """
    size = max(1, min(MAX_CHUNK, len(jobs) // (4 * max(1, workers))))
    return [jobs[i:i + size] for i in range(0, len(jobs), size)]


def _call_chunk(function, chunk, args):
    """Run ``function(*job, *args)`` for each job of a chunk (in the worker)."""
    return [function(*(job if isinstance(job, tuple) else (job,)), *args) for job in chunk]


def _one_line(exc):
    return " ".join(f"{type(exc).__name__}: {exc}".split())


def run_jobs(function, jobs, args=(), executor=None, workers=None, lost=None, done=None):
    """``[function(*job, *args) for job in jobs]``, spread over workers.

    Parameters
    ----------
    function : callable
        Module-level function run for each job; it should not raise (a job
        reports its own failure in its result).
    jobs : sequence
        One tuple of arguments (or a single argument) per job.
    args : tuple
        Arguments appended to every call (sent once per chunk).
    executor : concurrent.futures.Executor, optional
        Where chunks run; the caller keeps it open and shuts it down.  When
        None, a local process pool of ``workers`` processes is used (started
        here, closed at the end), or this process when ``workers`` is 1 or
        there is one job.
    workers : int, optional
        Worker count (default ``os.cpu_count()``); also sizes the chunks
        handed to a given ``executor``.
    lost : callable, optional
        ``lost(job, reason)`` -> the result of a job whose chunk raised in
        the executor (worker lost, future cancelled); default: re-raise.
    done : callable, optional
        Called with the number of jobs finished each time a chunk ends
        (progress display).

    Returns
    -------
    list
        One result per job, in job order.
    """
    jobs = list(jobs)
    workers = max(1, int(workers or os.cpu_count() or 1))
    if executor is None and (workers == 1 or len(jobs) <= 1):
        results = []
        for job in jobs:
            results.append(_call_chunk(function, [job], args)[0])
            if done is not None:
                done(1)
        return results
    if executor is None:
        from concurrent.futures import ProcessPoolExecutor
        with ProcessPoolExecutor(max_workers=min(workers, len(jobs))) as pool:
            return _gathered(pool, function, jobs, args, workers, lost, done)
    return _gathered(executor, function, jobs, args, workers, lost, done)


def _gathered(executor, function, jobs, args, workers, lost, done):
    from concurrent.futures import as_completed

    parts = chunks(jobs, workers)
    futures = {executor.submit(_call_chunk, function, part, args): k for k, part in enumerate(parts)}
    results = [None] * len(parts)
    for future in as_completed(futures):
        k = futures[future]
        try:
            results[k] = future.result()
        except Exception as exc:  # noqa: BLE001 - a lost worker fails its own jobs only
            if lost is None:
                raise
            results[k] = [lost(job, _one_line(exc)) for job in parts[k]]
        if done is not None:
            done(len(parts[k]))
    return [row for part in results for row in part]


@contextlib.contextmanager
def scheduler_executor(address, timeout=CONNECT_TIMEOUT_S):
    """An executor on a running Dask scheduler, open for the ``with`` block.

    Parameters
    ----------
    address : str
        Scheduler address, e.g. ``tcp://10.0.0.5:8786``.
    timeout : float
        Seconds to wait for the connection [s].

    Yields
    ------
    concurrent.futures.Executor
        ``Client.get_executor(pure=False)`` of a client connected to the
        scheduler (closed when the block ends).

    Raises
    ------
    OptionError
        Dask's ``distributed`` package is not installed, or the scheduler
        cannot be reached (one line with the reason).
    """
    try:
        from distributed import Client
    except ImportError:
        raise OptionError("a Dask scheduler needs the 'distributed' package; install it with "
                          "pip install 'modeheat[cluster]'") from None
    try:
        client = Client(address, timeout=timeout, set_as_default=False)
    except Exception as exc:  # noqa: BLE001 - OSError, TimeoutError, ValueError for a bad address ...
        raise OptionError(f"cannot connect to the Dask scheduler at {address!r}: {_one_line(exc)}") from None
    try:
        yield client.get_executor(pure=False)
    finally:
        client.close()

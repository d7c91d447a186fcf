"""Where the points of a sweep are solved: this process, local worker processes, or a Dask cluster.

All three run the same pure task function (the core's ``solve_task``, passed in) on the same
tasks and put results back in grid order, so the figures are identical whichever runs them;
only the time differs.
"""

from __future__ import annotations

import os
import re
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass

from oddsbench.model import budget
from oddsbench.model.errors import OddsbenchError
from oddsbench.solve.detached import die_with_parent
from oddsbench.sweep.points import Point, PointResult, PointTask, chunked, grid_points
from oddsbench.sweep.spec import SweepSpec

Progress = Callable[[int, int], None]
SolveTask = Callable[[PointTask], list[PointResult]]  # a module-level function, so processes can pickle it
CLUSTER_ADDRESS = re.compile(r"^((tcp|tls|ws|wss|ucx)://)?(\[[0-9A-Fa-f:.]+\]|[A-Za-z0-9_.-]+)(:[0-9]{1,5})?/?$")
TASKS_PER_WORKER = 8
CONNECT_SECONDS = 10  # to reach the scheduler, and again for it to have a worker
POLL_SECONDS = 0.1
GRACE_SECONDS = 2
REACHED, NO_WORKERS = "reached", "no workers"


@dataclass(frozen=True)
class SweepResult:
    spec: SweepSpec
    points: tuple[Point, ...]
    results: tuple[PointResult, ...]
    runner: str
    seconds: float

    @property
    def errors(self) -> tuple[PointResult, ...]:
        return tuple(r for r in self.results if r.error is not None)


def default_workers() -> int:
    return max(1, len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count() or 1)


def run_sweep(
    spec: SweepSpec,
    solve_task: SolveTask,
    workers: int | None = None,
    cluster: str | None = None,
    progress: Progress | None = None,
) -> SweepResult:
    """Solve every grid point with ``solve_task``; ``cluster`` is a Dask scheduler address such as
    tcp://10.0.0.5:8786."""
    began = time.perf_counter()
    points = grid_points(spec)
    report = progress or (lambda done, total: None)
    if cluster is not None:
        results, runner = _on_cluster(spec, points, cluster, report, solve_task)
    else:
        count = min(workers or default_workers(), len(points))
        if count <= 1:
            results, runner = _here(spec, points, report, solve_task), "this process"
        else:
            results, runner = _on_processes(spec, points, count, report, solve_task), f"{count} local processes"
    ordered = tuple(sorted(results, key=lambda r: r.index))
    if [r.index for r in ordered] != [p.index for p in points]:
        raise OddsbenchError("sweep: some points came back missing or twice; run again")
    return SweepResult(spec, tuple(points), ordered, runner, time.perf_counter() - began)


def _here(spec: SweepSpec, points: list[Point], report: Progress, solve_task: SolveTask) -> list[PointResult]:
    results: list[PointResult] = []
    for task in chunked(spec, points, max(1, len(points) // 10)):
        budget.check("the sweep")
        results.extend(solve_task(task))
        report(len(results), len(points))
    return results


def _on_processes(
    spec: SweepSpec, points: list[Point], workers: int, report: Progress, solve_task: SolveTask
) -> list[PointResult]:
    """Tasks on a pool of forked workers. The workers ignore Ctrl-C and die with this process; any
    stop here (Ctrl-C, SIGTERM, the work budget's deadline, a failed task) ends them at once
    (``Pool.terminate``): no worker outlives the command."""
    import multiprocessing

    tasks = chunked(spec, points, workers * TASKS_PER_WORKER)
    results: list[PointResult] = []
    context = multiprocessing.get_context("fork")
    pool = context.Pool(workers, initializer=_worker_start)
    try:
        answers = pool.imap_unordered(solve_task, tasks)
        finished = 0
        while finished < len(tasks):
            try:
                found = answers.next(timeout=POLL_SECONDS)
            except multiprocessing.TimeoutError:
                budget.check("the sweep")
                continue
            finished += 1
            results.extend(found)
            report(len(results), len(points))
        pool.close()
    except BaseException:
        pool.terminate()
        raise
    finally:
        pool.join()
    return results


def _worker_start() -> None:
    """A sweep worker: Ctrl-C is for the command to handle; the worker dies with it."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    die_with_parent()


def _on_cluster(
    spec: SweepSpec, points: list[Point], address: str, report: Progress, solve_task: SolveTask
) -> tuple[list[PointResult], str]:
    try:
        from distributed import Client
        from distributed import as_completed as cluster_completed
    except ImportError:
        raise OddsbenchError(
            "--cluster needs dask.distributed: install it with pip install 'oddsbench[cluster]'"
        ) from None
    if not CLUSTER_ADDRESS.match(address):
        raise OddsbenchError(
            f"--cluster {address!r}: expected a scheduler address such as tcp://10.0.0.5:8786 "
            "(schemes tcp, tls, ws, wss, ucx)"
        )
    with _quiet_dask():
        client = _connect(Client, address)
        try:
            return _run_on(client, spec, points, address, report, solve_task, cluster_completed)
        finally:
            client.close()


def _run_on(
    client, spec: SweepSpec, points: list[Point], address: str, report: Progress, solve_task: SolveTask, completed
) -> tuple[list[PointResult], str]:
    """Every task on the connected cluster, results as they come (``completed``: dask's ``as_completed``)."""
    results: list[PointResult] = []
    threads = sum(client.nthreads().values()) or 1
    tasks: list[PointTask] = chunked(spec, points, threads * TASKS_PER_WORKER)
    futures = client.map(solve_task, tasks, pure=False)
    for future in completed(futures, loop=client.loop):
        try:
            results.extend(future.result())
        except Exception as error:  # a worker without oddsbench, or one that died
            raise OddsbenchError(
                f"a cluster worker failed: {type(error).__name__}: {error} "
                "(is oddsbench installed, at this version, on every worker?)"
            ) from None
        report(len(results), len(points))
        budget.check("the sweep")
    workers = len(client.scheduler_info().get("workers", {}))
    return results, f"Dask cluster {address} ({workers} workers, {threads} threads)"


@contextmanager
def _quiet_dask() -> Iterator[None]:
    """dask.distributed logs connection failures with tracebacks; the sweep reports them in one line."""
    import logging

    logger = logging.getLogger("distributed")
    level = logger.level
    logger.setLevel(logging.CRITICAL + 1)
    try:
        yield
    finally:
        logger.setLevel(level)


def _connect(client_class, address: str):
    """A client of a scheduler at ``address`` that has a worker, or one line saying why not, within
    ``CONNECT_SECONDS`` for each step: something listens there, it speaks Dask, it has a worker.
    The last two are tried first in a detached child (``solve/detached.py``): a server that accepts
    and then says nothing, or answers in another protocol, or a half-made client that waits for ever
    to close, is killed with the child and never holds the command."""
    from oddsbench.solve.detached import run_detached

    if not _answers(address, CONNECT_SECONDS):
        raise OddsbenchError(
            f"cannot reach a Dask scheduler at {address!r}: nothing accepts connections there "
            f"(refused, or no answer within {CONNECT_SECONDS} s)"
        )
    for step in (REACHED, NO_WORKERS):
        try:
            verdict = run_detached(
                _probe, (client_class, address, step), "the Dask scheduler", seconds=CONNECT_SECONDS + GRACE_SECONDS
            )
        except OddsbenchError:
            verdict = f"no answer within {CONNECT_SECONDS} s" if step == REACHED else NO_WORKERS
        if verdict == NO_WORKERS:
            raise OddsbenchError(
                f"the Dask scheduler at {address!r} has no workers (none joined within {CONNECT_SECONDS} s): "
                "start some with `dask worker ADDRESS`"
            )
        if verdict != REACHED:
            raise OddsbenchError(f"cannot reach a Dask scheduler at {address!r}: {verdict}")
    try:
        return client_class(address, timeout=f"{CONNECT_SECONDS}s", set_as_default=False)
    except (OSError, TimeoutError, ValueError) as error:
        raise OddsbenchError(f"cannot reach a Dask scheduler at {address!r}: {error}") from None


def _probe(client_class, address: str, step: str) -> str:
    """In a detached child: ``REACHED`` when the step passes (a client connects; with ``NO_WORKERS``,
    a worker is there too), else ``NO_WORKERS`` or why the scheduler cannot be reached."""
    try:
        client = client_class(address, timeout=f"{CONNECT_SECONDS}s", set_as_default=False)
    except BaseException as error:  # noqa: BLE001 - any failure becomes the reason
        reason = " ".join(str(error).split())[:160] or type(error).__name__
        if isinstance(error, (MemoryError, TimeoutError)) or "timed out" in reason.lower():
            return "the server answered, but not as a Dask scheduler"
        return reason
    if step == NO_WORKERS:
        try:
            client.wait_for_workers(1, timeout=CONNECT_SECONDS)
        except (TimeoutError, OSError):
            return NO_WORKERS
    return REACHED


def _answers(address: str, seconds: float) -> bool:
    """Whether something accepts connections at the address (a server, if not a scheduler)."""
    import socket
    from urllib.parse import urlsplit

    parts = urlsplit(address if "://" in address else f"tcp://{address}")
    try:
        with socket.create_connection((parts.hostname, parts.port or 8786), timeout=seconds):
            return True
    except (OSError, ValueError):
        return False

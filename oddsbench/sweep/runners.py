"""Where the points of a sweep are solved: this process, local worker processes, or a Dask cluster.

All three run the same pure task function (the core's ``solve_task``, passed in) on the same
tasks and put results back in grid order, so the figures are identical whichever runs them;
only the time differs.
"""

from __future__ import annotations

import os
import re
import time
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError
from oddsbench.sweep.points import Point, PointResult, PointTask, chunked, grid_points
from oddsbench.sweep.spec import SweepSpec

Progress = Callable[[int, int], None]
SolveTask = Callable[[PointTask], list[PointResult]]  # a module-level function, so processes can pickle it
CLUSTER_ADDRESS = re.compile(r"^((tcp|tls|ws|wss|ucx)://)?(\[[0-9A-Fa-f:.]+\]|[A-Za-z0-9_.-]+)(:[0-9]{1,5})?/?$")
TASKS_PER_WORKER = 8
CONNECT_TIMEOUT = "10s"


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
        results.extend(solve_task(task))
        report(len(results), len(points))
    return results


def _on_processes(
    spec: SweepSpec, points: list[Point], workers: int, report: Progress, solve_task: SolveTask
) -> list[PointResult]:
    tasks = chunked(spec, points, workers * TASKS_PER_WORKER)
    results: list[PointResult] = []
    with ProcessPoolExecutor(max_workers=workers) as pool:
        futures = [pool.submit(solve_task, task) for task in tasks]
        try:
            for future in as_completed(futures):
                results.extend(future.result())
                report(len(results), len(points))
        except BaseException:
            for future in futures:
                future.cancel()
            raise
    return results


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
    try:
        client = Client(address, timeout=CONNECT_TIMEOUT, set_as_default=False)
    except (OSError, TimeoutError, ValueError) as error:
        raise OddsbenchError(f"cannot reach the Dask scheduler at {address!r}: {error}") from None
    results: list[PointResult] = []
    try:
        threads = sum(client.nthreads().values()) or 1
        tasks: list[PointTask] = chunked(spec, points, threads * TASKS_PER_WORKER)
        futures = client.map(solve_task, tasks, pure=False)
        for future in cluster_completed(futures, loop=client.loop):
            try:
                results.extend(future.result())
            except Exception as error:  # a worker without oddsbench, or one that died
                raise OddsbenchError(
                    f"a cluster worker failed: {type(error).__name__}: {error} "
                    "(is oddsbench installed, at this version, on every worker?)"
                ) from None
            report(len(results), len(points))
        workers = len(client.scheduler_info().get("workers", {}))
    finally:
        client.close()
    return results, f"Dask cluster {address} ({workers} workers, {threads} threads)"

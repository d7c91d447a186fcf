"""The points of a sweep, the tasks that carry them and the results that come back.

A task carries the ruleset text and exact values as text, so it pickles small and a worker on
another machine needs oddsbench installed but not the files. Results are exact text plus the
decimal, identical on local processes and on a cluster. The function that solves a task is the
core's (``core.sweeps.solve_task``), handed to the runners: this layer does not solve.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from oddsbench.model.figure import all_exact
from oddsbench.model.numbers import text
from oddsbench.sweep.spec import SweepSpec


@dataclass(frozen=True)
class Point:
    """One grid point: ``settings`` as shown (axis label -> value text), inputs for the solve."""

    index: int
    settings: tuple[tuple[str, str], ...]
    params: tuple[tuple[str, str], ...] = ()
    strategy: str | None = None
    session: tuple[tuple[str, str], ...] = ()
    plan: str | None = None


@dataclass(frozen=True)
class PointTask:
    ruleset_text: str
    source: str
    exact_limit: int
    points: tuple[Point, ...]


@dataclass(frozen=True)
class PointResult:
    """Figures of one point as (name, exact text or None, decimal); ``error`` a one-line reason."""

    index: int
    figures: tuple[tuple[str, str | None, float], ...] = ()
    notes: tuple[str, ...] = ()
    error: str | None = None

    @property
    def exact(self) -> bool:
        return self.error is None and all_exact((name, exact) for name, exact, _ in self.figures)


def grid_points(spec: SweepSpec) -> list[Point]:
    """Every combination of axis values, first axis slowest."""
    points = []
    for index, combo in enumerate(itertools.product(*(axis.values for axis in spec.axes))):
        settings, params, session, strategy, plan = [], [], [], None, None
        for axis, value in zip(spec.axes, combo):
            settings.append((axis.label, axis.shown(value)))
            if axis.kind == "param":
                params.append((axis.name, text(value)))
            elif axis.kind == "session":
                session.append((axis.name, axis.shown(value)))
            elif axis.kind == "strategy":
                strategy = value
            elif axis.kind == "plan":
                plan = value
        points.append(Point(index, tuple(settings), tuple(params), strategy, tuple(session), plan))
    return points


def chunked(spec: SweepSpec, points: list[Point], chunks: int) -> list[PointTask]:
    """Split the points into about ``chunks`` tasks of neighbouring points."""
    size = max(1, -(-len(points) // max(chunks, 1)))
    return [
        PointTask(spec.ruleset_text, spec.ruleset_path.name, spec.exact_limit, tuple(points[i : i + size]))
        for i in range(0, len(points), size)
    ]

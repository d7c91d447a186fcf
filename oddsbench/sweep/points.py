"""The points of a sweep and the pure function that solves them, wherever it runs.

A task carries the ruleset text and exact values as text, so it pickles small and a worker on
another machine needs oddsbench installed but not the files. Results are exact text plus the
decimal, identical on local processes and on a cluster.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError, RulesetError
from oddsbench.model.numbers import parse_fraction, text
from oddsbench.sweep.spec import SweepSpec


@dataclass(frozen=True)
class Point:
    """One grid point: ``settings`` as shown (axis label -> value text), inputs for the solve."""

    index: int
    settings: tuple[tuple[str, str], ...]
    params: tuple[tuple[str, str], ...] = ()
    strategy: str | None = None


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
        return self.error is None and all(exact is not None for _, exact, _ in self.figures)


def grid_points(spec: SweepSpec) -> list[Point]:
    """Every combination of axis values, first axis slowest."""
    points = []
    for index, combo in enumerate(itertools.product(*(axis.values for axis in spec.axes))):
        settings, params, strategy = [], [], None
        for axis, value in zip(spec.axes, combo):
            settings.append((axis.label, axis.shown(value)))
            if axis.kind == "param":
                params.append((axis.name, text(value)))
            elif axis.kind == "strategy":
                strategy = value
        points.append(Point(index, tuple(settings), tuple(params), strategy))
    return points


def chunked(spec: SweepSpec, points: list[Point], chunks: int) -> list[PointTask]:
    """Split the points into about ``chunks`` tasks of neighbouring points."""
    size = max(1, -(-len(points) // max(chunks, 1)))
    return [
        PointTask(spec.ruleset_text, spec.ruleset_path.name, spec.exact_limit, tuple(points[i : i + size]))
        for i in range(0, len(points), size)
    ]


def solve_point(ruleset_text: str, source: str, exact_limit: int, point: Point) -> PointResult:
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset_text
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.compare import named_strategy, strategy_policy

    try:
        overrides = {name: parse_fraction(value) for name, value in point.params}
        ruleset = load_ruleset_text(ruleset_text, source, overrides)
        policy = strategy_policy(ruleset, named_strategy(ruleset, point.strategy)) if point.strategy else {}
        chain = build_round_chain(ruleset, policy)
        figures = solve_round(chain, exact_limit=exact_limit)
    except RulesetError as error:
        return PointResult(point.index, error="; ".join(str(p) for p in error.errors or error.problems))
    except OddsbenchError as error:
        return PointResult(point.index, error=str(error))
    rows = [(name, _text(f.exact), f.decimal) for name, f in figures.figures.items()]
    rows += [(f"end_probability[{name}]", _text(f.exact), f.decimal) for name, f in figures.end_probability.items()]
    rows += [
        (f"result_probability[{name}]", _text(f.exact), f.decimal) for name, f in figures.result_probability.items()
    ]
    return PointResult(point.index, tuple(rows), figures.notes)


def _text(value) -> str | None:
    return None if value is None else text(value)


def solve_task(task: PointTask) -> list[PointResult]:
    """Solve every point of a task in order: the unit of work sent to a process or a worker."""
    return [solve_point(task.ruleset_text, task.source, task.exact_limit, point) for point in task.points]

"""Sweeps: the solve of one grid point, and the orchestration that hands it to a runner.

The layer below (``sweep/``) reads the spec, builds the grid and runs tasks on this process, local
processes or a Dask cluster; it takes the per-point function from here (``solve_task``), so the
same core code solves every point wherever it runs.
"""

from __future__ import annotations

import time
from pathlib import Path

from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model.errors import OddsbenchError, RulesetError
from oddsbench.model.numbers import parse_fraction, text
from oddsbench.sweep.points import Point, PointResult, PointTask, grid_points
from oddsbench.sweep.runners import SweepResult
from oddsbench.sweep.spec import SweepSpec

QUICK_SECONDS = 2.0  # a sweep the first points show to take less runs in this process


def read_spec(path: str | Path) -> SweepSpec:
    """Read a sweep spec, its plans checked by the one plan grammar."""
    from oddsbench.strategy.plans import parse_plan
    from oddsbench.sweep.spec import read_sweep_spec

    return read_sweep_spec(path, parse_plan)


def solve_point(ruleset_text: str, source: str, exact_limit: int, point: Point) -> PointResult:
    """Every figure of one point (the ruleset with the point's parameters, strategy and session), as text.

    The point is asked of the core's own questions (``round_figures``, ``sessions``), so a sweep
    assembles no pipeline of its own.
    """
    try:
        figures, session = _point_figures(ruleset_text, source, exact_limit, point)
    except RulesetError as error:
        return PointResult(point.index, error="; ".join(str(p) for p in error.errors or error.problems))
    except OddsbenchError as error:
        return PointResult(point.index, error=str(error))
    rows = [(name, _text(f.exact), f.decimal) for name, f in figures.figures.items()]
    rows += [(f"end_probability[{name}]", _text(f.exact), f.decimal) for name, f in figures.end_probability.items()]
    rows += [
        (f"result_probability[{name}]", _text(f.exact), f.decimal) for name, f in figures.result_probability.items()
    ]
    notes = figures.notes
    if session is not None:
        rows += [(f"session.{name}", _text(f.exact), f.decimal) for name, f in session.figures.items()]
        notes += tuple(f"session: {note}" for note in session.notes)
    return PointResult(point.index, tuple(rows), notes)


def _point_figures(ruleset_text: str, source: str, exact_limit: int, point: Point):
    """(the round's figures, the plan's session figures or None) of one point, from the core's questions."""
    from dataclasses import replace

    from oddsbench.core.game import game_from_text
    from oddsbench.core.rounds import round_figures
    from oddsbench.core.session import sessions
    from oddsbench.core.settings import Settings, session_request

    overrides = {name: parse_fraction(value) for name, value in point.params}
    game = game_from_text(ruleset_text, source, overrides)
    settings = Settings(exact_limit=exact_limit, strategies=(point.strategy,) if point.strategy else ())
    rounds = round_figures(game, settings)
    if len(rounds.columns) > 1:
        raise OddsbenchError(f"{source}: has decision states: add a strategy axis to the sweep ([sweep] strategy)")
    if point.plan is None:
        return rounds.figures[0], None
    given = {name: (int(value) if name == "max_rounds" else value) for name, value in point.session}
    request = session_request(**given, plans=(point.plan,))
    solved = sessions(game, replace(settings, session=request))
    return rounds.figures[0], solved.plans[0].bounded


def _text(value) -> str | None:
    return None if value is None else text(value)


def solve_task(task: PointTask) -> list[PointResult]:
    """Solve every point of a task in order: the unit of work sent to a process or a cluster worker."""
    return [solve_point(task.ruleset_text, task.source, task.exact_limit, point) for point in task.points]


def point_settings(point: Point) -> str:
    """A point's axis values as one line (``pockets=37, payout=35``) for messages."""
    return ", ".join(f"{label}={value}" for label, value in point.settings) or "no axes"


@budgeted
def sweep(spec: SweepSpec, workers: int | None = None, cluster: str | None = None, work: Work = NO_WORK) -> SweepResult:
    """Solve the whole grid: point 0 first (a bad point or an unknown figure is one line before any
    runner starts), then every point on this process, local processes or the cluster.

    ``workers`` None chooses: one per core, or this process alone when the last point shows the
    whole sweep takes under two seconds (starting processes would cost more).
    """
    from oddsbench.sweep.runners import run_sweep

    points = grid_points(spec)
    first = points[0]
    trial = solve_point(spec.ruleset_text, spec.ruleset_path.name, spec.exact_limit, first)
    began = time.perf_counter()  # timed on the last point, after the first has warmed everything up
    solve_point(spec.ruleset_text, spec.ruleset_path.name, spec.exact_limit, points[-1])
    if workers is None and cluster is None and (time.perf_counter() - began) * spec.size < QUICK_SECONDS:
        workers = 1
    if trial.error is not None:
        raise OddsbenchError(f"{spec.source}: point 0 ({point_settings(first)}): {trial.error}")
    known = [name for name, _, _ in trial.figures]
    unknown = [name for name in spec.figures if name not in known]
    if unknown:
        raise OddsbenchError(
            f"{spec.source}: [sweep], figures: unknown {', '.join(map(repr, unknown))} (known: {', '.join(known)})"
        )
    return run_sweep(spec, solve_task, workers=workers, cluster=cluster, progress=work.progress)

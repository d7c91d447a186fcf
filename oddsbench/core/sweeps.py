"""Sweeps: the solve of one grid point, and the orchestration that hands it to a runner.

The layer below (``sweep/``) reads the spec, builds the grid and runs tasks on this process, local
processes or a Dask cluster; it takes the per-point function from here (``solve_task``), so the
same core code solves every point wherever it runs.
"""

from __future__ import annotations

import time
from pathlib import Path
from typing import TYPE_CHECKING

from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model.errors import OddsbenchError, RulesetError
from oddsbench.model.numbers import QQ, parse_fraction, text
from oddsbench.sweep.points import Point, PointResult, PointTask, grid_points
from oddsbench.sweep.runners import SweepResult
from oddsbench.sweep.spec import SweepSpec

if TYPE_CHECKING:
    from oddsbench.core.session import PlanResult
    from oddsbench.strategy.no_goal_play import NoGoalFigures

QUICK_SECONDS = 2.0
NO_GOAL_ROWS = (  # the session figures of play with no goal, as ``_no_goal_rows`` gives them
    "ruin_probability",
    "ruin_probability_lower",
    "ruin_probability_upper",
    "expected_result_per_round",
    "expected_rounds_to_ruin",
)  # a sweep the first points show to take less runs in this process


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
        session_rows, session_notes = _session_rows(session)
        rows += [(f"session.{name}", exact, decimal) for name, exact, decimal in session_rows]
        notes += tuple(f"session: {note}" for note in session_notes)
    return PointResult(point.index, tuple(rows), notes)


def _session_rows(plan: PlanResult) -> tuple[list[tuple[str, str | None, float | None]], tuple[str, ...]]:
    """A plan's session figures as rows: the bounded session's figures, or with no goal the ruin figures."""
    if plan.bounded is not None:
        return [(name, _text(f.exact), f.decimal) for name, f in plan.bounded.figures.items()], plan.bounded.notes
    return _no_goal_rows(plan.no_goal)


def _no_goal_rows(figures: NoGoalFigures) -> tuple[list[tuple[str, str | None, float | None]], tuple[str, ...]]:
    """Play with no goal: the ruin chance (exact where it is rational) between proved exact bounds
    (equal to it when it is exact), the expected result per round and, when finite, the expected
    rounds to ruin; a ruin chance that is not rational is named in a note by its exact form."""
    from oddsbench.core.tune_scan import decimal_rational, last_digit_unit
    from oddsbench.model.numbers import to_float

    ruin, grid = figures.ruin, figures.walk.grid
    notes = list(ruin.notes)
    if ruin.ruin_exact is not None:
        low = high = ruin.ruin_exact
    else:
        # the digits are correct to the last one shown, and the ball's radius is about its own
        # midpoint: the truth lies within one unit of the last digit plus the radius
        middle, radius = decimal_rational(ruin.ruin.text), decimal_rational(ruin.ruin.radius)
        slack = radius + last_digit_unit(ruin.ruin.text)
        low, high = max(middle - slack, QQ(0)), min(middle + slack, QQ(1))
        notes.append(f"ruin chance {ruin.ruin_exact_text} ({ruin.error_bound})")
    chance = ruin.ruin.value if ruin.ruin.value != 0 or low == 0 else None  # below the float range: no 0.0
    if chance is None:
        notes.append(f"ruin chance about 10^{ruin.ruin.log10:.1f}, below the float range")
    per_round = ruin.mean * grid
    rows = [
        ("ruin_probability", _text(ruin.ruin_exact), chance),
        ("ruin_probability_lower", text(low), to_float(low) if chance is not None else None),
        ("ruin_probability_upper", text(high), to_float(high) if chance is not None else None),
        ("expected_result_per_round", text(per_round), to_float(per_round)),
    ]
    rounds = ruin.rounds_to_ruin
    if rounds is not None and rounds.kind == "finite":
        decimal = rounds.decimal.value if rounds.decimal is not None else None
        rows.append(("expected_rounds_to_ruin", _text(rounds.exact), decimal))
    elif rounds is not None:
        notes.append(f"expected rounds to ruin: {rounds.kind} ({rounds.method})")
    return rows, tuple(notes)


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
    return rounds.figures[0], solved.plans[0]


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
    if any(name.startswith("session.") for name in known):  # a plan with no goal may lack a finite figure at point 0
        known += [f"session.{name}" for name in NO_GOAL_ROWS if f"session.{name}" not in known]
    unknown = [name for name in spec.figures if name not in known]
    if unknown:
        raise OddsbenchError(
            f"{spec.source}: [sweep], figures: unknown {', '.join(map(repr, unknown))} (known: {', '.join(known)})"
        )
    return run_sweep(spec, solve_task, workers=workers, cluster=cluster, progress=work.progress)

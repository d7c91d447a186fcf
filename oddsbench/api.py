"""The Python API: oddsbench's figures in scripts and notebooks, the same as the command line's.

Every question takes a loaded game and keyword settings (the names of ``core.Settings`` and of
the session options) and returns the core's frozen result; ``to_dict`` turns any result into the
plain dict that the matching command prints with ``--json``, ``to_text`` into its terminal text.

    import oddsbench

    game = oddsbench.load("rulesets/pass-line.toml")
    rounds = oddsbench.round_figures(game)
    print(rounds.figure("house_edge").exact)           # 7/495
    oddsbench.to_dict(rounds)                           # what `oddsbench solve FILE --json` prints

Figures are mathematics, not advice.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from oddsbench import core
from oddsbench.core import Game, Work, inline_round, make_settings
from oddsbench.core.results import (
    BestResults,
    HorizonResults,
    ReportFigures,
    RoundResults,
    SessionResults,
    Simulation,
    SweepResult,
    TuneResults,
)

# Names chosen not to clash with the subpackages (oddsbench.solve, .report, .simulate, .sweep).
__all__ = [
    "Game",
    "Work",
    "best_play",
    "check_strategy",
    "horizon",
    "inline_round",
    "load",
    "loads",
    "report_text",
    "round_figures",
    "run_sweep",
    "sessions",
    "simulation",
    "to_dict",
    "to_json",
    "to_text",
    "tune",
]


def load(path: str | Path, params: dict[str, Any] | None = None) -> Game:
    """A ruleset file, with ``params`` (name -> value, e.g. ``{"p": "1/2"}``) replacing its ``[params]``."""
    return core.load_game(path, params)


def loads(text: str, source: str = "<text>", params: dict[str, Any] | None = None) -> Game:
    """A ruleset from TOML text."""
    return core.game_from_text(text, source, params)


def round_figures(game: Game, work: Work | None = None, **settings: Any) -> RoundResults:
    """Every figure of one round (``starts=``, ``strategies=``, ``rounds=``, ``exact_limit=``...)."""
    return core.round_figures(game, make_settings(**settings), work or Work())


def best_play(game: Game, goal: str = "max-return", work: Work | None = None, **settings: Any) -> BestResults:
    """The best play for ``goal`` (max-return, max-win, min-loss, min-steps), its value and certificate."""
    return core.best_play(game, make_settings(best_goal=goal, **settings), work or Work())


def check_strategy(
    game: Game, strategy: str, goal: str = "max-return", work: Work | None = None, **settings: Any
) -> BestResults:
    """A named strategy held against ``goal``: every state where one change of action does better."""
    return core.check_strategy(game, strategy, make_settings(best_goal=goal, **settings), work or Work())


def sessions(game: Game, work: Work | None = None, **settings: Any) -> SessionResults:
    """Bankroll sessions: ``bankroll=``, ``goal=`` (an amount or ``"none"``), ``plans=[...]`` and the limits."""
    return core.sessions(game, make_settings(**settings), work or Work())


def simulation(game: Game, work: Work | None = None, **settings: Any) -> Simulation:
    """Monte Carlo beside the exact figures: rounds, or sessions when session settings are given
    (``trials=``, ``seed=``; ``strategies=[NAME]`` or ``play_best=True`` for a game with decisions)."""
    return core.simulate(game, make_settings(**settings), work or Work())


def horizon(game: Game, rounds: Any = (1, 10, 100, 1000), work: Work | None = None, **settings: Any) -> HorizonResults:
    """The total net after each number of ``rounds`` (a list, or text such as ``"1,10,100"``): chance ahead,
    even and behind, quantiles, the realised return's range (``strategies=[NAME]`` for a game with decisions)."""
    if isinstance(rounds, str):
        rounds = [int(item) for item in rounds.split(",") if item.strip()]
    elif isinstance(rounds, int):
        rounds = [rounds]
    return core.horizon(game, tuple(rounds), make_settings(**settings), work or Work())


def tune(
    game: Game,
    vary: str,
    target: str | None = None,
    tolerance: str = "1e-9",
    between: tuple[Any, Any] | None = None,
    work: Work | None = None,
    **settings: Any,
) -> TuneResults:
    """The figure of ``target`` (``"house_edge=1.5%"``; None: the break-even) as an exact function of the
    parameter ``vary``, and every value of it giving the target (``strategies=[NAME]`` for decisions)."""
    chosen = core.parse_target(target) if target is not None else None
    span = None
    if between is not None:
        span = (core.parse_amount(str(between[0]), "between"), core.parse_amount(str(between[1]), "between"))
    tolerance_value = core.parse_amount(tolerance, "tolerance")
    return core.tune(game, vary, chosen, make_settings(**settings), tolerance_value, span, work or Work())


def report_text(game: Game, fmt: str = "md", work: Work | None = None, **settings: Any) -> str:
    """A report as Markdown (``md``), ``csv`` or ``json`` text, as ``oddsbench report`` writes it."""
    from oddsbench.report.document import build_report
    from oddsbench.report.render_csv import render_csv
    from oddsbench.report.render_json import render_json
    from oddsbench.report.render_markdown import render_markdown

    renderers = {"md": render_markdown, "csv": render_csv, "json": render_json}
    if fmt not in renderers:
        raise ValueError(f"fmt must be one of {', '.join(renderers)}, got {fmt!r}")
    return renderers[fmt](build_report(core.report_figures(game, make_settings(**settings), work or Work())))


def run_sweep(path: str | Path, workers: int | None = None, cluster: str | None = None) -> SweepResult:
    """Every point of a sweep spec file, on this process, local processes or a Dask cluster."""
    return core.sweep(core.read_spec(path), workers=workers, cluster=cluster)


def to_dict(result: Any, series: bool = False) -> dict[str, Any]:
    """The plain dict the matching command prints with ``--json`` (``series``: sessions' whole goal series)."""
    from oddsbench.report.round_report import solve_json
    from oddsbench.report.session_report import session_json
    from oddsbench.report.simulation_report import simulate_json
    from oddsbench.report.strategy_report import best_json
    from oddsbench.report.sweep_report import sweep_json

    if isinstance(result, RoundResults):
        return solve_json(result)
    if isinstance(result, BestResults):
        return best_json(result)
    if isinstance(result, SessionResults):
        return session_json(result, series=series)
    if isinstance(result, Simulation):
        return simulate_json(result)
    if isinstance(result, SweepResult):
        return sweep_json(result)
    if isinstance(result, HorizonResults):
        from oddsbench.report.horizon_report import horizon_json

        return horizon_json(result)
    if isinstance(result, TuneResults):
        from oddsbench.report.tune_report import tune_json

        return tune_json(result)
    if isinstance(result, ReportFigures):
        from oddsbench.report.document import build_report
        from oddsbench.report.render_json import report_json

        return report_json(build_report(result))
    raise TypeError(f"to_dict takes a result of oddsbench (solve, best, session, ...), not {type(result).__name__}")


def to_json(result: Any, series: bool = False) -> str:
    """``to_dict`` as JSON text, exactly as the command prints it."""
    from oddsbench.report.json_output import dumps

    return dumps(to_dict(result, series))


def to_text(result: Any) -> str:
    """The terminal text of the matching command (tables, notes and the cautions)."""
    from oddsbench.report.round_report import solve_text
    from oddsbench.report.session_report import session_text
    from oddsbench.report.simulation_report import simulate_text
    from oddsbench.report.strategy_report import best_text, check_text

    if isinstance(result, RoundResults):
        return solve_text(result)
    if isinstance(result, BestResults):
        return best_text(result.best) if result.best is not None else check_text(result.checks[0])
    if isinstance(result, SessionResults):
        return session_text(result)
    if isinstance(result, Simulation):
        return simulate_text(result)
    if isinstance(result, SweepResult):
        from oddsbench.report.sweep_report import sweep_table

        return sweep_table(result)
    if isinstance(result, HorizonResults):
        from oddsbench.report.horizon_report import horizon_text

        return horizon_text(result)
    if isinstance(result, TuneResults):
        from oddsbench.report.tune_report import tune_text

        return tune_text(result)
    raise TypeError(f"to_text takes a result of oddsbench (solve, best, session, ...), not {type(result).__name__}")

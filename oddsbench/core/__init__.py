"""The analysis core: the one way a front end (command line, workbench, reports, sweeps, the Python
API) asks for figures.

A loaded game and one ``Settings`` in, frozen results out; cancellation and progress through one
``Work`` object. The core never imports textual and never formats text (the report layer does).

Entry points:

- ``load_game(path, params)``, ``game_from_text(text, source, params)``, ``inline_round("1:18/37,-1:19/37")``
- ``round_figures(game, settings, work) -> RoundResults``: any start states, any strategies, side by side
- ``best_play(game, settings, work)`` / ``check_strategy(game, name, settings, work) -> BestResults``
- ``sessions(game, settings, work) -> SessionResults``: a bounded goal or none, every plan
- ``simulate(game, settings, work) -> Simulation``: rounds, or sessions per plan
- ``read_spec(path)``, ``sweep(spec, workers, cluster, work) -> SweepResult``, ``solve_point(...)``
- ``report_figures(game, settings, work) -> ReportFigures``
"""

from oddsbench.core.game import Game, game_from_text, inline_round, load_game
from oddsbench.core.reports import ReportFigures, report_figures
from oddsbench.core.rounds import BestResults, best_play, check_strategy, round_figures
from oddsbench.core.sessions import PlanResult, SessionResults, session_settings, sessions
from oddsbench.core.settings import DEFAULTS, SessionRequest, Settings, make_settings, money, session_request
from oddsbench.core.simulation import Simulation, simulate
from oddsbench.core.sweeps import read_spec, solve_point, solve_task, sweep
from oddsbench.core.work import NO_WORK, Cancelled, Work

__all__ = [
    "DEFAULTS",
    "NO_WORK",
    "BestResults",
    "Cancelled",
    "Game",
    "PlanResult",
    "ReportFigures",
    "SessionRequest",
    "SessionResults",
    "Settings",
    "Simulation",
    "Work",
    "best_play",
    "check_strategy",
    "game_from_text",
    "inline_round",
    "load_game",
    "make_settings",
    "money",
    "read_spec",
    "report_figures",
    "round_figures",
    "session_request",
    "session_settings",
    "sessions",
    "simulate",
    "solve_point",
    "solve_task",
    "sweep",
]

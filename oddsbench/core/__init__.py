"""The analysis core: the one way a front end (command line, workbench, reports, sweeps, the Python
API) asks for figures.

A loaded game and one ``Settings`` in, frozen results out; cancellation, progress and the work
budget (time and memory) through one ``Work`` object. The core never imports textual and never
formats text (the report layer does).

Entry points:

- ``load_game(path, params)``, ``game_from_text(text, source, params)``, ``inline_round("1:18/37,-1:19/37")``
- ``round_figures(game, settings, work) -> RoundResults``: any start states, any strategies, side by side
- ``best_play(game, settings, work)`` / ``check_strategy(game, name, settings, work) -> BestResults``
- ``sessions(game, settings, work) -> SessionResults``: a bounded goal or none, every plan
- ``simulate(game, settings, work) -> Simulation``: rounds, or sessions per plan
- ``read_spec(path)``, ``sweep(spec, workers, cluster, work) -> SweepResult``, ``solve_point(...)``
- ``report_figures(game, settings, work) -> ReportFigures``
- ``horizon(game, rounds, settings, work) -> HorizonResults``: the total net after N rounds
- ``tune(game, name, (figure, value), settings, tolerance, between, work) -> TuneResults``
"""

import importlib as _importlib

# Loaded on first use (``from oddsbench.core import sessions`` works as usual): the command line
# reads the plan help from ``oddsbench.core.plans`` at start-up without loading any engine.
_WHERE = {
    "Game": "game",
    "game_from_text": "game",
    "inline_round": "game",
    "load_game": "game",
    "check_size": "game",
    "dealt_size": "game",
    "HorizonResults": "horizons",
    "horizon": "horizons",
    "parse_rounds": "horizons",
    "ReportFigures": "reports",
    "report_figures": "reports",
    "BestResults": "rounds",
    "best_play": "rounds",
    "check_strategy": "rounds",
    "round_figures": "rounds",
    "PlanResult": "session",
    "SessionResults": "session",
    "session_settings": "session",
    "sessions": "session",
    "DEFAULTS": "settings",
    "SessionRequest": "settings",
    "Settings": "settings",
    "make_settings": "settings",
    "money": "settings",
    "session_request": "settings",
    "Simulation": "simulation",
    "simulate": "simulation",
    "read_spec": "sweeps",
    "solve_point": "sweeps",
    "solve_task": "sweeps",
    "sweep": "sweeps",
    "TuneResults": "tuning",
    "parse_amount": "tuning",
    "parse_target": "tuning",
    "tune": "tuning",
    "NO_WORK": "work",
    "Budget": "work",
    "Cancelled": "work",
    "OverBudget": "work",
    "Work": "work",
}

__all__ = sorted(_WHERE)


def __getattr__(name: str):
    if name in _WHERE:
        return getattr(_importlib.import_module(f"oddsbench.core.{_WHERE[name]}"), name)
    raise AttributeError(f"module 'oddsbench.core' has no attribute {name!r}")

"""What a report shows, solved once: the round under each reported play and, if asked, the sessions.

``report_figures(game, settings, work) -> ReportFigures``; the report layer formats it (Markdown,
CSV, JSON) and never solves.
"""

from __future__ import annotations

from dataclasses import dataclass

from oddsbench.core.game import Game
from oddsbench.core.session import SessionResults
from oddsbench.core.settings import DEFAULTS, Settings
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.strategy.compare import RoundResults


@dataclass(frozen=True)
class ReportFigures:
    """The game (ruleset and its text), its rounds side by side, and the sessions (None when not asked)."""

    game: Game
    rounds: RoundResults
    sessions: SessionResults | None = None


@budgeted
def report_figures(game: Game, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> ReportFigures:
    """The round under each requested strategy (all of the file's when none is named); sessions under the first."""
    from oddsbench.strategy.compare import plays_to_compare, solve_rounds, starting_at

    ruleset = game.need_ruleset("a report")
    plays = [(ruleset.start, name) for name in plays_to_compare(ruleset, settings.strategies)]
    compared = "strategies" if len(plays) > 1 else None
    rounds = solve_rounds(
        ruleset, plays, compared, settings.rounds, settings.round_exact_limit, work.should_stop, settings.max_states
    )
    if settings.session is None:
        return ReportFigures(game, rounds)
    from oddsbench.core.session import repeated_round, session_settings, solve_plans

    first = rounds.columns[0]
    distribution = repeated_round(starting_at(ruleset, None, settings.max_states), first.policy)
    session = session_settings(game, settings.session)
    results = solve_plans(game, distribution, session, _for_sessions(settings), work, first.strategy)
    return ReportFigures(game, rounds, results)


def _for_sessions(settings: Settings) -> Settings:
    """Reports ask sessions without ``--rounds`` (that option is the round's chances by step N)."""
    from dataclasses import replace

    return replace(settings, rounds=None)

"""Monte Carlo cross-checks: rounds, or whole sessions per plan, beside the exact figures.

``simulate(game, settings, work) -> Simulation``: rounds when ``settings.session`` is None,
otherwise sessions (each plan's bankroll chain is the one ``strategy.session.session_chain``
builds, the one the session solver solves).
"""

from __future__ import annotations

from dataclasses import dataclass

from oddsbench.core.game import Game
from oddsbench.core.settings import DEFAULTS, Settings
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model import budget as budgets
from oddsbench.model.defaults import DEFAULT_PLANS, DEFAULT_ROUND_TRIALS, DEFAULT_SESSION_TRIALS
from oddsbench.model.errors import SettingProblem
from oddsbench.simulate.checks import Check
from oddsbench.simulate.round_sim import RoundSample
from oddsbench.simulate.session_sim import SessionSample
from oddsbench.solve.round import RoundFigures
from oddsbench.strategy.session import SessionFigures, SessionSettings


@dataclass(frozen=True)
class SessionRun:
    """One plan's simulated sessions, the checks against the exact figures, and those figures."""

    sample: SessionSample
    checks: tuple[Check, ...]
    figures: SessionFigures


@dataclass(frozen=True)
class Simulation:
    """Simulated rounds (``sample``, ``checks``, ``figures``) or sessions (``runs``), and the seed that
    repeats them."""

    title: str
    seed: int
    confidence: float
    play: str | None
    sample: RoundSample | None = None
    checks: tuple[Check, ...] = ()
    figures: RoundFigures | None = None
    session: SessionSettings | None = None
    runs: tuple[SessionRun, ...] = ()

    @property
    def of_sessions(self) -> bool:
        return self.session is not None


def fresh_seed() -> int:
    import numpy as np

    return int(np.random.SeedSequence().entropy % (1 << 63))


@budgeted
def simulate(game: Game, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> Simulation:
    """Play many rounds (or sessions) at random and check every exact figure against the sample."""
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.core.rounds import round_play
    from oddsbench.strategy.compare import starting_at

    ruleset = starting_at(game.need_ruleset("simulation"), settings.starts, settings.max_states)
    policy, play = round_play(ruleset, settings, work)
    chain = build_round_chain(ruleset, policy, settings.max_states)
    seed = settings.seed if settings.seed is not None else fresh_seed()
    if settings.session is not None:
        return _sessions(game, chain, seed, play, settings, work)
    from oddsbench.simulate.checks import round_checks
    from oddsbench.simulate.round_sim import simulate_round
    from oddsbench.solve.round import solve_round

    sample = simulate_round(
        chain,
        settings.trials or DEFAULT_ROUND_TRIALS,
        seed,
        max_steps=settings.max_steps,
        should_stop=work.should_stop,
        progress=work.progress,
    )
    work.check()
    figures = solve_round(chain, exact_limit=settings.round_exact_limit, should_stop=work.should_stop)
    checks = round_checks(sample, figures, settings.confidence)
    return Simulation(ruleset.title, seed, settings.confidence, play, sample, tuple(checks), figures)


def _sessions(game: Game, chain, seed: int, play: str | None, settings: Settings, work: Work) -> Simulation:
    from oddsbench.core.session import for_plan, session_settings
    from oddsbench.simulate.checks import session_checks
    from oddsbench.simulate.round_sim import RoundPlayer
    from oddsbench.simulate.session_sim import simulate_session
    from oddsbench.solve.round_distribution import round_distribution
    from oddsbench.strategy.plans import parse_plans
    from oddsbench.strategy.session import analyse_session, session_chain

    session = session_settings(game, settings.session)
    if session.no_goal:
        raise SettingProblem(
            f"{game.source}: simulated sessions need a goal: with no goal play only stops at ruin, which may "
            "never come (the exact figures of play with no goal need no simulation: ask for the session)",
            "goal",
        )
    with budgets.exact_part(1):  # the round has no decimal stand-in: a part of its own (core/session.py)
        distribution = round_distribution(chain)
    player = RoundPlayer.of(chain)
    trials = settings.trials or DEFAULT_SESSION_TRIALS
    limit = settings.round_exact_limit
    plans = parse_plans(settings.session.plans or DEFAULT_PLANS)
    runs = []
    for done, plan in enumerate(plans):
        work.check()
        played = for_plan(session, plan)
        planned = session_chain(distribution, played, plan, limit)
        with budgets.exact_part(len(plans)):  # each plan its own piece of exact arithmetic's time
            figures = analyse_session(distribution, played, plan, limit, should_stop=work.should_stop, planned=planned)

        def progress(count: int, total: int, done: int = done) -> None:  # every plan's sessions, in turn
            work.done(done * total + count, len(plans) * total)

        sample = simulate_session(
            planned.chain,
            trials,
            seed,
            player,
            session.max_rounds,
            plan=plan.spelling,
            should_stop=work.should_stop,
            progress=progress,
        )
        runs.append(SessionRun(sample, tuple(session_checks(sample, figures, settings.confidence)), figures))
    return Simulation(game.title, seed, settings.confidence, play, session=session, runs=tuple(runs))

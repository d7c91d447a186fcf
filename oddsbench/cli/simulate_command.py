"""``oddsbench simulate FILE``: a Monte Carlo cross-check of the exact figures of a round."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.best_command import GOAL_NAMES
from oddsbench.cli.options import add_exact_limit, add_max_states, non_negative_int, positive_int
from oddsbench.cli.session_options import add_session_options

DEFAULT_EXACT_LIMIT = 5_000
DEFAULT_TRIALS = 1_000_000
DEFAULT_SESSION_TRIALS = 100_000


def confidence_level(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number such as 0.99, got {text!r}") from None
    if not 0 < value < 1:
        raise argparse.ArgumentTypeError(f"expected a level strictly between 0 and 1 (such as 0.99), got {text}")
    return value


def register(commands) -> None:
    parser = commands.add_parser(
        "simulate",
        help="Monte Carlo cross-check: estimates with intervals beside the exact figures",
        description="Play many independent rounds at random (numpy's Generator, reproducible by "
        "seed) and print each estimate with its confidence interval (Wilson for chances, normal "
        "for means and variances), the exact value beside it, and a flag where the exact value "
        "falls outside the interval.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    parser.add_argument(
        "--trials",
        type=positive_int,
        metavar="N",
        help=f"rounds to play (default {DEFAULT_TRIALS:,}), or sessions per plan (default {DEFAULT_SESSION_TRIALS:,})",
    )
    parser.add_argument(
        "--seed", type=non_negative_int, metavar="S", help="random seed; without it a fresh seed is drawn and printed"
    )
    parser.add_argument(
        "--confidence",
        type=confidence_level,
        default=0.99,
        metavar="LEVEL",
        help="confidence level of the intervals (default 0.99)",
    )
    play = parser.add_mutually_exclusive_group()
    play.add_argument("--strategy", metavar="NAME", help="play the file's named strategy")
    play.add_argument(
        "--best",
        metavar="GOAL",
        choices=GOAL_NAMES,
        help="play the best play for a goal, as `oddsbench best` finds it (" + ", ".join(GOAL_NAMES) + ")",
    )
    parser.add_argument("--from", dest="start", metavar="STATE", help="start the round in STATE instead")
    parser.add_argument(
        "--max-steps",
        type=positive_int,
        default=1_000_000,
        metavar="N",
        help="give up on a round after N steps (default 1,000,000)",
    )
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    add_max_states(parser)
    add_session_options(parser)
    parser.set_defaults(run=run)


def round_play(ruleset, args: argparse.Namespace) -> tuple[dict[str, str], str | None]:
    """The policy to play and its label: a named strategy, the best play for a goal, or none."""
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.strategy.compare import named_strategy, strategy_policy

    if args.strategy is not None:
        return strategy_policy(ruleset, named_strategy(ruleset, args.strategy)), args.strategy
    if args.best is not None:
        from oddsbench.strategy.best_policy import best_policy

        best = best_policy(ruleset, args.best, args.exact_limit)
        return dict(best.policy), f"best for {args.best}"
    if ruleset.has_decisions:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(
            f"{ruleset.source}: has decision states: choose --strategy NAME (known: {known}) or --best GOAL"
        )
    return {}, None


def run(args: argparse.Namespace) -> int:
    import numpy as np

    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.cli.options import load_with_warnings
    from oddsbench.cli.session_options import wants_session
    from oddsbench.report.simulation_report import simulation_json, simulation_text
    from oddsbench.simulate.checks import round_checks
    from oddsbench.simulate.round_sim import simulate_round
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.compare import starting_at

    ruleset = starting_at(load_with_warnings(args.file), args.start)
    policy, play = round_play(ruleset, args)
    chain = build_round_chain(ruleset, policy, args.max_states)
    seed = args.seed if args.seed is not None else int(np.random.SeedSequence().entropy % (1 << 63))
    if wants_session(args):
        return _sessions(ruleset, chain, seed, play, args)
    sample = simulate_round(chain, args.trials or DEFAULT_TRIALS, seed, max_steps=args.max_steps)
    figures = solve_round(chain, exact_limit=args.exact_limit)
    checks = round_checks(sample, figures, args.confidence)
    if args.json:
        print(json.dumps(simulation_json(sample, checks, args.confidence, figures.notes), indent=2))
    else:
        print(simulation_text(sample, checks, args.confidence, play, figures.notes))
    return 0


def _sessions(ruleset, chain, seed: int, play: str | None, args: argparse.Namespace) -> int:
    from oddsbench.cli.session_options import session_plans, session_settings
    from oddsbench.model.numbers import text
    from oddsbench.report.simulation_report import session_simulation_json, session_simulation_text
    from oddsbench.simulate.checks import session_checks
    from oddsbench.simulate.round_sim import RoundPlayer
    from oddsbench.simulate.session_sim import session_chain, simulate_session
    from oddsbench.solve.round_distribution import round_distribution
    from oddsbench.strategy.session import analyse_session

    settings = session_settings(args, ruleset)
    distribution = round_distribution(chain)
    player = RoundPlayer.of(chain)
    trials = args.trials or DEFAULT_SESSION_TRIALS
    runs = []
    for plan in session_plans(args):
        figures = analyse_session(distribution, settings, plan, args.exact_limit)
        bankroll_chain = session_chain(distribution, settings, plan, args.exact_limit)
        sample = simulate_session(bankroll_chain, trials, seed, player, settings.max_rounds, plan=plan)
        runs.append((sample, session_checks(sample, figures, args.confidence), figures))
    shown = {
        name: (text(value) if not isinstance(value, int) else value)
        for name, value in vars(settings).items()
        if value is not None
    }
    if args.json:
        print(json.dumps(session_simulation_json(runs, args.confidence, shown), indent=2))
        return 0
    line = f"{ruleset.title}: sessions " + ", ".join(f"{k} {v}" for k, v in shown.items())
    if play:
        line += f"; each round playing {play!r}"
    print(session_simulation_text(runs, args.confidence, line))
    return 0

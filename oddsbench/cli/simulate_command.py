"""``oddsbench simulate FILE``: a Monte Carlo cross-check of the exact figures of a round."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.best_command import GOAL_NAMES
from oddsbench.cli.options import add_exact_limit, add_max_states, positive_int

DEFAULT_EXACT_LIMIT = 5_000
DEFAULT_TRIALS = 1_000_000


def confidence_level(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number such as 0.99, got {text!r}") from None
    if not 0 < value < 1:
        raise argparse.ArgumentTypeError(f"expected a level strictly between 0 and 1 (such as 0.99), got {text}")
    return value


def seed_value(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 0, got {value}")
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
        default=DEFAULT_TRIALS,
        metavar="N",
        help=f"rounds to play (default {DEFAULT_TRIALS:,})",
    )
    parser.add_argument(
        "--seed", type=seed_value, metavar="S", help="random seed; without it a fresh seed is drawn and printed"
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
    from oddsbench.model.load import load_ruleset
    from oddsbench.report.simulation_report import simulation_json, simulation_text
    from oddsbench.simulate.checks import round_checks
    from oddsbench.simulate.round_sim import simulate_round
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.compare import starting_at

    ruleset = starting_at(load_ruleset(args.file), args.start)
    policy, play = round_play(ruleset, args)
    chain = build_round_chain(ruleset, policy, args.max_states)
    seed = args.seed if args.seed is not None else int(np.random.SeedSequence().entropy % (1 << 63))
    sample = simulate_round(chain, args.trials, seed, max_steps=args.max_steps)
    figures = solve_round(chain, exact_limit=args.exact_limit)
    checks = round_checks(sample, figures, args.confidence)
    if args.json:
        print(json.dumps(simulation_json(sample, checks, args.confidence, figures.notes), indent=2))
    else:
        print(simulation_text(sample, checks, args.confidence, play, figures.notes))
    return 0

"""``oddsbench simulate FILE``: a Monte Carlo cross-check of the exact figures of a round."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.options import add_exact_limit, positive_int

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
    parser.add_argument("--strategy", metavar="NAME", help="play the file's named strategy")
    parser.add_argument(
        "--max-steps",
        type=positive_int,
        default=1_000_000,
        metavar="N",
        help="give up on a round after N steps (default 1,000,000)",
    )
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    import numpy as np

    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset
    from oddsbench.report.simulation_report import simulation_json, simulation_text
    from oddsbench.simulate.checks import round_checks
    from oddsbench.simulate.round_sim import simulate_round
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.policy import policy_for

    ruleset = load_ruleset(args.file)
    chain = build_round_chain(ruleset, policy_for(ruleset, args.strategy))
    seed = args.seed if args.seed is not None else int(np.random.SeedSequence().entropy % (1 << 63))
    sample = simulate_round(chain, args.trials, seed, max_steps=args.max_steps)
    figures = solve_round(chain, exact_limit=args.exact_limit)
    checks = round_checks(sample, figures, args.confidence)
    if args.json:
        print(json.dumps(simulation_json(sample, checks, args.confidence), indent=2))
    else:
        print(simulation_text(sample, checks, args.confidence, args.strategy))
        for note in figures.notes:
            print(f"  - {note}")
    return 0

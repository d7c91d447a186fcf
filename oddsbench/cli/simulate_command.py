"""``oddsbench simulate FILE``: a Monte Carlo cross-check of the exact figures of a round."""

from __future__ import annotations

import argparse

from oddsbench.cli.options import (
    add_exact_limit,
    add_max_states,
    add_session_options,
    non_negative_int,
    positive_int,
)
from oddsbench.model.defaults import (
    BEST_GOALS,
    DEFAULT_BEST_GOAL,
    DEFAULT_CONFIDENCE,
    DEFAULT_MAX_STEPS,
    DEFAULT_ROUND_TRIALS,
    DEFAULT_SESSION_TRIALS,
    ROUND_EXACT_LIMIT,
)


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
        help=f"rounds to play (default {DEFAULT_ROUND_TRIALS:,}), or sessions per plan "
        f"(default {DEFAULT_SESSION_TRIALS:,})",
    )
    parser.add_argument(
        "--seed", type=non_negative_int, metavar="S", help="random seed; without it a fresh seed is drawn and printed"
    )
    parser.add_argument(
        "--confidence",
        type=confidence_level,
        default=DEFAULT_CONFIDENCE,
        metavar="LEVEL",
        help=f"confidence level of the intervals (default {DEFAULT_CONFIDENCE})",
    )
    play = parser.add_mutually_exclusive_group()
    play.add_argument("--strategy", metavar="NAME", help="play the file's named strategy")
    play.add_argument(
        "--best",
        metavar="GOAL",
        choices=BEST_GOALS,
        help="play the best play for a goal, as `oddsbench best` finds it (" + ", ".join(BEST_GOALS) + ")",
    )
    parser.add_argument("--from", dest="start", metavar="STATE", help="start the round in STATE instead")
    parser.add_argument(
        "--max-steps",
        type=positive_int,
        default=DEFAULT_MAX_STEPS,
        metavar="N",
        help="give up on a round after N steps (default 1,000,000)",
    )
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    add_max_states(parser)
    add_session_options(parser, switch=True)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_game, settings_of, wants_session
    from oddsbench.core import simulate
    from oddsbench.report.json_output import dumps
    from oddsbench.report.simulation_report import simulate_json, simulate_text

    settings = settings_of(
        args,
        sessions=wants_session(args),
        strategies=(args.strategy,) if args.strategy else (),
        play_best=args.best is not None,
        best_goal=args.best or DEFAULT_BEST_GOAL,
    )
    simulation = simulate(load_game(args.file), settings)
    print(dumps(simulate_json(simulation)) if args.json else simulate_text(simulation))
    return 0

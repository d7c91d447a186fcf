"""``oddsbench best FILE``: the best action in every decision state, its value and certificate."""

from __future__ import annotations

import argparse

from oddsbench.cli.options import add_exact_limit
from oddsbench.model.defaults import BEST_GOALS, DEFAULT_BEST_GOAL, ROUND_EXACT_LIMIT

GOAL_NAMES = BEST_GOALS


def register(commands) -> None:
    parser = commands.add_parser(
        "best",
        help="the best play for a goal, with a certificate of optimality",
        description="Find the best action in every decision state by policy iteration with exact "
        "evaluation, print the value from the start state, and check exactly that no single change "
        "of action improves any state. With --check-strategy, hold a named strategy against the goal "
        "instead and list every state where another action does better.",
        epilog="Goals: max-return = highest expected net (sum of pays); max-win = highest chance of "
        'ending in a state whose result is "win"; min-loss = lowest chance of a "loss"; min-steps = '
        "fewest expected steps. Ties go to the action listed first in the file.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    parser.add_argument(
        "--goal", choices=GOAL_NAMES, default=DEFAULT_BEST_GOAL, help=f"what to optimise (default {DEFAULT_BEST_GOAL})"
    )
    parser.add_argument("--check-strategy", metavar="NAME", help="check a named strategy against the goal")
    parser.add_argument("--from", dest="start", metavar="STATE", help="start the round in STATE instead")
    parser.add_argument(
        "--every-state", action="store_true", help="one line per decision state instead of runs of equal actions"
    )
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_game, settings_of
    from oddsbench.core import best_play, check_strategy
    from oddsbench.report.json_output import dumps
    from oddsbench.report.strategy_report import best_json, best_text, check_text

    game = load_game(args.file)
    settings = settings_of(args, best_goal=args.goal)
    if args.check_strategy is not None:
        results = check_strategy(game, args.check_strategy, settings)
        print(dumps(best_json(results)) if args.json else check_text(results.checks[0]))
        return 0
    results = best_play(game, settings)
    print(dumps(best_json(results)) if args.json else best_text(results.best, args.every_state))
    return 0

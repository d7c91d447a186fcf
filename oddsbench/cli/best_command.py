"""``oddsbench best FILE``: the best action in every decision state, its value and certificate."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.options import add_exact_limit

DEFAULT_EXACT_LIMIT = 5_000
GOAL_NAMES = ("max-return", "max-win", "min-loss", "min-steps")


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
        "--goal", choices=GOAL_NAMES, default="max-return", help="what to optimise (default max-return)"
    )
    parser.add_argument("--check-strategy", metavar="NAME", help="check a named strategy against the goal")
    parser.add_argument("--from", dest="start", metavar="STATE", help="start the round in STATE instead")
    parser.add_argument(
        "--every-state", action="store_true", help="one line per decision state instead of runs of equal actions"
    )
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_with_warnings
    from oddsbench.report.strategy_report import best_json, best_text, check_json, check_text
    from oddsbench.strategy.best_policy import best_policy, check_strategy
    from oddsbench.strategy.compare import starting_at

    ruleset = starting_at(load_with_warnings(args.file), args.start)
    if args.check_strategy is not None:
        check = check_strategy(ruleset, args.check_strategy, args.goal, args.exact_limit)
        print(json.dumps(check_json(check), indent=2) if args.json else check_text(check))
        return 0
    best = best_policy(ruleset, args.goal, args.exact_limit)
    print(json.dumps(best_json(best), indent=2) if args.json else best_text(best, args.every_state))
    return 0

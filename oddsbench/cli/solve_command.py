"""``oddsbench solve FILE``: every figure of one round, exact beside decimal."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.options import add_exact_bits, add_exact_limit, add_max_states, positive_int

DEFAULT_EXACT_LIMIT = 5_000


def register(commands) -> None:
    parser = commands.add_parser(
        "solve",
        help="all figures of one round: house edge, return, variance, steps",
        description="Solve one round of a ruleset by first-step analysis, exactly (rationals) and "
        "in floating point: end-state chances, expected net, expected staked, house edge, "
        "return to player, net variance, expected steps and their variance.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument(
        "--rounds",
        type=positive_int,
        metavar="N",
        help="also the chance the round has ended, and in each end state, by step N",
    )
    parser.add_argument(
        "--strategy",
        metavar="NAME",
        help="play the file's named strategy (without it, a file with decisions is solved under each "
        "named strategy, side by side)",
    )
    parser.add_argument(
        "--from",
        dest="start",
        metavar="STATES",
        help="start the round in STATE instead; several states (comma-separated, or a pattern such as "
        "'up-*') are solved side by side",
    )
    parser.add_argument(
        "--cells",
        choices=("both", "exact", "decimal"),
        default="both",
        help="side-by-side tables: show exact | decimal (default), or only one of them",
    )
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    add_max_states(parser)
    add_exact_bits(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.cli.options import load_with_warnings
    from oddsbench.report.round_report import round_json, round_text
    from oddsbench.solve.round import solve_round
    from oddsbench.strategy.compare import named_strategy, starting_at, strategy_policy

    ruleset = load_with_warnings(args.file)
    if args.start is not None and ("," in args.start or any(char in args.start for char in "*?[")):
        return _from_each(ruleset, args)
    ruleset = starting_at(ruleset, args.start)
    if args.strategy is None and ruleset.has_decisions:
        return _side_by_side(ruleset, args)
    policy = {}
    if args.strategy is not None:
        policy = strategy_policy(ruleset, named_strategy(ruleset, args.strategy))
    chain = build_round_chain(ruleset, policy, args.max_states)
    figures = solve_round(chain, rounds=args.rounds, exact_limit=args.exact_limit, exact_bits=args.exact_bits)
    if args.json:
        print(json.dumps(round_json(figures, ruleset.title), indent=2))
    else:
        print(round_text(figures, args.strategy))
    return 0


def _side_by_side(ruleset, args: argparse.Namespace) -> int:
    from oddsbench.report.strategy_report import comparison_json, comparison_text
    from oddsbench.strategy.compare import compare_strategies

    comparison = compare_strategies(ruleset, rounds=args.rounds, exact_limit=args.exact_limit)
    print(json.dumps(comparison_json(comparison), indent=2) if args.json else comparison_text(comparison, args.cells))
    return 0


def _from_each(ruleset, args: argparse.Namespace) -> int:
    from oddsbench.report.strategy_report import comparison_text, starts_json
    from oddsbench.strategy.compare import compare_starts, matching_states

    starts = matching_states(ruleset, args.start)
    comparison = compare_starts(ruleset, starts, args.strategy, rounds=args.rounds, exact_limit=args.exact_limit)
    print(json.dumps(starts_json(comparison), indent=2) if args.json else comparison_text(comparison, args.cells))
    return 0

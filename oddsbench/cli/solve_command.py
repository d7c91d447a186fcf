"""``oddsbench solve FILE``: every figure of one round, exact beside decimal."""

from __future__ import annotations

import argparse
import json
import sys

from oddsbench.cli.options import add_exact_limit, add_max_states, positive_int

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
    parser.add_argument("--strategy", metavar="NAME", help="play the file's named strategy")
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    add_max_states(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.errors import OddsbenchError, RulesetError
    from oddsbench.model.load import read_ruleset_file
    from oddsbench.report.round_report import round_json, round_text
    from oddsbench.solve.round import solve_round

    loaded = read_ruleset_file(args.file)
    if loaded.ruleset is None:
        raise RulesetError(loaded.problems)
    for warning in loaded.warnings:
        print(warning, file=sys.stderr)
    ruleset = loaded.ruleset
    policy = {}
    if args.strategy is not None:
        try:
            strategy = ruleset.strategy(args.strategy)
        except KeyError:
            known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
            raise OddsbenchError(f"{ruleset.source}: unknown strategy {args.strategy!r} (known: {known})") from None
        policy = {state.name: strategy.action_for(state) for state in ruleset.states if state.is_decision}
    chain = build_round_chain(ruleset, policy, args.max_states)
    figures = solve_round(chain, rounds=args.rounds, exact_limit=args.exact_limit)
    if args.json:
        print(json.dumps(round_json(figures, ruleset.title), indent=2))
    else:
        print(round_text(figures, args.strategy))
    return 0

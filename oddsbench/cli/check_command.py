"""``oddsbench check FILE``: validate a ruleset, one line per problem, exit 2 when invalid."""

from __future__ import annotations

import argparse
import sys

from oddsbench.cli.options import add_max_states


def register(commands) -> None:
    parser = commands.add_parser(
        "check",
        help="validate a ruleset file",
        description="Validate a ruleset: exact probability sums, known targets and parameters, a "
        "start state, a round that can always end. Exit 0 when valid, 2 when not.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    add_max_states(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.model.load import read_ruleset_file

    result = read_ruleset_file(args.file)
    for problem in result.problems:
        print(problem, file=sys.stderr if problem.is_error else sys.stdout)
    if result.ruleset is None:
        return 2
    ruleset = result.ruleset
    from oddsbench.core.game import check_size, dealt_size

    check_size(ruleset, args.max_states)
    dealt = dealt_size(ruleset, args.max_states)
    ends = sum(1 for state in ruleset.states if state.is_end)
    decisions = sum(1 for state in ruleset.states if state.is_decision)
    summary = f"{ruleset.source}: valid: {len(ruleset.states)} states, {ends} end states"
    if decisions:
        summary += f", {decisions} decision states, {len(ruleset.strategies)} strategies"
    if dealt is not None:
        states = f"{dealt:,} state{'' if dealt == 1 else 's'}"
        summary += f"; dealt from {ruleset.deck.describe()}: {states} from {ruleset.start!r}"
    print(summary)
    return 0

"""``oddsbench solve FILE``: every figure of one round, exact beside decimal."""

from __future__ import annotations

import argparse

from oddsbench.cli.options import add_exact_bits, add_exact_limit, add_max_states, positive_int
from oddsbench.model.defaults import ROUND_EXACT_LIMIT


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
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    add_max_states(parser)
    add_exact_bits(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_game, settings_of
    from oddsbench.core import round_figures
    from oddsbench.report.json_output import dumps
    from oddsbench.report.round_report import solve_json, solve_text

    results = round_figures(load_game(args.file), settings_of(args))
    print(dumps(solve_json(results)) if args.json else solve_text(results, args.cells))
    return 0

"""``oddsbench tune FILE --vary NAME --target FIGURE=VALUE``: the parameter value that hits a target."""

from __future__ import annotations

import argparse

from oddsbench.cli.options import add_exact_limit, add_max_states
from oddsbench.model.defaults import ROUND_EXACT_LIMIT


def register(commands) -> None:
    parser = commands.add_parser(
        "tune",
        help="set a parameter to hit a target figure exactly (a house edge, a chance...); break-even by default",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description="Find a round figure as an exact function of one [params] entry and every value of it "
        "that gives a target: rational values exactly, others as exact algebraic numbers with proved "
        "decimals, within the range where the file stays valid. Without --target: the break-even value "
        "(house edge 0). Where the parameter enters through floor, comparisons or if, the figure is "
        "piecewise: the target is bracketed by exact bisection instead.",
        epilog="FIGURE: house_edge, return_to_player, expected_net, expected_staked, net_variance, net_sd,\n"
        "expected_steps, steps_variance, hit_frequency, push_probability, loss_probability, end:STATE,\n"
        "result:LABEL. VALUE: exact (1/40, 0.025), or a percentage (2.5%).\n"
        "Examples:\n  oddsbench tune rulesets/single-zero-wheel.toml --vary payout\n"
        "  oddsbench tune rulesets/pair-side-bet-six-decks.toml --vary pays --target house_edge=5%\n"
        "  oddsbench tune rulesets/deuce-game.toml --vary p --target end:won=1/2\n\n"
        "Figures are mathematics, not advice.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    parser.add_argument("--vary", required=True, metavar="NAME", help="the [params] entry to vary")
    parser.add_argument(
        "--target", metavar="FIGURE=VALUE", help="the figure and the value it should take (default house_edge=0)"
    )
    parser.add_argument(
        "--tolerance",
        metavar="WIDTH",
        default="1e-9",
        help="piecewise figures: bisect until the bracket is at most this wide (default 1e-9; a parameter "
        "that takes whole values only is bracketed by two neighbouring whole values, exactly)",
    )
    parser.add_argument("--between", metavar="LO,HI", help="piecewise figures: scan the parameter evenly from LO to HI")
    parser.add_argument("--strategy", metavar="NAME", help="play the file's named strategy (games with decisions)")
    parser.add_argument("--from", dest="start", metavar="STATE", help="start the round in STATE")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    add_max_states(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_game, settings_of
    from oddsbench.core import parse_amount, parse_target, tune
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.report.json_output import dumps
    from oddsbench.report.tune_report import tune_json, tune_text

    target = parse_target(args.target) if args.target is not None else None
    tolerance = parse_amount(args.tolerance, "tolerance")
    between = None
    if args.between is not None:
        ends = args.between.split(",")
        if len(ends) != 2:
            raise OddsbenchError(f"--between {args.between[:40]!r}: expected LO,HI")
        between = (parse_amount(ends[0], "between"), parse_amount(ends[1], "between"))
    results = tune(load_game(args.file), args.vary, target, settings_of(args), tolerance, between)
    print(dumps(tune_json(results)) if args.json else tune_text(results))
    return 0

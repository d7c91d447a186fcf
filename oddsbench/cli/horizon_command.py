"""``oddsbench horizon FILE --rounds 1,10,100,10000``: the total net after N independent rounds."""

from __future__ import annotations

import argparse

from oddsbench.cli.options import add_exact_limit, add_max_states
from oddsbench.model.defaults import DEFAULT_HORIZON_ROUNDS, ROUND_EXACT_LIMIT
from oddsbench.model.errors import OddsbenchError

DEFAULT_ROUNDS = ",".join(str(n) for n in DEFAULT_HORIZON_ROUNDS)


def rounds_list(text: str) -> tuple[int, ...]:
    """``--rounds 1,10,100``, read by the core's one grammar (argparse shows the message)."""
    from oddsbench.core.horizons import parse_rounds

    try:
        return parse_rounds(text)
    except OddsbenchError as error:
        raise argparse.ArgumentTypeError(str(error)) from None


def register(commands) -> None:
    parser = commands.add_parser(
        "horizon",
        help="the total net after N rounds: chance ahead, quantiles, range of the realised return",
        description="The law of the total net after N independent rounds, exact by convolution while it "
        "stays small (a float convolution past that, with the exact mean and variance beside it): the chance "
        "the player is ahead, even or behind, quantiles of the total, and the range of the realised return "
        "to player at 90, 95 and 99 %, beside the normal approximation from the exact standard deviation.",
        epilog="Examples:\n  oddsbench horizon rulesets/pass-line.toml --rounds 1,10,100,10000\n"
        "  oddsbench horizon --round '1:18/37,-1:19/37' --rounds 10 --json\n\n"
        "Over many rounds the result converges on the house edge; no betting plan changes that.",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    parser.add_argument("file", nargs="?", help="ruleset file (TOML); or give --round instead")
    parser.add_argument(
        "--round",
        metavar="NET:PROB,...",
        help="an inline round instead of a file: net result per unit staked : probability, e.g. '1:18/37,-1:19/37'",
    )
    parser.add_argument(
        "--rounds",
        type=rounds_list,
        default=DEFAULT_HORIZON_ROUNDS,
        metavar="N,N,...",
        help=f"numbers of rounds, comma separated (default {DEFAULT_ROUNDS})",
    )
    parser.add_argument("--strategy", metavar="NAME", help="play the ruleset's named strategy (games with decisions)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    add_max_states(parser)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import file_or_round, settings_of
    from oddsbench.core import horizon
    from oddsbench.report.horizon_report import horizon_json, horizon_text
    from oddsbench.report.json_output import dumps

    game = file_or_round(args, "horizon")
    settings = settings_of(args, rounds=None)
    results = horizon(game, args.rounds, settings)
    print(dumps(horizon_json(results)) if args.json else horizon_text(results))
    return 0

"""``oddsbench session FILE``: risk of ruin, session length and betting plans, one column per plan.

With ``--goal none`` (or ``goal = "none"`` in the file's [session]) each plan is played until ruin:
the same command, the same core entry, another kind of figures.
"""

from __future__ import annotations

import argparse

from oddsbench.cli.options import add_exact_limit, add_session_options, positive_int


def _plans_help() -> str:
    from oddsbench.core.plans import PLAN_HELP

    return "\n".join(f"  {name:<16} {about}" for name, about in PLAN_HELP)


def register(commands) -> None:
    from oddsbench.model.defaults import NO_GOAL_DIGITS

    parser = commands.add_parser(
        "session",
        help="bankroll sessions: chance of the goal, risk of ruin, session length, betting plans",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description="A session repeats one round from a starting bankroll until the bankroll reaches "
        "the goal, falls to the floor (stop-loss), can no longer cover the minimum bet (ruin), or the "
        "time cap is hit. Figures for each betting plan, exact beside decimal: chance of the goal, of "
        "ruin, expected rounds and their variance, expected total staked, expected final bankroll and "
        "its distribution, and the optional-stopping check. With --goal none: the chance that play "
        "with no goal ever ends in ruin, exactly.",
        epilog="Betting plans (--plan, repeatable; amounts are money, exact, e.g. 1/2):\n"
        + _plans_help()
        + "\n\nEvery bet is raised to --min-bet, cut to --max-bet and to what the bankroll covers for the "
        "round's worst loss (extra stakes included).\nWith --goal none only flat, timid, martingale and "
        "paroli can be played (their bet stays bounded).\nA ruleset's [session] table gives defaults "
        "(bankroll, goal, floor, min_bet, max_bet, unit, max_rounds); options override them.\n"
        "Examples:\n  oddsbench session rulesets/single-zero-wheel.toml --bankroll 100 --goal 200 "
        "--plan flat:1 --plan bold\n  oddsbench session --round '1:18/37,-1:19/37' --bankroll 10 --goal 20 "
        "--plan kelly:1/2 --plan best\n  oddsbench session --round '1:51/100,-1:49/100' --bankroll 20 "
        "--goal none --plan flat:1\n\nFigures are mathematics, not advice.",
    )
    parser.add_argument("file", nargs="?", help="ruleset file (TOML); or give --round instead")
    parser.add_argument(
        "--round",
        metavar="NET:PROB,...",
        help="an inline round instead of a file: net result per unit staked : probability, comma "
        "separated, e.g. '1:18/37,-1:19/37' (an optional third field is an extra stake)",
    )
    add_session_options(
        parser,
        "stop once the bankroll reaches or passes this; 'none': no goal, play until ruin (the risk of ruin "
        "of play with no goal, exact)",
    )
    parser.add_argument(
        "--rounds", type=positive_int, metavar="N", help="also ruin within N rounds and the bankroll after N"
    )
    parser.add_argument("--strategy", metavar="NAME", help="play the ruleset's named strategy in each round")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument(
        "--series", action="store_true", help="with --json: the goal chance for every starting bankroll"
    )
    parser.add_argument("--series-csv", metavar="FILE", help="write the goal chance for every starting bankroll as CSV")
    parser.add_argument("--force", action="store_true", help="let --series-csv replace an existing file")
    add_exact_limit(parser, None)
    parser.add_argument(
        "--digits",
        type=positive_int,
        default=NO_GOAL_DIGITS,
        metavar="N",
        help=f"with --goal none: significant digits of each decimal, each one proved (default {NO_GOAL_DIGITS})",
    )
    parser.add_argument(
        "--no-check",
        action="store_true",
        help="with --goal none: skip the exact truncation cross-check (faster for long bankrolls)",
    )
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import file_or_round, settings_of
    from oddsbench.core import session_settings, sessions
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.report.json_output import dumps
    from oddsbench.report.session_report import series_csv, session_json, session_text

    if args.series_csv:
        from oddsbench.model.atomic_write import check_target

        check_target(args.series_csv, force=args.force)  # refused before the work, not after it
    game = file_or_round(args, "session")
    settings = settings_of(args, sessions=True)
    if session_settings(game, settings.session).no_goal:
        for option, given in (("--series", args.series), ("--series-csv", args.series_csv)):
            if given:  # the core says the same of a number of rounds
                raise OddsbenchError(
                    f"{game.source}: {option} needs a goal; with --goal none the session only ends at ruin"
                )
    results = sessions(game, settings)
    if args.series_csv:
        from oddsbench.model.atomic_write import write_atomically

        write_atomically(args.series_csv, series_csv(results.bounded), force=args.force)
    print(dumps(session_json(results, series=args.series)) if args.json else session_text(results))
    return 0

"""``oddsbench report FILE``: a shareable report (Markdown, CSV or JSON), written atomically."""

from __future__ import annotations

import argparse
import sys

from oddsbench.cli.options import add_exact_limit, add_session_options, positive_int
from oddsbench.model.defaults import ROUND_EXACT_LIMIT
from oddsbench.report.writing import FORMATS


def register(commands) -> None:
    parser = commands.add_parser(
        "report",
        help="write a shareable report: every figure exact and decimal, ruleset, sources, cautions",
        description="Solve a ruleset and write every figure of a round (and of each named "
        "strategy, side by side) exactly and in decimals, with the ruleset echoed, the sources of "
        "the method and the cautions. The file is written whole or not at all; an existing file "
        "is kept unless --force.",
    )
    parser.add_argument("file", help="ruleset file (TOML)")
    parser.add_argument(
        "--format", choices=FORMATS, help="md, csv or json (default: from the --output suffix, else md)"
    )
    parser.add_argument("--output", "-o", metavar="PATH", help="file to write (default: print to the terminal)")
    parser.add_argument("--force", action="store_true", help="replace an existing output file")
    parser.add_argument(
        "--strategy",
        action="append",
        default=[],
        metavar="NAME",
        help="report this named strategy (repeat for several; default: every strategy in the file)",
    )
    parser.add_argument("--rounds", type=positive_int, metavar="N", help="also the chances of having ended by step N")
    add_exact_limit(parser, ROUND_EXACT_LIMIT)
    add_session_options(parser, switch=True)
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from oddsbench.cli.options import load_game, settings_of, wants_session
    from oddsbench.core import report_figures
    from oddsbench.model.atomic_write import check_target, write_atomically
    from oddsbench.report.writing import render_report, report_format

    if args.output is not None:
        check_target(args.output, force=args.force)  # refused before the work, not after it
    settings = settings_of(args, sessions=wants_session(args), strategies=tuple(args.strategy))
    fmt = report_format(args.format, args.output)
    rendered = render_report(report_figures(load_game(args.file), settings), fmt)
    if args.output is None:
        sys.stdout.write(rendered)
        return 0
    path = write_atomically(args.output, rendered, force=args.force)
    print(f"wrote {path} ({fmt}, {len(rendered.encode('utf-8')):,} bytes)")
    return 0

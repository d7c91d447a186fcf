"""Entry point: parse arguments, run one command, turn every expected failure into exit 2."""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence

from oddsbench import __version__
from oddsbench.cli import (
    best_command,
    check_command,
    report_command,
    simulate_command,
    solve_command,
    sweep_command,
)
from oddsbench.model.errors import OddsbenchError, RulesetError

COMMANDS = (check_command, solve_command, best_command, simulate_command, report_command, sweep_command)
EXIT_BAD_INPUT = 2


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="oddsbench",
        description="Exact and decimal mathematics of games of chance: house edge, risk of ruin, "
        "durations, strategies. Run without a command to open the workbench.",
        epilog="Figures are mathematics, not advice. Set limits of time and money.",
    )
    parser.add_argument("--version", action="version", version=f"oddsbench {__version__}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")
    for module in COMMANDS:
        module.register(commands)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.command is None:
        return _no_command(parser)
    try:
        return int(args.run(args) or 0)
    except RulesetError as error:
        for problem in error.problems:
            print(problem, file=sys.stderr)
        return EXIT_BAD_INPUT
    except OddsbenchError as error:
        print(f"oddsbench: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("oddsbench: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        # The reader (e.g. `head`) closed the pipe: stop quietly, as Unix tools do.
        import os

        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 141


def _no_command(parser: argparse.ArgumentParser) -> int:
    parser.print_help()
    return 0


def entry() -> None:
    sys.exit(main())

"""Entry point: parse arguments, run one command, turn every expected failure into exit 2."""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Sequence

from oddsbench import __version__
from oddsbench.cli import (
    best_command,
    check_command,
    open_command,
    report_command,
    session_command,
    simulate_command,
    solve_command,
    sweep_command,
)
from oddsbench.model.errors import OddsbenchError, RulesetError

COMMANDS = (
    check_command,
    solve_command,
    session_command,
    best_command,
    simulate_command,
    report_command,
    sweep_command,
    open_command,
)
EXIT_BAD_INPUT = 2
EXIT_INTERNAL = 70
EXIT_INTERRUPTED = 130
EXIT_BROKEN_PIPE = 141


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
    for stream in (sys.stdout, sys.stderr):
        if hasattr(stream, "reconfigure"):
            stream.reconfigure(errors="backslashreplace")  # odd names never crash the output
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        if args.command is None:
            return open_command.run_workbench(None)
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
        return EXIT_INTERRUPTED
    except BrokenPipeError:
        # The reader went away (``| head``): stop quietly, and keep Python's exit flush quiet too.
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return EXIT_BROKEN_PIPE
    except MemoryError:
        print("oddsbench: out of memory: lower --exact-limit or --max-states", file=sys.stderr)
        return EXIT_BAD_INPUT
    except Exception as error:  # the last line of defence: one line, never a traceback
        if os.environ.get("ODDSBENCH_DEBUG"):
            raise
        message = " ".join(str(error).split())[:300]
        print(
            f"oddsbench: internal error: {type(error).__name__}: {message} "
            "(a bug: please report it; set ODDSBENCH_DEBUG=1 for the details)",
            file=sys.stderr,
        )
        return EXIT_INTERNAL


def entry() -> None:
    try:
        code = main()
    except KeyboardInterrupt:  # Ctrl-C before a command started (while parsing or importing)
        print("oddsbench: interrupted", file=sys.stderr)
        code = EXIT_INTERRUPTED
    sys.exit(code)

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
from oddsbench.cli.options import add_budget, budget_of
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
EXIT_TERMINATED = 143
WITHOUT_BUDGET = ("open",)  # the workbench bounds each analysis itself, not the session


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
    for name, command in commands.choices.items():
        if name not in WITHOUT_BUDGET:
            add_budget(command)
    return parser


class Terminated(BaseException):
    """SIGTERM, turned into an exception so that cleanups run (sweep workers and detached solves end)."""


def main(argv: Sequence[str] | None = None, hard_limits: bool = False) -> int:
    """Run one command; ``hard_limits`` (the real process, not a test calling in) also caps this
    process's memory at the budget, so an allocation past it fails instead of swapping."""
    from oddsbench.model import budget as budgets
    from oddsbench.model.families import state_limit

    for stream in (sys.stdout, sys.stderr):
        if hasattr(stream, "reconfigure"):
            stream.reconfigure(errors="backslashreplace")  # odd names never crash the output
    parser = build_parser()
    args = parser.parse_args(argv)
    budget = budget_of(args)
    if hard_limits and budget is not None:
        budgets.limit_process_memory(budget.memory_mb)
    try:
        if args.command is None:
            return open_command.run_workbench(None)
        with budgets.scope(budget), state_limit(getattr(args, "max_states", None)):
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
    except Terminated:
        print("oddsbench: terminated", file=sys.stderr)
        return EXIT_TERMINATED
    except BrokenPipeError:
        # The reader went away (``| head``): stop quietly, and keep Python's exit flush quiet too.
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return EXIT_BROKEN_PIPE
    except MemoryError:
        shown = budget or budgets.Budget()
        print(f"oddsbench: {budgets.over_memory('out of memory', shown)}", file=sys.stderr)
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


def _terminate(signum, frame) -> None:
    raise Terminated


def entry() -> None:
    import signal

    signal.signal(signal.SIGTERM, _terminate)
    try:
        code = main(hard_limits=True)
    except KeyboardInterrupt:  # Ctrl-C before a command started (while parsing or importing)
        print("oddsbench: interrupted", file=sys.stderr)
        code = EXIT_INTERRUPTED
    except Terminated:
        print("oddsbench: terminated", file=sys.stderr)
        code = EXIT_TERMINATED
    sys.exit(code)

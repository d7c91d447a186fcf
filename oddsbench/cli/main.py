"""Entry point: parse arguments, run one command, turn every expected failure into exit 2."""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Iterator, Sequence
from contextlib import contextmanager
from typing import NoReturn, TextIO

from oddsbench import __version__
from oddsbench.cli import (
    best_command,
    check_command,
    horizon_command,
    open_command,
    report_command,
    session_command,
    simulate_command,
    solve_command,
    sweep_command,
    tune_command,
)
from oddsbench.cli.options import add_budget, budget_of, error_line
from oddsbench.model.errors import OddsbenchError, RulesetError, one_line
from oddsbench.model.visible import visible

COMMANDS = (
    check_command,
    solve_command,
    session_command,
    best_command,
    simulate_command,
    report_command,
    sweep_command,
    horizon_command,
    tune_command,
    open_command,
)
EXIT_BAD_INPUT = 2
EXIT_INTERNAL = 70
EXIT_INTERRUPTED = 130
EXIT_BROKEN_PIPE = 141
EXIT_TERMINATED = 143
WITHOUT_BUDGET = ("open",)  # the workbench bounds each analysis itself, not the session


class OneLineParser(argparse.ArgumentParser):
    """argparse with a bad option as one line (and exit 2), not the whole usage block."""

    def error(self, message: str) -> NoReturn:
        self.exit(EXIT_BAD_INPUT, f"{self.prog}: {message} (see {self.prog} --help)\n")


# Options whose value may start with a minus sign (a losing net result, a negative amount):
# argparse would take ``--round -1:1/2,...`` for two options, so such a value is joined to its
# option as ``--round=-1:1/2,...`` before parsing.
SIGNED_VALUE_OPTIONS = frozenset(
    {"--round", "--target", "--between", "--floor", "--bankroll", "--goal", "--min-bet", "--max-bet", "--unit"}
    | {"--plan"}
)


def joined_signed_values(argv: Sequence[str]) -> list[str]:
    """``--round -1:1/2`` as ``--round=-1:1/2`` (only for a value that starts with a minus and a digit)."""
    joined: list[str] = []
    pending = False
    for arg in argv:
        if pending and len(arg) > 1 and arg[0] == "-" and (arg[1].isdigit() or arg[1] in "./("):
            joined[-1] = f"{joined[-1]}={arg}"
        else:
            joined.append(arg)
        pending = arg in SIGNED_VALUE_OPTIONS
    return joined


class VisibleStream:
    """A text stream whose text is written through ``visible``: nothing a file holds (a title, a
    name, a path) can drive the terminal. ``raw`` is the stream underneath (for our own progress bar)."""

    def __init__(self, raw: TextIO) -> None:
        self.raw = raw

    def write(self, text: str) -> int:
        self.raw.write(visible(text, multiline=True))
        return len(text)

    def __getattr__(self, name: str):
        return getattr(self.raw, name)


@contextmanager
def visible_output() -> Iterator[None]:
    """stdout and stderr made visible while one command runs (the workbench draws its own screen)."""
    streams = sys.stdout, sys.stderr
    sys.stdout, sys.stderr = VisibleStream(sys.stdout), VisibleStream(sys.stderr)
    try:
        yield
    finally:
        sys.stdout, sys.stderr = streams


def build_parser() -> argparse.ArgumentParser:
    parser = OneLineParser(
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
    for stream in (sys.stdout, sys.stderr):
        if hasattr(stream, "reconfigure"):
            stream.reconfigure(errors="backslashreplace")  # odd names never crash the output
    parser = build_parser()
    with visible_output():  # the workbench draws on the terminal itself (sys.__stderr__), not through these
        args = parser.parse_args(joined_signed_values(sys.argv[1:] if argv is None else argv))
        return _run(args, hard_limits)


def _run(args: argparse.Namespace, hard_limits: bool = False) -> int:
    """One command under its work budget, with every expected failure turned into its exit code and one line."""
    from oddsbench.model import budget as budgets
    from oddsbench.model.family_budget import state_limit

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
        print(one_line(f"oddsbench: {error_line(error)}"), file=sys.stderr)
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
        print(f"oddsbench: {budgets.over_memory('out of memory', budget or budgets.Budget())}", file=sys.stderr)
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

"""Problems found in a ruleset: one line each, naming file, place and field."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.model.visible import visible


@dataclass(frozen=True)
class Problem:
    """One finding about a ruleset. ``where`` names the state, outcome and field."""

    source: str
    where: str
    message: str
    severity: str = "error"  # "error" or "warning"

    @property
    def is_error(self) -> bool:
        return self.severity == "error"

    def __str__(self) -> str:
        label = "" if self.is_error else "warning: "
        place = f"{self.where}: " if self.where else ""
        return one_line(f"{self.source}: {label}{place}{self.message}")


MAX_LINE_LENGTH = 400


def one_line(text: str) -> str:
    """Whitespace folded to single spaces and the whole cut to a readable length: a hostile
    file cannot flood a terminal with one message."""
    line = visible(" ".join(text.split()))
    return line if len(line) <= MAX_LINE_LENGTH else line[: MAX_LINE_LENGTH - 3] + "..."


def shown_name(name: object, limit: int = 60) -> str:
    """A name from a file, quoted for a message and cut if very long."""
    shown = repr(name)
    return shown if len(shown) <= limit else shown[: limit - 4] + "...'"


class RulesetError(Exception):
    """A ruleset that cannot be used; carries every problem found."""

    def __init__(self, problems: list[Problem] | tuple[Problem, ...]) -> None:
        self.problems = tuple(problems)
        super().__init__("\n".join(str(problem) for problem in self.problems))

    @property
    def errors(self) -> tuple[Problem, ...]:
        return tuple(problem for problem in self.problems if problem.is_error)


class OddsbenchError(Exception):
    """A user-facing failure outside ruleset files (bad option values, limits); one line."""


class SettingProblem(OddsbenchError):
    """A setting (or settings that clash) wrong, said in the setting's own words.

    The command line, the workbench and the Python API set the same things in different ways
    (``--rounds N``, a field of a form, a keyword), so the message names a setting as the analysis
    knows it ("a number of rounds", "the target") and ``settings`` carries the keys (names of
    ``Settings``, ``SessionRequest``, the session table or a tune argument), the one to change
    first; each front end adds its own way to change them (``with_ways``) from its one table: the
    command line's options (``cli/options.py``), the workbench's fields (``tui/setting_ways.py``)."""

    def __init__(self, message: str, *settings: str) -> None:
        super().__init__(message)
        self.settings = settings


class SettingError(SettingProblem):
    """A session setting missing or wrong; a form shows ``reason`` beside the field of ``setting``."""

    def __init__(self, message: str, setting: str, reason: str) -> None:
        super().__init__(message, setting)
        self.setting = setting
        self.reason = reason


def with_ways(error: BaseException, way: Callable[[str], str | None], lead: str = "") -> str:
    """The error's line, and for a setting problem the front end's ways to change the settings it
    names, after ``lead`` (``way(key)``; None where that front end has no way: the line is left as
    the core said it)."""
    line = str(error)
    if not isinstance(error, SettingProblem):
        return line
    ways = [found for found in (way(key) for key in error.settings) if found]
    return f"{line} ({lead}{', '.join(dict.fromkeys(ways))})" if ways else line


def type_name(value: object) -> str:
    """A TOML value's kind in words, for messages such as "must be text, not a whole number"."""
    return {
        bool: "true/false",
        int: "a whole number",
        float: "a decimal number",
        str: "text",
        list: "a list",
        dict: "a table",
    }.get(type(value), type(value).__name__)

"""Problems found in a ruleset: one line each, naming file, place and field."""

from __future__ import annotations

from dataclasses import dataclass


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
        return _one_line(f"{self.source}: {label}{place}{self.message}")


def _one_line(text: str) -> str:
    return " ".join(text.split())


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

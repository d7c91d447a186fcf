"""Every problem of the current text, as ``oddsbench check`` prints them."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from oddsbench.model.errors import Problem


class ProblemsPanel(Static):
    """Errors first in their own colour; a short line when the ruleset is valid."""

    def show(self, problems: tuple[Problem, ...], valid_line: str) -> None:
        text = Text()
        ordered = [p for p in problems if p.is_error] + [p for p in problems if not p.is_error]
        for problem in ordered:
            if text:
                text.append("\n")
            text.append(str(problem), style="red" if problem.is_error else "yellow")
        if not ordered:
            text.append(valid_line, style="green")
        self.update(text)
        self.set_class(any(p.is_error for p in problems), "-errors")

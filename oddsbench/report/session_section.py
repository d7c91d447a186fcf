"""The session comparison of a report: each betting plan's figures side by side, exact and decimal.

With a goal, one table with a column pair per plan; with no goal, one table per plan (its ruin
figures). The JSON is the ``session --json`` object without its envelope.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from oddsbench.model.numbers import text
from oddsbench.report.numbers_text import csv_decimal, exact_text, figure_decimal_text

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import SessionResults

MD_EXACT_WIDTH = 60


def _label(name: str) -> str:
    return name.replace("_", " ")


def _setting_text(value: Any) -> str:
    return str(value) if isinstance(value, int) else text(value)


@dataclass(frozen=True)
class SessionSection:
    """Every plan solved with one set of session settings, as the core returned them."""

    results: SessionResults
    json_key: str = "sessions"

    @property
    def settings(self) -> tuple[tuple[str, Any], ...]:
        shown = []
        for name, value in vars(self.results.settings).items():
            if name == "goal" and value is None:
                shown.append((name, "none"))
            elif value is not None:
                shown.append((name, value))
        return tuple(shown)

    @property
    def plans(self) -> list[str]:
        return [plan.plan for plan in self.results.plans]

    def names(self) -> list[str]:
        order: list[str] = []
        for result in self.results.bounded:
            order += [name for name in result.figures if name not in order]
        return order

    def markdown_lines(self) -> list[str]:
        from oddsbench.report.render_markdown import _table

        settings = ", ".join(f"{name} {_setting_text(value)}" for name, value in self.settings)
        strategy = self.results.strategy
        play = f" Each round is played with strategy `{strategy}`." if strategy else ""
        lines = ["## Sessions compared", "", f"Settings: {settings}.{play}", ""]
        if self.results.no_goal:
            return lines + self._no_goal_markdown(_table)
        headers = ["quantity"]
        for plan in self.plans:
            headers += [f"{plan} exact", f"{plan} decimal"]
        rows = []
        for name in self.names():
            row = [_label(name)]
            for result in self.results.bounded:
                figure = result.figures.get(name)
                if figure is None:
                    row += ["-", "-"]
                else:
                    row += [exact_text(figure.exact, MD_EXACT_WIDTH), figure_decimal_text(figure)]
            rows.append(row)
        lines += _table(headers, rows)
        notes = [f"- Note ({r.plan}): {note}" for r in self.results.plans for note in r.notes]
        return lines + ([""] + notes if notes else [])

    def _no_goal_markdown(self, table) -> list[str]:
        from oddsbench.report.no_goal_report import no_goal_rows

        lines: list[str] = []
        for plan in self.results.plans:
            lines += [f"### Plan `{plan.plan}`: no goal, play until ruin", ""]
            lines += table(["quantity", "exact", "decimal"], [list(row) for row in no_goal_rows(plan.no_goal)])
            lines += [""] + [f"- Note: {note}" for note in plan.notes] + [""]
        return lines

    def csv_rows(self) -> list[tuple[str, str, str, str, str, str]]:
        rows = [("session", "settings", name, _setting_text(value), "", "") for name, value in self.settings]
        for plan in self.results.plans:
            if plan.bounded is not None:
                for name, figure in plan.bounded.figures.items():
                    exact = "" if figure.exact is None else text(figure.exact)
                    rows.append(("session", plan.plan, name, exact, csv_decimal(figure), ""))
            else:
                from oddsbench.report.no_goal_report import no_goal_rows

                rows += [
                    ("session", plan.plan, label, exact, decimal, "")
                    for label, exact, decimal in no_goal_rows(plan.no_goal)
                ]
            rows += [("note", plan.plan, "", "", "", note) for note in plan.notes]
        return rows

    def json_value(self) -> dict[str, Any]:
        from oddsbench.report.session_report import plans_json, round_outcomes_json, settings_json

        results = self.results
        return {
            "settings": settings_json(results.settings),
            "strategy": results.strategy,
            "round": round_outcomes_json(results.distribution),
            "plans": plans_json(results),
        }

"""The session comparison of a report: each betting plan's figures side by side, exact and decimal."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from oddsbench.model.numbers import text
from oddsbench.report.numbers_text import decimal_text, exact_text

MD_EXACT_WIDTH = 60


def _label(name: str) -> str:
    return name.replace("_", " ")


def _setting_text(value: Any) -> str:
    return str(value) if isinstance(value, int) else text(value)


@dataclass(frozen=True)
class SessionSection:
    """Plans solved with one set of session settings (``results``: one ``SessionFigures`` per plan)."""

    settings: tuple[tuple[str, Any], ...]
    results: tuple[Any, ...]
    strategy: str | None = None
    json_key: str = "sessions"

    @property
    def plans(self) -> list[str]:
        return [result.plan for result in self.results]

    def names(self) -> list[str]:
        order: list[str] = []
        for result in self.results:
            order += [name for name in result.figures if name not in order]
        return order

    def markdown_lines(self) -> list[str]:
        from oddsbench.report.render_markdown import _table

        settings = ", ".join(f"{name} {_setting_text(value)}" for name, value in self.settings)
        play = f" Each round is played with strategy `{self.strategy}`." if self.strategy else ""
        lines = ["## Sessions compared", "", f"Settings: {settings}.{play}", ""]
        headers = ["quantity"]
        for plan in self.plans:
            headers += [f"{plan} exact", f"{plan} decimal"]
        rows = []
        for name in self.names():
            row = [_label(name)]
            for result in self.results:
                figure = result.figures.get(name)
                if figure is None:
                    row += ["-", "-"]
                else:
                    row += [exact_text(figure.exact, MD_EXACT_WIDTH), decimal_text(figure.decimal, figure.exact)]
            rows.append(row)
        lines += _table(headers, rows)
        notes = [f"- Note ({r.plan}): {note}" for r in self.results for note in r.notes]
        return lines + ([""] + notes if notes else [])

    def csv_rows(self) -> list[tuple[str, str, str, str, str, str]]:
        rows = [("session", "settings", name, _setting_text(value), "", "") for name, value in self.settings]
        for result in self.results:
            for name, figure in result.figures.items():
                exact = "" if figure.exact is None else text(figure.exact)
                rows.append(("session", result.plan, name, exact, repr(figure.decimal), ""))
            rows += [("note", result.plan, "", "", "", note) for note in result.notes]
        return rows

    def json_value(self) -> dict[str, Any]:
        return {
            "settings": {name: _setting_text(value) for name, value in self.settings},
            "strategy": self.strategy,
            "plans": [
                {
                    "plan": result.plan,
                    "states": result.states,
                    "figures": {
                        name: {"exact": None if f.exact is None else text(f.exact), "decimal": f.decimal}
                        for name, f in result.figures.items()
                    },
                    "final_bankroll": [
                        {
                            "money": text(v.money),
                            "kind": v.kind,
                            "exact": None if v.chance.exact is None else text(v.chance.exact),
                            "decimal": v.chance.decimal,
                        }
                        for v in result.final
                    ],
                    "notes": list(result.notes),
                }
                for result in self.results
            ],
        }


def session_section(ruleset, policy: dict[str, str], strategy: str | None, settings, plans, exact_limit: int):
    """Solve every plan with the session solver and wrap them for the report."""
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.solve.round_distribution import round_distribution
    from oddsbench.strategy.session import analyse_session

    distribution = round_distribution(build_round_chain(ruleset, policy))
    results = tuple(analyse_session(distribution, settings, plan, exact_limit) for plan in plans)
    shown = tuple((name, value) for name, value in vars(settings).items() if value is not None)
    return SessionSection(shown, results, strategy)

"""What the family forms show of a family's members: each member's index values and outcomes as the
reader expanded them, and the round's figures from a member, asked of the core.

Pure (no textual): the member list comes from the reading (``LoadResult.members`` and
``member_tables``), the figures from ``core.round_figures`` with the member as the start, and
every number as text from the report layer.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.families import FamilyMember
from oddsbench.model.numbers import text
from oddsbench.model.ruleset import Ruleset

MAX_LISTED = 2_000  # members shown in the table; the count says how many there are


@dataclass(frozen=True)
class MemberRow:
    """One member: its state name, its index values as text, and its outcomes as the reader made them."""

    state: str
    index: tuple[tuple[str, str], ...]
    outcomes: tuple[tuple[str, dict[str, str]], ...]  # (action or "", fields as text)

    @property
    def kind(self) -> str:
        if not self.outcomes:
            return "end"
        return "decision" if any(action for action, _ in self.outcomes) else "outcomes"


def members_of(
    family: str, members: Mapping[str, FamilyMember], tables: Mapping[str, Mapping[str, Any]]
) -> tuple[int, tuple[MemberRow, ...]]:
    """How many states the family makes, and the first ``MAX_LISTED`` of them."""
    names = [name for name, member in members.items() if member.family == family]
    rows = []
    for name in names[:MAX_LISTED]:
        table = tables.get(name, {})
        outcomes: list[tuple[str, dict[str, str]]] = []
        for item in table.get("outcomes", []) or []:
            outcomes.append(("", _fields(item)))
        for action, listed in (table.get("choices") or {}).items():
            outcomes += [(str(action), _fields(item)) for item in listed or []]
        index = tuple((variable, text(value)) for variable, value in members[name].index)
        rows.append(MemberRow(name, index, tuple(outcomes)))
    return len(names), tuple(rows)


def _fields(item: Any) -> dict[str, str]:
    if not isinstance(item, Mapping):
        return {}
    return {key: str(item[key]) for key in ("to", "prob", "pay", "stake", "note") if key in item}


@dataclass(frozen=True)
class MemberFigures:
    """The round from one member: a heading and quantity | exact | decimal rows (report text)."""

    heading: str
    rows: tuple[tuple[str, str, str], ...]


def member_figures(
    ruleset: Ruleset, state: str, strategy: str | None, should_stop: Callable[[], bool] | None = None
) -> MemberFigures:
    """One round started at ``state`` under ``strategy`` (games with decisions); raises
    ``OddsbenchError`` when the core cannot answer (``Cancelled`` when stopped)."""
    from oddsbench.core.game import Game
    from oddsbench.core.rounds import round_figures
    from oddsbench.core.settings import Settings
    from oddsbench.core.work import Work
    from oddsbench.report.round_report import round_rows

    if ruleset.state(state).is_end:
        return MemberFigures(f"{state!r} ends the round: nothing to solve from here", ())
    played = (strategy,) if strategy is not None and ruleset.has_decisions else ()
    if ruleset.has_decisions and not played:
        raise OddsbenchError("the game has decisions and no named strategy: add one to see figures from a member")
    work = Work(should_stop=should_stop) if should_stop is not None else Work()
    results = round_figures(Game(ruleset.source, ruleset=ruleset), Settings(starts=state, strategies=played), work)
    figures = results.columns[0].figures
    heading = f"one round from {state!r}" + (f" under {played[0]!r}" if played else "")
    return MemberFigures(heading, tuple(round_rows(figures)))

"""A report's content, gathered once and rendered to Markdown, CSV or JSON by the renderers."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

from oddsbench import __version__
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.method_sources import ROUND_SOURCES, MethodSource
from oddsbench.solve.round import RoundFigures, solve_round
from oddsbench.strategy.compare import named_strategy, strategy_policy


@dataclass(frozen=True)
class RoundSection:
    """One round's figures under one way of playing (``strategy`` None: no decisions)."""

    strategy: str | None
    policy: dict[str, str]
    figures: RoundFigures


@dataclass(frozen=True)
class ReportDocument:
    ruleset: Ruleset
    content: str
    rounds: tuple[RoundSection, ...]
    sources: tuple[MethodSource, ...] = ROUND_SOURCES
    cautions: tuple[str, ...] = CAUTIONS
    extra_sections: tuple[Any, ...] = field(default=())
    version: str = __version__

    @property
    def compares_strategies(self) -> bool:
        return len(self.rounds) > 1


def round_sections(
    ruleset: Ruleset, strategies: Sequence[str] = (), rounds: int | None = None, exact_limit: int = 5_000
) -> tuple[RoundSection, ...]:
    """The round under each requested strategy; all of the file's when none is named."""
    names: list[str | None] = list(strategies)
    if not names:
        if ruleset.has_decisions:
            names = [s.name for s in ruleset.strategies]
            if not names:
                raise OddsbenchError(f"{ruleset.source}: has decision states but no strategies to report on")
        else:
            names = [None]
    sections = []
    for name in names:
        policy = strategy_policy(ruleset, named_strategy(ruleset, name)) if name is not None else {}
        figures = solve_round(build_round_chain(ruleset, policy), rounds=rounds, exact_limit=exact_limit)
        sections.append(RoundSection(name, policy, figures))
    return tuple(sections)


def build_report(
    ruleset: Ruleset,
    content: str,
    strategies: Sequence[str] = (),
    rounds: int | None = None,
    exact_limit: int = 5_000,
) -> ReportDocument:
    """Everything a round report shows, solved now."""
    return ReportDocument(ruleset, content, round_sections(ruleset, strategies, rounds, exact_limit))

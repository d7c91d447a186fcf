"""A figure of one round at chosen values of one parameter, exactly: what ``tune`` is built on.

``FigureAt`` reads the ruleset text once and, for each value of the parameter, reads it again with
that value, builds the chain of the one play asked for and solves it exactly (values are cached).
A value where the file is not valid (a probability outside [0, 1], sums not 1, a round that can
never end) gives the reader's first problem instead of a figure.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

from oddsbench.core.game import Game, game_from_text
from oddsbench.core.settings import Settings
from oddsbench.core.work import Work
from oddsbench.model.errors import OddsbenchError, RulesetError
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.return_table import CHANCE_FIGURES, rational_sqrt

ROUND_FIGURES = (
    "house_edge",
    "return_to_player",
    "expected_net",
    "expected_staked",
    "net_variance",
    "net_sd",
    "expected_steps",
    "steps_variance",
    *CHANCE_FIGURES,
)


@dataclass(frozen=True)
class Point:
    """One value of the parameter: the chain's shape (states and edges), its transient rows'
    chances, the figure's exact value (``figure``), or why the file is not valid there (``problem``)."""

    value: Rational
    figure: Rational | None = None
    shape: tuple | None = None
    rows: tuple[tuple[Rational, ...], ...] = ()
    nodes: int = 0
    problem: str | None = None


class FigureAt:
    """The exact value of one figure of one play, at any value of one parameter."""

    def __init__(self, game: Game, name: str, figure: str, strategy: str | None, settings: Settings, work: Work):
        self.game = game
        self.name = name
        self.figure = figure
        self.strategy = strategy
        self.settings = settings
        self.work = work
        self.cache: dict[Rational, Point] = {}
        self.solves = 0

    def __call__(self, value: Rational) -> Point:
        if value not in self.cache:
            self.cache[value] = self._point(value)
        return self.cache[value]

    def _point(self, value: Rational) -> Point:
        from oddsbench.solve.round import solve_round
        from oddsbench.strategy.compare import play_chain

        if self.work.should_stop():
            from oddsbench.core.work import Cancelled

            raise Cancelled
        try:
            overrides = {**dict(self.game.params), self.name: value}
            ruleset = game_from_text(self.game.text or "", self.game.source, overrides).ruleset
            chain = play_chain(ruleset, self.settings.starts, self.strategy, self.settings.max_states)
        except RulesetError as error:
            return Point(value, problem=str(error.errors[0] if error.errors else error.problems[0]))
        except OddsbenchError as error:
            return Point(value, problem=str(error))
        self.solves += 1
        figures = solve_round(
            chain,
            exact_limit=self.settings.round_exact_limit,
            should_stop=self.work.should_stop,
            exact_bits=self.settings.exact_bits,
            with_return_table=self.figure in CHANCE_FIGURES,
        )
        shape = (chain.names, tuple((e.source, e.target) for e in chain.edges))
        rows = tuple(tuple(e.prob for e in chain.edges if e.source == i) for i in range(chain.transient_count))
        nodes = figures.return_table.nodes if figures.return_table is not None else 0
        return Point(value, _figure_of(figures, self.figure, chain.title), shape, rows, nodes)


def _figure_of(figures, name: str, title: str) -> Rational:
    """The exact value of a figure by name (``end:STATE``, ``result:LABEL`` too); ``net_sd`` is given squared."""
    if name.startswith("end:"):
        found = figures.end_probability.get(name[4:])
    elif name.startswith("result:"):
        found = figures.result_probability.get(name[7:])
    elif name == "net_sd":
        variance, staked = figures.figures.get("net_variance"), figures.figures.get("expected_staked")
        if variance is None or staked is None or variance.exact is None or staked.exact is None or staked.exact == 0:
            raise OddsbenchError(f"{title}: net_sd needs the exact variance and something staked")
        return variance.exact / (staked.exact * staked.exact)
    else:
        found = figures.figures.get(name)
        if found is None:
            why = "; ".join(figures.notes) or "it does not apply to this round"
            raise OddsbenchError(f"{title}: no {name} in this round ({why})")
    if found is None:  # an end state or label not reached under this value: chance exactly 0
        return QQ(0)
    if found.exact is None:
        raise OddsbenchError(
            f"{title}: tuning needs the exact {name}, and exact arithmetic was skipped ({'; '.join(figures.notes)})"
        )
    return found.exact


def spread(center: Rational, step: Rational) -> Iterator[Rational]:
    """center, center + step, center - step, center + 2 step, ...: values near the file's own."""
    yield center
    k = 1
    while True:
        yield center + k * step
        yield center - k * step
        k += 1


def shown_figure(figure: str, value: Rational) -> Figure:
    """A figure's value as shown: ``net_sd`` is held squared (variance / staked^2) and shown as its root."""
    if figure == "net_sd":
        root = rational_sqrt(value)
        return Figure(root, to_float(root) if root is not None else math.sqrt(to_float(value)))
    return Figure(value, to_float(value))

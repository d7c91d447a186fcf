"""The total net after N independent rounds: ``horizon(game, rounds, settings, work) -> HorizonResults``.

One round's net law comes from the round solver's return table (a ruleset, under one play) or from
an inline round (``--round NET:PROB,...``: nets per unit staked); ``solve/horizon.py`` convolves it.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass

from oddsbench.core.game import Game
from oddsbench.core.settings import DEFAULTS, Settings
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.horizon import Horizon, TooManyRounds, horizons

__all__ = ["Horizon", "HorizonResults", "TooManyRounds", "horizon", "parse_rounds"]


@dataclass(frozen=True)
class HorizonResults:
    """One round's net law and its figures, then the law after each number of rounds asked for.

    ``expected_staked`` is None for a game of points (nothing staked): no return to player then.
    """

    title: str
    start: str | None
    strategy: str | None
    law: tuple[tuple[Rational, Rational], ...]
    expected_net: Figure
    net_variance: Figure
    expected_staked: Figure | None
    horizons: tuple[Horizon, ...]
    notes: tuple[str, ...] = ()

    @property
    def return_to_player(self) -> Figure | None:
        if self.expected_staked is None:
            return None
        value = 1 + self.expected_net.exact / self.expected_staked.exact
        return Figure(value, to_float(value))


ROUNDS_DIGITS = 12  # digits of one number of rounds read from text (the solver refuses past its own limit)


def parse_rounds(text: str) -> tuple[int, ...]:
    """Numbers of rounds typed as ``1, 10, 100`` (``1_000`` allowed), each at least 1: in increasing
    order, repeats dropped (tables and charts run along N).

    Raises OddsbenchError with one line naming the item that does not read (a comma inside a number,
    as in ``1,000``, is taken for a separator: the message says so)."""
    items = [item.strip().replace("_", "") for item in text.split(",")]
    if not any(items):
        raise OddsbenchError(f"expected whole numbers of rounds such as 1,10,100, got {text[:40]!r}")
    values: list[int] = []
    for item in filter(None, items):
        if not item.isascii() or not item.isdigit() or len(item) > ROUNDS_DIGITS:
            raise OddsbenchError(f"expected whole numbers of rounds such as 1,10,100, got {item[:20]!r}")
        if len(item) > 1 and item.startswith("0"):
            raise OddsbenchError(f"{item!r}: commas separate the numbers of rounds: write 1000 or 1_000, not 1,000")
        value = int(item)
        if value < 1:
            raise OddsbenchError(f"a number of rounds is at least 1, got {value}")
        values.append(value)
    return tuple(sorted(set(values)))


@budgeted
def horizon(game: Game, rounds: Sequence[int], settings: Settings = DEFAULTS, work: Work = NO_WORK) -> HorizonResults:
    """The law of the total net after each N in ``rounds`` independent rounds, played as ``settings`` says."""
    if not rounds:
        raise SettingProblem(f"{game.source}: give the numbers of rounds, e.g. 1,10,100", "rounds")
    if game.round is not None:
        distribution = game.round
        law: dict[Rational, Rational] = {}
        for outcome in distribution.outcomes:
            law[outcome.net] = law.get(outcome.net, QQ(0)) + outcome.prob
        pairs = tuple(sorted(law.items()))
        staked = distribution.expected_staked
        start, strategy, notes = None, None, ()
    else:
        pairs, staked, start, strategy, notes = _ruleset_law(game, settings, work)
    mean = sum((net * prob for net, prob in pairs), QQ(0))
    variance = sum((net * net * prob for net, prob in pairs), QQ(0)) - mean * mean
    stake = None if staked == 0 else staked
    solved = horizons(pairs, stake, rounds, work.should_stop)
    return HorizonResults(
        title=game.title,
        start=start,
        strategy=strategy,
        law=pairs,
        expected_net=Figure(mean, to_float(mean)),
        net_variance=Figure(variance, to_float(variance)),
        expected_staked=None if stake is None else Figure(stake, to_float(stake)),
        horizons=solved,
        notes=notes,
    )


def _ruleset_law(game: Game, settings: Settings, work: Work):
    from oddsbench.core.rounds import one_play, round_figures

    ruleset = game.need_ruleset("a horizon")
    one_play(ruleset, settings, "a horizon")
    column = round_figures(game, dataclasses.replace(settings, rounds=None), work).columns[0]
    figures = column.figures
    table = figures.return_table
    if table is None or table.law is None:
        why = "; ".join(note for note in figures.notes if "not listed" in note) or "it is not listed"
        raise OddsbenchError(f"{ruleset.source}: a horizon needs the round's net law: {why}")
    pairs = tuple((value.net, value.probability) for value in table.law)
    staked = figures.figures["expected_staked"].exact
    return pairs, staked, figures.start, column.strategy, figures.notes

"""Monte Carlo of bankroll sessions: every live session plays its next round at the same time.

Each round of each live session is played on the round's own chain (``RoundPlayer``), so the
check covers the round distribution a session is built on as well as the session solver; the
round's result (net and extra stake per unit of initial stake) is matched to its outcome of
the distribution, and the session moves by the bankroll chain's bet for its state. A
distribution given without a ruleset is drawn from directly. Sessions stop at the goal, at the
floor, at ruin, or at the round cap, like the chain they check.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import to_float
from oddsbench.simulate.alias_table import build_alias_tables
from oddsbench.simulate.moments import CrossMoment, Moments
from oddsbench.simulate.round_sim import MAX_TRIALS, RoundPlayer, SimulationCancelled

if TYPE_CHECKING:
    from oddsbench.chain.bankroll import BankrollChain

SESSION_BATCH = 1 << 15
DEFAULT_MAX_ROUNDS = 1_000_000
MATCH_DIGITS = 9
END_KINDS = ("goal", "ruin", "floor", "time_cap", "unfinished")


@dataclass
class SessionSample:
    """How the simulated sessions ended, and moments of rounds, staked and final bankroll."""

    title: str
    plan: str
    trials: int
    seed: int
    start_bankroll: float
    ends: dict[str, int] = field(default_factory=lambda: dict.fromkeys(END_KINDS, 0))
    rounds: Moments = field(default_factory=Moments)
    staked: Moments = field(default_factory=Moments)
    final: Moments = field(default_factory=Moments)
    final_staked: CrossMoment = field(default_factory=CrossMoment)
    rounds_played: int = 0
    seconds: float = 0.0
    max_rounds: int | None = None
    safety_rounds: int = DEFAULT_MAX_ROUNDS
    played_on_chain: bool = True

    @property
    def unfinished(self) -> int:
        return self.ends["unfinished"]

    @property
    def rounds_per_second(self) -> float:
        return self.rounds_played / self.seconds if self.seconds > 0 else float("inf")


class _OutcomeMatcher:
    """Round results (net, extra per unit of initial stake) to the distribution's outcome index."""

    def __init__(self, outcomes) -> None:
        self.index = {
            (round(to_float(o.net), MATCH_DIGITS), round(to_float(o.extra), MATCH_DIGITS)): k
            for k, o in enumerate(outcomes)
        }
        nets = np.array([to_float(o.net) for o in outcomes])
        self.order = np.argsort(nets, kind="stable")
        self.sorted_nets = nets[self.order]
        self.extras = np.array([to_float(o.extra) for o in outcomes])
        self.nets_unique = len(np.unique(np.round(nets, MATCH_DIGITS))) == len(nets)

    def __call__(self, net: np.ndarray, extra: np.ndarray) -> np.ndarray:
        if self.nets_unique:  # the usual case: the net result alone names the outcome
            spot = np.clip(np.searchsorted(self.sorted_nets, net), 1, max(len(self.sorted_nets) - 1, 1))
            left = np.maximum(spot - 1, 0)
            spot = np.minimum(spot, len(self.sorted_nets) - 1)
            nearer = np.where(np.abs(self.sorted_nets[left] - net) <= np.abs(self.sorted_nets[spot] - net), left, spot)
            k = self.order[nearer]
            tolerance = 10.0**-MATCH_DIGITS * (1 + np.abs(net))
            if np.all(np.abs(self.sorted_nets[nearer] - net) <= tolerance) and np.all(
                np.abs(self.extras[k] - extra) <= tolerance
            ):
                return k
        return self._by_pairs(net, extra)

    def _by_pairs(self, net: np.ndarray, extra: np.ndarray) -> np.ndarray:
        pairs = np.column_stack([np.round(net, MATCH_DIGITS), np.round(extra, MATCH_DIGITS)])
        unique, inverse = np.unique(pairs, axis=0, return_inverse=True)
        found = np.empty(len(unique), dtype=np.int64)
        for row, (n, x) in enumerate(unique.tolist()):
            k = self.index.get((n + 0.0, x + 0.0))
            if k is None:
                raise OddsbenchError(
                    f"simulation: a round ended with net {n:g} and extra stake {x:g} per unit, which the "
                    "round's distribution does not list: the distribution and the round chain disagree"
                )
            found[row] = k
        return found[inverse.reshape(-1)]


def simulate_session(
    chain: BankrollChain,
    trials: int,
    seed: int,
    round_player: RoundPlayer | None = None,
    max_rounds: int | None = None,
    safety_rounds: int = DEFAULT_MAX_ROUNDS,
    plan: str = "",
    batch_size: int = SESSION_BATCH,
    should_stop: Callable[[], bool] | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> SessionSample:
    """Play ``trials`` sessions of the bankroll ``chain`` with ``numpy.random.default_rng(seed)``;
    ``should_stop`` is asked every round (``SimulationCancelled``), ``progress(done, trials)`` hears
    after each batch."""
    if not 1 <= trials <= MAX_TRIALS:
        raise OddsbenchError(f"trials must be between 1 and {MAX_TRIALS:,}, got {trials:,}")
    began = time.perf_counter()
    grid = chain.grid
    step = to_float(grid.step)
    unit = to_float(grid.unit)
    outcomes = chain.distribution.outcomes
    staked_per_unit = np.array([1 + to_float(o.extra) for o in outcomes])
    sample = SessionSample(
        title=chain.distribution.title,
        plan=plan,
        trials=trials,
        seed=seed,
        start_bankroll=grid.start * step,
        max_rounds=max_rounds,
        safety_rounds=safety_rounds,
        played_on_chain=round_player is not None,
    )
    from oddsbench.chain.bankroll import KIND_NAMES

    kind_map = np.array([END_KINDS.index(name) for name in KIND_NAMES], dtype=np.int64)
    rng = np.random.default_rng(seed)
    if round_player is None:
        probs = np.array([to_float(o.prob) for o in outcomes])
        direct = build_alias_tables(np.zeros(len(outcomes), dtype=np.int64), probs, 1)
        matcher = None
    else:
        matcher = _OutcomeMatcher(outcomes)
    cap = safety_rounds if max_rounds is None else min(max_rounds, safety_rounds)
    done = 0
    while done < trials:
        size = min(batch_size, trials - done)
        final = np.zeros(size)
        staked = np.zeros(size)
        rounds = np.zeros(size)
        kind = np.full(size, END_KINDS.index("unfinished"), dtype=np.int64)
        start = chain.start
        if start < 0:
            kind[:] = kind_map[int(chain.absorbing_kinds[-1 - start])]
            final[:] = chain.absorbing_values[-1 - start] * step
            live = np.zeros(0, dtype=np.int64)
            state = live
        else:
            live = np.arange(size)
            state = np.full(size, start, dtype=np.int64)
        played = 0
        while live.size and played < cap:
            if should_stop is not None and should_stop():
                raise SimulationCancelled
            if matcher is None:
                k = direct.draw(np.zeros(live.size, dtype=np.int64), rng)
            else:
                end, net, total, _, _ = round_player.play(live.size, rng)
                if (end < 0).any():
                    raise OddsbenchError("simulation: a round did not end within its step limit")
                k = matcher(net / round_player.stake, total / round_player.stake - 1)
            staked[live] += chain.bets[state] * unit * staked_per_unit[k]
            nxt = chain.target[state, k]
            played += 1
            rounds[live] = played
            sample.rounds_played += live.size
            absorbed = nxt < 0
            if absorbed.any():
                which = -1 - nxt[absorbed]
                ended = live[absorbed]
                kind[ended] = kind_map[chain.absorbing_kinds[which]]
                final[ended] = chain.absorbing_values[which] * step
                live, nxt = live[~absorbed], nxt[~absorbed]
            state = nxt
        if live.size:
            final[live] = chain.values[state] * step
            if max_rounds is not None and played >= max_rounds:
                kind[live] = END_KINDS.index("time_cap")
        for index, name in enumerate(END_KINDS):
            sample.ends[name] += int((kind == index).sum())
        counted = kind != END_KINDS.index("unfinished")
        sample.rounds.add(rounds[counted])
        sample.staked.add(staked[counted])
        sample.final.add(final[counted])
        sample.final_staked.add(final[counted], staked[counted])
        done += size
        if progress is not None:
            progress(done, trials)
    sample.seconds = time.perf_counter() - began
    return sample

"""Monte Carlo of one round: every live trial steps through the absorbing chain at once.

Each batch starts all its trials at the start state; at every step each live trial draws its
edge from its state's alias table, adds the edge's pay and extra stake, and leaves the batch
when it reaches an end state. Batches have a fixed size, so a seed gives the same sample on
any machine and at any trial count the prefix of batches agrees.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from oddsbench.chain.round_chain import RoundChain
from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.numbers import to_float
from oddsbench.simulate.alias_table import build_alias_tables
from oddsbench.simulate.moments import CrossMoment, Moments
from oddsbench.solve.cancel import SolveCancelled

BATCH_SIZE = 1 << 18
DEFAULT_MAX_STEPS = 1_000_000
MAX_TRIALS = 10**10
STEP_BUDGET = 1_000_000_000  # trial-steps in one run: about a minute or two of sampling


class StepBudgetExceeded(SettingProblem):
    """A simulation whose rounds are so long that it would run for many minutes: fewer trials or a
    lower cap on each round's steps would end it (each front end names its way to change them)."""


class SimulationCancelled(SolveCancelled):
    """Raised between steps when the caller's ``should_stop`` says so (a cancelled solve, to the core)."""


@dataclass
class RoundSample:
    """What the trials of one round showed: end counts and moments of net, staked and steps."""

    title: str
    start: str
    trials: int
    seed: int
    stake: float
    end_names: tuple[str, ...]
    end_results: tuple[str | None, ...]
    end_counts: np.ndarray
    net: Moments = field(default_factory=Moments)
    staked: Moments = field(default_factory=Moments)
    steps: Moments = field(default_factory=Moments)
    net_staked: CrossMoment = field(default_factory=CrossMoment)
    unfinished: int = 0
    max_steps: int = DEFAULT_MAX_STEPS
    seconds: float = 0.0
    steps_taken: int = 0
    actions: tuple[tuple[str, str], ...] = ()

    @property
    def finished(self) -> int:
        return self.trials - self.unfinished

    @property
    def rounds_per_second(self) -> float:
        return self.trials / self.seconds if self.seconds > 0 else float("inf")


def simulate_round(
    chain: RoundChain,
    trials: int,
    seed: int,
    max_steps: int = DEFAULT_MAX_STEPS,
    batch_size: int = BATCH_SIZE,
    should_stop: Callable[[], bool] | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> RoundSample:
    """Play ``trials`` independent rounds of ``chain`` with ``numpy.random.default_rng(seed)``;
    ``progress(done, trials)`` hears after each batch."""
    if not 1 <= trials <= MAX_TRIALS:
        raise OddsbenchError(f"trials must be between 1 and {MAX_TRIALS:,}, got {trials:,}")
    began = time.perf_counter()
    n = chain.transient_count
    sample = RoundSample(
        title=chain.title,
        start=chain.names[0],
        trials=trials,
        seed=seed,
        stake=to_float(chain.stake),
        end_names=chain.ends,
        end_results=chain.end_results,
        end_counts=np.zeros(len(chain.ends), dtype=np.int64),
        max_steps=max_steps,
        actions=chain.actions,
    )
    rng = np.random.default_rng(seed)
    if n == 0:
        zeros = np.zeros(trials)
        sample.end_counts[0] = trials
        for moments in (sample.net, sample.steps):
            moments.add(zeros)
        sample.staked.add(zeros + sample.stake)
        sample.net_staked.add(zeros, zeros + sample.stake)
        sample.seconds = time.perf_counter() - began
        return sample
    player = RoundPlayer.of(chain)
    done_trials = 0
    while done_trials < trials:
        size = min(batch_size, trials - done_trials)
        budget = STEP_BUDGET - sample.steps_taken
        _run_batch(sample, size, player, rng, max_steps, should_stop, budget)
        done_trials += size
        if progress is not None:
            progress(done_trials, trials)
    sample.seconds = time.perf_counter() - began
    return sample


@dataclass(frozen=True)
class RoundPlayer:
    """A round chain ready for sampling: alias tables and per-edge targets, pays and extra stakes."""

    tables: object
    target: np.ndarray
    pay: np.ndarray
    extra: np.ndarray | None
    transient: int
    stake: float

    @classmethod
    def of(cls, chain: RoundChain) -> RoundPlayer:
        source = np.fromiter((e.source for e in chain.edges), dtype=np.int64)
        target = np.fromiter((e.target for e in chain.edges), dtype=np.int64)
        prob = np.fromiter((to_float(e.prob) for e in chain.edges), dtype=float)
        pay = np.fromiter((to_float(e.pay) for e in chain.edges), dtype=float)
        extra = np.fromiter((to_float(e.stake) for e in chain.edges), dtype=float)
        tables = build_alias_tables(source, prob, chain.transient_count)
        return cls(tables, target, pay, extra if np.any(extra) else None, chain.transient_count, to_float(chain.stake))

    def play(
        self,
        size: int,
        rng: np.random.Generator,
        max_steps: int = DEFAULT_MAX_STEPS,
        should_stop=None,
        budget: int = STEP_BUDGET,
    ):
        """``size`` rounds at once: (end index or -1 if unfinished, net, total staked, steps, steps taken).

        Raises StepBudgetExceeded once more than ``budget`` trial-steps would be taken, so a chain
        whose rounds almost never end cannot keep the command busy for hours.
        """
        n = self.transient
        live = np.arange(size)
        state = np.zeros(size, dtype=np.int64)
        net = np.zeros(size)
        staked = np.full(size, self.stake)
        steps = np.zeros(size)
        end = np.full(size, -1, dtype=np.int64)
        step = taken = 0
        while live.size and step < max_steps:
            if should_stop is not None and step % 64 == 0 and should_stop():
                raise SimulationCancelled
            edge = self.tables.draw(state, rng)
            net[live] += self.pay[edge]
            if self.extra is not None:
                staked[live] += self.extra[edge]
            state = self.target[edge]
            step += 1
            taken += live.size
            if taken > budget:
                raise StepBudgetExceeded(
                    f"simulation stopped: over {STEP_BUDGET:,} simulated steps in all (rounds here last "
                    f"{step:,}+ steps); play fewer trials or cap each round at fewer steps",
                    "trials",
                    "max_steps",
                )
            ended = state >= n
            if ended.any():
                finished = live[ended]
                end[finished] = state[ended] - n
                steps[finished] = step
                still = ~ended
                live, state = live[still], state[still]
        return end, net, staked, steps, taken


def _run_batch(sample, size, player: RoundPlayer, rng, max_steps, should_stop, budget: int) -> None:
    end, net, staked, steps, taken = player.play(size, rng, max_steps, should_stop, budget)
    sample.steps_taken += taken
    finished_mask = end >= 0
    sample.unfinished += int(size - finished_mask.sum())
    if not finished_mask.all():
        net, staked, steps, end = net[finished_mask], staked[finished_mask], steps[finished_mask], end[finished_mask]
    sample.end_counts += np.bincount(end, minlength=sample.end_counts.size)
    sample.net.add(net)
    sample.staked.add(staked)
    sample.steps.add(steps)
    sample.net_staked.add(net, staked)

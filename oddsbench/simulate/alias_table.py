"""Walker's alias tables for every state of a chain at once: one O(1) draw per live trial.

A state with k outcomes gets k slots; a draw picks a slot uniformly, then keeps the slot's own
outcome with the slot's threshold chance or takes its alias. Unlike one cumulative table over
all states, no precision is lost to large state indices (A. J. Walker, "An efficient method for
generating discrete random variables with general distributions", ACM TOMS 3 (1977) 253-256;
the stable construction of M. D. Vose, IEEE Trans. Softw. Eng. 17 (1991) 972-975).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class AliasTables:
    """Slots of state s are ``offset[s] .. offset[s] + width[s] - 1``; each names two edges."""

    offset: np.ndarray
    width: np.ndarray
    threshold: np.ndarray
    own: np.ndarray
    alias: np.ndarray

    def draw(self, states: np.ndarray, rng: np.random.Generator) -> np.ndarray:
        """One edge index per entry of ``states``."""
        width = self.width[states]
        slot = self.offset[states] + (rng.random(states.size) * width).astype(np.int64)
        np.minimum(slot, self.offset[states] + width - 1, out=slot)
        keep = rng.random(states.size) < self.threshold[slot]
        return np.where(keep, self.own[slot], self.alias[slot])


def build_alias_tables(source: np.ndarray, prob: np.ndarray, states: int) -> AliasTables:
    """Tables for edges grouped by ``source`` (any order) with float chances summing to 1 per state."""
    order = np.argsort(source, kind="stable")
    width = np.bincount(source, minlength=states).astype(np.int64)
    offset = np.concatenate([[0], np.cumsum(width)[:-1]]).astype(np.int64)
    total = int(width.sum())
    threshold = np.ones(total)
    own = np.empty(total, dtype=np.int64)
    alias = np.empty(total, dtype=np.int64)
    for s in range(states):
        start, k = int(offset[s]), int(width[s])
        edges = order[start : start + k]
        own[start : start + k] = edges
        alias[start : start + k] = edges
        if k == 1:
            continue
        p = prob[edges]
        scaled = p / p.sum() * k
        small = [i for i in range(k) if scaled[i] < 1.0]
        large = [i for i in range(k) if scaled[i] >= 1.0]
        while small and large:
            lo, hi = small.pop(), large.pop()
            threshold[start + lo] = scaled[lo]
            alias[start + lo] = edges[hi]
            scaled[hi] -= 1.0 - scaled[lo]
            (small if scaled[hi] < 1.0 else large).append(hi)
        for i in small + large:
            threshold[start + i] = 1.0
    return AliasTables(offset, width, threshold, own, alias)

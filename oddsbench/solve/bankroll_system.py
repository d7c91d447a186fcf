"""A bankroll chain's float system in the form its structure allows; the front door picks the engine.

* A skip-free walk: one plan level, the same bet at every bankroll, and a round that loses at most
  one grid step (even money, timid play, a flat bet on a paytable), or, mirrored, wins at most one
  step. Its end chances come in log space from positive terms (``linear/skip_free.py``), so a goal
  chance of 1e-2349 is a number, not an underflow.
* Else a band LAPACK can store (flat bets that get cut near the bottom, progressions over few
  levels): LAPACK's band LU.
* Else the sparse matrix, eliminated from the top by SuperLU (bold play, large irregular plans).

Why a chain is not a skip-free walk is kept (``WalkView.reason``) so the session can say so.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.bankroll import BankrollChain
from oddsbench.model.numbers import to_float, to_int
from oddsbench.solve.linear import BandMatrix, SkipFreeWalk, band_storage_fits, identity_minus_float


@dataclass(frozen=True)
class WalkView:
    """A bankroll chain seen as a skip-free walk: ``mirrored`` walks are read top down (level k of
    the walk is bankroll level ``size - 1 - k``), so their exact end is the goal and their overshoot
    is below the ruin level."""

    walk: SkipFreeWalk | None
    mirrored: bool = False
    reason: str = ""

    def chain_order(self, values: np.ndarray) -> np.ndarray:
        """Per-level values of the walk in the chain's level order."""
        return values[::-1] if self.mirrored else values

    def walk_level(self, level: int) -> int:
        return self.walk.size - 1 - level if self.mirrored else level


def skip_free_view(chain: BankrollChain) -> WalkView:
    """The chain as a skip-free walk, or the reason it is not one."""
    if chain.size == 0:
        return WalkView(None, reason="no bankroll is in play")
    if chain.levels != 1:
        return WalkView(None, reason="the plan's bet depends on more than the bankroll (a progression)")
    bets = chain.bets
    if not (bets == bets[0]).all():
        return WalkView(None, reason="the bet changes with the bankroll (cut or sized bets)")
    steps = np.array([to_int(o.net * chain.grid.scale) for o in chain.distribution.outcomes], dtype=np.int64)
    raw = steps * int(bets[0])
    probs_all = np.array([to_float(o.prob) for o in chain.distribution.outcomes])
    live = probs_all > 0
    low, high = int(raw[live].min()), int(raw[live].max())
    # a jump past the whole run of levels lands beyond it from every level: as far as the walk goes it
    # is a jump of ``size`` (a win of 10^12 units on a goal 100 away needs no 10^12-long recursion)
    if low == -1 and high >= 1:
        return WalkView(_walk(np.minimum(raw, chain.size), probs_all, chain.size))
    if high == 1 and low <= -1:
        return WalkView(_walk(np.minimum(-raw, chain.size), probs_all, chain.size), mirrored=True)
    if low >= 0 or high <= 0:
        return WalkView(None, reason="the bankroll can only rise, or only fall")
    return WalkView(None, reason="a round can lose, and win, more than one grid step")


def _walk(jumps: np.ndarray, probs: np.ndarray, size: int) -> SkipFreeWalk:
    """The walk with equal jumps merged and impossible ones dropped."""
    merged, where = np.unique(jumps, return_inverse=True)
    total = np.zeros(len(merged))
    np.add.at(total, where, probs)
    keep = total > 0
    return SkipFreeWalk(merged[keep], total[keep], size)


def band_system(chain: BankrollChain) -> BandMatrix | None:
    """I - Q in LAPACK band storage, straight from the chain's targets, or None when the band is too wide to store."""
    n = chain.size
    rows = np.broadcast_to(np.arange(n)[:, None], chain.target.shape)
    inside = chain.target >= 0
    offsets = chain.target[inside] - rows[inside]
    lower = int(max(-offsets.min(), 0)) if offsets.size else 0
    upper = int(max(offsets.max(), 0)) if offsets.size else 0
    if not band_storage_fits(lower, upper, n):
        return None
    band = BandMatrix.zeros(lower, upper, n)
    band.bands[upper] = 1.0
    probs = np.broadcast_to(chain.probabilities(), chain.target.shape)
    band.add(rows[inside], chain.target[inside], -probs[inside])
    return band


def float_system(chain: BankrollChain):
    """(system, order) for ``factor_float`` when the chain is not a skip-free walk: a band, else sparse."""
    band = band_system(chain)
    if band is not None:
        return band, "natural"
    return identity_minus_float(chain.q_matrix()), "from-top"

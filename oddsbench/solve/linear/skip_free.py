"""Walks that step down at most one level a round: probabilities in log space, by positive terms.

A bankroll walk on levels ``0 .. size - 1`` whose round has the same law at every level (a flat
bet, timid play) and loses at most one level (even money, any flat bet on a paytable) is
*skip-free downwards*: the walk is ruined exactly at level -1 and reaches the goal at ``size``
or above (an overshoot of up to ``top - 1`` levels). Write ``c_i`` for the chance of a jump of
at least ``i`` levels up and ``q`` for the chance of stepping down. The ruin chance from level
``k`` is ``H(size - k - 1) / H(size)`` and the goal chance ``(H(size) - H(size - k - 1)) /
H(size)``, summed term by term, where ``H`` is the running sum of the positive sequence

    h(0) = 1,   h(n) = (1/q) sum_{i=1}^{top} c_i h(n - i)

(the differences of the ruin chance, Feller vol. I ch. XIV; for even money h(n) = (p/q)^n).
Every term is positive: no cancellation, so a goal chance is never taken as 1 - ruin. The
sequence is computed in blocks, each a Toeplitz product with BLAS (vectorised, O(size x top)),
and kept as mantissas with a power-of-two exponent per block, so it never underflows: the goal
chance 7.77e-2349 comes out with all its digits.

Other right-hand sides (expected rounds, staked, second moments) use the Green function of the
same walk, ``G(s, l) = (psi(s) H(l) - H(l - s - 1)) / q``: a difference, accurate while the walk
does not drift upwards (the ``upward`` property); the solver reports a relative error bound per
value, and callers send upward walks to a band or sparse LU instead.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

LOG10_2 = math.log10(2.0)
FLOAT_TINY = 2.2250738585072014e-308  # smallest normal float
EPS = np.finfo(float).eps
SPAN_BITS = 400  # largest growth (in bits) allowed inside one block of the recurrence
GREEN_TOLERANCE = 1e-10  # a Green-function solve must vouch for this relative accuracy, else a band LU runs


@dataclass(frozen=True)
class SkipFreeWalk:
    """A homogeneous walk on ``size`` levels: jump ``jumps[i]`` (>= -1) with chance ``probs[i]``.

    Landing below level 0 is the bottom end (one state, at level -1); at or above ``size`` the
    top end, at level ``size + o`` for an overshoot ``o``. Jumps of 0 (a push) are allowed.
    """

    jumps: np.ndarray
    probs: np.ndarray
    size: int

    @property
    def down(self) -> float:
        return float(self.probs[self.jumps == -1].sum())

    @property
    def top(self) -> int:
        """The largest jump up (at least 1 for a walk that can reach the top)."""
        return int(self.jumps.max())

    @property
    def drift(self) -> float:
        return float(np.dot(self.jumps, self.probs))

    @property
    def upward(self) -> bool:
        """The walk drifts up: the Green function's difference loses digits, so other solves go elsewhere."""
        return self.drift > 0

    def tails(self) -> np.ndarray:
        """``c[i]`` = chance of a jump of at least ``i`` levels up, i = 0 .. top (c[0] unused)."""
        tails = np.zeros(self.top + 1)
        for jump, prob in zip(self.jumps.tolist(), self.probs.tolist()):
            if jump >= 1:
                tails[1 : jump + 1] += prob
        return tails


@dataclass(frozen=True)
class Scaled:
    """Positive numbers ``mantissa * 2**exponent`` (mantissa in [0.5, 1) or 0): any size, no underflow."""

    mantissa: np.ndarray
    exponent: np.ndarray

    @classmethod
    def of(cls, values: np.ndarray, exponents: np.ndarray) -> Scaled:
        mantissa, extra = np.frexp(values)
        return cls(mantissa, np.where(mantissa == 0, 0, exponents + extra).astype(np.int64))

    def __getitem__(self, index) -> Scaled:
        return Scaled(self.mantissa[index], self.exponent[index])

    def log10(self) -> np.ndarray:
        """log10 of each value (-inf for 0)."""
        with np.errstate(divide="ignore"):
            return np.log10(self.mantissa) + self.exponent * LOG10_2

    def ratio(self, other: Scaled) -> tuple[np.ndarray, np.ndarray]:
        """(decimal, log10) of self / other: the decimal 0.0 where it is below the normal float range."""
        with np.errstate(divide="ignore", invalid="ignore", over="ignore", under="ignore"):
            quotient = self.mantissa / other.mantissa
            shift = self.exponent - other.exponent
            log10 = np.log10(quotient) + shift * LOG10_2
            decimal = np.ldexp(quotient, np.clip(shift, -2000, 2000).astype(np.int32))
        decimal = np.where(np.abs(decimal) < FLOAT_TINY, 0.0, decimal)
        return decimal, log10


def running_sums(values: Scaled, block: int = 4096) -> Scaled:
    """Running sums s(n) = values(0) + ... + values(n), block by block, each sum of positive terms."""
    size = len(values.mantissa)
    out_mantissa = np.zeros(size)
    out_exponent = np.zeros(size, dtype=np.int64)
    carry_m, carry_e = 0.0, 0
    for start in range(0, size, block):
        stop = min(start + block, size)
        mantissa, exponent = values.mantissa[start:stop], values.exponent[start:stop]
        live = mantissa > 0
        top = int(exponent[live].max()) if live.any() else carry_e
        if carry_m > 0:
            top = max(top, carry_e)
        with np.errstate(under="ignore"):
            shifted = np.ldexp(mantissa, np.clip(exponent - top, -1100, 0).astype(np.int32))
            carry = math.ldexp(carry_m, max(carry_e - top, -1100)) if carry_m > 0 else 0.0
        sums = carry + np.cumsum(shifted)
        scaled = Scaled.of(sums, np.full(stop - start, top, dtype=np.int64))
        out_mantissa[start:stop], out_exponent[start:stop] = scaled.mantissa, scaled.exponent
        carry_m, carry_e = float(scaled.mantissa[-1]), int(scaled.exponent[-1])
    return Scaled(out_mantissa, out_exponent)


def filtered(tails_over_q: np.ndarray, forcing: np.ndarray, length: int) -> Scaled:
    """y(n) = sum_{i>=1} tails_over_q[i] y(n - i) + forcing[n], n = 0 .. length - 1 (y(<0) = 0).

    Coefficients and forcing are non-negative, so every output is a sum of positive terms. Blocks
    of ``block`` outputs at a time: the earlier outputs enter through one Toeplitz product, the
    block's own through its impulse response, both matrix products. Each block is rescaled by a
    power of two (exact), so values may run far past the float range.
    """
    top = len(tails_over_q) - 1
    growth = max(float(tails_over_q.sum()), 1.0)
    decay = float(tails_over_q[1]) if top else 1.0
    per_step = max(math.log2(growth), -math.log2(decay) if decay > 0 else 64.0, 1e-3)
    if top == 1:
        return _first_order(float(tails_over_q[1]), forcing, length, per_step)
    block = int(max(1, min(SPAN_BITS / per_step, max(top, 512), length)))
    impulse = np.zeros(block)
    impulse[0] = 1.0
    for n in range(1, block):
        reach = min(n, top)
        impulse[n] = np.dot(tails_over_q[1 : reach + 1], impulse[n - 1 :: -1][:reach])
    index = np.arange(block)
    gaps = index[:, None] - index[None, :]
    inside = np.where(gaps >= 0, impulse[np.clip(gaps, 0, block - 1)], 0.0)
    lags = index[:, None] + np.arange(1, top + 1)[None, :]  # output t sees y(start - m) through c_{t + m}
    carried = np.where(lags <= top, tails_over_q[np.clip(lags, 0, top)], 0.0)
    values = np.zeros(length)
    exponents = np.zeros(length, dtype=np.int64)
    history = np.zeros(top)  # y(start - 1), y(start - 2), ... in the current scale
    scale = 0  # values in this block are true values times 2**-scale
    for start in range(0, length, block):
        stop = min(start + block, length)
        width = stop - start
        with np.errstate(under="ignore"):
            drive = carried[:width] @ history + np.ldexp(forcing[start:stop], -scale)
        out = inside[:width, :width] @ drive
        values[start:stop] = out
        exponents[start:stop] = scale
        shift = _top_exponent(out)
        recent = np.concatenate([out[::-1], history])[:top]
        with np.errstate(under="ignore"):
            history = np.ldexp(recent, -shift)
        scale += shift
    return Scaled.of(values, exponents)


def _top_exponent(values: np.ndarray) -> int:
    largest = float(values.max()) if len(values) else 0.0
    return math.frexp(largest)[1] if largest > 0 else 0


def _first_order(ratio: float, forcing: np.ndarray, length: int, per_step: float) -> Scaled:
    """The recurrence with one coefficient, y(n) = ratio y(n - 1) + forcing(n), as cumulative sums:
    y(start + t) = ratio^t (ratio y(start - 1) + sum_{u <= t} ratio^-u forcing(start + u))."""
    block = int(max(1, min(SPAN_BITS / (2 * per_step), 1 << 16, length)))
    powers = ratio ** np.arange(block, dtype=float)
    with np.errstate(divide="ignore", over="ignore"):
        inverse = 1.0 / powers
    values = np.zeros(length)
    exponents = np.zeros(length, dtype=np.int64)
    previous = 0.0  # y(start - 1) in the current scale
    scale = 0
    for start in range(0, length, block):
        stop = min(start + block, length)
        width = stop - start
        with np.errstate(under="ignore"):
            drive = np.ldexp(forcing[start:stop], -scale) * inverse[:width]
        drive[0] += ratio * previous
        out = powers[:width] * np.cumsum(drive)
        values[start:stop] = out
        exponents[start:stop] = scale
        shift = _top_exponent(out)
        previous = math.ldexp(float(out[-1]), -shift)
        scale += shift
    return Scaled.of(values, exponents)


def _growth(size: int) -> float:
    """Rounding error of a difference of two running sums of ``size`` positive terms, per unit of the terms."""
    return 2 * EPS * math.sqrt(size + 1)


class SkipFreeFactors:
    """Everything a skip-free walk needs, computed once: the ruin-difference sequence and its sums."""

    method = "skip-free recursion in log space"

    def __init__(self, walk: SkipFreeWalk) -> None:
        if walk.down <= 0 or walk.top < 1:
            raise ValueError("a skip-free walk needs a chance of stepping down and a jump up")
        self.walk = walk
        self.size = walk.size
        self._tails_over_q = walk.tails() / walk.down
        forcing = np.zeros(walk.size + 1)
        forcing[0] = 1.0
        self.h = filtered(self._tails_over_q, forcing, walk.size + 1)  # h(0 .. size)
        self.big_h = running_sums(self.h)  # H(0 .. size)
        reversed_h = Scaled(self.h.mantissa[::-1], self.h.exponent[::-1])
        self._from_top = running_sums(reversed_h)  # sum_{n >= size - j} h(n), j = 0 .. size
        self._fallback = None

    def top_chance(self) -> tuple[np.ndarray, np.ndarray]:
        """(decimal, log10) of the chance of ending at the top from every level 0 .. size - 1."""
        n = self.size
        total = self.big_h[np.full(n, n)]
        return self._from_top[np.arange(n)].ratio(total) if n else (np.zeros(0), np.zeros(0))

    def bottom_chance(self) -> tuple[np.ndarray, np.ndarray]:
        """(decimal, log10) of the chance of ending at the bottom (level -1) from every level."""
        n = self.size
        total = self.big_h[np.full(n, n)]
        return self.big_h[np.arange(n - 1, -1, -1)].ratio(total) if n else (np.zeros(0), np.zeros(0))

    def _float_sums(self) -> np.ndarray:
        """H(0 .. size) as plain floats (the Green function's scale), inf where too large."""
        with np.errstate(over="ignore"):
            return np.ldexp(self.big_h.mantissa, np.clip(self.big_h.exponent, -2000, 2000).astype(np.int32))

    def solve(self, rhs) -> np.ndarray:
        """x with (I - Q) x = rhs (rhs >= 0): the Green function where it holds its digits, else a band LU."""
        return self.solve_with_bound(rhs)[0]

    def solve_with_bound(self, rhs) -> tuple[np.ndarray, float]:
        """``solve(rhs)`` and a bound of its largest relative error (from the Green function's
        cancellation; 0 where a band or sparse LU took over, whose error the caller checks by residual)."""
        rhs = np.asarray(rhs, dtype=float)
        if not self.walk.upward and rhs.ndim == 1 and (rhs >= 0).all():
            x, bound = self._green(rhs)
            worst = float(bound.max()) if len(bound) else 0.0
            if worst <= GREEN_TOLERANCE:
                return x, worst
        return self.fallback().solve(rhs), 0.0

    def solve_transposed(self, rhs) -> np.ndarray:
        """x with (I - Q)^T x = rhs: a unit vector gives expected visits (the Green function's row)."""
        rhs = np.asarray(rhs, dtype=float)
        starts = np.flatnonzero(rhs)
        if not self.walk.upward and rhs.ndim == 1 and len(starts) == 1 and rhs[starts[0]] > 0:
            row, bound = self.visits_from(int(starts[0]))
            if float(bound[row > 0].max(initial=0.0)) <= GREEN_TOLERANCE:
                return row * rhs[starts[0]]
        return self.fallback().solve_transposed(rhs)

    def fallback(self):
        """The same system as a band (LAPACK) or sparse (SuperLU) factorisation, built on first need."""
        if self._fallback is None:
            from oddsbench.solve.linear.banded import BandFactors, BandMatrix
            from oddsbench.solve.linear.sparse import SuperLUFactors
            from oddsbench.solve.linear.structure import band_storage_fits

            walk, n = self.walk, self.size
            lower, upper = 1, walk.top
            if band_storage_fits(lower, upper, n):
                band = BandMatrix.zeros(lower, upper, n)
                band.bands[upper] = 1.0
                for jump, prob in zip(walk.jumps.tolist(), walk.probs.tolist()):
                    rows = np.arange(max(0, -jump), min(n, n - jump))
                    band.add(rows, rows + jump, -prob)
                self._fallback = BandFactors(band)
            else:
                self._fallback = SuperLUFactors(walk_matrix(walk), "fill-reducing")
        return self._fallback

    def _green(self, rhs: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        rhs = np.asarray(rhs, dtype=float)
        n, q = self.size, self.walk.down
        if n == 0:
            return rhs.copy(), np.zeros(0)
        psi, _ = self.bottom_chance()
        # D(m), m = size .. 0, is a filtered sequence: q D(k) = sum_i c_i D(k + i) + rhs(k); Y(s) = sum_{m > s} D(m)
        forcing = np.zeros(n + 1)
        forcing[1:] = rhs[::-1] / q
        d = filtered(self._tails_over_q, forcing, n + 1)
        with np.errstate(over="ignore", under="ignore"):
            d_values = np.ldexp(d.mantissa, np.clip(d.exponent, -2000, 2000).astype(np.int32))
        running = np.cumsum(d_values)  # running[j] = sum of D(m) over m >= size - j
        y = running[n - 1 - np.arange(n)]  # Y(s) = sum_{m > s} D(m), s = 0 .. size - 1
        y_all = running[n]  # Y(-1)
        first = psi * y_all
        x = first - y
        with np.errstate(divide="ignore", invalid="ignore"):
            bound = np.where(x > 0, _growth(n) * (first + y) / x, np.inf)
        return x, bound

    def visits_from(self, start: int) -> tuple[np.ndarray, np.ndarray]:
        """Expected visits to every level from ``start`` (the Green function's row), and a relative error bound."""
        n, q = self.size, self.walk.down
        sums = self._float_sums()
        psi, _ = self.bottom_chance()
        levels = np.arange(n)
        behind = np.where(levels - start - 1 >= 0, sums[np.clip(levels - start - 1, 0, n)], 0.0)
        first = psi[start] * sums[levels]
        with np.errstate(invalid="ignore", divide="ignore"):
            row = (first - behind) / q
            bound = np.where(row > 0, _growth(n) * (first + behind) / (q * row), np.inf)
        return np.maximum(row, 0.0), bound


def walk_matrix(walk: SkipFreeWalk):
    """I - Q of a homogeneous walk as a scipy CSC matrix."""
    from scipy.sparse import diags

    n = walk.size
    offsets, values = [0], [np.ones(n)]
    for jump, prob in zip(walk.jumps.tolist(), walk.probs.tolist()):
        if abs(jump) < n:
            offsets.append(jump)
            values.append(np.full(n - abs(jump), -prob))
    merged: dict[int, np.ndarray] = {}
    for offset, value in zip(offsets, values):
        merged[offset] = merged.get(offset, 0) + value
    return diags(list(merged.values()), list(merged.keys()), shape=(n, n), format="csc")

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

LN_2 = math.log(2.0)
LN_10 = math.log(10.0)
FLOAT_TINY = 2.2250738585072014e-308  # smallest normal float
EPS = np.finfo(float).eps
SPAN_BITS = 400  # largest growth (in bits) allowed inside one block of the recurrence
SUM_SPAN_BITS = 900  # largest spread of exponents inside one block of a running sum
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

    def ln(self):
        """Natural logarithm of each value (-inf for 0)."""
        with np.errstate(divide="ignore"):
            return np.log(self.mantissa) + self.exponent * LN_2


def _chances(ln_values: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(decimal, log10) from natural logs: the decimal 0.0 where it is below the normal float range."""
    with np.errstate(under="ignore"):
        decimal = np.exp(ln_values)
    return np.where(decimal < FLOAT_TINY, 0.0, decimal), ln_values / LN_10


def _geometric_log_sums(ln_ratio: float, size: int) -> np.ndarray:
    """ln H(n) for n = 0 .. size, H(n) = 1 + r + ... + r^n with ln r = ``ln_ratio``, without cancellation:
    H(n) = e^max(n ln r, 0) (1 - e^-(n+1)|ln r|) / (1 - e^-|ln r|), each factor by expm1."""
    n = np.arange(size + 1, dtype=float)
    if ln_ratio == 0.0:
        return np.log(n + 1)
    size_ln = abs(ln_ratio)
    return np.maximum(n * ln_ratio, 0.0) + np.log(-np.expm1(-(n + 1) * size_ln)) - math.log(-math.expm1(-size_ln))


def running_sums(values: Scaled, block: int = 4096) -> Scaled:
    """Running sums s(n) = values(0) + ... + values(n), block by block, each sum of positive terms.

    A block ends before its values span more than ``SUM_SPAN_BITS`` bits, so shifted to the block's
    largest exponent every value stays a normal float (a smaller one is below rounding of the sum)."""
    size = len(values.mantissa)
    out_mantissa = np.zeros(size)
    out_exponent = np.zeros(size, dtype=np.int64)
    carry_m, carry_e = 0.0, 0
    start = 0
    while start < size:
        stop = _span_stop(values, start, min(start + block, size))
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
        start = stop
    return Scaled(out_mantissa, out_exponent)


def _span_stop(values: Scaled, start: int, stop: int) -> int:
    """The end of a block from ``start``: at most ``stop``, and before the live exponents span too far."""
    exponent = np.where(values.mantissa[start:stop] > 0, values.exponent[start:stop], values.exponent[start])
    span = np.maximum.accumulate(exponent) - np.minimum.accumulate(exponent)
    over = np.flatnonzero(span > SUM_SPAN_BITS)
    return start + int(over[0]) if over.size else stop


def filtered(tails_over_q: np.ndarray, forcing: np.ndarray, length: int, as_floats: bool = False):
    """y(n) = sum_{i>=1} tails_over_q[i] y(n - i) + forcing[n], n = 0 .. length - 1 (y(<0) = 0).

    Coefficients and forcing are non-negative, so every output is a sum of positive terms. Blocks
    of ``block`` outputs at a time: the earlier outputs enter through one Toeplitz product, the
    block's own through its impulse response, both matrix products. Each block is rescaled by a
    power of two (exact), so values may run far past the float range. ``as_floats`` returns plain
    floats instead (past the float range: inf or 0), written block by block with no exponent array.
    """
    top = len(tails_over_q) - 1
    growth = max(float(tails_over_q.sum()), 1.0)
    decay = float(tails_over_q[1]) if top else 1.0
    per_step = max(math.log2(growth), -math.log2(decay) if decay > 0 else 64.0, 1e-3)
    if top == 1:
        return _first_order(float(tails_over_q[1]), forcing, length, per_step, as_floats)
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
    out_values = _Output(length, as_floats)
    history = np.zeros(top)  # y(start - 1), y(start - 2), ... in the current scale
    scale = 0  # values in this block are true values times 2**-scale
    for start in range(0, length, block):
        stop = min(start + block, length)
        width = stop - start
        with np.errstate(under="ignore"):
            drive = carried[:width] @ history + np.ldexp(forcing[start:stop], -scale)
        out = inside[:width, :width] @ drive
        out_values.put(start, stop, out, scale)
        shift = _top_exponent(out)
        recent = np.concatenate([out[::-1], history])[:top]
        with np.errstate(under="ignore"):
            history = np.ldexp(recent, -shift)
        scale += shift
    return out_values.result()


def _top_exponent(values: np.ndarray) -> int:
    largest = float(values.max()) if len(values) else 0.0
    return math.frexp(largest)[1] if largest > 0 else 0


class _Output:
    """Where ``filtered`` writes its blocks: scaled values (mantissa-like values and a power of two per
    block, normalised at the end) or, for callers that want them, plain floats."""

    def __init__(self, length: int, as_floats: bool) -> None:
        self.as_floats = as_floats
        self.values = np.zeros(length)
        self.exponents = None if as_floats else np.zeros(length, dtype=np.int64)

    def put(self, start: int, stop: int, out: np.ndarray, scale: int) -> None:
        if self.as_floats:
            with np.errstate(over="ignore", under="ignore"):
                self.values[start:stop] = np.ldexp(out, min(max(scale, -2000), 2000))
        else:
            self.values[start:stop] = out
            self.exponents[start:stop] = scale

    def result(self):
        return self.values if self.as_floats else Scaled.of(self.values, self.exponents)


def _first_order(ratio: float, forcing: np.ndarray, length: int, per_step: float, as_floats: bool = False):
    """The recurrence with one coefficient, y(n) = ratio y(n - 1) + forcing(n), as cumulative sums:
    y(start + t) = ratio^t (ratio y(start - 1) + sum_{u <= t} ratio^-u forcing(start + u)); a block
    is as long as ratio^-t stays far inside the float range."""
    block = int(max(1, min(2 * SPAN_BITS / per_step, 1 << 16, length)))
    powers = ratio ** np.arange(block, dtype=float)
    with np.errstate(divide="ignore", over="ignore"):
        inverse = 1.0 / powers
    out_values = _Output(length, as_floats)
    previous = 0.0  # y(start - 1) in the current scale
    scale = 0
    for start in range(0, length, block):
        stop = min(start + block, length)
        width = stop - start
        with np.errstate(under="ignore"):
            drive = np.ldexp(forcing[start:stop], -scale) * inverse[:width]
        drive[0] += ratio * previous
        out = powers[:width] * np.cumsum(drive)
        out_values.put(start, stop, out, scale)
        shift = _top_exponent(out)
        previous = math.ldexp(float(out[-1]), -shift)
        scale += shift
    return out_values.result()


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
        self._fallback = None
        self._top = self._bottom = None
        n = walk.size
        if walk.top == 1:
            # h(n) = rho^n: the running sums in closed form, in logarithms
            ln_ratio = math.log(float(self._tails_over_q[1]))
            ln_sums = _geometric_log_sums(ln_ratio, n)
            self._ln_bottom = ln_sums[n - 1 :: -1] - ln_sums[n]  # ln H(size - 1 - k) - ln H(size)
            self._ln_top = np.arange(n, 0, -1) * ln_ratio + ln_sums[:n] - ln_sums[n]  # rho^(size - k) H(k) / H(size)
            return
        forcing = np.zeros(n + 1)
        forcing[0] = 1.0
        self.h = filtered(self._tails_over_q, forcing, n + 1)  # h(0 .. size)
        self.big_h = running_sums(self.h)  # H(0 .. size)
        self._from_top = running_sums(Scaled(self.h.mantissa[::-1], self.h.exponent[::-1]))  # T(size - j)
        ln_total = self.big_h[n].ln()
        self._ln_bottom = self.big_h[np.arange(n - 1, -1, -1)].ln() - ln_total
        self._ln_top = self._from_top[np.arange(n)].ln() - ln_total

    def top_chance(self) -> tuple[np.ndarray, np.ndarray]:
        """(decimal, log10) of the chance of ending at the top from every level 0 .. size - 1."""
        if self._top is None:
            self._top = _chances(self._ln_top)
        return self._top

    def bottom_chance(self) -> tuple[np.ndarray, np.ndarray]:
        """(decimal, log10) of the chance of ending at the bottom (level -1) from every level."""
        if self._bottom is None:
            self._bottom = _chances(self._ln_bottom)
        return self._bottom

    def solve(self, rhs) -> np.ndarray:
        """x with (I - Q) x = rhs (rhs >= 0): the Green function where it holds its digits, else a band LU."""
        return self.solve_with_bound(rhs)[0]

    def solve_with_bound(self, rhs) -> tuple[np.ndarray, float]:
        """``solve(rhs)`` and a bound of its largest relative error (from the Green function's
        cancellation; 0 where a band or sparse LU took over, whose error the caller checks by residual)."""
        rhs = np.asarray(rhs, dtype=float)
        if not self.walk.upward and rhs.ndim == 1 and (rhs >= 0).all():
            x, worst = self._green(rhs)
            if worst <= GREEN_TOLERANCE:
                return x, worst
        return self.fallback().solve(rhs), 0.0

    def solve_transposed(self, rhs) -> np.ndarray:
        """x with (I - Q)^T x = rhs: a unit vector gives expected visits (the Green function's row)."""
        rhs = np.asarray(rhs, dtype=float)
        starts = np.flatnonzero(rhs)
        if rhs.ndim == 1 and len(starts) == 1 and rhs[starts[0]] > 0:
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
                    if abs(jump) < n:  # A[i, i + jump] -= prob, stored at bands[upper - jump, i + jump]
                        band.bands[upper - jump, max(jump, 0) : n + min(jump, 0)] -= prob
                self._fallback = BandFactors(band)
            else:
                self._fallback = SuperLUFactors(walk_matrix(walk), "fill-reducing")
        return self._fallback

    def _green(self, rhs: np.ndarray) -> tuple[np.ndarray, float]:
        """x = G rhs by the Green function. With D(m), m = size .. 0, the filtered sequence
        q D(k) = sum_i c_i D(k + i) + rhs(k), and its sums from below, L(s) = sum_{m <= s} D(m), and from
        above, Y(s) = sum_{m > s} D(m): x(s) = psi(s) L(s) - goal(s) Y(s), each end chance from its own
        positive terms, so the one subtraction left cancels only where both ends are likely."""
        rhs = np.asarray(rhs, dtype=float)
        n, q = self.size, self.walk.down
        if n == 0:
            return rhs.copy(), 0.0
        psi, _ = self.bottom_chance()
        goal, _ = self.top_chance()
        forcing = np.empty(n + 1)
        forcing[0] = 0.0
        np.divide(rhs[::-1], q, out=forcing[1:])
        d = filtered(self._tails_over_q, forcing, n + 1, as_floats=True)  # d[j] = D(size - j)
        first = np.cumsum(d[::-1])[:n]  # L(s) = d[size - s] + ... + d[size], then psi(s) L(s)
        first *= psi
        second = np.cumsum(d)[n - 1 :: -1]  # Y(s) = d[0] + ... + d[size - 1 - s], then goal(s) Y(s)
        second *= goal
        x = first - second
        if not (x > 0).all():
            return x, math.inf
        first += second  # how much the one subtraction cancels, per level: (first + second) / x
        first /= x
        return x, float(first.max()) * _growth(n)

    @staticmethod
    def _floats(values: Scaled) -> np.ndarray:
        with np.errstate(over="ignore", under="ignore"):
            return np.ldexp(values.mantissa, np.clip(values.exponent, -2000, 2000).astype(np.int32))

    def visits_from(self, start: int) -> tuple[np.ndarray, np.ndarray]:
        """Expected visits to every level from ``start`` (the Green function's row) and a relative error
        bound per level; by the band LU (bound 0) for a walk of one level up or one drifting up.

        q G(s, l) = psi(s) H(l) for l <= s; above the start, psi(s) W - goal(s) H(l - s - 1) with the
        window W = h(l - s) + ... + h(l) taken as T(l - s) - T(l + 1) from the sums from the top T."""
        if self.walk.top == 1 or self.walk.upward:
            unit = np.zeros(self.size)
            unit[start] = 1.0
            return self.fallback().solve_transposed(unit), np.zeros(self.size)
        n, q = self.size, self.walk.down
        sums = self._floats(self.big_h)  # H(0 .. size)
        tops = np.append(self._floats(self._from_top)[::-1], 0.0)  # T(0 .. size + 1)
        psi, _ = self.bottom_chance()
        goal, _ = self.top_chance()
        levels = np.arange(n)
        above = levels > start
        behind = np.where(above, sums[np.clip(levels - start - 1, 0, n)], 0.0)
        window = np.where(above, tops[np.clip(levels - start, 0, n + 1)] - tops[levels + 1], sums[levels])
        first, second = psi[start] * window, goal[start] * behind
        with np.errstate(invalid="ignore", divide="ignore"):
            row = (first - second) / q
            spread = _growth(n) * (first + second + psi[start] * tops[np.clip(levels - start, 0, n + 1)] * above)
            bound = np.where(row > 0, spread / (q * row), np.inf)
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

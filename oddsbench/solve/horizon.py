"""The law of the total net after N independent rounds: exact by convolution, floats past a limit.

One round's net takes values on a lattice low + step x k (k = 0..span, gcd of the k's 1), so the
total after N rounds is N x low + step x K with K in 0..N x span, and the law of K is the N-th
power of the polynomial sum_i p_i x^(k_i). Exact: with the chances over a common denominator Q,
the integer polynomial is raised to the N-th power by repeated squaring (python-flint
``fmpz_poly``), the chances being coefficients over Q^N, while the support (N x span + 1 points)
and the estimated size (support x N x bits of Q) stay under their limits. Past them: the same
powering in floats with FFT convolution (scipy), each chance within ``FLOAT_CHANCE_ERROR``
(absolute; the tests hold the float law to the exact one), and the exact mean and variance
(N times one round's) beside it. Past the float support limit the question is refused in one line.

From the law: the chance the player is ahead (total > 0), even and behind; quantiles; and the
range of the realised return to player, 1 + total / (N x expected staked), between the
(1 - c)/2 and (1 + c)/2 quantiles (it holds at least c of the chance; the exact chance inside is
given), beside the normal approximation from the exact mean and standard deviation (de
Moivre-Laplace, named as such).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from statistics import NormalDist

from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, count_text, denominator, numerator, to_float
from oddsbench.solve.cancel import SolveCancelled

EXACT_SUPPORT = 100_000  # lattice points of the total kept exactly
EXACT_BITS = 1 << 28  # estimated bits of the exact law (support x N x bits of the common denominator)
FLOAT_SUPPORT = 4_000_000  # lattice points of the float law; past it the question is refused
FLOAT_CHANCE_ERROR = 1e-12  # absolute error of each chance of the float law (held by the tests)
QUANTILES = (1, 5, 25, 50, 75, 95, 99)  # percent
LEVELS = (90, 95, 99)  # percent: central ranges of the realised return to player
MAX_ROUNDS = 10**9


class TooManyRounds(SettingProblem):
    """A number of rounds refused before any work: out of range, or its law would be too large (the
    setting ``rounds``: each front end adds its way to change it)."""

    def __init__(self, message: str) -> None:
        super().__init__(message, "rounds")


@dataclass(frozen=True)
class ReturnRange:
    """The realised return to player over N rounds at one level: between the (1 - c)/2 and (1 + c)/2
    quantiles of the law (``inside``: the chance of that range, at least c), and the normal
    approximation's range from the exact mean and standard deviation."""

    level: int
    low: Figure
    high: Figure
    inside: Figure
    normal_low: float
    normal_high: float


@dataclass(frozen=True)
class Horizon:
    """The total net after ``rounds`` independent rounds."""

    rounds: int
    method: str  # "exact" or "float"
    support: int  # lattice points low + step x k, k = 0 .. support - 1
    low: Rational
    step: Rational
    mean: Rational
    variance: Rational
    ahead: Figure
    even: Figure
    behind: Figure
    quantiles: tuple[tuple[int, Figure], ...]
    normal_quantiles: tuple[tuple[int, float], ...]
    rtp_ranges: tuple[ReturnRange, ...]
    error_bound: float | None = None  # absolute error of each chance (float law); None when exact
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class Lattice:
    """One round's net as low + step x k: ``weights[k]`` over ``denominator`` is the chance of k."""

    low: Rational
    step: Rational
    weights: tuple[int, ...]
    denominator: int

    @property
    def span(self) -> int:
        return len(self.weights) - 1


def lattice_of(law: Sequence[tuple[Rational, Rational]]) -> Lattice:
    """The lattice of a net law given as (net, chance) pairs with chances summing to 1."""
    values = [(net, prob) for net, prob in law if prob != 0]
    if not values or sum((prob for _, prob in values), QQ(0)) != 1:
        raise OddsbenchError("horizon: the round's net law must have chances summing to 1")
    low = min(net for net, _ in values)
    gaps = [net - low for net, _ in values]
    scale = math.lcm(*(denominator(gap) for gap in gaps))
    whole = [numerator(gap) * (scale // denominator(gap)) for gap in gaps]
    unit = math.gcd(*whole) or 1
    step = QQ(unit, scale)
    common = math.lcm(*(denominator(prob) for _, prob in values))
    weights = [0] * (max(whole) // unit + 1)
    for (_, prob), k in zip(values, whole):
        weights[k // unit] += numerator(prob) * (common // denominator(prob))
    return Lattice(low, step, tuple(weights), common)


def horizons(
    law: Sequence[tuple[Rational, Rational]],
    expected_staked: Rational | None,
    rounds: Sequence[int],
    should_stop: Callable[[], bool] | None = None,
) -> tuple[Horizon, ...]:
    """The law after each number of rounds in ``rounds`` (each checked against the limits first);
    ``expected_staked`` None (a game of points) leaves out the return to player."""
    lattice = lattice_of(law)
    mean = sum((net * prob for net, prob in law), QQ(0))
    variance = sum((net * net * prob for net, prob in law), QQ(0)) - mean * mean
    for n in rounds:
        _check_rounds(n, lattice)
    return tuple(_horizon(lattice, n, mean, variance, expected_staked, should_stop) for n in rounds)


def _check_rounds(n: int, lattice: Lattice) -> None:
    if n < 1 or n > MAX_ROUNDS:
        raise TooManyRounds(f"{count_text(n)} rounds: a number of rounds runs from 1 to {MAX_ROUNDS:,}")
    support = n * lattice.span + 1
    if support > FLOAT_SUPPORT:
        raise TooManyRounds(
            f"{n:,} rounds: the total after {n:,} rounds can take {count_text(support)} values, over the limit of "
            f"{FLOAT_SUPPORT:,} for its law (ask for fewer rounds)"
        )


def exact_fits(lattice: Lattice, n: int) -> bool:
    """Whether the law after n rounds is kept exactly (support and estimated size under the limits)."""
    support = n * lattice.span + 1
    return support <= EXACT_SUPPORT and support * n * max(lattice.denominator.bit_length(), 1) <= EXACT_BITS


def _horizon(
    lattice: Lattice,
    n: int,
    mean: Rational,
    variance: Rational,
    staked: Rational | None,
    should_stop: Callable[[], bool] | None,
) -> Horizon:
    notes: list[str] = []
    if exact_fits(lattice, n):
        chances = _exact_law(lattice, n, should_stop)
        method, error = "exact", None
    else:
        notes.append(
            f"the law after {n:,} rounds has {n * lattice.span + 1:,} values: past the exact limits ({EXACT_SUPPORT:,} "
            f"values, {EXACT_BITS:,} bits), so it is a float convolution (FFT); each chance is within "
            f"{FLOAT_CHANCE_ERROR:g} (absolute); the mean and variance are exact"
        )
        chances = _float_law(lattice, n, should_stop)
        method, error = "float", FLOAT_CHANCE_ERROR
    low = n * lattice.low
    size = n * lattice.span + 1

    def total(index: int) -> Figure:
        value = low + lattice.step * index
        return Figure(value if method == "exact" else None, to_float(value))

    def rtp(index: int) -> Figure:
        value = 1 + (low + lattice.step * index) / (n * staked)
        return Figure(value if method == "exact" else None, to_float(value))

    sd = math.sqrt(to_float(n * variance))
    normal = NormalDist(to_float(n * mean), sd) if sd > 0 else None
    ahead, even, behind = chances.split(*_around_zero(low, lattice.step, size))
    quantiles = tuple((q, total(chances.quantile_index(QQ(q, 100)))) for q in QUANTILES)
    normal_quantiles = tuple((q, normal.inv_cdf(q / 100) if normal else to_float(n * mean)) for q in QUANTILES)
    ranges = []
    for level in LEVELS if staked is not None else ():
        centre = 1 + to_float(mean / staked)
        tail = QQ(100 - level, 200)
        bottom, top = chances.quantile_index(tail), chances.quantile_index(1 - tail)
        spread = NormalDist().inv_cdf(1 - to_float(tail)) * sd / to_float(n * staked)
        inside = chances.between(bottom, top)
        ranges.append(ReturnRange(level, rtp(bottom), rtp(top), inside, centre - spread, centre + spread))
    if method == "float":
        notes.append(
            "quantiles of the float law: where the cumulative chance is within "
            f"{FLOAT_CHANCE_ERROR:g} of a level, a quantile may sit one lattice step off"
        )
    return Horizon(
        rounds=n,
        method=method,
        support=n * lattice.span + 1,
        low=low,
        step=lattice.step,
        mean=n * mean,
        variance=n * variance,
        ahead=ahead,
        even=even,
        behind=behind,
        quantiles=quantiles,
        normal_quantiles=normal_quantiles,
        rtp_ranges=tuple(ranges),
        error_bound=error,
        notes=tuple(notes),
    )


def _around_zero(low: Rational, step: Rational, size: int) -> tuple[int, int | None, int]:
    """Lattice indices around a total of 0: the last one below it (-1: none), the one at it (None: 0 is
    not on the lattice or outside it) and the first one above it (``size``: none)."""
    zero = -low / step
    below = numerator(zero) // denominator(zero)  # floor
    at = None
    if denominator(zero) == 1:
        at = below if 0 <= below < size else None
        below -= 1
    above = below + (2 if denominator(zero) == 1 else 1)
    return min(max(below, -1), size - 1), at, min(max(above, 0), size)


class _ExactLaw:
    """Integer weights over a common denominator: the chance of low + step x k is weights[k] / total."""

    def __init__(self, weights: list[int], total: int) -> None:
        self.weights = weights
        self.total = total
        self.cumulative: list[int] = []
        running = 0
        for weight in weights:
            running += weight
            self.cumulative.append(running)

    def chance(self, weight: int) -> Figure:
        value = QQ(weight, self.total)
        return Figure(value, to_float(value))

    def _up_to(self, index: int) -> int:
        return self.cumulative[index] if index >= 0 else 0

    def split(self, below: int, at: int | None, above: int) -> tuple[Figure, Figure, Figure]:
        """Chances of a total above 0, at 0 and below 0."""
        even = self.weights[at] if at is not None else 0
        return self.chance(self.total - self._up_to(above - 1)), self.chance(even), self.chance(self._up_to(below))

    def quantile_index(self, level: Rational) -> int:
        """The smallest index whose cumulative chance is at least ``level``."""
        target = level * self.total
        return _first_at_least(self.cumulative, lambda c: c >= target)

    def between(self, first: int, last: int) -> Figure:
        return self.chance(self._up_to(last) - self._up_to(first - 1))


class _FloatLaw:
    """Float chances of low + step x k (each within ``FLOAT_CHANCE_ERROR``)."""

    def __init__(self, chances) -> None:
        import numpy as np

        self.chances = chances
        self.cumulative = np.cumsum(chances)

    def split(self, below: int, at: int | None, above: int) -> tuple[Figure, Figure, Figure]:
        behind = float(self.chances[: below + 1].sum())
        even = Figure(None, float(self.chances[at])) if at is not None else Figure(QQ(0), 0.0)
        return Figure(None, float(self.chances[above:].sum())), even, Figure(None, behind)

    def quantile_index(self, level: Rational) -> int:
        import numpy as np

        index = int(np.searchsorted(self.cumulative, to_float(level), side="left"))
        return min(index, len(self.chances) - 1)

    def between(self, first: int, last: int) -> Figure:
        return Figure(None, float(self.chances[first : last + 1].sum()))


def _first_at_least(values: list[int], holds: Callable[[int], bool]) -> int:
    """Binary search over a non-decreasing list: the first index where ``holds`` is true."""
    lo, hi = 0, len(values) - 1
    while lo < hi:
        middle = (lo + hi) // 2
        if holds(values[middle]):
            hi = middle
        else:
            lo = middle + 1
    return lo


def _exact_law(lattice: Lattice, n: int, should_stop: Callable[[], bool] | None) -> _ExactLaw:
    from flint import fmpz_poly

    base = fmpz_poly(list(lattice.weights))
    power = _powered(base, n, lambda a, b: a * b, fmpz_poly([1]), should_stop)
    weights = [int(c) for c in power.coeffs()]
    weights += [0] * (n * lattice.span + 1 - len(weights))
    return _ExactLaw(weights, lattice.denominator**n)


def _float_law(lattice: Lattice, n: int, should_stop: Callable[[], bool] | None) -> _FloatLaw:
    import numpy as np
    from scipy.signal import convolve

    base = np.array([w / lattice.denominator for w in lattice.weights], dtype=float)

    def product(a, b):
        result = convolve(a, b, method="auto")
        np.clip(result, 0.0, None, out=result)  # FFT round-off below 0 is noise within the error bound
        return result

    return _FloatLaw(_powered(base, n, product, np.ones(1), should_stop))


def _powered(base, n: int, multiply, one, should_stop: Callable[[], bool] | None):
    """base^n by repeated squaring, asking ``should_stop`` between products."""
    result = one
    square = base
    while True:
        if should_stop is not None and should_stop():
            raise SolveCancelled
        if n & 1:
            result = multiply(result, square)
        n >>= 1
        if not n:
            return result
        square = multiply(square, square)

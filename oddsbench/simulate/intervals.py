"""Confidence intervals for simulation estimates: Wilson for chances, normal for means.

Wilson's score interval (E. B. Wilson, "Probable inference, the law of succession, and
statistical inference", J. Amer. Statist. Assoc. 22 (1927) 209-212) keeps its coverage near
0 and 1, where the plain normal interval collapses to a point; means and variances use the
central limit theorem with the sample's own standard error.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from statistics import NormalDist

DEFAULT_CONFIDENCE = 0.99


@dataclass(frozen=True)
class Interval:
    low: float
    high: float

    def contains(self, value: float) -> bool:
        """Inside, allowing for the rounding of a degenerate (zero-width) interval."""
        slack = 1e-12 * max(1.0, abs(self.low), abs(self.high))
        return self.low - slack <= value <= self.high + slack


def z_value(confidence: float) -> float:
    """Two-sided standard normal quantile: 2.5758... for 0.99."""
    if not 0 < confidence < 1:
        raise ValueError(f"confidence must be strictly between 0 and 1, got {confidence}")
    return NormalDist().inv_cdf(0.5 + confidence / 2)


def wilson_interval(successes: int, trials: int, confidence: float = DEFAULT_CONFIDENCE) -> Interval:
    """Wilson score interval for a binomial proportion."""
    if trials <= 0:
        return Interval(0.0, 1.0)
    z = z_value(confidence)
    p = successes / trials
    z2n = z * z / trials
    centre = (p + z2n / 2) / (1 + z2n)
    half = z * math.sqrt(p * (1 - p) / trials + z2n / (4 * trials)) / (1 + z2n)
    return Interval(max(0.0, centre - half), min(1.0, centre + half))


def normal_interval(estimate: float, standard_error: float, confidence: float = DEFAULT_CONFIDENCE) -> Interval:
    """estimate +- z * standard error."""
    half = z_value(confidence) * standard_error
    return Interval(estimate - half, estimate + half)

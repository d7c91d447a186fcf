"""Running sample moments over batches: mean, variance and the spread of the variance itself.

Sums of powers are taken about a fixed shift (the first batch's mean), which keeps float64
cancellation small when the mean is far from zero, and lets batches be added in any order.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np


@dataclass
class Moments:
    """Shifted power sums of one quantity, and its cross sum with a partner quantity."""

    count: int = 0
    shift: float | None = None
    s1: float = 0.0
    s2: float = 0.0
    s3: float = 0.0
    s4: float = 0.0

    def add(self, values: np.ndarray) -> None:
        if values.size == 0:
            return
        if self.shift is None:
            self.shift = float(np.mean(values))
        d = values - self.shift
        d2 = d * d
        self.count += values.size
        self.s1 += float(d.sum())
        self.s2 += float(d2.sum())
        self.s3 += float((d2 * d).sum())
        self.s4 += float((d2 * d2).sum())

    @property
    def mean(self) -> float:
        return (self.shift or 0.0) + self.s1 / self.count

    def central(self) -> tuple[float, float]:
        """Second and fourth central moments (divided by n)."""
        n = self.count
        m1, r2, r3, r4 = self.s1 / n, self.s2 / n, self.s3 / n, self.s4 / n
        m2 = max(r2 - m1 * m1, 0.0)
        m4 = max(r4 - 4 * m1 * r3 + 6 * m1 * m1 * r2 - 3 * m1**4, 0.0)
        return m2, m4

    @property
    def variance(self) -> float:
        """Unbiased sample variance."""
        n = self.count
        return self.central()[0] * n / (n - 1) if n > 1 else 0.0

    @property
    def mean_error(self) -> float:
        return math.sqrt(self.variance / self.count) if self.count else math.inf

    @property
    def variance_error(self) -> float:
        """Large-sample standard error of the sample variance: sqrt((m4 - m2^2) / n)."""
        m2, m4 = self.central()
        return math.sqrt(max(m4 - m2 * m2, 0.0) / self.count) if self.count else math.inf


@dataclass
class CrossMoment:
    """Sum of products of two quantities' deviations from their shifts: their covariance."""

    count: int = 0
    shift_x: float | None = None
    shift_y: float | None = None
    sx: float = 0.0
    sy: float = 0.0
    sxy: float = 0.0

    def add(self, x: np.ndarray, y: np.ndarray) -> None:
        if x.size == 0:
            return
        if self.shift_x is None:
            self.shift_x, self.shift_y = float(np.mean(x)), float(np.mean(y))
        dx, dy = x - self.shift_x, y - self.shift_y
        self.count += x.size
        self.sx += float(dx.sum())
        self.sy += float(dy.sum())
        self.sxy += float((dx * dy).sum())

    @property
    def covariance(self) -> float:
        n = self.count
        if n < 2:
            return 0.0
        return (self.sxy - self.sx * self.sy / n) / (n - 1)

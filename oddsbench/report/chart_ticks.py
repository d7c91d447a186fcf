"""Round tick values for chart axes (1, 2 or 5 times a power of ten), and their labels."""

from __future__ import annotations

import math

TICKS = 5  # about how many ticks an axis shows


def nice_step(span: float, ticks: int = TICKS) -> float:
    """The step between ticks: 1, 2 or 5 times a power of ten, giving about ``ticks`` ticks over ``span``."""
    if span <= 0 or not math.isfinite(span):
        return 1.0
    rough = span / max(1, ticks - 1)
    power = 10 ** math.floor(math.log10(rough))
    for factor in (1, 2, 5, 10):
        if factor * power >= rough:
            return factor * power
    return 10 * power


def nice_ticks(low: float, high: float, ticks: int = TICKS) -> list[tuple[float, str]]:
    """Ticks at round values covering ``low`` to ``high`` (the last at or above ``high``), each with
    its label: whole numbers without a decimal point, others with as few digits as the step needs."""
    step = nice_step(high - low, ticks)
    first = math.floor(low / step) * step
    count = math.ceil((high - first) / step - 1e-9)
    digits = max(0, -math.floor(math.log10(step))) if step < 1 else 0
    return [(first + k * step, _label(first + k * step, digits)) for k in range(count + 1)]


def _label(value: float, digits: int) -> str:
    if digits == 0:
        return f"{round(value):,}"
    return f"{value:.{digits}f}"


CHANCE_TICKS = ((0.0, "0"), (0.25, "0.25"), (0.5, "0.5"), (0.75, "0.75"), (1.0, "1"))  # a chance axis


def log_positions(values) -> list[float]:
    """Where values above 0 sit on a log axis drawn in plain coordinates (their base-ten logarithms):
    plotext's own log scale takes the logarithm again each time a chart is drawn anew."""
    return [math.log10(value) for value in values]


def log_ticks(low: float, high: float, ticks: int = TICKS + 2) -> list[tuple[float, str]]:
    """Ticks at powers of ten covering ``low`` to ``high`` (both above 0) for a log axis, at their
    positions (``log_positions``), labelled ``1, 10, 100, 1k, 10k, 1M``: every decade, or every other
    one (every third...) so at most ``ticks`` are shown; at least two."""
    first = math.floor(math.log10(max(low, 1e-300)) + 1e-9)
    last = max(first + 1, math.ceil(math.log10(max(high, 1e-300)) - 1e-9))
    every = max(1, math.ceil((last - first) / max(1, ticks - 1)))
    last = first + every * math.ceil((last - first) / every)
    return [(float(power), _power_label(power)) for power in range(first, last + 1, every)]


def _power_label(power: int) -> str:
    if power < 0:
        return f"1e{power}"
    for suffix, size in (("G", 9), ("M", 6), ("k", 3)):
        if power >= size:
            return f"{10 ** (power - size)}{suffix}"
    return str(10**power)


def percent_ticks(low: float, high: float, ticks: int = TICKS) -> list[tuple[float, str]]:
    """Round ticks for an axis of shares drawn as fractions (0.974) and labelled as percents (``97.5 %``)."""
    return [(value / 100, f"{label} %") for value, label in nice_ticks(low * 100, high * 100, ticks)]

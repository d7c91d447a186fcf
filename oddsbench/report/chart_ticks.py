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

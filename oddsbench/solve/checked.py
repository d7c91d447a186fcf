"""The one rule for a decimal beside its exact value: exact values are the truth where they exist,
the float engine's decimal is checked against them (a gap over the tolerance becomes a note), and
a decimal alone says what it cannot vouch for (not finite, underflow, a negative chance).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from oddsbench.model.figure import FLOAT_TINY, Figure
from oddsbench.model.numbers import Rational, log10_abs, to_float

UNRELIABLE_TINY = 1e-300  # a lone decimal this small may be underflow debris


@dataclass(frozen=True)
class Tolerance:
    """How far a decimal may stray from its exact value without a note: the larger of ``relative``
    times the value and ``absolute``. ``small_notes``: note here a value below the float range (exact)
    or a lone decimal that is underflow debris or a negative chance; engines that name such values
    themselves, once per figure rather than once per bankroll, turn it off."""

    relative: float
    absolute: float
    small_notes: bool = True


def checked_figure(
    name: str,
    exact: Rational | None,
    decimal: float,
    notes: list[str],
    tolerance: Tolerance,
    log10: float | None = None,
    digits: int | None = None,
) -> Figure:
    """The figure to show: the exact value with a note where the float engine disagrees with it;
    without one, the decimal with the digits its solve vouches for, or its log10 below the float range."""
    decimal = float(decimal)
    if exact is None:
        if log10 is not None:  # below the float range: its size is known from the log-space engine
            return Figure(None, 0.0, log10)
        if not math.isfinite(decimal):
            notes.append(f"{name}: the float engine gave {decimal}; no exact value to fall back on")
        elif tolerance.small_notes and decimal != 0 and abs(decimal) < UNRELIABLE_TINY:
            notes.append(
                f"{name}: the float engine gives {decimal:.3g}, so small that floating point is unreliable "
                "(underflow); raise --exact-limit for the exact value"
            )
        elif tolerance.small_notes and "probability" in name and decimal < 0:
            notes.append(f"{name}: the float engine gives a negative chance ({decimal:.3g}): rounding error")
        return Figure(None, decimal, None, digits)
    truth = to_float(exact)
    if tolerance.small_notes and exact != 0 and abs(truth) < FLOAT_TINY:
        notes.append(
            f"{name}: the exact value is about 1e{log10_abs(exact):.0f}, below the floating-point range; "
            f"the float engine gives {decimal!r} (underflow); the exact value stands"
        )
        return Figure(exact, truth)
    limit = max(tolerance.relative * abs(truth), tolerance.absolute)
    if not math.isfinite(decimal) or abs(decimal - truth) > limit:
        shown = repr(truth) if math.isfinite(truth) else f"about 1e{log10_abs(exact):.0f}, beyond the float range"
        notes.append(
            f"numerical warning: {name}: float engine gives {decimal!r}, exact value is {shown}; "
            "the exact value is shown"
        )
    return Figure(exact, truth)

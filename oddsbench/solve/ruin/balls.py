"""Ball (interval) arithmetic with python-flint's arb/acb (and, re-exported, the cancel context
of ``solve/cancel.py`` the ruin engines use: ``cancellable``, ``current_stop``).

Every decimal of play with no goal is a ball: a midpoint and a proved radius. ``certified``
prints only the digits the radius proves; ``with_retries`` raises the working precision until
they are enough. ``flint.ctx.prec`` is set only through ``precision``, which restores it.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Any

from oddsbench.model.defaults import NO_GOAL_DIGITS
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import Rational, denominator, numerator
from oddsbench.solve.cancel import cancellable, current_stop, stop_if_asked  # noqa: F401 - the ruin engines' names


@dataclass(frozen=True)
class Certified:
    """A real number known inside a proved interval: ``text`` is correct to its last digit."""

    text: str
    # the radius of the proved interval the digits were read from ("0" when exact); the digits in
    # ``text`` are rounded from its midpoint, so they are within one unit of their last place, not
    # within ``radius``: say so with ``error_bound_text``
    radius: str
    log10: float  # log10 of the value (-inf for 0), usable far below the float range
    value: float  # nearest float (0.0 when the value is below the float range)

    def __str__(self) -> str:
        return self.text


DEFAULT_DIGITS = NO_GOAL_DIGITS  # one default for the engines, the core and --digits
MAX_DIGITS = 2000


@contextmanager
def precision(bits: int) -> Iterator[None]:
    import flint

    saved = flint.ctx.prec
    flint.ctx.prec = max(int(bits), 64)
    try:
        yield
    finally:
        flint.ctx.prec = saved


def bits_for(digits: int, level: int = 1) -> int:
    """Working precision for ``digits`` correct digits of a power up to ``level``."""
    return int((digits + 12) * 3.33) + max(level, 1).bit_length() + 32


def arb_of(value: Rational):
    from flint import arb, fmpq

    return arb(fmpq(numerator(value), denominator(value)))


def certified(ball, digits: int) -> Certified:
    """Text with at most ``digits`` significant digits, each proved by the ball's radius."""
    from flint import arb

    if ball.is_exact() and ball.mid() == 0:
        return Certified("0", "0", -math.inf, 0.0)
    shown = ball.str(digits, radius=False)
    radius = ball.rad()
    radius_text = "0" if radius == 0 else arb(radius).str(3, radius=False)
    magnitude = abs(ball.mid())
    log10 = float((arb(magnitude).log() / arb(10).log()).mid()) if magnitude > 0 else -math.inf
    try:
        value = float(ball.mid())
    except (OverflowError, ValueError):
        value = 0.0
    return Certified(shown, radius_text, log10, value)


def error_bound_text(radius: str, how: str = "proved by interval arithmetic") -> str:
    """What the error of certified digits is: one unit in their last place (they are rounded), and
    the radius of the interval they were read from, said apart so no one adds them up wrongly."""
    return (
        "every digit shown is correct to within one unit of the last; "
        f"the interval it was read from has radius at most {radius} ({how})"
    )


def certified_exact(value: Rational, digits: int = DEFAULT_DIGITS) -> Certified:
    """An exact rational as a Certified decimal with radius 0."""
    with precision(bits_for(digits)):
        ball = arb_of(value)
        shown = certified(ball, digits)
    return Certified(shown.text, "0", shown.log10, shown.value)


def enough(ball, digits: int) -> bool:
    """True when the ball pins ``digits`` significant digits (relative radius small enough)."""
    from flint import arb

    magnitude = abs(ball.mid())
    if magnitude == 0:
        return ball.rad() == 0
    return ball.rad() <= magnitude * arb(10) ** (-(digits + 2))


def with_retries(compute: Callable[[], Any], digits: int, level: int, check: Callable[[Any], bool]):
    """Run ``compute`` at growing precision until ``check`` accepts its balls: (result, bits)."""
    bits = bits_for(digits, level)
    for _ in range(6):
        stop_if_asked(current_stop())
        with precision(bits):
            result = compute()
            if check(result):
                return result, bits
        bits *= 2
    raise OddsbenchError(f"could not reach {digits} correct digits even at {bits // 2} bits of precision")


def interval(lower_ball, gap_ball):
    """The ball covering [lower, lower + gap]: a truncation's answer with its proved gap."""
    from flint import arb

    return arb(lower_ball.mid() + gap_ball.mid() / 2, gap_ball.mid() / 2 + gap_ball.rad() + lower_ball.rad())

"""Exact rationals for the whole project: sympy's QQ domain (FLINT's fmpq underneath).

Every module takes its exact numbers from here so the number type, its conversions and its
size measures live in one place.
"""

from __future__ import annotations

from typing import Any

from sympy.polys.domains import QQ, ZZ

Rational = Any  # an element of QQ (flint.fmpq or sympy's PythonMPQ, depending on ground types)

_RATIONAL_TYPE = type(QQ(1))

__all__ = ["QQ", "ZZ", "Rational", "bit_size", "int_text", "is_integer", "to_int", "to_float", "text", "parse_fraction"]


def is_rational(value: object) -> bool:
    """Whether ``value`` is already an exact number of ours (a family hands its evaluated values on as such)."""
    return isinstance(value, _RATIONAL_TYPE)


def numerator(value: Rational) -> int:
    return int(QQ.numer(value))


def denominator(value: Rational) -> int:
    return int(QQ.denom(value))


def bit_size(value: Rational) -> int:
    """Bits in numerator plus denominator: the measure our size limits use."""
    return numerator(value).bit_length() + denominator(value).bit_length()


def is_integer(value: Rational) -> bool:
    return denominator(value) == 1


def to_int(value: Rational) -> int:
    return numerator(value) // denominator(value)


def to_float(value: Rational) -> float:
    """Correctly rounded float of an exact value (Python's int division rounds exactly)."""
    try:
        return numerator(value) / denominator(value)
    except OverflowError:
        return float("inf") if value > 0 else float("-inf")


def int_text(value: int) -> str:
    """Decimal digits of any integer. Python refuses ``str`` of ints over 4,300 digits (a guard
    against slow conversion); FLINT's conversion is fast and has no such limit."""
    if value.bit_length() < 13_000:  # under 3,900 digits: well inside Python's limit
        return str(value)
    from flint import fmpz

    return str(fmpz(value))


def count_text(count: int) -> str:
    """A whole count for a message: ``12,345``, or ``about 10^50`` past the digits anyone reads."""
    return (
        f"{count:,}" if abs(count) < 10**15 else f"about {'-' if count < 0 else ''}10^{len(int_text(abs(count))) - 1}"
    )


def log10_abs(value: Rational) -> float:
    """log10 |value| (value not 0) from the integers, so it works far outside the float range."""
    return _log10_int(abs(numerator(value))) - _log10_int(denominator(value))


def _log10_int(value: int) -> float:
    import math

    shift = max(value.bit_length() - 64, 0)
    return math.log10(value >> shift) + shift * math.log10(2)


def text(value: Rational) -> str:
    """Exact text: ``7/495``, ``-1``, ``0``."""
    p, q = numerator(value), denominator(value)
    return int_text(p) if q == 1 else f"{int_text(p)}/{int_text(q)}"


def parse_fraction(value: str) -> Rational:
    """Inverse of ``text`` for trusted machine output (integers and a/b only)."""
    top, _, bottom = value.partition("/")
    return QQ(_int_from_text(top), _int_from_text(bottom or "1"))


def _int_from_text(digits: str) -> int:
    if len(digits) < 4000:
        return int(digits)
    from flint import fmpz

    return int(fmpz(digits.strip()))

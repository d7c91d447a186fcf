"""Exact rationals for the whole project: python-flint's ``fmpq`` (FLINT), through a small ``QQ``.

Every module takes its exact numbers from here so the number type, its conversions and its
size measures live in one place. ``QQ`` is the part of sympy's rational domain the project uses
(``QQ(3, 4)``, ``QQ.numer``, ``QQ.denom``) on the same element type sympy itself uses when
python-flint is installed (``oddsbench/__init__.py`` asks sympy for FLINT ground types), so values
pass to sympy's exact solvers as they are, while reading and checking a file never imports sympy
(0.7 s of start-up).
"""

from __future__ import annotations

from typing import Any

from flint import fmpq

Rational = Any  # a flint.fmpq

__all__ = ["QQ", "Rational", "bit_size", "int_text", "is_integer", "to_int", "to_float", "text", "parse_fraction"]


class _Rationals:
    """``QQ(3, 4)``, ``QQ(value)``, ``QQ.numer(x)``, ``QQ.denom(x)``, ``QQ.of_type(x)``: flint ``fmpq`` rationals."""

    dtype = fmpq

    def __call__(self, numerator: Any = 0, denominator: Any = 1) -> Rational:
        value = _as_fmpq(numerator)
        return value if denominator == 1 else value / _as_fmpq(denominator)

    @staticmethod
    def of_type(value: Any) -> bool:
        return isinstance(value, fmpq)

    @staticmethod
    def numer(value: Rational):
        return value.p

    @staticmethod
    def denom(value: Rational):
        return value.q

    def __repr__(self) -> str:
        return "QQ"


def _as_fmpq(value: Any) -> Rational:
    if isinstance(value, fmpq):
        return value
    if isinstance(value, float):
        return fmpq(*value.as_integer_ratio())
    if hasattr(value, "p") and hasattr(value, "q"):  # sympy's own rationals (python ground types)
        return fmpq(int(value.p), int(value.q))
    return fmpq(int(value))


QQ = _Rationals()


def is_rational(value: object) -> bool:
    """Whether ``value`` is already an exact number of ours (a family hands its evaluated values on as such)."""
    return isinstance(value, fmpq)


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


def from_sympy(value) -> Rational:
    """A rational from sympy's domain (whatever its ground types) as ours."""
    return fmpq(int(value.numerator), int(value.denominator))

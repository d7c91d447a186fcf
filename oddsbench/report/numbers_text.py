"""Exact | decimal text for figures: the one place that decides how numbers are shown."""

from __future__ import annotations

import math

from oddsbench.model.numbers import Rational, denominator, int_text, numerator, text

MAX_EXACT_WIDTH = 40
SIGNIFICANT = 6


def exact_text(value: Rational | None, width: int | None = MAX_EXACT_WIDTH) -> str:
    """``7/495``; very long values are cut in the middle with their digit count; ``-`` if none."""
    if value is None:
        return "-"
    full = text(value)
    if width is None or len(full) <= width:
        return full
    p, q = numerator(value), denominator(value)
    return f"{_short_int(p)}/{_short_int(q)}" if q != 1 else _short_int(p)


def fit_exact(full: str, width: int) -> str:
    """Exact text within ``width`` characters: whole when it fits (never shortened then), else each long
    integer cut in the middle with its digit count, else the leading digits and the digit counts
    (``40609.../36561... (18/17 digits)``), else only the digit counts. Text that is not a number
    (a closed form) is cut at the end."""
    if len(full) <= width:
        return full
    sign = "-" if full.startswith("-") else ""
    parts = full.removeprefix("-").split("/")
    if len(parts) > 2 or not all(part.isdigit() for part in parts):
        return full[: max(0, width - 1)] + "…"
    middle = sign + "/".join(_cut_digits(part) for part in parts)
    if len(middle) <= width:
        return middle
    counts = "/".join(str(len(part)) for part in parts)
    for lead in (6, 4, 2, 1):
        compact = sign + "/".join(part[:lead] + "..." for part in parts) + f" ({counts} digits)"
        if len(compact) <= width:
            return compact
    for bare in (f"{sign}({counts} digits)", f"{sign}{counts} digits"):
        if len(bare) <= width:
            return bare
    return "…"


def _cut_digits(digits: str) -> str:
    return digits if len(digits) <= 14 else f"{digits[:5]}...{digits[-3:]} ({len(digits)} digits)"


def _short_int(value: int) -> str:
    digits = int_text(abs(value))
    sign = "-" if value < 0 else ""
    if len(digits) <= 14:
        return sign + digits
    return f"{sign}{digits[:5]}...{digits[-3:]} ({len(digits)} digits)"


def log10_abs(value: Rational) -> float:
    """log10 |value| from the integers, so it works far below the float range."""
    p, q = abs(numerator(value)), denominator(value)
    return _log10_int(p) - _log10_int(q)


def _log10_int(value: int) -> float:
    bits = value.bit_length()
    if bits < 1000:
        return math.log10(value)
    shift = bits - 64
    return math.log10(value >> shift) + shift * math.log10(2)


def decimal_text(decimal: float, exact: Rational | None = None, percent: bool = False) -> str:
    """Six significant digits; values beyond the float range are given as powers of ten."""
    if decimal == 0:
        decimal = 0.0  # a float engine's -0.0 (a fair game's edge) reads as 0
    if exact is not None and exact != 0 and (decimal == 0 or math.isinf(decimal)):
        power = log10_abs(exact)
        sign = "-" if exact < 0 else ""
        mantissa = 10 ** (power - math.floor(power))
        return f"{sign}{mantissa:.5f}e{math.floor(power):+d}"
    if math.isnan(decimal):
        return "not a number"
    if math.isinf(decimal):
        return "infinite" if decimal > 0 else "-infinite"
    shown = f"{decimal:.{SIGNIFICANT}g}"
    if percent and abs(decimal) < 10:
        shown += f" ({decimal * 100:.{max(SIGNIFICANT - 2, 1)}g} %)"
    return shown


def render_table(headers: list[str], rows: list[list[str]], right: set[int] | None = None) -> str:
    """A plain aligned text table for terminals and pipes."""
    right = right if right is not None else set(range(1, len(headers)))
    widths = [max(len(str(cell)) for cell in column) for column in zip(headers, *rows)]

    def line(cells: list[str]) -> str:
        parts = [
            str(cell).rjust(width) if i in right else str(cell).ljust(width)
            for i, (cell, width) in enumerate(zip(cells, widths))
        ]
        return "  ".join(parts).rstrip()

    rule = "  ".join("-" * width for width in widths)
    return "\n".join([line(headers), rule] + [line(row) for row in rows])

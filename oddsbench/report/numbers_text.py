"""Exact | decimal text for figures: the one place that decides how numbers are shown."""

from __future__ import annotations

import math

from oddsbench.model.figure import FLOAT_TINY, Figure
from oddsbench.model.numbers import Rational, denominator, int_text, log10_abs, numerator, text

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


def shown_log10(figure: Figure) -> float | None:
    """log10 of a figure's size where its decimal cannot hold it (below the normal float range or
    beyond it): from the engine's log10, else from the exact value; None where the decimal holds it."""
    if figure.log10 is not None:
        return figure.log10
    decimal = figure.decimal
    if figure.exact is not None and figure.exact != 0:
        if not math.isfinite(decimal) or abs(decimal) < FLOAT_TINY:
            return log10_abs(figure.exact)
    return None


def figure_decimal_text(figure: Figure, percent: bool = False) -> str:
    """A figure's decimal: six significant digits (fewer where the engine vouches for fewer), a
    power of ten where the value is outside the float range, never a denormal or a silent 0."""
    return decimal_text(figure.decimal, figure.exact, percent, figure.log10, figure.digits)


def decimal_text(
    decimal: float,
    exact: Rational | None = None,
    percent: bool = False,
    log10: float | None = None,
    digits: int | None = None,
) -> str:
    """Six significant digits (or ``digits``); values beyond the float range as powers of ten."""
    if decimal == 0:
        decimal = 0.0  # a float engine's -0.0 (a fair game's edge) reads as 0
    power = shown_log10(Figure(exact, decimal, log10))
    if power is not None:
        negative = exact is not None and exact < 0
        return ("-" if negative else "") + power_text(power, min(SIGNIFICANT, digits or SIGNIFICANT))
    if math.isnan(decimal):
        return "not a number"
    if math.isinf(decimal):
        return "infinite" if decimal > 0 else "-infinite"
    if decimal != 0 and abs(decimal) < FLOAT_TINY:
        return ("-" if decimal < 0 else "") + "below 2.2e-308"  # a denormal: only its size is known
    significant = min(SIGNIFICANT, digits) if digits else SIGNIFICANT
    shown = f"{decimal:.{significant}g}"
    if percent and abs(decimal) < 10:
        shown += f" ({decimal * 100:.{max(significant - 2, 1)}g} %)"
    return shown


def power_text(log10: float, significant: int = SIGNIFICANT) -> str:
    """10**log10 as ``7.76989e-2349``: the leading digits and the exponent, from the log alone."""
    exponent = math.floor(log10)
    mantissa = f"{10 ** (log10 - exponent):.{max(significant - 1, 0)}f}"
    if float(mantissa) >= 10:  # rounding carried into the next power
        exponent += 1
        mantissa = f"{1:.{max(significant - 1, 0)}f}"
    return f"{mantissa}e{exponent:+d}"


def csv_decimal(figure: Figure) -> str:
    """A figure's decimal for CSV: the float's repr, or its power of ten where a float cannot hold it."""
    power = shown_log10(figure)
    if power is not None:
        return ("-" if figure.exact is not None and figure.exact < 0 else "") + power_text(power)
    return repr(figure.decimal)


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

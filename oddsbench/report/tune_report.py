"""``oddsbench tune`` as text and as the documented JSON object: the formula, how it was found,
the valid range, and every value of the parameter that gives the target (formatting only)."""

from __future__ import annotations

import textwrap
from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import Rational, text, to_float
from oddsbench.report.cautions import caution_block
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table
from oddsbench.report.round_report import figure_json

if TYPE_CHECKING:
    from oddsbench.core.results import Solution, TuneResults


def _end_text(edge, variable: str) -> str:
    return "unbounded" if edge.at is None else edge.at.text(variable)


def valid_range_text(results: TuneResults) -> str:
    if not results.valid_range:
        return f"no value of {results.parameter} keeps every chance in [0, 1]"
    parts = []
    for low, high in results.valid_range:
        if low.at is None and high.at is None:
            return f"every value of {results.parameter} (no chance depends on it)"
        left = "(-inf" if low.at is None else ("[" if low.closed else "(") + _end_text(low, results.parameter)
        right = "inf)" if high.at is None else _end_text(high, results.parameter) + ("]" if high.closed else ")")
        parts.append(f"{left}, {right}")
    return " or ".join(parts) + " (every chance in [0, 1])"


def _target_text(results: TuneResults) -> str:
    shown = f"{results.figure} = {text(results.target)}"
    return shown if results.target_given else f"{shown} (break-even)"


def _heading(results: TuneResults) -> list[str]:
    play = f", strategy {results.strategy!r}" if results.strategy else ""
    now = ""
    if results.figure_now is not None:
        cell = exact_text(results.figure_now.exact) if results.figure_now.exact is not None else "-"
        now = f", where {results.figure} = {cell} ({decimal_text(results.figure_now.decimal)})"
    return [
        f"{results.title}: tune {results.parameter!r} (now {text(results.current)}{now}){play}",
        f"Target: {_target_text(results)}",
    ]


def _how(results: TuneResults) -> list[str]:
    bound = results.bound
    name = results.parameter
    if bound is None:
        return []
    enters = []
    if bound.prob:
        enters.append(f"the chances of {bound.rows:,} of {bound.states:,} transient states with degree {bound.prob}")
    if bound.pay:
        enters.append(f"the pays with degree {bound.pay}")
    if bound.stake:
        enters.append(f"the stakes with degree {bound.stake}")
    return textwrap.wrap(
        f"Found exactly: {name} enters {' and '.join(enters) or 'no chance, pay or stake'}, so by Cramer's rule "
        f"the numerator has degree at most {bound.numerator} and the denominator at most {bound.denominator}; "
        f"reconstructed from {bound.solves} exact solves and confirmed by {bound.confirmed} more.",
        width=100,
    )


def value_rows(results: TuneResults) -> list[list[str]]:
    rows = []
    for value in results.values:
        solution = value.solution
        if value.valid is False:
            status = "outside the valid range" + (f": {value.problem}" if value.problem else "")
        elif value.valid is None:
            status = "at an edge of the valid range (a chance is 0 or 1 there)"
        else:
            status = "valid"
        if value.confirmed:
            status += "; solving the file at it gives the target exactly"
        elif value.confirmed is False and value.problem is None:
            status += "; solving the file at it does NOT give the target"
        decimal = solution.decimal.text if solution.exact is None else decimal_text(solution.approximate)
        rows.append([solution.text(results.parameter), decimal, status])
    return rows


def _bracket_rows(results: TuneResults) -> list[list[str]]:
    rows = []
    for bracket in results.brackets:
        where = text(bracket.low) if bracket.exact else f"[{exact_text(bracket.low)}, {exact_text(bracket.high)}]"
        decimal = (
            decimal_text(to_float(bracket.low))
            if bracket.exact
            else (f"{to_float(bracket.low):.12g} .. {to_float(bracket.high):.12g}")
        )
        figure = _figure_cell(bracket.figure_low)
        if not bracket.exact:
            figure += f" .. {_figure_cell(bracket.figure_high)}"
        rows.append([where, decimal, figure, "exactly" if bracket.exact else f"{bracket.steps} bisections"])
    return rows


def _figure_cell(figure: Figure) -> str:
    return f"{figure.decimal:.10g}"


def tune_text(results: TuneResults, cautions: bool = True) -> str:
    """The human output of ``oddsbench tune``; ``cautions`` False leaves out the cautions block for a
    screen that keeps them on its own line (the workbench's tune dialog, F9 for the full text)."""
    name = results.parameter
    parts = _heading(results) + [""]
    if results.kind == "constant":
        parts.append(
            f"{results.figure} does not depend on {name}: "
            + ("every value gives the target" if results.every_value else "no value gives the target")
        )
    elif results.formula is not None:
        label = f"{results.figure}^2" if results.figure == "net_sd" else results.figure
        parts.append(f"{label}({name}) = {results.formula.text(name)}")
        parts += _how(results)
        parts.append(f"Valid range: {valid_range_text(results)}.")
        parts.append("")
        if results.every_value:
            parts.append(f"Every valid value of {name} gives the target: the figure is that constant.")
        elif not results.values:
            parts.append(f"No real value of {name} gives {_target_text(results)}.")
        else:
            parts.append(f"Values of {name} giving {_target_text(results)}:")
            parts.append(
                render_table([name, "decimal (every digit proved)", "status"], value_rows(results), right=set())
            )
    else:
        kind = "piecewise in" if results.kind == "piecewise" else "not a polynomial function of"
        parts.append(f"{results.figure} is {kind} {name}, so it is not found as one formula:")
        parts += [f"  - {reason}" for reason in results.reasons]
        low, high = results.scanned or (results.current, results.current)
        parts += textwrap.wrap(
            f"{_search_text(results)}: {name} scanned from {text(low)} to {text(high)} "
            "(steps doubling away from the file's value, or evenly with --between LO,HI); crossings of the target:",
            width=100,
        )
        if results.brackets:
            headers = [f"{name} (bracket)", "decimal", results.figure + " at its ends", "how"]
            parts.append(render_table(headers, _bracket_rows(results), right=set()))
        else:
            parts.append("  none found in the scanned values (try --between LO,HI)")
    if results.notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in results.notes]
    if cautions:
        parts += ["", caution_block()]
    return "\n".join(parts)


def _search_text(results: TuneResults) -> str:
    """How the crossings were searched: over whole values the bisection ends at two neighbouring
    whole values, exactly, whatever the tolerance; otherwise to the tolerance."""
    if results.whole:
        return (
            f"Exact bisection over whole values of {results.parameter} (each crossing between two neighbouring "
            "whole values; no tolerance applies)"
        )
    return f"Exact bisection to {text(results.tolerance)}"


def _value(value: Rational | None) -> dict[str, Any] | None:
    return None if value is None else figure_json(Figure(value, to_float(value)))


def _solution_json(solution: Solution) -> dict[str, Any]:
    return {
        "exact": None if solution.exact is None else text(solution.exact),
        "polynomial": [str(c) for c in solution.polynomial],
        "root_index": solution.index,
        "decimal": solution.decimal.text,
        "radius": solution.decimal.radius,
        "approximate": solution.approximate,
    }


def _edge_json(edge) -> dict[str, Any] | None:
    return None if edge.at is None else {**_solution_json(edge.at), "closed": edge.closed}


def tune_json(results: TuneResults) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench tune``."""
    formula = None
    if results.formula is not None:
        formula = {
            "text": results.formula.text(results.parameter),
            "of": f"{results.figure}^2" if results.figure == "net_sd" else results.figure,
            "numerator": [str(c) for c in results.formula.numerator],
            "denominator": [str(c) for c in results.formula.denominator],
        }
    bound = results.bound
    body: dict[str, Any] = {
        "ruleset": results.title,
        "parameter": {"name": results.parameter, "current": _value(results.current)},
        "figure": results.figure,
        "target": _value(results.target),
        "target_given": results.target_given,
        "strategy": results.strategy,
        "figure_now": None if results.figure_now is None else figure_json(results.figure_now),
        "kind": results.kind,
        "formula": formula,
        "degree_bound": None
        if bound is None
        else {
            "numerator": bound.numerator,
            "denominator": bound.denominator,
            "states_depending": bound.rows,
            "states": bound.states,
            "prob_degree": bound.prob,
            "pay_degree": bound.pay,
            "stake_degree": bound.stake,
            "solves": bound.solves,
            "confirmed": bound.confirmed,
        },
        "valid_range": [{"low": _edge_json(low), "high": _edge_json(high)} for low, high in results.valid_range],
        "every_value": results.every_value,
        "solutions": [
            {**_solution_json(v.solution), "valid": v.valid, "confirmed": v.confirmed, "problem": v.problem}
            for v in results.values
        ],
        "reasons": list(results.reasons),
        "brackets": [
            {
                "low": _value(b.low),
                "high": _value(b.high),
                "figure_low": figure_json(b.figure_low),
                "figure_high": figure_json(b.figure_high),
                "bisections": b.steps,
            }
            for b in results.brackets
        ],
        "scanned": None if results.scanned is None else [_value(results.scanned[0]), _value(results.scanned[1])],
        "tolerance": _value(results.tolerance),
        "whole_values": results.whole,
        "notes": list(results.notes),
    }
    return envelope("tune", body)


def applicable_values(results: TuneResults) -> list[tuple[str, str]]:
    """(label, value text) for each value of the parameter a designer may apply: every valid
    solution (a rational exactly; an algebraic one as its proved decimal, which rounds it), or the
    two ends of each bracket of a piecewise figure, with the figure there."""
    name = results.parameter
    choices: list[tuple[str, str]] = []
    for value in results.values:
        if value.valid is False:
            continue
        solution = value.solution
        if solution.exact is not None:
            choices.append(
                (f"{name} = {text(solution.exact)} ({decimal_text(solution.approximate)})", text(solution.exact))
            )
        else:
            digits = solution.decimal.text
            choices.append((f"{name} = {digits} (rounds {solution.text(name)})", digits))
    for bracket in results.brackets:
        ends = [bracket.low] if bracket.exact else [bracket.low, bracket.high]
        figures = [bracket.figure_low] if bracket.exact else [bracket.figure_low, bracket.figure_high]
        for end, figure in zip(ends, figures):
            label = f"{name} = {exact_text(end)} ({results.figure} {_figure_cell(figure)})"
            choices.append((label, text(end)))
    return choices

"""Simulation results beside exact figures, as terminal text and as JSON."""

from __future__ import annotations

import re
from typing import Any

from oddsbench.model.numbers import text
from oddsbench.report.cautions import CAUTIONS, caution_block
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table
from oddsbench.report.round_report import figure_label
from oddsbench.simulate.checks import Check
from oddsbench.simulate.round_sim import RoundSample

INSIDE = "inside"
OUTSIDE = "OUTSIDE <<"
NO_EXACT = "no exact value"
_KEYED = re.compile(r"^(end_probability|result_probability)\[(.*)\]$")


def check_label(name: str, sample: RoundSample | None = None) -> str:
    keyed = _KEYED.match(name)
    if not keyed:
        return figure_label(name)
    kind, key = keyed.groups()
    if kind == "result_probability":
        return f"result {key!r}"
    result = None
    if sample is not None and key in sample.end_names:
        result = sample.end_results[sample.end_names.index(key)]
    return f"ends in {key!r}" + (f" ({result})" if result else "")


def check_status(check: Check) -> str:
    if check.exact is None:
        return NO_EXACT
    return OUTSIDE if check.outside else INSIDE


def _number(value: float) -> str:
    return decimal_text(value)


def check_rows(checks: list[Check], sample: RoundSample | None = None) -> list[list[str]]:
    rows = []
    for check in checks:
        exact = check.exact
        rows.append(
            [
                check_label(check.name, sample),
                _number(check.estimate),
                f"[{_number(check.interval.low)}, {_number(check.interval.high)}]",
                exact_text(exact.exact) if exact is not None else "-",
                decimal_text(exact.decimal, exact.exact) if exact is not None else "-",
                check_status(check),
            ]
        )
    return rows


def verdict(checks: list[Check], confidence: float) -> str:
    compared = [c for c in checks if c.exact is not None]
    outside = [c for c in compared if c.outside]
    level = f"{confidence * 100:g} %"
    if not compared:
        return "No exact values to compare with."
    kind = "exact values" if all(c.exact.exact is not None for c in compared) else "solver values (decimal only)"
    if not outside:
        return f"All {len(compared)} {kind} lie inside their {level} intervals."
    names = ", ".join(check_label(c.name) for c in outside)
    return (
        f"{len(outside)} of {len(compared)} {kind} fall OUTSIDE their {level} intervals: {names}. "
        f"By chance alone about {(1 - confidence) * 100:g} in 100 would; run again with another seed "
        "or more trials to tell chance from a wrong model."
    )


def simulation_text(
    sample: RoundSample,
    checks: list[Check],
    confidence: float,
    strategy: str | None = None,
    solver_notes: tuple[str, ...] = (),
) -> str:
    """The human output of ``oddsbench simulate`` for rounds; ``solver_notes`` from the exact side."""
    heading = f"{sample.title}: {sample.trials:,} simulated rounds from {sample.start!r}, seed {sample.seed}" + (
        f", playing {strategy!r}" if strategy else ""
    )
    speed = (
        f"{sample.seconds:.2f} s, {sample.rounds_per_second:,.0f} rounds/s, "
        f"{sample.steps_taken:,} steps; intervals at {confidence * 100:g} %: "
        "Wilson for chances, normal for means and variances"
    )
    headers = ["quantity", "estimate", f"{confidence * 100:g} % interval", "exact", "exact decimal", "check"]
    table = render_table(headers, check_rows(checks, sample), right={1, 2, 3, 4})
    parts = [heading, speed, "", table, "", verdict(checks, confidence)]
    notes = simulation_notes(sample) + list(solver_notes)
    if notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def simulation_notes(sample: RoundSample) -> list[str]:
    notes = []
    if sample.unfinished:
        notes.append(
            f"{sample.unfinished:,} of {sample.trials:,} rounds had not ended after {sample.max_steps:,} steps "
            "and are left out of the means; the estimates lean towards short rounds (raise --max-steps)"
        )
    return notes


def check_json(check: Check) -> dict[str, Any]:
    exact = check.exact
    return {
        "name": check.name,
        "estimate": check.estimate,
        "interval": [check.interval.low, check.interval.high],
        "method": check.method,
        "exact": None if exact is None or exact.exact is None else text(exact.exact),
        "exact_decimal": None if exact is None else exact.decimal,
        "outside": check.outside,
    }


def simulation_json(
    sample: RoundSample, checks: list[Check], confidence: float, solver_notes: tuple[str, ...] = ()
) -> dict[str, Any]:
    return {
        "ruleset": sample.title,
        "start": sample.start,
        "trials": sample.trials,
        "seed": sample.seed,
        "confidence": confidence,
        "seconds": sample.seconds,
        "rounds_per_second": sample.rounds_per_second,
        "unfinished": sample.unfinished,
        "policy": dict(sample.actions),
        "estimates": [check_json(check) for check in checks],
        "outside": [check.name for check in checks if check.outside],
        "notes": simulation_notes(sample) + list(solver_notes),
        "cautions": list(CAUTIONS),
    }

"""Strategy rules over families: ``[strategies.NAME] rules = [...]`` resolved at load time.

A rule ``{ family = "turn", when = "t >= 20", action = "hold" }`` picks an action for every
member of a family whose index values meet ``when`` (through ``model/expr.py``, with the file's
parameters). Rules become plain (state, action) pairs, so a ``Strategy`` stays a flat map.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from oddsbench.model.errors import Problem, shown_name, type_name
from oddsbench.model.expr import ExpressionError, evaluate, parse
from oddsbench.model.families import FamilyMember
from oddsbench.model.numbers import Rational, text

RULE_KEYS = frozenset({"family", "when", "action"})


def rule_actions(
    rules: Any,
    where: str,
    members: Mapping[str, FamilyMember],
    params: Mapping[str, Rational],
    explicit: set[str],
    problems: list[Problem],
    source: str,
) -> list[tuple[str, str]]:
    """(state, action) pairs from a strategy's ``rules``: the first rule that matches a state wins.

    A rule is ``{ family = "turn", when = "t >= 20", action = "hold" }``; ``when`` may use the
    family's index variables and the file's parameters. States named in the strategy by hand keep
    their hand-written action.
    """

    def error(place: str, message: str) -> None:
        problems.append(Problem(source, place, message))

    if not isinstance(rules, list):
        error(f"{where}, rules", 'must be a list of { family = "...", when = "...", action = "..." }')
        return []
    families = {member.family for member in members.values()}
    chosen: dict[str, str] = {}
    for number, rule in enumerate(rules, start=1):
        place = f"{where}, rule {number}"
        if not isinstance(rule, dict):
            error(place, f'must be a table like {{ family = "...", action = "..." }}, not {type_name(rule)}')
            continue
        for key in rule:
            if key not in RULE_KEYS:
                problems.append(Problem(source, place, f"unknown field {key!r} is ignored", "warning"))
        family, action, when = rule.get("family"), rule.get("action"), rule.get("when")
        if not isinstance(family, str) or not isinstance(action, str):
            error(place, "needs 'family' and 'action', both text")
            continue
        if family not in families:
            known = ", ".join(sorted(families)) or "none defined"
            error(f"{place}, family", f"unknown family {family!r} (known: {known})")
            continue
        if when is not None and not isinstance(when, str):
            error(f"{place}, when", "must be a condition in quotes")
            continue
        try:
            test = parse(when) if when is not None else None
        except ExpressionError as problem:
            error(f"{place}, when {shown_name(when)}", str(problem))
            continue
        for state, member in members.items():
            if member.family != family or state in explicit or state in chosen:
                continue
            env = dict(params)
            env.update(member.index)
            try:
                if test is None or evaluate(test, env) != 0:
                    chosen[state] = action
            except ExpressionError as problem:
                shown = ", ".join(f"{n}={text(v)}" for n, v in member.index)
                error(f"{place}, when {shown_name(when)}", f"at {shown}: {problem}")
                break
    return list(chosen.items())

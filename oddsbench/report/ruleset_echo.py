"""The ruleset as a report repeats it: header, parameters, every outcome exactly, strategies."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from typing import Any

from oddsbench.model.expr import spelled
from oddsbench.model.numbers import Rational, text, to_float
from oddsbench.model.ruleset import Outcome, Ruleset


@dataclass(frozen=True)
class OutcomeRow:
    state: str
    action: str | None
    to: str
    prob: Rational
    pay: Rational
    stake: Rational
    note: str


def outcome_rows(ruleset: Ruleset) -> list[OutcomeRow]:
    """Every outcome of every state, in file order; decision states once per action."""
    rows = []
    for state in ruleset.states:
        listed: list[tuple[str | None, tuple[Outcome, ...]]] = [(None, state.outcomes)] if state.outcomes else []
        listed += list(state.choices)
        for action, outcomes in listed:
            for o in outcomes:
                rows.append(OutcomeRow(state.name, action, o.to, o.prob, o.pay, o.stake, _noted(o)))
    return rows


def _noted(outcome: Outcome) -> str:
    """The note, with what the cards decide in a deck game: the case's condition, fields read from the hands."""
    parts = [f"when {spelled(outcome.when)}"] if outcome.when is not None else []
    parts += [f"{name} = {spelled(tree)}" for name, tree in outcome.by_hand]
    if not parts:
        return outcome.note
    return "; ".join(([outcome.note] if outcome.note else []) + parts)


def file_digest(content: str) -> str:
    return hashlib.sha256(content.encode("utf-8")).hexdigest()


def _plain(value: Any) -> Any:
    """TOML session values as JSON-safe data (dates and times as text)."""
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, list):
        return [_plain(v) for v in value]
    if isinstance(value, str | int | float | bool) or value is None:
        return value
    return str(value)


def ruleset_json(ruleset: Ruleset, content: str) -> dict[str, Any]:
    return {
        "title": ruleset.title,
        "about": ruleset.about,
        "source": ruleset.source,
        "sha256": file_digest(content),
        "start": ruleset.start,
        "stake": text(ruleset.stake),
        "params": {name: {"exact": text(v), "decimal": to_float(v)} for name, v in ruleset.params},
        "states": len(ruleset.states),
        "deck": ruleset.deck.describe() if ruleset.deck is not None else None,
        "outcomes": [
            {
                "state": row.state,
                "action": row.action,
                "to": row.to,
                "prob": text(row.prob),
                "prob_decimal": to_float(row.prob),
                "pay": text(row.pay),
                "stake": text(row.stake),
                "note": row.note,
            }
            for row in outcome_rows(ruleset)
        ],
        "results": {state.name: state.result for state in ruleset.states if state.result},
        "strategies": {
            s.name: {**dict(s.actions), **({"default": s.default} if s.default else {})} for s in ruleset.strategies
        },
        "session": _plain(ruleset.session),
        "text": content,
    }

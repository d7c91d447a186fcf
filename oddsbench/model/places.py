"""Where in a ruleset a problem is: the structured form of ``Problem.where``.

The reader names places in words (``state 'come-out', outcome 2, prob "2"``) so that the CLI
line reads well; the workbench needs the same place as data to put the message beside the
field. Parsing the words here keeps one source of truth: the reader's own messages.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from oddsbench.model.errors import Problem

_QUOTED = r"(?:'(?:[^'\\]|\\.)*'|\"(?:[^\"\\]|\\.)*\")"
_STATE = re.compile(rf"^state (?P<state>{_QUOTED})")
_CHOICE = re.compile(rf"^, choice (?P<action>{_QUOTED})")
_OUTCOME = re.compile(r"^, outcome (?P<index>\d+)")
_FIELD = re.compile(r"^, (?P<field>[A-Za-z_][\w-]*)")
_PARAM = re.compile(rf"^param (?P<name>{_QUOTED})")
_STRATEGY = re.compile(rf"^strategy (?P<name>{_QUOTED})(?:, (?P<field>.+))?$")
_HEAD = re.compile(r"^\[ruleset\](?:, (?P<field>\w+))?")
_DECK = re.compile(r"^\[deck\](?:, (?P<field>\w+)(?:, (?P<name>\w+))?)?")


@dataclass(frozen=True)
class Place:
    """A section (``ruleset``, ``params``, ``deck``, ``states``, ``strategies``, ``session``, ``file``) and the
    spot in it (for the deck: the field, and the item or rank named after it)."""

    section: str
    state: str | None = None
    action: str | None = None
    outcome: int | None = None  # 0-based
    field: str | None = None
    name: str | None = None


def _unquote(quoted: str) -> str:
    """The inverse of ``repr`` for a str: drop the quotes, undo backslash escapes of quotes and backslashes."""
    return re.sub(r"\\(.)", r"\1", quoted[1:-1])


def place_of(problem: Problem) -> Place:
    where = problem.where
    if match := _STATE.match(where):
        rest = where[match.end() :]
        state = _unquote(match["state"])
        action = None
        if choice := _CHOICE.match(rest):
            action = _unquote(choice["action"])
            rest = rest[choice.end() :]
        index = None
        if outcome := _OUTCOME.match(rest):
            index = int(outcome["index"]) - 1
            rest = rest[outcome.end() :]
        field = None
        if named := _FIELD.match(rest):
            field = named["field"]
        return Place("states", state=state, action=action, outcome=index, field=field)
    if match := _PARAM.match(where):
        return Place("params", name=_unquote(match["name"]))
    if match := _STRATEGY.match(where):
        return Place("strategies", name=_unquote(match["name"]), field=match["field"])
    if match := _HEAD.match(where):
        return Place("ruleset", field=match["field"])
    if match := _DECK.match(where):
        return Place("deck", field=match["field"], name=match["name"])
    if where.startswith("[session]"):
        return Place("session")
    if where.startswith("[states]"):
        return Place("states")
    return Place("file")

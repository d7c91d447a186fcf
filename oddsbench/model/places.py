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
_RULE = re.compile(r"^rule (?P<number>\d+)(?:, (?P<field>family|when|action)\b)?")
_HEAD = re.compile(r"^\[ruleset\](?:, (?P<field>\w+))?")
_DECK = re.compile(r"^\[deck\](?:, (?P<field>\w+)(?:, (?P<name>\w+))?)?")


_MEMBER = re.compile(rf"^ \(family (?P<family>{_QUOTED}) at (?P<index>[^)]*)\)")
_FAMILY = re.compile(rf"^family (?P<family>{_QUOTED})(?: at (?P<index>[\w]+=[^,:]+(?:, [\w]+=[^,:]+)*))?")
_FAMILY_OUTCOMES = re.compile(r"^, outcomes")
_FAMILY_FIELD = re.compile(r"^(?:, | )(?P<field>index|let|when|state|result|about|each|to|prob|pay|stake|note|draw)\b")
_PART_NAME = re.compile(r"^, (?P<name>[A-Za-z_]\w*)\b")
_EACH_VALUES = re.compile(r"^[A-Za-z_]\w*=[^,:]+(?:, [A-Za-z_]\w*=[^,:]+)*: ")
_LET_NAME = re.compile(r"^let (?P<name>[A-Za-z_]\w*): ")


@dataclass(frozen=True)
class Place:
    """A section (``ruleset``, ``params``, ``deck``, ``states``, ``families``, ``strategies``, ``session``,
    ``file``) and the spot in it. ``family`` names the family of a generated state (with ``index``,
    its index values as written, ``t=5``) or the family a ``families`` problem is in; ``part``
    names the row of an ``each``, ``let`` or ``index`` part where the message says which; for the
    deck: the field, and the item or rank named after it (``name``)."""

    section: str
    state: str | None = None
    action: str | None = None
    outcome: int | None = None  # 0-based
    field: str | None = None
    name: str | None = None
    family: str | None = None
    index: str | None = None
    part: str | None = None
    rule: int | None = None  # 0-based, a strategy's rule


def _unquote(quoted: str) -> str:
    """The inverse of ``repr`` for a str: drop the quotes, undo backslash escapes of quotes and backslashes."""
    return re.sub(r"\\(.)", r"\1", quoted[1:-1])


def place_of(problem: Problem) -> Place:
    where = problem.where
    if where.startswith("family ") or (not where and problem.message.startswith("family ")):
        return _family_place(where or problem.message, problem.message if where else "")
    if not where and problem.message.startswith("state "):
        where = problem.message  # a hand-written state's outcome in the family language: the place leads the message
    if match := _STATE.match(where):
        rest = where[match.end() :]
        state = _unquote(match["state"])
        family = index = None
        if member := _MEMBER.match(rest):
            family, index = _unquote(member["family"]), member["index"]
            rest = rest[member.end() :]
        action = None
        if choice := _CHOICE.match(rest):
            action = _unquote(choice["action"])
            rest = rest[choice.end() :]
        if plain := _FAMILY_OUTCOMES.match(rest):
            rest = rest[plain.end() :]
        outcome_index = None
        if outcome := _OUTCOME.match(rest):
            outcome_index = int(outcome["index"]) - 1
            rest = rest[outcome.end() :]
        field = None
        if named := _FIELD.match(rest):
            field = named["field"]
        return Place(
            "states", state=state, action=action, outcome=outcome_index, field=field, family=family, index=index
        )
    if match := _PARAM.match(where):
        return Place("params", name=_unquote(match["name"]))
    if match := _STRATEGY.match(where):
        field = match["field"]
        if field and (rule := _RULE.match(field)):
            return Place("strategies", name=_unquote(match["name"]), rule=int(rule["number"]) - 1, field=rule["field"])
        return Place("strategies", name=_unquote(match["name"]), field=field)
    if match := _HEAD.match(where):
        return Place("ruleset", field=match["field"])
    if match := _DECK.match(where):
        return Place("deck", field=match["field"], name=match["name"])
    if where.startswith("[session]"):
        return Place("session")
    if where.startswith("[states]"):
        return Place("states")
    return Place("file")


def _family_place(text: str, message: str) -> Place:
    """A problem in a family's template, worded by ``model/families.py``: ``family 'x' at t=5,
    choice 'hold', outcome 2, prob ...: reason`` (the place may be in the message itself)."""
    match = _FAMILY.match(text)
    if match is None:
        return Place("file")
    family, index = _unquote(match["family"]), match["index"]
    rest = text[match.end() :]
    action = outcome = field = part = None
    if choice := _CHOICE.match(rest):
        action = _unquote(choice["action"])
        rest = rest[choice.end() :]
    if plain := _FAMILY_OUTCOMES.match(rest):
        rest = rest[plain.end() :]
    if numbered := _OUTCOME.match(rest):
        outcome = int(numbered["index"]) - 1
        rest = rest[numbered.end() :]
    if named := _FAMILY_FIELD.match(rest):
        field = named["field"]
        rest = rest[named.end() :]
        if field in ("index", "let", "each") and (name := _PART_NAME.match(rest)):
            part = name["name"]
    elif rest.startswith(": "):
        # no field in the place: the reason may still say (``f=3: ...``, ``let n: ...``)
        reason = rest[2:] if not message else message
        reason = reason[each.end() :] if (each := _EACH_VALUES.match(reason)) else reason
        if let := _LET_NAME.match(reason):
            field, part = "let", let["name"]
    return Place("families", action=action, outcome=outcome, field=field, family=family, index=index, part=part)

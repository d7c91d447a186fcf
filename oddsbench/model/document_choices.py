"""The player's actions in a decision state (or a family of them), and turning one kind of state into
another: plain outcomes, a decision (``choices``, one outcome list per action), or an end.

Strategies follow every edit (``document_strategies.py``): a renamed action is renamed where a
strategy names it for this state (or, in a family, in its rules), a deleted action's entries go,
and a state that stops being a decision drops the entries that name it.
"""

from __future__ import annotations

from typing import Any

import tomlkit
from tomlkit.items import AoT

from oddsbench.model.document_base import DocumentError, deletion
from oddsbench.model.document_strategies import StrategyEdits
from oddsbench.model.toml_edits import Keys, container_of, inline_table, multiline_array

KINDS = ("outcomes", "choices", "end")


def _new_outcomes(like: Any = None) -> Any:
    """One outcome that goes nowhere yet (the check flags it until a target is typed), written like ``like``."""
    if isinstance(like, AoT):
        aot = tomlkit.aot()
        table = tomlkit.table()
        table["to"] = ""
        aot.append(table)
        return aot
    return multiline_array([inline_table([("to", "")])])


class ChoiceEdits(StrategyEdits):
    """Actions of decision states and families, and kinds of state."""

    def owner_kind(self, name: str, family: bool = False) -> str:
        """``outcomes``, ``choices`` or ``end`` (a state with neither ends the round)."""
        owner = self._owner(name, family)
        if "choices" in owner:
            return "choices"
        return "outcomes" if "outcomes" in owner else "end"

    def actions(self, name: str, family: bool = False) -> list[str]:
        choices = self._owner(name, family).get("choices")
        return [str(action) for action in choices] if isinstance(choices, dict) else []

    # ----- actions -----

    def add_action(self, name: str, action: str, family: bool = False) -> None:
        """A new action at the end, with one outcome to fill in."""
        action = self._checked_name(action, "action")
        owner = self._owner(name, family)
        if "choices" not in owner:
            self.make_decision(name, action, family)
            return
        if action in self.actions(name, family):
            raise DocumentError(f"there is already an action {action!r} here")
        keys = Keys(owner, "choices")
        first = keys.items()[0][1] if keys.items() else None
        keys.set(action, _new_outcomes(first))

    def rename_action(self, name: str, old: str, new: str, family: bool = False) -> int:
        """Rename an action and the strategy entries (or family rules) that choose it; the count."""
        new = self._checked_name(new, "action")
        actions = self.actions(name, family)
        if old not in actions:
            raise DocumentError(f"no action {old!r} here")
        if new == old:
            return 0
        if new in actions:
            raise DocumentError(f"there is already an action {new!r} here")
        Keys(self._owner(name, family), "choices").rename(old, new)
        if family:
            changed = self._edit_rules(name, old, lambda _, rows, index: rows.set(index, "action", new))
        else:
            changed = self._rename_action_entries(name, old, new)
        if not any(old in self.actions(owner, is_family) for owner, is_family in self.decision_owners()):
            changed += self._rename_default(old, new)  # no other state offers it: the default follows
        return changed

    @deletion
    def delete_action(self, name: str, action: str, family: bool = False) -> int:
        """Delete an action with its outcomes, and the strategy entries (or rules) that chose it."""
        actions = self.actions(name, family)
        if action not in actions:
            raise DocumentError(f"no action {action!r} here")
        if len(actions) == 1:
            raise DocumentError("a decision needs an action: turn it into a plain state instead (k)")
        Keys(self._owner(name, family), "choices").delete(action)
        if family:
            return self._edit_rules(
                name, action, lambda strategy, rows, index: self.delete_strategy_rule(strategy, index)
            )
        return self._drop_action_entries(name, action)

    def move_action(self, name: str, action: str, offset: int, family: bool = False) -> bool:
        """Move an action earlier (-1) or later (+1): the order is the file's (ties in best play go to
        the first listed)."""
        if action not in self.actions(name, family):
            raise DocumentError(f"no action {action!r} here")
        return Keys(self._owner(name, family), "choices").move(action, offset)

    # ----- kinds -----

    def make_decision(self, name: str, action: str, family: bool = False) -> int:
        """Plain outcomes become the outcomes of one action (more can be added); an end state gets
        one action with an outcome to fill in. Every strategy chooses that one action there (so
        each stays complete); the count of entries written."""
        action = self._checked_name(action, "action")
        owner = self._owner(name, family)
        if "choices" in owner:
            raise DocumentError("this is a decision already")
        outcomes = owner.get("outcomes")
        if outcomes is None:
            self._put(owner, f"choices.{tomlkit.key(action).as_string()}", _new_outcomes(), None)
            if not family and "result" in owner:
                del owner["result"]
        elif isinstance(outcomes, AoT):
            raise DocumentError("outcomes written as [[...]] tables: make this a decision in the Source view")
        else:
            self._put(owner, f"choices.{tomlkit.key(action).as_string()}", outcomes, "outcomes")
        return 0 if family else self._choose_everywhere(name, action)

    def make_plain(self, name: str, family: bool = False) -> int:
        """A decision with one action becomes plain outcomes; an end state gets an outcome to fill in.
        Strategy entries (or rules) that named it go; the count."""
        owner = self._owner(name, family)
        if "outcomes" in owner:
            raise DocumentError("these are plain outcomes already")
        if "choices" not in owner:
            self._put(owner, "outcomes", _new_outcomes(), None)
            if "result" in owner:
                del owner["result"]
            return 0
        actions = self.actions(name, family)
        if len(actions) != 1:
            raise DocumentError(
                f"a decision between {len(actions)} actions cannot be plain outcomes: "
                "delete actions (x) until one is left"
            )
        outcomes = self._owner(name, family)["choices"][actions[0]]
        if isinstance(outcomes, AoT):
            raise DocumentError("outcomes written as [[...]] tables: make this plain in the Source view")
        self._put(owner, "outcomes", outcomes, "choices")
        if family:
            return self._edit_rules(name, None, lambda strategy, _, index: self.delete_strategy_rule(strategy, index))
        return self._drop_state_entries(name)

    def make_end(self, name: str) -> int:
        """A state that ends the round: its outcomes (or actions) go, and strategy entries naming it."""
        owner = self._state(name)
        for key in ("outcomes", "choices"):
            if key in owner:
                del owner[key]
        return self._drop_state_entries(name)

    # ----- internals -----

    def decision_owners(self) -> list[tuple[str, bool]]:
        owners = [(name, False) for name in self._names("states")]
        owners += [(name, True) for name in self._names("families")]
        return [(name, family) for name, family in owners if self.actions(name, family)]

    @staticmethod
    def _put(owner: Any, written_key: str, value: Any, replacing: str | None) -> None:
        """``written_key = value`` (a dotted key like ``choices.hold`` allowed) where ``replacing``
        was (every piece of it removed), else after the owner's last plain key."""
        snippet = tomlkit.parse(f"[x]\n{written_key} = {value.as_string().strip()}\n")
        key, item = snippet["x"].value.body[0]
        container = container_of(owner)
        body = container.body
        if replacing is not None:
            index = next(i for i, (k, _) in enumerate(body) if k is not None and str(k.key) == replacing)
            container.remove(replacing)
        else:
            index = next(
                (
                    i
                    for i, (k, v) in enumerate(body)
                    if k is not None
                    and isinstance(v, tomlkit.items.Table | AoT)
                    and not getattr(v, "is_super_table", lambda: False)()
                ),
                len(body),
            )
            while index > 0 and body[index - 1][0] is None:
                index -= 1  # before the blank lines that end the owner's plain keys
        if index >= len(body):
            container._raw_append(key, item)
        else:
            container._insert_at(index, key, item)

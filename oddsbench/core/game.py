"""A loaded game: what every question starts from, read once with its warnings kept (never printed).

A game is a ruleset (from a file or from text, with parameter overrides) or, for sessions only,
an inline round (``--round 1:18/37,-1:19/37``). Front ends show ``warnings`` their own way: the
command line prints them to stderr, the workbench beside the field.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from oddsbench.model.errors import OddsbenchError, Problem, RulesetError
from oddsbench.model.ruleset import Ruleset

if TYPE_CHECKING:  # the round's module imports numpy: `oddsbench check` needs neither
    from oddsbench.chain.round_distribution import RoundDistribution

INLINE_TITLE = "Inline round"
INLINE_SOURCE = "the inline round"  # what messages call a round given as text (the CLI: its option)


@dataclass(frozen=True)
class Game:
    """A ruleset (``ruleset``) or an inline round (``round``), the text it was read from, and its warnings."""

    source: str
    ruleset: Ruleset | None = None
    round: RoundDistribution | None = None
    text: str | None = None
    warnings: tuple[Problem, ...] = ()
    params: tuple[tuple[str, object], ...] = ()  # the [params] overrides it was read with (exact values)

    @property
    def title(self) -> str:
        return self.ruleset.title if self.ruleset is not None else INLINE_TITLE

    def need_ruleset(self, question: str) -> Ruleset:
        """The ruleset, or one line saying this question needs a ruleset rather than an inline round."""
        if self.ruleset is None:
            raise OddsbenchError(f"{self.source}: {question} needs a ruleset file; an inline round only has sessions")
        return self.ruleset


def _read(loaded, text: str | None, params: dict | None) -> Game:
    if loaded.ruleset is None:
        raise RulesetError(loaded.problems)
    ruleset = loaded.ruleset
    overrides = tuple((params or {}).items())
    return Game(ruleset.source, ruleset=ruleset, text=text, warnings=tuple(loaded.warnings), params=overrides)


def load_game(path: str | Path, params: Mapping[str, object] | None = None) -> Game:
    """Read a ruleset file (``params``: name -> exact value, replacing the file's ``[params]``).

    Raises ``RulesetError`` with one problem per line when the file is not a valid ruleset.
    """
    from oddsbench.model.load import read_ruleset_file

    exact = _exact(params)
    loaded = read_ruleset_file(path, exact)
    return _read(loaded, loaded.text, exact)


def game_from_text(text: str, source: str = "<text>", params: Mapping[str, object] | None = None) -> Game:
    """A ruleset from TOML text, as ``load_game`` reads a file (``source`` names it in messages)."""
    from oddsbench.model.load import read_ruleset_text

    exact = _exact(params)
    return _read(read_ruleset_text(text, source, exact), text, exact)


def inline_round(spelled: str, source: str = INLINE_SOURCE) -> Game:
    """A round given as ``NET:PROB,...`` (an optional third field is an extra stake): sessions only;
    ``source`` is what messages call it."""
    from oddsbench.chain.round_distribution import parse_round_text

    return Game(source, round=parse_round_text(spelled), text=spelled)


def _exact(params: Mapping[str, object] | None) -> dict | None:
    """Parameter overrides as exact values (text such as "1/2" is read by the expression language)."""
    if not params:
        return None
    from oddsbench.core.settings import money

    return {name: money(value, f"param {name}") for name, value in params.items()}


def check_size(ruleset: Ruleset, max_states: int) -> None:
    """Refuse a ruleset with more states than ``max_states`` (one line, as the chain builder words it)."""
    from oddsbench.chain.round_chain import check_state_count

    check_state_count(len(ruleset.states), max_states, ruleset.source, "the ruleset has")


def dealt_size(ruleset: Ruleset, max_states: int) -> int | None:
    """For a deck game, the states of its round once dealt out from the start (every hand checked on
    the way: a hand no case fits is one line); None for a game without a deck."""
    if ruleset.deck is None:
        return None
    from oddsbench.chain.deal import dealt

    return sum(1 for state in dealt(ruleset, max_states).states if not state.is_end)

"""What the hands decide in a deck game: which outcomes hold, with what chance, pay and stake.

A drawing state's outcomes are cases (the first whose ``when`` holds is taken); a state that does
not draw keeps its chances, which may read the hands; a strategy may choose by the hands. All of
it goes through the expression language (``model/expr.py``) with the values of the functions of
the hands (``model/hands.py``) for one set of hands: computed once per different call, and the
answer memoised per state by those values, so the dealer (``deal.py``) asks once per pattern.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

from oddsbench.chain.card_kinds import Hands, Kinds, Summary
from oddsbench.model.deck import Deck
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.expr import Call, ExpressionError, Node, evaluate, hand_calls
from oddsbench.model.hands import DRAWN, SUIT_FUNCTIONS, Resolved, check_call, hand_value
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.model.ruleset import Outcome, Ruleset, State, Strategy


@dataclass
class CaseLists:
    """A state's outcome lists (one, or one per action) and every hand function they call."""

    lists: list[tuple[str | None, tuple[Outcome, ...], bool]]  # (action or None, outcomes, cases)
    calls: tuple[Resolved, ...]  # every different call
    slots: dict[int, int]  # id of each call in the trees -> its place in ``calls``
    memo: dict[tuple, object]


class HandCases:
    """The outcomes a deck game's hands choose: every call of a function of the hands checked once,
    each state's lists compiled once, and one memo per state keyed by the values of its calls, so
    hands that agree on every value share the answer (refusals name the state and the hands)."""

    def __init__(self, ruleset: Ruleset, hand_names: tuple[str, ...]) -> None:
        self.source = ruleset.source
        self.params = dict(ruleset.params)
        self.deck: Deck = ruleset.deck  # type: ignore[assignment]
        self.by_name = {state.name: state for state in ruleset.states}
        self.hand_names = hand_names
        self.position = {name: i for i, name in enumerate(hand_names)}
        self.resolved: dict[Call, Resolved] = {}
        for tree in _trees(ruleset):
            for call in hand_calls(tree):
                if call not in self.resolved:
                    checked = check_call(call, self.deck, hand_names, drawn=True)
                    if isinstance(checked, str):  # the reader checked it; a tree built elsewhere may not be
                        raise OddsbenchError(f"{self.source}: {checked}")
                    self.resolved[call] = checked
        self.kinds = Kinds.of(self.deck, list(self.resolved.values()))
        self.named_suit = any(r.label is not None and r.label[0] == "suit" for r in self.resolved.values())
        self.compiled: dict[str, CaseLists] = {}

    def slots(self, trees: Sequence[Node]) -> tuple[tuple[Resolved, ...], dict[int, int]]:
        """The different calls in the trees, and where each call node's value sits among them."""
        distinct: dict[Call, int] = {}
        slots: dict[int, int] = {}
        for tree in trees:
            for call in hand_calls(tree):
                slots[id(call)] = distinct.setdefault(call, len(distinct))
        return tuple(self.resolved[call] for call in distinct), slots

    def compile(self, state: State) -> CaseLists:
        compiled = self.compiled.get(state.name)
        if compiled is None:
            draws = state.draw is not None
            lists = [
                (action, outcomes, draws or any(o.when is not None for o in outcomes))
                for action, outcomes in lists_of(state)
            ]
            trees = [tree for _, outcomes, _ in lists for outcome in outcomes for tree in _outcome_trees(outcome)]
            calls, slots = self.slots(trees)
            compiled = CaseLists(lists, calls, slots, {})
            self.compiled[state.name] = compiled
        return compiled

    def raw_values(
        self, calls: Sequence[Resolved], summaries: Sequence[Summary], drawn: Summary | None
    ) -> tuple[int | Rational, ...]:
        """The value of every call for these hands, as ints where whole (hashed as a memo key)."""
        classes = self.kinds.classes
        values: list[int | Rational] = []
        for resolved in calls:
            if resolved.function == "left":
                values.append(self.left_value(resolved, summaries))
                continue
            if resolved.hand == DRAWN:
                if drawn is None:
                    raise ExpressionError("'drawn' is known only right after a draw")
                ranks, suits = drawn
            else:
                ranks, suits = summaries[self.position[resolved.hand]]  # type: ignore[index]
            values.append(hand_value(resolved.function, ranks, suits, resolved.label, classes))
        return tuple(values)

    def left_value(self, resolved: Resolved, summaries: Sequence[Summary]) -> int:
        label = resolved.label
        if label is None:
            return sum(self.kinds.counts) - sum(sum(ranks) for ranks, _ in summaries)
        kind, index = label
        if kind == "suit":
            deck_total = self.deck.suit_total(index)
            held = sum(suits[index] for _, suits in summaries if suits is not None)
        else:
            rank_class = self.kinds.classes.of_rank[index]
            members = [r for r, c in enumerate(self.kinds.classes.of_rank) if c == rank_class]
            deck_total = sum(self.deck.rank_total(r) for r in members)
            held = sum(ranks[rank_class] for ranks, _ in summaries)
        return deck_total - held

    def choose(
        self, compiled: CaseLists, summaries: Sequence[Summary], drawn: Summary | None, name: str, hands: Hands | None
    ) -> list[tuple[str | None, list[tuple[Outcome, Rational, Rational, Rational]]]]:
        """For each outcome list (per action): the outcomes taken with these hands, their chance,
        pay and stake. Hands with the same values of every function called share the answer."""
        try:
            key = self.raw_values(compiled.calls, summaries, drawn)
        except ExpressionError as error:
            raise OddsbenchError(f"{self.source}: state {name!r}: {error}") from None
        return self.decide(compiled, key, name, hands)

    def decide(
        self, compiled: CaseLists, key: tuple, name: str, hands: Hands | None
    ) -> list[tuple[str | None, list[tuple[Outcome, Rational, Rational, Rational]]]]:
        """The outcomes taken for one set of values of the calls (memoised per state)."""
        known = compiled.memo.get(key)
        if known is not None:
            return known  # type: ignore[return-value]
        value = _resolver(key, compiled.slots)
        chosen = []
        for action, outcomes, cases in compiled.lists:
            place = f"state {name!r}" + (f", choice {action!r}" if action is not None else "")
            picked = self.pick(outcomes, cases, value, place, hands, action)
            if picked or action is None:
                chosen.append((action, picked))
        compiled.memo[key] = chosen
        return chosen

    def pick(self, outcomes: tuple[Outcome, ...], cases: bool, value, place: str, hands: Hands | None, action):
        """Cases: the first outcome whose ``when`` holds, chance 1 (none: an action is not offered, a
        state is refused). Otherwise every outcome, with its chance for these hands."""
        params = self.params
        picked: list[tuple[Outcome, Rational, Rational, Rational]] = []
        for number, outcome in enumerate(outcomes, start=1):
            where = f"{place}, outcome {number}"
            try:
                if outcome.when is not None and evaluate(outcome.when, params, value) == 0:
                    continue
                pay = _field(outcome, "pay", params, value)
                stake = _field(outcome, "stake", params, value)
                prob = QQ(1) if cases else _field(outcome, "prob", params, value)
            except ExpressionError as error:
                raise OddsbenchError(f"{self.source}: {where}: {error}{self.hands_note(hands)}") from None
            if stake < 0:
                raise OddsbenchError(f"{self.source}: {where}, stake: cannot be negative, got {text(stake)}")
            if cases:
                return [(outcome, prob, pay, stake)]
            if not 0 <= prob <= 1:
                raise OddsbenchError(f"{self.source}: {where}, prob: must be between 0 and 1, got {text(prob)}")
            picked.append((outcome, prob, pay, stake))
        if cases:
            if action is not None:
                return []  # an action none of whose cases hold is not offered with these hands
            raise OddsbenchError(
                f"{self.source}: {place}: no outcome's 'when' holds{self.hands_note(hands)} "
                "(end the list with an outcome without 'when')"
            )
        return self.shared(picked, place, hands)

    def shared(self, picked, place: str, hands: Hands | None):
        """Probabilities per hand: omitted ones share what is left; the sum must be exactly 1."""
        given = sum((prob for outcome, prob, _, _ in picked if outcome.prob_given), QQ(0))
        omitted = [item for item in picked if not item[0].prob_given]
        if omitted:
            share = (QQ(1) - given) / len(omitted)
            picked = [(o, prob if o.prob_given else share, pay, stake) for o, prob, pay, stake in picked]
        total = sum((prob for _, prob, _, _ in picked), QQ(0))
        if total != 1:
            raise OddsbenchError(
                f"{self.source}: {place}: probabilities sum to {text(total)}, not 1{self.hands_note(hands)}"
            )
        return picked

    def hands_note(self, hands: Hands | None) -> str:
        if hands is None:
            return ""
        held = [f"{h}: {self.kinds.spelled(c)}" for h, c in zip(self.hand_names, hands) if any(c)]
        return f" (with {'; '.join(held)})" if held else ""

    # -- strategies --------------------------------------------------------------------------
    def strategy(
        self, strategy: Strategy, tables: dict[str, State], dealt_of: dict[str, tuple[str, Hands]]
    ) -> Strategy:
        """A strategy over the dealt decision states: the first rule by hand that holds and whose action
        is offered, else the state's own entry, else the default."""
        actions = []
        calls, slots = self.slots([when for _, when, _ in strategy.by_hand if when is not None])
        for name, table in tables.items():
            if not table.is_decision:
                continue
            state_name, hands = dealt_of[name]
            source_state = self.by_name[state_name]
            offered = table.actions
            chosen = None
            summaries = [self.kinds.summary(hand) for hand in hands]
            value = _resolver(self.raw_values(calls, summaries, None), slots)
            for rule_state, when, action in strategy.by_hand:
                if rule_state != state_name or action not in offered:
                    continue
                try:
                    holds = when is None or evaluate(when, self.params, value) != 0
                except ExpressionError as error:
                    raise OddsbenchError(f"{self.source}: strategy {strategy.name!r}, at {name!r}: {error}") from None
                if holds:
                    chosen = action
                    break
            if chosen is None:
                fallback = strategy.action_for(source_state)
                if fallback in offered:
                    chosen = fallback
            if chosen is None:
                raise OddsbenchError(
                    f"{self.source}: strategy {strategy.name!r}: no action it names is offered at {name!r} "
                    f"(offered: {', '.join(offered)})"
                )
            actions.append((name, chosen))
        return Strategy(name=strategy.name, actions=tuple(actions))


def reads_suits(call: Resolved) -> bool:
    return call.function in SUIT_FUNCTIONS or (call.label is not None and call.label[0] == "suit")


def _resolver(values: tuple[int | Rational, ...], slots: dict[int, int]) -> Callable[[Call], Rational]:
    """Hand values for the evaluator: each call node finds its value by its place (no hashing of trees)."""

    def value(call: Call) -> Rational:
        return QQ(values[slots[id(call)]])

    return value


def _field(outcome: Outcome, name: str, params: dict[str, Rational], value) -> Rational:
    """An outcome's pay, stake or prob: its expression for these hands, or its fixed value."""
    tree = outcome.rule(name)
    return evaluate(tree, params, value) if tree is not None else getattr(outcome, name)


def _outcome_trees(outcome: Outcome) -> list[Node]:
    return ([outcome.when] if outcome.when is not None else []) + [tree for _, tree in outcome.by_hand]


def _trees(ruleset: Ruleset) -> list[Node]:
    trees = []
    for state in ruleset.states:
        for _, outcomes in lists_of(state):
            for outcome in outcomes:
                trees += _outcome_trees(outcome)
    for strategy in ruleset.strategies:
        trees += [when for _, when, _ in strategy.by_hand if when is not None]
    return trees


def lists_of(state: State) -> list[tuple[str | None, tuple[Outcome, ...]]]:
    return list(state.choices) if state.is_decision else [(None, state.outcomes)]

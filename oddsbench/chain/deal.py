"""A deck game dealt out: the chain over (state, what has been dealt), as plain states.

A round of a deck game is still a Markov chain once the state carries the cards dealt: the next
card depends only on what is left. ``dealt(ruleset)`` expands it from the start, lazily (only the
(state, hands) pairs the round can reach), into a plain ``Ruleset`` that every engine already
solves: best play, strategies, sessions, simulation, sweeps. It is kept small by symmetry:

* a hand is a count per kind of card, so hands equal up to order are one state;
* suits are counted only where an expression asks about them (``flush``, ``most_suit``, a suit
  named in ``count``/``left``); otherwise a card is its rank;
* ranks are merged where nothing tells them apart (only values are asked, as a dealer's total
  does): a shoe's 10, J, Q and K are one kind of card;
* end states forget the hands, so a whole deal that ends at once is a handful of edges;
* a hand classified at once (five cards, then an end) is counted by pattern (``draws.py``): rank
  vectors times suit patterns, never the 2,598,960 hands one at a time.

A deal that only removes cards is acyclic; its states are put in topological order (start first),
so I - Q is triangular and the exact front door's elimination is plain back substitution.
Refusals are one line naming the file, the state, the hands and the reason.

Three modules, one concept each: this one walks and draws; ``card_kinds.py`` says how cards are
told apart (kinds, exchangeable suits); ``hand_cases.py`` says which outcomes the hands choose.
"""

from __future__ import annotations

import dataclasses
import functools
from collections import deque
from collections.abc import Callable
from dataclasses import dataclass
from math import comb

from oddsbench.chain.card_kinds import Hands, Summary
from oddsbench.chain.draws import TooManyHands, count_multisets, multisets, suit_patterns
from oddsbench.chain.hand_cases import CaseLists, HandCases, lists_of, reads_suits
from oddsbench.model.deck import Deck
from oddsbench.model.defaults import DEFAULT_MAX_STATES
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational
from oddsbench.model.ruleset import Outcome, Ruleset, State

MAX_DEAL_HANDS = 500_000  # hands looked at in one expansion, all draws together (seconds, not minutes)


class _Dealer:
    """One deal: the walk over (state, hands) from the start, each dealt state's edges, the limits."""

    def __init__(self, ruleset: Ruleset, max_states: int | None) -> None:
        self.ruleset = ruleset
        self.deck: Deck = ruleset.deck  # type: ignore[assignment]
        self.source = ruleset.source
        self.max_states = max_states
        self.by_name = {state.name: state for state in ruleset.states}
        self.hand_names = _hand_names(ruleset)
        self.position = {name: i for i, name in enumerate(self.hand_names)}
        self.cases = HandCases(ruleset, self.hand_names)
        self.kinds = self.cases.kinds
        self.budget = MAX_DEAL_HANDS
        self.reached = 0
        self.summaries: dict[tuple[int, ...], Summary] = {}
        takes_a_suit = any(" of " in card for state in ruleset.states if state.draw for card in state.draw.take)
        self.suit_layout = self.kinds.exchangeable_suits(self.cases.named_suit, takes_a_suit)

    # -- the walk ---------------------------------------------------------------------------
    def run(self) -> Ruleset:
        empty: Hands = tuple((0,) * len(self.kinds.counts) for _ in self.hand_names)
        start = self.ruleset.start
        names: dict[tuple[str, Hands], str] = {}
        tables: dict[str, State] = {}
        successors: dict[str, set[str]] = {}
        dealt_of: dict[str, tuple[str, Hands]] = {}
        queue: deque[tuple[str, Hands]] = deque()
        ends = {state.name for state in self.ruleset.states if state.is_end}

        def name_of(state: str, hands: Hands) -> str:
            if state in ends:
                return state  # an end state forgets the hands
            if self.suit_layout is not None:
                hands = self.kinds.canonical(hands, self.suit_layout)
            key = (state, hands)
            known = names.get(key)
            if known is not None:
                return known
            name = self.spelled(state, hands)
            names[key] = name
            dealt_of[name] = key
            self.reached += 1
            if self.max_states is not None and self.reached > self.max_states:
                raise OddsbenchError(
                    f"{self.source}: dealing the round from {start!r} reaches more than {self.max_states:,} "
                    "states, over the state limit (raise it with --max-states)"
                )
            queue.append(key)
            return name

        first = name_of(start, empty)
        while queue:
            state_name, hands = queue.popleft()
            state = self.by_name[state_name]
            name = names[(state_name, hands)]
            tables[name] = self.expand(state, hands, name, name_of)
            successors[name] = {o.to for _, listed in lists_of(tables[name]) for o in listed}
        order = _topological(first, successors) or list(tables)
        states = [tables[name] for name in order] + [s for s in self.ruleset.states if s.is_end]
        strategies = tuple(self.cases.strategy(strategy, tables, dealt_of) for strategy in self.ruleset.strategies)
        return dataclasses.replace(self.ruleset, start=first, states=tuple(states), strategies=strategies, deck=None)

    def spelled(self, state: str, hands: Hands) -> str:
        if self.by_name[state].is_end or not any(any(hand) for hand in hands):
            return state
        held = [f"{hand}: {self.kinds.spelled(cards)}" for hand, cards in zip(self.hand_names, hands) if any(cards)]
        return f"{state} [{'; '.join(held)}]"

    # -- one dealt state --------------------------------------------------------------------
    def expand(self, state: State, hands: Hands, name: str, name_of: Callable[[str, Hands], str]) -> State:
        compiled = self.cases.compile(state)
        if state.draw is None:
            results: list[tuple[Hands, tuple[int, ...] | None, int | Rational]] = [(hands, None, 1)]
            scale: Rational = QQ(1)
        elif self.pattern_counted(state, compiled):
            return self.by_pattern(state, hands, name, compiled)
        else:
            results, scale = self.drawn(state, hands, name)
        # weights per (action, target, entry): entries are the memoised (outcome, prob, pay, stake)
        # tuples, so the hot loop hashes names and ids, never exact numbers
        weights: dict[tuple, int | Rational] = {}
        entries: dict[int, tuple] = {}
        summary = self.summary
        for after, drawn, weight in results:
            chosen = self.cases.choose(
                compiled, [summary(hand) for hand in after], summary(drawn) if drawn is not None else None, name, after
            )
            for action, picked in chosen:
                for entry in picked:
                    key = (action, name_of(entry[0].to, after), id(entry))
                    entries[id(entry)] = entry
                    prob = entry[1]
                    weights[key] = weights.get(key, 0) + (weight if prob == 1 else weight * prob)
        edges: dict[str | None, dict[tuple, tuple]] = {action: {} for action, _, _ in compiled.lists}
        for (action, target, entry_id), weight in weights.items():
            outcome, _, pay, stake = entries[entry_id]
            edges[action][(target, entry_id)] = (weight * scale, pay, stake, outcome.note)
        return self.state_from(state, name, edges)

    def summary(self, hand: tuple[int, ...]) -> Summary:
        known = self.summaries.get(hand)
        if known is None:
            known = self.kinds.summary(hand)
            self.summaries[hand] = known
        return known

    def state_from(self, state: State, name: str, edges: dict[str | None, dict[tuple, tuple]]) -> State:
        """The dealt state: per action, edges keyed by (target, ...) holding (chance, pay, stake, note)."""

        def outcomes(bucket: dict[tuple, tuple]) -> tuple[Outcome, ...]:
            return tuple(
                Outcome(to=key[0], prob=prob, pay=pay, stake=stake, note=note)
                for key, (prob, pay, stake, note) in bucket.items()
                if prob != 0
            )

        if not state.is_decision:
            return State(name=name, outcomes=outcomes(edges[None]))
        choices = tuple((action, outcomes(bucket)) for action, bucket in edges.items() if bucket)
        if not choices:
            raise OddsbenchError(f"{self.source}: state {name!r}: no action is offered for these hands")
        return State(name=name, choices=choices)

    def drawn(
        self, state: State, hands: Hands, name: str
    ) -> tuple[list[tuple[Hands, tuple[int, ...], int | Rational]], Rational]:
        """Every hand after the draw (the hands, the cards drawn, a weight), and the scale that turns the
        weights into chances: numbers of ways over C(left, count) (exact fractions once cards are taken)."""
        draw = state.draw
        index = self.position[draw.hand]  # type: ignore[union-attr]
        left = self.left(hands)
        size = len(left)
        partial: list[tuple[tuple[int, ...], tuple[int, ...], int | Rational]] = [(left, (0,) * size, 1)]
        for card in draw.take:  # type: ignore[union-attr]
            grown = []
            kinds = self.kinds.matching(self.deck, card)
            for remaining, taken, weight in partial:
                there = sum(remaining[k] for k in kinds)
                if there == 0:
                    raise OddsbenchError(
                        f"{self.source}: state {name!r}: takes {card!r}, but none is left in the {self.deck.kind}s"
                    )
                for kind in kinds:
                    if remaining[kind]:
                        chance = QQ(remaining[kind], there)
                        grown.append((_minus(remaining, kind), _plus_one(taken, kind), weight * chance))
            partial = grown
        count = draw.count  # type: ignore[union-attr]
        results = []
        totals = {sum(remaining) for remaining, _, _ in partial}
        for remaining, taken, weight in partial:
            total = sum(remaining)
            if count > total:
                raise OddsbenchError(
                    f"{self.source}: state {name!r}: draws {count} {self.deck.kind}(s), but only {total} are left"
                )
            self.spend(count_multisets(remaining, count, self.budget), name, count, total)
            # one denominator for all: C(total, count), the same for every branch of the takes
            if count == 1 and not draw.take:  # type: ignore[union-attr]  # the commonest draw: one card
                single = (0,) * size
                for kind, ways in enumerate(remaining):
                    if ways:
                        after = hands[:index] + (_plus_one(hands[index], kind),) + hands[index + 1 :]
                        results.append((after, _plus_one(single, kind), weight * ways))
                continue
            for x, ways in multisets(remaining, count):
                drawn = _added(taken, x) if draw.take else x  # type: ignore[union-attr]
                after = hands[:index] + (_added(hands[index], drawn),) + hands[index + 1 :]
                results.append((after, drawn, weight * ways))
        (total,) = totals if len(totals) == 1 else (None,)
        if total is None:  # takes of different sizes cannot happen: each take removes exactly one card
            raise AssertionError("takes left different numbers of cards")
        return results, QQ(1, comb(total, count))

    def spend(self, hands: int, name: str, count: int, total: int) -> None:
        self.budget -= hands
        if self.budget < 0:
            raise TooManyHands(
                f"{self.source}: dealing the round looks at more than {MAX_DEAL_HANDS:,} hands (the limit), "
                f"at state {name!r} (drawing {count} of {total:,})"
            )

    def left(self, hands: Hands) -> tuple[int, ...]:
        return tuple(total - sum(hand[k] for hand in hands) for k, total in enumerate(self.kinds.counts))

    # -- a hand classified at once: counted by pattern -----------------------------------------
    def pattern_counted(self, state: State, compiled: CaseLists) -> bool:
        """Suits told apart, and the draw ends the round whatever comes: count rank vectors times suit
        patterns instead of every card vector (the other hands and the ones before are fixed)."""
        return (
            self.kinds.suited
            and not state.draw.take  # type: ignore[union-attr]
            and not state.is_decision
            and all(self.by_name[o.to].is_end for o in state.outcomes)
        )

    def by_pattern(self, state: State, hands: Hands, name: str, compiled: CaseLists) -> State:
        index = self.position[state.draw.hand]  # type: ignore[union-attr]
        count = state.draw.count  # type: ignore[union-attr]
        left = self.left(hands)
        classes = len(self.kinds.classes.labels)
        rows = [[0] * self.kinds.suits for _ in range(classes)]
        for kind, (rank, suit) in enumerate(self.kinds.of_kind):
            rows[rank][suit] += left[kind]  # type: ignore[index]
        total = sum(left)
        if count > total:
            raise OddsbenchError(f"{self.source}: state {name!r}: draws {count}, but only {total} are left")
        self.spend(count_multisets([sum(r) for r in rows], count, self.budget), name, count, total)
        summaries = [self.kinds.summary(hand) for hand in hands]
        before_ranks, before_suits = summaries[index]
        symmetric = not self.cases.named_suit and not any(before_ranks)
        calls = compiled.calls
        by_suit = [i for i, call in enumerate(calls) if reads_suits(call)]
        suit_calls = [calls[i] for i in by_suit]
        tally: dict[tuple, int] = {}  # hands with the same values of every call, counted together
        now = list(summaries)
        for ranks, spread in suit_patterns(rows, count, symmetric):
            after_ranks = tuple(a + b for a, b in zip(before_ranks, ranks))
            now[index] = (after_ranks, before_suits)
            values = list(self.cases.raw_values(calls, now, (ranks, before_suits)))
            for suits, ways in spread.items():
                if by_suit:
                    now[index] = (after_ranks, tuple(a + b for a, b in zip(before_suits, suits)))  # type: ignore[arg-type]
                    for i, value in zip(by_suit, self.cases.raw_values(suit_calls, now, (ranks, suits))):
                        values[i] = value
                key = tuple(values)
                tally[key] = tally.get(key, 0) + ways
        whole = comb(total, count)
        bucket: dict[tuple, tuple] = {}
        for key, ways in tally.items():
            for entry in self.cases.decide(compiled, key, name, None)[0][1]:
                outcome, prob, pay, stake = entry
                edge = (outcome.to, id(entry))
                before = bucket[edge][0] if edge in bucket else QQ(0)
                bucket[edge] = (before + QQ(ways, whole) * prob, pay, stake, outcome.note)
        return self.state_from(state, name, {None: bucket})


def _added(a: tuple[int, ...], b: tuple[int, ...]) -> tuple[int, ...]:
    return tuple(x + y for x, y in zip(a, b))


def _minus(values: tuple[int, ...], index: int) -> tuple[int, ...]:
    return values[:index] + (values[index] - 1,) + values[index + 1 :]


def _plus_one(values: tuple[int, ...], index: int) -> tuple[int, ...]:
    return values[:index] + (values[index] + 1,) + values[index + 1 :]


def _hand_names(ruleset: Ruleset) -> tuple[str, ...]:
    names: list[str] = []
    for state in ruleset.states:
        if state.draw is not None and state.draw.hand not in names:
            names.append(state.draw.hand)
    return tuple(names)


def _topological(start: str, successors: dict[str, set[str]]) -> list[str] | None:
    """The dealt states with every move going forward (Kahn's algorithm), start first; None when
    some move does not remove a card and comes back (a cycle), so no such order exists."""
    indegree = dict.fromkeys(successors, 0)
    for targets in successors.values():
        for target in targets:
            if target in indegree:
                indegree[target] += 1
    if indegree.get(start, 0) != 0:
        return None
    ready = deque([start] + [name for name, degree in indegree.items() if degree == 0 and name != start])
    order = []
    while ready:
        name = ready.popleft()
        order.append(name)
        for target in successors[name]:
            if target in indegree:
                indegree[target] -= 1
                if indegree[target] == 0:
                    ready.append(target)
    return order if len(order) == len(successors) else None


@functools.lru_cache(maxsize=16)
def _dealt(ruleset: Ruleset, max_states: int | None) -> Ruleset:
    return _Dealer(ruleset, max_states).run()


def dealt(ruleset: Ruleset, max_states: int | None = DEFAULT_MAX_STATES) -> Ruleset:
    """The round as plain states: a deck game dealt out from its start (cached), any other as it is."""
    if ruleset.deck is None:
        return ruleset
    return _dealt(ruleset, max_states)


@dataclass(frozen=True)
class SingleDraw:
    """A round that is one draw of ``count`` from the full deck of ``size``, ending at once: its chances
    are counts of hands out of ``hands`` = C(size, count)."""

    count: int
    size: int
    kind: str

    @property
    def hands(self) -> int:
        return comb(self.size, self.count)

    def counted(self, chances: dict[str, Rational]) -> HandCounts | None:
        """Each end's chance as a count of hands (None when some chance is not a whole count, which
        a single draw cannot give; or when exact chances are missing)."""
        per_end = []
        for name, chance in chances.items():
            if chance is None:
                return None
            hands = chance * self.hands
            if QQ.denom(hands) != 1:
                return None
            per_end.append((name, int(QQ.numer(hands))))
        return HandCounts(self.count, self.size, self.kind, self.hands, tuple(per_end))


@dataclass(frozen=True)
class HandCounts:
    """How many of the ``total`` = C(size, count) equally likely hands end in each end state."""

    count: int
    size: int
    kind: str
    total: int
    per_end: tuple[tuple[str, int], ...]


def single_draw(ruleset: Ruleset) -> SingleDraw | None:
    """Whether the round (from its start) is one draw of k that ends the round whatever is drawn."""
    if ruleset.deck is None:
        return None
    try:
        state = ruleset.state(ruleset.start)
    except KeyError:
        return None
    draw = state.draw
    if draw is None or draw.take or state.is_decision:
        return None
    if not all(ruleset.state(o.to).is_end for o in state.outcomes if o.to in ruleset.state_names):
        return None
    return SingleDraw(draw.count, ruleset.deck.size, ruleset.deck.kind)

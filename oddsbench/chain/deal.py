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
"""

from __future__ import annotations

import dataclasses
import functools
from collections import deque
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from math import comb

from oddsbench.chain.draws import TooManyHands, count_multisets, multisets, suit_patterns
from oddsbench.model.deck import Deck
from oddsbench.model.defaults import DEFAULT_MAX_STATES
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.expr import Call, ExpressionError, Node, evaluate, hand_calls
from oddsbench.model.hands import DRAWN, SUIT_FUNCTIONS, RankClasses, Resolved, check_call, hand_value
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.model.ruleset import Outcome, Ruleset, State, Strategy

MAX_DEAL_HANDS = 500_000  # hands looked at in one expansion, all draws together (seconds, not minutes)
Hands = tuple[tuple[int, ...], ...]  # per hand, a count per kind of card
Summary = tuple[tuple[int, ...], tuple[int, ...] | None]  # counts per rank class, per suit (None: suits not told)


@dataclass(frozen=True)
class Kinds:
    """How the dealer tells cards apart in this game: rank classes, with or without suits."""

    classes: RankClasses
    suited: bool
    of_kind: tuple[tuple[int, int | None], ...]  # kind -> (rank class, suit or None)
    counts: tuple[int, ...]  # kind -> how many in the full deck
    suits: int
    labels: tuple[str, ...]
    items: bool

    @staticmethod
    def of(deck: Deck, calls: Sequence[Resolved]) -> Kinds:
        suited = bool(deck.suits) and any(
            call.function in SUIT_FUNCTIONS or (call.label is not None and call.label[0] == "suit") for call in calls
        )
        told_apart = any(
            call.function not in ("cards", "hard", "total", "soft", "left", "count")
            or (call.label is not None and call.label[0] == "rank")
            for call in calls
            if call.function not in SUIT_FUNCTIONS
        )
        classes = RankClasses.of(deck, merge=not told_apart)
        totals: dict[tuple[int, int | None], int] = {}
        for rank, row in enumerate(deck.counts):
            for suit, count in enumerate(row):
                key = (classes.of_rank[rank], suit if suited else None)
                totals[key] = totals.get(key, 0) + count
        kinds = tuple(key for key in sorted(totals, key=lambda k: (k[0], -1 if k[1] is None else k[1])) if totals[key])
        labels = tuple(
            classes.labels[c] if s is None or deck.items else f"{classes.labels[c]} of {deck.suits[s]}"
            for c, s in kinds
        )
        return Kinds(classes, suited, kinds, tuple(totals[k] for k in kinds), len(deck.suits), labels, deck.items)

    def summary(self, hand: Sequence[int]) -> Summary:
        ranks = [0] * len(self.classes.labels)
        suits = [0] * self.suits if self.suited else None
        for kind, count in enumerate(hand):
            if count:
                rank, suit = self.of_kind[kind]
                ranks[rank] += count
                if suits is not None:
                    suits[suit] += count
        return tuple(ranks), (tuple(suits) if suits is not None else None)

    def matching(self, deck: Deck, name: str) -> list[int]:
        """The kinds a card named in ``take`` can be: one rank (any suit), or one card."""
        rank, suit = deck.card(name)  # type: ignore[misc]
        wanted_class = self.classes.of_rank[rank]
        return [
            kind
            for kind, (c, s) in enumerate(self.of_kind)
            if c == wanted_class and (suit is None or not self.suited or s == suit)
        ]

    def spelled(self, hand: Sequence[int]) -> str:
        if self.items:
            return ", ".join(f"{count} {self.labels[kind]}" for kind, count in enumerate(hand) if count)
        joiner = ", " if self.suited else " "  # "A of spades, K of hearts" or "10 6"
        return joiner.join(self.labels[kind] for kind, count in enumerate(hand) for _ in range(count))


@dataclass
class _Lists:
    """A state's outcome lists (one, or one per action) and every hand function they call."""

    lists: list[tuple[str | None, tuple[Outcome, ...], bool]]  # (action or None, outcomes, cases)
    calls: tuple[Resolved, ...]  # every different call
    slots: dict[int, int]  # id of each call in the trees -> its place in ``calls``
    memo: dict[tuple, object]


class _Dealer:
    def __init__(self, ruleset: Ruleset, max_states: int | None) -> None:
        self.ruleset = ruleset
        self.deck: Deck = ruleset.deck  # type: ignore[assignment]
        self.source = ruleset.source
        self.params = dict(ruleset.params)
        self.max_states = max_states
        self.by_name = {state.name: state for state in ruleset.states}
        self.hand_names = _hand_names(ruleset)
        self.position = {name: i for i, name in enumerate(self.hand_names)}
        self.resolved: dict[Call, Resolved] = {}
        for tree in _trees(ruleset):
            for call in hand_calls(tree):
                if call not in self.resolved:
                    checked = check_call(call, self.deck, self.hand_names, drawn=True)
                    if isinstance(checked, str):  # the reader checked it; a tree built elsewhere may not be
                        raise OddsbenchError(f"{self.source}: {checked}")
                    self.resolved[call] = checked
        self.kinds = Kinds.of(self.deck, list(self.resolved.values()))
        self.named_suit = any(r.label is not None and r.label[0] == "suit" for r in self.resolved.values())
        self.compiled: dict[str, _Lists] = {}
        self.budget = MAX_DEAL_HANDS
        self.reached = 0
        self.summaries: dict[tuple[int, ...], Summary] = {}
        self.suit_layout = self.exchangeable_suits()

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
                hands = self.canonical(hands)
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
            successors[name] = {o.to for _, listed in _lists_of(tables[name]) for o in listed}
        order = _topological(first, successors) or list(tables)
        states = [tables[name] for name in order] + [s for s in self.ruleset.states if s.is_end]
        strategies = tuple(self.strategy(strategy, tables, dealt_of) for strategy in self.ruleset.strategies)
        return dataclasses.replace(self.ruleset, start=first, states=tuple(states), strategies=strategies, deck=None)

    def exchangeable_suits(self) -> list[list[int]] | None:
        """Where the suits are told apart but none is ever named (flushes only) and the deck holds the same
        cards in every suit, hands equal up to a renaming of the suits are one state: the layout of kinds
        per rank class and suit that ``canonical`` permutes; None when the suits cannot be exchanged."""
        kinds = self.kinds
        if not kinds.suited or self.named_suit:
            return None
        if any(" of " in card for state in self.ruleset.states if state.draw for card in state.draw.take):
            return None
        place = {key: kind for kind, key in enumerate(kinds.of_kind)}
        layout = []
        for rank_class in range(len(kinds.classes.labels)):
            row = [place.get((rank_class, suit)) for suit in range(kinds.suits)]
            if all(kind is None for kind in row):
                continue
            if any(kind is None for kind in row) or len({kinds.counts[k] for k in row}) != 1:  # type: ignore[index]
                return None
            layout.append(row)
        return layout  # type: ignore[return-value]

    def canonical(self, hands: Hands) -> Hands:
        """The hands with the suits renamed so that their columns (every hand's cards of that suit) are in
        sorted order: one representative for all hands that differ only by the names of the suits."""
        layout = self.suit_layout
        columns = [tuple(hand[row[suit]] for hand in hands for row in layout) for suit in range(self.kinds.suits)]
        order = sorted(range(self.kinds.suits), key=columns.__getitem__)
        if order == sorted(order):
            return hands
        renamed = []
        for hand in hands:
            cards = list(hand)
            for row in layout:
                for new, old in enumerate(order):
                    cards[row[new]] = hand[row[old]]
            renamed.append(tuple(cards))
        return tuple(renamed)

    def spelled(self, state: str, hands: Hands) -> str:
        if self.by_name[state].is_end or not any(any(hand) for hand in hands):
            return state
        held = [f"{hand}: {self.kinds.spelled(cards)}" for hand, cards in zip(self.hand_names, hands) if any(cards)]
        return f"{state} [{'; '.join(held)}]"

    # -- one dealt state --------------------------------------------------------------------
    def expand(self, state: State, hands: Hands, name: str, name_of: Callable[[str, Hands], str]) -> State:
        compiled = self.compile(state)
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
            chosen = self.choose(
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
    def pattern_counted(self, state: State, compiled: _Lists) -> bool:
        """Suits told apart, and the draw ends the round whatever comes: count rank vectors times suit
        patterns instead of every card vector (the other hands and the ones before are fixed)."""
        return (
            self.kinds.suited
            and not state.draw.take  # type: ignore[union-attr]
            and not state.is_decision
            and all(self.by_name[o.to].is_end for o in state.outcomes)
        )

    def by_pattern(self, state: State, hands: Hands, name: str, compiled: _Lists) -> State:
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
        symmetric = not self.named_suit and not any(before_ranks)
        calls = compiled.calls
        by_suit = [i for i, call in enumerate(calls) if _reads_suits(call)]
        suit_calls = [calls[i] for i in by_suit]
        tally: dict[tuple, int] = {}  # hands with the same values of every call, counted together
        now = list(summaries)
        for ranks, spread in suit_patterns(rows, count, symmetric):
            after_ranks = tuple(a + b for a, b in zip(before_ranks, ranks))
            now[index] = (after_ranks, before_suits)
            values = list(self.raw_values(calls, now, (ranks, before_suits)))
            for suits, ways in spread.items():
                if by_suit:
                    now[index] = (after_ranks, tuple(a + b for a, b in zip(before_suits, suits)))  # type: ignore[arg-type]
                    for i, value in zip(by_suit, self.raw_values(suit_calls, now, (ranks, suits))):
                        values[i] = value
                key = tuple(values)
                tally[key] = tally.get(key, 0) + ways
        whole = comb(total, count)
        bucket: dict[tuple, tuple] = {}
        for key, ways in tally.items():
            for entry in self.decide(compiled, key, name, None)[0][1]:
                outcome, prob, pay, stake = entry
                edge = (outcome.to, id(entry))
                before = bucket[edge][0] if edge in bucket else QQ(0)
                bucket[edge] = (before + QQ(ways, whole) * prob, pay, stake, outcome.note)
        return self.state_from(state, name, {None: bucket})

    # -- outcomes for one set of hands -------------------------------------------------------
    def slots(self, trees: Sequence[Node]) -> tuple[tuple[Resolved, ...], dict[int, int]]:
        """The different calls in the trees, and where each call node's value sits among them."""
        distinct: dict[Call, int] = {}
        slots: dict[int, int] = {}
        for tree in trees:
            for call in hand_calls(tree):
                slots[id(call)] = distinct.setdefault(call, len(distinct))
        return tuple(self.resolved[call] for call in distinct), slots

    def compile(self, state: State) -> _Lists:
        compiled = self.compiled.get(state.name)
        if compiled is None:
            draws = state.draw is not None
            lists = [
                (action, outcomes, draws or any(o.when is not None for o in outcomes))
                for action, outcomes in _lists_of(state)
            ]
            trees = [tree for _, outcomes, _ in lists for outcome in outcomes for tree in _outcome_trees(outcome)]
            calls, slots = self.slots(trees)
            compiled = _Lists(lists, calls, slots, {})
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
        self, compiled: _Lists, summaries: Sequence[Summary], drawn: Summary | None, name: str, hands: Hands | None
    ) -> list[tuple[str | None, list[tuple[Outcome, Rational, Rational, Rational]]]]:
        """For each outcome list (per action): the outcomes taken with these hands, their chance,
        pay and stake. Hands with the same values of every function called share the answer."""
        try:
            key = self.raw_values(compiled.calls, summaries, drawn)
        except ExpressionError as error:
            raise OddsbenchError(f"{self.source}: state {name!r}: {error}") from None
        return self.decide(compiled, key, name, hands)

    def decide(
        self, compiled: _Lists, key: tuple, name: str, hands: Hands | None
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


def _reads_suits(call: Resolved) -> bool:
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


def _added(a: tuple[int, ...], b: tuple[int, ...]) -> tuple[int, ...]:
    return tuple(x + y for x, y in zip(a, b))


def _minus(values: tuple[int, ...], index: int) -> tuple[int, ...]:
    return values[:index] + (values[index] - 1,) + values[index + 1 :]


def _plus_one(values: tuple[int, ...], index: int) -> tuple[int, ...]:
    return values[:index] + (values[index] + 1,) + values[index + 1 :]


def _outcome_trees(outcome: Outcome) -> list[Node]:
    return ([outcome.when] if outcome.when is not None else []) + [tree for _, tree in outcome.by_hand]


def _trees(ruleset: Ruleset) -> list[Node]:
    trees = []
    for state in ruleset.states:
        for _, outcomes in _lists_of(state):
            for outcome in outcomes:
                trees += _outcome_trees(outcome)
    for strategy in ruleset.strategies:
        trees += [when for _, when, _ in strategy.by_hand if when is not None]
    return trees


def _lists_of(state: State) -> list[tuple[str | None, tuple[Outcome, ...]]]:
    return list(state.choices) if state.is_decision else [(None, state.outcomes)]


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

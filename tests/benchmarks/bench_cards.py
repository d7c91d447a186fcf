"""Benchmark: deck games, exactly. Run on demand: python tests/benchmarks/bench_cards.py [--quick]

1. Five cards from 52, every category exactly: the deal (counted by pattern: rank vectors times
   suit patterns) and the exact solve, beside the baseline of listing all 2,598,960 hands with
   itertools.combinations and classifying each in plain Python (with --quick: three cards, 22,100).
2. The dealer's final totals from a six-deck shoe, all ten upcards, exactly: the deal (hands as
   counts per kind, ten-valued cards merged) and the exact solve per upcard, beside a brute-force
   enumeration of every ordered sequence of cards the dealer can draw (exact rationals).

Both sides give exact answers and are checked equal; times are processor seconds of this process
(time.process_time: other work on a shared machine does not count), the ratio from one run.
"""

from __future__ import annotations

import dataclasses
import itertools
import sys
import time
from pathlib import Path

from oddsbench.chain.deal import _dealt, dealt
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

ROOT = Path(__file__).resolve().parents[2]
RULESETS = ROOT / "rulesets"
sys.path.insert(0, str(ROOT / "tests"))
from unit.test_dealer_finite_shoe import brute_force  # noqa: E402  (the baseline is the tests' own walk)

RANKS = "23456789TJQKA"


def classify(hand) -> str:
    """A hand of (rank index, suit) pairs, ranked as the bundled rulesets rank it."""
    ranks = sorted(rank for rank, _ in hand)
    counts = sorted((ranks.count(rank) for rank in set(ranks)), reverse=True)
    flush = len({suit for _, suit in hand}) == 1
    distinct = len(set(ranks)) == len(ranks)
    straight = distinct and (ranks[-1] - ranks[0] == len(ranks) - 1 or ranks == [*range(len(ranks) - 1), 12])
    if len(hand) == 3:
        return (
            "straight-flush"
            if straight and flush
            else "three-of-a-kind"
            if counts[0] == 3
            else "straight"
            if straight
            else "flush"
            if flush
            else "pair"
            if counts[0] == 2
            else "high-card"
        )
    if straight and flush:
        return "straight-flush"
    if counts[0] == 4:
        return "four-of-a-kind"
    if counts[:2] == [3, 2]:
        return "full-house"
    if flush:
        return "flush"
    if straight:
        return "straight"
    if counts[0] == 3:
        return "three-of-a-kind"
    if counts[:2] == [2, 2]:
        return "two-pair"
    return "pair" if counts[0] == 2 else "high-card"


def listing(size: int) -> dict[str, QQ]:
    deck = [(rank, suit) for rank in range(13) for suit in range(4)]
    counts: dict[str, int] = {}
    total = 0
    for hand in itertools.combinations(deck, size):
        name = classify(hand)
        counts[name] = counts.get(name, 0) + 1
        total += 1
    return {name: QQ(count, total) for name, count in counts.items()}


def ours(name: str, start: str | None = None, params=None) -> tuple[dict[str, QQ], float, float]:
    """(end chances, seconds to deal, seconds to solve exactly), the deal's cache cleared first."""
    _dealt.cache_clear()
    ruleset = load_ruleset(RULESETS / name, params)
    if start is not None:
        ruleset = dataclasses.replace(ruleset, start=start)
    began = time.process_time()
    played = dealt(ruleset)
    dealt_at = time.process_time()
    figures = solve_round(build_round_chain(played))
    solved_at = time.process_time()
    chances = {end: figure.exact for end, figure in figures.end_probability.items()}
    return chances, dealt_at - began, solved_at - dealt_at


def dealer_brute_force(upcard: int, decks: int) -> dict[str, QQ]:
    """The tests' independent walk over every sequence of cards (tests/unit/test_dealer_finite_shoe.py)."""
    return {name: value for name, value in brute_force(upcard, decks).items() if value}


def main() -> None:
    quick = "--quick" in sys.argv
    size, name = (3, "three-card-hands.toml") if quick else (5, "five-card-hands.toml")
    print(f"1. {size} cards from 52, every category exactly (one run each)")
    chances, deal_s, solve_s = ours(name)
    began = time.process_time()
    baseline = listing(size)
    listing_s = time.process_time() - began
    assert chances == baseline, "the deal and the listing disagree"
    ours_s = deal_s + solve_s
    print(
        f"   oddsbench (deal by pattern + exact solve): {ours_s:8.3f} s  (deal {deal_s:.3f} s, solve {solve_s:.3f} s)"
    )
    print(f"   baseline (list every hand, classify):       {listing_s:8.3f} s")
    print(f"   ratio baseline / oddsbench: {listing_s / ours_s:,.0f}x; answers identical")
    print()
    decks = 6
    print(f"2. dealer stands on soft 17, {decks}-deck shoe, all ten upcards exactly")
    total_ours = total_brute = 0.0
    states = 0
    print("   upcard   oddsbench s   brute force s   dealt states")
    for upcard in range(2, 12):
        chances, deal_s, solve_s = ours("dealer-six-decks-stands-soft-17.toml", f"up-{upcard}", {"decks": QQ(decks)})
        began = time.process_time()
        brute = dealer_brute_force(upcard, decks)
        brute_s = time.process_time() - began
        assert chances == brute, f"upcard {upcard}: the engine and the brute force disagree"
        ruleset = load_ruleset(RULESETS / "dealer-six-decks-stands-soft-17.toml")
        count = sum(1 for s in dealt(dataclasses.replace(ruleset, start=f"up-{upcard}")).states if not s.is_end)
        states += count
        total_ours += deal_s + solve_s
        total_brute += brute_s
        print(f"   {upcard:>6}   {deal_s + solve_s:11.3f}   {brute_s:13.3f}   {count:12,}")
    print(f"   all ten: oddsbench {total_ours:.3f} s ({states:,} dealt states), brute force {total_brute:.3f} s")
    print(f"   ratio brute force / oddsbench: {total_brute / total_ours:.2f}x; every final total identical")
    rows, shared_s, shared_states = all_upcards_at_once(decks)
    for upcard, row in rows.items():
        assert row == dealer_brute_force(upcard, decks), f"upcard {upcard}: the shared solve disagrees"
    print(
        f"   the ten rows from one deal from 'deal' ({shared_states:,} states: hands shared between upcards) and one "
        f"exact factorization: {shared_s:.3f} s; ratio brute force / this: {total_brute / shared_s:.2f}x"
    )
    _dealt.cache_clear()
    from oddsbench.core import load_game, make_settings, round_figures

    game = load_game(RULESETS / "dealer-six-decks-stands-soft-17.toml", {"decks": decks})
    began = time.process_time()
    columns = round_figures(game, make_settings(starts="up-*")).columns
    solve_s = time.process_time() - began
    for column in columns:
        row = {end: figure.exact for end, figure in column.figures.end_probability.items()}
        assert row == dealer_brute_force(int(column.start[3:]), decks), f"{column.start}: the solve disagrees"
    print(
        f"   oddsbench solve --from 'up-*' (one shared deal; every figure, both engines, per upcard): {solve_s:.3f} s; "
        f"ratio brute force / this: {total_brute / solve_s:.2f}x"
    )


def all_upcards_at_once(decks: int) -> tuple[dict[int, dict[str, QQ]], float, int]:
    """Every upcard's row from one chain: deal from 'deal' (every up-X state and the hands after it),
    factor I - Q once (exact, triangular: the deal only removes cards), one solve per end state."""
    from oddsbench.solve.linear import factor_exact, identity_minus

    _dealt.cache_clear()
    ruleset = load_ruleset(RULESETS / "dealer-six-decks-stands-soft-17.toml", {"decks": QQ(decks)})
    began = time.process_time()
    chain = build_round_chain(dealt(ruleset))
    factors = factor_exact(identity_minus(chain.q_rows()))
    columns = {end: factors.solve(column) for end, column in zip(chain.ends, chain.end_columns())}
    seconds = time.process_time() - began
    rows = {}
    for upcard in range(2, 12):
        at = chain.names.index(f"up-{upcard}")
        rows[upcard] = {end: values[at] for end, values in columns.items() if values[at]}
    return rows, seconds, chain.transient_count


if __name__ == "__main__":
    main()

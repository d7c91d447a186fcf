"""Counting draws without replacement: every hand of k from piles of cards, with its number of ways.

Taking k cards from piles of sizes n_1, ..., n_m (a pile per rank, per card, or per item label),
the hand that takes x_i from pile i can be dealt in prod C(n_i, x_i) ways out of C(n, k): the
multivariate hypergeometric law. ``multisets`` lists the hands as count vectors, never the cards
one by one (five from 13 ranks is 6,175 vectors, not 2,598,960 hands). ``suit_patterns`` adds the
suits where a hand is classified at once: for each vector of ranks, the ways per vector of suits,
found once per shape of the hand (which counts of which piles) and reused.
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from math import comb

from oddsbench.model.errors import OddsbenchError


def multisets(left: Sequence[int], k: int) -> Iterator[tuple[tuple[int, ...], int]]:
    """Every way to take ``k`` from piles of sizes ``left``: (count per pile, number of ways).

    Iterative (a deck of thousands of piles must not meet the recursion limit); piles that cannot
    be filled any more are pruned with suffix sums, so every branch ends in a hand."""
    size = len(left)
    suffix = [0] * (size + 1)
    for i in range(size - 1, -1, -1):
        suffix[i] = suffix[i + 1] + left[i]
    if k < 0 or k > suffix[0]:
        return
    if size == 0:
        yield (), 1
        return
    x = [0] * size
    low = [0] * size
    remaining = [0] * (size + 1)
    ways = [1] * (size + 1)
    remaining[0] = k
    i = 0
    fresh = True
    while True:
        if fresh:
            if i == size:
                yield tuple(x), ways[size]
                i -= 1
                fresh = False
                continue
            low[i] = max(0, remaining[i] - suffix[i + 1])
            x[i] = min(left[i], remaining[i])
        else:
            if i < 0:
                return
            if x[i] == low[i]:
                x[i] = 0
                i -= 1
                continue
            x[i] -= 1
        ways[i + 1] = ways[i] * comb(left[i], x[i])
        remaining[i + 1] = remaining[i] - x[i]
        i += 1
        fresh = True


def count_multisets(left: Sequence[int], k: int, cap: int) -> int:
    """How many hands ``multisets(left, k)`` lists, or ``cap + 1`` once it is known to be more
    than ``cap`` (the bound C(m + k - 1, k) first, an exact count only where that is cheap)."""
    piles = [n for n in left if n > 0]
    if k < 0 or k > sum(piles):
        return 0
    bound = comb(len(piles) + k - 1, k) if piles else 1
    if bound <= cap:
        return bound  # an upper bound is enough to accept
    if len(piles) * (k + 1) > 4_000_000:
        return cap + 1
    counts = [1] + [0] * k  # counts[j]: ways to choose count vectors summing to j so far
    for n in piles:
        window = 0
        updated = [0] * (k + 1)
        for j in range(k + 1):
            window += counts[j]
            if j - n - 1 >= 0:
                window -= counts[j - n - 1]
            updated[j] = min(window, cap + 1)
        counts = updated
    return min(counts[k], cap + 1)


def suit_patterns(
    rows: Sequence[Sequence[int]], k: int, symmetric: bool
) -> Iterator[tuple[tuple[int, ...], dict[tuple[int, ...], int]]]:
    """Hands of ``k`` from a deck given as ``rows[rank][suit]`` counts: for each vector of ranks,
    the number of ways per vector of suits. With ``symmetric`` the suit vectors are sorted (largest
    first), for questions that never name a suit (flushes, the most of one suit)."""
    totals = [sum(row) for row in rows]
    cache: dict[tuple, dict[tuple[int, ...], int]] = {}
    for ranks, _ in multisets(totals, k):
        shape = tuple(sorted((ranks[r], tuple(rows[r])) for r in range(len(ranks)) if ranks[r]))
        spread = cache.get(shape)
        if spread is None:
            spread = _spread(shape, len(rows[0]) if rows else 0, symmetric)
            cache[shape] = spread
        yield ranks, spread


def _spread(shape: tuple, suits: int, symmetric: bool) -> dict[tuple[int, ...], int]:
    """Ways per suit vector to deal ``taken`` cards of each rank from that rank's suits."""
    spread: dict[tuple[int, ...], int] = {(0,) * suits: 1}
    for taken, row in shape:
        grown: dict[tuple[int, ...], int] = {}
        for held, ways in spread.items():
            for split, more in multisets(row, taken):
                after = tuple(a + b for a, b in zip(held, split))
                grown[after] = grown.get(after, 0) + ways * more
        spread = grown
    if not symmetric:
        return spread
    folded: dict[tuple[int, ...], int] = {}
    for held, ways in spread.items():
        key = tuple(sorted(held, reverse=True))
        folded[key] = folded.get(key, 0) + ways
    return folded


class TooManyHands(OddsbenchError):
    """A draw or a whole deal would list more hands than the limit; the message says how many."""

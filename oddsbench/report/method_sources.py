"""Where the methods behind the figures come from: printed in every report."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class MethodSource:
    topic: str
    method: str
    reference: str


ROUND_SOURCES: tuple[MethodSource, ...] = (
    MethodSource(
        "round",
        "A round is an absorbing Markov chain; end chances, expected totals and their variances "
        "come from first-step analysis with the fundamental matrix N = (I - Q)^-1.",
        "J. G. Kemeny and J. L. Snell, Finite Markov Chains, Van Nostrand (1960), chapter III; "
        "C. M. Grinstead and J. L. Snell, Introduction to Probability, AMS (1997), chapter 11.",
    ),
    MethodSource(
        "exact arithmetic",
        "Exact figures are rationals from sparse elimination over the rationals (FLINT fmpq "
        "through sympy's domain matrices); decimals are derived from them.",
        "W. B. Hart, Fast Library for Number Theory: an introduction, ICMS 2010, LNCS 6327; "
        "sympy.polys.matrices (DomainMatrix) documentation.",
    ),
    MethodSource(
        "decimal check",
        "An independent float64 solve (sparse LU) of the same systems checks the exact engine.",
        "X. S. Li, An overview of SuperLU, ACM Trans. Math. Softw. 31 (2005) 302-325.",
    ),
    MethodSource(
        "house edge",
        "House edge = -(expected net) / (expected total staked); return to player = 1 - house edge.",
        "S. N. Ethier, The Doctrine of Chances: Probabilistic Aspects of Gambling, Springer (2010); "
        "common practice for rounds with extra stakes.",
    ),
)

SESSION_SOURCES: tuple[MethodSource, ...] = (
    MethodSource(
        "session",
        "A session of repeated rounds with a bankroll, a goal and a stop is again an absorbing "
        "chain, over bankroll states; ruin and goal chances are its absorption probabilities.",
        "W. Feller, An Introduction to Probability Theory and Its Applications, vol. 1, 3rd ed., "
        "Wiley (1968), chapter XIV (the classical ruin problem).",
    ),
)

SIMULATION_SOURCES: tuple[MethodSource, ...] = (
    MethodSource(
        "simulation",
        "Monte Carlo cross-check with numpy's PCG64 generator and Walker's alias tables; "
        "Wilson intervals for chances, normal intervals for means.",
        "A. J. Walker, ACM Trans. Math. Softw. 3 (1977) 253-256; E. B. Wilson, J. Amer. Statist. "
        "Assoc. 22 (1927) 209-212; M. E. O'Neill, PCG, Harvey Mudd College HMC-CS-2014-0905 (2014).",
    ),
)

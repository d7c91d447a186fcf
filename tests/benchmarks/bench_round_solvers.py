"""Exact and decimal first-step solves on walk-like chains, beside two baselines.

Run on demand (not part of the test run):

    python tests/benchmarks/bench_round_solvers.py            # full run, a few minutes
    python tests/benchmarks/bench_round_solvers.py --quick    # smaller sizes

The chain: a +1/-1 walk with p = 18/37 on transient states 1..N-1 (absorbing at 0 and N),
built as the RoundChain the solver uses. Ours: the exact sparse LU and
the decimal SuperLU path, both through the front door solve/linear/. Baselines: dense numpy.linalg.solve and sympy
Matrix.LUsolve, each as far as it is feasible; the ratio column is baseline time / our time.
"""

from __future__ import annotations

import argparse
import time

import numpy as np

import oddsbench  # noqa: F401  (sets FLINT ground types before sympy loads)
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve.linear import factor_exact, factor_float, identity_minus, identity_minus_float

P = QQ(18, 37)


def walk_rows(size: int) -> list[dict[int, object]]:
    rows = []
    for i in range(size):
        row = {}
        if i + 1 < size:
            row[i + 1] = P
        if i > 0:
            row[i - 1] = 1 - P
        rows.append(row)
    return rows


def timed(function, *args):
    start = time.perf_counter()
    result = function(*args)
    return time.perf_counter() - start, result


def exact_ours(size: int):
    rows = identity_minus(walk_rows(size))
    rhs = [QQ(0)] * size
    rhs[-1] = P
    return factor_exact(rows).solve(rhs)


def exact_sympy_solve_den(size: int):
    rows = identity_minus(walk_rows(size))
    rhs = [QQ(0)] * size
    rhs[-1] = P
    return factor_exact(rows, method="fraction-free").solve(rhs)


def exact_sympy_matrix(size: int):
    from sympy import Matrix, Rational

    p = Rational(18, 37)
    matrix = Matrix.zeros(size, size)
    for i in range(size):
        matrix[i, i] = 1
        if i + 1 < size:
            matrix[i, i + 1] = -p
        if i > 0:
            matrix[i, i - 1] = -(1 - p)
    rhs = Matrix.zeros(size, 1)
    rhs[size - 1] = p
    return matrix.LUsolve(rhs)


def decimal_ours(size: int):
    p = 18 / 37
    index = np.arange(size)
    from scipy.sparse import csc_matrix

    rows = np.concatenate([index[:-1], index[1:]])
    cols = np.concatenate([index[1:], index[:-1]])
    data = np.concatenate([np.full(size - 1, p), np.full(size - 1, 1 - p)])
    q = csc_matrix((data, (rows, cols)), shape=(size, size))
    rhs = np.zeros(size)
    rhs[-1] = p
    return factor_float(identity_minus_float(q)).solve(rhs)


def decimal_dense(size: int):
    p = 18 / 37
    matrix = np.eye(size)
    index = np.arange(size - 1)
    matrix[index, index + 1] = -p
    matrix[index + 1, index] = -(1 - p)
    rhs = np.zeros(size)
    rhs[-1] = p
    return np.linalg.solve(matrix, rhs)


def walk_ruleset_chain(size: int):
    """The same walk as a RoundChain, for the whole pipeline (every figure, both engines)."""
    from oddsbench.chain.round_chain import Edge, RoundChain

    names = tuple(f"s{i}" for i in range(1, size + 1)) + ("ruin", "goal")
    index_of = {"ruin": size, "goal": size + 1}
    edges = []
    for i in range(size):
        up = i + 1 if i + 1 < size else index_of["goal"]
        down = i - 1 if i > 0 else index_of["ruin"]
        edges.append(Edge(i, up, P, QQ(1), QQ(0)))
        edges.append(Edge(i, down, 1 - P, QQ(-1), QQ(0)))
    return RoundChain("walk", names, size, (None,) * len(names), tuple(edges), QQ(1))


def full_round_solve(size: int):
    from oddsbench.solve.round import solve_round

    return solve_round(walk_ruleset_chain(size))


def row(label: str, ours: float, baseline: float | None, name: str) -> str:
    base = f"{baseline:9.3f} s" if baseline is not None else "        -  "
    ratio = f"{baseline / ours:8.1f}x" if baseline is not None and ours > 0 else "       - "
    return f"{label:>10}  {ours:9.3f} s  {base}  {ratio}  ({name})"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="smaller sizes")
    args = parser.parse_args()
    exact_sizes = [100, 1_000, 2_000] if args.quick else [100, 1_000, 2_000, 10_000]
    decimal_sizes = [100, 10_000, 100_000] if args.quick else [100, 10_000, 100_000, 1_000_000]
    print("Exact solves (ruin chance from the top state), ours vs baselines")
    print(f"{'states':>10}  {'ours':>11}  {'baseline':>11}  {'ratio':>9}")
    for size in exact_sizes:
        ours, value = timed(exact_ours, size)
        if size <= 2_000:
            den, check = timed(exact_sympy_solve_den, size)
            assert check == value
            print(row(f"{size:,}", ours, den, "sympy DomainMatrix sparse solve_den"))
        if size <= 100:
            lu, check = timed(exact_sympy_matrix, size)
            assert [QQ(int(v.p), int(v.q)) for v in check] == value
            print(row(f"{size:,}", ours, lu, "sympy Matrix.LUsolve"))
        elif size > 2_000:
            print(row(f"{size:,}", ours, None, "baselines infeasible"))
        if size in (1_000, 2_000):
            whole, _ = timed(full_round_solve, size)
            print(row(f"{size:,}", whole, None, "whole solve_round: 7 figures + 2 end chances, both engines"))
    print()
    print("Decimal solves, ours (scipy SuperLU on CSC) vs dense numpy.linalg.solve")
    print(f"{'states':>10}  {'ours':>11}  {'baseline':>11}  {'ratio':>9}")
    for size in decimal_sizes:
        ours, value = timed(decimal_ours, size)
        if size <= 10_000:
            dense, check = timed(decimal_dense, size)
            assert np.allclose(check, value, atol=1e-12)
            print(row(f"{size:,}", ours, dense, "numpy dense"))
        else:
            print(row(f"{size:,}", ours, None, "dense infeasible: n^2 memory"))
    exact_value = exact_ours(1_000)
    gap = abs(decimal_ours(1_000)[0] - to_float(exact_value[0]))
    print(f"\nfloat vs exact at 1,000 states, state 1: absolute gap {gap:.2e}")


if __name__ == "__main__":
    main()

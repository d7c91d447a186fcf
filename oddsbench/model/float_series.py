"""A long series of decimals (the goal chance from every bankroll) kept as one read-only float array.

A session of 10^6 bankroll values has a goal-chance series of 10^6 decimals: as a tuple of Python
floats it took 35 ms and 32 MB to build (measured on the 10^6-unit timid session, issue 15), more
than a fifth of the whole solve, while callers read a few of its values (a sample, a CSV line at a
time). So it stays one numpy array that reads as a sequence of Python floats.
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence

import numpy as np


class FloatSeries(Sequence):
    """Read-only decimals: ``len``, ``series[k]`` (a Python float), slices (a series), iteration,
    equality with another series or a sequence of the same floats; ``array()`` for numpy work."""

    __slots__ = ("_values",)

    def __init__(self, values) -> None:
        array = np.asarray(values, dtype=float).view()
        array.flags.writeable = False
        self._values = array

    def __len__(self) -> int:
        return len(self._values)

    def __getitem__(self, index):
        if isinstance(index, slice):
            return FloatSeries(self._values[index])
        return float(self._values[index])

    def __iter__(self) -> Iterator[float]:
        return iter(self._values.tolist())

    def __eq__(self, other: object) -> bool:
        if isinstance(other, FloatSeries):
            return bool(np.array_equal(self._values, other._values))
        if isinstance(other, Sequence) and not isinstance(other, str):
            return len(other) == len(self) and bool(np.array_equal(self._values, np.asarray(other, dtype=float)))
        return NotImplemented

    __hash__ = None  # type: ignore[assignment]  (like a list: equal by value, so not hashable)

    def array(self) -> np.ndarray:
        """The values as a read-only numpy array (no copy)."""
        return self._values

    def __repr__(self) -> str:
        return f"FloatSeries({len(self)} values)"

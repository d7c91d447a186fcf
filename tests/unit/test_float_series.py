"""A goal-chance series is one read-only float array that reads as a sequence of Python floats."""

from __future__ import annotations

import json

import numpy as np
import pytest

from oddsbench.model.float_series import FloatSeries


def test_a_series_reads_as_python_floats_and_slices_to_a_series():
    series = FloatSeries(np.array([0.0, 0.25, 1.0]))
    assert len(series) == 3
    assert type(series[1]) is float and series[1] == 0.25
    assert series[-1] == 1.0
    assert isinstance(series[:2], FloatSeries) and list(series[:2]) == [0.0, 0.25]
    assert json.dumps(list(series)) == "[0.0, 0.25, 1.0]"


def test_a_series_equals_the_same_floats_and_no_others():
    series = FloatSeries([0.5, 1.0])
    assert series == FloatSeries(np.array([0.5, 1.0]))
    assert series == (0.5, 1.0)
    assert series != (0.5, 0.75)
    assert series != (0.5,)


def test_a_series_cannot_be_changed_through_its_array():
    series = FloatSeries(np.zeros(4))
    with pytest.raises(ValueError):
        series.array()[0] = 1.0

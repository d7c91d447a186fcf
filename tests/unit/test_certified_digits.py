"""Certified digits say what their error is: within one unit of their last place (they are rounded
from a proved interval), and the interval's radius beside it, never the radius as the digits' error."""

from __future__ import annotations

import json
import subprocess
import sys
from decimal import Decimal

import mpmath

from oddsbench.solve.ruin.balls import certified, error_bound_text, precision


def unit_in_last_place(text: str) -> Decimal:
    return Decimal(1).scaleb(Decimal(text).as_tuple().exponent)


def test_digits_read_from_a_wide_interval_are_within_one_unit_of_the_true_value():
    from flint import arb

    with precision(200):
        for true, radius in (("0.23606797749978969640917", "1e-15"), ("1.99999999999999999", "3e-12")):
            ball = arb(true, radius)  # a proved interval around ``true``, as an engine would hold it
            shown = certified(ball, 20)
            assert abs(Decimal(shown.text) - Decimal(true)) <= unit_in_last_place(shown.text), shown


def test_the_error_bound_names_the_last_digit_and_the_radius_apart():
    said = error_bound_text("2.1e-43")
    assert "within one unit of the last" in said and "radius at most 2.1e-43" in said


def test_the_golden_ruin_chance_is_within_one_unit_of_its_last_digit():
    # Win 2 or lose 1, each with chance 1/2: ruin from bankroll 3 with no goal is theta^3, theta the
    # root in (0, 1) of t^2 + t - 1, theta = (sqrt 5 - 1)/2 (first principles: E[t^X] = 1, Feller
    # vol. I ch. XIV for the method).
    out = subprocess.run(
        [
            sys.executable,
            "-m",
            "oddsbench",
            "session",
            "--round",
            "2:1/2,-1:1/2",
            "--bankroll",
            "3",
            "--goal",
            "none",
            "--plan",
            "flat:1",
            "--json",
        ],
        capture_output=True,
        text=True,
        check=True,
    ).stdout
    document = json.loads(out)
    ruin = document["plans"][0]["ruin"] if "plans" in document else document["ruin"]
    mpmath.mp.dps = 60
    true = ((mpmath.sqrt(5) - 1) / 2) ** 3
    digits = ruin["decimal"]["digits"]
    assert abs(mpmath.mpf(digits) - true) <= mpmath.mpf(str(unit_in_last_place(digits)))
    assert "within one unit of the last" in ruin["error_bound"]

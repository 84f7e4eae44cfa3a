"""Tests of calc.solve: bisection to a sign change, and bracketing a yes/no change."""
import math

import pytest

from calc.kernel.solve import bisect, bracket


def test_bisect_finds_sqrt_two():
    # sqrt(2) is the positive root of x^2 - 2, by definition.
    assert bisect(lambda x: x * x - 2.0, 0.0, 2.0) == pytest.approx(math.sqrt(2.0), rel=1e-12)


def test_bisect_finds_ln_two():
    # ln 2 is the root of e^x - 2, by definition of the natural logarithm.
    assert abs(bisect(lambda x: math.exp(x) - 2.0, 0.0, 1.0, rel_tol=1e-15) - math.log(2.0)) < 1e-15


def test_bisect_falling_function_with_ends_swapped():
    # cos falls through zero at pi/2 (by definition of pi); the negative end goes first.
    root = bisect(math.cos, 2.0, 1.0, x_tol=1e-13, rel_tol=0.0)
    assert abs(root - math.pi / 2.0) <= 1e-13


def test_bisect_absolute_tolerance_is_kept():
    # A straight line through 1/3: the answer lies within half the tolerance of the crossing.
    root = bisect(lambda x: x - 1.0 / 3.0, 0.0, 1.0, x_tol=1e-3, rel_tol=0.0)
    assert abs(root - 1.0 / 3.0) <= 0.5e-3
    assert abs(root - 1.0 / 3.0) > 1e-9  # it stopped at the tolerance, not at machine precision


def test_bisect_max_iter_limits_the_halvings():
    # Two halvings of [0, 8] leave a bracket of width 2; its midpoint is returned.
    calls = []

    def f(x):
        calls.append(x)
        return x - 3.0
    assert bisect(f, 0.0, 8.0, rel_tol=0.0, max_iter=2) == 3.0  # brackets [2, 4]
    assert calls == [4.0, 2.0]


def test_bracket_returns_the_end_past_the_change():
    # A yes/no test that turns yes at 5.5: the high end always passes, the low end never.
    low, high = bracket(lambda x: x >= 5.5, 0.0, 16.0, x_tol=0.25, rel_tol=0.0)
    assert high >= 5.5 > low
    assert high - low <= 0.25


def test_bracket_stops_at_once_when_already_narrow():
    # A bracket already within tolerance is returned unchanged, with no evaluation.
    assert bracket(lambda x: 1 / 0, 1.0, 1.5, x_tol=1.0) == (1.0, 1.5)

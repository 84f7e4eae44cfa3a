"""Bisection: where a continuous quantity crosses zero, or a yes/no answer turns to yes.

Several calculators invert a relation that has no closed-form inverse (Saybolt seconds to
cSt, VI to KV100, tank level from volume, the steady tank temperature, the temperature at
which a pump starves, the least VI that fits a pump). They all halve a bracket the same way;
this module is that one loop. Each caller keeps its own tolerance.

Convention: the "left" end `low` is where the answer is still no (f < 0), the "right" end
`high` where it is yes (f >= 0). `low` may be numerically above `high` (a search that walks
down in temperature); the halving does not care which is larger.

Source: the bisection method, e.g. Burden & Faires, Numerical Analysis, section 2.1 (from
memory): each halving keeps the half whose ends still disagree, so the bracket shrinks by 2
per step and always holds a crossing of a continuous f.
"""
from __future__ import annotations

from collections.abc import Callable


def bracket(past: Callable[[float], bool], low: float, high: float, *, x_tol: float = 0.0,
            rel_tol: float = 1e-12, max_iter: int = 200) -> tuple[float, float]:
    """Narrow [low, high] around the point where `past(x)` turns from False to True.

    Contract: `past(low)` is False and `past(high)` is True (not checked: the caller has
    bracketed). Each step evaluates the midpoint and moves `high` there when `past` is True,
    else `low`. Stops, before halving, once |high - low| <= max(x_tol, rel_tol * |high|), or
    after `max_iter` halvings. Returns the final (low, high): `high` is the end known to be
    past the change, which is the cautious answer for "the least x that passes".

    >>> low, high = bracket(lambda x: x >= 3.0, 0.0, 8.0, x_tol=1.0, rel_tol=0.0)
    >>> (low, high)
    (2.0, 3.0)
    """
    for _ in range(max_iter):
        if abs(high - low) <= max(x_tol, rel_tol * abs(high)):
            break
        mid = 0.5 * (low + high)
        if past(mid):
            high = mid
        else:
            low = mid
    return low, high


def bisect(f: Callable[[float], float], low: float, high: float, *, x_tol: float = 0.0,
           rel_tol: float = 1e-12, max_iter: int = 200) -> float:
    """The x between `low` and `high` where a continuous `f` crosses from negative to >= 0.

    Contract: f(low) < 0 <= f(high) (not checked). A midpoint with f < 0 replaces `low`,
    any other (f >= 0, or NaN) replaces `high`; so for a falling f pass the ends swapped, or
    negate f. Tolerances and the stop rule are those of `bracket`; the result is the midpoint
    of the final bracket, within half the tolerance of a crossing.

    Example: sqrt(2), the positive root of x^2 - 2, by definition 1.41421356237...

    >>> round(bisect(lambda x: x * x - 2.0, 1.0, 2.0), 11)
    1.41421356237
    """
    low, high = bracket(lambda x: not f(x) < 0.0, low, high, x_tol=x_tol, rel_tol=rel_tol,
                        max_iter=max_iter)
    return 0.5 * (low + high)


def find_root(f, lo: float, hi: float, steps: int = 400) -> float | None:
    """The first x in [lo, hi] (lo, hi > 0) where f(x) crosses from negative to >= 0.

    Brackets the crossing on a geometric grid of `steps` points, then bisects to
    machine precision; None when f never reaches 0 in the range. Robust where f is
    piecewise (as D2270's interpolated table is) or not monotonic.

    >>> round(find_root(lambda x: x * x - 2.0, 1.0, 10.0), 12)
    1.414213562373
    """
    ratio = (hi / lo) ** (1.0 / steps)
    left = lo
    if f(left) >= 0.0:
        return left
    for k in range(1, steps + 1):
        right = hi if k == steps else lo * ratio ** k
        if f(right) >= 0.0:
            break
        left = right
    else:
        return None
    return bisect(f, left, right, rel_tol=1e-14, max_iter=200)

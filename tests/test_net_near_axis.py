"""Interior points next to the axis in skewed cells, and crossing characteristics.

Exact reference: spherical source flow (theta = polar angle, A/A* = (r/r*)^2;
Source: exact radial-flow solution, Zucrow and Hoffman, Gas Dynamics vol. 1,
1976, from memory; A/A*(M) from NACA Report 1135).  On its axis
sin(theta)/y -> 1/x, so the source term there is sin(mu)/x exactly.
"""

import numpy as np
import pytest

from moc.errors import ComputationError
from moc.flow import mach_from_area_ratio
from moc.net import interior_point, points

G = 1.4


def spherical(x, y):
    x, y = np.atleast_1d(x).astype(float), np.atleast_1d(y).astype(float)
    return points(x, y, np.arctan2(y, x), mach_from_area_ratio(np.hypot(x, y) ** 2, G), G)


def test_skewed_cell_next_to_the_axis_converges_at_third_order():
    # A on the axis, B far up and upstream (as after a strong expansion): the new point
    # lies close to the axis, and its own source term sin(theta)/y feeds back into its
    # flow angle with a gain 0.25 |s_C- - s_C+| sin(mu) / y above 1, where a plain
    # fixed-point corrector diverges.  The local error must still fall as h^3.
    errs = []
    for h in (0.1, 0.05, 0.025, 0.0125):
        a = spherical(2.0, 0.0)
        b = spherical(2.0 - 2.0 * h, h)
        p = interior_point(a, b, G, 1, source_a=np.sin(a.mu) / a.x)
        s_plus = np.hypot(p.x - a.x, p.y - a.y)
        s_minus = np.hypot(p.x - b.x, p.y - b.y)
        gain = 0.25 * (s_minus - s_plus) * np.sin(p.mu) / p.y
        assert gain[0] > 1.0  # the case the corrector has to handle
        ex = spherical(p.x, p.y)
        errs.append(max(abs(p.theta[0] - ex.theta[0]), abs(p.nu[0] - ex.nu[0])))
    orders = np.log2(np.array(errs[:-1]) / np.array(errs[1:]))
    assert np.all(orders > 2.8), (errs, orders)
    assert errs[-1] < 2e-6


def test_crossing_characteristics_are_reported():
    # the C- through B reaches the axis upstream of A: it has crossed the C- through A
    # (common practice: an envelope of one family marks a shock, the net stops there)
    a = spherical(2.0, 0.0)
    b = spherical(1.5, 0.1)
    with pytest.raises(ComputationError, match=r"C-\) cross near x = 1\.75"):
        interior_point(a, b, G, 1, source_a=np.sin(a.mu) / a.x)

"""The one-point (float) path of axis_point against its array path, and the Mach angle
that interior_point returns against the Prandtl-Meyer relation.

Reference flow: spherical source flow (exact radial-flow solution; Source: Zucrow
and Hoffman, Gas Dynamics vol. 1, 1976, from memory), Mach numbers from the
isentropic area ratio (Source: NACA Report 1135); inverse Prandtl-Meyer from
moc.flow (closed form of NACA Report 1135 solved independently of the net's own
Newton steps).
"""

import numpy as np

from moc.flow import mach_angle, mach_from_area_ratio, mach_from_prandtl_meyer
from moc.net import Points, axis_point, interior_point, points

G = 1.4


def spherical(r, phi):
    r, phi = np.broadcast_arrays(np.asarray(r, dtype=float), np.asarray(phi, dtype=float))
    return points(r * np.cos(phi), r * np.sin(phi), phi, mach_from_area_ratio(r**2, G), G)


def test_axis_point_float_path_equals_array_path():
    r = np.array([1.05, 1.3, 2.0, 3.5])
    phi = np.array([0.01, 0.04, 0.08, 0.03])
    both = spherical(r, phi)
    for k in range(r.size):
        # the same point twice takes the array path through the same iterations
        arr, src = axis_point(both.take([k, k]), G, 1, return_source=True)
        one, s1 = axis_point(both.take(slice(k, k + 1)), G, 1, return_source=True)  # float path
        for f_one, f_arr in zip(one, arr):
            assert abs(f_one[0] - f_arr[0]) <= 1e-14 * max(1.0, abs(f_arr[0]))
        assert abs(s1[0] - src[0]) <= 1e-14
        # and the point is the spherical-flow state on the axis to the local error of one step
        # (common practice: O(h^2) for the axis unit process, h ~ r phi here)
        exact = mach_from_area_ratio(one.x[0] ** 2, G)
        assert abs(one.mach[0] / exact - 1.0) < 5.0 * (r[k] * phi[k]) ** 2


def test_interior_point_mach_angle_matches_prandtl_meyer():
    f = spherical(np.full(41, 1.6), np.linspace(0.0, 0.4, 41))
    for delta in (0, 1):
        p = interior_point(f.take(slice(0, -1)), f.take(slice(1, None)), G, delta)
        ref = mach_angle(mach_from_prandtl_meyer(p.nu, G))
        assert np.max(np.abs(p.mu - ref)) < 1e-12
        assert isinstance(p, Points)

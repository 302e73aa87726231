"""Unit processes and net builders checked on exact flows.

Exact reference: radial source flow, cylindrical (planar, delta = 0) or
spherical (axisymmetric, delta = 1).  It is an exact homentropic solution of
the equations the net solves, with non-zero source terms in the axisymmetric
case: theta is the polar angle and the Mach number follows from the area
ratio A/A* = (r/r*)^(1+delta) (Source: exact solution, radial flow as in
Zucrow and Hoffman, Gas Dynamics vol. 1, 1976, from memory; A/A*(M) from
NACA Report 1135).  The checks are the orders of accuracy a second-order
predictor-corrector must show: local error ~ step^3, global error ~ step^2.
"""

import numpy as np
import pytest

from moc.errors import InputError
from moc.flow import mach_angle, mach_from_area_ratio, mach_from_prandtl_meyer, prandtl_meyer
from moc.net import (
    Points, axis_point, goursat, interior_point, inverse_wall_point, march_fan,
    march_from_line, points, wall_point,
)
from moc.net._pm import mu_of_nu

G = 1.4


def exact(x, y, delta):
    r = np.hypot(x, y)
    m = mach_from_area_ratio(r ** (1 + delta), G)
    return np.arctan2(y, x), prandtl_meyer(m, G)


def pts(x, y, delta):
    x, y = np.atleast_1d(x).astype(float), np.atleast_1d(y).astype(float)
    r = np.hypot(x, y)
    return points(x, y, np.arctan2(y, x), mach_from_area_ratio(r ** (1 + delta), G), G)


def polar(r, phi, delta):
    return pts(r * np.cos(phi), r * np.sin(phi), delta)


def order(errors):
    e = np.asarray(errors)
    return np.log2(e[:-1] / e[1:])


@pytest.mark.parametrize("delta", [0, 1])
def test_interior_point_local_error_is_third_order(delta):
    errs = []
    for h in (0.08, 0.04, 0.02, 0.01):
        a = polar(2.0, 0.3 - h, delta)  # C+ from the lower point
        b = polar(2.0, 0.3 + h, delta)  # C- from the upper point
        p = interior_point(a, b, G, delta)
        th, nu = exact(p.x, p.y, delta)
        errs.append(max(abs(p.nu - nu)[0], abs(p.theta - th)[0]))
    assert np.all(order(errs) > 2.7), errs


@pytest.mark.parametrize("delta", [0, 1])
def test_wall_points_local_error_is_third_order(delta):
    # the wall is the ray phi = phi_w of the source flow (a wedge or a cone), a streamline
    phiw = 0.35
    curve = lambda x: (x * np.tan(phiw), np.full_like(x, np.tan(phiw)))  # noqa: E731
    e_dir, e_inv = [], []
    for h in (0.08, 0.04, 0.02, 0.01):
        a = polar(2.0, phiw - h, delta)
        p = inverse_wall_point(a, curve, G, delta)
        th, nu = exact(p.x, p.y, delta)
        e_inv.append(abs(p.nu - nu)[0] + abs(p.y - p.x * np.tan(phiw))[0])
        w = polar(2.0 - 0.5 * h, phiw, delta)  # previous wall point, on the wall
        q = wall_point(a, w, np.full(1, phiw), G, delta)
        th, nu = exact(q.x, q.y, delta)
        e_dir.append(abs(q.nu - nu)[0] + abs(np.arctan2(q.y, q.x) - phiw)[0])
    assert np.all(order(e_inv) > 2.7), e_inv
    assert np.all(order(e_dir) > 2.7), e_dir


@pytest.mark.parametrize("delta", [0, 1])
def test_marched_net_with_axis_and_wall_is_second_order(delta):
    # initial-value line: the arc r = 1.2 from the axis to the wall phi = 0.4; the net
    # uses interior, axis and inverse wall points and runs to x = 3.
    phiw, r0 = 0.4, 1.2
    curve = lambda x: (x * np.tan(phiw), np.full_like(x, np.tan(phiw)))  # noqa: E731
    errs = []
    for k in (10, 20, 40):
        ph = np.linspace(0.0, phiw, k + 1)
        grid = march_from_line(polar(r0, ph, delta), G, delta, wall=curve, x_end=3.0)
        v = grid.valid
        th, nu = exact(grid.x[v], grid.y[v], delta)
        errs.append(max(np.max(np.abs(grid.nu[v] - nu)), np.max(np.abs(grid.theta[v] - th))))
        assert grid.x[v].max() >= 3.0
    assert np.all(order(errs) > 1.85), errs


def test_axisymmetric_net_without_wall_is_second_order():
    # domain of dependence of an arc, with axis points only (no wall)
    errs = []
    for k in (10, 20, 40, 80):
        ph = np.linspace(0.0, 0.25, k + 1)
        grid = march_from_line(polar(2.0, ph, 1), G, 1)
        v = grid.valid
        th, nu = exact(grid.x[v], grid.y[v], 1)
        errs.append(np.max(np.abs(grid.nu[v] - nu)))
    assert np.all(order(errs) > 1.9), errs


def _characteristic(p0, sign, length, steps, delta):
    """Exact characteristic of the source flow through p0 (RK4 in arc length):
    sign = +1 follows the C+ downstream, -1 follows the C- upstream."""
    def direction(x, y):
        th, nu = exact(np.array([x]), np.array([y]), delta)
        mu = mu_of_nu(nu, G)[0]
        ang = th[0] + mu if sign > 0 else th[0] - mu + np.pi
        return np.array([np.cos(ang), np.sin(ang)])
    out = [np.array(p0, dtype=float)]
    sub = 8
    ds = length / steps / sub
    z = out[0].copy()
    for _ in range(steps):
        for _ in range(sub):
            k1 = direction(*z)
            k2 = direction(*(z + 0.5 * ds * k1))
            k3 = direction(*(z + 0.5 * ds * k2))
            k4 = direction(*(z + ds * k3))
            z = z + ds / 6.0 * (k1 + 2 * k2 + 2 * k3 + k4)
        out.append(z.copy())
    return np.array(out)


@pytest.mark.parametrize("delta", [0, 1])
def test_goursat_solution_is_second_order(delta):
    # data on the exact C- (upstream) and C+ (downstream) through a junction point
    j = (2.0 * np.cos(0.1), 2.0 * np.sin(0.1))
    errs = []
    for steps in (6, 12, 24):
        cm = _characteristic(j, -1, 0.6, steps, delta)[::-1]  # far end first, junction last
        cp = _characteristic(j, +1, 0.6, steps, delta)
        grid = goursat(pts(cm[:, 0], cm[:, 1], delta), pts(cp[:, 0], cp[:, 1], delta), G, delta)
        v = grid.valid
        th, nu = exact(grid.x[v], grid.y[v], delta)
        errs.append(max(np.max(np.abs(grid.nu[v] - nu)), np.max(np.abs(grid.theta[v] - th))))
        assert grid.size == (steps + 1) ** 2
    assert np.all(order(errs) > 1.85), errs


def test_planar_riemann_invariants_exact_in_fan_kernel():
    # Source: Anderson, Modern Compressible Flow, method of characteristics for planar
    # irrotational flow (from memory): theta + nu is constant on C-, theta - nu on C+,
    # so in the kernel theta(i, j) = th_j - th_i and nu(i, j) = th_j + th_i exactly.
    th = np.linspace(0.01, 0.3, 9)
    grid, ax, axn = march_fan(0.0, 1.0, th, th, G, 0)
    i, j = np.nonzero(grid.valid)
    assert np.allclose(grid.theta[i, j], th[j] - th[i], atol=1e-12)
    assert np.allclose(grid.nu[i, j], th[j] + th[i], atol=1e-12)
    assert np.allclose(axn, 2 * th, atol=1e-12)


def test_axis_point_local_error_is_second_order():
    # the axis limit sin(theta)/y -> d theta/dy is taken from the upstream point, so one
    # axis step has an O(h^2) error (first order in that term); the marched nets above
    # nevertheless converge at second order.
    errs = []
    for phi in (0.04, 0.02, 0.01, 0.005):
        p = axis_point(polar(1.5, phi, 1), G, 1)
        assert p.y[0] == 0.0 and p.theta[0] == 0.0
        th, nu = exact(p.x, p.y, 1)
        errs.append(abs(p.nu[0] - nu[0]))
    assert np.all(order(errs) > 1.9), errs
    # planar: no source term, the axis point is exact to the iteration tolerance
    p = axis_point(polar(1.5, 0.04, 0), G, 0)
    th, nu = exact(p.x, p.y, 0)
    assert abs(p.nu[0] - nu[0]) < 2e-5


def test_fast_inverse_prandtl_meyer_matches_reference():
    # Source: NACA Report 1135 inverse Prandtl-Meyer values (VALIDATION.md):
    # nu = 10, 20, 30, 40 deg -> M = 1.43497, 1.77498, 2.13391, 2.53782.
    nu = np.radians([10.0, 20.0, 30.0, 40.0])
    m = 1.0 / np.sin(mu_of_nu(nu, G))
    assert np.allclose(m, [1.43497, 1.77498, 2.13391, 2.53782], atol=6e-6)
    many = np.linspace(1e-8, 2.2, 500)
    ref = mach_angle(mach_from_prandtl_meyer(many, G))
    assert np.allclose(mu_of_nu(many, G), ref, atol=1e-12)
    assert np.allclose(mu_of_nu(many, G, mu0=ref * (1 + 1e-3)), ref, atol=1e-12)


def test_bad_net_input():
    with pytest.raises(InputError):
        points([0.0], [-0.1], [0.0], [1.5])
    with pytest.raises(InputError):
        points([0.0], [0.1], [0.0], [0.5])
    line = polar(2.0, np.linspace(0.05, 0.2, 5), 1)  # does not start on the axis
    with pytest.raises(InputError, match="axis"):
        march_from_line(line, G, 1)
    a = polar(2.0, np.linspace(0.2, 0.0, 4), 0)
    b = polar(2.5, np.linspace(0.0, 0.2, 4), 0)
    with pytest.raises(InputError, match="meet"):
        goursat(a, b, G, 0)
    assert isinstance(a, Points)
    line = polar(2.0, np.linspace(0.0, 0.2, 5), 1)
    with pytest.raises(InputError, match="x_end"):
        march_from_line(line, G, 1, wall=lambda x: (x * 0.2, np.full_like(x, 0.2)))
    with pytest.raises(InputError, match="two points"):
        goursat(a.take(slice(0, 1)), b.take(slice(0, 1)), G, 0)

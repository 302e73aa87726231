"""Contour representations and the subsonic inlet (moc.geometry)."""

import math

import numpy as np
import pytest

from moc.errors import InputError
from moc.geometry import bell_nozzle, conical_nozzle, subsonic_inlet, wall_spline


def _joins_smooth(c, tol=1e-9):
    for b in c.breaks[1:-1]:
        for f in (c.y, c.dydx):
            assert abs(f(np.array([b - 1e-12]))[0] - f(np.array([b + 1e-12]))[0]) < tol


@pytest.mark.parametrize("geometry", ["planar", "axisymmetric"])
def test_inlet_face_throat_and_tangency(geometry):
    # Exact geometry: the face height gives the contraction ratio (A ~ y^(1+d)), the wall
    # ends at the throat (0, 1) with zero slope and the throat's radius of curvature
    # (common practice: tangent, curvature-matched join to the divergent arc).
    cr, rt = 6.0, 2.0
    inl = subsonic_inlet(cr, entrance_radius=1.5, throat_radius=rt, cone_angle_deg=30, geometry=geometry)
    d = 1 if geometry == "axisymmetric" else 0
    x, y = inl["x"], inl["y"]
    assert x[-1] == 0.0 and y[-1] == pytest.approx(1.0, abs=1e-14)
    assert y[0] ** (1 + d) == pytest.approx(cr, rel=1e-12)
    assert inl["theta"][0] == pytest.approx(0.0, abs=1e-12) and inl["theta"][-1] == pytest.approx(0.0, abs=1e-12)
    assert inl["curvature"][-1] == pytest.approx(1.0 / rt, rel=1e-12)
    assert np.all(np.diff(x) > 0) and np.all(np.diff(y) <= 1e-15)
    assert np.min(inl["theta"]) == pytest.approx(-math.radians(30), abs=1e-9)


def test_inlet_impossible_and_bad_inputs():
    with pytest.raises(InputError, match="contraction ratio of at least"):
        subsonic_inlet(1.2, entrance_radius=3.0, throat_radius=3.0, cone_angle_deg=45)
    with pytest.raises(InputError, match="above 1"):
        subsonic_inlet(0.8)
    with pytest.raises(InputError, match="0 < angle <= 89"):
        subsonic_inlet(4.0, cone_angle_deg=95)


@pytest.mark.parametrize("alpha,R,eps", [(15.0, 1.5, 10.0), (12.0, 0.5, 4.0)])
def test_conical_nozzle_length(alpha, R, eps):
    # Source: Sutton and Biblarz, Rocket Propulsion Elements, nozzle chapter (from memory):
    # L = (r_e - r_t + R (sec a - 1)) / tan a for a throat arc of radius R tangent to the cone.
    c = conical_nozzle(alpha, area_ratio=eps, throat_curvature=R)
    a = math.radians(alpha)
    ye = math.sqrt(eps)
    assert c.x1 == pytest.approx((ye - 1 + R * (1 / math.cos(a) - 1)) / math.tan(a), rel=1e-12)
    assert c.y(np.array([c.x1]))[0] == pytest.approx(ye, rel=1e-12)
    assert c.d2ydx2(np.array([0.0]))[0] == pytest.approx(1 / R, rel=1e-12)
    _joins_smooth(c)
    y, s = c(np.array([c.x1 - 0.1]))
    assert s[0] == pytest.approx(math.tan(a), rel=1e-12)


def test_bell_nozzle_angles_and_exit():
    # Construction of Rao's parabolic approximation (from memory): tangent to the throat
    # arc at the start angle, exit angle and exit radius as given; the Bezier segment is a
    # parabola, so its second difference at equal parameter steps is constant (exact).
    c = bell_nozzle(area_ratio=9.0, length=7.0, start_angle_deg=30, exit_angle_deg=8)
    xn = c.breaks[1]
    assert math.degrees(math.atan(c.dydx(np.array([xn + 1e-13]))[0])) == pytest.approx(30, abs=1e-9)
    assert math.degrees(math.atan(c.dydx(np.array([7.0]))[0])) == pytest.approx(8, abs=1e-9)
    assert c.y(np.array([7.0]))[0] == pytest.approx(3.0, rel=1e-12)
    _joins_smooth(c)
    par = c.segments[1]
    t = np.linspace(0, 1, 9)
    px, py = par._xy(t, 0)
    assert np.allclose(np.diff(px, 2), np.diff(px, 2)[0]) and np.allclose(np.diff(py, 2), np.diff(py, 2)[0])
    # y(x) evaluation inverts x(t): compare with the parametric points
    assert np.allclose(c.y(px), py, atol=1e-12)
    # curvature from the analytic d2y/dx2 against central differences
    xm = np.linspace(xn + 0.5, 6.5, 5)
    h = 1e-4
    fd = (c.y(xm + h) - 2 * c.y(xm) + c.y(xm - h)) / h**2
    assert np.allclose(c.d2ydx2(xm), fd, rtol=1e-5, atol=1e-7)
    with pytest.raises(InputError, match="no parabola joins"):
        bell_nozzle(area_ratio=9.0, length=1.5, start_angle_deg=30, exit_angle_deg=8)


def test_wall_spline_reproduces_cubic():
    # Exact invariant: a not-a-knot cubic spline reproduces a cubic polynomial exactly
    # (de Boor, A Practical Guide to Splines; common practice).
    x = np.linspace(0, 4, 9)
    f = lambda x: 1 + 0.2 * x - 0.03 * x**2 + 0.004 * x**3  # noqa: E731
    c = wall_spline(x, f(x))
    xx = np.linspace(0, 4, 57)
    assert np.allclose(c.y(xx), f(xx), atol=1e-13)
    assert np.allclose(c.dydx(xx), 0.2 - 0.06 * xx + 0.012 * xx**2, atol=1e-12)
    assert np.allclose(c.d2ydx2(xx), -0.06 + 0.024 * xx, atol=1e-11)
    with pytest.raises(InputError, match="strictly increasing x; point 3"):
        wall_spline([0, 1, 2, 2, 3], [1, 1, 1, 1, 1])

"""Initial C- characteristic across a rounded throat, from the transonic field of moc.throat.

The net marcher starts from a C- characteristic.  Across a rounded throat of
downstream radius of curvature R the flow near the throat is given by a
published small-parameter solution (Sauer, or Hall to third order: see
moc.throat); the C- characteristic dy/dx = tan(theta - mu) is integrated
through that field (classical fourth-order Runge-Kutta in y) from a wall
point on the throat arc down to the axis (traced from the axis upstream).
"""

from __future__ import annotations

import math

import numpy as np

from moc import throat
from moc.errors import ComputationError
from moc.net import rotational as rp


def initial_cminus(R, gamma, geometry, n, solution="hall", x_axis=None):
    """C- characteristic through the axis point x_axis (default 1.25 times the sonic-point shift), traced
    upstream to the throat arc; returned wall first, n + 1 points evenly spaced in y."""
    shift = throat.sonic_shift(R, gamma, geometry, solution)
    xa = 1.25 * shift if x_axis is None else float(x_axis)

    def slope(x, y):
        th, m = throat.state(np.array([x]), np.array([y]), R, gamma, geometry, solution)
        th, m = float(th[0]), float(m[0])
        if not m > 1.0:
            raise ComputationError(
                f"the transonic field is subsonic at x = {x:.4g}, y = {y:.4g}; start the initial characteristic further downstream.")
        return 1.0 / math.tan(th - math.asin(1.0 / m))  # dx/dy

    def wall_gap(x, y):
        return y - float(throat.throat_wall(np.array([x]), R)[0][0])

    h = 1.0 / (8 * n)
    xs, ys = [xa], [0.0]
    while wall_gap(xs[-1], ys[-1]) < 0:
        x, y = xs[-1], ys[-1]
        k1 = slope(x, y)
        k2 = slope(x + 0.5 * h * k1, y + 0.5 * h)
        k3 = slope(x + 0.5 * h * k2, y + 0.5 * h)
        k4 = slope(x + h * k3, y + h)
        xs.append(x + h * (k1 + 2 * k2 + 2 * k3 + k4) / 6.0)
        ys.append(y + h)
        if len(ys) > 100 * n:
            raise ComputationError("the initial characteristic does not reach the throat wall.")
    # the wall crossing inside the last step (linear in the gap)
    g0, g1 = wall_gap(xs[-2], ys[-2]), wall_gap(xs[-1], ys[-1])
    u = g0 / (g0 - g1)
    xw, yw = xs[-2] + u * (xs[-1] - xs[-2]), ys[-2] + u * (ys[-1] - ys[-2])
    xs[-1], ys[-1] = xw, yw
    yq = np.linspace(yw, 0.0, n + 1)
    xq = np.interp(yq, np.array(ys), np.array(xs))
    th, m = throat.state(xq, yq, R, gamma, geometry, solution)
    th = np.asarray(th, float).copy()
    th[-1] = 0.0
    m = np.asarray(m, float)
    if np.any(m <= 1.0):
        raise ComputationError("the initial characteristic is not supersonic everywhere; move it downstream.")
    return dict(x=xq, y=yq, theta=th, nu=rp.prandtl_meyer_safe(m, gamma), mach=m, lnp0=np.zeros_like(xq))


def line_flux(line, gamma, delta):
    """Mass flow (over the sonic throat flow rho* a* A*) and axial momentum plus pressure (over p0 A*) across a line."""
    g = gamma
    x, y, th, m = (np.asarray(line[k], float) for k in ("x", "y", "theta", "mach"))
    o = np.argsort(y)
    x, y, th, m = x[o], y[o], th[o], m[o]
    p0 = np.exp(np.asarray(line["lnp0"], float)[o])
    tf = 1.0 + 0.5 * (g - 1.0) * m * m
    p = p0 * tf ** (-g / (g - 1.0))
    rv = p0 * tf ** (-1.0 / (g - 1.0)) * m * tf ** -0.5
    w = 2.0 * y if delta else np.ones_like(y)
    dx, dy = np.diff(x), np.diff(y)

    def mid(f):
        return 0.5 * (f[1:] + f[:-1])

    mass = np.sum(mid(rv * w * np.cos(th)) * dy - mid(rv * w * np.sin(th)) * dx)
    mom = np.sum(mid(p * w * (1 + g * m * m * np.cos(th) ** 2)) * dy - mid(p * w * g * m * m * np.cos(th) * np.sin(th)) * dx)
    star = (2.0 / (g + 1.0)) ** ((g + 1.0) / (2.0 * (g - 1.0)))
    return float(mass / star), float(mom)

"""Initial C- characteristic across a rounded throat, from the transonic field of moc.throat.

The net marcher starts from a C- characteristic.  Across a rounded throat of
downstream radius of curvature R the flow near the throat is given by a
published small-parameter solution (Sauer, or Hall to third order: see
moc.throat); the C- characteristic dy/dx = tan(theta - mu) is integrated
through that field (classical fourth-order Runge-Kutta in y) from a wall
point on the throat arc down to the axis (traced from the axis upstream).
"""

from __future__ import annotations

import numpy as np

from moc import throat
from moc.errors import ComputationError
from moc.net import rotational as rp


def initial_cminus(R, gamma, geometry, n, solution="hall", x_axis=None):
    """C- characteristic through the axis point x_axis (default 1.25 times the sonic-point shift), traced
    upstream to the throat arc by moc.throat.initial_cminus; returned wall first, n + 1 points evenly
    spaced in y, with the Prandtl-Meyer angle and the (zero) log total-pressure ratio the march carries."""
    line = throat.initial_cminus(R, gamma, geometry, solution=solution, n=n, x_axis=x_axis)
    th = np.asarray(line["theta"], float)  # 0 on the axis
    m = np.asarray(line["mach"], float)
    if np.any(m <= 1.0):
        raise ComputationError("the initial characteristic is not supersonic everywhere; move it downstream.")
    x = np.asarray(line["x"], float)
    return dict(x=x, y=np.asarray(line["y"], float), theta=th, nu=rp.prandtl_meyer_safe(m, gamma), mach=m,
                lnp0=np.zeros_like(x))


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

"""Regular reflection of a fitted shock at the axis or the wall, tracked as a new shock.

A shock of the C+ family in (x, y) is a shock of the C- family in the mirror
image (x, -y, -theta): the compatibility relations are unchanged (the source
term sin(theta)/y is even in the pair), so the reflected shock is fitted by
the same marcher in mirrored coordinates, with the axis as its "wall" and the
mirrored wall as the boundary it runs toward.  At the reflection point the
flow behind the incident shock is turned back parallel to the boundary by a
weak oblique shock (NACA Report 1135); where that turning exceeds theta_max no
regular reflection exists and the march stops (a Mach reflection would form).
The flow ahead of the reflected shock is the region behind the incident one.
"""

from __future__ import annotations

import math

import numpy as np

from moc.analysis.shockfit import UpstreamField, fit_shock
from moc.flow import oblique_shock
from moc.net import rotational as rp

KEYS = rp.KEYS


class _Mirror:
    """Wall y = -w(x), angle -w'(x): the wall seen in the mirrored frame."""

    def __init__(self, wall):
        self.w = wall

    def y_of(self, x):
        return -self.w.y_of(x)

    def angle(self, x):
        return -self.w.angle(x)


class _Axis:
    """The axis y = 0 as a wall (mirrored frame)."""

    def y_of(self, x):
        return np.zeros(np.shape(x))

    def angle(self, x):
        return np.zeros(np.shape(x))


def flip(d):
    """Mirror a point dict (x, y, theta, ...) across the axis."""
    out = dict(d)
    out["y"] = -np.asarray(d["y"], float)
    out["theta"] = -np.asarray(d["theta"], float)
    return out


def region_triangle_index(fronts, origin):
    """Triangles ((front, point) x 3) covering the region swept by consecutive fronts behind a shock."""
    tri = []
    for k in range(1, len(fronts)):
        A, N, o = fronts[k - 1], fronts[k], origin[k - 1]
        nA, nN = A["x"].size, N["x"].size
        inner = [i for i in range(1, nN - 1) if o[i] >= 0]
        first = o[inner[0]] if inner else nA - 1
        # shock side: fan from the new shock point over the absorbed part of the previous front
        for j in range(0, first):
            tri.append(((k, 0), (k - 1, j), (k - 1, j + 1)))
        tri.append(((k, 0), (k - 1, first), (k, inner[0] if inner else nN - 1)))
        for a, b in zip(inner[:-1], inner[1:]):
            ma, mb = o[a], o[b]
            for j in range(ma, mb):
                tri.append(((k, a), (k - 1, j), (k - 1, j + 1)))
            tri.append(((k, a), (k - 1, mb), (k, b)))
        if inner:
            last = inner[-1]
            for j in range(o[last], nA - 1):
                tri.append(((k, last), (k - 1, j), (k - 1, j + 1)))
            tri.append(((k, last), (k - 1, nA - 1), (k, nN - 1)))
    return tri


def region_triangles(fronts, origin):
    """Triangles (dict of (3, n) arrays of point values) covering the region swept by the fronts."""
    tri = region_triangle_index(fronts, origin)
    if not tri:
        return None
    return {q: np.array([[fronts[t[i][0]][q][t[i][1]] for t in tri] for i in range(3)]) for q in KEYS}


def reflect(fit, frame, wall, gamma, delta, step, x_end):
    """Fit the shock reflected where `fit` met its boundary; returns (new fit, new frame) or (None, reason)."""
    if fit.fate != "axis" or fit.reflection is None or not fit.reflection.get("regular") or fit.shock["x"].size < 1:
        return None, "no regular reflection to track"
    sh = fit.shock
    tris = region_triangles(fit.fronts, fit.origin)
    if tris is None:
        return None, "the region behind the shock is too small to carry a reflection"
    tris = flip(tris)
    up = UpstreamField(vertices=tris, gamma=gamma, near=3.0 * step)
    xh, yh = fit.end
    m1 = float(sh["m2"][-1])
    th1 = -(float(sh["theta1"][-1]) - float(sh["deflection"][-1]))  # flow behind the incident shock, mirrored
    ln1 = float(sh["lnp01"][-1]) + math.log(float(sh["p02_p01"][-1]))
    if frame == +1:  # the incident shock met the axis: the axis becomes the wall of the mirrored frame
        new_wall, lower, lower_angle = _Axis(), (lambda x: -float(wall.y_of(x))), (lambda x: -float(wall.angle(x)))
    else:  # it met the wall (seen from the mirrored frame): back to the real frame
        new_wall, lower, lower_angle = wall, None, None
    th_w = float(new_wall.angle(np.array(xh)))
    dfl = th1 - th_w
    if dfl <= 0:
        return None, "the flow behind the shock already turns away from the boundary: it reflects as expansion waves (not tracked)"
    s = oblique_shock(m1, dfl, gamma)
    b = float(s.beta)
    yh_new = -yh
    corner = dict(x=xh, y=yh_new, theta=th_w, nu=float(rp.prandtl_meyer_safe(float(s.m2), gamma)),
                  mach=float(s.m2), lnp0=ln1 + math.log(float(s.p02_p01)))
    start = dict(x=xh, y=yh_new, phi=th1 - b, beta=b, theta1=th1, m1=m1, m2=float(s.m2), p2_p1=float(s.p2_p1),
                 p02_p01=float(s.p02_p01), lnp01=ln1, deflection=dfl, label0=3_000_000 + 100_000 * (frame + 2))
    front0 = {k: np.array([corner[k]]) for k in KEYS}
    new = fit_shock(up, new_wall, start, front0, gamma, delta, step, x_end, lower=lower, lower_angle=lower_angle,
                    lower_name="wall" if frame == +1 else "axis", frame=-frame)
    return new, -frame

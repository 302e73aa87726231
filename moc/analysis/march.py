"""March a characteristic net between a known wall and the axis (shock-free part).

Points are labelled (a, d): a numbers the C- characteristics (each leaves the
wall), d = a - b counts from the axis (d = 0) to the wall (d = W), b numbering
the C+ characteristics.  Point (a, d) is the meeting of the C- through
(a, d+1) and the C+ through (a-1, d-1), so all points with the same
s = 2a - d (one zig-zag front) are computed together as arrays.  The start is
an initial C- characteristic (row a = 0) and, at a sharp corner, a centred
fan of wall points at the corner (each with the Prandtl-Meyer relation
nu - theta = const along the zero-length C+ into the corner: Anderson, Modern
Compressible Flow, method-of-characteristics chapter, from memory).

The net is continued through any fold (crossing of same-family
characteristics) without stopping; `moc.analysis.coalescence` finds the
fold, and `moc.analysis.shockfit` replaces the folded part by a fitted shock.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from moc.errors import ComputationError, InputError
from moc.flow import mach_angle, prandtl_meyer
from moc.net import rotational as rp

KEYS = rp.KEYS


@dataclass
class ZigzagNet:
    """Region of the net marched between wall and axis; arrays of shape (rows a, W + 1)."""

    W: int
    gamma: float
    delta: int
    data: dict
    rows: int
    n_fan: int
    start: dict = field(default_factory=dict)
    notes: list = field(default_factory=list)

    def point(self, a, d):
        return {k: self.data[k][a, d] for k in KEYS}

    def front(self, a, d):
        return {k: self.data[k][a, d] for k in KEYS}

    @property
    def valid(self):
        return np.isfinite(self.data["mach"][: self.rows])

    def arr(self, k):
        return self.data[k][: self.rows]


def fan_angles(theta0, theta1, n, p=4):
    """Fan angles from theta0 to theta1, clustered toward theta0 (h(t) = p t^p - (p-1) t^(p+1), NUMERICS note)."""
    t = np.arange(1, n + 1) / n
    h = p * t**p - (p - 1) * t ** (p + 1)
    return theta0 + (theta1 - theta0) * h


def uniform_line(x0, y0, mach, gamma, W):
    """Initial C- characteristic of a uniform parallel flow from the wall point (x0, y0) to the axis."""
    mu = float(mach_angle(mach))
    nu = float(prandtl_meyer(mach, gamma))
    # d = W at the wall, d = 0 on the axis
    frac = np.arange(W + 1) / W
    y = y0 * frac
    x = x0 + (y0 - y) / math.tan(mu)
    return dict(x=x, y=y, theta=np.zeros(W + 1), nu=np.full(W + 1, nu), mach=np.full(W + 1, float(mach)),
                lnp0=np.zeros(W + 1))


def march(wall, gamma=1.4, geometry="planar", n=40, start="corner", mach_in=None, n_fan=None,
          initial=None, max_rows=20000, nu0=None):
    """March the net along `wall` from its start to its end (plus one C- past the end).

    start: "corner" (sonic flow, sharp throat corner at the wall start, fan to
    the wall's initial angle), "uniform" (uniform flow at `mach_in` meeting
    the wall start; a positive wall angle there makes an expansion fan, a
    negative one a compression corner left to the shock fitter), or "line"
    (an initial C- line given as `initial`, dict of arrays from wall to axis).
    """
    delta = 1 if geometry == "axisymmetric" else 0
    if start == "line":
        init = {k: np.asarray(initial[k], float)[::-1] for k in KEYS}  # store axis -> wall
        W = init["x"].size - 1
    else:
        W = int(n)
        if W < 4:
            raise InputError(f"the number of characteristics must be at least 4, got {n}.")
        if start == "corner":
            if nu0 is None:
                nu0 = 1e-6
            m0 = float(rp.mach_of_nu(np.array([nu0]), gamma)[0])
            init = uniform_line(wall.x_start, wall.y_start, m0, gamma, W)
        elif start == "uniform":
            init = uniform_line(wall.x_start, wall.y_start, mach_in, gamma, W)
        else:
            raise InputError(f"start must be 'corner', 'uniform' or 'line', got {start!r}.")
    th_w0 = wall.angle_start
    th_f0 = float(init["theta"][-1])
    fan = np.array([])
    if start != "line" and th_w0 > th_f0 + 1e-12:
        # axisymmetric: half as many fan lines as points across, so that the C+ characteristics from the
        # lower half of the initial line reach the wall just after the corner, where an axisymmetric wall
        # may still be turning (measured on a minimum-length design, Me = 2.4, n = 80: exit mass flow
        # 0.15 % high with as many fan lines as points, 0.04 % with half).  Planar: as many.
        nf = n_fan if n_fan is not None else (max(4, W // 2) if delta else W)
        fan = fan_angles(th_f0, th_w0, nf)
    nf = fan.size
    cap = 256
    data = {k: np.full((cap, W + 1), np.nan) for k in KEYS}
    for k in KEYS:
        data[k][0] = init[k]
    nu_c = float(init["nu"][-1] - init["theta"][-1])  # nu - theta on the C+ into the corner
    a_max = None
    rows = 1
    s = 2 - W
    notes = []
    while True:
        d = np.arange(W + 1)
        d = d[(d % 2) == (s % 2)]
        a = (s + d) // 2
        keep = (a >= 1)
        if a_max is not None:
            keep &= a <= a_max
        d, a = d[keep], a[keep]
        if d.size == 0:
            break
        top = int(a.max())
        if top >= cap:
            if top >= max_rows:
                notes.append(f"the march stopped after {max_rows} C- characteristics before the wall end.")
                a_max = top - 1
                s += 1
                continue
            for k in KEYS:
                data[k] = np.vstack([data[k], np.full((cap, W + 1), np.nan)])
            cap *= 2
        rows = max(rows, top + 1)
        mid = (d > 0) & (d < W)
        if np.any(mid):
            am, dm = a[mid], d[mid]
            A = {k: data[k][am - 1, dm - 1] for k in KEYS}
            B = {k: data[k][am, dm + 1] for k in KEYS}
            P = rp.interior(A, B, gamma, delta)
            for k in KEYS:
                data[k][am, dm] = P[k]
        if np.any(d == W):
            aw = int(a[d == W][0])
            if aw <= nf:
                th = fan[aw - 1]
                P = dict(x=wall.x_start, y=wall.y_start, theta=th, nu=nu_c + th,
                         mach=float(rp.mach_of_nu(np.array([nu_c + th]), gamma)[0]), lnp0=data["lnp0"][aw - 1, W])
            else:
                A = {k: data[k][aw - 1, W - 1] for k in KEYS}
                P = rp.wall_point(A, wall, gamma, delta, lnp0_wall=data["lnp0"][aw - 1, W])
                P = {k: float(np.asarray(v)) for k, v in P.items()}
                if not np.isfinite(P["mach"]) or not P["x"] > data["x"][aw - 1, W] - 1e-12:
                    notes.append(f"the wall point after x = {data['x'][aw - 1, W]:.6g} could not be found "
                                 "(the flow there is folded or subsonic); the shock-free march stops there.")
                    for k in KEYS:
                        P[k] = np.nan
                    a_max = aw - 1
            for k in KEYS:
                data[k][aw, W] = P[k]
            if a_max is None and np.isfinite(P["x"]) and P["x"] > wall.x_end:
                a_max = aw
        if np.any(d == 0):
            aa = int(a[d == 0][0])
            B = {k: data[k][aa, 1] for k in KEYS}
            P = rp.axis_point(B, gamma, delta, lnp0_axis=data["lnp0"][aa - 1, 0])
            for k in KEYS:
                data[k][aa, 0] = np.asarray(P[k])
        s += 1
    net = ZigzagNet(W=W, gamma=gamma, delta=delta, data=data, rows=rows, n_fan=nf, notes=notes,
                    start=dict(kind=start, fan=fan, wall_angle=th_w0, flow_angle=th_f0))
    if rows < 2:
        raise ComputationError("the characteristic net could not leave its initial line.")
    return net


def cells(net):
    """Quadrilateral cells (a, d) with corners (a,d), (a+1,d+1), (a+1,d), (a,d-1) for 1 <= d <= W-1.

    Returns (ia, id) index arrays of the first corner, and the corner
    coordinate arrays (4, ncell) for x and y.
    """
    R, W = net.rows, net.W
    aa, dd = np.meshgrid(np.arange(R - 1), np.arange(1, W), indexing="ij")
    aa, dd = aa.ravel(), dd.ravel()
    X, Y = net.data["x"], net.data["y"]
    corners = [(aa, dd), (aa + 1, dd + 1), (aa + 1, dd), (aa, dd - 1)]
    cx = np.array([X[i, j] for i, j in corners])
    cy = np.array([Y[i, j] for i, j in corners])
    return aa, dd, cx, cy


def signed_area(cx, cy):
    """Shoelace signed area of polygons given corner arrays (k, n)."""
    return 0.5 * np.sum(cx * np.roll(cy, -1, axis=0) - np.roll(cx, -1, axis=0) * cy, axis=0)

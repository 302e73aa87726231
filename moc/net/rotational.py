"""Unit processes of the characteristic net for rotational (non-homentropic) flow.

Steady, inviscid, adiabatic flow of a perfect gas with uniform total
temperature, planar (delta = 0) or axisymmetric (delta = 1).  Per unit arc
length s along each characteristic (Zucrow and Hoffman, Gas Dynamics vol. 2,
1977, ch. 16, compatibility relations in p and theta, rewritten with
p = p0 f(M); from memory):

    C+ : d(nu - theta) = delta sin(mu) sin(theta) / y ds + K d(ln p0)
    C- : d(nu + theta) = delta sin(mu) sin(theta) / y ds + K d(ln p0)
    K  = sqrt(M^2 - 1) / (gamma M^2)

and total pressure p0 is constant along streamlines.  With p0 uniform these
are the homentropic relations.  The coefficients are averaged over each
segment and the step iterated (modified Euler predictor-corrector), so the
scheme is second order.  Every function works on whole numpy arrays (one
front of the net at a time); points that cannot be computed (subsonic,
parallel characteristics) come back as NaN.  A negative step (a parent
beyond the point: the net has folded) is kept, so the fold shows as a cell
of reversed orientation.

A point is a dict of arrays: x, y, theta, nu, mach, lnp0 (natural log of the
local total pressure over the chamber value).
"""

from __future__ import annotations

import math

import numpy as np

from moc.flow import mach_from_prandtl_meyer, nu_max

TOL = 1e-11
MAX_ITER = 12

KEYS = ("x", "y", "theta", "nu", "mach", "lnp0")


def mach_of_nu(nu, gamma):
    """Inverse Prandtl-Meyer function that returns NaN (not an error) outside 0 <= nu < nu_max."""
    nu = np.asarray(nu, dtype=float)
    out = np.full(nu.shape, np.nan)
    ok = np.isfinite(nu) & (nu >= 0.0) & (nu < nu_max(gamma))
    if np.any(ok):
        out[ok] = mach_from_prandtl_meyer(nu[ok], gamma)
    return out


def mach_of_nu_near(nu, mach_guess, gamma, iters=4):
    """Inverse Prandtl-Meyer by Newton steps on nu^(1/3) in b = sqrt(M^2 - 1), from a nearby guess.

    Used inside the corrector loop, where the previous iterate is close; falls
    back to the full inverse where the steps fail.  NaN outside 0 <= nu < nu_max.
    """
    nu = np.asarray(nu, dtype=float)
    k = math.sqrt((gamma + 1.0) / (gamma - 1.0))
    with np.errstate(invalid="ignore", divide="ignore"):
        b = np.sqrt(np.maximum(np.asarray(mach_guess, float) ** 2 - 1.0, 1e-12))
        b = np.where(np.isfinite(b), b, 1.0)
        target = np.cbrt(nu)
        for _ in range(iters):
            v = k * np.arctan(b / k) - np.arctan(b)
            dv = b * b * (1.0 - 1.0 / (k * k)) / ((1.0 + b * b / (k * k)) * (1.0 + b * b))
            cv = np.cbrt(v)
            f = cv - target
            df = dv / (3.0 * cv * cv)
            bn = b - f / df
            b = np.where(np.isfinite(bn) & (bn > 0), bn, 0.5 * b)
        m = np.sqrt(1.0 + b * b)
        v = k * np.arctan(b / k) - np.arctan(b)
    ok = np.isfinite(nu) & (nu >= 0.0) & (nu < nu_max(gamma))
    poor = ok & ~(np.abs(v - nu) <= 1e-13 * np.maximum(1.0, np.abs(nu)))
    if np.any(poor):
        m = np.where(poor, mach_of_nu(np.where(poor, nu, 0.5), gamma), m)
    return np.where(ok, m, np.nan)


def prandtl_meyer_safe(mach, gamma):
    """nu(M) (NACA Report 1135 closed form) with NaN, not an error, for M < 1."""
    m = np.asarray(mach, dtype=float)
    k = np.sqrt((gamma + 1.0) / (gamma - 1.0))
    with np.errstate(invalid="ignore"):
        b = np.sqrt(m * m - 1.0)
    return k * np.arctan(b / k) - np.arctan(b)


def k_coef(mach, gamma):
    """K = sqrt(M^2 - 1) / (gamma M^2), the factor of d(ln p0) in the compatibility relations."""
    m = np.asarray(mach, dtype=float)
    return np.sqrt(np.maximum(m * m - 1.0, 0.0)) / (gamma * m * m)


def _mu(mach):
    with np.errstate(invalid="ignore"):
        return np.arcsin(1.0 / mach)


def source(theta, mu, y, delta):
    """delta sin(mu) sin(theta) / y, 0 where y is 0 (the caller averages); even in (y, theta) -> (-y, -theta)."""
    if delta == 0:
        return np.zeros(np.broadcast(theta, mu, y).shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.sin(mu) * np.sin(theta) / y
    return np.where(y != 0, s, 0.0)


def _intersect(xa, ya, aa, xb, yb, ab):
    """Arc lengths (sa, sb) with A + sa e(aa) = B + sb e(ab); NaN where parallel."""
    ca, sa_ = np.cos(aa), np.sin(aa)
    cb, sb_ = np.cos(ab), np.sin(ab)
    det = ca * (-sb_) - (-cb) * sa_
    dx, dy = xb - xa, yb - ya
    with np.errstate(divide="ignore", invalid="ignore"):
        s1 = (dx * (-sb_) - (-cb) * dy) / det
        s2 = (ca * dy - sa_ * dx) / det
    return s1, s2


def streamline_p0(xp, yp, thp, a, b):
    """ln p0 where the backward streamline from P crosses the segment A-B (linear in between)."""
    ex, ey = np.cos(thp), np.sin(thp)
    dx, dy = b["x"] - a["x"], b["y"] - a["y"]
    # P - s e = A + t (B - A)  ->  solve for t
    det = -ex * dy + ey * dx
    rx, ry = xp - a["x"], yp - a["y"]
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (-ex * ry + ey * rx) / det
    t = np.clip(np.where(np.isfinite(t), t, 0.5), 0.0, 1.0)
    return a["lnp0"] + t * (b["lnp0"] - a["lnp0"])


def interior(a, b, gamma, delta):
    """Interior point P from A (on the C+ through P, upstream) and B (on the C- through P).

    Returns the point dict; arrays broadcast over a front.
    """
    g = gamma
    xa, ya, tha, nua, ma = a["x"], a["y"], a["theta"], a["nu"], a["mach"]
    xb, yb, thb, nub, mb = b["x"], b["y"], b["theta"], b["nu"], b["mach"]
    mua, mub = _mu(ma), _mu(mb)
    rotational = np.any(a["lnp0"] != b["lnp0"])
    # predictor: coefficients from the parents
    thp, mup, mp = 0.5 * (tha + thb), 0.5 * (mua + mub), 0.5 * (ma + mb)
    xp, yp = 0.5 * (xa + xb), 0.5 * (ya + yb)
    lnp = 0.5 * (a["lnp0"] + b["lnp0"])
    nup = 0.5 * (nua + nub)
    for _ in range(MAX_ITER):
        t1, m1 = 0.5 * (tha + thp), 0.5 * (mua + mup)
        t2, m2 = 0.5 * (thb + thp), 0.5 * (mub + mup)
        s1, s2 = _intersect(xa, ya, t1 + m1, xb, yb, t2 - m2)
        xn = xa + s1 * np.cos(t1 + m1)
        yn = ya + s1 * np.sin(t1 + m1)
        y1, y2 = 0.5 * (ya + yn), 0.5 * (yb + yn)
        src1 = source(t1, m1, y1, delta) * s1
        src2 = source(t2, m2, y2, delta) * s2
        if rotational:
            lnn = streamline_p0(xn, yn, thp, a, b)
            k1 = k_coef(0.5 * (ma + mp), g)
            k2 = k_coef(0.5 * (mb + mp), g)
            r1 = nua - tha + src1 + k1 * (lnn - a["lnp0"])
            r2 = nub + thb + src2 + k2 * (lnn - b["lnp0"])
        else:
            lnn = lnp
            r1 = nua - tha + src1
            r2 = nub + thb + src2
        nun = 0.5 * (r1 + r2)
        thn = 0.5 * (r2 - r1)
        mn = mach_of_nu_near(nun, mp, g)
        done = np.nanmax(np.abs(np.concatenate([np.atleast_1d(xn - xp), np.atleast_1d(yn - yp),
                                                np.atleast_1d(nun - nup), np.atleast_1d(thn - thp)])),
                         initial=0.0) < TOL
        xp, yp, thp, nup, mp, lnp = xn, yn, thn, nun, mn, lnn
        mup = _mu(mp)
        if done:
            break
    bad = ~(np.isfinite(mp) & np.isfinite(s1) & np.isfinite(s2))
    out = dict(x=xp, y=yp, theta=thp, nu=nup, mach=mp, lnp0=np.broadcast_to(lnp, np.shape(xp)).astype(float))
    if np.any(bad):
        for k in KEYS:
            out[k] = np.where(bad, np.nan, out[k])
    return out


def wall_point(a, wall, gamma, delta, lnp0_wall=None):
    """Wall point P where the C+ from A meets the known wall (the flow at the wall is found).

    `wall` has vectorised y_of(x) and angle(x) (radians).  `lnp0_wall` is the
    total pressure carried along the wall streamline (default: A's).
    """
    g = gamma
    xa, ya, tha, nua, ma = a["x"], a["y"], a["theta"], a["nu"], a["mach"]
    mua = _mu(ma)
    lnw = a["lnp0"] if lnp0_wall is None else lnp0_wall
    thp, mup, mp, nup = tha, mua, ma, nua
    xp = xa
    s = np.zeros(np.shape(xa))
    for _ in range(MAX_ITER):
        t1, m1 = 0.5 * (tha + thp), 0.5 * (mua + mup)
        al = t1 + m1
        ca, sa = np.cos(al), np.sin(al)
        # Newton on f(s) = ya + s sin(al) - yw(xa + s cos(al))
        for _ in range(30):
            xs = xa + s * ca
            f = ya + s * sa - wall.y_of(xs)
            df = sa - np.tan(wall.angle(xs)) * ca
            with np.errstate(divide="ignore", invalid="ignore"):
                ds = -f / df
            s = s + np.where(np.isfinite(ds), ds, 0.0)
            if np.all(np.abs(ds[np.isfinite(ds)]) < 1e-14):
                break
        xn = xa + s * ca
        yn = ya + s * sa
        thn = wall.angle(xn)
        y1 = 0.5 * (ya + yn)
        src = source(t1, m1, y1, delta) * s
        rot = k_coef(0.5 * (ma + mp), g) * (lnw - a["lnp0"])
        nun = nua - tha + thn + src + rot
        mn = mach_of_nu_near(nun, mp, g)
        done = np.nanmax(np.abs(np.atleast_1d(nun - nup)), initial=0.0) < TOL and \
            np.nanmax(np.abs(np.atleast_1d(xn - xp)), initial=0.0) < TOL
        xp, thp, nup, mp = xn, thn, nun, mn
        mup = _mu(mp)
        yp = yn
        if done:
            break
    miss = np.abs(yp - wall.y_of(xp)) > 1e-9 * np.maximum(1.0, np.abs(yp))
    bad = ~(np.isfinite(mp) & (s > 0)) | miss
    out = dict(x=xp, y=yp, theta=thp, nu=nup, mach=mp, lnp0=np.broadcast_to(lnw, np.shape(xp)).astype(float))
    if np.any(bad):
        for k in KEYS:
            out[k] = np.where(bad, np.nan, out[k])
    return out


def axis_point(b, gamma, delta, lnp0_axis=None):
    """Point P on the axis (or planar centre line), y = 0 and theta = 0, from B on the C- through P.

    The axisymmetric source term sin(theta)/y (0/0 on the axis) is taken with
    averaged properties, i.e. from B: its limit d(theta)/dy (common practice).
    """
    g = gamma
    xb, yb, thb, nub, mb = b["x"], b["y"], b["theta"], b["nu"], b["mach"]
    mub = _mu(mb)
    lnw = b["lnp0"] if lnp0_axis is None else lnp0_axis
    mup, mp, nup = mub, mb, nub
    xp = xb
    for _ in range(MAX_ITER):
        t2, m2 = 0.5 * thb, 0.5 * (mub + mup)
        al = t2 - m2
        with np.errstate(divide="ignore", invalid="ignore"):
            s = -yb / np.sin(al)
        xn = xb + s * np.cos(al)
        src = source(t2, m2, 0.5 * yb, delta) * s
        rot = k_coef(0.5 * (mb + mp), g) * (lnw - b["lnp0"])
        nun = nub + thb + src + rot
        mn = mach_of_nu_near(nun, mp, g)
        done = np.nanmax(np.abs(np.atleast_1d(nun - nup)), initial=0.0) < TOL and \
            np.nanmax(np.abs(np.atleast_1d(xn - xp)), initial=0.0) < TOL
        xp, nup, mp = xn, nun, mn
        mup = _mu(mp)
        if done:
            break
    bad = ~(np.isfinite(mp) & (s > 0))
    z = np.zeros(np.shape(xp))
    out = dict(x=xp, y=z, theta=z.copy(), nu=nup, mach=mp, lnp0=np.broadcast_to(lnw, np.shape(xp)).astype(float))
    if np.any(bad):
        for k in KEYS:
            out[k] = np.where(bad, np.nan, out[k])
    return out

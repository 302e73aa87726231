"""Shock point: an oblique shock of the C- family met by a downstream C- characteristic.

At a point on the shock the upstream state (M1, theta1, p01) is known.  The
shock angle beta fixes the downstream state through the oblique-shock
relations (theta-beta-M relation and Rankine-Hugoniot jump, NACA Report 1135,
weak root); the downstream state must also satisfy the C- compatibility
relation of rotational flow (see `moc.net.rotational`) from a known point Q
where the C- through the shock point crosses the previous front.  One
equation in beta, solved by bracketing (Brent) on the weak branch between the
Mach angle (zero strength) and the angle at which the flow behind becomes
sonic.  The shock turns the flow clockwise: theta2 = theta1 - deflection.
"""

from __future__ import annotations

import math

import numpy as np
from scipy.optimize import brentq

from moc.flow.shocks import _normal, _theta
from moc.flow import sonic_deflection
from moc.net import rotational as rp


def downstream(m1, th1, lnp01, beta, gamma):
    """Downstream (theta, nu, mach, lnp0, p2/p1, p02/p01) behind a C- shock of angle beta."""
    dfl = float(_theta(m1, beta, gamma))
    mn1 = max(m1 * math.sin(beta), 1.0)
    mn2, p, r, t, p0 = (float(v) for v in _normal(np.float64(mn1), gamma))
    m2 = mn2 / math.sin(beta - dfl)
    nu2 = float(rp.prandtl_meyer_safe(m2, gamma))
    return dict(theta=th1 - dfl, nu=nu2, mach=m2, lnp0=lnp01 + math.log(p0), p2_p1=p, p02_p01=p0, deflection=dfl)


def crossing_on_polyline(xp, yp, ang, front, clamp=True):
    """Where the line through P with direction `ang`, traced backward (t > 0), crosses the polyline `front`.

    Returns (t, j, u): distance back from P, segment index j and fraction u
    along it, or None.  A one-point front returns that point.
    """
    fx, fy = front["x"], front["y"]
    if fx.size == 1:
        t = math.hypot(xp - fx[0], yp - fy[0])
        return t, 0, 0.0
    ex, ey = math.cos(ang), math.sin(ang)
    g = (fx - xp) * ey - (fy - yp) * ex
    s = np.sign(g)
    idx = np.flatnonzero(s[:-1] * s[1:] <= 0)
    best = None
    for j in idx:
        if g[j] == g[j + 1]:
            continue
        u = g[j] / (g[j] - g[j + 1])
        qx = fx[j] + u * (fx[j + 1] - fx[j])
        qy = fy[j] + u * (fy[j + 1] - fy[j])
        t = -((qx - xp) * ex + (qy - yp) * ey)
        if t > -1e-12 and (best is None or t < best[0]):
            best = (t, int(j), float(u))
    if best is None and clamp:
        # the line passes beyond an end of the front: use the nearer end point (keeps the residual continuous)
        j = 0 if abs(g[0]) <= abs(g[-1]) else fx.size - 1
        t = math.hypot(xp - fx[j], yp - fy[j])
        best = (t, min(j, fx.size - 2), 0.0 if j == 0 else 1.0)
    return best


def _interp(front, j, u):
    if front["x"].size == 1:
        return {k: float(front[k][0]) for k in rp.KEYS}
    return {k: float(front[k][j] + u * (front[k][j + 1] - front[k][j])) for k in rp.KEYS}


def residual(beta, up, xp, yp, front, gamma, delta, ang=None):
    """C- compatibility residual (nu + theta)_2 - (nu + theta)_Q - source - K dln p0, and the details.

    With `ang` given, the C- through P is traced back along that fixed
    direction, so Q does not move with the trial beta (the residual is then
    continuous and monotone in beta); otherwise its direction is averaged
    between the downstream state and Q.
    """
    d = downstream(up["mach"], up["theta"], up["lnp0"], beta, gamma)
    mu2 = math.asin(1.0 / d["mach"])
    hit = None
    if ang is not None:
        hit = crossing_on_polyline(xp, yp, ang, front)
        if hit is None:
            return None, d
        q = _interp(front, hit[1], hit[2])
    else:
        a_ = d["theta"] - mu2
        for _ in range(4):
            hit = crossing_on_polyline(xp, yp, a_, front)
            if hit is None:
                return None, d
            q = _interp(front, hit[1], hit[2])
            a_ = 0.5 * (d["theta"] - mu2 + q["theta"] - math.asin(1.0 / q["mach"]))
    t = hit[0]
    tm = 0.5 * (d["theta"] + q["theta"])
    mm = 0.5 * (mu2 + math.asin(1.0 / q["mach"]))
    ym = 0.5 * (yp + q["y"])
    src = float(rp.source(np.float64(tm), np.float64(mm), np.float64(ym), delta)) * t
    k = float(rp.k_coef(0.5 * (d["mach"] + q["mach"]), gamma))
    r = (d["nu"] + d["theta"]) - (q["nu"] + q["theta"]) - src - k * (d["lnp0"] - q["lnp0"])
    d["q"] = q
    d["q_index"] = hit[1]
    d["q_frac"] = hit[2]
    return r, d


def solve_beta(up, xp, yp, front, gamma, delta, outer=10):
    """Weak-root shock angle at P matching the downstream C- from `front`.

    Returns (status, beta, downstream dict): status "ok", "vanishes" (the
    downstream flow asks for no compression: the shock has decayed to a Mach
    wave), "too_strong" (no weak solution with supersonic flow behind:
    detachment or Mach reflection), or "lost" (the C- does not meet the front).
    The direction of the C- back to the front is fixed during each root
    search and updated between searches (`outer` times).
    """
    m1 = up["mach"]
    mu1 = math.asin(1.0 / m1)
    _, bs = sonic_deflection(m1, gamma)
    lo, hi = mu1 * (1 + 1e-9) + 1e-12, float(bs) * (1 - 1e-9)
    # first direction: the upstream Mach direction averaged with the front's C- direction near P
    ang = up["theta"] - mu1
    hit = crossing_on_polyline(xp, yp, ang, front)
    if hit is None:
        return "lost", None, {}
    q = _interp(front, hit[1], hit[2])
    ang = 0.5 * (ang + q["theta"] - math.asin(1.0 / q["mach"]))
    status, beta, d = "ok", None, None
    for _ in range(outer):
        r_lo, d_lo = residual(lo, up, xp, yp, front, gamma, delta, ang)
        if r_lo is None:
            return "lost", None, d_lo
        if r_lo <= 0:
            status, beta, d = "vanishes", lo, d_lo
        else:
            r_hi, d_hi = residual(hi, up, xp, yp, front, gamma, delta, ang)
            if r_hi is None:
                return "lost", None, d_hi
            if r_hi > 0:
                return "too_strong", hi, d_hi

            def f(b):
                r, _ = residual(b, up, xp, yp, front, gamma, delta, ang)
                return r if r is not None else -1.0

            beta = brentq(f, lo, hi, xtol=1e-13, rtol=1e-13, maxiter=200)
            _, d = residual(beta, up, xp, yp, front, gamma, delta, ang)
            status = "ok"
        qq = d["q"]
        new = 0.5 * (d["theta"] - math.asin(1.0 / d["mach"]) + qq["theta"] - math.asin(1.0 / qq["mach"]))
        if abs(new - ang) < 1e-12:
            break
        ang = new
    return status, beta, d

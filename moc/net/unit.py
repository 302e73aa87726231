"""Unit processes of the method of characteristics (homentropic flow).

All functions are pure and vectorised: arrays of upstream points in, an array
of new points out.  Planar and axisymmetric flow share one code path; the
source term is switched by `delta` (0 planar, 1 axisymmetric).

Compatibility relations per unit arc length s along each characteristic
(steady irrotational homentropic flow; derivation in streamline coordinates as
in Zucrow and Hoffman, Gas Dynamics vol. 2, 1977, ch. 16, from memory; the
per-arc-length form avoids the 1/cos(theta -/+ mu) of the dx form near M = 1):

    along C+ (direction theta + mu):  d(nu - theta) = delta sin(mu) sin(theta) / y ds
    along C- (direction theta - mu):  d(nu + theta) = delta sin(mu) sin(theta) / y ds

Predictor-corrector: the predictor takes directions and source terms at the
known points, the corrector averages them between the known and the new point
(trapezoidal rule), iterated to `tol`; the scheme is second order (local error
O(step^3), checked on radial source flow in tests/test_unit_processes.py).

On the axis sin(theta)/y -> d theta/dy, and the axisymmetric continuity
equation gives d theta/dy = cot(mu) (d nu/dx) / 2 there; `axis_point` takes
the limit from the upstream point (as in Zucrow and Hoffman, vol. 2, axis
treatment, from memory).
"""

import math

import numpy as np

from moc.errors import ComputationError
from moc.net._pm import _nu_t, mu_of_nu, pm_constants
from moc.net.points import Points

TOL = 1e-9
MAXITER = 40
#: below this change the iteration is accepted once it stops contracting (round-off floor,
#: reached where the two characteristics are nearly tangent, M -> 1)
FLOOR = 1e-9
#: gain 0.25 |s2 - s1| sin(mu) / y of the source term of a new point near the axis on its own
#: flow angle, above which the interior point interpolates that source term (see interior_point)
STIFF_GAIN = 0.5


def _done(err, prev, tol):
    return err <= tol or (err < FLOOR and err >= 0.5 * prev)


def source(p_y, p_theta, p_mu, delta):
    """delta sin(mu) sin(theta) / y; 0 is returned on the axis (y = 0), where the
    caller supplies the limit (see `axis_point`)."""
    if not delta:
        return np.zeros_like(p_y)
    # 1/inf = 0 on the axis (no division warning, one pass over the arrays)
    return np.sin(p_mu) * np.sin(p_theta) / np.where(p_y > 0.0, p_y, np.inf)


def _check(p, what, it):
    if not np.isfinite(np.sum(p.x) + np.sum(p.nu) + np.sum(p.y)):  # NaN/inf anywhere
        raise ComputationError(
            f"the {what} unit process produced non-finite values (characteristics did not intersect "
            "or the flow left the supersonic range); the net cannot be continued here."
        )
    if np.any(p.nu < 0.0):
        raise ComputationError(
            f"the {what} unit process reached a subsonic state (Prandtl-Meyer angle below 0); "
            "a supersonic net cannot be continued here."
        )
    if it >= MAXITER:
        raise ComputationError(
            f"the {what} predictor-corrector did not converge in {MAXITER} iterations."
        )


def _intersect(xa, ya, aa, xb, yb, ab):
    """Arc lengths (sa, sb) from A along angle aa and from B along angle ab to their crossing."""
    ca, sa_ = np.cos(aa), np.sin(aa)
    cb, sb_ = np.cos(ab), np.sin(ab)
    det = cb * sa_ - ca * sb_  # = sin(aa - ab)
    dx = xb - xa
    dy = yb - ya
    s_a = (cb * dy - sb_ * dx) / det
    s_b = (ca * dy - sa_ * dx) / det
    return s_a, s_b


def interior_point(a, b, gamma, delta, tol=TOL, source_a=None, guess=None, cminus_forward=True):
    """New point P on the C+ through `a` and the C- through `b` (arrays of Points).

    `source_a` optionally gives the source term at the points `a` (needed where
    an `a` lies on the axis: pass the value returned by `axis_point`; NaN
    entries are computed from the state as usual).  `guess = (theta, mu, y)`
    optionally gives a starting estimate of P (NaN where none): the first pass
    is then already a corrector pass, which saves iterations when the guess is
    second-order accurate (as the parallelogram rule of a structured net is);
    the converged point does not depend on it.  `cminus_forward`: P lies
    downstream of `b` on its C- (True when marching downstream; a Goursat
    problem may run a C- backward); a P behind `a` on its C+ (or behind `b`
    when forward) means two characteristics of one family crossed, reported as
    a ComputationError naming the place.

    Source: unit process of Zucrow and Hoffman, Gas Dynamics vol. 2 (1977),
    modified Euler predictor-corrector (from memory), written per arc length.
    The Mach angle of P is updated by one Newton step on nu^(1/3) per
    corrector pass (the two iterations converge together).
    """
    k, c = pm_constants(gamma)
    kk = 1.0 / (k * k)
    sa = source(a.y, a.theta, a.mu, delta)
    if source_a is not None and delta:
        sa = np.where(np.isnan(source_a), sa, source_a)
    sb = source(b.y, b.theta, b.mu, delta)
    ap = a.theta + a.mu
    bm = b.theta - b.mu
    kp = a.nu - a.theta
    km = b.nu + b.theta
    dx = b.x - a.x
    dy = b.y - a.y
    alpha_p, alpha_m, sp, sm = ap, bm, sa, sb
    t = 0.5 * (np.pi - a.mu - b.mu)  # warm start: t = pi/2 - mu, averaged
    if guess is not None:
        tg, mg, yg = guess
        ok = np.isfinite(tg) & (mg > 0.0) & (mg < 0.5 * np.pi) & (np.abs(tg) < 0.5 * np.pi) & (yg > 0.0)
        alpha_p = np.where(ok, 0.5 * (ap + tg + mg), ap)
        alpha_m = np.where(ok, 0.5 * (bm + tg - mg), bm)
        t = np.where(ok, 0.5 * np.pi - mg, t)
        if delta:
            with np.errstate(divide="ignore", invalid="ignore"):
                sg = np.sin(mg) * np.sin(tg) / yg
            sp = np.where(ok, 0.5 * (sa + sg), sa)
            sm = np.where(ok, 0.5 * (sb + sg), sb)
    x = y = nu = None
    prev = np.inf
    stiff = np.zeros(np.shape(a.x), dtype=bool)
    for it in range(MAXITER + 1):
        ca, sna = np.cos(alpha_p), np.sin(alpha_p)
        cb, snb = np.cos(alpha_m), np.sin(alpha_m)
        det = cb * sna - ca * snb
        s1 = (cb * dy - snb * dx) / det
        s2 = (ca * dy - sna * dx) / det
        xn = a.x + s1 * ca
        yn = a.y + s1 * sna
        rp = kp + s1 * sp
        rm = km + s2 * sm
        nun = 0.5 * (rp + rm)
        th = 0.5 * (rm - rp)
        t = _newton_t(t, nun, k, kk, c)
        t = _newton_t(t, nun, k, kk, c) if it == 0 else t
        mu = 0.5 * np.pi - t
        if x is not None:
            # position change measured along the C+ (s1), flow change on nu and theta
            err = max(np.abs(nun - nu).max(), np.abs(s1 - s1_old).max(), np.abs(th - th_old).max())
        else:
            err = np.inf
        x, y, nu, s1_old, th_old = xn, yn, nun, s1, th
        if _done(err, prev, tol):
            break
        prev = err
        alpha_p = 0.5 * (ap + th + mu)
        alpha_m = 0.5 * (bm + th - mu)
        if delta:
            snm = np.sin(mu)
            s_p = snm * np.sin(th) / y
            # where P lies close to the axis compared with its steps, theta_P / y_P
            # feeds back with a gain 0.25 |s2 - s1| sin(mu) / y_P into theta_P; at
            # 1/2 or more the pass no longer contracts (it diverges above 1).  There
            # the source term at P is taken linear between A and B instead
            # (sin(theta)/y is smooth and even in y: the local error stays O(h^3)).
            stiff |= np.abs(s2 - s1) * snm >= 4.0 * STIFF_GAIN * y
            if stiff.any():
                # linear in x between A and B (P usually lies beyond A: extrapolated)
                with np.errstate(divide="ignore", invalid="ignore"):
                    w = np.where(np.abs(dx) > 0.25 * np.abs(dy), (xn - a.x) / dx,
                                 ((xn - a.x) * dx + (yn - a.y) * dy) / (dx * dx + dy * dy))
                w = np.clip(w, -2.0, 3.0)
                s_p = np.where(stiff, sa + w * (sb - sa), s_p)
            sp = 0.5 * (sa + s_p)
            sm = 0.5 * (sb + s_p)
    return _finish(a, b, x, y, th, nu, mu, s1, s2, it, gamma, cminus_forward)


def _finish(a, b, x, y, th, nu, mu, s1, s2, it, gamma, cminus_forward):
    _crossing(a, b, s1, s2 if cminus_forward else np.abs(s2), it)
    # finish the Mach angle to round-off at the converged nu: the last pass left t one
    # Newton step from it, and Newton converges quadratically (as mu_of_nu, cheaper)
    k, c = pm_constants(gamma)
    kk = 1.0 / (k * k)
    t = _newton_t(_newton_t(0.5 * np.pi - mu, nu, k, kk, c), nu, k, kk, c)
    mu = 0.5 * np.pi - t
    p = Points(x, y, th, nu, mu)
    _check(p, "interior point", it)
    return p


def _crossing(a, b, s1, s2, it):
    """A new point behind A on its C+ or behind B on its C- means two characteristics of
    one family have crossed (their envelope is where a shock forms): say so and where."""
    if it < MAXITER and min(s1.min(initial=0.0), s2.min(initial=0.0)) >= -1e-9:
        return  # the common case, in two reductions
    scale = 1e-9 * (1.0 + np.abs(a.y) + np.abs(b.y))
    bad = (s1 < -scale) | (s2 < -scale)
    if it >= MAXITER:
        bad |= ~(np.isfinite(s1) & np.isfinite(s2))
    if np.any(bad):
        k = int(np.flatnonzero(bad)[0])
        fam = "C-" if s1[k] < -scale[k] else "C+"  # behind A on its C+: a C- has crossed
        raise ComputationError(
            f"characteristics of one family ({fam}) cross near x = {0.5 * (a.x[k] + b.x[k]):.4g}, "
            f"y = {0.5 * (a.y[k] + b.y[k]):.4g}: the flow compresses into a shock there, and the "
            "isentropic net cannot be continued past it."
        )


def _newton_t(t, nu, k, kk, c):
    """One safeguarded Newton step for t = pi/2 - mu on nu(t)^(1/3) = nu^(1/3)."""
    if t.min() < 2e-3:  # near M = 1: series form of nu(t) avoids cancellation
        nv, tb2 = _nu_t(t, k, kk)
    else:
        tb = np.tan(t)
        tb2 = tb * tb
        nv = k * np.arctan(tb / k) - t
    cn = np.cbrt(nv)
    dt = (cn - np.cbrt(np.maximum(nu, 1e-300))) * 3.0 * cn * cn * (1.0 + tb2 * kk) / (c * tb2)
    return np.minimum(np.maximum(t - dt, 0.5 * t), 0.25 * np.pi + 0.5 * t)


def axis_point(a, gamma, delta, tol=TOL, return_source=False):
    """New point on the axis (y = 0, theta = 0) reached by the C- through `a`.

    The source term at the axis point is the limit sin(theta)/y -> d theta/dy;
    it is taken equal to its value at the known upstream point `a`.  This is
    stable, and the O(h) error it makes in that one term alternates in sign
    from one axis point to the next, so a marched net stays second order
    (measured on spherical source flow in tests/test_unit_processes.py).
    Extrapolating the axis value from two upstream points, or from the axis
    relation d theta/dy = cot(mu) (d nu/dx)/2 with backward differences, was
    tried and grew odd-even oscillations.  With `return_source` the source
    term used at the new point is also returned, as (points, source), for the
    C+ leaving it.
    """
    k, c = pm_constants(gamma)
    kk = 1.0 / (k * k)
    if np.size(a.x) == 1:  # one point (as the marchers call it): plain floats, same arithmetic
        return _axis_one(a, gamma, delta, tol, return_source, k, kk, c)
    sa = source(a.y, a.theta, a.mu, delta)
    am = a.theta - a.mu
    km = a.nu + a.theta
    alpha = am
    s_avg = sa
    s_p = sa
    t = 0.5 * np.pi - a.mu
    nu = x = None
    prev = np.inf
    for it in range(MAXITER + 1):
        s = -a.y / np.sin(alpha)
        xn = a.x + s * np.cos(alpha)
        nun = km + s * s_avg
        t = _newton_t(_newton_t(t, nun, k, kk, c), nun, k, kk, c)
        mu = 0.5 * np.pi - t
        if nu is not None:
            err = max(np.abs(xn - x).max(initial=0.0), np.abs(nun - nu).max(initial=0.0))
        else:
            err = np.inf
        x, nu = xn, nun
        if _done(err, prev, tol):
            break
        prev = err
        alpha = 0.5 * (am - mu)
    mu = mu_of_nu(nu, gamma, mu)
    z = np.zeros_like(x)
    p = Points(x, z, z.copy(), nu, mu)
    _check(p, "axis point", it)
    if return_source:
        return p, np.asarray(s_p, dtype=float) * np.ones_like(x)
    return p


def _newton_t1(t, nu, k, kk, c):
    """`_newton_t` for one float."""
    tb = math.tan(t)
    tb2 = tb * tb
    if tb < 1e-3:  # series form of nu(t) (only reached for t < 2e-3, as in _newton_t)
        nv = tb * tb2 * ((1.0 - kk) / 3.0 - tb2 * ((1.0 - kk * kk) / 5.0 - tb2 * (1.0 - kk**3) / 7.0))
    else:
        nv = k * math.atan(tb / k) - t
    cn = float(np.cbrt(nv))
    dt = (cn - float(np.cbrt(max(nu, 1e-300)))) * 3.0 * cn * cn * (1.0 + tb2 * kk) / (c * tb2)
    return min(max(t - dt, 0.5 * t), 0.25 * math.pi + 0.5 * t)


def _axis_one(a, gamma, delta, tol, return_source, k, kk, c):
    """`axis_point` for a single upstream point, in floats (saves the NumPy call overhead
    that dominates one-point arrays; the iteration and its stopping test are the same)."""
    shape = np.shape(a.x)
    ax, ay, ath, anu, amu = (float(np.ravel(v)[0]) for v in a)
    sa = math.sin(amu) * math.sin(ath) / ay if (delta and ay > 0.0) else 0.0
    am = ath - amu
    km = anu + ath
    alpha = am
    t = 0.5 * math.pi - amu
    nu = x = None
    prev = math.inf
    for it in range(MAXITER + 1):
        s = -ay / math.sin(alpha)
        xn = ax + s * math.cos(alpha)
        nun = km + s * sa
        t = _newton_t1(_newton_t1(t, nun, k, kk, c), nun, k, kk, c)
        if nu is not None:
            err = max(abs(xn - x), abs(nun - nu))
        else:
            err = math.inf
        x, nu = xn, nun
        if _done(err, prev, tol):
            break
        prev = err
        alpha = 0.5 * (am - (0.5 * math.pi - t))
    # finish to round-off: Newton converges quadratically from the converged iterate
    mu = 0.5 * math.pi - _newton_t1(_newton_t1(t, nu, k, kk, c), nu, k, kk, c)
    full = (lambda v: np.array([v])) if shape == (1,) else (lambda v: np.full(shape, v, dtype=float))
    p = Points(full(x), full(0.0), full(0.0), full(nu), full(mu))
    _check(p, "axis point", it)
    if return_source:
        return p, full(sa)
    return p


def wall_point(a, w, theta_p, gamma, delta, tol=TOL):
    """Direct wall point: the wall angle `theta_p` at the new point is known.

    P lies on the C+ through `a` and on the wall segment from the previous
    wall point `w` at the mean angle (theta_w + theta_p)/2; the flow angle at
    P is theta_p and nu follows from the C+ compatibility relation.
    """
    theta_p = np.broadcast_to(np.asarray(theta_p, dtype=float), np.shape(a.x)).copy()
    sa = source(a.y, a.theta, a.mu, delta)
    ap = a.theta + a.mu
    kp = a.nu - a.theta
    aw = 0.5 * (w.theta + theta_p)
    alpha = ap
    s_avg = sa
    mu = a.mu
    x = nu = None
    prev = np.inf
    for it in range(MAXITER + 1):
        s1, _ = _intersect(a.x, a.y, alpha, w.x, w.y, aw)
        xn = a.x + s1 * np.cos(alpha)
        yn = a.y + s1 * np.sin(alpha)
        nun = kp + theta_p + s1 * s_avg
        mu = mu_of_nu(nun, gamma, mu)
        if x is not None:
            err = max(np.abs(xn - x).max(initial=0.0), np.abs(nun - nu).max(initial=0.0))
        else:
            err = np.inf
        x, y, nu = xn, yn, nun
        if _done(err, prev, tol):
            break
        prev = err
        alpha = 0.5 * (ap + theta_p + mu)
        if delta:
            s_avg = 0.5 * (sa + source(y, theta_p, mu, delta))
    p = Points(x, y, theta_p, nu, mu)
    _check(p, "wall point", it)
    return p


def inverse_wall_point(a, curve, gamma, delta, tol=TOL):
    """Wall point on a known wall curve: the flow there is found.

    `curve(x)` returns (y, dy/dx) of the upper wall, vectorised.  P is where
    the C+ through `a` meets the curve; theta_P = atan(dy/dx) and nu_P follows
    from the C+ compatibility relation (predictor-corrector as above; the
    intersection with the curve is found by Newton's method along the C+).
    """
    sa = source(a.y, a.theta, a.mu, delta)
    ap = a.theta + a.mu
    kp = a.nu - a.theta
    alpha = ap
    s_avg = sa
    mu = a.mu
    s = np.zeros_like(a.x)
    x = nu = None
    prev = np.inf
    for it in range(MAXITER + 1):
        ca, sn = np.cos(alpha), np.sin(alpha)
        for _ in range(50):
            yc, dc = curve(a.x + s * ca)
            g = a.y + s * sn - yc
            ds = -g / (sn - dc * ca)
            s = s + ds
            if np.abs(ds).max(initial=0.0) <= 1e-14:
                break
        xn = a.x + s * ca
        yn, dydx = curve(xn)
        th = np.arctan(dydx)
        nun = kp + th + s * s_avg
        mu = mu_of_nu(nun, gamma, mu)
        if x is not None:
            err = max(np.abs(xn - x).max(initial=0.0), np.abs(nun - nu).max(initial=0.0))
        else:
            err = np.inf
        x, y, nu = xn, np.asarray(yn, dtype=float), nun
        if _done(err, prev, tol):
            break
        prev = err
        alpha = 0.5 * (ap + th + mu)
        if delta:
            s_avg = 0.5 * (sa + source(y, th, mu, delta))
    p = Points(x, y, np.asarray(th, dtype=float), nu, mu)
    _check(p, "inverse wall point", it)
    return p

"""Finding the wall in a computed net: mass balance and streamline tracing.

The wall of a designed nozzle is the streamline that carries the throat mass
flow.  `mass_balance_wall` finds it on every C+ characteristic as the point
where the mass flux crossing the characteristic from the axis equals the
throat flux; `trace_streamline` integrates dy/dx = tan(theta) from a start
point across the C+ characteristics.  The two agree to the discretisation
error, which the designers report.

Mass flux across a C+ characteristic: the flow crosses it at the Mach angle,
so d(mdot) = rho V sin(mu) (2 pi y)^delta dl; with rho V / (rho* a*) =
1 / (A/A*)(M) (isentropic relation, NACA Report 1135) and the throat flux
rho* a* (1 planar, 1/2 axisymmetric per radian) this is made dimensionless.
"""

import numpy as np

from moc.errors import ComputationError
from moc.net._pm import mass_flux_density


def throat_flux(delta):
    """Throat mass flux per unit depth (planar) or per radian (axisymmetric), in rho* a* units."""
    return 0.5 if delta else 1.0


def flux_integrand(y, mu, gamma, delta):
    """rho V sin(mu) y^delta / (rho* a*), the flux per unit length across a C+ (or C-) line."""
    f = mass_flux_density(mu, gamma) * np.sin(mu)
    return f * y if delta else f


def cumulative_flux(x, y, mu, gamma, delta):
    """Cumulative mass flux along each row of 2-D arrays (rows are characteristics,
    NaN where a row has no point), trapezoidal rule on chords; NaN where undefined."""
    f = flux_integrand(y, mu, gamma, delta)
    dl = np.hypot(np.diff(x, axis=1), np.diff(y, axis=1))
    seg = 0.5 * (f[:, 1:] + f[:, :-1]) * dl
    seg = np.where(np.isfinite(seg), seg, 0.0)
    cum = np.concatenate([np.zeros((x.shape[0], 1)), np.cumsum(seg, axis=1)], axis=1)
    return np.where(np.isfinite(x), cum, np.nan), f


def mass_balance_wall(grid, gamma, delta, target=None, rows=None):
    """Wall point on each C+ row of `grid` where the flux from the row's first
    point (on the axis) reaches `target` (default: the throat flux; a scalar
    or one value per row).

    Returns dict x, y, theta, nu, mu (one entry per row), `col` (index of the
    last grid point of the row inside the wall) and the cumulative flux array.
    Inside a segment the integrand is taken linear in arc length, so the
    crossing solves a quadratic (second order, like the march).
    """
    if target is None:
        target = throat_flux(delta)
    sel = slice(None) if rows is None else rows
    arrays = [getattr(grid, k)[sel] for k in ("x", "y", "theta", "nu", "mu")]
    return flux_crossing(*arrays, gamma, delta, target, strict=True)


def flux_crossing(X, Y, TH, NU, MU, gamma, delta, target, strict=False):
    """Where the cumulative flux along each row of the 2-D arrays (rows are
    characteristics or other lines, NaN where a row has no point) reaches
    `target` (scalar or per row).  With `strict` a row that never reaches it
    raises ComputationError; otherwise its outputs are NaN (col = -1)."""
    cum, f = cumulative_flux(X, Y, MU, gamma, delta)
    tgt = np.broadcast_to(np.asarray(target, dtype=float), (X.shape[0],))
    over = np.nan_to_num(cum, nan=-np.inf) >= tgt[:, None]
    reach = over.any(axis=1)
    if strict and not np.all(reach):
        bad = int(np.flatnonzero(~reach)[0])
        raise ComputationError(
            f"the net does not reach the wall on C+ characteristic {bad}: "
            "the computed flow carries less than the throat mass flow there."
        )
    jb = np.argmax(over, axis=1)  # first point at or beyond the wall
    r = np.arange(X.shape[0])
    ja = jb - 1
    good = reach & (ja >= 0)
    good[good] &= np.isfinite(X[r[good], ja[good]])
    if strict and not np.all(good):
        raise ComputationError("the wall lies before the first point of a C+ characteristic; "
                               "the net does not start inside the nozzle.")
    ja = np.where(good, ja, 0)
    jb = np.where(good, jb, 1)
    fa, fb = f[r, ja], f[r, jb]
    dl = np.hypot(X[r, jb] - X[r, ja], Y[r, jb] - Y[r, ja])
    need = tgt - cum[r, ja]
    # need = dl (fa tau + (fb - fa) tau^2 / 2), 0 <= tau <= 1
    qa = 0.5 * (fb - fa) * dl
    qb = fa * dl
    with np.errstate(divide="ignore", invalid="ignore"):
        disc = np.sqrt(np.maximum(qb * qb + 4.0 * qa * need, 0.0))
        tau = np.where(np.abs(qa) > 1e-14 * np.abs(qb), 2.0 * need / (qb + disc), need / qb)
    tau = np.clip(tau, 0.0, 1.0)
    out = {"col": np.where(good, ja, -1), "cumulative": cum}
    nan = np.where(good, 0.0, np.nan)
    for k, A in (("x", X), ("y", Y), ("theta", TH), ("nu", NU), ("mu", MU)):
        out[k] = A[r, ja] + tau * (A[r, jb] - A[r, ja]) + nan
    return out


def _cross(xs, ys, x0, y0, ang):
    """First crossing of the polyline (xs, ys) with the ray from (x0, y0) at angle `ang`.

    Returns (segment index k, fraction tau along segment k) or None."""
    c, s = np.cos(ang), np.sin(ang)
    side = (xs - x0) * s - (ys - y0) * c  # signed distance from the line
    fwd = (xs - x0) * c + (ys - y0) * s
    ch = np.flatnonzero((side[:-1] * side[1:] <= 0.0) & ((fwd[:-1] > -1e-12) | (fwd[1:] > -1e-12)))
    if ch.size == 0:
        # coarse nets: the crossing may lie on the extension of an end segment
        for k in (xs.size - 2, 0):
            den = side[k] - side[k + 1]
            if den != 0.0:
                tau = side[k] / den
                if (k == 0 and tau < 0.0) or (k > 0 and tau > 1.0):
                    return k, float(tau)
        return None
    k = int(ch[0])
    den = side[k] - side[k + 1]
    tau = 0.5 if den == 0.0 else side[k] / den
    return k, float(tau)


def trace_streamline(grid, x0, y0, theta0, rows=None, iterations=4):
    """Trace a streamline from (x0, y0, theta0) across the C+ rows of `grid` in order.

    Each step is a straight segment at the mean of the flow angles at its two
    ends (trapezoidal rule for dy/dx = tan theta), the end found by
    intersection with the next C+ polyline (flow angle interpolated linearly
    along it) and iterated.  Returns arrays x, y, theta (start point first).
    """
    X, Y, TH = grid.x, grid.y, grid.theta
    rows = range(X.shape[0]) if rows is None else rows
    xs, ys, ts = [x0], [y0], [theta0]
    for i in rows:
        ok = np.isfinite(X[i])
        px, py, pt = X[i][ok], Y[i][ok], TH[i][ok]
        th_new = ts[-1]
        hit = None
        for _ in range(iterations):
            hit = _cross(px, py, xs[-1], ys[-1], 0.5 * (ts[-1] + th_new))
            if hit is None:
                raise ComputationError(f"the streamline does not cross C+ characteristic {i} of the net.")
            k, tau = hit
            th_new = pt[k] + tau * (pt[k + 1] - pt[k])
        k, tau = hit
        xs.append(px[k] + tau * (px[k + 1] - px[k]))
        ys.append(py[k] + tau * (py[k + 1] - py[k]))
        ts.append(th_new)
    return np.array(xs), np.array(ys), np.array(ts)

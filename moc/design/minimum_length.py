"""Minimum-length nozzle: sharp-corner throat, centered expansion fan, uniform exit.

The throat is a straight sonic line at x = 0 ending at a sharp corner
(0, 1).  A centered Prandtl-Meyer fan of C- rays leaves the corner (on each
ray nu = theta, the corner being a point where the C+ has zero length) and
reflects from the axis (the kernel).  The fan's last ray, with the corner
angle theta_c, reaches the axis at E where the Mach number must equal Me;
downstream of the C+ from E the flow is uniform.  The region between the last
ray and the exit C+ is solved as a Goursat problem from those two
characteristics, and the wall is the streamline carrying the throat mass flow
(mass balance on each C+; checked against streamline tracing).

Planar: theta_c = nu(Me)/2 exactly (the turning region is a simple wave;
Anderson, Modern Compressible Flow, nozzle design by the method of
characteristics, from memory).  Axisymmetric: theta_c is found by root
finding so that M on the axis equals Me where the kernel ends.

Sonic start: the fan's rays are clustered toward the sonic end,
theta_j = theta_c h(t_j), h(t) = p t^p - (p-1) t^(p+1), t_j = (j+1)/n, so the
first ray starts from a small turning angle theta_0 = theta_c h(1/n) > 0 and
the sonic line itself is not a computed characteristic (small initial
turning angle at the corner, as in Zucrow and Hoffman, Gas Dynamics vol. 2,
1977, from memory).
"""

import math

import numpy as np

from moc.errors import ComputationError, MachError
from moc.flow import area_ratio, pressure_ratio, prandtl_meyer
from moc.design._inputs import check_design_inputs
from moc.net._pm import mu_of_nu
from moc.net.assemble import grid_cells, net_arrays, zipper
from moc.net.grid import Grid
from moc.net.march import goursat, march_fan
from moc.net.points import Points
from moc.net.wall import cumulative_flux, mass_balance_wall, throat_flux, trace_streamline
from moc.result import Net, Result

#: exponent p of the fan clustering h(t) = p t^p - (p-1) t^(p+1)
CLUSTER_POWER = 8
#: smallest exit Mach angle accepted (deg): below it characteristics and streamlines
#: are nearly parallel, the intersections of the net become ill-conditioned
MIN_EXIT_MACH_ANGLE_DEG = 3.0
MAX_EXIT_MACH = 1.0 / math.sin(math.radians(MIN_EXIT_MACH_ANGLE_DEG))


def fan_angles(theta_c, n, power=CLUSTER_POWER):
    """Flow angles of the n fan rays: theta_c h((j+1)/n), j = 0..n-1 (last = theta_c)."""
    t = np.arange(1, n + 1) / n
    h = power * t**power - (power - 1) * t ** (power + 1)
    h[-1] = 1.0
    return theta_c * h


def _check_inputs(exit_mach, gamma, geometry, n):
    me, g, delta, n = check_design_inputs(exit_mach, gamma, geometry, n, min_n=3)
    if me > MAX_EXIT_MACH:
        raise MachError(
            f"exit Mach number {me:g} is too high for this designer: the exit Mach angle must be at "
            f"least {MIN_EXIT_MACH_ANGLE_DEG:g} deg (Me <= {MAX_EXIT_MACH:.4g}), beyond which the "
            "characteristics run almost along the streamlines and the net degenerates."
        )
    nue = prandtl_meyer(me, g)
    if 0.5 * nue >= 0.5 * math.pi * 0.999:
        raise MachError(
            f"exit Mach number {me:g} needs a corner turning nu(Me)/2 = {math.degrees(nue / 2):.2f} deg, "
            "but the wall at a sharp corner must turn by less than 90 deg; lower the exit Mach number "
            "(or raise gamma)."
        )
    return me, g, delta, n, nue


def _kernel(theta_c, n, gamma, delta, power, grid=True):
    th = fan_angles(theta_c, n, power)
    return march_fan(0.0, 1.0, th, th, gamma, delta, grid=grid), th


_LAST = {}  # the latest kernel marched by _axis_residual (as fronts), reused by the designer


def _axis_residual(theta_c, n, gamma, delta, power, nue):
    # the root search needs only the axis values: the kernel's grid is assembled
    # (Grid.from_fronts) only for the one kernel the designer keeps
    out = _kernel(theta_c, n, gamma, delta, power, grid=False)
    _LAST.clear()
    _LAST[(float(theta_c), n, gamma, delta, power)] = out
    return float(out[0][2][-1] - nue)


def corner_angle(exit_mach, gamma, delta, n, power=CLUSTER_POWER, tol=1e-10):
    """Corner angle theta_c (radians) for which the axis reaches nu(Me) at the kernel end.

    Planar: nu(Me)/2.  Axisymmetric: bracketed root (Brent) on coarse nets,
    extrapolated to n, then secant iterations on the net of n characteristics.
    """
    nue = prandtl_meyer(exit_mach, gamma)
    if not delta:
        return 0.5 * nue

    def coarse(m):
        def f(t):
            try:
                return _axis_residual(t, m, gamma, delta, power, nue)
            except ComputationError:  # far too strong a fan: the net breaks down
                return np.inf
        # bracket: the axisymmetric corner angle lies below the planar nu(Me)/2
        lo = 0.0
        for frac in (0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0):
            t = frac * 0.5 * nue
            ft = f(t)
            if ft > 0.0:
                break
            lo = t
        else:
            raise ComputationError(
                "no corner angle up to nu(Me)/2 brings the axis to the exit Mach number; "
                "the axisymmetric kernel could not be solved."
            )
        hi = t
        if not np.isfinite(ft):  # shrink the upper end until the net can be marched
            for _ in range(60):
                mid = 0.5 * (lo + hi)
                fm = f(mid)
                if fm > 0.0:
                    hi = mid
                    if np.isfinite(fm):
                        break
                else:
                    lo = mid
        if lo == 0.0:
            lo = 1e-6 * hi
        root = _illinois(f, lo, hi, f(lo), f(hi), 1e-12 * hi)
        # the root must lie where the coarse net can be marched on both sides
        if not (np.isfinite(f(root * (1 + 1e-6))) and np.isfinite(f(root * (1 - 1e-6)))):
            return None
        return root

    # a bracketed root on a coarse net, then secant iterations on finer nets
    # (the slope carried from level to level), the last level being n
    t0 = None
    for m0 in (10, 20, 40, 80, 160):  # coarsest net on which the root can be found
        m0 = min(n, m0)
        t0 = coarse(m0)
        if t0 is not None or m0 == n:
            break
    if t0 is None:
        raise ComputationError("the axisymmetric kernel breaks down near the required corner angle.")
    h = 1e-6 * t0
    slope = (_axis_residual(t0 + h, m0, gamma, delta, power, nue)
             - _axis_residual(t0 - h, m0, gamma, delta, power, nue)) / (2 * h)
    levels = [m for m in (40, 160) if m0 < m < n // 2] + [n] if n > m0 else []
    roots = {m0: t0}
    for m in levels:
        if m == n and len(roots) >= 3:
            # Richardson extrapolation in 1/n^2 from the two finest levels (second order)
            m1, m2 = sorted(roots)[-2:]
            c = (roots[m1] - roots[m2]) / (1.0 / m1**2 - 1.0 / m2**2)
            t0 = roots[m2] - c * (1.0 / m2**2 - 1.0 / n**2)
        t0, slope = _secant(lambda t: _axis_residual(t, m, gamma, delta, power, nue), t0, slope, tol)
        roots[m] = t0
    return t0


def _illinois(f, a, b, fa, fb, xtol, maxiter=100):
    """Bracketed root of f on [a, b] (fa < 0 < fb) by the Illinois variant of
    regula falsi (Dowell and Jarratt, BIT 11, 1971, from memory); a non-finite
    value counts as positive (the net broke down: far too strong a fan)."""
    side = 0
    for _ in range(maxiter):
        c = b - fb * (b - a) / (fb - fa) if np.isfinite(fb) else 0.5 * (a + b)
        if not (a < c < b):
            c = 0.5 * (a + b)
        fc = f(c)
        if fc > 0.0 or not np.isfinite(fc):
            b, fb = c, fc
            if side == 1:
                fa *= 0.5
            side = 1
        else:
            a, fa = c, fc
            if side == -1 and np.isfinite(fb):
                fb *= 0.5
            side = -1
        if abs(b - a) <= xtol or fc == 0.0:
            break
    return c


def _secant(f, t0, slope, tol, maxiter=12):
    """Secant iterations from t0 with an initial slope; returns (root, last slope)."""
    f0 = f(t0)
    for _ in range(maxiter):
        if abs(f0) <= tol:
            break
        t1 = t0 - f0 / slope
        f1 = f(t1)
        if t1 == t0:
            break
        if f1 != f0:
            slope = (f1 - f0) / (t1 - t0)
        t0, f0 = t1, f1
    else:
        raise ComputationError("the corner-angle iteration did not converge; try another number of characteristics.")
    return t0, slope


def design_minimum_length(exit_mach, gamma=1.4, geometry="axisymmetric", n=50):
    """Design a minimum-length nozzle for exit Mach number `exit_mach`.

    gamma: ratio of specific heats (or a `moc.gas.PerfectGas`).  n: number of
    characteristics (fan rays).  Returns a `moc.result.Result`
    (kind "design"); lengths in throat half-heights (planar) or radii.
    """
    me, g, delta, n, nue = _check_inputs(exit_mach, gamma, geometry, n)
    try:
        return _design(me, g, delta, n, nue)
    except ComputationError as exc:
        raise ComputationError(
            f"the minimum-length design for Me = {me:g}, gamma = {g:g} with {n} characteristics "
            f"failed: {exc} More characteristics usually help at high exit Mach numbers."
        ) from None


def _design(me, g, delta, n, nue):
    power = CLUSTER_POWER
    theta_c = corner_angle(me, g, delta, n, power)
    cached = _LAST.pop((float(theta_c), n, g, delta, power), None)
    _LAST.clear()
    if cached is not None:
        (fronts, axis_x, axis_nu), fan = cached
        kgrid = Grid.from_fronts(fronts)
        del fronts
    else:
        (kgrid, axis_x, axis_nu), fan = _kernel(theta_c, n, g, delta, power)
    del cached
    nu_e = axis_nu[-1]  # = nue to the root tolerance (exactly for planar)
    mu_e = float(mu_of_nu(np.array([nu_e]), g)[0])

    # the uniform exit C+ from E: m even steps up to the exact lip height (so the
    # lip falls on a grid point at every n) and three more beyond it
    y_exact = area_ratio(me, g) ** (1.0 / (1 + delta))
    m = n + 3
    ye = y_exact * np.arange(m + 1) / n
    xE = kgrid.x[n - 1, n - 1]
    cplus = Points(xE + ye / math.tan(mu_e), ye, np.zeros(m + 1), np.full(m + 1, nu_e), np.full(m + 1, mu_e))
    cminus = kgrid.cminus(n - 1)  # ray n-1 from i = 0 (by the corner) to E (i = n-1)
    F0 = throat_flux(delta)
    kcum, _ = cumulative_flux(kgrid.x, kgrid.y, kgrid.mu, g, delta)
    ggrid = goursat(cminus, cplus, g, delta, flux0=kcum[:, n - 1], flux_target=F0)
    if ggrid.shape != (n, m + 1):  # pruned fronts may end early: pad to the full block
        pad = Grid.empty(n, m + 1)
        for k in ("x", "y", "theta", "nu", "mu"):
            getattr(pad, k)[: ggrid.shape[0], : ggrid.shape[1]] = getattr(ggrid, k)
        ggrid = pad

    # one grid [i, j]: kernel columns 0..n-1, turning-region columns n..n+m-1
    full = Grid(*(np.concatenate([getattr(kgrid, k), getattr(ggrid, k)[:, 1:]], axis=1)
                  for k in ("x", "y", "theta", "nu", "mu")))
    del ggrid, kcum
    wall = mass_balance_wall(full, g, delta, F0)
    del wall["cumulative"]

    # corner (start of the wall): downstream side of the fan
    corner = Points(np.zeros(n), np.ones(n), fan, fan, mu_of_nu(fan, g))
    wx = np.concatenate([[0.0], wall["x"]])
    wy = np.concatenate([[1.0], wall["y"]])
    wth = np.concatenate([[theta_c], wall["theta"]])
    wmu = np.concatenate([[corner.mu[-1]], wall["mu"]])
    wm = 1.0 / np.sin(wmu)

    # streamline check (None in the summary if a very coarse net cannot be traced)
    try:
        sx, sy, sth = trace_streamline(full, 0.0, 1.0, theta_c)
        stream_dy = float(np.max(np.abs(sy - wy)))
        ar_s = float(sy[-1] ** (1 + delta))
    except ComputationError:
        stream_dy = ar_s = None

    # mass balance across the C- rays of the kernel (corner to axis) and across
    # the exit C+ to (n-1, j) then the C- j up to the wall, for the check
    mass_err = _mass_check(full, kgrid, corner, wall, g, delta, n, F0)
    del kgrid

    # exit characteristic: points of the exit C+ inside the wall, then the lip
    inside = np.isfinite(full.x) & (np.arange(n + m)[None, :] <= wall["col"][:, None])
    rr = np.arange(n)
    same = np.hypot(full.x[rr, wall["col"]] - wall["x"], full.y[rr, wall["col"]] - wall["y"]) <= 1e-12 * wx[-1]
    inside[rr[same], wall["col"][same]] = False  # e.g. the lip, a grid point of the exit C+
    ex_cols = np.flatnonzero(inside[n - 1])
    ex_cols = ex_cols[ex_cols >= n - 1]
    exit_ = {
        "x": np.append(full.x[n - 1, ex_cols], wx[-1]),
        "y": np.append(full.y[n - 1, ex_cols], wy[-1]),
        "mach": np.append(full.mach[n - 1, ex_cols], wm[-1]),
        "theta": np.append(full.theta[n - 1, ex_cols], wth[-1]),
    }
    axis_ = {
        "x": np.concatenate([[0.0], axis_x, [wx[-1]]]),
        "mach": np.concatenate([[1.0], 1.0 / np.sin(mu_of_nu(axis_nu, g)), [1.0 / math.sin(mu_e)]]),
    }

    net = _build_net(full, inside, corner, (wx, wy, wth, wm), n, m)
    ar = float(wy[-1] ** (1 + delta))
    ar_i = float(area_ratio(me, g))
    dev = float(np.max(np.abs(exit_["mach"] - me)))
    summary = {
        "geometry": "axisymmetric" if delta else "planar",
        "method": "minimum_length",
        "gamma": g,
        "exit_mach": float(np.mean(exit_["mach"])),
        "exit_mach_max_dev": dev,
        "area_ratio": ar,
        "area_ratio_isentropic": ar_i,
        "area_ratio_error": (ar - ar_i) / ar_i,
        "area_ratio_streamline": ar_s,
        "area_ratio_streamline_error": None if ar_s is None else (ar_s - ar_i) / ar_i,
        "exit_height": float(wy[-1]),
        "length": float(wx[-1]),
        "kernel_length": float(xE),
        "max_wall_angle_deg": float(np.degrees(np.max(wth))),
        "corner_angle_deg": float(np.degrees(theta_c)),
        "initial_turning_angle_deg": float(np.degrees(fan[0])),
        "fan_clustering_power": power,
        "characteristics": n,
        "points": int(net.size),
        "wall_points": int(wx.size),
        "mass_flow_error": mass_err,
        "wall_streamline_difference": stream_dy,
        # the sharp-corner model starts from a straight sonic line of uniform flow: Cd = 1 by construction
        "discharge_coefficient": 1.0,
    }
    inputs = {"method": "minimum_length", "exit_mach": me, "gamma": g,
              "geometry": summary["geometry"], "characteristics": n}
    wall_ = {"x": wx, "y": wy, "theta": wth, "mach": wm, "p_p0": pressure_ratio(wm, g)}
    return Result(kind="design", inputs=inputs, summary=summary, net=net, wall=wall_,
                  axis=axis_, exit=exit_)


def _mass_check(full, kgrid, corner, wall, gamma, delta, n, F0):
    """Largest relative mismatch of the mass flux across characteristics and the throat flux."""
    errs = []
    # kernel C- rays: from the corner down to the axis
    X = np.concatenate([np.zeros((1, n)), kgrid.x], axis=0).T  # rows = rays j, from the corner
    Y = np.concatenate([np.ones((1, n)), kgrid.y], axis=0).T
    MU = np.concatenate([corner.mu[None, :], kgrid.mu], axis=0).T
    cum, _ = cumulative_flux(X, Y, MU, gamma, delta)
    tot = np.nanmax(cum, axis=1)
    errs.append(np.max(np.abs(tot / F0 - 1.0)))
    # turning region: exit C+ from E to column j, then C- j upward to the wall
    ncol = full.shape[1]
    ex_cum, _ = cumulative_flux(full.x[n - 1:n, n - 1:], full.y[n - 1:n, n - 1:], full.mu[n - 1:n, n - 1:],
                                gamma, delta)
    cols = np.arange(n, ncol)
    # C- j runs over rows i = n-1 (exit C+) up to i = 0; reverse to march upward
    Xc, Yc, MUc = (getattr(full, k)[::-1, n:].T for k in ("x", "y", "mu"))
    ccum, _ = cumulative_flux(Xc, Yc, MUc, gamma, delta)
    total = ex_cum[0, 1:][:, None] + ccum  # rows: columns j; entries along C- j upward
    # the C- j crosses the wall between the rows i with col_i < j <= ... use rows still inside
    inside = (cols[:, None] <= wall["col"][::-1][None, :])
    # take, for each C- j, the last point inside and the first outside; the flux at the wall
    # is bracketed; compare by interpolation of the flux in the wall-crossing segment
    last = np.where(inside.any(axis=1), inside.shape[1] - 1 - np.argmax(inside[:, ::-1], axis=1), -1)
    ok = (last >= 0) & (last < inside.shape[1] - 1)
    for jj in np.flatnonzero(ok):
        k = last[jj]
        # wall crossing between points k and k+1 of C- j: distance along the segment
        i_in, i_out = n - 1 - k, n - 2 - k
        xa, ya = full.x[i_in, cols[jj]], full.y[i_in, cols[jj]]
        xb, yb = full.x[i_out, cols[jj]], full.y[i_out, cols[jj]]
        # wall segment between wall points on C+ i_out and C+ i_in (wall["x"] index = row)
        tau = _seg_cross(xa, ya, xb, yb, wall["x"][i_out], wall["y"][i_out], wall["x"][i_in], wall["y"][i_in])
        if tau is None:
            continue
        fl = total[jj, k] + tau * (total[jj, k + 1] - total[jj, k])
        errs.append(abs(fl / F0 - 1.0))
    return float(max(errs))


def _seg_cross(xa, ya, xb, yb, xc, yc, xd, yd):
    """Fraction along AB where it crosses the line CD (None if parallel or outside [0, 1])."""
    rx, ry = xb - xa, yb - ya
    sx, sy = xd - xc, yd - yc
    den = rx * sy - ry * sx
    if den == 0.0:
        return None
    t = ((xc - xa) * sy - (yc - ya) * sx) / den
    return t if -1e-9 <= t <= 1.0 + 1e-9 else None


def _build_net(full, inside, corner, wallpts, n, m):
    """Points inside the nozzle, wall points and the corner fan, with labels and cells."""
    wx, wy, wth, wm = wallpts
    ni, nj = full.shape
    idx = -np.ones((ni, nj), dtype=np.int64)
    ii, jj = np.nonzero(inside)
    npg = ii.size
    idx[ii, jj] = np.arange(npg)
    # corner points (one per fan ray, C+ label -1), then wall points (C+ i, own C- label)
    c0 = npg
    w0 = c0 + n  # wall point on C+ i has number w0 + i; the corner wall point is c0 + n - 1
    x = np.concatenate([full.x[ii, jj], corner.x, wx[1:]])
    y = np.concatenate([full.y[ii, jj], corner.y, wy[1:]])
    th = np.concatenate([full.theta[ii, jj], corner.theta, wth[1:]])
    ma = np.concatenate([full.mach[ii, jj], 1.0 / np.sin(corner.mu), wm[1:]])
    cp = np.concatenate([ii, -np.ones(n, dtype=np.int64), np.arange(n)])
    cm = np.concatenate([jj, np.arange(n), nj + np.arange(n)])
    cells = [grid_cells(idx, inside, np.isfinite(full.x))]
    extra = []
    # corner fan: triangles between consecutive rays next to the corner
    for j in range(n - 1):
        extra.append((c0 + j, idx[0, j], idx[0, j + 1], c0 + j))
    last = [int(np.flatnonzero(inside[i])[-1]) for i in range(ni)]
    # from the corner to the wall along C+ 0
    chain0 = [idx[0, j] for j in range(n - 1, last[0] + 1)] + [w0]
    for a, b in zip(chain0[:-1], chain0[1:]):
        extra.append((c0 + n - 1, a, b, c0 + n - 1))
    # strips between C+ i, C+ i+1 and the wall
    for i in range(ni - 1):
        start = min(last[i], last[i + 1])
        ca = [idx[i, j] for j in range(start, last[i] + 1)] + [w0 + i]
        cb = [idx[i + 1, j] for j in range(start, last[i + 1] + 1)] + [w0 + i + 1]
        extra.extend(zipper(ca, cb, x, y))
    cells.append(np.asarray(extra, dtype=np.int64).reshape(-1, 4))
    arrs = net_arrays(x, y, th, ma, cp, cm, np.concatenate(cells, axis=0))
    return Net(**arrs)

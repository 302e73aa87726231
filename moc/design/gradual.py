"""Gradual-expansion nozzle: rounded throat, initial expansion arc, straightening section.

Layout (x downstream, throat at x = 0):
* the throat wall is a circular arc of radius R (throat units) about (0, 1 + R);
  the flow across it is started on a supersonic initial-value line from a
  published transonic solution (`moc.throat`: Sauer, Hall);
* the arc continues up to the inflection angle theta_a and is followed by a
  straight (conical / wedge) segment at theta_a, tangent to it;
* the kernel, the flow determined by the initial line and this initial
  contour, is marched (`moc.net.march.march_from_line`) until the axis
  reaches the exit Mach number Me at E.  The C- characteristic through E meets
  the initial contour at the attachment point A; the straight segment ends
  there.  (Method of the ideal contour with a specified initial expansion,
  Zucrow and Hoffman, Gas Dynamics vol. 2, 1977, from memory.)
* downstream of AE the flow is the characteristic initial-value (Goursat)
  problem between AE and the uniform exit C+ from E (`moc.net.march.goursat`);
  the straightening wall is the streamline from A carrying the mass that
  crosses AE (mass balance on each C+), checked by streamline tracing.

The C- line through E lies between two computed C- characteristics j and
j+1 of the kernel; it is interpolated linearly between them in the
characteristic coordinate (second order, like the march).

Area ratios: `area_ratio` is the geometric exit area over the geometric
throat area, A_e/A_t = Cd A/A*(Me), with Cd the mass flow the transonic
field carries across the initial line over the one-dimensional sonic flow;
`area_ratio_sonic` = A_e/(Cd A_t) is the ratio to the sonic area and equals
A/A*(Me) for a shock-free uniform exit (mass conservation).
"""

from __future__ import annotations

import math

import numpy as np

from moc import throat as _throat
from moc.errors import ComputationError, InputError, MachError
from moc.flow import area_ratio, pressure_ratio, prandtl_meyer
from moc.flow._checks import check_gamma
from moc.net._pm import mu_of_nu
from moc.net.march import goursat, march_from_line
from moc.net.points import Points
from moc.net.wall import cumulative_flux, mass_balance_wall, throat_flux, trace_streamline
from moc.result import Net, Result

GEOMETRIES = {"planar": 0, "axisymmetric": 1}


class _Contour:
    """Initial contour: throat arc of radius R up to theta_a, then the tangent line."""

    def __init__(self, R, theta_a):
        self.R, self.ta = R, theta_a
        self.xt = R * math.sin(theta_a)
        self.yt = 1.0 + R * (1.0 - math.cos(theta_a))
        self.slope = math.tan(theta_a)

    def __call__(self, x):
        x = np.asarray(x, float)
        xa = np.clip(x, -self.xt, self.xt)
        w = np.sqrt(self.R * self.R - xa * xa)
        on_arc = x <= self.xt
        y = np.where(on_arc, 1.0 + self.R - w, self.yt + self.slope * (x - self.xt))
        return y, np.where(on_arc, xa / w, self.slope)


def _check(exit_mach, gamma, geometry, n, throat_curvature, throat_solution):
    g = check_gamma(gamma)
    if geometry not in GEOMETRIES:
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    try:
        me = float(exit_mach)
    except (TypeError, ValueError):
        raise MachError(f"exit Mach number must be a number above 1, got {exit_mach!r}.") from None
    if not math.isfinite(me) or me <= 1.0:
        raise MachError(f"exit Mach number must be a finite number above 1, got {exit_mach!r}.")
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or n < 5:
        raise InputError(f"the number of characteristics must be a whole number of at least 5, got {n!r}.")
    _throat.check_solution(throat_solution)
    if throat_solution == "kliegel-levine":
        raise InputError(
            "the Kliegel-Levine throat solution provides the discharge coefficient only; "
            "a gradual-expansion design starts from 'sauer' or 'hall'."
        )
    R = _throat.check_curvature(throat_curvature, throat_solution)
    return me, g, GEOMETRIES[geometry], int(n), R


def _line_points(line, g):
    return Points(line.x, line.y, line.theta, prandtl_meyer(line.mach, g), np.arcsin(1.0 / line.mach))


def _kernel(line_pts, contour, g, delta, nue, x_end0):
    """March the kernel just far enough that a wall C- reaches the axis beyond nu_e.

    The march is repeated with a growing end (x 1.15 each time): downstream of
    the attachment point the kernel's straight wall is not part of the nozzle,
    and marching it far can run into the compression its tangency sends to
    the axis.  Returns the grid and the wall-started C- columns ending on the
    axis: (column j, top row, bottom row, axis nu)."""
    def run(x_end):
        grid = march_from_line(line_pts, g, delta, wall=contour, x_end=x_end)
        cols = _wall_columns(grid, contour)
        return grid, cols, len(cols) >= 2 and cols[-1][3] > nue

    # fast: double the end until the axis passes nu_e; on a failure of the net,
    # restart from the last good end with small steps
    x_end, good, growth = x_end0, x_end0, 2.0
    last_exc = None
    for _ in range(80):
        try:
            grid, cols, done = run(x_end)
        except ComputationError as exc:
            last_exc = exc
            if growth == 2.0:
                growth, x_end = 1.1, good * 1.1
                continue
            break
        if done:
            return grid, cols
        good = x_end
        x_end *= growth
        if x_end > 1e3:
            break
    if last_exc is not None:
        raise ComputationError(
            f"marching the kernel downstream of the throat's initial-value line failed before the axis "
            f"reached the exit Mach number ({last_exc}) Try another number of characteristics, throat "
            "curvature or inflection angle."
        )
    raise ComputationError(
        "the kernel did not reach the exit Mach number on the axis within "
        f"x = {x_end:.3g} throat units; choose a larger inflection angle."
    )


def _wall_columns(grid, contour):
    v = grid.valid
    out = []
    for j in range(grid.shape[1]):
        r = np.flatnonzero(v[:, j])
        if r.size < 2:
            continue
        top, bot = int(r[0]), int(r[-1])
        yw, _ = contour(np.array([grid.x[top, j]]))
        if abs(grid.y[top, j] - yw[0]) < 1e-9 and grid.y[bot, j] == 0.0:
            out.append((j, top, bot, float(grid.nu[bot, j])))
    return out


def _lerp_points(p, q, t, g):
    f = [(1.0 - t) * a + t * b for a, b in zip(p[:4], q[:4])]
    return Points(*f, mu_of_nu(np.asarray(f[3]), g))


def _attachment(grid, cols, contour, nue, g, theta_a, strict=True):
    """The C- through the axis point E (nu = nu_e) as Points from A (wall) to E (axis)."""
    nus = np.array([c[3] for c in cols])
    k = int(np.searchsorted(nus, nue))
    if k == 0:
        wall_angle = math.degrees(grid.theta[cols[0][1], cols[0][0]])
        raise InputError(
            f"the initial expansion overshoots the exit Mach number already at wall angle {wall_angle:.3g} deg; "
            "use a larger exit Mach number or a gentler throat (larger radius of curvature)."
        )
    (j0, t0, b0, n0), (j1, t1, b1, n1) = cols[k - 1], cols[k]
    if j1 != j0 + 1 or t1 != t0 + 1 or b1 != b0 + 1:
        raise ComputationError("the kernel's wall characteristics are not consecutive near the attachment point.")
    tau = (nue - n0) / (n1 - n0)
    rows = np.arange(t0 + 1, b0 + 1)
    mid = _lerp_points(grid.at((rows, np.full(rows.size, j0))), grid.at((rows, np.full(rows.size, j1))), tau, g)
    wa, wb = grid.at((np.array([t0]), np.array([j0]))), grid.at((np.array([t1]), np.array([j1])))
    xa = (1.0 - tau) * wa.x + tau * wb.x
    ya, sa = contour(xa)
    nua = (1.0 - tau) * wa.nu + tau * wb.nu
    A = Points(xa, ya, np.arctan(sa), nua, mu_of_nu(nua, g))
    ea, eb = grid.at((np.array([b0]), np.array([j0]))), grid.at((np.array([b1]), np.array([j1])))
    xe = (1.0 - tau) * ea.x + tau * eb.x
    E = Points(xe, np.zeros(1), np.zeros(1), np.array([nue]), mu_of_nu(np.array([nue]), g))
    pts = [A] + [mid.take(slice(i, i + 1)) for i in range(rows.size)] + [E]
    # drop interpolated points crowding A or E (keeps the Goursat cells regular)
    keep = [pts[0]]
    spacing = np.median(np.hypot(np.diff(mid.x), np.diff(mid.y))) if rows.size > 1 else np.inf
    for p in pts[1:-1]:
        if math.hypot(p.x[0] - keep[-1].x[0], p.y[0] - keep[-1].y[0]) > 0.3 * spacing:
            keep.append(p)
    if len(keep) > 1 and math.hypot(keep[-1].x[0] - E.x[0], keep[-1].y[0]) < 0.3 * spacing:
        keep.pop()
    keep.append(E)
    ae = Points(*(np.concatenate([p[f] for p in keep]) for f in range(5)))
    if strict and ae.theta[0] < theta_a - 1e-12 and xa[0] < contour.xt:
        wall_angle = math.degrees(float(ae.theta[0]))
        raise InputError(
            f"inflection angle {math.degrees(theta_a):.4g} deg is too large for this exit Mach number and "
            f"throat: the arc alone reaches the exit Mach number on the axis at wall angle {wall_angle:.4g} deg; "
            f"allowed is 0 < inflection < {wall_angle:.4g} deg."
        )
    return ae, (j0, tau)


def _row_walls(G, ae_cum, g, delta):
    """Mass-balance wall point on each Goursat row i >= 1 (flux from AE point i = flux along AE above it)."""
    out = {k: [] for k in ("x", "y", "theta", "nu", "mu")}
    for i in range(1, G.shape[0]):
        w = mass_balance_wall(G, g, delta, target=float(ae_cum[i]), rows=slice(i, i + 1))
        for k in out:
            out[k].append(float(w[k][0]))
    return {k: np.array(v) for k, v in out.items()}


def _design(me, g, delta, n, R, theta_a, solution, nue):
    geometry = "axisymmetric" if delta else "planar"
    line = _throat.initial_line(R, g, geometry, solution, n=n)
    if theta_a <= line.wall_angle:
        raise InputError(
            f"inflection angle {math.degrees(theta_a):.4g} deg is below the throat-arc wall angle at the "
            f"initial-value line ({math.degrees(line.wall_angle):.4g} deg); allowed is above that and at most "
            f"nu(Me)/2 = {math.degrees(nue / 2):.4g} deg."
        )
    contour = _Contour(R, theta_a)
    pts = _line_points(line, g)
    grid, cols = _kernel(pts, contour, g, delta, nue, contour.xt + 0.5)
    ae, (jstar, tau) = _attachment(grid, cols, contour, nue, g, theta_a)
    F0 = line.mass_flow * throat_flux(delta)
    # flux along AE measured from A downward
    cum, _ = cumulative_flux(ae.x[None, :], ae.y[None, :], ae.mu[None, :], g, delta)
    ae_cum = cum[0]
    mass_err = float(ae_cum[-1] / F0 - 1.0)
    mu_e = float(ae.mu[-1])
    # exit C+ sized for the mass crossing AE (the Goursat region carries exactly that)
    y_exact = (ae_cum[-1] * (1 + delta) * area_ratio(me, g)) ** (1.0 / (1 + delta))
    m = n + n // 5
    ye = y_exact * 1.2 * np.arange(m + 1) / m
    cplus = Points(ae.x[-1] + ye / math.tan(mu_e), ye, np.zeros(m + 1), np.full(m + 1, nue), np.full(m + 1, mu_e))
    G = goursat(ae, cplus, g, delta)
    wall = _row_walls(G, ae_cum, g, delta)
    # streamline check from A across the Goursat C+ rows
    sx, sy, sth = trace_streamline(G, float(ae.x[0]), float(ae.y[0]), float(ae.theta[0]), rows=range(1, G.shape[0]))
    stream_dy = float(np.max(np.abs(sy[1:] - wall["y"])))
    return dict(line=line, contour=contour, grid=grid, jstar=jstar, tau=tau, ae=ae, G=G, wall=wall,
                stream=(sx, sy, sth), stream_dy=stream_dy, mass_err=mass_err, F0=F0, mu_e=mu_e)


def _assemble(me, g, delta, n, R, theta_a, solution, nue, d):
    geometry = "axisymmetric" if delta else "planar"
    line, contour, grid, ae, G, wall = d["line"], d["contour"], d["grid"], d["ae"], d["G"], d["wall"]
    jstar = d["jstar"]
    # wall: throat arc up to the initial line, kernel wall points before A, A, straightening section
    x0 = float(line.x[-1])
    xa_ = np.linspace(0.0, x0, 9)[:-1]
    ya_, sa_ = contour(xa_)
    ma_ = _throat.state(xa_, ya_, R, g, geometry, solution)[1]
    kv = grid.valid
    kx, ky = np.where(kv, grid.x, np.nan), np.where(kv, grid.y, np.nan)
    yw, _ = contour(np.nan_to_num(kx))
    on_wall = kv & (np.abs(ky - yw) < 1e-9) & (kx < ae.x[0]) & (np.arange(grid.shape[1])[None, :] <= jstar)
    wi, wj = np.nonzero(on_wall)
    order = np.argsort(grid.x[wi, wj])
    wi, wj = wi[order], wj[order]
    wx = np.concatenate([xa_, grid.x[wi, wj], ae.x[:1], wall["x"]])
    wy = np.concatenate([ya_, grid.y[wi, wj], ae.y[:1], wall["y"]])
    wth = np.concatenate([np.arctan(sa_), grid.theta[wi, wj], ae.theta[:1], wall["theta"]])
    wm = np.concatenate([ma_, grid.mach[wi, wj], 1.0 / np.sin(ae.mu[:1]), 1.0 / np.sin(wall["mu"])])
    # net points: kernel columns up to j*, the line AE, Goursat points inside the wall
    keep_k = kv & (np.arange(grid.shape[1])[None, :] <= jstar)
    ki, kj = np.nonzero(keep_k)
    ni, nk = G.shape
    inside = G.valid.copy()
    for i in range(1, ni):
        wxi = wall["x"][i - 1]
        inside[i] &= G.x[i] <= wxi + 1e-12
    inside[0, 1:] = False
    inside[:, 0] = False  # AE itself is added once below
    gi, gk = np.nonzero(inside)
    # C+ labels: kernel rows; AE point i continues the kernel row it was interpolated on
    ae_rows = np.arange(ni) + int(grid.shape[0])  # fresh labels for the Goursat C+ lines
    x = np.concatenate([grid.x[ki, kj], ae.x, G.x[gi, gk], wall["x"]])
    y = np.concatenate([grid.y[ki, kj], ae.y, G.y[gi, gk], wall["y"]])
    th = np.concatenate([grid.theta[ki, kj], ae.theta, G.theta[gi, gk], wall["theta"]])
    ma = np.concatenate([grid.mach[ki, kj], 1.0 / np.sin(ae.mu), 1.0 / np.sin(G.mu[gi, gk]), 1.0 / np.sin(wall["mu"])])
    j_ae = jstar + 1
    cp = np.concatenate([ki, ae_rows, ae_rows[gi], ae_rows[1:]])
    cm = np.concatenate([kj, np.full(ni, j_ae), j_ae + gk, j_ae + nk + np.arange(ni - 1)])
    cells = _cells(x, y, wx, wy)
    net = Net(x=x, y=y, theta=th, mach=ma, cplus=cp, cminus=cm, cells=cells)
    # exit: the uniform exit C+ from E up to the lip
    last = G.shape[0] - 1
    ex_ok = inside[last] | (np.arange(nk) == 0)
    exit_ = {
        "x": np.append(G.x[last, ex_ok], wall["x"][-1]),
        "y": np.append(G.y[last, ex_ok], wall["y"][-1]),
        "mach": np.append(1.0 / np.sin(G.mu[last, ex_ok]), 1.0 / np.sin(wall["mu"][-1])),
        "theta": np.append(G.theta[last, ex_ok], wall["theta"][-1]),
    }
    axis_pts = kv & (grid.y == 0.0) & (np.arange(grid.shape[1])[None, :] <= jstar)
    ax_x = np.append(np.sort(grid.x[axis_pts]), [ae.x[-1], wall["x"][-1]])
    ax_m = np.append(grid.mach[axis_pts][np.argsort(grid.x[axis_pts])], [me, me])
    axis_ = {"x": ax_x, "mach": ax_m}
    cd = float(line.mass_flow)
    ar = float(wy[-1] ** (1 + delta))
    ar_s = float(d["stream"][1][-1] ** (1 + delta))
    ar_i = float(area_ratio(me, g))
    dev = float(np.max(np.abs(exit_["mach"] - me)))
    summary = {
        "geometry": geometry,
        "method": "gradual",
        "gamma": g,
        "exit_mach": float(np.mean(exit_["mach"])),
        "exit_mach_max_dev": dev,
        "area_ratio": ar,
        "area_ratio_sonic": ar / cd,
        "area_ratio_isentropic": ar_i,
        "area_ratio_error": (ar / cd - ar_i) / ar_i,
        "area_ratio_streamline": ar_s,
        "area_ratio_streamline_error": (ar_s / cd - ar_i) / ar_i,
        "exit_height": float(wy[-1]),
        "length": float(wx[-1]),
        "kernel_length": float(ae.x[-1]),
        "attachment_x": float(ae.x[0]),
        "straight_length": float(max(ae.x[0] - contour.xt, 0.0)),
        "max_wall_angle_deg": float(np.degrees(np.max(wth))),
        "inflection_angle_deg": float(math.degrees(theta_a)),
        "throat_curvature": R,
        "throat_solution": solution,
        "discharge_coefficient": cd,
        "discharge_coefficient_published": float(_throat.discharge_coefficient(R, g, geometry, solution)),
        "sonic_shift": float(line.sonic_shift),
        "initial_line_x": x0,
        "characteristics": n,
        "points": int(net.size),
        "wall_points": int(wx.size),
        "mass_flow_error": d["mass_err"],
        "wall_streamline_difference": d["stream_dy"],
    }
    inputs = {"method": "gradual", "exit_mach": me, "gamma": g, "geometry": geometry, "characteristics": n,
              "throat_curvature": R, "inflection_deg": math.degrees(theta_a), "throat_solution": solution}
    wall_ = {"x": wx, "y": wy, "theta": wth, "mach": wm, "p_p0": pressure_ratio(wm, g)}
    return Result(kind="design", inputs=inputs, summary=summary, net=net, wall=wall_, axis=axis_, exit=exit_)


def _cells(x, y, wx, wy):
    """Triangles of the net points inside the wall (Delaunay), as quads with a repeated corner."""
    from scipy.spatial import Delaunay

    tri = Delaunay(np.column_stack([x, y])).simplices
    cx, cy = x[tri].mean(axis=1), y[tri].mean(axis=1)
    inside = cy <= np.interp(cx, wx, wy) + 1e-12
    # drop slivers spanning the outside of a concave wall
    t = tri[inside]
    cells = np.column_stack([t, t[:, 0]])
    px, py = x[cells], y[cells]
    area = 0.5 * np.sum(px * np.roll(py, -1, axis=1) - np.roll(px, -1, axis=1) * py, axis=1)
    cells[area < 0] = cells[area < 0][:, ::-1]
    return cells


def max_inflection_deg(exit_mach, gamma=1.4, geometry="axisymmetric", n=50, throat_curvature=2.0,
                       throat_solution="sauer"):
    """Largest inflection angle (degrees) for these inputs: the wall angle at which the
    throat arc, continued without a straight segment, is met by the C- from the axis
    point where M = Me.  Designs up to this angle exist; at it the straight segment
    has zero length.
    """
    me, g, delta, n, R = _check(exit_mach, gamma, geometry, n, throat_curvature, throat_solution)
    nue = prandtl_meyer(me, g)
    line = _throat.initial_line(R, g, "axisymmetric" if delta else "planar", throat_solution, n=n)
    contour = _Contour(R, 0.5 * nue)
    grid, cols = _kernel(_line_points(line, g), contour, g, delta, nue, 0.5)
    ae, _ = _attachment(grid, cols, contour, nue, g, 0.5 * nue, strict=False)
    return float(np.degrees(ae.theta[0]))


def design_gradual(exit_mach, gamma=1.4, geometry="axisymmetric", n=50, throat_curvature=2.0,
                   inflection_deg=None, length=None, throat_solution="sauer"):
    """Design a gradual-expansion nozzle (rounded throat, arc, straightening section) for `exit_mach`.

    Give the inflection angle `inflection_deg` (wall angle at the end of the
    initial expansion, degrees) or a target `length` (throat units; the angle
    is solved for).  n: points on the initial-value line (characteristics).
    Returns a `moc.result.Result` (kind "design").
    """
    me, g, delta, n, R = _check(exit_mach, gamma, geometry, n, throat_curvature, throat_solution)
    nue = prandtl_meyer(me, g)
    if (inflection_deg is None) == (length is None):
        raise InputError("give exactly one of inflection_deg (inflection angle) or length (target nozzle length).")
    if inflection_deg is not None:
        try:
            ta = math.radians(float(inflection_deg))
        except (TypeError, ValueError):
            raise InputError(f"inflection angle must be a number in degrees, got {inflection_deg!r}.") from None
        if not math.isfinite(ta) or ta <= 0.0 or ta > 0.5 * nue:
            raise InputError(
                f"inflection angle {inflection_deg!r} deg is outside what exit Mach {me:g} allows: "
                f"0 < inflection <= nu(Me)/2 = {math.degrees(0.5 * nue):.4g} deg."
            )
        d = _design(me, g, delta, n, R, ta, throat_solution, nue)
        return _assemble(me, g, delta, n, R, ta, throat_solution, nue, d)
    return _design_for_length(me, g, delta, n, R, float(length), throat_solution, nue)


def _design_for_length(me, g, delta, n, R, target, solution, nue):
    """Solve for the inflection angle giving the target length (Brent on a coarse net, secant on n)."""
    from scipy.optimize import brentq

    if not math.isfinite(target) or target <= 0:
        raise InputError(f"target length must be a positive number of throat units, got {target!r}.")
    geometry = "axisymmetric" if delta else "planar"
    line = _throat.initial_line(R, g, geometry, solution, n=5)
    lo = line.wall_angle * 1.05 + math.radians(0.2)
    hi = 0.5 * nue

    def length_at(ta, m):
        d = _design(me, g, delta, m, R, ta, solution, nue)
        return float(d["wall"]["x"][-1])

    # bracket: the largest angle the arc allows (shortest nozzle) and the smallest angle
    # for which the net can be built (longest nozzle)
    m0 = min(n, 30)
    hi = math.radians(max_inflection_deg(me, g, geometry, m0, R, solution)) * 0.999
    l_hi = length_at(hi, m0)
    if target < l_hi:
        raise InputError(
            f"target length {target:g} is shorter than the shortest gradual nozzle for these inputs "
            f"({l_hi:.4g} throat units, inflection {math.degrees(hi):.3g} deg); allowed is at least {l_hi:.4g}."
        )
    l_lo = None
    while lo < hi:
        try:
            l_lo = length_at(lo, m0)
            break
        except ComputationError:
            lo += math.radians(0.5)
    if l_lo is None or target > l_lo:
        longest = l_lo if l_lo is not None else l_hi
        raise InputError(
            f"target length {target:g} is longer than the gentlest design this net can build "
            f"({longest:.4g} throat units, inflection {math.degrees(lo):.3g} deg); allowed is at most {longest:.4g}."
        )
    ta = brentq(lambda t: length_at(t, m0) - target, lo, hi, xtol=1e-6)
    # secant on the full net
    t0, f0 = ta, length_at(ta, n) - target
    t1 = ta * (1.0 + 1e-3)
    for _ in range(6):
        f1 = length_at(min(t1, hi), n) - target
        if abs(f1) < 1e-6 * target or f1 == f0:
            break
        t0, t1, f0 = t1, t1 - f1 * (t1 - t0) / (f1 - f0), f1
    t1 = min(max(t1, lo), hi)
    d = _design(me, g, delta, n, R, t1, solution, nue)
    res = _assemble(me, g, delta, n, R, t1, solution, nue, d)
    res.summary["target_length"] = target
    res.inputs["length"] = target
    return res

"""Gradual-expansion nozzle: rounded throat, initial expansion, straightening section.

Layout (x downstream, throat at x = 0):
* the throat wall is a circular arc of radius R (throat units) about
  (0, 1 + R); the flow is started on an initial C- characteristic of a
  published transonic solution (`moc.throat`: Sauer, Hall);
* the arc runs to half the inflection angle theta_a, a curvature blend
  (curvature falling linearly to zero) turns the wall to theta_a, and a
  straight (conical / wedge) segment follows;
* the kernel, the flow determined by the initial characteristic and this
  initial contour, is marched as a zig-zag net of C- lines leaving the wall
  (unit processes of `moc.net.rotational`) until the axis reaches the exit
  Mach number Me at E.  The C- characteristic through E meets the initial
  contour at the attachment point A; the straight segment ends there
  (ideal contour with a specified initial expansion, Zucrow and Hoffman, Gas
  Dynamics vol. 2, 1977, from memory);
* downstream of AE the flow is the characteristic initial-value (Goursat)
  problem between AE and the uniform exit C+ from E (`moc.net.march.goursat`);
  the straightening wall is the streamline from A carrying the mass that
  crosses AE (mass balance on each C+), checked by streamline tracing.

The C- through E lies between two computed C- characteristics a and a+1 of
the kernel; it is interpolated linearly between them in the characteristic
coordinate (second order, like the march).

Area ratios: `area_ratio` is the geometric exit area over the geometric
throat area, A_e/A_t = Cd A/A*(Me), with Cd the mass flow the transonic
field carries across the initial characteristic over the one-dimensional
sonic flow; `area_ratio_sonic` = A_e/(Cd A_t) is the ratio to the sonic area
and equals A/A*(Me) for a shock-free uniform exit (mass conservation).
"""

from __future__ import annotations

import math

import numpy as np

from moc import throat as _throat
from moc.errors import ComputationError, InputError
from moc.flow import area_ratio, pressure_ratio, prandtl_meyer
from moc.design._inputs import check_design_inputs
from moc.net._pm import mu_of_nu
from moc.net.march import goursat
from moc.net.points import Points
from moc.net.wall import cumulative_flux, mass_balance_wall, throat_flux, trace_streamline
from moc.result import Net, Result



class _Contour:
    """Initial contour: throat arc, curvature blend, tangent line.

    From the throat the wall is the circular arc of radius R (the throat
    curvature of the transonic solution) up to half the inflection angle; its
    curvature then falls linearly with arc length to zero where the wall
    reaches theta_a (a clothoid blend of length R theta_a), and a straight
    segment at theta_a follows.  The continuous curvature matters in
    axisymmetric flow: a sudden arc-to-cone tangency sends compression waves
    that fold near the axis (an internal shock; measured with the net for
    Me = 3, R = 2, theta_a = 12 deg) before the axis reaches Me.
    """

    def __init__(self, R, theta_a, blend=0.5):
        self.R, self.ta = R, theta_a
        self.th1 = (1.0 - blend) * theta_a
        self.s1 = R * self.th1
        self.sb = 2.0 * R * (theta_a - self.th1)
        self.x1 = R * math.sin(self.th1)
        s = np.linspace(0.0, self.sb, 4001)
        th = self._theta_blend(s)
        c, sn = np.cos(th), np.sin(th)
        ds = np.diff(s)
        self.bx = self.x1 + np.concatenate([[0.0], np.cumsum(0.5 * (c[1:] + c[:-1]) * ds)])
        self.by = 1.0 + R * (1.0 - math.cos(self.th1)) + np.concatenate([[0.0], np.cumsum(0.5 * (sn[1:] + sn[:-1]) * ds)])
        self.bs = s
        self.xt, self.yt = float(self.bx[-1]), float(self.by[-1])
        self.slope = math.tan(theta_a)

    def _theta_blend(self, s):
        return self.th1 + s / self.R - s * s / (2.0 * self.R * self.sb) if self.sb > 0 else np.full_like(s, self.th1)

    def __call__(self, x):
        x = np.asarray(x, float)
        xa = np.clip(x, -self.x1, self.x1)
        w = np.sqrt(self.R * self.R - xa * xa)
        y = np.where(x <= self.x1, 1.0 + self.R - w, self.yt + self.slope * (x - self.xt))
        dy = np.where(x <= self.x1, xa / w, self.slope)
        inb = (x > self.x1) & (x < self.xt)
        if np.any(inb):
            sb = np.interp(x[inb], self.bx, self.bs)
            y = np.array(y, float)
            dy = np.array(dy, float)
            y[inb] = np.interp(x[inb], self.bx, self.by)
            dy[inb] = np.tan(self._theta_blend(sb))
        return y, dy


def _check(exit_mach, gamma, geometry, n, throat_curvature, throat_solution):
    me, g, delta, n = check_design_inputs(exit_mach, gamma, geometry, n, min_n=5)
    _throat.check_solution(throat_solution)
    if throat_solution == "kliegel-levine":
        raise InputError(
            "the Kliegel-Levine throat solution provides the discharge coefficient only; "
            "a gradual-expansion design starts from 'sauer' or 'hall'."
        )
    R = _throat.check_curvature(throat_curvature, throat_solution)
    return me, g, delta, n, R


class _TooLarge(Exception):
    """The attachment point lies on the curved part: the inflection angle is too large."""


class _WallCurve:
    """The initial contour in the form the net's wall point takes (y_of, angle)."""

    def __init__(self, contour):
        self.c = contour

    def y_of(self, x):
        return self.c(x)[0]

    def angle(self, x):
        return np.arctan(self.c(x)[1])


def _kernel(init, contour, g, delta, nue, max_rows=20000):
    """Kernel net from the initial C- (wall first) along the initial contour.

    Zig-zag net of C- characteristics leaving the wall: point [a, d] lies on
    C- number a (a = 0 the initial characteristic) and d = 0 (axis) .. W
    (wall); it is the meeting of the C- through [a, d+1] and the C+ through
    [a-1, d-1], so each front 2a - d = const is one array operation with the
    net's unit processes (moc.net.rotational: interior, wall and axis
    points).  The march stops at the first C- whose axis point passes nu_e.
    Returns dict of 2-D arrays (rows a, columns d) and the number of rows.
    """
    from moc.net import rotational as rp

    W = init["x"].size - 1
    wall = _WallCurve(contour)
    keys = rp.KEYS
    cap = 256
    data = {k: np.full((cap, W + 1), np.nan) for k in keys}
    first = {"x": init["x"][::-1], "y": init["y"][::-1], "theta": init["theta"][::-1],
             "mach": init["mach"][::-1], "nu": prandtl_meyer(init["mach"][::-1], g),
             "lnp0": np.zeros(W + 1)}
    for k in keys:
        data[k][0] = first[k]
    s = 2 - W
    while True:
        d = np.arange(W + 1)
        d = d[(d % 2) == (s % 2)]
        a = (s + d) // 2
        keep = a >= 1
        d, a = d[keep], a[keep]
        top = int(a.max())
        if top >= cap:
            if top >= max_rows:
                raise ComputationError(
                    f"the kernel needed more than {max_rows} characteristics without reaching the exit Mach "
                    "number on the axis; choose a larger inflection angle."
                )
            for k in keys:
                data[k] = np.vstack([data[k], np.full((cap, W + 1), np.nan)])
            cap *= 2
        mid = (d > 0) & (d < W)
        if np.any(mid):
            am, dm = a[mid], d[mid]
            P = rp.interior({k: data[k][am - 1, dm - 1] for k in keys}, {k: data[k][am, dm + 1] for k in keys},
                            g, delta)
            for k in keys:
                data[k][am, dm] = P[k]
        if np.any(d == W):
            aw = int(a[d == W][0])
            P = rp.wall_point({k: data[k][aw - 1, W - 1] for k in keys}, wall, g, delta)
            for k in keys:
                data[k][aw, W] = np.asarray(P[k], float)
        if np.any(d == 0):
            aa = int(a[d == 0][0])
            P = rp.axis_point({k: data[k][aa, 1] for k in keys}, g, delta)
            for k in keys:
                data[k][aa, 0] = np.asarray(P[k], float)
            row_ok = np.all(np.isfinite(data["nu"][aa]))
            if not row_ok:
                raise ComputationError(
                    f"the kernel's characteristic net broke down on C- characteristic {aa} (a point could not "
                    "be computed: folded or subsonic flow) before the axis reached the exit Mach number; "
                    "try a smaller inflection angle or a gentler throat."
                )
            if data["nu"][aa, 0] > nue:
                rows = aa + 1
                return {k: v[:rows] for k, v in data.items()}, rows
        s += 1


def _attachment(K, contour, nue, g, theta_a, strict=True):
    """The C- through the axis point E (nu = nu_e), as Points from A (wall) to E (axis).

    E lies between the axis ends of C- rows a and a+1 of the kernel; the
    characteristic through it is row a + tau, interpolated point by point.
    """
    nu_ax = K["nu"][:, 0]
    a1 = int(np.argmax(nu_ax > nue))
    if a1 == 0:
        raise InputError(
            "the initial characteristic already reaches the exit Mach number on the axis; "
            "use a larger exit Mach number."
        )
    a0 = a1 - 1
    tau = (nue - nu_ax[a0]) / (nu_ax[a1] - nu_ax[a0])
    f = {k: ((1.0 - tau) * K[k][a0] + tau * K[k][a1])[::-1] for k in ("x", "y", "theta", "nu")}  # wall first
    ya, sa = contour(f["x"][:1])
    f["y"][0], f["theta"][0] = ya[0], np.arctan(sa[0])
    f["y"][-1], f["theta"][-1], f["nu"][-1] = 0.0, 0.0, nue
    ae = Points(f["x"], f["y"], f["theta"], f["nu"], mu_of_nu(f["nu"], g))
    folded = (np.diff(ae.x) <= 0.0) | (np.diff(ae.y) >= 0.0)
    if np.any(folded):
        k = int(np.flatnonzero(folded)[0])
        raise ComputationError(
            f"the kernel's C+ characteristics cross near x = {ae.x[k]:.4g}, y = {ae.y[k]:.4g} (an internal "
            "shock would form there), so no shock-free gradual nozzle follows from these inputs; "
            "use a larger throat radius of curvature or another inflection angle."
        )
    if strict and ae.x[0] < contour.xt:
        raise _TooLarge(float(ae.x[0]), float(math.degrees(ae.theta[0])))
    return ae, (a0, tau)


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
    init = _throat.initial_cminus(R, g, geometry, solution, n=n)
    contour = _Contour(R, theta_a)
    K, rows = _kernel(init, contour, g, delta, nue)
    ae, (a0, tau) = _attachment(K, contour, nue, g, theta_a)
    F0 = init["mass_flow"] * throat_flux(delta)
    # flux along AE measured from A downward
    cum, _ = cumulative_flux(ae.x[None, :], ae.y[None, :], ae.mu[None, :], g, delta)
    ae_cum = cum[0]
    mass_err = float(ae_cum[-1] / F0 - 1.0)
    mu_e = float(ae.mu[-1])
    # exit C+ sized for the mass crossing AE (the Goursat region carries exactly that)
    y_exact = (ae_cum[-1] * (1 + delta) * area_ratio(me, g)) ** (1.0 / (1 + delta))
    m = n + n // 5
    ye = y_exact * 1.23 * np.arange(m + 1) / m
    cplus = Points(ae.x[-1] + ye / math.tan(mu_e), ye, np.zeros(m + 1), np.full(m + 1, nue), np.full(m + 1, mu_e))
    G = goursat(ae, cplus, g, delta)
    wall = _row_walls(G, ae_cum, g, delta)
    # streamline check from A across the Goursat C+ rows
    sx, sy, sth = trace_streamline(G, float(ae.x[0]), float(ae.y[0]), float(ae.theta[0]), rows=range(1, G.shape[0]))
    stream_dy = float(np.max(np.abs(sy[1:] - wall["y"])))
    return dict(init=init, contour=contour, K=K, a0=a0, tau=tau, ae=ae, G=G, wall=wall,
                stream=(sx, sy, sth), stream_dy=stream_dy, mass_err=mass_err, F0=F0, mu_e=mu_e)


def _assemble(me, g, delta, n, R, theta_a, solution, nue, d):
    geometry = "axisymmetric" if delta else "planar"
    init, contour, K, ae, G, wall = d["init"], d["contour"], d["K"], d["ae"], d["G"], d["wall"]
    a0 = d["a0"]
    W = init["x"].size - 1
    # wall: throat arc from the throat (or the initial C-'s wall point, if downstream
    # of it) to the start of the kernel, kernel wall points up to row a0, A, straightening
    # (the wall starts at the throat, x = 0; kernel wall points upstream of it, on the
    # converging side of the arc where the initial characteristic meets the wall, are
    # left to the inlet)
    xw0 = float(init["x"][0])
    xa_ = np.linspace(0.0, xw0, 9)[:-1] if xw0 > 0.0 else np.array([0.0])
    ya_, sa_ = contour(xa_)
    ma_ = _throat.state(xa_, ya_, R, g, geometry, solution)[1]
    kw = slice(0, a0 + 1)
    kx, ky, kth, kn = (K[k][kw, W] for k in ("x", "y", "theta", "nu"))
    km = K["mach"][kw, W]
    down = kx > xa_[-1] + 1e-12
    kx, ky, kth, km = kx[down], ky[down], kth[down], km[down]
    wx = np.concatenate([xa_, kx, ae.x[:1], wall["x"]])
    wy = np.concatenate([ya_, ky, ae.y[:1], wall["y"]])
    wth = np.concatenate([np.arctan(sa_), kth, ae.theta[:1], wall["theta"]])
    wm = np.concatenate([ma_, km, 1.0 / np.sin(ae.mu[:1]), 1.0 / np.sin(wall["mu"])])
    # net points: kernel rows 0..a0, the C- AE, Goursat points inside the wall
    ni, nk = G.shape
    inside = G.valid.copy()
    for i in range(1, ni):
        inside[i] &= G.x[i] <= wall["x"][i - 1] + 1e-12
    inside[0, :] = False
    inside[:, 0] = False  # AE itself is added once below
    gi, gk = np.nonzero(inside)
    rows_k, cols_d = np.meshgrid(np.arange(a0 + 1), np.arange(W + 1), indexing="ij")
    rk, dk = rows_k.ravel(), cols_d.ravel()
    x = np.concatenate([K["x"][kw].ravel(), ae.x, G.x[gi, gk], wall["x"]])
    y = np.concatenate([K["y"][kw].ravel(), ae.y, G.y[gi, gk], wall["y"]])
    th = np.concatenate([K["theta"][kw].ravel(), ae.theta, G.theta[gi, gk], wall["theta"]])
    ma = np.concatenate([K["mach"][kw].ravel(), 1.0 / np.sin(ae.mu), 1.0 / np.sin(G.mu[gi, gk]),
                         1.0 / np.sin(wall["mu"])])
    # labels: kernel C- = row a, C+ = a - d (shifted to start at 0); AE is C- a0 + 1 and its
    # point i (from the wall, d = W - i) continues the C+ a0 + 1 - (W - i); Goursat columns
    # k are further C- lines, rows keep their C+ label
    shift = W
    cp_ae = (a0 + 1) - (W - np.arange(ni)) + shift
    cp = np.concatenate([rk - dk + shift, cp_ae, cp_ae[gi], cp_ae[1:]])
    cm = np.concatenate([rk, np.full(ni, a0 + 1), a0 + 1 + gk, a0 + 1 + nk + np.arange(ni - 1)])
    cells = _cells(x, y, wx, wy)
    net = Net(x=x, y=y, theta=th, mach=ma, cplus=cp, cminus=cm, cells=cells)
    # exit: the uniform exit C+ from E up to the lip
    last = ni - 1
    ex_ok = (inside[last] | (np.arange(nk) == 0)) & (G.y[last] < wall["y"][-1] - 1e-12)
    exit_ = {
        "x": np.append(G.x[last, ex_ok], wall["x"][-1]),
        "y": np.append(G.y[last, ex_ok], wall["y"][-1]),
        "mach": np.append(1.0 / np.sin(G.mu[last, ex_ok]), 1.0 / np.sin(wall["mu"][-1])),
        "theta": np.append(G.theta[last, ex_ok], wall["theta"][-1]),
    }
    axis_ = {"x": np.concatenate([K["x"][kw, 0], ae.x[-1:], wall["x"][-1:]]),
             "mach": np.concatenate([K["mach"][kw, 0], [me, me]])}
    cd = float(init["mass_flow"])
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
        "sonic_shift": float(init["sonic_shift"]),
        "initial_line_x": float(init["x"][-1]),
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
                       throat_solution="sauer", tol_deg=0.01):
    """Largest inflection angle (degrees) for these inputs, to `tol_deg`.

    At that angle the C- from the axis point where M = Me meets the wall
    exactly where the initial contour reaches the inflection angle (no
    straight segment); above it the initial expansion alone overshoots Me.
    Found by bisection on designs' kernels (each a march of the net).
    """
    me, g, delta, n, R = _check(exit_mach, gamma, geometry, n, throat_curvature, throat_solution)
    nue = prandtl_meyer(me, g)
    init = _throat.initial_cminus(R, g, "axisymmetric" if delta else "planar", throat_solution, n=n)

    def feasible(ta):
        contour = _Contour(R, ta)
        try:
            K, _ = _kernel(init, contour, g, delta, nue)
        except ComputationError:
            return True   # the net failed downstream: not an overshoot of the initial expansion
        ae, _ = _attachment(K, contour, nue, g, ta, strict=False)
        return bool(ae.x[0] >= contour.xt)

    lo, hi = 0.0, 0.5 * nue
    if feasible(hi):
        return float(math.degrees(hi))
    while math.degrees(hi - lo) > tol_deg:
        mid = 0.5 * (lo + hi)
        if feasible(mid):
            lo = mid
        else:
            hi = mid
    return float(math.degrees(lo))


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
        try:
            d = _design(me, g, delta, n, R, ta, throat_solution, nue)
        except _TooLarge as exc:
            top = max_inflection_deg(me, g, geometry, n, R, throat_solution, tol_deg=0.05)
            raise InputError(
                f"inflection angle {inflection_deg:g} deg is too large for exit Mach {me:g} with throat "
                f"curvature {R:g}: the initial expansion reaches Me on the axis before the wall turns that far "
                f"(attachment at x = {exc.args[0]:.4g}, wall angle {exc.args[1]:.4g} deg); allowed is "
                f"0 < inflection <= {top:.3f} deg."
            ) from None
        return _assemble(me, g, delta, n, R, ta, throat_solution, nue, d)
    return _design_for_length(me, g, delta, n, R, float(length), throat_solution, nue)


def _design_for_length(me, g, delta, n, R, target, solution, nue):
    """Solve for the inflection angle giving the target length (Brent on a coarse net, secant on n)."""
    from scipy.optimize import brentq

    if not math.isfinite(target) or target <= 0:
        raise InputError(f"target length must be a positive number of throat units, got {target!r}.")
    geometry = "axisymmetric" if delta else "planar"
    lo = math.radians(1.0)

    def length_at(ta, m):
        try:
            d = _design(me, g, delta, m, R, ta, solution, nue)
        except _TooLarge:
            raise ComputationError("the inflection angle is above the largest one for this net.") from None
        return float(d["wall"]["x"][-1])

    # bracket: the largest angle the arc allows (shortest nozzle) and the smallest angle
    # for which the net can be built (longest nozzle)
    m0 = min(n, 30)
    hi = math.radians(max_inflection_deg(me, g, geometry, m0, R, solution, tol_deg=0.05)) * 0.995
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

"""Marching the characteristic net front by front.

Every point of a front depends only on the previous front, so each front is a
handful of array operations (interior points of consecutive pairs, plus the
boundary points at its two ends).  Three drivers share this pattern:

* `march_fan`: the kernel behind a sharp sonic corner, C- rays of a centered
  expansion fan from the corner reflected at the axis;
* `march_from_line`: the net downstream of an initial-value line crossing the
  flow from the axis upward, with a free upper end (domain of dependence) or
  an upper wall given as a curve;
* `goursat`: the characteristic initial-value (Goursat) problem between a C-
  and a C+ characteristic that meet at a point.

Labels: i is the C+ index, j the C- index of a point.  Grids are `Grid`s.
"""

import numpy as np

from moc.errors import ComputationError, InputError
from moc.net.grid import Grid
from moc.net.points import Points, concat
from moc.net.unit import axis_point, interior_point, inverse_wall_point

class _Axis:
    """Axis points of one march, and the source term at the latest one."""

    def __init__(self, gamma, delta):
        self.gamma, self.delta = gamma, delta
        self.xs, self.nus = [], []
        self.last_source = np.nan  # source term at the latest axis point

    def add(self, x, nu, src=np.nan):
        self.xs.append(float(x))
        self.nus.append(float(nu))
        self.last_source = float(src)

    def point(self, a):
        p, src = axis_point(a, self.gamma, self.delta, return_source=True)
        self.add(p.x[0], p.nu[0], src[0])
        return p


def _pairs(front, gamma, delta, source0=None, corner=None, forward=True):
    """Interior points from consecutive pairs: C+ from front[k], C- from front[k+1].

    `source0`: source term of front[0] when it lies on the axis.  `corner`:
    the points C opposite each new point P in its characteristic cell (the
    front before `front`; NaN where none), for the parallelogram starting
    estimate P ~ A + B - C."""
    a = front.take(slice(0, -1))
    b = front.take(slice(1, None))
    sa = None
    if source0 is not None and delta:
        sa = np.full(len(a), np.nan)
        sa[0] = source0
    if corner is not None:
        guess = (a.theta + b.theta - corner.theta, a.mu + b.mu - corner.mu, a.y + b.y - corner.y)
        try:
            return interior_point(a, b, gamma, delta, source_a=sa, guess=guess, cminus_forward=forward)
        except ComputationError:  # a poor estimate (strong gradients): start as usual
            pass
    return interior_point(a, b, gamma, delta, source_a=sa, cminus_forward=forward)


def _opposite(prev, prev_labels, labels):
    """Points of `prev` (labels `prev_labels`, a contiguous run) with the given labels; NaN outside."""
    if prev is None or len(prev) == 0:
        return None
    step = 1 if len(prev_labels) < 2 else int(prev_labels[1] - prev_labels[0])
    pos = (labels - prev_labels[0]) * step
    ok = (pos >= 0) & (pos < len(prev))
    posc = np.where(ok, pos, 0)
    out = prev.take(posc)
    nan = np.where(ok, 0.0, np.nan)
    return Points(*(f + nan for f in out))


def line_axis_source(line, delta):
    """Source term at the axis end of an initial-value line: sin(theta)/y -> d theta/dy,
    from theta/y = g1 + g3 y^2 fitted to the next two points of the line."""
    if not delta or len(line) < 3:
        return np.nan if len(line) < 3 and delta else 0.0
    y1, y2 = line.y[1], line.y[2]
    g1, g2 = np.sin(line.theta[1]) / y1, np.sin(line.theta[2]) / y2
    slope = (g1 * y2 * y2 - g2 * y1 * y1) / (y2 * y2 - y1 * y1)
    return float(np.sin(line.mu[0]) * slope)


def march_fan(corner_x, corner_y, fan_theta, fan_nu, gamma, delta, grid=True):
    """Kernel of a sharp-corner expansion: C- rays j = 0..n-1 leave the corner
    (flow angle fan_theta[j], Prandtl-Meyer angle fan_nu[j], increasing) and
    reach the axis; C+ line i starts on the axis where ray i arrives.

    Returns (grid, axis_x, axis_nu): grid[i, j] for 0 <= i <= j < n, the
    axis points being grid[j, j].  With `grid=False` the first item is the
    list of fronts instead (build the Grid later with `Grid.from_fronts`; a
    root search that only needs the axis values skips that assembly).
    """
    th = np.asarray(fan_theta, dtype=float)
    nu = np.asarray(fan_nu, dtype=float)
    n = th.size
    from moc.net._pm import mu_of_nu

    mu = mu_of_nu(nu, gamma)
    corner = Points(np.full(n, float(corner_x)), np.full(n, float(corner_y)), th, nu, mu)
    ax = _Axis(gamma, delta)
    p0 = ax.point(corner.take(slice(0, 1)))
    fronts = [(np.array([0]), np.array([0]), p0)]
    front, fi = p0, np.array([0])  # front sorted bottom (largest i) to top
    prev, prev_fi = None, None  # the front before `front`
    for s in range(1, 2 * n - 1):
        if s <= n - 1:
            ext = concat(front, corner.take(slice(s, s + 1)))
            ext_i = np.append(fi, -1)
        else:
            ext, ext_i = front, fi
        parts, ids = [], []
        if s % 2 == 0:  # front s-1 ends above the axis: new axis point first
            parts.append(ax.point(front.take(slice(0, 1))))
            ids.append(np.array([s // 2]))
        if len(ext) >= 2:
            # the cell of P = (i, j) from A = (i, j-1), B = (i-1, j) has C = (i-1, j-1)
            opp = _opposite(prev, prev_fi, ext_i[1:])
            parts.append(_pairs(ext, gamma, delta, ax.last_source if s % 2 == 1 else None, opp))
            top = max(0, s - n + 1)
            ids.append(np.arange((s - 1) // 2 if s % 2 else s // 2 - 1, top - 1, -1))
        prev, prev_fi = front, fi
        front = concat(*parts) if len(parts) > 1 else parts[0]
        fi = np.concatenate(ids)
        fronts.append((fi, s - fi, front))
    out = Grid.from_fronts(fronts) if grid else fronts
    return out, np.array(ax.xs), np.array(ax.nus)


def goursat(cminus, cplus, gamma, delta, flux0=None, flux_target=None):
    """Solve the characteristic initial-value (Goursat) problem.

    `cminus`: Points along a C- characteristic, from its far end to the
    junction point (last); `cplus`: Points along a C+ characteristic from the
    junction (first; the same point) to its far end.  The net fills the
    characteristic quadrilateral they span: grid[i, k] lies on the C+ through
    cminus[i] and on the C- through cplus[k]; grid[i, 0] = cminus[i] and
    grid[ni-1, k] = cplus[k].  Each new point comes from grid[i, k-1] (C+) and
    grid[i+1, k] (C-).  Source: method of characteristics for hyperbolic
    systems, Goursat problem (Courant and Friedrichs, Supersonic Flow and
    Shock Waves, 1948, from memory).

    Wall-bounded use: with `flux_target` (and `flux0`, the mass flux already
    crossed by each C+ before cminus[i], from the axis) a C+ stops one point
    after its mass flux from the axis exceeds `flux_target` (the wall
    streamline lies before that point), and the front is trimmed from its
    far-end side while its C+ lines are finished: about half of the
    quadrilateral lies beyond the wall of a nozzle and is not computed.
    """
    from moc.net.wall import flux_integrand

    ni, nk = len(cminus), len(cplus)
    if ni < 2 or nk < 2:
        raise InputError("the Goursat problem needs at least two points on each bounding characteristic.")
    if not (abs(cminus.x[-1] - cplus.x[0]) <= 1e-9 and abs(cminus.y[-1] - cplus.y[0]) <= 1e-9):
        raise InputError("the two bounding characteristics of a Goursat problem must meet: "
                         "the last C- point and the first C+ point must coincide.")
    prune = flux_target is not None
    if prune:
        cum = np.array(flux0, dtype=float) if flux0 is not None else np.zeros(ni)
        cum = cum.copy()
        fprev = flux_integrand(cminus.y, cminus.mu, gamma, delta)
        xprev, yprev = cminus.x.copy(), cminus.y.copy()
        finished = cum >= flux_target
    fronts = [(np.array([ni - 1]), np.array([0]), cplus.take(slice(0, 1)))]
    front = cplus.take(slice(0, 1))
    lo, hi = ni - 1, ni - 1
    prev, prev_i = None, None
    for d in range(1, ni + nk - 1):
        if prune:
            # drop the leading points whose C+ is finished (no later point needs them)
            ii = np.arange(lo, hi + 1)
            drop = int(np.argmin(finished[ii])) if not finished[ii].all() else ii.size
            if drop:
                front = front.take(slice(drop, None))
                lo += drop
        parts = []
        lo_new = lo
        if ni - 1 - d >= 0 and (not prune or not finished[ni - 1 - d]):
            if lo == ni - d:  # the new C- point continues the front at its start
                parts.append(cminus.take(slice(ni - 1 - d, ni - d)))
                lo_new = ni - 1 - d
        if len(front) >= 2:
            # the cell of P = (i, k) from A = (i, k-1), B = (i+1, k) has C = (i+1, k-1)
            fr_i = np.arange(lo, hi + 1)
            opp = _opposite(prev, prev_i, fr_i[1:])
            parts.append(_pairs(front, gamma, delta, None, opp, forward=False))
        prev, prev_i = front, np.arange(lo, hi + 1)
        if d <= nk - 1 and hi == ni - 1:
            parts.append(cplus.take(slice(d, d + 1)))
            hi_new = ni - 1
        else:
            hi_new = hi - 1
        if not parts:
            break
        front = concat(*parts)
        lo, hi = lo_new, hi_new
        if hi < lo:
            break
        ii = np.arange(lo, hi + 1)
        fronts.append((ii, ii + d - (ni - 1), front))
        if prune:
            f = flux_integrand(front.y, front.mu, gamma, delta)
            dl = np.hypot(front.x - xprev[ii], front.y - yprev[ii])
            inc = 0.5 * (f + fprev[ii]) * dl
            inc = np.where(ii == ni - 1 - d, 0.0, inc)  # an injected start point adds nothing
            cum[ii] += inc
            fprev[ii], xprev[ii], yprev[ii] = f, front.x, front.y
            finished[ii] |= cum[ii] >= flux_target
            if finished.all():
                break
    return Grid.from_fronts(fronts)


def march_from_line(line, gamma, delta, wall=None, x_end=None, max_fronts=100000):
    """March downstream of an initial-value line.

    `line`: Points ordered from the axis (first point, y = 0, theta = 0) up to
    the upper end; the line must not be a characteristic (it must cross the
    flow inside the Mach cone, e.g. a sonic-free supersonic line from a throat
    solution).  Without `wall` the net fills the domain of dependence of the
    line (bounded by the C- from its upper end, reflected at the axis).  With
    `wall(x) -> (y, dy/dx)` the upper end of every other front is an inverse
    wall point on that curve and the march stops when a wall point passes
    `x_end` (or after `max_fronts`).

    Returns a Grid; the line point k has labels i = K - k, j = k (K = last).
    """
    K = len(line) - 1
    if K < 1:
        raise InputError("an initial-value line needs at least two points.")
    if abs(line.y[0]) > 1e-12 or abs(line.theta[0]) > 1e-12:
        raise InputError("the initial-value line must start on the axis (y = 0, theta = 0).")
    if not np.all(np.diff(line.y) > 0):
        raise InputError("the initial-value line must have strictly increasing y from the axis upward.")
    if wall is not None and x_end is None:
        raise InputError("marching with a wall curve needs x_end, the x where the march stops.")
    ax = _Axis(gamma, delta)
    ax.add(line.x[0], line.nu[0], line_axis_source(line, delta))
    fi = np.arange(K, -1, -1)
    fronts = [(fi, K - fi, line)]
    front = line
    on_axis = True  # is front[0] an axis point?
    on_wall = wall is not None  # is front[-1] on the wall?
    for s in range(K + 1, K + 1 + max_fronts):
        parts, ids = [], []
        if not on_axis:
            parts.append(ax.point(front.take(slice(0, 1))))
            ids.append(np.array([fi[0] + 1]))
        if len(front) >= 2:
            parts.append(_pairs(front, gamma, delta, ax.last_source if on_axis else None))
            ids.append(fi[:-1])
        done = False
        if wall is not None and not on_wall:
            wp = inverse_wall_point(front.take(slice(-1, None)), wall, gamma, delta)
            parts.append(wp)
            ids.append(fi[-1:])
            done = bool(wp.x[0] >= x_end)
        if not parts:
            break
        front = concat(*parts)
        fi = np.concatenate(ids)
        fronts.append((fi, s - fi, front))
        on_axis = not on_axis
        if wall is not None:
            on_wall = not on_wall
        if done or (wall is None and len(front) == 1 and on_axis):
            break
    return Grid.from_fronts(fronts)

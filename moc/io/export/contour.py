"""The wall contour as a smooth curve, and its sampling to a chord-error tolerance.

The true contour is a cubic spline through the saved wall points (clamped to
the saved wall angle at both ends when the result holds it), plus a separate
spline through the subsonic inlet points, so the throat corner of a
minimum-length nozzle is kept as a corner.  A point the wall repeats (a
sharp corner, where an analysis stores the expansion fan) also splits the
wall into separate splines, each clamped to the angle on its own side.  Exported points are placed so
that the largest distance between the spline and the straight segments
between consecutive points stays below a tolerance: for a curve of local
curvature kappa the arc allowed per segment is (2/kappa) acos(1 - tol kappa),
the exact sagitta relation s = R (1 - cos(dphi/2)) of a circular arc (common
geometry), and any segment still above the tolerance is bisected.
Lengths here are in throat units; the caller scales.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.interpolate import CubicSpline

from moc.errors import ExportError

_DENSE_PER_KNOT = 16
_CHECK_SAMPLES = 33


@dataclass
class Piece:
    """One smooth stretch of contour, parametrised by t in [t0, t1].

    kind "graph": t is x and the spline gives y(x).  kind "param": t is the
    chord length and two splines give x(t), y(t).
    """

    name: str
    kind: str
    t: np.ndarray
    splines: tuple

    @property
    def t0(self):
        return float(self.t[0])

    @property
    def t1(self):
        return float(self.t[-1])

    def eval(self, t, nu=0):
        """(x, y) derivatives of order nu (0, 1, 2) with respect to t."""
        t = np.asarray(t, dtype=float)
        if self.kind == "graph":
            fx = t if nu == 0 else (np.ones_like(t) if nu == 1 else np.zeros_like(t))
            return fx, self.splines[0](t, nu)
        return self.splines[0](t, nu), self.splines[1](t, nu)

    def curvature(self, t):
        """Signed curvature (x'y'' - y'x'')/|P'|^3; positive where the wall turns toward +y."""
        dx, dy = self.eval(t, 1)
        ddx, ddy = self.eval(t, 2)
        return (dx * ddy - dy * ddx) / np.hypot(dx, dy) ** 3


def _make_piece(name, x, y, theta=None):
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    if np.all(np.diff(x) > 0.0):
        bc = "not-a-knot"
        if theta is not None and np.all(np.isfinite(theta)):
            bc = ((1, float(np.tan(theta[0]))), (1, float(np.tan(theta[-1]))))
        return Piece(name, "graph", x, (CubicSpline(x, y, bc_type=bc),))
    s = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(x), np.diff(y)))])
    if np.any(np.diff(s) <= 0.0):
        raise ExportError(f"the saved {name} contour repeats a point; it cannot be exported as a curve.")
    return Piece(name, "param", s, (CubicSpline(s, x), CubicSpline(s, y)))


def _checked(group, name, need_theta=False):
    x = np.asarray(group.get("x", []), dtype=float).ravel()
    y = np.asarray(group.get("y", []), dtype=float).ravel()
    if x.size != y.size:
        raise ExportError(f"the saved {name} has {x.size} x values but {y.size} y values.")
    if x.size and not (np.all(np.isfinite(x)) and np.all(np.isfinite(y))):
        raise ExportError(f"the saved {name} holds NaN or infinite coordinates; re-run the design.")
    if x.size and np.any(y <= 0.0):
        raise ExportError(f"the saved {name} touches or crosses the axis (y <= 0); it cannot be exported.")
    theta = None
    if need_theta and "theta" in group:
        theta = np.asarray(group["theta"], dtype=float).ravel()
        if theta.size != x.size:
            theta = None
    return x, y, theta


class Contour:
    """The wetted wall from the inlet face to the exit, in throat units."""

    def __init__(self, pieces):
        self.pieces = pieces

    @classmethod
    def from_result(cls, result):
        wx, wy, wt = _checked(result.wall or {}, "wall", need_theta=True)
        if wx.size < 2:
            raise ExportError("the saved wall has fewer than 2 points; nothing to export.")
        eps = 1e-12 * max(1.0, float(np.abs(wy).max()))
        same = np.hypot(np.diff(wx), np.diff(wy)) <= eps   # a repeated point marks a corner
        back = (np.diff(wx) <= 0.0) & ~same
        if np.any(back):
            k = int(np.flatnonzero(back)[0])
            raise ExportError(f"the saved wall does not advance downstream at point {k + 1}; it cannot be exported.")
        if np.all(same):
            raise ExportError("the saved wall has fewer than 2 distinct points; nothing to export.")
        pieces = []
        ix, iy, _ = _checked(result.inlet or {}, "inlet")
        if ix.size:
            if ix[0] > ix[-1]:
                ix, iy = ix[::-1], iy[::-1]
            # the inlet ends where the wall begins: drop inlet points at or past the wall's first point
            keep = ix < wx[0] - 1e-12 * max(1.0, abs(wy[0]))
            ix, iy = np.append(ix[keep], wx[0]), np.append(iy[keep], wy[0])
            if ix.size >= 2:
                pieces.append(_make_piece("inlet", ix, iy))
        # smooth runs between corners: steps a..b join points a..b+1; each run ends where a corner begins
        run = np.concatenate([[False], ~same, [False]]).astype(np.int8)
        starts = np.flatnonzero(np.diff(run) == 1)
        ends = np.flatnonzero(np.diff(run) == -1)
        for a, b in zip(starts, ends):
            sl = slice(a, b + 1)
            pieces.append(_make_piece("wall", wx[sl], wy[sl], None if wt is None else wt[sl]))
        return cls(pieces)


def _refine(t, m):
    """Knots t with m equal sub-steps in every knot interval."""
    f = np.linspace(0.0, 1.0, m + 1)[:-1]
    inner = (t[:-1, None] + np.diff(t)[:, None] * f[None, :]).ravel()
    return np.append(inner, t[-1])


def chord_errors(piece, ta, tb, samples=_CHECK_SAMPLES):
    """Largest distance from the curve between ta and tb to the chord joining its ends."""
    ta = np.asarray(ta, dtype=float)
    tb = np.asarray(tb, dtype=float)
    f = np.linspace(0.0, 1.0, samples)[1:-1]
    t = ta[:, None] + (tb - ta)[:, None] * f[None, :]
    x, y = piece.eval(t)
    xa, ya = piece.eval(ta)
    xb, yb = piece.eval(tb)
    cx, cy = (xb - xa)[:, None], (yb - ya)[:, None]
    px, py = x - xa[:, None], y - ya[:, None]
    L2 = cx * cx + cy * cy
    u = np.clip((px * cx + py * cy) / np.where(L2 > 0, L2, 1.0), 0.0, 1.0)
    d = np.hypot(px - u * cx, py - u * cy)
    return d.max(axis=1) if d.size else np.zeros(ta.size)


def _segment_density(kappa, tol):
    """Segments needed per unit arc length so that each chord's sagitta is at most tol."""
    k = np.abs(kappa)
    e = np.minimum(tol * k, 1.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        exact = k / (2.0 * np.arccos(1.0 - e))
    small = np.sqrt(k / (8.0 * tol))
    return np.where(e < 1e-8, small, exact)


def sample_piece(piece, tol, max_rounds=60):
    """Parameters t of points on one piece whose chords stay within tol of the curve."""
    td = _refine(piece.t, _DENSE_PER_KNOT)
    dx, dy = piece.eval(td, 1)
    ds = np.hypot(dx, dy)
    dens = _segment_density(piece.curvature(td), 0.97 * tol) * ds  # small margin spares bisections
    w = 0.5 * (dens[1:] + dens[:-1]) * np.diff(td)
    total = float(w.sum())
    cum = np.concatenate([[0.0], np.cumsum(w)])
    # a vanishing extra weight keeps the map strictly increasing on straight stretches
    cum = cum + 1e-9 * max(total, 1.0) * (td - td[0]) / (td[-1] - td[0])
    n = max(1, int(np.ceil(cum[-1] - 1e-12)))
    t = np.interp(np.linspace(0.0, cum[-1], n + 1), cum, td)
    t[0], t[-1] = piece.t0, piece.t1
    for _ in range(max_rounds):
        err = chord_errors(piece, t[:-1], t[1:])
        bad = np.flatnonzero(err > tol)
        if bad.size == 0:
            return t
        mids = 0.5 * (t[bad] + t[bad + 1])
        t = np.insert(t, bad + 1, mids)
    raise ExportError(
        f"could not meet a chord tolerance of {tol:.3g} throat units on the {piece.name} contour; use a larger tolerance."
    )


def sample(contour, tol):
    """Points of the whole contour within chord tolerance tol (throat units).

    Returns a dict of arrays: x, y, slope (dy/dx), angle (radians), curvature
    (signed, per throat unit), s (arc length of the polyline from the first
    point), piece (index into contour.pieces), and the float max_chord_error.
    """
    if not (isinstance(tol, (int, float)) and np.isfinite(tol) and tol > 0.0):
        raise ExportError(f"the chord tolerance must be a positive length, got {tol!r}.")
    cols = {k: [] for k in ("x", "y", "slope", "angle", "curvature", "piece")}
    worst = 0.0
    for k, p in enumerate(contour.pieces):
        t = sample_piece(p, tol)
        worst = max(worst, float(chord_errors(p, t[:-1], t[1:], 129).max()))
        if k < len(contour.pieces) - 1:
            t = t[:-1]  # the junction point is listed once, with the downstream piece's slope
        x, y = p.eval(t)
        dx, dy = p.eval(t, 1)
        cols["x"].append(x)
        cols["y"].append(y)
        with np.errstate(divide="ignore"):
            cols["slope"].append(dy / dx)
        cols["angle"].append(np.arctan2(dy, dx))
        cols["curvature"].append(p.curvature(t))
        cols["piece"].append(np.full(t.size, k))
    out = {k: np.concatenate(v) for k, v in cols.items()}
    out["s"] = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(out["x"]), np.diff(out["y"])))])
    out["max_chord_error"] = worst
    return out

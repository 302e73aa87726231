"""Wall contour representations and the subsonic inlet.

A `Contour` is a chain of smooth segments y(x) (circular arcs, straight lines,
quadratic Bezier parabolas, cubic splines through points), evaluated
vectorised with y, dy/dx and d2y/dx2.  Calling a contour, `c(x)`, returns
(y, dy/dx), the wall-curve signature of the characteristic net's inverse wall
point, so analysers can march any of these walls.

Builders:
* `subsonic_inlet`: convergent section from an inlet face to the throat:
  entrance arc, straight cone, throat-side arc tangent to the throat with the
  throat's radius of curvature (common practice of nozzle layout);
* `conical_nozzle`: throat arc tangent to a cone (Sutton and Biblarz, Rocket
  Propulsion Elements, nozzle chapter, conical-nozzle length, from memory);
* `bell_nozzle`: throat arc then a parabola from a start to an exit wall angle
  over a given length (G. V. R. Rao, Jet Propulsion 1958 / ARS J. 1960,
  parabolic approximation of the thrust-optimum contour, from memory);
* `wall_spline`: a smooth cubic spline through wall points.

Lengths in throat half-heights (planar) or radii (axisymmetric), the throat
at x = 0, y = 1.  Angles in degrees at this interface, radians inside.
"""

from __future__ import annotations

import math

import numpy as np

from moc.errors import InputError


def _num(v, name, lo=None, hi=None, lo_open=True, hi_open=True, allowed=""):
    try:
        f = float(v)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a number, got {v!r}.") from None
    ok = math.isfinite(f)
    if ok and lo is not None:
        ok = f > lo if lo_open else f >= lo
    if ok and hi is not None:
        ok = f < hi if hi_open else f <= hi
    if not ok:
        raise InputError(f"{name} = {v!r} is not allowed; {allowed}.")
    return f


def _delta(geometry):
    if geometry not in ("planar", "axisymmetric"):
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    return 1 if geometry == "axisymmetric" else 0


class Segment:
    """A smooth piece of wall on x0 <= x <= x1; subclasses give y, dy/dx, d2y/dx2."""

    x0: float
    x1: float

    def sample(self, n):
        x = np.linspace(self.x0, self.x1, max(int(n), 2))
        return x, self.y(x)


class Arc(Segment):
    """Circular arc of radius r about (xc, yc); `below=True` is the part under the centre
    (a throat arc, y = yc - sqrt(r^2 - (x-xc)^2)), else the part above it."""

    def __init__(self, x0, x1, xc, yc, r, below=True):
        self.x0, self.x1, self.xc, self.yc, self.r = float(x0), float(x1), float(xc), float(yc), float(r)
        self.s = -1.0 if below else 1.0

    def _w(self, x):
        return np.sqrt(np.maximum(self.r**2 - (x - self.xc) ** 2, 0.0))

    def y(self, x):
        return self.yc + self.s * self._w(x)

    def dydx(self, x):
        return -self.s * (x - self.xc) / self._w(x)

    def d2ydx2(self, x):
        return -self.s * self.r**2 / self._w(x) ** 3


class Line(Segment):
    """Straight wall y = y0 + slope (x - x0)."""

    def __init__(self, x0, x1, y0, slope):
        self.x0, self.x1, self.y0, self.slope = float(x0), float(x1), float(y0), float(slope)

    def y(self, x):
        return self.y0 + self.slope * (np.asarray(x, float) - self.x0)

    def dydx(self, x):
        return np.full(np.shape(x), self.slope)

    def d2ydx2(self, x):
        return np.zeros(np.shape(x))


class Parabola(Segment):
    """Quadratic Bezier curve P(t) = (1-t)^2 P0 + 2 t (1-t) P1 + t^2 P2 (a parabola),
    written as y(x) by solving the quadratic x(t) = x (x monotone in t)."""

    def __init__(self, p0, p1, p2):
        self.p = np.array([p0, p1, p2], float)
        self.x0, self.x1 = float(self.p[0, 0]), float(self.p[2, 0])

    def _t(self, x):
        a0, a1, a2 = self.p[:, 0]
        a = a0 - 2 * a1 + a2
        b = 2 * (a1 - a0)
        c = a0 - np.asarray(x, float)
        if abs(a) < 1e-14 * max(1.0, abs(b)):
            return -c / b
        disc = np.sqrt(np.maximum(b * b - 4 * a * c, 0.0))
        # the root in [0, 1] (numerically stable form)
        q = -0.5 * (b + math.copysign(1.0, b) * disc)
        t1, t2 = q / a, c / q
        return np.where((t1 >= -1e-12) & (t1 <= 1 + 1e-12), t1, t2)

    def _xy(self, t, k):
        (x0, y0), (x1, y1), (x2, y2) = self.p
        if k == 0:
            return ((1 - t) ** 2 * x0 + 2 * t * (1 - t) * x1 + t * t * x2,
                    (1 - t) ** 2 * y0 + 2 * t * (1 - t) * y1 + t * t * y2)
        if k == 1:
            return 2 * ((1 - t) * (x1 - x0) + t * (x2 - x1)), 2 * ((1 - t) * (y1 - y0) + t * (y2 - y1))
        return np.full(np.shape(t), 2 * (x2 - 2 * x1 + x0)), np.full(np.shape(t), 2 * (y2 - 2 * y1 + y0))

    def y(self, x):
        return self._xy(self._t(x), 0)[1]

    def dydx(self, x):
        xt, yt = self._xy(self._t(x), 1)
        return yt / xt

    def d2ydx2(self, x):
        t = self._t(x)
        xt, yt = self._xy(t, 1)
        xtt, ytt = self._xy(t, 2)
        return (ytt * xt - yt * xtt) / xt**3


class Spline(Segment):
    """Cubic spline y(x) through points (not-a-knot ends; scipy.interpolate.CubicSpline)."""

    def __init__(self, x, y):
        from scipy.interpolate import CubicSpline

        x, y = np.asarray(x, float), np.asarray(y, float)
        if x.ndim != 1 or x.size < 4 or x.shape != y.shape:
            raise InputError("a wall spline needs at least 4 points with x and y of equal length.")
        if not (np.all(np.isfinite(x)) and np.all(np.isfinite(y))):
            raise InputError("wall points must be finite numbers.")
        if np.any(np.diff(x) <= 0):
            k = int(np.flatnonzero(np.diff(x) <= 0)[0])
            raise InputError(f"wall points must have strictly increasing x; point {k + 1} does not.")
        self.cs = CubicSpline(x, y)
        self.x0, self.x1 = float(x[0]), float(x[-1])

    def y(self, x):
        return self.cs(x)

    def dydx(self, x):
        return self.cs(x, 1)

    def d2ydx2(self, x):
        return self.cs(x, 2)


class Contour:
    """A chain of segments, contiguous in x; evaluation picks the segment of each x."""

    def __init__(self, segments):
        self.segments = list(segments)
        self.breaks = np.array([s.x0 for s in self.segments] + [self.segments[-1].x1])
        self.x0, self.x1 = float(self.breaks[0]), float(self.breaks[-1])

    def _eval(self, x, what):
        x = np.asarray(x, float)
        k = np.clip(np.searchsorted(self.breaks, x, side="right") - 1, 0, len(self.segments) - 1)
        out = np.empty(x.shape)
        for i, seg in enumerate(self.segments):
            m = k == i
            if np.any(m):
                out[m] = getattr(seg, what)(x[m])
        return out

    def y(self, x):
        return self._eval(x, "y")

    def dydx(self, x):
        return self._eval(x, "dydx")

    def d2ydx2(self, x):
        return self._eval(x, "d2ydx2")

    def __call__(self, x):
        return self.y(x), self.dydx(x)

    def sample(self, per_segment=60):
        """Points along the contour (x, y), joins shared once."""
        xs = [np.linspace(s.x0, s.x1, per_segment)[: -1] for s in self.segments]
        x = np.concatenate(xs + [np.array([self.x1])])
        return x, self.y(x)


def wall_spline(x, y):
    """A smooth contour (cubic spline) through wall points x, y (x strictly increasing)."""
    return Contour([Spline(x, y)])


def subsonic_inlet(contraction_ratio, entrance_radius=1.0, throat_radius=2.0, cone_angle_deg=30.0,
                   geometry="axisymmetric", points=121):
    """Convergent section from the inlet face (x < 0) to the throat (0, 1).

    Wall, going downstream: an arc of `entrance_radius` turning from the face
    (wall parallel to the axis) to the cone half-angle, a straight cone, then
    an arc of `throat_radius` about (0, 1 + throat_radius) tangent to the
    throat, so the inlet joins the divergent wall with a common tangent and the
    same radius of curvature when throat_radius equals the throat curvature.
    contraction_ratio: inlet-face area over throat area (> 1); the face height
    is CR (planar) or sqrt(CR) (axisymmetric).  Returns dict x, y, theta (rad,
    wall angle), curvature (d2y/dx2) in throat units, x ending at 0.
    """
    d = _delta(geometry)
    cr = _num(contraction_ratio, "inlet contraction ratio", lo=1.0, allowed="it must be above 1 (inlet face area over throat area)")
    re = _num(entrance_radius, "inlet entrance radius", lo=0.0, allowed="it must be a positive length in throat units")
    rt = _num(throat_radius, "inlet throat-side radius", lo=0.0, allowed="it must be a positive length in throat units")
    beta = math.radians(_num(cone_angle_deg, "inlet cone half-angle", lo=0.0, hi=89.0, hi_open=False,
                             allowed="allowed is 0 < angle <= 89 deg"))
    yf = cr ** (1.0 / (1 + d))
    y1 = 1.0 + rt * (1.0 - math.cos(beta))
    dy_cone = yf - y1 - re * (1.0 - math.cos(beta))
    if dy_cone < 0.0:
        top = 1.0 + (rt + re) * (1.0 - math.cos(beta))
        need = top ** (1 + d)
        raise InputError(
            f"the inlet arcs (radii {re:g} and {rt:g}) turning through {math.degrees(beta):g} deg rise "
            f"to {top:.4g} throat units, above the inlet face at {yf:.4g}; use a contraction ratio of at "
            f"least {need:.4g}, smaller radii or a smaller cone angle."
        )
    x1 = -rt * math.sin(beta)
    x2 = x1 - dy_cone / math.tan(beta)
    xf = x2 - re * math.sin(beta)
    segs = [Arc(xf, x2, xf, yf - re, re, below=False),
            Line(x2, x1, y1 + dy_cone, -math.tan(beta)),
            Arc(x1, 0.0, 0.0, 1.0 + rt, rt, below=True)]
    if dy_cone == 0.0:
        segs.pop(1)
    c = Contour(segs)
    n = max(int(points), 7)
    # spacing by arc length so the cone and the arcs are both resolved
    xx = np.linspace(xf, 0.0, 4 * n)
    yy = c.y(xx)
    s = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(xx), np.diff(yy)))])
    x = np.interp(np.linspace(0.0, s[-1], n), s, xx)
    x[0], x[-1] = xf, 0.0
    return {"x": x, "y": c.y(x), "theta": np.arctan(c.dydx(x)), "curvature": c.d2ydx2(x)}


def _throat_arc_to(angle, rc):
    """Arc of radius rc about (0, 1 + rc) from the throat to wall angle `angle` (rad)."""
    x1 = rc * math.sin(angle)
    return Arc(0.0, x1, 0.0, 1.0 + rc, rc, below=True), x1, 1.0 + rc * (1.0 - math.cos(angle))


def conical_nozzle(half_angle_deg, area_ratio=None, length=None, throat_curvature=1.0, geometry="axisymmetric"):
    """Divergent wall: throat arc of radius `throat_curvature` tangent to a cone (wedge).

    Give the exit `area_ratio` (A_e/A_t) or the `length` from the throat.  With
    an area ratio the length is L = (y_e - 1 + R (sec a - 1)) / tan a
    (Sutton and Biblarz, conical nozzle length, from memory).
    """
    d = _delta(geometry)
    a = math.radians(_num(half_angle_deg, "cone half-angle", lo=0.0, hi=60.0, hi_open=False,
                          allowed="allowed is 0 < half-angle <= 60 deg"))
    rc = _num(throat_curvature, "throat radius of curvature", lo=0.0, allowed="it must be positive (throat units)")
    if (area_ratio is None) == (length is None):
        raise InputError("give exactly one of area_ratio or length for a conical nozzle.")
    arc, x1, y1 = _throat_arc_to(a, rc)
    if area_ratio is not None:
        ye = _num(area_ratio, "area ratio", lo=1.0, allowed="it must be above 1") ** (1.0 / (1 + d))
        if ye <= y1:
            raise InputError(
                f"the throat arc alone reaches area ratio {y1 ** (1 + d):.4g}; ask for a larger area ratio "
                "or a smaller throat radius of curvature."
            )
        xe = x1 + (ye - y1) / math.tan(a)
    else:
        xe = _num(length, "nozzle length", lo=x1, allowed=f"it must exceed the throat arc's length {x1:.4g}")
    return Contour([arc, Line(x1, xe, y1, math.tan(a))])


def bell_nozzle(area_ratio, length, start_angle_deg, exit_angle_deg, throat_curvature=0.382,
                geometry="axisymmetric"):
    """Divergent wall: throat arc up to the start angle, then a parabola to the exit.

    The parabola is the quadratic Bezier curve from the arc's end N (angle
    theta_n) to the exit lip E (x = length, y_e from the area ratio, angle
    theta_e), its control point where the two tangents meet (Rao's parabolic
    approximation; throat arc 0.382 throat radii by default, from memory).
    """
    d = _delta(geometry)
    ye = _num(area_ratio, "area ratio", lo=1.0, allowed="it must be above 1") ** (1.0 / (1 + d))
    tn = math.radians(_num(start_angle_deg, "bell start angle", lo=0.0, hi=60.0, allowed="allowed is 0 < angle < 60 deg"))
    te = math.radians(_num(exit_angle_deg, "bell exit angle", lo=-1e-300, hi=math.degrees(tn),
                           lo_open=False, allowed="allowed is 0 <= exit angle < start angle"))
    rc = _num(throat_curvature, "throat radius of curvature", lo=0.0, allowed="it must be positive (throat units)")
    arc, xn, yn = _throat_arc_to(tn, rc)
    L = _num(length, "bell length", lo=xn, allowed=f"it must exceed the throat arc's length {xn:.4g}")
    if ye <= yn:
        raise InputError("the throat arc alone reaches the exit area; use a larger area ratio or a smaller arc.")
    # tangents: y = yn + tan(tn)(x - xn), y = ye + tan(te)(x - L)
    xq = (ye - yn - L * math.tan(te) + xn * math.tan(tn)) / (math.tan(tn) - math.tan(te))
    if not (xn < xq < L):
        lo = xn + (ye - yn) / math.tan(tn)
        raise InputError(
            f"no parabola joins the start angle {math.degrees(tn):g} deg to the exit angle "
            f"{math.degrees(te):g} deg over length {L:.4g}: the length must exceed {lo:.4g} "
            "(reach the exit height along the start tangent) with these angles."
        )
    yq = yn + math.tan(tn) * (xq - xn)
    return Contour([arc, Parabola((xn, yn), (xq, yq), (L, ye))])

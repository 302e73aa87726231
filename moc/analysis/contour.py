"""Wall contours given for analysis: point lists (CSV), cones and parabolic bells.

A `Wall` is the supersonic wall from the throat (x = 0, y = 1 in throat units)
to the exit, as a C1 piecewise cubic (Hermite where the slopes are known,
not-a-knot spline through points otherwise), extended beyond both ends along
its end tangents so that characteristic intersections can be found.
"""

from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from scipy.interpolate import CubicHermiteSpline, CubicSpline

from moc.errors import ContourError
from moc.units import METRES_PER_UNIT, normalise_length_unit

MIN_POINTS = 5


@dataclass
class Wall:
    """Wall y(x) (planar half-height or radius) with its angle; lengths in throat units."""

    x: np.ndarray
    y: np.ndarray
    slope: np.ndarray | None = None
    description: str = "wall"
    throat_arc: float | None = None  # downstream throat radius of curvature, None for a sharp corner
    meta: dict = field(default_factory=dict)

    def __post_init__(self):
        self.x = np.asarray(self.x, float)
        self.y = np.asarray(self.y, float)
        if self.slope is not None:
            self.slope = np.asarray(self.slope, float)
            self._s = CubicHermiteSpline(self.x, self.y, self.slope)
        else:
            self._s = CubicSpline(self.x, self.y, bc_type="not-a-knot")
        self._d = self._s.derivative()
        self.x_start, self.x_end = float(self.x[0]), float(self.x[-1])
        self.y_start, self.y_end = float(self.y[0]), float(self.y[-1])
        self.slope_start = float(self._d(self.x_start))
        self.slope_end = float(self._d(self.x_end))

    def y_of(self, x):
        x = np.asarray(x, float)
        xc = np.clip(x, self.x_start, self.x_end)
        y = self._s(xc)
        y = np.where(x > self.x_end, self.y_end + self.slope_end * (x - self.x_end), y)
        return np.where(x < self.x_start, self.y_start + self.slope_start * (x - self.x_start), y)

    def angle(self, x):
        x = np.asarray(x, float)
        xc = np.clip(x, self.x_start, self.x_end)
        return np.arctan(self._d(xc))

    @property
    def angle_start(self):
        return math.atan(self.slope_start)

    @property
    def angle_end(self):
        return math.atan(self.slope_end)


# -- checks -----------------------------------------------------------------

def check_points(x, y, lines=None, max_turn_deg=None):
    """Validate a wall point list; raise ContourError naming the point (and file line) at fault."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)

    def where(i):
        return f"point {i + 1}" + (f" (line {lines[i]})" if lines is not None else "")

    if x.size < MIN_POINTS:
        raise ContourError(f"the wall has {x.size} points; at least {MIN_POINTS} are needed from the throat to the exit.")
    bad = ~(np.isfinite(x) & np.isfinite(y))
    if np.any(bad):
        i = int(np.flatnonzero(bad)[0])
        raise ContourError(f"{where(i)} is not a finite number; every x and y must be a number.")
    dx = np.diff(x)
    if np.any(dx <= 0):
        i = int(np.flatnonzero(dx <= 0)[0]) + 1
        raise ContourError(
            f"the wall is not monotone in x at {where(i)}: x = {x[i]:.6g} does not exceed the previous "
            f"x = {x[i - 1]:.6g}; give points in increasing x from the throat to the exit.")
    if np.any(y <= 0):
        i = int(np.flatnonzero(y <= 0)[0])
        raise ContourError(f"{where(i)} has y = {y[i]:.6g}; the wall must stay above the axis (y > 0).")
    # the kink check ignores points crowded within 5 % of the typical spacing of the previous one
    # (near-duplicate points, whose tiny segment has a meaningless direction)
    tiny = 0.05 * float(np.median(dx))
    kept = [0]
    for i in range(1, x.size):
        if x[i] - x[kept[-1]] >= tiny or i == x.size - 1:
            kept.append(i)
    kept = np.asarray(kept)
    ang = np.arctan2(np.diff(y[kept]), np.diff(x[kept]))
    turn = np.diff(ang)
    lim = math.radians(max_turn_deg if max_turn_deg is not None else 20.0)
    if np.any(np.abs(turn) > lim):
        i = int(kept[int(np.flatnonzero(np.abs(turn) > lim)[0]) + 1])
        raise ContourError(
            f"the wall kinks by {math.degrees(turn[i - 1]):.3g} deg at {where(i)} (x = {x[i]:.6g}); "
            f"the flow cannot follow a kink of more than {math.degrees(lim):.3g} deg there "
            "(a compression kink that large would detach the shock); smooth the contour or add points.")
    return x, y


def _throat_normalise(x, y, lines):
    """Shift and scale so the throat (the first and narrowest section) is at x = 0, y = 1."""
    i0 = 0
    # drop a converging (inlet) part: the throat is where y stops decreasing
    while i0 + 1 < y.size and y[i0 + 1] < y[i0]:
        i0 += 1
    later = np.flatnonzero(y[i0 + 1:] < y[i0] * (1 - 1e-9))
    if later.size:
        j = i0 + 1 + int(later[0])
        where = f"point {j + 1}" + (f" (line {lines[j]})" if lines is not None else "")
        raise ContourError(
            f"the throat is not the narrowest section: {where} at x = {x[j]:.6g} has y = {y[j]:.6g}, below the "
            f"throat y = {y[i0]:.6g} at x = {x[i0]:.6g}; the supersonic wall must not narrow after the throat.")
    h = y[i0]
    xs, ys = (x[i0:] - x[i0]) / h, y[i0:] / h
    return xs, ys, h, i0


def wall_from_points(x, y, slope=None, lines=None, description="wall from points", normalise=True):
    """Wall through points; lengths in any unit.

    normalise: "throat"/True (the throat, first narrowest section after any
    inlet part, which is dropped, goes to x = 0, y = 1), "first" (the first
    point goes to x = 0, y = 1: a wall in a uniform stream), or False.
    """
    x, y = check_points(x, y, lines)
    h, i0 = 1.0, 0
    if normalise == "first":
        h = y[0]
        x, y = (x - x[0]) / h, y / h
    elif normalise:
        x, y, h, i0 = _throat_normalise(x, y, lines)
        if slope is not None:
            slope = np.asarray(slope, float)[i0:]
    if x.size < MIN_POINTS:
        raise ContourError(f"only {x.size} wall points follow the throat; at least {MIN_POINTS} are needed.")
    if normalise != "first" and slope is None and (y[1] - y[0]) / (x[1] - x[0]) < -1e-12:
        raise ContourError("the wall narrows right after the throat (point 2); the throat must be the narrowest section.")
    w = Wall(x, y, slope, description=description)
    w.meta["throat_size"] = h
    w.meta["first_row"] = i0
    return w


# -- CSV ----------------------------------------------------------------------

def normalise_unit(unit):
    """Canonical short name of a length unit (or 'throat'), or ContourError."""
    return normalise_length_unit(unit, ContourError, extra=("throat",))


_UNIT_RE = re.compile(r"^\s*([A-Za-z]+)\s*(?:\[\s*([^\]]*)\s*\]|_([A-Za-z]+))?\s*$")


def read_wall_csv(path, units=None, normalise=True):
    """Read a wall CSV: '#' comment lines, one header line naming the columns, then numbers.

    The x and y (or r) columns are found by name; their unit comes from the
    header ("x [mm]", "x_mm", "x [throat]") or from `units`.  Rows of a
    section named "inlet" are skipped.  Returns (Wall, info dict).
    """
    p = Path(path)
    if units is not None and str(units).strip().lower() != "throat":
        normalise_unit(units)
    if not p.is_file():
        raise ContourError(f"wall file {p} does not exist or is not a file.")
    try:
        text = p.read_text(encoding="utf-8-sig")
    except (OSError, UnicodeDecodeError) as exc:
        raise ContourError(f"cannot read wall file {p} ({exc}).") from None
    rows = []
    header = None
    for lineno, raw in enumerate(text.splitlines(), start=1):
        s = raw.strip()
        if not s or s.startswith("#"):
            continue
        cells = next(csv.reader([s]))
        if header is None:
            try:
                [float(c) for c in cells]
                header = []  # no header: plain numbers
            except ValueError:
                header = [c.strip() for c in cells]
                continue
        rows.append((lineno, [c.strip() for c in cells]))
    if header is None or not rows:
        raise ContourError(f"wall file {p} has no data rows; give x and y columns, one point per line.")
    cols = {}
    unit_of = {}
    for k, name in enumerate(header):
        m = _UNIT_RE.match(name)
        if not m:
            continue
        base = m.group(1).lower()
        u = m.group(2) or m.group(3)
        if base in ("x", "y", "r", "section", "part", "slope") and base not in cols:
            cols[base] = k
            unit_of[base] = u
        elif base in ("wall", "angle") and "angle" not in cols and "deg" in name.lower():
            cols["angle"] = k
    if "angle" not in cols:
        for k, name in enumerate(header):
            if name.lower().startswith(("wall_angle", "angle")):
                cols["angle"] = k
    if header == []:
        cols = {"x": 0, "y": 1}
        unit_of = {"x": None, "y": None}
    ycol = "y" if "y" in cols else "r" if "r" in cols else None
    if "x" not in cols or ycol is None:
        raise ContourError(f"wall file {p}: the header must name an x column and a y (or r) column, got {header}.")
    sec = cols.get("section", cols.get("part"))
    xs, ys, angs, lines = [], [], [], []
    for lineno, cells in rows:
        if sec is not None and sec < len(cells) and cells[sec].lower() == "inlet":
            continue
        try:
            xv = float(cells[cols["x"]])
            yv = float(cells[cols[ycol]])
            av = float(cells[cols["angle"]]) if "angle" in cols else None
        except (ValueError, IndexError):
            raise ContourError(f"wall file {p}, line {lineno}: expected numbers in the x and {ycol} columns, got {cells}.") from None
        xs.append(xv)
        ys.append(yv)
        angs.append(av)
        lines.append(lineno)
    u = unit_of.get("x") or unit_of.get(ycol)
    if u is not None and u.lower() in ("throat", "-", "1"):
        unit = "throat"
    elif u is not None:
        unit = normalise_unit(u)
        if units is not None and normalise_unit(units) != unit:
            raise ContourError(f"wall file {p} says its lengths are in {unit} but --units says {units}; drop one.")
    elif units is not None:
        unit = "throat" if str(units).lower() == "throat" else normalise_unit(units)
    else:
        raise ContourError(
            f"wall file {p} does not say its length unit; name it in the header (for example 'x [mm]') "
            "or pass --units (m, cm, mm, um, in, ft or throat).")
    slope = None
    if all(a is not None for a in angs):
        slope = np.tan(np.radians(np.asarray(angs, float)))
    w = wall_from_points(np.asarray(xs), np.asarray(ys), slope=slope, lines=lines,
                         description=f"wall from {p.name}", normalise="throat" if normalise else "first")
    info = {"source": str(p), "unit": unit, "points_read": len(xs),
            "throat_size": w.meta["throat_size"],
            "throat_size_m": (w.meta["throat_size"] * METRES_PER_UNIT[unit]) if unit != "throat" else None}
    return w, info


# -- analytic contours ---------------------------------------------------------

def _arc(radius, angle, n=400, upstream_deg=30.0):
    """Throat arc of radius `radius` through (0, 1), from upstream_deg before the throat to wall angle `angle` (rad).

    The short converging part lets a transonic initial line start just upstream of the geometric throat.
    """
    t = np.linspace(-math.radians(upstream_deg), angle, n)
    return radius * np.sin(t), 1.0 + radius * (1.0 - np.cos(t)), np.tan(t)


def cone(half_angle_deg, area_ratio, geometry="axisymmetric", throat_radius=None, n=800):
    """Straight (conical or wedge) wall of the given half-angle, after a sharp corner or a throat arc."""
    a = math.radians(_num(half_angle_deg, "cone half-angle"))
    if not 0.5 <= math.degrees(a) <= 45:
        raise ContourError(f"cone half-angle must be between 0.5 and 45 deg, got {math.degrees(a):.6g}.")
    ar = _num(area_ratio, "area ratio")
    if not ar > 1.0:
        raise ContourError(f"the exit area ratio must be above 1, got {ar:.6g}.")
    ye = math.sqrt(ar) if geometry == "axisymmetric" else ar
    xs, ys, ss = [np.zeros(1)], [np.ones(1)], [np.array([math.tan(a)])]
    if throat_radius:
        r = _num(throat_radius, "throat radius of curvature")
        if r <= 0:
            raise ContourError(f"throat radius of curvature must be positive, got {r:.6g}.")
        xs, ys, ss = _arc(r, a)
        xs, ys, ss = [xs], [ys], [ss]
    x0, y0 = xs[-1][-1], ys[-1][-1]
    if ye <= y0:
        raise ContourError(f"area ratio {ar:.6g} is reached inside the throat arc; give a larger area ratio or a smaller arc.")
    xe = x0 + (ye - y0) / math.tan(a)
    xl = np.linspace(x0, xe, n)[1:]
    x = np.concatenate(xs + [xl])
    y = np.concatenate(ys + [y0 + (xl - x0) * math.tan(a)])
    s = np.concatenate(ss + [np.full(xl.size, math.tan(a))])
    w = Wall(x, y, s, description=f"{math.degrees(a):g} deg {'cone' if geometry == 'axisymmetric' else 'wedge'}",
             throat_arc=throat_radius or None)
    w.meta.update(kind="cone", half_angle_deg=math.degrees(a))
    return w


def bell(start_deg, exit_deg, length, geometry="axisymmetric", throat_radius=None, n=800):
    """Parabolic bell: a parabola x = A y^2 + B y + C tangent to the start and exit wall angles.

    For a parabola with axis parallel to x, tangent at (x0, y0) and (x0 + L, ye):
    ye = y0 + 2 L / (cot(start) + cot(exit)) (derived in docs/analysis.md).
    """
    tn = math.radians(_num(start_deg, "bell start angle"))
    te = math.radians(_num(exit_deg, "bell exit angle"))
    L = _num(length, "bell length")
    if not (0 < math.degrees(tn) <= 50):
        raise ContourError(f"bell start angle must be between 0 and 50 deg, got {math.degrees(tn):.6g}.")
    if not (0 <= math.degrees(te) < math.degrees(tn)):
        raise ContourError(
            f"bell exit angle must be at least 0 deg and below the start angle {math.degrees(tn):.6g} deg, got {math.degrees(te):.6g}.")
    if not L > 0:
        raise ContourError(f"bell length must be positive (throat units), got {L:.6g}.")
    xs, ys, ss = [np.zeros(1)], [np.ones(1)], [np.array([math.tan(tn)])]
    if throat_radius:
        r = _num(throat_radius, "throat radius of curvature")
        if r <= 0:
            raise ContourError(f"throat radius of curvature must be positive, got {r:.6g}.")
        xa, ya, sa = _arc(r, tn)
        xs, ys, ss = [xa], [ya], [sa]
    x0, y0 = xs[-1][-1], ys[-1][-1]
    cn, ce = 1.0 / math.tan(tn), (1.0 / math.tan(te) if te > 0 else math.inf)
    if math.isinf(ce):
        raise ContourError("bell exit angle must be above 0 deg for a parabola of finite length; use a small angle such as 2 deg.")
    ye = y0 + 2.0 * L / (cn + ce)
    A = (ce - cn) / (2.0 * (ye - y0))
    yy = np.linspace(y0, ye, n)[1:]
    dxdy = cn + 2.0 * A * (yy - y0)
    xx = x0 + cn * (yy - y0) + A * (yy - y0) ** 2
    x = np.concatenate(xs + [xx])
    y = np.concatenate(ys + [yy])
    s = np.concatenate(ss + [1.0 / dxdy])
    w = Wall(x, y, s, description=f"parabolic bell {math.degrees(tn):g} to {math.degrees(te):g} deg, length {L:g}",
             throat_arc=throat_radius or None)
    w.meta.update(kind="bell")
    return w


def _num(v, name):
    try:
        f = float(v)
    except (TypeError, ValueError):
        raise ContourError(f"{name} must be a number, got {v!r}.") from None
    if not math.isfinite(f):
        raise ContourError(f"{name} must be a finite number, got {v!r}.")
    return f

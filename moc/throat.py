"""Transonic start: the flow near a rounded throat and the supersonic initial-value line.

A throat whose wall has radius of curvature R (in throat half-heights, planar,
or throat radii, axisymmetric) is started from a published small-parameter
solution of the transonic equations, expanded in eps = 1/R:

* ``"sauer"``: R. Sauer, NACA TM 1147 (1947), the first-order (linear in x,
  quadratic in y) solution; form as in Zucrow and Hoffman, Gas Dynamics vol. 2
  (1977), from memory.
* ``"hall"``: I. M. Hall, Q. J. Mech. Appl. Math. 15(4), 1962, the expansion
  carried to third order in 1/R, planar and axisymmetric.  The coefficients
  below were re-derived by solving the order-by-order equations (irrotational
  isentropic flow, wall streamline on the circular arc); the axisymmetric ones
  coincide with Hall's published u1, u2, u3 (checked term by term against the
  recalled publication).
* ``"kliegel-levine"``: J. R. Kliegel and J. N. Levine, AIAA J. 7(7), 1969:
  the same expansion in 1/(R + 1) (toroidal coordinates); only its discharge
  coefficient is provided here.  Its velocity field is not implemented, so an
  initial line asked from it raises an InputError naming the alternatives.

Velocities are in units of the critical speed a*; x is measured downstream
from the geometric throat, y from the axis; angles are radians.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from moc.errors import ComputationError, InputError
from moc.flow._checks import check_gamma

SOLUTIONS = ("sauer", "hall", "kliegel-levine")
GEOMETRIES = ("planar", "axisymmetric")

#: Accepted throat radius of curvature (wall radius over throat half-height /
#: radius) for each solution.  The expansions are asymptotic in 1/R: Sauer's
#: and Hall's lose accuracy below R = 1; Kliegel and Levine's 1/(R+1) form
#: was published as usable down to about R = 0.5 (from memory).  Above 100 the
#: transonic region is longer than any practical nozzle.
VALID_CURVATURE = {"sauer": (1.0, 100.0), "hall": (1.0, 100.0), "kliegel-levine": (0.5, 100.0)}

# Polynomial coefficients of the expansion u = 1 + sum_k eps^k u_k(z, y),
# v = s sum_k eps^k v_k(z, y), with eps = 1/R, s = sqrt((g+1) eps / (1+d)),
# z = x / s.  Key (d, component, order) -> [(power of z, power of y,
# (c0, c1, c2))] meaning (c0 + c1 g + c2 g^2) z^p y^q.
_TABLE = {
    (0, "u", 1): [(0, 0, ("-1/6", "0", "0")), (0, 2, ("1/2", "0", "0")), (1, 0, ("1", "0", "0"))],
    (0, "u", 2): [(0, 0, ("1/9", "1/270", "0")), (0, 2, ("-1/2", "-1/9", "0")), (0, 4, ("1/3", "1/18", "0")), (1, 0, ("-1/2", "0", "0")), (1, 2, ("1", "0", "0")), (2, 0, ("1/2", "-1/3", "0"))],
    (0, "u", 3): [(0, 0, ("-2543/30240", "-263/12960", "-391/136080")), (0, 2, ("751/1440", "1229/4320", "427/6480")), (0, 4, ("-185/288", "-31/96", "-97/1296")), (0, 6, ("353/1440", "161/1440", "181/6480")), (1, 0, ("581/1440", "143/1440", "67/2160")), (1, 2, ("-21/16", "-17/48", "-13/72")), (1, 4, ("79/96", "3/32", "13/144")), (2, 0, ("-1/2", "7/36", "0")), (2, 2, ("0", "-5/4", "0")), (3, 0, ("1/8", "-11/24", "1/36"))],
    (0, "v", 1): [(0, 1, ("-1/6", "0", "0")), (0, 3, ("1/6", "0", "0")), (1, 1, ("1", "0", "0"))],
    (0, "v", 2): [(0, 1, ("13/72", "17/540", "0")), (0, 3, ("-7/18", "-5/54", "0")), (0, 5, ("5/24", "11/180", "0")), (1, 1, ("-1", "-2/9", "0")), (1, 3, ("4/3", "2/9", "0")), (2, 1, ("1", "0", "0"))],
    (0, "v", 3): [(0, 1, ("-10973/60480", "-27/320", "-757/54432")), (0, 3, ("5153/8640", "2839/8640", "2513/38880")), (0, 5, ("-1831/2880", "-3371/8640", "-1127/12960")), (0, 7, ("4451/20160", "1261/8640", "3287/90720")), (1, 1, ("751/720", "1229/2160", "427/3240")), (1, 3, ("-185/72", "-31/24", "-97/324")), (1, 5, ("353/240", "161/240", "181/1080")), (2, 1, ("-21/16", "-17/48", "-13/72")), (2, 3, ("79/48", "3/16", "13/72")), (3, 1, ("0", "-5/6", "0"))],
    (1, "u", 1): [(0, 0, ("-1/4", "0", "0")), (0, 2, ("1/2", "0", "0")), (1, 0, ("1", "0", "0"))],
    (1, "u", 2): [(0, 0, ("19/96", "5/144", "0")), (0, 2, ("-5/8", "-1/6", "0")), (0, 4, ("3/8", "1/12", "0")), (1, 0, ("-5/8", "0", "0")), (1, 2, ("1", "0", "0")), (2, 0, ("1/2", "-1/3", "0"))],
    (1, "u", 3): [(0, 0, ("-1579/9216", "-871/9216", "-677/20736")), (0, 2, ("23/32", "277/576", "19/108")), (0, 4, ("-209/256", "-129/256", "-97/576")), (0, 6, ("341/1152", "193/1152", "139/2592")), (1, 0, ("71/128", "5/32", "23/288")), (1, 2, ("-93/64", "-25/64", "-13/48")), (1, 4, ("109/128", "17/128", "13/96")), (2, 0, ("-9/16", "13/48", "0")), (2, 2, ("3/8", "-7/8", "0")), (3, 0, ("3/16", "-19/48", "1/36"))],
    (1, "v", 1): [(0, 1, ("-1/4", "0", "0")), (0, 3, ("1/4", "0", "0")), (1, 1, ("1", "0", "0"))],
    (1, "v", 2): [(0, 1, ("31/96", "7/72", "0")), (0, 3, ("-21/32", "-5/24", "0")), (0, 5, ("1/3", "1/9", "0")), (1, 1, ("-5/4", "-1/3", "0")), (1, 3, ("3/2", "1/3", "0")), (2, 1, ("1", "0", "0"))],
    (1, "v", 3): [(0, 1, ("-3361/9216", "-2479/9216", "-1775/20736")), (0, 3, ("141/128", "3757/4608", "107/432")), (0, 5, ("-1699/1536", "-3797/4608", "-845/3456")), (0, 7, ("3403/9216", "853/3072", "1709/20736")), (1, 1, ("23/16", "277/288", "19/54")), (1, 3, ("-209/64", "-129/64", "-97/144")), (1, 5, ("341/192", "193/192", "139/432")), (2, 1, ("-93/64", "-25/64", "-13/48")), (2, 3, ("109/64", "17/64", "13/48")), (3, 1, ("1/4", "-7/12", "0"))],
}

_COEF = {key: [(p, q, tuple(float(Fraction(c)) for c in cs)) for p, q, cs in rows]
         for key, rows in _TABLE.items()}


def check_geometry(geometry):
    """Return 0 (planar) or 1 (axisymmetric) for a geometry name."""
    if geometry not in GEOMETRIES:
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    return GEOMETRIES.index(geometry)


def check_solution(solution):
    if solution not in SOLUTIONS:
        raise InputError(
            f"throat solution must be one of {', '.join(repr(s) for s in SOLUTIONS)}, got {solution!r}."
        )
    return solution


def check_curvature(R, solution="sauer"):
    """Return R as float; it must lie in the solution's published range of validity."""
    check_solution(solution)
    lo, hi = VALID_CURVATURE[solution]
    try:
        r = float(R)
    except (TypeError, ValueError):
        raise InputError(f"throat radius of curvature must be a number, got {R!r}.") from None
    if not np.isfinite(r) or r < lo or r > hi:
        raise InputError(
            f"throat radius of curvature R = {r:g} (throat half-heights / radii) is outside the "
            f"range of the {solution!r} transonic solution; allowed is {lo:g} <= R <= {hi:g}."
        )
    return r


def _order(solution):
    return {"sauer": 1, "hall": 3}[solution]


def _field_solution(solution):
    check_solution(solution)
    if solution == "kliegel-levine":
        raise InputError(
            "the Kliegel-Levine throat solution provides the discharge coefficient only; "
            "for the initial-value line choose throat_solution 'sauer' or 'hall'."
        )
    return solution


def _poly(key, z, y, g):
    out = np.zeros(np.broadcast(z, y).shape)
    for p, q, (c0, c1, c2) in _COEF[key]:
        out = out + (c0 + g * (c1 + g * c2)) * z**p * y**q
    return out


def velocity(x, y, R, gamma=1.4, geometry="axisymmetric", solution="sauer"):
    """Velocity (u, v) in units of a* near a throat of wall curvature radius R.

    x from the geometric throat (downstream positive), y from the axis, both in
    throat half-heights / radii.  Source: Sauer (1947) first order, Hall (1962)
    third order (see module docstring).
    """
    g = check_gamma(gamma)
    d = check_geometry(geometry)
    solution = _field_solution(solution)
    R = check_curvature(R, solution)
    return _velocity(np.asarray(x, float), np.asarray(y, float), R, g, d, _order(solution))


def _velocity(x, y, R, g, d, order):
    eps = 1.0 / R
    s = np.sqrt((g + 1.0) * eps / (1.0 + d))
    z = x / s
    u = np.ones(np.broadcast(x, y).shape)
    v = np.zeros_like(u)
    for k in range(1, order + 1):
        u = u + eps**k * _poly((d, "u", k), z, y, g)
        v = v + s * eps**k * _poly((d, "v", k), z, y, g)
    return u, v


def _mach_from_q(q2, g):
    lim = (g + 1.0) / (g - 1.0)
    if np.any(q2 >= lim) or np.any(q2 <= 0):
        raise ComputationError("the transonic expansion left its range (speed beyond the limit); "
                               "start the initial line closer to the throat.")
    return np.sqrt(2.0 * q2 / ((g + 1.0) - (g - 1.0) * q2))


def state(x, y, R, gamma=1.4, geometry="axisymmetric", solution="sauer"):
    """(theta, M) of the transonic solution at points (x, y); theta in radians."""
    u, v = velocity(x, y, R, gamma, geometry, solution)
    return np.arctan2(v, u), _mach_from_q(u * u + v * v, float(gamma))


def sonic_shift(R, gamma=1.4, geometry="axisymmetric", solution="sauer"):
    """Distance from the geometric throat downstream to the sonic point on the axis.

    Sauer: eps = (g+1) a / (2 (3+d)), a = sqrt((1+d)/((g+1) R)).  For Hall's
    solution the root of u(x, 0) = 1 of the third-order series.
    """
    return float(sonic_line(np.array([0.0]), R, gamma, geometry, solution)[0])


def sonic_line(y, R, gamma=1.4, geometry="axisymmetric", solution="sauer"):
    """x of the sonic line (speed = a*) at heights y, found by bisection on the field."""
    g = check_gamma(gamma)
    d = check_geometry(geometry)
    solution = _field_solution(solution)
    R = check_curvature(R, solution)
    y = np.atleast_1d(np.asarray(y, float))
    if np.any(y < 0) or np.any(y > 1.0 + 1e-12):
        raise InputError("sonic-line heights must lie between the axis (0) and the throat wall (1).")
    order = _order(solution)
    a = np.sqrt((1.0 + d) / ((g + 1.0) * R))
    span = 2.0 * (g + 1.0) * a / (1.0 + d) + 0.5
    lo = np.full_like(y, -span)
    hi = np.full_like(y, span)
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        u, v = _velocity(mid, y, R, g, d, order)
        fast = u * u + v * v > 1.0
        hi = np.where(fast, mid, hi)
        lo = np.where(fast, lo, mid)
    return 0.5 * (lo + hi)


def discharge_coefficient(R, gamma=1.4, geometry="axisymmetric", solution="sauer"):
    """Discharge coefficient Cd = mass flow / one-dimensional sonic mass flow through the throat.

    'sauer': Hall's (1962) leading order, the value Sauer's field implies:
    1 - (g+1)/(90 R^2) planar, 1 - (g+1)/(96 R^2) axisymmetric.
    'hall': the mass flux of the third-order field integrated across the
    throat plane (Simpson's rule); its expansion is
    1 - (g+1)/(96 R^2) [1 - (8g+21)/(24 R) + O(R^-2)] axisymmetric
    (see docs/throat.md).
    'kliegel-levine' (AIAA J. 7(7), 1969; from memory), axisymmetric:
    1 - (g+1)/(96 (R+1)^2) [1 - (8g-27)/(24 (R+1)) + (754 g^2 - 757 g + 3633)/(2880 (R+1)^2)];
    planar: the third-order planar field's throat mass flux evaluated at R + 1.
    """
    g = check_gamma(gamma)
    d = check_geometry(geometry)
    check_solution(solution)
    R = check_curvature(R, solution)
    if solution == "sauer":
        return 1.0 - (g + 1.0) / ((90.0, 96.0)[d] * R * R)
    if solution == "hall":
        return _line_mass_flow(0.0, R, g, d, 3, 1.0, 2001)
    Re = R + 1.0
    if d == 1:
        return 1.0 - (g + 1.0) / (96.0 * Re**2) * (
            1.0 - (8.0 * g - 27.0) / (24.0 * Re) + (754.0 * g * g - 757.0 * g + 3633.0) / (2880.0 * Re**2))
    return _line_mass_flow(0.0, Re, g, 0, 3, 1.0, 2001)


def _flux_density(x, y, R, g, d, order):
    """rho q_n / (rho* a*) across a line x = const (normal velocity u)."""
    u, v = _velocity(x, y, R, g, d, order)
    q2 = u * u + v * v
    t = (g + 1.0) / 2.0 - (g - 1.0) / 2.0 * q2   # (a/a*)^2 = rho/rho* ^(g-1)
    return np.maximum(t, 0.0) ** (1.0 / (g - 1.0)) * u


def _line_mass_flow(x, R, g, d, order, y_top, n):
    """Mass flow across x = const from the axis to y_top over the 1-D sonic flow through the throat."""
    yy = np.linspace(0.0, y_top, n)
    f = _flux_density(np.full_like(yy, x), yy, R, g, d, order) * ((1.0 + d) * yy**d)
    h = yy[1] - yy[0]
    # Simpson's rule (n odd)
    return float(h / 3.0 * (f[0] + f[-1] + 4.0 * f[1:-1:2].sum() + 2.0 * f[2:-1:2].sum()))


def field_discharge_coefficient(R, gamma=1.4, geometry="axisymmetric", solution="sauer", x=0.0):
    """Mass flux of the chosen field integrated across the plane x (default the throat), over 1-D sonic flow."""
    g = check_gamma(gamma)
    d = check_geometry(geometry)
    solution = _field_solution(solution)
    R = check_curvature(R, solution)
    return _line_mass_flow(float(x), R, g, d, _order(solution), float(throat_wall(x, R)[0]), 2001)


def throat_wall(x, R):
    """Circular-arc throat wall y = 1 + R - sqrt(R^2 - x^2): (y, dy/dx, d2y/dx2)."""
    x = np.asarray(x, float)
    if np.any(np.abs(x) >= R):
        raise InputError(f"the throat arc of radius {R:g} only spans |x| < {R:g}.")
    w = np.sqrt(R * R - x * x)
    return 1.0 + R - w, x / w, R * R / w**3


@dataclass
class InitialLine:
    """A supersonic initial-value line x = const from the axis (index 0) to the wall (index -1).

    mass_flow: mass flow of the field across the line over the 1-D sonic mass
    flow through the geometric throat (equals the field's own Cd).
    discharge_coefficient: the published Cd of the chosen solution.
    sonic_shift: distance of the axis sonic point downstream of the throat.
    """

    x: np.ndarray
    y: np.ndarray
    theta: np.ndarray
    mach: np.ndarray
    geometry: str
    gamma: float
    throat_curvature: float
    solution: str
    mass_flow: float
    discharge_coefficient: float
    sonic_shift: float

    @property
    def wall_angle(self):
        """Throat-arc wall angle at the line's wall point (radians)."""
        return float(np.arcsin(self.x[-1] / self.throat_curvature))


def _start_inputs(R, gamma, geometry, solution, n, x, min_n, what):
    """Checked inputs of an initial-value line: (g, d, solution, R, n, order, x, shift), x defaulting to
    1.25 times the axis sonic-point shift and required between that point and half the arc radius."""
    g = check_gamma(gamma)
    d = check_geometry(geometry)
    solution = _field_solution(solution)
    R = check_curvature(R, solution)
    if isinstance(n, bool) or not isinstance(n, (int, np.integer, float)) or int(n) != n or n < min_n:
        raise InputError(f"{what} needs n of at least {min_n}, got n = {n!r}.")
    shift = float(sonic_line(np.array([0.0]), R, g, geometry, solution)[0])
    x0 = 1.25 * shift if x is None else float(x)
    if not np.isfinite(x0) or x0 <= shift or x0 >= 0.5 * R:
        raise InputError(
            f"{what} must lie downstream of the axis sonic point (x > {shift:.5g}) "
            f"and within the throat arc (x < {0.5 * R:.5g}); got x = {x!r}."
        )
    return g, d, solution, R, int(n), _order(solution), x0, shift


def initial_line(R, gamma=1.4, geometry="axisymmetric", solution="sauer", n=51, x=None):
    """Supersonic initial-value line across a rounded throat.

    The line is the plane x = const, by default 1.25 times the distance from the
    geometric throat to the axis sonic point (so every point is supersonic and
    the line is crossed by both characteristic families: theta + mu < 90 deg).
    Points are evenly spaced from the axis to the throat arc.
    """
    g, d, solution, R, n, order, x0, shift = _start_inputs(R, gamma, geometry, solution, n, x, 3, "the initial line")
    yw = float(throat_wall(x0, R)[0])
    y = np.linspace(0.0, yw, n)
    xs = np.full(n, x0)
    u, v = _velocity(xs, y, R, g, d, order)
    q2 = u * u + v * v
    if np.any(q2 <= 1.0):
        raise ComputationError(
            f"the initial line at x = {x0:.5g} is not supersonic everywhere; move it downstream."
        )
    mach = _mach_from_q(q2, g)
    theta = np.arctan2(v, u)
    mu = np.arcsin(1.0 / mach)
    if np.any(theta + mu >= 0.5 * np.pi):
        raise ComputationError(
            f"the initial line at x = {x0:.5g} is tangent to a C+ characteristic somewhere; move it downstream."
        )
    mass = _line_mass_flow(x0, R, g, d, order, yw, 2 * (n // 2) * 4 + 1)
    return InitialLine(x=xs, y=y, theta=theta, mach=mach, geometry=geometry, gamma=g,
                       throat_curvature=R, solution=solution, mass_flow=mass,
                       discharge_coefficient=discharge_coefficient(R, g, geometry, solution),
                       sonic_shift=shift)


def initial_cminus(R, gamma=1.4, geometry="axisymmetric", solution="sauer", n=50, x_axis=None):
    """Initial C- characteristic through the transonic field, from the throat arc (first) to the axis.

    The C- dy/dx = tan(theta - mu) through the axis point x_axis (default
    1.25 times the sonic shift) is integrated upstream through the field by
    the classical fourth-order Runge-Kutta rule in y (step 1/(8n)) to the
    throat arc; n + 1 points evenly spaced in y are returned as a dict x, y,
    theta, mach, plus mass_flow (mass flow of the field across the
    characteristic over the 1-D sonic flow through the throat, evaluated on
    the fine integration path).
    """
    g, d, solution, R, n, order, xa, shift = _start_inputs(R, gamma, geometry, solution, n, x_axis, 2,
                                                           "the initial characteristic")

    def dxdy(x, y):
        u, v = _velocity(np.array([x]), np.array([y]), R, g, d, order)
        q2 = float(u[0] ** 2 + v[0] ** 2)
        if q2 <= 1.0:
            raise ComputationError(
                f"the transonic field is subsonic at x = {x:.4g}, y = {y:.4g}; start the initial "
                "characteristic further downstream."
            )
        m = float(_mach_from_q(np.array([q2]), g)[0])
        return 1.0 / np.tan(np.arctan2(v[0], u[0]) - np.arcsin(1.0 / m))

    def gap(x, y):
        return y - float(throat_wall(np.array([x]), R)[0][0])

    h = 1.0 / (8 * n)
    xs, ys = [xa], [0.0]
    while gap(xs[-1], ys[-1]) < 0.0:
        x, y = xs[-1], ys[-1]
        k1 = dxdy(x, y)
        k2 = dxdy(x + 0.5 * h * k1, y + 0.5 * h)
        k3 = dxdy(x + 0.5 * h * k2, y + 0.5 * h)
        k4 = dxdy(x + h * k3, y + h)
        xs.append(x + h * (k1 + 2 * k2 + 2 * k3 + k4) / 6.0)
        ys.append(y + h)
        if len(ys) > 40 * n:
            raise ComputationError("the initial characteristic does not reach the throat wall.")
    g0, g1 = gap(xs[-2], ys[-2]), gap(xs[-1], ys[-1])
    t = g0 / (g0 - g1)
    xs[-1] = xs[-2] + t * (xs[-1] - xs[-2])
    ys[-1] = ys[-2] + t * (ys[-1] - ys[-2])
    px, py = np.array(xs), np.array(ys)
    # mass flow across the fine path: rho (u dy - v dx) (1+d) y^d, trapezoidal rule
    u, v = _velocity(px, py, R, g, d, order)
    q2 = u * u + v * v
    rho = np.maximum((g + 1.0) / 2.0 - (g - 1.0) / 2.0 * q2, 0.0) ** (1.0 / (g - 1.0))
    w = (1.0 + d) * py**d
    fu, fv = rho * u * w, rho * v * w
    mass = float(np.sum(0.5 * (fu[1:] + fu[:-1]) * np.diff(py) - 0.5 * (fv[1:] + fv[:-1]) * np.diff(px)))
    yq = np.linspace(py[-1], 0.0, n + 1)
    xq = np.interp(yq, py, px)
    uq, vq = _velocity(xq, yq, R, g, d, order)
    theta = np.arctan2(vq, uq)
    theta[-1] = 0.0
    mach = _mach_from_q(uq * uq + vq * vq, g)
    return {"x": xq, "y": yq, "theta": theta, "mach": mach, "mass_flow": mass, "sonic_shift": shift}

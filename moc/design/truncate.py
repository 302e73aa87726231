"""Truncation of a designed contour, and the thrust integral across an exit curve.

`truncate(result, length_fraction= | area_ratio= | exit_wall_angle_deg=)`
cuts the wall at one of three criteria and returns a new Result: the wall and
the net up to the cut, the exit plane x = x_cut with the flow interpolated
from the net (linear on the net's Delaunay triangles; in the uniform region
downstream of the exit characteristic the exit state itself), and a summary
reporting what the cut costs: thrust coefficient lost (vacuum), length lost,
exit non-uniformity.  Truncated ideal contours are the classic way to trade
a little thrust for much length and mass (Hoffman, J. Propulsion 3(2), 1987,
truncated ideal nozzles; from memory).

`exit_fluxes` integrates mass, x-momentum and pressure across a curve from
the axis to the lip (control-volume thrust, Sutton and Biblarz, Rocket
Propulsion Elements, ideal-rocket chapter); `moc.performance` uses it too.
"""

from __future__ import annotations

import copy
import math

import numpy as np

from moc.errors import InputError
from moc.flow import area_ratio as _area_ratio
from moc.flow import pressure_ratio
from moc.flow._checks import check_gamma
from moc.result import Net, Result


def _delta(geometry):
    if geometry not in ("planar", "axisymmetric"):
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    return 1 if geometry == "axisymmetric" else 0


def exit_fluxes(x, y, theta, mach, gamma, geometry, p0_ratio=None):
    """Integrals across a curve from the axis to the lip (points in order, trapezoidal rule).

    Returns dict: momentum (x-momentum flux / (p0 A_t)), pressure (INT p/p0 dA / A_t),
    area (projected exit area / A_t), mass (mass flow over rho* a* A_t, i.e. the
    one-dimensional sonic flow through the throat), mass_velocity (mass-averaged u / a*).
    p0_ratio: local total pressure over the chamber value (behind shocks), default 1.
    """
    g = check_gamma(gamma)
    d = _delta(geometry)
    x, y, th, m = (np.asarray(v, float) for v in (x, y, theta, mach))
    r0 = np.ones_like(m) if p0_ratio is None else np.asarray(p0_ratio, float) * np.ones_like(m)
    if x.ndim != 1 or x.size < 2 or not (x.shape == y.shape == th.shape == m.shape):
        raise InputError("an exit curve needs at least two points with x, y, theta and Mach of equal length.")
    if not (np.all(np.isfinite(x)) and np.all(np.isfinite(y)) and np.all(np.isfinite(th)) and np.all(np.isfinite(m))):
        raise InputError("the exit curve has non-finite values; the flowfield does not reach the exit.")
    # drop repeated points (a lip that coincides with a net point)
    keep = np.concatenate([[True], (np.abs(np.diff(x)) > 1e-12) | (np.abs(np.diff(y)) > 1e-12)])
    x, y, th, m, r0 = x[keep], y[keep], th[keep], m[keep], r0[keep]
    if abs(y[0]) > 1e-9 or np.any(np.diff(y) <= 0):
        raise InputError("the exit curve must start on the axis (y = 0) and rise monotonically to the lip.")
    p = r0 * pressure_ratio(m, g)
    dy, dx = np.diff(y), np.diff(x)
    w = (1.0 + d) * y**d
    c, s = np.cos(th), np.sin(th)

    def seg(f_dy, f_dx=None):
        # trapezoid on each segment of the integrand times the radius weight
        v = 0.5 * ((f_dy * w)[1:] + (f_dy * w)[:-1]) * dy
        if f_dx is not None:
            v = v - 0.5 * ((f_dx * w)[1:] + (f_dx * w)[:-1]) * dx
        return float(np.sum(v))

    gm2 = g * m * m * p
    rho_v = r0 / _area_ratio(m, g)        # rho V / (rho* a*), NACA Report 1135 (times p0/p0,chamber)
    a_ratio = np.sqrt((g + 1.0) / 2.0 * m * m / (1.0 + 0.5 * (g - 1.0) * m * m))  # V / a*
    mass = seg(rho_v * c, rho_v * s)
    mom = seg(gm2 * c * c, gm2 * c * s)
    return {
        "momentum": mom,
        "pressure": seg(p),
        "area": float(y[-1] ** (1 + d)),
        "mass": mass,
        "mass_velocity": seg(rho_v * a_ratio * c * c, rho_v * a_ratio * c * s) / mass,
    }


def _cut_x(wall, delta, length_fraction, area_ratio, exit_wall_angle_deg):
    x, y, th = (np.asarray(wall[k], float) for k in ("x", "y", "theta"))
    given = [v is not None for v in (length_fraction, area_ratio, exit_wall_angle_deg)]
    if sum(given) != 1:
        raise InputError("give exactly one truncation criterion: length_fraction, area_ratio or exit_wall_angle_deg.")
    L = float(x[-1])
    if length_fraction is not None:
        f = float(length_fraction)
        if not math.isfinite(f) or f <= x[0] / L or f > 1.0:
            raise InputError(
                f"length fraction {length_fraction!r} is beyond the contour; allowed is {x[0] / L:.4g} < fraction <= 1 "
                "(fraction of the length from the throat to the exit)."
            )
        return f * L, "length_fraction", f
    if area_ratio is not None:
        ar = float(area_ratio)
        k0 = int(np.argmin(y))  # from the narrowest section downstream
        x, y = x[k0:], y[k0:]
        a = y ** (1 + delta)
        if not np.all(np.diff(a) > 0):
            raise InputError("the wall radius does not grow monotonically, so an area-ratio cut is ambiguous.")
        if not math.isfinite(ar) or ar <= a[0] or ar > a[-1]:
            raise InputError(
                f"area ratio {area_ratio!r} is beyond the contour; allowed is {a[0]:.5g} < area ratio <= {a[-1]:.5g} "
                "(throat to exit)."
            )
        return float(np.interp(ar, a, x)), "area_ratio", ar
    ang = math.radians(float(exit_wall_angle_deg))
    k = int(np.argmax(th))
    if not math.isfinite(ang) or ang < th[-1] - 1e-12 or ang >= th[k]:
        raise InputError(
            f"exit wall angle {exit_wall_angle_deg!r} deg is beyond the contour; allowed is "
            f"{math.degrees(th[-1]):.4g} <= angle < {math.degrees(th[k]):.4g} deg (the straightening section)."
        )
    tail_th = th[k:]
    j = k + int(np.argmax(tail_th <= ang))
    # theta falls from th[j-1] > ang to th[j] <= ang
    t = (th[j - 1] - ang) / (th[j - 1] - th[j]) if th[j - 1] != th[j] else 1.0
    return float(x[j - 1] + t * (x[j] - x[j - 1])), "exit_wall_angle_deg", float(exit_wall_angle_deg)


def exit_plane(result, x_cut, points=101):
    """Flow across the plane x = x_cut from the axis to the wall: dict x, y, theta, mach."""
    from scipy.interpolate import LinearNDInterpolator, NearestNDInterpolator

    net, wall = result.net, result.wall
    yw = float(np.interp(x_cut, wall["x"], wall["y"]))
    y = yw * np.linspace(0.0, 1.0, int(points))
    x = np.full_like(y, x_cut)
    pts = np.column_stack([net.x, net.y])
    vals = np.column_stack([net.theta, net.mach])
    lin = LinearNDInterpolator(pts, vals)(x, y)
    ex = result.exit
    if ex and "x" in ex and len(ex["x"]) > 1:
        # downstream of the exit characteristic the flow is the exit flow
        xe_at_y = np.interp(y, ex["y"], ex["x"], right=np.inf)
        down = x > xe_at_y
        lin[down, 0] = np.interp(y[down], ex["y"], ex["theta"])
        lin[down, 1] = np.interp(y[down], ex["y"], ex["mach"])
    bad = ~np.all(np.isfinite(lin), axis=1)
    if np.any(bad):
        lin[bad] = NearestNDInterpolator(pts, vals)(x[bad], y[bad])
    lin[0, 0] = 0.0  # on the axis the flow is axial
    lin[-1, 0] = float(np.interp(x_cut, wall["x"], wall["theta"]))
    lin[-1, 1] = float(np.interp(x_cut, wall["x"], wall["mach"]))
    return {"x": x, "y": y, "theta": lin[:, 0], "mach": lin[:, 1]}


def _thrust_vacuum(curve, g, geometry):
    fl = exit_fluxes(curve["x"], curve["y"], curve["theta"], curve["mach"], g, geometry)
    return fl["momentum"] + fl["pressure"], fl


def truncate(result, length_fraction=None, area_ratio=None, exit_wall_angle_deg=None):
    """Cut a designed contour at a length fraction, an exit area ratio or an exit wall angle.

    Returns a new Result: wall and net up to the cut, exit = the exit plane at
    the cut, and summary keys truncation_* reporting the cost (vacuum thrust
    coefficient and length lost, exit Mach and flow-angle spread).
    """
    s = result.summary
    try:
        g = check_gamma(s["gamma"])
        geometry = s["geometry"]
    except KeyError as exc:
        raise InputError(f"the result's summary lacks {exc.args[0]!r}; truncate needs a designed nozzle.") from None
    delta = _delta(geometry)
    wall = result.wall
    x_cut, crit, value = _cut_x(wall, delta, length_fraction, area_ratio, exit_wall_angle_deg)
    wx = np.asarray(wall["x"], float)
    keep = wx < x_cut - 1e-12
    new_wall = {}
    for k, v in wall.items():
        v = np.asarray(v, float)
        new_wall[k] = np.append(v[keep], np.interp(x_cut, wx, v))
    new_wall["x"][-1] = x_cut
    ex = exit_plane(result, x_cut)
    cf_full, _ = _thrust_vacuum(result.exit, g, geometry) if result.exit else (float("nan"), None)
    cf_cut, fl = _thrust_vacuum(ex, g, geometry)
    # net up to the cut
    net = result.net
    inside = net.x <= x_cut + 1e-12
    new_index = -np.ones(net.size, dtype=np.int64)
    new_index[inside] = np.arange(int(inside.sum()))
    cells = net.cells[np.all(inside[net.cells], axis=1)]
    new_net = Net(x=net.x[inside], y=net.y[inside], theta=net.theta[inside], mach=net.mach[inside],
                  cplus=net.cplus[inside], cminus=net.cminus[inside], cells=new_index[cells],
                  p0_ratio=net.p0_ratio[inside])
    axis = {}
    if result.axis and "x" in result.axis:
        ax = np.asarray(result.axis["x"], float)
        ok = ax <= x_cut
        axis = {k: np.append(np.asarray(v)[ok], np.interp(x_cut, ax, np.asarray(v, float))) for k, v in result.axis.items()}
    L_full = float(wx[-1])
    m = ex["mach"]
    summary = dict(s)
    ar_new = float(new_wall["y"][-1] ** (1 + delta))
    summary.update({
        "truncated": True,
        "truncation_criterion": crit,
        "truncation_value": value,
        "truncation_x": x_cut,
        "length": x_cut,
        "length_full": L_full,
        "length_lost": L_full - x_cut,
        "length_fraction_kept": x_cut / L_full,
        "area_ratio_full": float(s.get("area_ratio", wall["y"][-1] ** (1 + delta))),
        "area_ratio": ar_new,
        "exit_height": float(new_wall["y"][-1]),
        "exit_wall_angle_deg": float(np.degrees(new_wall["theta"][-1])),
        "exit_mach": float(np.sum(m) / m.size),
        "exit_mach_max_dev": float(np.max(np.abs(m - np.mean(m)))),
        "exit_mach_spread": float(m.max() - m.min()),
        "exit_flow_angle_max_deg": float(np.degrees(np.max(np.abs(ex["theta"])))),
        "truncation_thrust_coefficient_vacuum_full": cf_full,
        "truncation_thrust_coefficient_vacuum": cf_cut,
        "truncation_thrust_coefficient_lost": cf_full - cf_cut,
        "truncation_thrust_loss_fraction": (cf_full - cf_cut) / cf_full,
        "truncation_exit_mass_flow_ratio": fl["mass"],
        "points": int(new_net.size),
        "wall_points": int(new_wall["x"].size),
    })
    summary.pop("area_ratio_error", None)
    summary.pop("area_ratio_streamline_error", None)
    summary["area_ratio_isentropic"] = float(_area_ratio(s["exit_mach"], g)) if "exit_mach" in s else None
    inputs = copy.deepcopy(result.inputs)
    inputs["truncate"] = {crit: value}
    return Result(kind=result.kind, inputs=inputs, summary=summary, net=new_net, wall=new_wall,
                  axis=axis, exit=ex, inlet=copy.deepcopy(result.inlet), shocks=list(result.shocks))

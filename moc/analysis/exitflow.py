"""Exit-plane profile, mass flow and thrust of an analysed contour.

Vacuum thrust by the momentum balance on the nozzle wall: the throat
momentum flux plus pressure, (gamma + 1) p* A* for a uniform sonic throat,
plus the integral of the wall pressure over the projected wall area (Sutton
and Biblarz, Rocket Propulsion Elements, thrust chapter).  The same thrust
from the exit plane, integral of (p + rho u^2) dA, is a check (momentum
conservation), as is the exit mass flow against the sonic throat flow.
Ideal one-dimensional vacuum thrust coefficient, same area ratio:
C_F = sqrt(2 g^2/(g-1) (2/(g+1))^((g+1)/(g-1)) (1 - (pe/p0)^((g-1)/g))) + eps pe/p0
(Sutton and Biblarz, ideal-rocket chapter).
"""

from __future__ import annotations

import math

import numpy as np

from moc.flow import mach_from_area_ratio, pressure_ratio


def throat_thrust_coefficient(gamma):
    """(gamma + 1) p*/p0 for a uniform sonic throat (momentum plus pressure over p0 A*)."""
    g = gamma
    return (g + 1.0) * (2.0 / (g + 1.0)) ** (g / (g - 1.0))


def ideal_vacuum_cf(area_ratio, gamma):
    """Ideal 1-D vacuum thrust coefficient at the exit area ratio (Sutton and Biblarz)."""
    g = gamma
    me = float(mach_from_area_ratio(area_ratio, g, supersonic=True))
    pe = float(pressure_ratio(me, g))
    mom = math.sqrt(2 * g * g / (g - 1) * (2 / (g + 1)) ** ((g + 1) / (g - 1)) * (1 - pe ** ((g - 1) / g)))
    return mom + area_ratio * pe, me, pe


def _dA(y, delta):
    """d(A/A*) per dy: 1 (planar half-height) or 2 y (axisymmetric radius)."""
    return 2.0 * y if delta else np.ones_like(y)


def wall_thrust(wx, wy, wmach, wlnp0, x_end, gamma, delta, cf_start=None):
    """Vacuum C_F from the wall pressure integral up to x_end, or None if the wall is not covered.

    cf_start: momentum plus pressure flux through the initial line (default: a uniform sonic throat).
    """
    o = np.argsort(wx)
    wx, wy, wm, wl = wx[o], wy[o], wmach[o], wlnp0[o]
    good = np.isfinite(wm)
    wx, wy, wm, wl = wx[good], wy[good], wm[good], wl[good]
    if wx.size < 2 or wx[-1] < x_end - 1e-9:
        return None
    p = np.exp(wl) * pressure_ratio(wm, gamma)
    keep = wx <= x_end
    xs, ys, ps = wx[keep], wy[keep], p[keep]
    if xs[-1] < x_end:
        ye = np.interp(x_end, wx, wy)
        pe = np.interp(x_end, wx, p)
        xs, ys, ps = np.append(xs, x_end), np.append(ys, ye), np.append(ps, pe)
    A = ys**2 if delta else ys
    c0 = throat_thrust_coefficient(gamma) if cf_start is None else cf_start
    return c0 + float(np.sum(0.5 * (ps[1:] + ps[:-1]) * np.diff(A)))


def section(polylines, x_cut):
    """Samples (y, theta, nu, lnp0) where polylines (dicts of arrays) cross x = x_cut, sorted by y."""
    ys, th, nu, lp = [], [], [], []
    for pl in polylines:
        x = pl["x"]
        if x.size < 2:
            continue
        g = x - x_cut
        idx = np.flatnonzero((g[:-1] <= 0) & (g[1:] > 0) | (g[:-1] > 0) & (g[1:] <= 0))
        for j in idx:
            u = g[j] / (g[j] - g[j + 1])
            vals = [pl[k][j] + u * (pl[k][j + 1] - pl[k][j]) for k in ("y", "theta", "nu", "lnp0")]
            if all(np.isfinite(vals)):
                ys.append(vals[0]); th.append(vals[1]); nu.append(vals[2]); lp.append(vals[3])
    o = np.argsort(ys)
    return {k: np.asarray(v, float)[o] for k, v in (("y", ys), ("theta", th), ("nu", nu), ("lnp0", lp))}


def exit_integrals(prof, mach, gamma, delta, y_wall):
    """Area-mean Mach, largest deviation, mass-flow ratio to the sonic throat, exit-plane C_F (vacuum)."""
    g = gamma
    y, th, lp = prof["y"], prof["theta"], prof["lnp0"]
    if y.size < 3:
        return None
    # close the section at the axis and at the wall with the nearest samples
    y = np.concatenate([[0.0], y, [max(y_wall, y[-1])]])
    th = np.concatenate([[0.0], th, [th[-1]]])
    lp = np.concatenate([[lp[0]], lp, [lp[-1]]])
    mach = np.concatenate([[mach[0]], mach, [mach[-1]]])
    w = _dA(y, delta)
    tf = 1.0 + 0.5 * (g - 1.0) * mach**2
    p = np.exp(lp) * tf ** (-g / (g - 1.0))
    rho_u = np.exp(lp) * tf ** (-1.0 / (g - 1.0)) * mach * np.cos(th) * tf ** -0.5
    star = (2.0 / (g + 1.0)) ** ((g + 1.0) / (2.0 * (g - 1.0)))
    mom = p * (1.0 + g * mach**2 * np.cos(th) ** 2)

    def integ(f):
        return float(np.trapezoid(f * w, y)) if hasattr(np, "trapezoid") else float(np.trapz(f * w, y))

    area = integ(np.ones_like(y))
    mean = integ(mach) / area
    return {
        "exit_mach": mean,
        "exit_mach_max_dev": float(np.max(np.abs(mach - mean))),
        "exit_mach_min": float(mach.min()),
        "exit_mach_max": float(mach.max()),
        "mass_flow_ratio": integ(rho_u) / star,
        "thrust_coefficient_exit_plane": integ(mom),
        "exit_flow_angle_max_deg": float(np.degrees(np.max(np.abs(th)))),
        "exit_section_coverage": float((y.max() - y.min()) / y_wall),
    }

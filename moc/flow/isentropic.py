"""Isentropic flow of a calorically perfect gas.

Source: NACA Report 1135 (Ames Research Staff, 1953), isentropic-flow
equations (closed forms).  All functions are vectorised: scalars in, scalars
out; arrays in, arrays out.
"""

import numpy as np

from moc.errors import InputError
from moc.flow._checks import as_float_array, check_gamma, check_mach, fmt, out


def temperature_ratio(mach, gamma=1.4):
    """T/T0 = 1 / (1 + (g-1)/2 M^2)."""
    g = check_gamma(gamma)
    m, s = check_mach(mach)
    return out(1.0 / (1.0 + 0.5 * (g - 1.0) * m * m), s)


def pressure_ratio(mach, gamma=1.4):
    """p/p0 = (T/T0)^(g/(g-1))."""
    g = check_gamma(gamma)
    m, s = check_mach(mach)
    return out((1.0 + 0.5 * (g - 1.0) * m * m) ** (-g / (g - 1.0)), s)


def density_ratio(mach, gamma=1.4):
    """rho/rho0 = (T/T0)^(1/(g-1))."""
    g = check_gamma(gamma)
    m, s = check_mach(mach)
    return out((1.0 + 0.5 * (g - 1.0) * m * m) ** (-1.0 / (g - 1.0)), s)


def _area_ratio(m, g):
    e = (g + 1.0) / (2.0 * (g - 1.0))
    return (2.0 / (g + 1.0) * (1.0 + 0.5 * (g - 1.0) * m * m)) ** e / m


def area_ratio(mach, gamma=1.4):
    """A/A* = (1/M) [2/(g+1) (1 + (g-1)/2 M^2)]^((g+1)/(2(g-1)))."""
    g = check_gamma(gamma)
    m, s = check_mach(mach)
    return out(_area_ratio(m, g), s)


def mass_flow_parameter(mach, gamma=1.4):
    """Mass-flow function mdot sqrt(R T0) / (p0 A) = sqrt(g) M (1 + (g-1)/2 M^2)^(-(g+1)/(2(g-1)))."""
    g = check_gamma(gamma)
    m, s = check_mach(mach)
    e = (g + 1.0) / (2.0 * (g - 1.0))
    return out(np.sqrt(g) * m * (1.0 + 0.5 * (g - 1.0) * m * m) ** (-e), s)


def choked_mass_flow_parameter(gamma=1.4):
    """Mass-flow function at M = 1: sqrt(g) (2/(g+1))^((g+1)/(2(g-1)))."""
    g = check_gamma(gamma)
    return float(np.sqrt(g) * (2.0 / (g + 1.0)) ** ((g + 1.0) / (2.0 * (g - 1.0))))


def mach_from_area_ratio(ratio, gamma=1.4, supersonic=True):
    """Inverse of A/A*(M) on the supersonic (default) or the subsonic branch.

    Safeguarded Newton iteration on ln(A/A*) with a bracket, accurate to
    machine precision on both branches including A/A* -> 1.
    """
    g = check_gamma(gamma)
    a, s = as_float_array(ratio, "area ratio A/A*")
    bad = a < 1.0 - 1e-12
    if np.any(bad):
        raise InputError(
            f"area ratio A/A* must be at least 1 (A* is the smallest section), got {fmt(a[bad].ravel()[0])}."
        )
    a = np.maximum(a, 1.0)  # round-off below 1 at the sonic point
    target = np.log(a)
    if supersonic:
        # A/A* ~ M^((g+1)/(g-1)) / const for large M: bracket generously.
        lo = np.ones_like(a)
        hi = np.full_like(a, 2.0)
        while np.any(np.log(_area_ratio(hi, g)) < target):
            hi = np.where(np.log(_area_ratio(hi, g)) < target, hi * 2.0, hi)
    else:
        lo = np.zeros_like(a) + 1e-300
        hi = np.ones_like(a)
    x = 0.5 * (lo + hi)
    for _ in range(200):
        f = np.log(_area_ratio(x, g)) - target
        # d ln(A/A*)/dM = (M^2 - 1) / (M (1 + (g-1)/2 M^2))
        df = (x * x - 1.0) / (x * (1.0 + 0.5 * (g - 1.0) * x * x))
        # ln(A) increases with M on the supersonic branch, decreases on the subsonic one
        if supersonic:
            lo = np.where(f < 0, x, lo)
            hi = np.where(f > 0, x, hi)
        else:
            lo = np.where(f > 0, x, lo)
            hi = np.where(f < 0, x, hi)
        with np.errstate(divide="ignore", invalid="ignore"):
            xn = x - f / df
        outside = ~np.isfinite(xn) | (xn <= lo) | (xn >= hi)
        xn = np.where(outside, 0.5 * (lo + hi), xn)
        done = np.all(np.abs(xn - x) <= 1e-15 * np.maximum(1.0, x)) or np.all(hi - lo <= 1e-15 * hi)
        x = xn
        if done:
            break
    x = np.where(a == 1.0, 1.0, x)
    return out(x, s)

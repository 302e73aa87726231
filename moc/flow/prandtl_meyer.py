"""Mach angle and the Prandtl-Meyer function with a robust inverse.

Source: NACA Report 1135 (Ames Research Staff, 1953), Prandtl-Meyer
equations.  Angles in radians.
"""

import numpy as np

from moc.errors import PrandtlMeyerError
from moc.flow._checks import as_float_array, check_gamma, check_mach, out


def mach_angle(mach):
    """mu = asin(1/M) for M >= 1."""
    m, s = check_mach(mach, supersonic=True)
    return out(np.arcsin(1.0 / m), s)


def nu_max(gamma=1.4):
    """Largest Prandtl-Meyer angle (M -> infinity): pi/2 (sqrt((g+1)/(g-1)) - 1)."""
    g = check_gamma(gamma)
    return float(0.5 * np.pi * (np.sqrt((g + 1.0) / (g - 1.0)) - 1.0))


def _nu_of_t(t, k):
    # t = atan(sqrt(M^2 - 1)) = pi/2 - mu, so M = 1/cos(t)
    return k * np.arctan(np.tan(t) / k) - t


def prandtl_meyer(mach, gamma=1.4):
    """nu(M) = k atan(sqrt(M^2-1)/k) - atan(sqrt(M^2-1)), k = sqrt((g+1)/(g-1))."""
    g = check_gamma(gamma)
    m, s = check_mach(mach, supersonic=True)
    k = np.sqrt((g + 1.0) / (g - 1.0))
    b = np.sqrt(m * m - 1.0)
    return out(k * np.arctan(b / k) - np.arctan(b), s)


def mach_from_prandtl_meyer(nu, gamma=1.4):
    """Inverse Prandtl-Meyer function, 0 <= nu < nu_max.

    Newton iteration on nu^(1/3) in the variable t = atan(sqrt(M^2-1)), both of
    which are smooth near M = 1 (where nu ~ t^3) and near nu_max, with a
    bracketing safeguard; converges to machine precision.
    """
    g = check_gamma(gamma)
    v, s = as_float_array(nu, "Prandtl-Meyer angle")
    vmax = nu_max(g)
    if np.any(v < 0.0):
        bad = v[v < 0.0].ravel()[0]
        raise PrandtlMeyerError(
            f"Prandtl-Meyer angle must be at least 0 deg, got {np.degrees(bad):.6g} deg."
        )
    if np.any(v >= vmax):
        bad = v[v >= vmax].ravel()[0]
        raise PrandtlMeyerError(
            f"Prandtl-Meyer angle {np.degrees(bad):.6g} deg is at or beyond nu_max = "
            f"{np.degrees(vmax):.6g} deg for gamma = {g:.6g}; allowed is 0 <= nu < nu_max."
        )
    k = np.sqrt((g + 1.0) / (g - 1.0))
    c = 1.0 - 1.0 / (k * k)
    target = np.cbrt(v)
    lo = np.zeros_like(v)
    hi = np.full_like(v, 0.5 * np.pi)
    t = np.clip(np.arctan(np.cbrt(3.0 * v / c)), 0.0, 0.5 * np.pi * (1 - 1e-12))
    for _ in range(100):
        nv = _nu_of_t(t, k)
        f = np.cbrt(nv) - target
        lo = np.where(f < 0, t, lo)
        hi = np.where(f > 0, t, hi)
        tb = np.tan(t)
        dnu = tb * tb * c / (1.0 + tb * tb / (k * k))
        with np.errstate(divide="ignore", invalid="ignore"):
            # d(nu^(1/3))/dt; its limit at t -> 0 is c^(1/3) / 3^(1/3)
            df = np.where(nv > 0, dnu / (3.0 * np.cbrt(nv) ** 2), np.cbrt(c / 3.0))
            tn = t - f / df
        bad = ~np.isfinite(tn) | (tn < lo) | (tn > hi)
        tn = np.where(bad, 0.5 * (lo + hi), tn)
        done = np.all(np.abs(tn - t) <= 4e-16 * np.maximum(t, 1e-300))
        t = tn
        if done:
            break
    m = 1.0 / np.cos(t)
    m = np.where(v == 0.0, 1.0, m)
    return out(m, s)

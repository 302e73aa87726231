"""Normal and oblique shock relations for a calorically perfect gas.

Source: NACA Report 1135 (Ames Research Staff, 1953), normal- and
oblique-shock equations (the theta-beta-M relation and the closed form of the
shock angle at maximum deflection and at sonic downstream flow).
Angles in radians.
"""

from dataclasses import dataclass

import numpy as np

from moc.errors import DetachedShockError, InputError
from moc.flow._checks import as_float_array, check_gamma, check_mach, out


@dataclass(frozen=True)
class ShockState:
    """Downstream state of a shock; every field a float or an array."""

    beta: object  # shock angle, rad (pi/2 for a normal shock)
    theta: object  # flow deflection, rad
    m2: object
    p2_p1: object
    rho2_rho1: object
    T2_T1: object
    p02_p01: object


def _normal(mn1, g):
    m2sq = (1.0 + 0.5 * (g - 1.0) * mn1**2) / (g * mn1**2 - 0.5 * (g - 1.0))
    p = 1.0 + 2.0 * g / (g + 1.0) * (mn1**2 - 1.0)
    r = (g + 1.0) * mn1**2 / ((g - 1.0) * mn1**2 + 2.0)
    p0 = r ** (g / (g - 1.0)) * p ** (-1.0 / (g - 1.0))
    return np.sqrt(m2sq), p, r, p / r, p0


def normal_shock(mach, gamma=1.4):
    """Normal shock: M2, p2/p1, rho2/rho1, T2/T1, p02/p01 for M1 >= 1."""
    g = check_gamma(gamma)
    m, s = check_mach(mach, supersonic=True, name="upstream Mach number")
    m2, p, r, t, p0 = _normal(m, g)
    return ShockState(out(np.full_like(m, np.pi / 2), s), out(np.zeros_like(m), s),
                      out(m2, s), out(p, s), out(r, s), out(t, s), out(p0, s))


def _theta(m, b, g):
    """theta-beta-M relation: tan(theta) = 2 cot(beta) (M^2 sin^2 b - 1) / (M^2 (g + cos 2b) + 2)."""
    num = 2.0 / np.tan(b) * (m * m * np.sin(b) ** 2 - 1.0)
    den = m * m * (g + np.cos(2.0 * b)) + 2.0
    return np.arctan(num / den)


def deflection_from_shock_angle(mach, beta, gamma=1.4):
    """Flow deflection theta for a shock of angle beta (mu <= beta <= pi/2)."""
    g = check_gamma(gamma)
    m, s1 = check_mach(mach, supersonic=True, name="upstream Mach number")
    b, s2 = as_float_array(beta, "shock angle")
    mu = np.arcsin(1.0 / m)
    bad = (b < mu - 1e-12) | (b > np.pi / 2 + 1e-12)
    if np.any(bad):
        raise InputError(
            "shock angle must lie between the Mach angle and 90 deg, got "
            f"{np.degrees(b[bad].ravel()[0]) if b.ndim else np.degrees(b):.6g} deg."
        )
    return out(np.maximum(_theta(m, b, g), 0.0), s1 and s2)


def _beta_max(m, g):
    """Shock angle of maximum deflection (NACA Report 1135, closed form)."""
    m2 = m * m
    sin2 = ((g + 1.0) / 4.0 * m2 - 1.0 + np.sqrt((g + 1.0) * (1.0 + 0.5 * (g - 1.0) * m2 + (g + 1.0) / 16.0 * m2 * m2))) / (g * m2)
    return np.arcsin(np.sqrt(np.clip(sin2, 0.0, 1.0)))


def max_deflection(mach, gamma=1.4):
    """Return (theta_max, beta at theta_max), radians, for M1 >= 1."""
    g = check_gamma(gamma)
    m, s = check_mach(mach, supersonic=True, name="upstream Mach number")
    bm = _beta_max(m, g)
    return out(np.maximum(_theta(m, bm, g), 0.0), s), out(bm, s)


def sonic_deflection(mach, gamma=1.4):
    """Return (theta, beta) at which the flow behind the weak shock is exactly sonic (M2 = 1)."""
    g = check_gamma(gamma)
    m, s = check_mach(mach, supersonic=True, name="upstream Mach number")
    m2 = m * m
    sin2 = ((g + 1.0) * m2 - (3.0 - g) + np.sqrt((g + 1.0) * ((g + 1.0) * m2 * m2 - 2.0 * (3.0 - g) * m2 + g + 9.0))) / (4.0 * g * m2)
    bs = np.arcsin(np.sqrt(np.clip(sin2, 0.0, 1.0)))
    return out(_theta(m, bs, g), s), out(bs, s)


def shock_angle(mach, theta, gamma=1.4, root="weak"):
    """Shock angle beta from (M1, theta): the weak or the strong root of theta-beta-M.

    Raises DetachedShockError when theta exceeds theta_max(M1).
    Bisection on the monotone branch (64 halvings, then two Newton steps).
    """
    g = check_gamma(gamma)
    if root not in ("weak", "strong"):
        raise InputError(f"root must be 'weak' or 'strong', got {root!r}.")
    m, s1 = check_mach(mach, supersonic=True, name="upstream Mach number")
    th, s2 = as_float_array(theta, "deflection angle")
    m, th = np.broadcast_arrays(m, th)
    m = m.astype(float)
    th = th.astype(float)
    if np.any(th < -1e-12):
        raise InputError(
            f"deflection angle must be at least 0 deg for a compression shock, got {np.degrees(th[th < -1e-12].ravel()[0]):.6g} deg."
        )
    th = np.maximum(th, 0.0)
    bm = _beta_max(m, g)
    tmax = np.maximum(_theta(m, bm, g), 0.0)
    over = th > tmax * (1.0 + 1e-13) + 1e-15
    if np.any(over):
        i = np.flatnonzero(over.ravel())[0]
        raise DetachedShockError(
            f"a deflection of {np.degrees(th.ravel()[i]):.6g} deg exceeds theta_max = "
            f"{np.degrees(tmax.ravel()[i]):.4f} deg for M1 = {m.ravel()[i]:.6g} and gamma = {g:.6g}; "
            "the shock would detach (allowed: 0 <= theta <= theta_max)."
        )
    mu = np.arcsin(1.0 / m)
    if root == "weak":
        lo, hi = mu.copy(), bm.copy()
    else:
        lo, hi = bm.copy(), np.full_like(m, np.pi / 2)
    for _ in range(64):
        mid = 0.5 * (lo + hi)
        f = _theta(m, mid, g) - th
        # weak branch: theta increases with beta; strong branch: decreases
        up = (f < 0) if root == "weak" else (f > 0)
        lo = np.where(up, mid, lo)
        hi = np.where(up, hi, mid)
    b = 0.5 * (lo + hi)
    b = np.where(th <= 0, mu if root == "weak" else np.pi / 2, b)
    return out(b, s1 and s2)


def oblique_shock(mach, theta, gamma=1.4, root="weak"):
    """Full downstream state behind an oblique shock of deflection theta (weak or strong root)."""
    g = check_gamma(gamma)
    beta = np.asarray(shock_angle(mach, theta, g, root))
    m = np.asarray(mach, dtype=float)
    th = np.asarray(theta, dtype=float)
    return _state_from_beta(m, beta, th, g, np.ndim(mach) == 0 and np.ndim(theta) == 0)


def oblique_shock_from_angle(mach, beta, gamma=1.4):
    """Downstream state behind an oblique shock of given angle beta."""
    g = check_gamma(gamma)
    th = np.asarray(deflection_from_shock_angle(mach, beta, g))
    m = np.asarray(mach, dtype=float)
    b = np.asarray(beta, dtype=float)
    return _state_from_beta(m, b, th, g, np.ndim(mach) == 0 and np.ndim(beta) == 0)


def _state_from_beta(m, beta, th, g, scalar):
    mn1 = np.maximum(m * np.sin(beta), 1.0)
    mn2, p, r, t, p0 = _normal(mn1, g)
    m2 = mn2 / np.sin(beta - th)
    return ShockState(out(beta, scalar), out(th, scalar), out(m2, scalar), out(p, scalar),
                      out(r, scalar), out(t, scalar), out(p0, scalar))

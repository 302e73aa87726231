"""Fast, unvalidated Prandtl-Meyer helpers for the hot loops of the net.

Same relations as `moc.flow.prandtl_meyer` (NACA Report 1135, Prandtl-Meyer
equations) but without input checks, and with a warm start for the inverse:
inside a predictor-corrector iteration the Mach angle of a new point is known
to O(step) from its neighbours, so two or three Newton steps are enough.
The iteration variable is t = pi/2 - mu = atan(sqrt(M^2 - 1)) and the residual
is taken on nu^(1/3), both smooth at M = 1 where d nu / dM is infinite.
"""

import numpy as np


def pm_constants(gamma):
    k = np.sqrt((gamma + 1.0) / (gamma - 1.0))
    return k, 1.0 - 1.0 / (k * k)


def nu_of_mu(mu, gamma):
    """nu as a function of the Mach angle mu (radians)."""
    k, _ = pm_constants(gamma)
    t = 0.5 * np.pi - mu
    return k * np.arctan(np.tan(t) / k) - t


def _nu_t(t, k, kk):
    """nu(t) and tan(t)^2, t = atan(sqrt(M^2 - 1)); series for small t avoids cancellation."""
    tb = np.tan(t)
    tb2 = tb * tb
    series = tb * tb2 * ((1.0 - kk) / 3.0 - tb2 * ((1.0 - kk * kk) / 5.0 - tb2 * (1.0 - kk**3) / 7.0))
    return np.where(tb < 1e-3, series, k * np.arctan(tb / k) - t), tb2


def mu_of_nu(nu, gamma, mu0=None, rtol=1e-9, maxiter=60):
    """Mach angle mu(nu) for 0 <= nu < nu_max; `mu0` is an optional warm start."""
    k, c = pm_constants(gamma)
    kk = 1.0 / (k * k)
    nu = np.maximum(np.asarray(nu, dtype=float), 1e-300)  # nu = 0 gives mu = pi/2 to roundoff
    target = np.cbrt(nu)
    cold = np.clip(np.arctan(np.cbrt(3.0 * nu / c)), 1e-300, 0.5 * np.pi - 1e-9)
    if mu0 is None:
        t = cold
    else:
        t = 0.5 * np.pi - np.asarray(mu0, dtype=float)
        t = np.where((t > 0.5 * cold) & (t < 0.5 * np.pi), t, cold)
    hi = 0.5 * np.pi
    for _ in range(maxiter):
        nv, tb2 = _nu_t(t, k, kk)
        cn = np.cbrt(nv)
        # Newton on nu^(1/3): d(nu^(1/3))/dt = c tb^2 / ((1 + tb^2/k^2) 3 nu^(2/3))
        dt = (cn - target) * 3.0 * cn * cn * (1.0 + tb2 * kk) / (c * tb2)
        tn = np.minimum(np.maximum(t - dt, 0.5 * t), 0.5 * (hi + t))
        # Newton converges quadratically: a relative step below rtol leaves an
        # error far below round-off, so no further step is needed
        err = (np.abs(tn - t) / tn).max(initial=0.0)
        t = tn
        if err <= rtol:
            break
    return 0.5 * np.pi - t


def mach_of_mu(mu):
    return 1.0 / np.sin(mu)


def mass_flux_density(mu, gamma):
    """rho V / (rho* a*) = 1 / (A/A*)(M), from the isentropic area relation (NACA Report 1135)."""
    m = 1.0 / np.sin(mu)
    e = (gamma + 1.0) / (2.0 * (gamma - 1.0))
    return m * ((2.0 / (gamma + 1.0)) * (1.0 + 0.5 * (gamma - 1.0) * m * m)) ** (-e)

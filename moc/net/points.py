"""The state carried by every point of the characteristic net.

A `Points` tuple holds arrays of equal shape: position x, y (y is the radius
in axisymmetric flow), flow angle theta, Prandtl-Meyer angle nu and Mach angle
mu (radians; mu is kept consistent with nu so it is computed once per point).
Lengths are in throat half-heights (planar) or throat radii (axisymmetric).
"""

from typing import NamedTuple

import numpy as np

from moc.errors import InputError
from moc.flow import mach_angle, prandtl_meyer
from moc.flow._checks import check_gamma


class Points(NamedTuple):
    x: np.ndarray
    y: np.ndarray
    theta: np.ndarray
    nu: np.ndarray
    mu: np.ndarray

    @property
    def mach(self):
        return 1.0 / np.sin(self.mu)

    def take(self, index):
        """Points selected by an index or slice (same selection in every field)."""
        return Points(*(np.asarray(f)[index] for f in self))

    def __len__(self):  # number of points, not of fields
        return int(np.size(self.x))


def points(x, y, theta, mach, gamma=1.4):
    """Build validated `Points` from x, y, theta (radians) and Mach number arrays (M >= 1)."""
    g = check_gamma(gamma)
    arrs = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (x, y, theta, mach)))
    x, y, th, m = (np.array(a, dtype=float, ndmin=1) for a in arrs)
    for name, a in (("x", x), ("y", y), ("theta", th), ("Mach number", m)):
        if not np.all(np.isfinite(a)):
            raise InputError(f"every {name} of a net point must be a finite number.")
    if np.any(y < 0.0):
        raise InputError("net points must have y (or radius r) >= 0; the axis or symmetry plane is y = 0.")
    if np.any(np.abs(th) >= 0.5 * np.pi):
        raise InputError("flow angles of net points must lie strictly between -90 and 90 deg.")
    return Points(x, y, th, prandtl_meyer(m, g), mach_angle(m))


def concat(*parts):
    """Concatenate several `Points` (in order) into one."""
    return Points(*(np.concatenate([np.atleast_1d(p[k]) for p in parts]) for k in range(5)))

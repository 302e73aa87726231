"""Input checks shared by the designers (one sentence per error: what was wrong, what is allowed)."""

import math

import numpy as np

from moc.errors import InputError, MachError
from moc.flow._checks import check_gamma

#: geometry name -> source-term switch delta (0 planar, 1 axisymmetric).
GEOMETRIES = {"planar": 0, "axisymmetric": 1}


def check_design_inputs(exit_mach, gamma, geometry, n, min_n=3):
    """Return (Me, gamma, delta, n) after checking each; gamma may be a number or a moc.gas.PerfectGas."""
    g = check_gamma(getattr(gamma, "gamma", gamma))
    if geometry not in GEOMETRIES:
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    try:
        me = float(exit_mach)
    except (TypeError, ValueError):
        raise MachError(f"exit Mach number must be a number above 1, got {exit_mach!r}.") from None
    if not math.isfinite(me) or me <= 1.0:
        raise MachError(f"exit Mach number must be a finite number above 1 for a supersonic nozzle, got {exit_mach!r}.")
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or n < min_n:
        raise InputError(f"the number of characteristics must be a whole number of at least {min_n}, got {n!r}.")
    return me, g, GEOMETRIES[geometry], int(n)

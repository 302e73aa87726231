"""Input checks shared by the relations: each raises a `moc.errors` exception
with one sentence saying what was wrong and what is allowed."""

import math

import numpy as np

from moc.errors import GammaError, MachError, NonFiniteError


def fmt(v):
    """Short printable form of a (possibly array) value."""
    return f"{float(v):.6g}"


def check_gamma(gamma):
    """Return gamma as float; it must be a finite number above 1."""
    try:
        g = float(gamma)
    except (TypeError, ValueError):
        raise GammaError(f"gamma must be a number above 1, got {gamma!r}.") from None
    if not math.isfinite(g):
        raise NonFiniteError(f"gamma must be a finite number above 1, got {g}.")
    if g <= 1.0:
        raise GammaError(
            f"gamma (ratio of specific heats) must be above 1, got {fmt(g)}; "
            "typical values are 1.4 for air and 1.1 to 1.3 for combustion gases."
        )
    return g


def as_float_array(x, name):
    """Return (array, was_scalar); every element must be finite."""
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise NonFiniteError(f"{name} must be a number, got {x!r}.") from None
    if not np.all(np.isfinite(a)):
        bad = a[~np.isfinite(a)].ravel()[0]
        raise NonFiniteError(f"{name} must be a finite number, got {bad}.")
    return a, a.ndim == 0


def first_bad(a, mask):
    return a[mask].ravel()[0]


def check_mach(mach, *, supersonic=False, sonic_ok=True, name="Mach number"):
    """Return (array, was_scalar) of Mach numbers; M > 0, or M >= 1 / M > 1."""
    m, scalar = as_float_array(mach, name)
    bad = m <= 0.0
    if np.any(bad):
        raise MachError(f"{name} must be positive, got {fmt(first_bad(m, bad))}.")
    if supersonic:
        bad = (m < 1.0) if sonic_ok else (m <= 1.0)
        if np.any(bad):
            limit = "at least 1" if sonic_ok else "above 1"
            raise MachError(
                f"{name} must be {limit} here (supersonic flow is required), "
                f"got {fmt(first_bad(m, bad))}."
            )
    return m, scalar


def out(a, scalar):
    """Return a float for scalar input, else the array."""
    return float(a) if scalar else a

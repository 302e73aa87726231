"""Length units at the I/O edge.

Inside `moc` every length is in throat half-heights (planar) or throat radii
(axisymmetric).  Files carry real units: this module turns one into the other
from the throat size saved in the result's inputs.  Conversion factors are
exact by definition (Source: BIPM, The International System of Units, 9th ed.
2019; the inch is 25.4 mm exactly by the 1959 international yard and pound
agreement).
"""

from __future__ import annotations

import math
import warnings

from moc.errors import ExportError
from moc.units import METRES_PER_UNIT, normalise_length_unit  # noqa: F401 (re-exported for exporters)



def normalise_unit(unit):
    """Return the canonical short name of a length unit, or raise ExportError."""
    return normalise_length_unit(unit, ExportError)


def convert(value, from_unit, to_unit):
    """Convert a length (scalar or array) between two named units."""
    a, b = normalise_unit(from_unit), normalise_unit(to_unit)
    return value * (METRES_PER_UNIT[a] / METRES_PER_UNIT[b])


def throat_size(inputs):
    """(value, unit) of the throat half-height/radius saved in a result's inputs, or None."""
    t = (inputs or {}).get("throat")
    if not isinstance(t, dict) or "value" not in t:
        return None
    value = t["value"]
    try:
        value = float(value)
    except (TypeError, ValueError):
        raise ExportError(f"the saved throat size {value!r} is not a number.") from None
    if not math.isfinite(value) or value <= 0.0:
        raise ExportError(f"the saved throat size must be a positive length, got {value!r}.")
    return value, normalise_unit(t.get("unit", "mm"))


def default_unit(inputs):
    """The unit the throat was given in, or 'mm' when the result has none."""
    ts = throat_size(inputs)
    return ts[1] if ts else "mm"


def scale_factor(inputs, unit):
    """Length of one throat half-height/radius expressed in `unit`.

    When the result holds no throat size, one throat unit is taken as one
    `unit` and a warning says so.
    """
    unit = normalise_unit(unit)
    ts = throat_size(inputs)
    if ts is None:
        warnings.warn(
            f"the result has no throat size; lengths are exported as 1 throat radius/half-height = 1 {unit}.",
            stacklevel=2,
        )
        return 1.0
    value, tunit = ts
    return float(convert(value, tunit, unit))

"""Length and pressure units, for the edges of the tool (files, flags, case files).

Inside `moc` lengths are in throat half-heights or radii; these tables turn
real units into metres and pascals.  Conversion factors are exact by
definition (Source: BIPM, The International System of Units, 9th ed. 2019;
the inch is 25.4 mm exactly by the 1959 international yard and pound
agreement; 1 psi = 6894.757293168 Pa, 1 atm = 101325 Pa by definition).
"""

from moc.errors import InputError

#: metres per length unit.
METRES_PER_UNIT = {"m": 1.0, "cm": 0.01, "mm": 0.001, "um": 1e-6, "in": 0.0254, "ft": 0.3048}

#: pascals per pressure unit.
PASCALS_PER_UNIT = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "bar": 1e5, "atm": 101325.0, "psi": 6894.757293168}

_ALIASES = {
    "meter": "m", "meters": "m", "metre": "m", "metres": "m",
    "centimeter": "cm", "centimeters": "cm", "centimetre": "cm", "centimetres": "cm",
    "millimeter": "mm", "millimeters": "mm", "millimetre": "mm", "millimetres": "mm",
    "micron": "um", "microns": "um", "µm": "um",
    "inch": "in", "inches": "in", '"': "in",
    "foot": "ft", "feet": "ft",
}


def normalise_length_unit(unit, error=InputError, extra=()):
    """Canonical short name of a length unit (aliases such as 'millimetre' accepted).

    Raises `error` (an InputError subclass) naming the allowed units; names in
    `extra` (for example 'throat') are accepted as they are.
    """
    if not isinstance(unit, str):
        raise error(f"a length unit must be a name such as 'mm', got {unit!r}.")
    key = unit.strip().lower()
    if key in extra:
        return key
    key = _ALIASES.get(key, key)
    if key not in METRES_PER_UNIT:
        allowed = ", ".join([*METRES_PER_UNIT, *extra])
        raise error(f"'{unit}' is not a length unit; use one of {allowed}.")
    return key

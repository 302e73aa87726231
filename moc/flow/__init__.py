"""Pure gas-dynamics relations (vectorised, stateless).  Angles in radians."""

from moc.flow.isentropic import (
    area_ratio,
    choked_mass_flow_parameter,
    density_ratio,
    mach_from_area_ratio,
    mass_flow_parameter,
    pressure_ratio,
    temperature_ratio,
)
from moc.flow.prandtl_meyer import mach_angle, mach_from_prandtl_meyer, nu_max, prandtl_meyer
from moc.flow.shocks import (
    ShockState,
    deflection_from_shock_angle,
    max_deflection,
    normal_shock,
    oblique_shock,
    oblique_shock_from_angle,
    shock_angle,
    sonic_deflection,
)

__all__ = [name for name in dir() if not name.startswith("_")]

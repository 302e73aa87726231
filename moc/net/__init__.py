"""The characteristic net: unit processes and front-by-front marching.

Public API (see docs/net.md):
  Points, points            point state arrays (x, y, theta, nu, mu)
  interior_point, axis_point, wall_point, inverse_wall_point   unit processes
  march_fan, march_from_line, goursat                          net builders
  Grid                      a net block in characteristic coordinates [i, j]
  mass_balance_wall, trace_streamline, cumulative_flux, throat_flux   the wall
"""

from moc.net.grid import Grid
from moc.net.march import goursat, march_fan, march_from_line
from moc.net.points import Points, concat, points
from moc.net.unit import axis_point, interior_point, inverse_wall_point, source, wall_point
from moc.net.wall import cumulative_flux, mass_balance_wall, throat_flux, trace_streamline

__all__ = [name for name in dir() if not name.startswith("_")]

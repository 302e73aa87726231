"""Analysis of given wall contours: march, coalescence of characteristics, shock fitting, exit flow.

    from moc.analysis import analyze, cone, bell, read_wall_csv, wall_from_points
    result = analyze(cone(15, 4, "axisymmetric"), geometry="axisymmetric", n=40)

See docs/analysis.md.
"""

from moc.analysis.analyze import analyze
from moc.analysis.contour import Wall, bell, cone, read_wall_csv, wall_from_points

__all__ = ["analyze", "Wall", "bell", "cone", "read_wall_csv", "wall_from_points"]

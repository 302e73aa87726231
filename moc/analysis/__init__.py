"""Analysis of given wall contours: march, coalescence of characteristics, shock fitting, exit flow.

    from moc.analysis.analyze import analyze
    from moc.analysis.contour import cone, bell, read_wall_csv, wall_from_points
    result = analyze(cone(15, 4, "axisymmetric"), geometry="axisymmetric", n=40)

See docs/analysis.md.
"""

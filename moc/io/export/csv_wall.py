"""Wall contour as a CSV point list for machining (format "csv").

One row per point from the inlet face to the exit, spaced so that the chord
error stays within the tolerance; columns: part, x, y or r, slope dy/dx,
wall angle (degrees), signed curvature (per unit; positive where the wall
turns away from the axis), arc length along the point list.  Lines starting
with '#' are comments.
"""

import io

import numpy as np


def write(path, ctx):
    p = ctx.profile
    u, k = ctx.unit, ctx.scale
    parts = np.array([pc.name for pc in ctx.contour.pieces])[p["piece"]]
    buf = io.StringIO()
    for line in ctx.header_lines("wall contour"):
        buf.write(f"# {line}\n")
    buf.write(
        f"# chord tolerance {ctx.chord_tolerance * k:.6g} {u}; largest chord error {p['max_chord_error'] * k:.6g} {u}; "
        f"{p['x'].size} points\n"
    )
    buf.write(f"# angle in degrees; curvature in 1/{u}, positive where the wall turns away from the axis\n")
    r = ctx.radial_name
    buf.write(f"part,x_{u},{r}_{u},slope,angle_deg,curvature_per_{u},arc_length_{u}\n")
    cols = np.column_stack([
        p["x"] * k, p["y"] * k, p["slope"], np.degrees(p["angle"]), p["curvature"] / k, p["s"] * k,
    ])
    for name, row in zip(parts, cols):
        buf.write(name + "," + ",".join(f"{v:.15g}" for v in row) + "\n")
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write(buf.getvalue())
    ctx.note(
        f"wall_points.csv: {p['x'].size} points, largest chord error {p['max_chord_error'] * k:.3g} {u} "
        f"(tolerance {ctx.chord_tolerance * k:.3g} {u})"
    )

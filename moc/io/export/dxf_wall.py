"""Wall contour as a DXF drawing for CAD and machining (format "dxf").

Written with ezdxf as DXF R2000 (AC1015), which old and new readers open.
Layers: WALL_SPLINE (one SPLINE per smooth part of the wall, inlet and
divergent section, so a throat corner stays a corner, through the
chord-spaced wall points as fit points, with control points computed so
readers that ignore fit points draw the same curve), WALL_POLYLINE (the same points as an LWPOLYLINE), AXIS or
CENTRELINE (the symmetry line, CENTER linetype), DIMENSIONS (overall length, exit
and throat radius or half-height, as DIMENSION entities in the drawing
unit), NOTES (the caution).
$INSUNITS and $MEASUREMENT carry the unit (codes from the DXF reference,
Autodesk DXF Reference R2000: 1 in, 2 ft, 4 mm, 5 cm, 6 m, 13 micron).
Group-999 comment lines at the top repeat the header text.
"""

import io

import numpy as np


INSUNITS = {"in": 1, "ft": 2, "mm": 4, "cm": 5, "m": 6, "um": 13}


def _dimensions(msp, pts, throat, height):
    """Linear dimensions: overall length, throat and exit radius/half-height (measured from the axis)."""
    x0, x1, ye = pts[0][0], pts[-1][0], pts[-1][1]
    attrs = {"layer": "DIMENSIONS"}
    override = {"dimtxt": height, "dimasz": height, "dimexe": 0.5 * height, "dimexo": 0.5 * height,
                "dimlfac": 1.0, "dimdec": 4, "dimzin": 8}
    dims = [
        msp.add_linear_dim(base=(x0, -6 * height), p1=(x0, 0.0), p2=(x1, 0.0), dimstyle="EZDXF",
                           override=override, dxfattribs=attrs),
        msp.add_linear_dim(base=(x1 + 6 * height, 0.0), p1=(x1, 0.0), p2=(x1, ye), angle=90, dimstyle="EZDXF",
                           override=override, dxfattribs=attrs),
    ]
    if throat > 0.0 and x0 <= 0.0 <= x1:
        dims.append(msp.add_linear_dim(base=(-6 * height, 0.0), p1=(0.0, 0.0), p2=(0.0, throat), angle=90,
                                       dimstyle="EZDXF", override=override, dxfattribs=attrs))
    for d in dims:
        d.render()


def write(path, ctx):
    import ezdxf
    from ezdxf.math import fit_points_to_cad_cv

    p = ctx.profile
    k = ctx.scale
    pts = [(float(x), float(y), 0.0) for x, y in zip(p["x"] * k, p["y"] * k)]
    doc = ezdxf.new("R2000", setup=True)
    doc.header["$INSUNITS"] = INSUNITS[ctx.unit]
    doc.header["$MEASUREMENT"] = 0 if ctx.unit in ("in", "ft") else 1
    axis_layer = "AXIS" if ctx.axisymmetric else "CENTRELINE"
    for name, colour, ltype in (("WALL_SPLINE", 5, "CONTINUOUS"), ("WALL_POLYLINE", 3, "CONTINUOUS"),
                                (axis_layer, 1, "CENTER"), ("DIMENSIONS", 2, "CONTINUOUS"),
                                ("NOTES", 7, "CONTINUOUS")):
        doc.layers.add(name, color=colour, linetype=ltype)
    msp = doc.modelspace()
    piece = p["piece"]
    for j in range(len(ctx.contour.pieces)):
        sel = np.flatnonzero(piece == j)
        if j + 1 < len(ctx.contour.pieces):
            sel = np.append(sel, sel[-1] + 1)  # each piece ends on the next one's first point
        fit = np.array([pts[i] for i in sel])
        if len(fit) < 4:  # a straight piece: collinear fit points give a straight spline
            f = np.linspace(0.0, 1.0, 4)[:, None]
            fit = fit[0] + f * (fit[-1] - fit[0])
        fit = [tuple(map(float, q)) for q in fit]
        spline = msp.add_spline(fit, degree=3, dxfattribs={"layer": "WALL_SPLINE"})
        spline.apply_construction_tool(fit_points_to_cad_cv(fit))
        spline.fit_points = fit
    msp.add_lwpolyline([(x, y) for x, y, _ in pts], dxfattribs={"layer": "WALL_POLYLINE"})
    x0, x1 = pts[0][0], pts[-1][0]
    msp.add_line((x0, 0.0), (x1, 0.0), dxfattribs={"layer": axis_layer})
    height = 0.04 * max(pts[-1][1], 1e-12)
    _dimensions(msp, pts, ctx.scale, height)
    for i, line in enumerate(ctx.header_lines("wall contour")):
        msp.add_text(line, height=height, dxfattribs={"layer": "NOTES", "insert": (x0, -(i + 6) * 1.6 * height)})
    buf = io.StringIO()
    doc.write(buf)
    comments = "".join(f"999\n{line}\n" for line in ctx.header_lines("wall contour"))
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write(comments + buf.getvalue())
    ctx.note(f"wall.dxf: DXF R2000, {len(pts)} wall points in {len(ctx.contour.pieces)} spline(s) and a polyline, "
             f"$INSUNITS = {INSUNITS[ctx.unit]} ({ctx.unit})")

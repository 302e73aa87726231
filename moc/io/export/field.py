"""The characteristic net as a 2-D mesh with flow data, shared by the flowfield formats.

Point data (all dimensionless, angles in degrees):
  mach, p_p0 (static over chamber total pressure), T_T0, rho_rho0 (over
  chamber stagnation values), flow_angle_deg, velocity_a0 (vector u, v, 0 in
  units of the stagnation speed of sound a0, constant in adiabatic flow),
  p0_ratio (local over chamber total pressure) and entropy_rise_R
  (Delta s / R = -ln p0_ratio, zero in homentropic flow).
Isentropic relations: NACA Report 1135 (closed forms, via moc.flow); the
entropy rise from total-pressure loss: Delta s / R = -ln(p02/p01) (same source).
Net cells are quads with a repeated index for a triangle; they become
meshio "quad" and "triangle" blocks, with fully degenerate cells dropped.
"""

import numpy as np

from moc import flow
from moc.errors import ExportError

FIELDS = ("mach", "p_p0", "T_T0", "rho_rho0", "flow_angle_deg", "velocity_a0", "p0_ratio", "entropy_rise_R")


def point_data(net, gamma):
    """Dict of point-data arrays for the net (see module docstring)."""
    m = np.asarray(net.mach, dtype=float)
    p0r = np.asarray(net.p0_ratio, dtype=float)
    if m.size == 0:
        raise ExportError("the saved net has no points; there is no flowfield to export.")
    bad = ~(np.isfinite(m) & np.isfinite(net.theta) & np.isfinite(p0r))
    if np.any(bad):
        raise ExportError(f"the saved net holds NaN or infinite values at point {int(np.flatnonzero(bad)[0])}; re-run the design.")
    if np.any(p0r <= 0.0):
        raise ExportError("the saved net has a total-pressure ratio <= 0; the result is damaged.")
    t = flow.temperature_ratio(m, gamma)
    speed = m * np.sqrt(t)
    vel = np.zeros((m.size, 3))
    vel[:, 0] = speed * np.cos(net.theta)
    vel[:, 1] = speed * np.sin(net.theta)
    return {
        "mach": m,
        "p_p0": flow.pressure_ratio(m, gamma) * p0r,
        "T_T0": t,
        "rho_rho0": flow.density_ratio(m, gamma) * p0r,
        "flow_angle_deg": np.degrees(net.theta),
        "velocity_a0": vel,
        "p0_ratio": p0r,
        "entropy_rise_R": -np.log(p0r),
    }


def split_cells(cells):
    """(quads, triangles) from net cells with a repeated index marking a triangle."""
    c = np.asarray(cells, dtype=np.int64).reshape(-1, 4)
    srt = np.sort(c, axis=1)
    distinct = 1 + (np.diff(srt, axis=1) != 0).sum(axis=1)
    quads = c[distinct == 4]
    tri_src = c[distinct == 3]
    # keep the first occurrence of each index, in order (the ccw sense is kept)
    nxt = np.roll(tri_src, -1, axis=1)
    keep = tri_src != nxt
    tris = tri_src[keep].reshape(-1, 3) if tri_src.size else np.zeros((0, 3), dtype=np.int64)
    return quads, tris, int(np.sum(distinct < 3))


def mesh_2d(ctx):
    """meshio.Mesh of the net in the output unit (z = 0) with point data."""
    import meshio

    net = ctx.result.net
    pts = np.zeros((net.size, 3))
    pts[:, 0] = net.x * ctx.scale
    pts[:, 1] = net.y * ctx.scale
    quads, tris, dropped = split_cells(net.cells)
    if quads.size + tris.size == 0:
        raise ExportError("the saved net has no cells; there is no flowfield mesh to export.")
    if dropped:
        ctx.note(f"flowfield: {dropped} degenerate net cells (fewer than 3 distinct points) left out")
    blocks = [(name, arr) for name, arr in (("quad", quads), ("triangle", tris)) if arr.size]
    return meshio.Mesh(pts, blocks, point_data=point_data(net, ctx.gamma))


def xml_caution(path, ctx, what):
    """Insert the header lines as an XML comment after the XML declaration of a written file."""
    text = open(path, encoding="utf-8").read()
    lines = [ln.replace("--", "- -") for ln in ctx.header_lines(what)]
    comment = "<!--\n" + "\n".join(lines) + "\n-->\n"
    if text.startswith("<?xml"):
        head, _, rest = text.partition("\n")
        text = head + "\n" + comment + rest
    else:
        text = comment + text
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write(text)


def msh_caution(path, ctx, what):
    """Insert the header lines as a $Comments section after $EndMeshFormat of a written Gmsh file.

    Gmsh and meshio skip sections they do not know (Gmsh reference manual, MSH file format; from memory).
    """
    raw = open(path, "rb").read()
    mark = b"$EndMeshFormat\n"
    k = raw.find(mark)
    if k < 0:
        return
    lines = "".join(f"{ln}\n" for ln in ctx.header_lines(what) if not ln.startswith("$"))
    block = b"$Comments\n" + lines.encode("utf-8") + b"$EndComments\n"
    k += len(mark)
    with open(path, "wb") as fh:
        fh.write(raw[:k] + block + raw[k:])

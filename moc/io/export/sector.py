"""An axisymmetric net revolved into a 3-D sector for viewing (format "sector-vtu").

The 2-D net (x, r) is turned about the x axis through `sector_angle`
degrees in `sector_segments` steps: (x, r) -> (x, r cos a, r sin a).  Cells
off the axis become hexahedra (quads) or wedges (triangles); a quad with an
edge on the axis becomes a wedge; other cells touching the axis are split
into triangles, which become pyramids or tetrahedra as one or two of their
points lie on the axis (points on the axis are not repeated).  Cells are handed to meshio in meshio's node order,
checked per cell by the sign of its volume and reordered if needed: the
hexahedron's base 0-3 and the pyramid's base turn counter-clockwise about
the direction to the opposite face or apex; the wedge's base 0-2 turns the
other way, and meshio permutes wedges to VTK's order on writing.  Measured
with VTK 9.7 on the written files: every cell has a positive volume in
vtkMeshQuality and VTK's face lists point out of every cell.  The velocity
vector is turned with the cell, so it stays tangent to the meridian plane.
"""

import numpy as np

from moc.errors import ExportError
from moc.io.export.field import mesh_2d, xml_caution


#: largest number of points the revolved sector may have (about 1.5 GB of VTU).
MAX_POINTS = 20_000_000


def check(ctx):
    if not ctx.axisymmetric:
        raise ExportError("the sector-vtu format revolves an axisymmetric result; this result is planar (use vtu).")
    n = ctx.result.net.size * (ctx.options.sector_segments + 1)
    if n > MAX_POINTS:
        raise ExportError(
            f"the revolved sector would have about {n:,} points (limit {MAX_POINTS:,}); use fewer --sector-segments."
        )


def _tet_volume(a, b, c, d):
    return np.einsum("ij,ij->i", b - a, np.cross(c - a, d - a)) / 6.0


def _orient(kind, cells, pts):
    """Reorder cells whose VTK orientation is negative.

    cells: (n, segments, nodes), one row per 2-D cell; a cell's orientation is
    the same in every segment (each spans under 180 degrees), so it is checked
    on the first segment only.
    """
    if not len(cells):
        return cells.reshape(-1, cells.shape[-1])
    p = pts[cells[:, 0]]
    if kind == "hexahedron":
        n = np.cross(p[:, 2] - p[:, 0], p[:, 3] - p[:, 1])
        sgn = np.einsum("ij,ij->i", n, p[:, 4:].mean(1) - p[:, :4].mean(1))
        flip = [0, 3, 2, 1, 4, 7, 6, 5]
    elif kind == "wedge":  # meshio's order: the base (0,1,2) normal points away from (3,4,5)
        n = np.cross(p[:, 1] - p[:, 0], p[:, 2] - p[:, 0])
        sgn = -np.einsum("ij,ij->i", n, p[:, 3:].mean(1) - p[:, :3].mean(1))
        flip = [0, 2, 1, 3, 5, 4]
    elif kind == "pyramid":  # VTK: the base normal points toward the apex
        n = np.cross(p[:, 2] - p[:, 0], p[:, 3] - p[:, 1])
        sgn = np.einsum("ij,ij->i", n, p[:, 4] - p[:, :4].mean(1))
        flip = [0, 3, 2, 1, 4]
    else:  # tetra
        sgn = _tet_volume(p[:, 0], p[:, 1], p[:, 2], p[:, 3])
        flip = [0, 2, 1, 3]
    bad = sgn < 0
    cells[bad] = cells[bad][..., flip]
    return cells.reshape(-1, cells.shape[-1])


def revolve(mesh, angle_deg, segments):
    """(points, cell blocks, point-data index) of the revolved sector."""
    x, r = mesh.points[:, 0], mesh.points[:, 1]
    n = x.size
    full = angle_deg >= 360.0 - 1e-9
    nring = segments if full else segments + 1
    a = np.radians(angle_deg) * np.arange(nring) / segments
    on_axis = r <= 1e-12 * max(float(np.abs(r).max()), 1e-300)
    # global index of point i at ring k: axis points once, the others once per ring
    off = np.flatnonzero(~on_axis)
    gid = np.empty((nring, n), dtype=np.int64)
    gid[:, on_axis] = np.arange(int(on_axis.sum()))[None, :]
    base = int(on_axis.sum())
    gid[:, off] = base + np.arange(nring)[:, None] * off.size + np.arange(off.size)[None, :]
    src = np.concatenate([np.flatnonzero(on_axis), np.tile(off, nring)])
    ring = np.concatenate([np.zeros(base, dtype=int), np.repeat(np.arange(nring), off.size)])
    pts = np.column_stack([x[src], r[src] * np.cos(a[ring]), r[src] * np.sin(a[ring])])
    k0 = np.arange(segments)
    k1 = (k0 + 1) % nring
    blocks = {"hexahedron": [], "wedge": [], "pyramid": [], "tetra": []}
    tris = []
    for block in mesh.cells:
        c = block.data
        if block.type == "quad":
            touch = on_axis[c].any(axis=1)
            q = c[~touch]
            blocks["hexahedron"].append(np.concatenate(
                [gid[k0][:, q].transpose(1, 0, 2), gid[k1][:, q].transpose(1, 0, 2)], axis=2))
            t = c[touch]
            oa = on_axis[t]
            pair = oa & np.roll(oa, -1, axis=1)          # corners k and k+1 both on the axis
            edge = (oa.sum(axis=1) == 2) & pair.any(axis=1)
            e = t[edge]
            if len(e):  # an edge on the axis: a wedge (a, d0, d1 | b, c0, c1) with a, b the axis points
                s = np.argmax(pair[edge], axis=1)
                e = np.take_along_axis(e, (np.arange(4)[None, :] + s[:, None]) % 4, axis=1)
                e0 = gid[k0][:, e].transpose(1, 0, 2)
                e1 = gid[k1][:, e].transpose(1, 0, 2)
                blocks["wedge"].append(np.stack(
                    [e0[..., 0], e0[..., 3], e1[..., 3], e0[..., 1], e0[..., 2], e1[..., 2]], axis=2))
            t = t[~edge]
            tris.append(np.concatenate([t[:, [0, 1, 2]], t[:, [0, 2, 3]]]))
        else:
            tris.append(c)
    tris = np.concatenate(tris) if tris else np.zeros((0, 3), dtype=np.int64)
    nax = on_axis[tris].sum(axis=1)
    # rotate each triangle so its axis points come first (order kept cyclic)
    shift = np.argmax(on_axis[tris], axis=1)
    shift = np.where(nax == 2, np.where(on_axis[tris][:, 0] & on_axis[tris][:, 2], 2, shift), shift)
    idx = (np.arange(3)[None, :] + shift[:, None]) % 3
    tris = np.take_along_axis(tris, idx, axis=1)
    g0 = gid[k0][:, tris].transpose(1, 0, 2)  # (ncell, segments, 3)
    g1 = gid[k1][:, tris].transpose(1, 0, 2)
    for count, kind in ((0, "wedge"), (1, "pyramid"), (2, "tetra")):
        sel = nax == count
        a0, a1 = g0[sel], g1[sel]
        if count == 0:
            cells = np.concatenate([a0, a1], axis=2)
        elif count == 1:  # apex on the axis, base quad b0 c0 c1 b1
            cells = np.stack([a0[..., 1], a0[..., 2], a1[..., 2], a1[..., 1], a0[..., 0]], axis=2)
        else:
            cells = np.stack([a0[..., 0], a0[..., 1], a0[..., 2], a1[..., 2]], axis=2)
        blocks[kind].append(cells)
    out = []
    for kind, parts in blocks.items():
        parts = [p for p in parts if len(p)]
        if parts:
            out.append((kind, _orient(kind, np.concatenate(parts), pts)))
    return pts, out, src, a[ring]


def write(path, ctx):
    import meshio

    check(ctx)
    flat = mesh_2d(ctx)
    pts, blocks, src, ang = revolve(flat, ctx.options.sector_angle, ctx.options.sector_segments)
    data = {}
    for name, arr in flat.point_data.items():
        v = arr[src]
        if v.ndim == 2:  # (u, v_r, 0) -> (u, v_r cos a, v_r sin a)
            v = np.column_stack([v[:, 0], v[:, 1] * np.cos(ang), v[:, 1] * np.sin(ang)])
        data[name] = v
    meshio.write(path, meshio.Mesh(pts, blocks, point_data=data), file_format="vtu")
    xml_caution(path, ctx, "flowfield sector")
    ncell = sum(len(b) for _, b in blocks)
    ctx.note(f"flowfield_sector.vtu: {ctx.options.sector_angle:g} deg sector, {len(pts)} points, {ncell} cells")

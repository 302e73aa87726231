"""The nozzle cavity as a binary STL for machining and CAD (format "stl").

The wetted wall swept around the axis (axisymmetric: `segments` facets
round) or spanned over `width` between two flat side walls (planar: the full
channel, both contoured walls), closed by flat caps at the inlet face and the
exit plane, so the solid is watertight and its normals point out of the
fluid.  Subtract it from a block to obtain the part.  The wall profile is the
chord-spaced point list of the CSV export.  Binary STL layout (80-byte
header, uint32 count, 50 bytes per facet) as in the STL specification
(3D Systems, StereoLithography Interface Specification, 1988).
"""

import numpy as np

_FACET = np.dtype([("normal", "<f4", 3), ("v", "<f4", (3, 3)), ("attr", "<u2")])


def span(y, ctx):
    """Planar STL span in the output unit: --width, else twice the exit half-height."""
    return ctx.options.width if ctx.options.width else 2.0 * float(y[-1])


def sections(x, y, ctx):
    """Cross-section polygons (stations, m, 3), counter-clockwise seen from +x; x, y in the output unit."""
    n = x.size
    if ctx.axisymmetric:
        m = ctx.options.segments
        a = 2.0 * np.pi * np.arange(m) / m
        yz = np.stack([np.cos(a), np.sin(a)], axis=-1)[None, :, :] * y[:, None, None]
    else:
        w = 0.5 * span(y, ctx)
        s = np.array([[1.0, -1.0], [1.0, 1.0], [-1.0, 1.0], [-1.0, -1.0]])
        yz = s[None, :, :] * np.stack([y, np.full(n, w)], axis=-1)[:, None, :]
    xs = np.broadcast_to(x[:, None, None], yz.shape[:2] + (1,))
    return np.concatenate([xs, yz], axis=-1)


def triangles(x, y, ctx):
    """(k, 3, 3) triangle vertices of the closed cavity, normals outward."""
    v = sections(x, y, ctx)
    n, m = v.shape[:2]
    j0 = np.arange(m)
    j1 = (j0 + 1) % m
    a, b = v[:-1, j0], v[:-1, j1]     # station i
    c, d = v[1:, j1], v[1:, j0]       # station i + 1
    side = np.concatenate([np.stack([a, b, c], axis=2), np.stack([a, c, d], axis=2)]).reshape(-1, 3, 3)
    c0 = np.broadcast_to(np.array([x[0], 0.0, 0.0]), (m, 3))
    c1 = np.broadcast_to(np.array([x[-1], 0.0, 0.0]), (m, 3))
    cap0 = np.stack([c0, v[0, j1], v[0, j0]], axis=1)
    cap1 = np.stack([c1, v[-1, j0], v[-1, j1]], axis=1)
    tri = np.concatenate([side, cap0, cap1])
    if signed_volume(tri) < 0.0:
        tri = tri[:, ::-1]
    return tri


def signed_volume(tri):
    """Volume enclosed by a closed triangulated surface (divergence theorem; common geometry)."""
    return float(np.einsum("ij,ij->i", tri[:, 0], np.cross(tri[:, 1], tri[:, 2])).sum() / 6.0)


def stl_bytes(tri, header):
    nrm = np.cross(tri[:, 1] - tri[:, 0], tri[:, 2] - tri[:, 0])
    ln = np.linalg.norm(nrm, axis=1, keepdims=True)
    nrm = nrm / np.where(ln > 0, ln, 1.0)
    rec = np.zeros(tri.shape[0], dtype=_FACET)
    rec["normal"] = nrm
    rec["v"] = tri
    head = header.encode("ascii", "replace")[:80].ljust(80, b" ")
    return head + np.uint32(tri.shape[0]).tobytes() + rec.tobytes()


def write(path, ctx):
    p = ctx.profile
    x, y = p["x"] * ctx.scale, p["y"] * ctx.scale
    tri = triangles(x, y, ctx)
    header = f"moc nozzle cavity, {ctx.unit}; CAUTION hardware can hurt: verify by licensed review"
    with open(path, "wb") as fh:
        fh.write(stl_bytes(tri, header))
    how = (f"revolved, {ctx.options.segments} segments" if ctx.axisymmetric
           else f"extruded over {span(y, ctx):.6g} {ctx.unit}")
    ctx.note(f"wall.stl: {tri.shape[0]} facets ({how}), cavity volume {signed_volume(tri):.6g} {ctx.unit}^3")

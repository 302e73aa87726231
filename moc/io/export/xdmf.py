"""The net as an XDMF 3 file with the data inline (format "xdmf").

Written directly (meshio 5.3's XDMF writer needs h5py, which `moc` does not
require): one Uniform grid, a Mixed topology (XDMF cell codes 4 triangle,
5 quadrilateral), XYZ geometry and one node-centred Attribute per field, all
as XML DataItems with 17 significant digits, so the file stands alone.
Layout as in the XDMF 3 model and format description (xdmf.org, "XDMF Model
and Format"; from memory).
"""

import numpy as np

from moc.io.export.field import mesh_2d, xml_caution


_XDMF_CODE = {"triangle": 4, "quad": 5}


def _rows(arr):
    """Text of an array, one row per line; repr of a float round-trips exactly."""
    arr = np.asarray(arr)
    rows = arr.reshape(arr.shape[0], -1) if arr.ndim > 1 else arr[:, None]
    return "\n".join(" ".join(map(repr, r)) for r in rows.tolist())


def _item(body, dims, number_type, precision=None):
    prec = f' Precision="{precision}"' if precision else ""
    return f'<DataItem Dimensions="{dims}" NumberType="{number_type}"{prec} Format="XML">\n{body}\n</DataItem>'


def write(path, ctx):
    mesh = mesh_2d(ctx)
    mixed, size = [], 0
    for block in mesh.cells:
        code = np.full((len(block.data), 1), _XDMF_CODE[block.type], dtype=np.int64)
        rows = np.hstack([code, block.data])
        mixed.append(_rows(rows))
        size += rows.size
    ncell = sum(len(b.data) for b in mesh.cells)
    parts = [
        '<?xml version="1.0"?>',
        '<Xdmf Version="3.0">',
        "<Domain>",
        '<Grid Name="flowfield" GridType="Uniform">',
        f'<Topology TopologyType="Mixed" NumberOfElements="{ncell}">',
        _item("\n".join(mixed), str(size), "Int"),
        "</Topology>",
        '<Geometry GeometryType="XYZ">',
        _item(_rows(mesh.points), f"{len(mesh.points)} 3", "Float", 8),
        "</Geometry>",
    ]
    for name, arr in mesh.point_data.items():
        kind = "Vector" if np.ndim(arr) == 2 else "Scalar"
        parts += [f'<Attribute Name="{name}" AttributeType="{kind}" Center="Node">', _item(_rows(arr), " ".join(map(str, np.shape(arr))), "Float", 8),
                  "</Attribute>"]
    parts += ["</Grid>", "</Domain>", "</Xdmf>", ""]
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write("\n".join(parts))
    xml_caution(path, ctx, "flowfield")
    ctx.note(f"flowfield.xdmf: {len(mesh.points)} points, {ncell} cells, data inline")

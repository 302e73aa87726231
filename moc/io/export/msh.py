"""The net as a Gmsh mesh with flow data as node data (format "msh", MSH 2.2 binary via meshio).

MSH 2.2 is chosen because meshio 5.3 writes its ASCII variant with numpy 2
wrongly and its 4.1 variant needs entity tags; the binary 2.2 file reads back
in Gmsh and meshio.  Physical group "flowfield" (dimension 2) holds all cells.
"""

import numpy as np

from moc.io.export.field import mesh_2d, msh_caution


def write(path, ctx):
    import meshio

    mesh = mesh_2d(ctx)
    tags = [np.ones(len(c.data), dtype=np.int32) for c in mesh.cells]
    mesh.cell_data = {"gmsh:physical": tags, "gmsh:geometrical": [t.copy() for t in tags]}
    mesh.field_data = {"flowfield": np.array([1, 2])}
    meshio.write(path, mesh, file_format="gmsh22", binary=True)
    msh_caution(path, ctx, "flowfield")
    ctx.note(f"flowfield.msh: {len(mesh.points)} points, {sum(len(c.data) for c in mesh.cells)} cells")

"""The CFD domain mesh in Gmsh format (format "mesh-msh", MSH 2.2 ASCII via meshio).

ASCII MSH 2.2 is the variant most mesh converters of CFD codes read.

Physical groups: "fluid" (dimension 2, all quadrilaterals) and one
dimension-1 group per boundary (inlet, outlet, wall, axis or symmetry,
farfield), named through the $PhysicalNames section.
"""

import numpy as np

from moc.io.export.field import msh_caution


def write(path, ctx):
    import meshio

    mesh = ctx.domain
    pts = np.column_stack([mesh.points, np.zeros(len(mesh.points))])
    cells = [("quad", mesh.quads)]
    phys = [np.ones(len(mesh.quads), dtype=np.int32)]
    field = {"fluid": np.array([1, 2])}
    for k, (name, edges) in enumerate(mesh.boundaries.items(), start=2):
        cells.append(("line", edges))
        phys.append(np.full(len(edges), k, dtype=np.int32))
        field[name] = np.array([k, 1])
    m = meshio.Mesh(pts, cells, cell_data={"gmsh:physical": phys, "gmsh:geometrical": [p.copy() for p in phys]},
                    field_data=field)
    meshio.write(path, m, file_format="gmsh22", binary=False)
    msh_caution(path, ctx, "CFD domain mesh")
    ctx.note(f"domain.msh: physical groups {', '.join(field)}")

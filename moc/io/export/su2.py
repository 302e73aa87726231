"""The CFD domain mesh in SU2's native format (format "su2").

Written directly rather than through meshio, whose SU2 writer numbers the
markers instead of naming them: NDIME= 2, NELEM= (VTK type 9 quadrilaterals,
counter-clockwise), NPOIN= (x y, 17 significant digits), NMARK= and one
MARKER_TAG= name / MARKER_ELEMS= block of VTK type 3 lines per boundary.
Layout as in the SU2 mesh-file documentation (su2code.github.io, "Mesh File";
from memory); '%' lines are comments.  Axisymmetric meshes are the meridian
plane with y the radius (run SU2 with its axisymmetric option).
"""

import io

import numpy as np


def _block(buf, rows, fmt):
    np.savetxt(buf, rows, fmt=fmt)


def write(path, ctx):
    mesh = ctx.domain
    buf = io.StringIO()
    for line in ctx.header_lines("CFD domain mesh"):
        buf.write(f"% {line}\n")
    buf.write("NDIME= 2\n")
    buf.write(f"NELEM= {len(mesh.quads)}\n")
    _block(buf, np.column_stack([np.full(len(mesh.quads), 9), mesh.quads]), "%d")
    buf.write(f"NPOIN= {len(mesh.points)}\n")
    _block(buf, mesh.points, "%.17g")
    buf.write(f"NMARK= {len(mesh.boundaries)}\n")
    for name, edges in mesh.boundaries.items():
        buf.write(f"MARKER_TAG= {name}\nMARKER_ELEMS= {len(edges)}\n")
        _block(buf, np.column_stack([np.full(len(edges), 3), edges]), "%d")
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write(buf.getvalue())
    ctx.note(f"domain.su2: markers {', '.join(mesh.boundaries)}")

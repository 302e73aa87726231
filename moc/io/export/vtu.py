"""The net as a VTK unstructured grid with flow data (format "vtu", through meshio)."""

from moc.io.export.field import mesh_2d, xml_caution


def write(path, ctx):
    import meshio

    mesh = mesh_2d(ctx)
    meshio.write(path, mesh, file_format="vtu")
    xml_caution(path, ctx, "flowfield")
    ctx.note(f"flowfield.vtu: {len(mesh.points)} points, {sum(len(c.data) for c in mesh.cells)} cells")

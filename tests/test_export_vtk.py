"""VTU files read by VTK itself (optional: runs where the vtk package is installed, `pip install vtk`).

VTK's own mesh-quality volumes must be positive for every cell of the
revolved sector, every cell face must face out of its cell (VTK's face
lists), and the cells must fill the revolved region: angle * ybar * A
(Pappus's centroid theorem), to the facet error.
"""

import math

import numpy as np
import pytest

from moc.io.export import export
from test_export_common import ALPHA, THROAT_MM, source_flow_result

vtk = pytest.importorskip("vtk")
from vtk.util.numpy_support import vtk_to_numpy  # noqa: E402


def read(path):
    r = vtk.vtkXMLUnstructuredGridReader()
    r.SetFileName(str(path))
    r.Update()
    return r.GetOutput()


def test_vtk_reads_the_sector_with_positive_outward_cells(tmp_path):
    res = source_flow_result()
    angle, segs = 90.0, 48
    export(res, ["sector-vtu", "vtu"], tmp_path, units="mm",
           options={"sector_angle": angle, "sector_segments": segs})
    g = read(tmp_path / "flowfield_sector.vtu")
    q = vtk.vtkMeshQuality()
    q.SetInputData(g)
    q.SetHexQualityMeasureToVolume()
    q.SetWedgeQualityMeasureToVolume()
    q.SetPyramidQualityMeasureToVolume()
    q.SetTetQualityMeasureToVolume()
    q.Update()
    vol = vtk_to_numpy(q.GetOutput().GetCellData().GetArray("Quality"))
    types = {g.GetCellType(i) for i in range(g.GetNumberOfCells())}
    assert types == {vtk.VTK_HEXAHEDRON, vtk.VTK_WEDGE, vtk.VTK_PYRAMID, vtk.VTK_TETRA}
    assert vol.min() > 0
    rho_s = THROAT_MM / math.sin(ALPHA)
    exact = math.radians(angle) * ((3.0 * rho_s) ** 3 - rho_s ** 3) / 3.0 * (1.0 - math.cos(ALPHA))
    assert vol.sum() == pytest.approx(exact, rel=2e-3)
    pts = vtk_to_numpy(g.GetPoints().GetData())
    for k in range(0, g.GetNumberOfCells(), 37):  # a sample of cells of every kind
        cell = g.GetCell(k)
        centre = pts[[cell.GetPointId(i) for i in range(cell.GetNumberOfPoints())]].mean(0)
        for f in range(cell.GetNumberOfFaces()):
            face = cell.GetFace(f)
            p = pts[[face.GetPointId(i) for i in range(face.GetNumberOfPoints())]]
            n = np.cross(p[1] - p[0], p[2] - p[0])
            assert np.dot(n, p.mean(0) - centre) > 0
    flat = read(tmp_path / "flowfield.vtu")
    mach = vtk_to_numpy(flat.GetPointData().GetArray("mach"))
    assert np.allclose(mach, res.net.mach, rtol=1e-12)
    assert "CAUTION" in open(tmp_path / "flowfield.vtu", encoding="utf-8").read(2000)


def test_vtk_xdmf_reader_reads_the_inline_xdmf(tmp_path):
    if not hasattr(vtk, "vtkXdmfReader"):
        pytest.skip("this VTK build has no XDMF reader")
    res = source_flow_result(p0_dip=True)
    export(res, ["xdmf"], tmp_path, units="mm")
    r = vtk.vtkXdmfReader()
    r.SetFileName(str(tmp_path / "flowfield.xdmf"))
    r.Update()
    g = r.GetOutputDataObject(0)
    assert g.GetNumberOfPoints() == res.net.size
    kinds = [g.GetCellType(i) for i in range(g.GetNumberOfCells())]
    assert kinds.count(vtk.VTK_TRIANGLE) == 20 and kinds.count(vtk.VTK_QUAD) == len(res.net.cells) - 20
    pts = vtk_to_numpy(g.GetPoints().GetData())
    assert np.allclose(pts[:, 0], res.net.x * THROAT_MM, rtol=1e-12, atol=1e-12)
    pd = g.GetPointData()
    assert np.array_equal(vtk_to_numpy(pd.GetArray("mach")), res.net.mach)
    assert np.array_equal(vtk_to_numpy(pd.GetArray("p0_ratio")), res.net.p0_ratio)
    assert vtk_to_numpy(pd.GetArray("velocity_a0")).shape == (res.net.size, 3)

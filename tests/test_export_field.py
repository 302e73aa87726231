"""Flowfield exports (vtu, xdmf, msh, sector-vtu) read back and compared with the exact source flow.

Exact values: radial source flow (see test_export_common) with the isentropic
relations of NACA Report 1135 (closed forms, written out here):
T/T0 = 1/(1 + (g-1)/2 M^2), p/p0 = (T/T0)^(g/(g-1)), rho/rho0 = (T/T0)^(1/(g-1)),
V/a0 = M sqrt(T/T0); entropy rise Delta s/R = -ln(p02/p01) (same source).
"""

import math
import xml.etree.ElementTree as ET

import numpy as np
import pytest

from moc.io.export import export
from test_export_common import ALPHA, GAMMA, THROAT_MM, source_flow_result


def exact_fields(res):
    g = GAMMA
    m = res.net.mach
    t = 1.0 / (1.0 + 0.5 * (g - 1.0) * m * m)
    p0 = res.net.p0_ratio
    return {
        "mach": m,
        "T_T0": t,
        "p_p0": t ** (g / (g - 1.0)) * p0,
        "rho_rho0": t ** (1.0 / (g - 1.0)) * p0,
        "flow_angle_deg": np.degrees(res.net.theta),
        "p0_ratio": p0,
        "entropy_rise_R": -np.log(p0),
        "speed_a0": m * np.sqrt(t),
    }


def check_fields(points, data, res, rtol=1e-12):
    ex = exact_fields(res)
    assert np.allclose(points[:, 0], res.net.x * THROAT_MM, rtol=1e-9, atol=1e-12)
    assert np.allclose(points[:, 1], res.net.y * THROAT_MM, rtol=1e-9, atol=1e-12)
    for k in ("mach", "T_T0", "p_p0", "rho_rho0", "flow_angle_deg", "p0_ratio"):
        assert np.allclose(np.asarray(data[k]).ravel(), ex[k], rtol=rtol, atol=1e-14), k
    assert np.allclose(np.asarray(data["entropy_rise_R"]).ravel(), ex["entropy_rise_R"], atol=1e-14)
    vel = np.asarray(data["velocity_a0"])
    assert np.allclose(np.hypot(vel[:, 0], vel[:, 1]), ex["speed_a0"], rtol=1e-12)
    # radial source flow: the velocity points away from the apex (the flow angle is the polar angle)
    assert np.allclose(np.arctan2(vel[:, 1], vel[:, 0]), res.net.theta, atol=1e-12)


def test_exact_fields_of_the_fixture_match_handbook_values():
    """Sanity of the exact flow itself: M = 2 gives p/p0 = 0.127805, T/T0 = 5/9 (VALIDATION.md, NACA 1135)."""
    res = source_flow_result()
    res.net.mach = np.array([2.0])
    res.net.theta = np.array([0.0])
    res.net.p0_ratio = np.array([1.0])
    ex = exact_fields(res)
    assert ex["p_p0"][0] == pytest.approx(0.127805, rel=1e-5)
    assert ex["T_T0"][0] == pytest.approx(5.0 / 9.0, rel=1e-12)


@pytest.mark.parametrize("p0_dip", [False, True])
def test_vtu_and_msh_read_back_with_meshio(tmp_path, p0_dip):
    import meshio

    res = source_flow_result(p0_dip=p0_dip)
    export(res, "vtu,msh", tmp_path, units="mm")
    for name in ("flowfield.vtu", "flowfield.msh"):
        m = meshio.read(tmp_path / name)
        check_fields(m.points, m.point_data, res)
        cd = m.cells_dict
        # 20 split cells stored as triangles (repeated index) and the rest as quads
        assert cd["triangle"].shape == (20, 3) and cd["quad"].shape == (len(res.net.cells) - 20, 4)
        assert np.all(np.isin(cd["quad"], res.net.cells))
    assert "CAUTION" in open(tmp_path / "flowfield.vtu", encoding="utf-8").read(2000)
    if p0_dip:
        assert meshio.read(tmp_path / "flowfield.vtu").point_data["entropy_rise_R"].max() == pytest.approx(
            -math.log(0.95), rel=1e-12)


def read_xdmf(path):
    root = ET.parse(path).getroot()
    assert root.tag == "Xdmf" and root.get("Version") == "3.0"
    grid = root.find("Domain/Grid")

    def arr(item):
        dims = [int(d) for d in item.get("Dimensions").split()]
        return np.array(item.text.split(), dtype=float).reshape(dims)

    pts = arr(grid.find("Geometry/DataItem"))
    topo = grid.find("Topology")
    mixed = arr(topo.find("DataItem")).astype(int)
    cells, i = [], 0
    size = {4: 3, 5: 4}  # XDMF cell codes: 4 triangle, 5 quadrilateral
    while i < mixed.size:
        n = size[mixed[i]]
        cells.append(mixed[i + 1: i + 1 + n])
        i += n + 1
    assert len(cells) == int(topo.get("NumberOfElements"))
    data = {a.get("Name"): arr(a.find("DataItem")) for a in grid.findall("Attribute")}
    return pts, cells, data


def test_xdmf_reads_back(tmp_path):
    res = source_flow_result(p0_dip=True)
    export(res, ["xdmf"], tmp_path)
    pts, cells, data = read_xdmf(tmp_path / "flowfield.xdmf")
    check_fields(pts, data, res, rtol=0)  # 17 digits: exact round trip
    assert sum(len(c) == 3 for c in cells) == 20
    try:
        import h5py  # noqa: F401  (meshio's XDMF reader needs it even for inline data)
    except ImportError:
        return
    import meshio
    m = meshio.read(tmp_path / "flowfield.xdmf")
    check_fields(m.points, m.point_data, res)


def _signed_volumes(points, kind, cells):
    """Signed volumes by tetrahedra in meshio's node order (hexahedron and pyramid bases counter-clockwise about
    the direction to the opposite face or apex, the wedge base clockwise; checked on unit cells below, and the
    written files against VTK itself in test_export_vtk.py)."""
    tets = {
        "tetra": [(0, 1, 2, 3)],
        "pyramid": [(0, 1, 2, 4), (0, 2, 3, 4)],
        "wedge": [(0, 2, 1, 3), (1, 2, 5, 3), (1, 5, 4, 3)],
        "hexahedron": [(0, 1, 2, 6), (0, 2, 3, 6), (0, 3, 7, 6), (0, 7, 4, 6), (0, 4, 5, 6), (0, 5, 1, 6)],
    }[kind]
    p = points[cells]
    v = 0.0
    for a, b, c, d in tets:
        v = v + np.einsum("ij,ij->i", p[:, b] - p[:, a], np.cross(p[:, c] - p[:, a], p[:, d] - p[:, a])) / 6.0
    return v


def test_tet_splits_match_vtk_unit_cells():
    cube = np.array([[0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0], [0, 0, 1], [1, 0, 1], [1, 1, 1], [0, 1, 1]], float)
    assert _signed_volumes(cube, "hexahedron", np.arange(8)[None])[0] == pytest.approx(1.0)
    # meshio wedge: base (0,1,2) normal points away from (3,4,5)
    wedge = np.array([[0, 0, 0], [0, 1, 0], [1, 0, 0], [0, 0, 1], [0, 1, 1], [1, 0, 1]], float)
    assert _signed_volumes(wedge, "wedge", np.arange(6)[None])[0] == pytest.approx(0.5)
    # VTK pyramid: base normal points to the apex
    pyr = np.array([[0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0], [0.5, 0.5, 1]], float)
    assert _signed_volumes(pyr, "pyramid", np.arange(5)[None])[0] == pytest.approx(1.0 / 3.0)


@pytest.mark.parametrize("angle,segs", [(90.0, 24), (360.0, 64)])
def test_revolved_sector_cells_are_positive_and_fill_the_pappus_volume(tmp_path, angle, segs):
    """Sum of cell volumes = angle * ybar * A of the net's region (Pappus's centroid theorem), to the facet error."""
    import meshio

    res = source_flow_result()
    export(res, ["sector-vtu"], tmp_path, options={"sector_angle": angle, "sector_segments": segs})
    m = meshio.read(tmp_path / "flowfield_sector.vtu")
    total = 0.0
    for block in m.cells:
        v = _signed_volumes(m.points, block.type, block.data)
        assert np.all(v > 0), block.type
        total += v.sum()
    # the net covers the annular sector between rho*, rho_e and 0 <= phi <= ALPHA about the cone apex
    rho_s = THROAT_MM / math.sin(ALPHA)
    rho_e = 3.0 * rho_s
    exact = math.radians(angle) * (rho_e ** 3 - rho_s ** 3) / 3.0 * (1.0 - math.cos(ALPHA))
    # exact: volume of revolution of a polar sector, int int r sin(phi) r dr dphi per radian (common geometry)
    assert total == pytest.approx(exact, rel=2e-2 if segs < 32 else 2e-3)
    # the velocity keeps its size (V/a0 = M sqrt(T/T0), closed form) and stays in the meridian plane
    vel, mach, pts = m.point_data["velocity_a0"], m.point_data["mach"], m.points
    speed = mach / np.sqrt(1.0 + 0.5 * (GAMMA - 1.0) * mach ** 2)
    assert np.allclose(np.linalg.norm(vel, axis=1), speed, rtol=1e-12)
    assert np.allclose(vel[:, 1] * pts[:, 2] - vel[:, 2] * pts[:, 1], 0.0, atol=1e-12 * THROAT_MM)
    # the plane a = 0 carries every net point with its 2-D data
    plane = (np.abs(pts[:, 2]) < 1e-12) & (pts[:, 1] >= 0.0)
    assert plane.sum() == res.net.size
    order = np.lexsort((pts[plane, 1], pts[plane, 0]))
    ref = np.lexsort((res.net.y, res.net.x))
    assert np.allclose(mach[plane][order], res.net.mach[ref], rtol=1e-12)


def test_sector_refuses_a_planar_result(tmp_path):
    from moc.errors import ExportError
    with pytest.raises(ExportError, match="planar"):
        export(source_flow_result("planar"), ["vtu", "sector-vtu"], tmp_path)
    assert not any(tmp_path.iterdir())

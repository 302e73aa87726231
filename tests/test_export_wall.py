"""DXF and STL wall exports, read back with ezdxf, meshio and a small numpy STL reader."""

import math

import numpy as np
import pytest
from scipy.integrate import quad

from moc.io.export import write
from test_export_common import PSI, RC, THROAT_MM, read_csv, source_flow_result


def _profile(tmp_path, res, units="mm", **opts):
    write("csv", tmp_path / "w.csv", res, units=units, options=opts or None, force=True)
    return read_csv(tmp_path / "w.csv")


# -- DXF -----------------------------------------------------------------------
@pytest.mark.parametrize("unit,code", [("mm", 4), ("in", 1), ("m", 6)])
def test_dxf_reads_back_with_units_layers_and_points(tmp_path, unit, code):
    import ezdxf
    from ezdxf import comments

    res = source_flow_result()
    write("dxf", tmp_path / "w.dxf", res, units=unit)
    _, _, data = _profile(tmp_path, res, units=unit)
    doc = ezdxf.readfile(tmp_path / "w.dxf")
    auditor = doc.audit()  # ezdxf's structural checker of the DXF (entities, layers, linetypes, handles)
    assert not auditor.has_errors and not auditor.has_fixes
    # Source: Autodesk DXF Reference (R2000): AC1015 is the R2000 version string; $INSUNITS 1 in, 4 mm, 6 m.
    assert doc.dxfversion == "AC1015"
    assert doc.header["$INSUNITS"] == code
    msp = doc.modelspace()
    assert {"WALL_SPLINE", "WALL_POLYLINE", "AXIS", "NOTES"} <= {layer.dxf.name for layer in doc.layers}
    poly = msp.query("LWPOLYLINE")
    assert len(poly) == 1 and poly[0].dxf.layer == "WALL_POLYLINE"
    pts = np.array([(p[0], p[1]) for p in poly[0].get_points()])
    assert np.allclose(pts, data[:, :2], rtol=1e-9, atol=1e-12 * abs(data).max())
    splines = msp.query("SPLINE")
    assert len(splines) == 2  # inlet and divergent wall: the throat corner stays a corner
    fit = np.concatenate([np.array(list(s.fit_points))[:, :2] for s in splines])
    # the wall spline is straight (cone) and carries collinear fit points; the inlet's are the CSV points
    inlet_fit = np.array(list(splines[0].fit_points))[:, :2]
    assert np.allclose(inlet_fit, data[: len(inlet_fit), :2], rtol=1e-9)
    assert np.allclose(fit[-1], data[-1, :2], rtol=1e-9)
    axis = msp.query("LINE")[0]
    assert axis.dxf.layer == "AXIS" and axis.dxf.start[1] == 0.0 and axis.dxf.end[1] == 0.0
    # dimensions in the drawing unit: overall length, exit radius, throat radius (the saved throat size)
    dims = sorted(d.get_measurement() for d in msp.query("DIMENSION"))
    throat = THROAT_MM * {"mm": 1.0, "in": 1.0 / 25.4, "m": 1e-3}[unit]
    expect = sorted([data[-1, 0] - data[0, 0], data[-1, 1], throat])
    assert np.allclose(dims, expect, rtol=1e-9)
    assert {d.dxf.layer for d in msp.query("DIMENSION")} == {"DIMENSIONS"}
    for d in msp.query("DIMENSION"):  # the drawn text shows the measured length itself (no scale factor)
        shown = [e.plain_text() for e in doc.blocks.get(d.dxf.geometry).query("MTEXT")]
        assert float(shown[0]) == pytest.approx(d.get_measurement(), rel=1e-4, abs=1e-4)
    text = " ".join(t.dxf.text for t in msp.query("TEXT"))
    assert "CAUTION" in text
    assert any("CAUTION" in str(tag.value) for tag in comments.from_file(str(tmp_path / "w.dxf")))


def test_dxf_inlet_spline_follows_the_true_arc(tmp_path):
    """The drawn inlet curve stays within the chord tolerance of the exact circle (common geometry)."""
    import ezdxf

    res = source_flow_result()
    tol = 1e-3
    write("dxf", tmp_path / "w.dxf", res, units="mm", options={"chord_tolerance": tol})
    sp = ezdxf.readfile(tmp_path / "w.dxf").modelspace().query("SPLINE")[0]
    pts = np.array(list(sp.construction_tool().approximate(4000)))[:, :2] / THROAT_MM
    radius = np.hypot(pts[:, 0], pts[:, 1] - (1.0 + RC))
    assert np.max(np.abs(radius - RC)) * THROAT_MM < tol


def test_planar_dxf_has_a_centreline_layer(tmp_path):
    import ezdxf

    write("dxf", tmp_path / "p.dxf", source_flow_result("planar"), units="mm")
    doc = ezdxf.readfile(tmp_path / "p.dxf")
    assert doc.modelspace().query("LINE")[0].dxf.layer == "CENTRELINE"


# -- STL -----------------------------------------------------------------------
def read_binary_stl(path):
    """Minimal binary STL reader (80-byte header, uint32 count, 50-byte records; 3D Systems 1988 layout)."""
    raw = open(path, "rb").read()
    n = int(np.frombuffer(raw, "<u4", 1, 80)[0])
    assert len(raw) == 84 + 50 * n
    rec = np.frombuffer(raw, np.dtype([("n", "<f4", 3), ("v", "<f4", (3, 3)), ("a", "<u2")]), n, 84)
    return raw[:80], rec["n"].astype(float), rec["v"].astype(float)


def closed_and_oriented(tri):
    """Every edge is shared by exactly two triangles, traversed once in each direction."""
    flat = tri.reshape(-1, 3)
    _, inv = np.unique(flat, axis=0, return_inverse=True)
    f = inv.reshape(-1, 3)
    directed = np.concatenate([f[:, [0, 1]], f[:, [1, 2]], f[:, [2, 0]]])
    keys = directed[:, 0] * (f.max() + 1) + directed[:, 1]
    rev = directed[:, 1] * (f.max() + 1) + directed[:, 0]
    uniq, counts = np.unique(keys, return_counts=True)
    return bool(np.all(counts == 1) and np.all(np.isin(rev, uniq)))


def volume(tri):
    return np.einsum("ij,ij->i", tri[:, 0], np.cross(tri[:, 1], tri[:, 2])).sum() / 6.0


def pappus_polyline(x, y):
    """Volume of the region between a polyline and the axis revolved once: V = 2 pi ybar A.

    Source: Pappus's second centroid theorem; polygon area and centroid by the shoelace formula (common geometry).
    """
    px = np.concatenate([x, [x[-1], x[0]]])
    py = np.concatenate([y, [0.0, 0.0]])
    cr = px * np.roll(py, -1) - np.roll(px, -1) * py
    area = 0.5 * cr.sum()
    ybar = ((py + np.roll(py, -1)) * cr).sum() / (6.0 * area)
    return 2.0 * math.pi * ybar * abs(area), abs(area)


def exact_cavity_volume_mm3():
    """Inlet arc of radius RC plus a cone frustum, revolved (common geometry: frustum pi L (a^2 + ab + b^2)/3)."""
    arc = quad(lambda x: math.pi * (1.0 + RC - math.sqrt(RC * RC - x * x)) ** 2, -RC * math.sin(PSI), 0.0,
               epsabs=1e-13)[0]
    res = source_flow_result()
    L, r2 = res.wall["x"][-1], res.wall["y"][-1]
    cone = math.pi * L * (1.0 + r2 + r2 * r2) / 3.0
    return (arc + cone) * THROAT_MM ** 3


@pytest.mark.parametrize("segments", [64, 180])
def test_revolved_stl_is_watertight_outward_and_has_the_pappus_volume(tmp_path, segments):
    import meshio

    res = source_flow_result()
    write("stl", tmp_path / "w.stl", res, units="mm", options={"segments": segments})
    header, normals, tri = read_binary_stl(tmp_path / "w.stl")
    assert not header.startswith(b"solid") and b"CAUTION" in header
    assert closed_and_oriented(tri)
    # stored normals agree with the vertex order and point out of the cavity (positive enclosed volume)
    geo = np.cross(tri[:, 1] - tri[:, 0], tri[:, 2] - tri[:, 0])
    geo /= np.linalg.norm(geo, axis=1, keepdims=True)
    assert np.all(np.einsum("ij,ij->i", geo, normals) > 0.999)
    v = volume(tri)
    assert v > 0
    _, _, data = _profile(tmp_path, res)
    vp, _ = pappus_polyline(data[:, 0], data[:, 1])
    # a regular N-gon has (N/2pi) sin(2pi/N) of its circle's area (common geometry)
    poly = segments / (2 * math.pi) * math.sin(2 * math.pi / segments)
    assert v == pytest.approx(poly * vp, rel=2e-6)
    if segments >= 180:
        assert v == pytest.approx(exact_cavity_volume_mm3(), rel=1e-3)
    m = meshio.read(tmp_path / "w.stl")
    assert m.cells_dict["triangle"].shape[0] == tri.shape[0]
    # radial extent: largest radius equals the exit radius
    r = np.hypot(m.points[:, 1], m.points[:, 2])
    assert r.max() == pytest.approx(res.wall["y"][-1] * THROAT_MM, rel=1e-6)


def test_planar_stl_is_the_extruded_channel(tmp_path):
    res = source_flow_result("planar")
    width = 40.0
    write("stl", tmp_path / "p.stl", res, units="mm", options={"width": width})
    _, _, tri = read_binary_stl(tmp_path / "p.stl")
    assert closed_and_oriented(tri)
    _, _, data = _profile(tmp_path, res)
    _, area = pappus_polyline(data[:, 0], data[:, 1])
    # both contoured walls over the span: V = 2 A W (Cavalieri's principle; common geometry)
    assert volume(tri) == pytest.approx(2.0 * area * width, rel=2e-6)
    z = tri[:, :, 2]
    assert z.min() == pytest.approx(-width / 2, rel=1e-7) and z.max() == pytest.approx(width / 2, rel=1e-7)
    arc = quad(lambda x: 1.0 + RC - math.sqrt(RC * RC - x * x), -RC * math.sin(PSI), 0.0, epsabs=1e-13)[0]
    L, y2 = res.wall["x"][-1], res.wall["y"][-1]
    exact = 2.0 * width * (arc + 0.5 * L * (1.0 + y2)) * THROAT_MM ** 2
    assert volume(tri) == pytest.approx(exact, rel=1e-3)


@pytest.mark.parametrize("geometry", ["axisymmetric", "planar"])
def test_stl_is_a_valid_volume_for_trimesh(tmp_path, geometry):
    """Optional independent check with the trimesh library (runs where it is installed, `pip install trimesh`)."""
    trimesh = pytest.importorskip("trimesh")
    res = source_flow_result(geometry)
    write("stl", tmp_path / "w.stl", res, units="mm")
    mesh = trimesh.load(tmp_path / "w.stl")
    assert mesh.is_watertight and mesh.is_winding_consistent and mesh.is_volume
    _, _, tri = read_binary_stl(tmp_path / "w.stl")
    assert mesh.volume == pytest.approx(volume(tri), rel=1e-9) and mesh.volume > 0

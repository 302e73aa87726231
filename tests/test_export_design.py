"""Exports of a real designed nozzle (runs once moc.design.design_minimum_length exists).

Checks against outside truth: the exit radius of a shock-free uniform-exit
nozzle is sqrt(A/A*(Me)) throat radii (mass conservation with the isentropic
area ratio, NACA Report 1135 closed form; VALIDATION.md), the STL volume is
the Pappus volume of the exported profile times the N-gon area factor
(common geometry), and every file reads back with its format's library.
"""

import math

import numpy as np
import pytest

from test_export_common import read_csv
from test_export_wall import closed_and_oriented, pappus_polyline, read_binary_stl, volume

design = pytest.importorskip("moc.design")
if not hasattr(design, "design_minimum_length"):
    pytest.skip("moc.design.design_minimum_length is not there yet", allow_module_level=True)

ME, G = 2.4, 1.4


@pytest.fixture(scope="module")
def designed(tmp_path_factory):
    res = design.design_minimum_length(exit_mach=ME, gamma=G, geometry="axisymmetric", n=30)
    res.inputs = dict(res.inputs or {})
    res.inputs["throat"] = {"value": 10.0, "unit": "mm"}
    d = tmp_path_factory.mktemp("design")
    res.save(d)
    return d


def test_designed_nozzle_exports_read_back(designed, tmp_path):
    import ezdxf
    import meshio

    from moc.cli import main
    from moc.result import Result

    out = tmp_path / "out"
    assert main(["export", str(designed), "--format", "csv,dxf,stl,vtu,su2", "-o", str(out), "-q",
                 "--chord-tolerance", "0.001", "--first-cell", "0.01"]) == 0
    res = Result.load(designed)
    _, parts, data = read_csv(out / "wall_points.csv")
    # Source: area ratio A/A* = (1/M)[2/(g+1)(1 + (g-1)/2 M^2)]^((g+1)/(2(g-1))), NACA Report 1135.
    ar = (2 / (G + 1) * (1 + 0.5 * (G - 1) * ME ** 2)) ** ((G + 1) / (2 * (G - 1))) / ME
    assert data[-1, 1] / 10.0 == pytest.approx(math.sqrt(ar), rel=1e-2)
    assert np.allclose(data[[0, -1], 0] / 10.0, [res.wall["x"][0] if not len(res.inlet.get("x", []))
                                                 else min(res.inlet["x"]), res.wall["x"][-1]], rtol=1e-9, atol=1e-12)
    doc = ezdxf.readfile(out / "wall.dxf")
    pts = np.array([(p[0], p[1]) for p in doc.modelspace().query("LWPOLYLINE")[0].get_points()])
    assert np.allclose(pts, data[:, :2], rtol=1e-9)
    _, _, tri = read_binary_stl(out / "wall.stl")
    assert closed_and_oriented(tri)
    vp, _ = pappus_polyline(data[:, 0], data[:, 1])
    assert volume(tri) == pytest.approx(180 / (2 * math.pi) * math.sin(2 * math.pi / 180) * vp, rel=1e-5)
    m = meshio.read(out / "flowfield.vtu")
    assert np.allclose(m.point_data["mach"], res.net.mach, rtol=1e-12)
    su2 = open(out / "domain.su2", encoding="utf-8").read()
    for marker in ("inlet", "outlet", "wall", "axis"):
        assert f"MARKER_TAG= {marker}\n" in su2

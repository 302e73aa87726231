"""CFD domain mesh (su2, mesh-msh): read back with meshio and checked against the exact nozzle geometry.

The nozzle is the source-flow fixture of test_export_common: a circular inlet
arc of radius RC ending at the throat (0, 1), then a straight cone wall of
half-angle ALPHA (common geometry: y = 1 + x tan(alpha)).
"""

import math

import numpy as np
import pytest

from moc.errors import ExportError
from moc.io.domain_mesh import graded, mesh_quality
from moc.io.export import export
from test_export_common import ALPHA, PSI, RC, THROAT_MM, source_flow_result


def su2_markers(path):
    """MARKER_TAG names and element counts, read as plain text (SU2 mesh format: 'KEY= value' lines)."""
    names, counts = [], []
    for line in open(path, encoding="utf-8"):
        if line.startswith("MARKER_TAG="):
            names.append(line.split("=", 1)[1].strip())
        elif line.startswith("MARKER_ELEMS="):
            counts.append(int(line.split("=", 1)[1]))
    return dict(zip(names, counts))


def quad_areas(points, quads):
    p = points[quads][..., :2]
    return 0.5 * (p[..., 0] * np.roll(p[..., 1], -1, 1) - np.roll(p[..., 0], -1, 1) * p[..., 1]).sum(1)


def exact_wall_y(x):
    """The fixture's wall in throat units: inlet arc for x < 0, straight cone after."""
    x = np.asarray(x, dtype=float)
    arc = 1.0 + RC - np.sqrt(np.maximum(RC * RC - x * x, 0.0))
    return np.where(x < 0, arc, 1.0 + x * math.tan(ALPHA))


def exact_area(res):
    """Area between the wall and the axis: arc segment integral plus trapezoid (common geometry)."""
    from scipy.integrate import quad
    arc = quad(lambda x: 1.0 + RC - math.sqrt(RC * RC - x * x), -RC * math.sin(PSI), 0.0, epsabs=1e-13)[0]
    L, ye = res.wall["x"][-1], res.wall["y"][-1]
    return arc + 0.5 * L * (1.0 + ye)


@pytest.mark.parametrize("geometry,axis_name", [("axisymmetric", "axis"), ("planar", "symmetry")])
def test_su2_mesh_reads_back_with_named_markers_on_the_true_boundaries(tmp_path, geometry, axis_name):
    import meshio

    res = source_flow_result(geometry)
    first = 0.002  # mm
    rep = export(res, ["su2", "mesh-msh"], tmp_path, units="mm",
                 options={"axial_cells": 80, "radial_cells": 30, "first_cell": first})
    markers = su2_markers(tmp_path / "domain.su2")
    assert markers == {"inlet": 30, "wall": 80, axis_name: 80, "outlet": 30}
    m = meshio.read(tmp_path / "domain.su2")
    pts, quads = m.points, m.cells_dict["quad"]
    assert pts.shape[1] == 2 and quads.shape == (80 * 30, 4)
    areas = quad_areas(pts, quads)
    assert np.all(areas > 0)  # no inverted cell, counter-clockwise as SU2 expects
    assert areas.sum() / THROAT_MM ** 2 == pytest.approx(exact_area(res), rel=1e-3)
    # boundary nodes by marker (meshio numbers string markers 1, 2, ... in file order)
    lines = [(b.data, t) for b, t in zip(m.cells, m.cell_data["su2:tag"]) if b.type == "line"]
    edges = np.concatenate([d for d, _ in lines])
    tags = np.concatenate([t for _, t in lines])
    order = list(markers)
    by = {name: np.unique(edges[tags == k + 1]) for k, name in enumerate(order)}
    x, y = pts[:, 0] / THROAT_MM, pts[:, 1] / THROAT_MM
    assert np.allclose(y[by[axis_name]], 0.0, atol=1e-15)
    assert np.allclose(x[by["inlet"]], -RC * math.sin(PSI), rtol=1e-9)
    assert np.allclose(x[by["outlet"]], res.wall["x"][-1], rtol=1e-9)
    assert np.allclose(y[by["wall"]], exact_wall_y(x[by["wall"]]), rtol=1e-7)
    # first cell height at every wall node: the node below lies `first` away
    wall_nodes = by["wall"]
    col = np.round(x, 12)
    for n in wall_nodes:
        same = np.flatnonzero(col == col[n])
        ys = np.sort(y[same])
        assert (ys[-1] - ys[-2]) * THROAT_MM == pytest.approx(first, rel=1e-9)
    assert any("largest skew" in n and "aspect ratio" in n and "smallest cell area" in n for n in rep.notes)
    g = meshio.read(tmp_path / "domain.msh")
    assert {"fluid", "inlet", "outlet", "wall", axis_name} == set(g.field_data)
    assert np.allclose(g.points[:, :2], pts, rtol=1e-12, atol=1e-15)


def test_plume_region_adds_farfield_and_moves_the_outlet(tmp_path):
    import meshio

    res = source_flow_result()
    L, H = 40.0, 30.0  # mm
    export(res, ["su2"], tmp_path, units="mm",
           options={"axial_cells": 60, "radial_cells": 20, "first_cell": 0.01, "plume_length": L, "plume_height": H,
                    "plume_axial_cells": 25, "plume_radial_cells": 15})
    markers = su2_markers(tmp_path / "domain.su2")
    assert markers == {"inlet": 20, "wall": 60, "axis": 60 + 25, "outlet": 20 + 15, "farfield": 25 + 15}
    m = meshio.read(tmp_path / "domain.su2")
    areas = quad_areas(m.points, m.cells_dict["quad"])
    assert np.all(areas > 0)
    xe, ye = res.wall["x"][-1] * THROAT_MM, res.wall["y"][-1] * THROAT_MM
    box = L * H
    assert areas.sum() == pytest.approx(exact_area(res) * THROAT_MM ** 2 + box, rel=1e-3)
    assert m.points[:, 0].max() == pytest.approx(xe + L, rel=1e-12)
    assert m.points[:, 1].max() == pytest.approx(H, rel=1e-12)
    assert ye < H
    # the plume columns start with the nozzle's last axial step and grow downstream
    xs = np.unique(np.round(m.points[:, 0], 9))
    k = int(np.searchsorted(xs, xe - 1e-9))
    assert xs[k + 1] - xs[k] == pytest.approx(xs[k] - xs[k - 1], rel=1e-6)
    assert np.all(np.diff(xs[k:], 2) > -1e-9)


def test_grading_has_the_requested_first_cell_and_fills_the_height():
    d = graded(np.array([1.0, 2.5]), 1e-3, 40)
    assert np.allclose(d[:, 1], 1e-3, rtol=1e-12)
    assert np.allclose(d[:, -1], [1.0, 2.5])
    r = np.diff(d, axis=1)
    q = r[:, 1:] / r[:, :-1]
    assert np.allclose(q, q[:, :1], rtol=1e-9)  # one growth ratio per line (geometric series)


def test_too_large_first_cell_is_refused(tmp_path):
    with pytest.raises(ExportError, match="first cell"):
        export(source_flow_result(), ["su2"], tmp_path, units="mm", options={"first_cell": 1.0, "radial_cells": 60})
    assert not any(tmp_path.iterdir())


def test_quality_detects_inverted_and_non_convex_cells():
    pts = np.array([[0, 0], [1, 0], [1, 1], [0, 1], [0.2, 0.8]], float)
    good = mesh_quality(pts, np.array([[0, 1, 2, 3]]))
    assert good["inverted"] == 0 and good["max_skew"] == pytest.approx(0.0, abs=1e-12)
    assert good["max_aspect"] == pytest.approx(1.0) and good["min_area"] == pytest.approx(1.0)
    assert mesh_quality(pts, np.array([[0, 3, 2, 1]]))["inverted"] == 1       # clockwise
    assert mesh_quality(pts, np.array([[0, 1, 4, 3]]))["inverted"] == 0       # convex, skewed
    assert mesh_quality(pts, np.array([[0, 2, 1, 3]]))["inverted"] == 1       # bow tie
    # equiangle skewness of a 60-degree rhombus: (120 - 90)/90 = 1/3 (common practice)
    rh = np.array([[0, 0], [1, 0], [1.5, math.sqrt(3) / 2], [0.5, math.sqrt(3) / 2]])
    assert mesh_quality(rh, np.array([[0, 1, 2, 3]]))["max_skew"] == pytest.approx(1.0 / 3.0)


def test_wall_turning_upstream_is_refused():
    from moc.io.domain_mesh import build
    from moc.io.export.contour import Contour
    res = source_flow_result()
    # an inlet face that steps back upstream (a chamber wall), which vertical grid lines cannot follow
    res.inlet = {"x": np.array([-1.0, -1.2, -0.5]), "y": np.array([3.0, 2.0, 1.2])}
    with pytest.raises(ExportError, match="upstream"):
        build(Contour.from_result(res), 40, 10, 1e-3)

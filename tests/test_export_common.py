"""Shared exact-flow results for the export tests, and tests of units, options and the CSV wall.

The results are built from a radial source flow, an exact homentropic
solution (Source: Zucrow and Hoffman, Gas Dynamics vol. 1, 1976, source flow;
from memory): in a cone (axisymmetric) or a wedge (planar) of half-angle
alpha the flow is radial, theta equals the polar angle, and the Mach number
at distance rho from the apex follows A/A*(M) = (rho/rho*)^(1+d) with the
isentropic area ratio of NACA Report 1135 (closed form, evaluated here
independently of moc.flow).  The subsonic inlet is a circular arc of radius
RC, so its curvature is known exactly.
"""

import math
import warnings

import numpy as np
import pytest
from scipy.optimize import brentq

from moc.errors import ExportError, ResultFileError
from moc.result import Net, Result

GAMMA = 1.4
ALPHA = math.radians(15.0)
RC = 1.5          # inlet arc radius, throat units
PSI = math.radians(40.0)  # inlet arc opening
THROAT_MM = 5.0


def area_ratio(m, g=GAMMA):
    """A/A* = (1/M) [2/(g+1) (1 + (g-1)/2 M^2)]^((g+1)/(2(g-1))) (Source: NACA Report 1135, closed form)."""
    return (2.0 / (g + 1.0) * (1.0 + 0.5 * (g - 1.0) * m * m)) ** ((g + 1.0) / (2.0 * (g - 1.0))) / m


def mach_supersonic(a, g=GAMMA):
    if a <= 1.0 + 1e-15:
        return 1.0
    return brentq(lambda m: area_ratio(m, g) - a, 1.0, 50.0, xtol=1e-15, rtol=1e-15)


def inlet_arc(n=120):
    """Circular inlet arc of radius RC tangent to y = 1 at the throat x = 0 (upstream, x < 0)."""
    psi = np.linspace(PSI, 0.0, n)
    return -RC * np.sin(psi), 1.0 + RC * (1.0 - np.cos(psi))


def source_flow_result(geometry="axisymmetric", n_rho=41, n_phi=11, rho_exit_ratio=3.0, inlet=True,
                       split_first=True, throat=True, p0_dip=False):
    """A Result holding an exact radial source flow between the sonic arc and rho = rho_exit_ratio rho*."""
    d = 1 if geometry == "axisymmetric" else 0
    rho_s = 1.0 / math.sin(ALPHA)          # wall at the sonic arc has y = 1 (throat units)
    rho = rho_s * np.linspace(1.0, rho_exit_ratio, n_rho)
    phi = np.linspace(0.0, ALPHA, n_phi)
    R, P = np.meshgrid(rho, phi, indexing="ij")
    mach_r = np.array([mach_supersonic((r / rho_s) ** (1 + d)) for r in rho])
    M = np.repeat(mach_r[:, None], n_phi, axis=1)
    x = R * np.cos(P) - rho_s * math.cos(ALPHA)
    y = R * np.sin(P)
    idx = np.arange(n_rho * n_phi).reshape(n_rho, n_phi)
    a, b, c, e = idx[:-1, :-1], idx[1:, :-1], idx[1:, 1:], idx[:-1, 1:]
    quads = np.stack([a, b, c, e], axis=-1).reshape(-1, 4)
    if split_first:  # the first column as triangles (repeated last index), as nets store them
        first = quads[: n_phi - 1]
        tris = np.concatenate([first[:, [0, 1, 2, 2]], first[:, [0, 2, 3, 3]]])
        quads = np.concatenate([tris, quads[n_phi - 1:]])
    I, J = np.meshgrid(np.arange(n_rho), np.arange(n_phi), indexing="ij")
    p0 = np.ones(M.size)
    if p0_dip:
        p0 = 1.0 - 0.05 * (x.ravel() > x.max() / 2)
    net = Net(x=x.ravel(), y=y.ravel(), theta=P.ravel(), mach=M.ravel(), cplus=(I - J).ravel(),
              cminus=(I + J).ravel(), cells=quads, p0_ratio=p0)
    wall = {"x": x[:, -1], "y": y[:, -1], "theta": P[:, -1], "mach": M[:, -1]}
    ix, iy = inlet_arc() if inlet else (np.array([]), np.array([]))
    inputs = {"geometry": geometry, "gamma": GAMMA}
    if throat:
        inputs["throat"] = {"value": THROAT_MM, "unit": "mm"}
    summary = {"geometry": geometry, "gamma": GAMMA, "exit_mach": float(mach_r[-1])}
    return Result(kind="design", inputs=inputs, summary=summary, net=net, wall=wall,
                  axis={"x": x[:, 0], "mach": M[:, 0]}, inlet={"x": ix, "y": iy})


def read_csv(path):
    rows = [ln for ln in open(path, encoding="utf-8") if not ln.startswith("#")]
    head = rows[0].strip().split(",")
    parts = [r.split(",")[0] for r in rows[1:]]
    data = np.array([[float(v) for v in r.strip().split(",")[1:]] for r in rows[1:]])
    return head, parts, data


# -- units -------------------------------------------------------------------
def test_unit_conversions_are_the_exact_definitions():
    from moc.io.units import convert
    # Source: 1959 international yard and pound agreement, 1 in = 25.4 mm exactly; 1 ft = 12 in.
    assert convert(1.0, "in", "mm") == pytest.approx(25.4, rel=1e-15)
    assert convert(1.0, "ft", "in") == pytest.approx(12.0, rel=1e-15)
    assert convert(2.5, "m", "mm") == pytest.approx(2500.0, rel=1e-15)
    assert convert(1.0, "inch", "millimetre") == pytest.approx(25.4, rel=1e-15)


@pytest.mark.parametrize("bad", ["kg", "psi", "deg", "", 3])
def test_not_a_length_unit_is_refused(bad):
    from moc.io.units import normalise_unit
    with pytest.raises(ExportError, match="length unit"):
        normalise_unit(bad)


def test_scale_from_saved_throat_and_missing_throat_warns():
    from moc.io.export.context import ExportContext
    from moc.io.units import scale_factor
    res = source_flow_result()
    assert ExportContext(res, "in").scale == pytest.approx(THROAT_MM / 25.4, rel=1e-15)
    assert ExportContext(res).unit == "mm"
    bare = source_flow_result(throat=False)
    ctx = ExportContext(bare, "mm")
    assert ctx.scale == 1.0 and any("no throat size" in n for n in ctx.notes)
    with warnings.catch_warnings(record=True) as w:
        warnings.simplefilter("always")
        assert scale_factor({}, "m") == 1.0
    assert w and "no throat size" in str(w[0].message)


# -- options and registry ------------------------------------------------------
@pytest.mark.parametrize("opts,match", [
    ({"chord_tolerance": 0.0}, "chord-tolerance"),
    ({"chord_tolerance": -1e-3}, "chord-tolerance"),
    ({"chord_tolerance": float("nan")}, "chord-tolerance"),
    ({"segments": 2}, "segments"),
    ({"radial_cells": 3.5}, "whole number"),
    ({"no_such": 1}, "unknown export option"),
    ({"sector_angle": 360.0, "sector_segments": 4}, "45 degrees"),
    ({"sector_angle": 400.0}, "at most 360"),
])
def test_bad_options_are_refused(opts, match):
    from moc.io.export import ExportOptions
    with pytest.raises(ExportError, match=match):
        ExportOptions.from_any(opts)


def test_unknown_format_lists_the_known_ones(tmp_path):
    from moc.io.export import FORMATS, export
    with pytest.raises(ExportError) as exc:
        export(source_flow_result(), ["csv", "iges"], tmp_path)
    for f in FORMATS:
        assert f in str(exc.value)
    assert not any(tmp_path.iterdir())


def test_result_geometry_must_be_known():
    from moc.io.export.context import ExportContext
    res = source_flow_result()
    res.summary["geometry"] = "spherical"
    with pytest.raises(ExportError, match="geometry"):
        ExportContext(res)


def test_bad_wall_is_refused():
    from moc.io.export.context import ExportContext
    res = source_flow_result()
    res.wall["y"] = res.wall["y"].copy()
    res.wall["y"][3] = np.nan
    with pytest.raises(ExportError, match="NaN"):
        ExportContext(res).profile


def test_missing_result_directory_is_a_result_file_error(tmp_path):
    with pytest.raises(ResultFileError):
        Result.load(tmp_path / "nothing")


# -- chord tolerance on a contour of known curvature ---------------------------
@pytest.mark.parametrize("tol_mm", [1e-2, 1e-3, 1e-4])
def test_chord_tolerance_on_circular_inlet_arc(tmp_path, tol_mm):
    """Exported inlet points lie on the arc and every chord's sagitta stays within the tolerance.

    Source: sagitta of a chord subtending dphi on a circle, s = R (1 - cos(dphi/2)) (common geometry).
    """
    from moc.io.export import write
    res = source_flow_result()
    rep = write("csv", tmp_path / "w.csv", res, options={"chord_tolerance": tol_mm}, units="mm")
    head, parts, data = read_csv(tmp_path / "w.csv")
    assert head[:3] == ["part", "x_mm", "r_mm"]
    parts = np.array(parts)
    # the inlet arc, back in throat units, and the junction point (first wall row)
    sel = np.flatnonzero(parts == "inlet")
    sel = np.append(sel, sel[-1] + 1)
    x, y = data[sel, 0] / THROAT_MM, data[sel, 1] / THROAT_MM
    cx, cy = 0.0, 1.0 + RC
    radius = np.hypot(x - cx, y - cy)
    assert np.max(np.abs(radius - RC)) < 1e-7 * RC
    ang = np.arctan2(x - cx, -(y - cy))
    dphi = np.abs(np.diff(ang))
    sag = RC * (1.0 - np.cos(dphi / 2.0)) * THROAT_MM
    assert sag.max() <= tol_mm * (1 + 1e-6)
    # not wastefully fine: at most 15 % more segments than the fewest that meet the tolerance
    fewest = math.ceil(PSI / (2.0 * math.acos(1.0 - tol_mm / (RC * THROAT_MM))))
    assert fewest <= len(dphi) <= math.ceil(1.15 * fewest) + 1
    # curvature column: +1/R on the arc (its centre lies away from the axis, so the wall turns outward)
    k = data[sel[1:-2], 4]
    assert np.allclose(k, 1.0 / (RC * THROAT_MM), rtol=1e-4)
    # the straight cone wall needs only its two end points, with slope tan(alpha)
    wall = np.flatnonzero(parts == "wall")
    assert len(wall) == 2
    assert np.allclose(data[wall, 2], math.tan(ALPHA), rtol=1e-12)
    assert np.allclose(data[wall, 3], 15.0, rtol=1e-12)
    assert "largest chord error" in rep.notes[0]


def test_csv_runs_from_inlet_face_to_exit_with_caution(tmp_path):
    from moc.io.export import write
    res = source_flow_result()
    write("csv", tmp_path / "w.csv", res, units="in")
    text = open(tmp_path / "w.csv", encoding="utf-8").read()
    assert "CAUTION" in text and "licensed engineering" in text
    head, parts, data = read_csv(tmp_path / "w.csv")
    ix, iy = inlet_arc()
    scale = THROAT_MM / 25.4
    assert data[0, 0] == pytest.approx(ix[0] * scale, rel=1e-12)
    assert data[0, 1] == pytest.approx(iy[0] * scale, rel=1e-12)
    assert data[-1, 0] == pytest.approx(res.wall["x"][-1] * scale, rel=1e-12)
    assert data[-1, 1] == pytest.approx(res.wall["y"][-1] * scale, rel=1e-12)
    assert np.all(np.diff(data[:, 0]) > 0)
    # arc-length column is the polyline length
    assert np.allclose(np.diff(data[:, 5]), np.hypot(np.diff(data[:, 0]), np.diff(data[:, 1])), rtol=1e-9)


def test_export_leaves_the_result_unchanged_and_joins_inlet_to_wall(tmp_path):
    """The inlet is cut where the wall begins, without a repeated point; the saved arrays are not modified."""
    from moc.io.export import write
    res = source_flow_result()
    ix, iy = inlet_arc()
    res.inlet = {"x": np.append(ix, 0.05), "y": np.append(iy, 1.01)}  # one inlet point past the throat
    before = {k: v.copy() for k, v in res.inlet.items()}
    write("csv", tmp_path / "w.csv", res, units="mm")
    for k in before:
        assert np.array_equal(res.inlet[k], before[k])
    _, parts, data = read_csv(tmp_path / "w.csv")
    assert np.all(np.diff(data[:, 0]) > 0)
    first_wall = parts.index("wall")
    assert data[first_wall, 0] == 0.0 and data[first_wall, 1] == pytest.approx(THROAT_MM, rel=1e-15)


def test_repeated_wall_points_are_corners(tmp_path):
    """A wall that repeats its corner point (an expansion fan stored at a sharp corner) exports as corners.

    Geometry (common geometry): a 15 degree cone from the throat, then at x = 2 a kink to a 5 degree cone;
    both parts are straight, so the exported points are exactly the three corners and the two ends.
    """
    from moc.io.export import write
    res = source_flow_result(inlet=False)
    t1, t2 = math.radians(15.0), math.radians(5.0)
    xa = np.linspace(0.0, 2.0, 9)
    ya = 1.0 + xa * math.tan(t1)
    xb = np.linspace(2.0, 5.0, 13)
    yb = ya[-1] + (xb - 2.0) * math.tan(t2)
    fan = np.linspace(0.0, t1, 6)   # the fan at the throat corner: one point, six angles
    x = np.concatenate([np.zeros(5), xa, xb])
    y = np.concatenate([np.ones(5), ya, yb])
    th = np.concatenate([fan[:5], np.full(xa.size, t1), np.full(xb.size, t2)])
    res.wall = {"x": x, "y": y, "theta": th}
    write("csv", tmp_path / "w.csv", res, units="mm", options={"chord_tolerance": 1e-6})
    _, parts, data = read_csv(tmp_path / "w.csv")
    assert np.allclose(data[:, 0] / THROAT_MM, [0.0, 2.0, 5.0], atol=1e-12)
    assert np.allclose(data[:, 1] / THROAT_MM, [1.0, ya[-1], yb[-1]], rtol=1e-12)
    assert np.allclose(data[:, 3], [15.0, 5.0, 5.0], rtol=1e-9)  # angle on the downstream side of each corner

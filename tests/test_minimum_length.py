"""Minimum-length nozzle designer: checks against published facts and exact invariants."""

import math

import numpy as np
import pytest

from moc.design import design_minimum_length
from moc.errors import GammaError, InputError, MachError
from moc.flow import area_ratio, prandtl_meyer
from moc.result import Net, Result


@pytest.fixture(scope="module")
def planar24():
    return design_minimum_length(2.4, 1.4, "planar", 100)


@pytest.fixture(scope="module")
def axi3():
    return design_minimum_length(3.0, 1.4, "axisymmetric", 100)


@pytest.mark.parametrize("me", [2.0, 2.4, 3.0, 4.0])
def test_planar_corner_angle_is_half_prandtl_meyer(me):
    # Source: Anderson, Modern Compressible Flow, nozzle design by the method of
    # characteristics (from memory): planar minimum-length corner angle = nu(Me)/2;
    # values 13.1899, 18.3733, 24.8787, 32.8924 deg listed in VALIDATION.md.
    r = design_minimum_length(me, 1.4, "planar", 12)
    expected = {2.0: 13.1899, 2.4: 18.3733, 3.0: 24.8787, 4.0: 32.8924}[me]
    assert r.summary["corner_angle_deg"] == pytest.approx(expected, abs=1e-4)
    assert r.summary["max_wall_angle_deg"] == pytest.approx(expected, abs=1e-4)


def test_planar_acceptance_numbers(planar24):
    s = planar24.summary
    # Source: nu(2.4)/2 = 36.7465/2 deg (NACA Report 1135, Prandtl-Meyer function).
    assert abs(s["max_wall_angle_deg"] - 36.7465 / 2) < 1e-3
    # Source: NACA Report 1135, A/A*(2.4) = 2.40310 (isentropic area relation).
    assert abs(s["area_ratio"] / 2.4031 - 1) < 2e-4
    assert abs(s["area_ratio_streamline"] / 2.4031 - 1) < 2e-4
    assert s["mass_flow_error"] < 1e-4
    assert s["wall_streamline_difference"] < 2e-4


def test_axisymmetric_acceptance_numbers(axi3):
    s = axi3.summary
    # Source: NACA Report 1135, A/A*(3) = 4.23457 (isentropic area relation).
    assert abs(s["area_ratio"] / 4.2346 - 1) < 1e-3
    assert abs(s["area_ratio_streamline"] / 4.2346 - 1) < 1e-3
    assert s["exit_mach_max_dev"] < 2e-3
    assert s["mass_flow_error"] < 5e-4
    assert s["wall_streamline_difference"] < 5e-4
    # Source: fact of the trade (Argrow and Emanuel, J. Fluids Eng. 110(3), 1988,
    # from memory): the axisymmetric corner angle lies below the planar nu(Me)/2.
    assert s["corner_angle_deg"] < 49.7573 / 2
    assert s["max_wall_angle_deg"] < 24.88


def test_axisymmetric_shorter_than_planar():
    # Source: fact of the trade (Argrow and Emanuel 1988, from memory): for the same
    # Me the axisymmetric minimum-length nozzle is shorter than the planar one.
    for me in (2.0, 3.0):
        a = design_minimum_length(me, 1.4, "axisymmetric", 30).summary
        p = design_minimum_length(me, 1.4, "planar", 30).summary
        assert a["length"] < p["length"]
        assert a["corner_angle_deg"] < p["corner_angle_deg"]


def test_axis_reaches_exit_mach_at_kernel_end(axi3):
    # Exact invariant of the design: the centreline Mach number rises monotonically
    # from 1 at the throat to Me where the kernel ends and stays Me downstream.
    ax = axi3.axis
    assert ax["mach"][0] == 1.0
    assert np.all(np.diff(ax["mach"]) >= -1e-12)
    assert ax["mach"][-2] == pytest.approx(3.0, abs=1e-9)


def test_result_contract(axi3):
    r = axi3
    assert isinstance(r, Result) and isinstance(r.net, Net)
    assert r.kind == "design"
    assert r.inputs == {"method": "minimum_length", "exit_mach": 3.0, "gamma": 1.4,
                        "geometry": "axisymmetric", "characteristics": 100}
    for key in ("geometry", "gamma", "exit_mach", "exit_mach_max_dev", "area_ratio",
                "area_ratio_isentropic", "length", "max_wall_angle_deg", "corner_angle_deg",
                "characteristics", "points", "mass_flow_error", "wall_streamline_difference"):
        assert key in r.summary
    w = r.wall
    assert w["x"][0] == 0.0 and w["y"][0] == 1.0
    assert np.all(np.diff(w["x"]) > 0)
    assert r.summary["length"] == w["x"][-1]
    # Source: NACA Report 1135 isentropic relations: p/p0 at the wall from its Mach number.
    g = 1.4
    assert np.allclose(w["p_p0"], (1 + 0.5 * (g - 1) * w["mach"] ** 2) ** (-g / (g - 1)))
    assert r.net.size == r.summary["points"]
    assert np.all(r.net.p0_ratio == 1.0)
    # cells counter-clockwise (positive shoelace area), common practice for meshes
    px, py = r.net.x[r.net.cells], r.net.y[r.net.cells]
    area = 0.5 * np.sum(px * np.roll(py, -1, 1) - np.roll(px, -1, 1) * py, axis=1)
    assert np.all(area > 0)
    assert r.summary["area_ratio_isentropic"] == pytest.approx(area_ratio(3.0, 1.4), rel=1e-14)
    # exact invariant: the cells tile the flow region bounded by the first fan ray, the
    # wall, the exit characteristic and the axis (shoelace areas agree to round-off)
    ax0 = r.axis["x"][1]
    poly_x = np.concatenate([w["x"], [r.exit["x"][0], ax0]])
    poly_y = np.concatenate([w["y"], [0.0, 0.0]])
    poly = 0.5 * abs(np.sum(poly_x * np.roll(poly_y, -1) - np.roll(poly_x, -1) * poly_y))
    assert area.sum() == pytest.approx(poly, rel=1e-10)


@pytest.mark.parametrize(
    "kwargs, err",
    [
        ({"exit_mach": 1.0}, MachError),
        ({"exit_mach": 0.7}, MachError),
        ({"exit_mach": float("nan")}, MachError),
        ({"exit_mach": "fast"}, MachError),
        ({"exit_mach": 2.0, "gamma": 0.9}, GammaError),
        ({"exit_mach": 2.0, "geometry": "conical"}, InputError),
        ({"exit_mach": 2.0, "n": 2}, InputError),
        ({"exit_mach": 2.0, "n": 10.5}, InputError),
        # nu(18)/2 = 94 deg for gamma = 1.1: a sharp corner cannot turn the wall past 90 deg
        ({"exit_mach": 18.0, "gamma": 1.1, "geometry": "planar"}, MachError),
        # exit Mach angle below 3 deg (Me above 1/sin 3 deg = 19.107): degenerate net
        ({"exit_mach": 60.0, "geometry": "planar"}, MachError),
        ({"exit_mach": 19.2}, MachError),
    ],
)
def test_bad_input(kwargs, err):
    with pytest.raises(err) as e:
        design_minimum_length(**kwargs)
    assert str(e.value).endswith(".")


def test_gas_object_accepted():
    # moc.gas.PerfectGas carries gamma (common practice: one gas object through the tool)
    from moc.gas import PerfectGas

    a = design_minimum_length(2.0, PerfectGas(1.3), "planar", 10).summary
    b = design_minimum_length(2.0, 1.3, "planar", 10).summary
    assert a["gamma"] == 1.3 and a["length"] == b["length"]
    # Source: nu(2) = 28.6809 deg for gamma = 1.3 (VALIDATION.md, closed form)
    assert a["corner_angle_deg"] == pytest.approx(28.6809 / 2, abs=1e-4)


def test_turning_limit_is_stated():
    # the limit follows from nu(Me)/2 < 90 deg (common practice statement of the corner limit)
    g = 1.1
    with pytest.raises(MachError, match="90 deg"):
        design_minimum_length(18.0, g, "planar")
    assert math.degrees(prandtl_meyer(18.0, g)) / 2 > 90
    with pytest.raises(MachError, match="Mach angle"):
        design_minimum_length(19.2, 1.4, "planar")
    r = design_minimum_length(19.0, 1.4, "axisymmetric", 80)  # just inside the stated limit
    # Source: NACA Report 1135 A/A*(Me) (mass conservation)
    assert abs(r.summary["area_ratio"] / area_ratio(19.0, 1.4) - 1) < 1e-9
    assert r.summary["mass_flow_error"] < 0.02


def _observed_order(ns, errors):
    """Least-squares slope of log(error) against log(n) (common practice)."""
    return -np.polyfit(np.log(ns), np.log(np.abs(errors)), 1)[0]


NS = np.array([25, 50, 100, 200])


@pytest.mark.parametrize("me, g", [(2.4, 1.4), (3.0, 1.2), (4.0, 1.4)])
def test_planar_convergence_to_isentropic_area_ratio(me, g):
    # Source: NACA Report 1135 isentropic area relation A/A*(Me): a shock-free nozzle with
    # uniform exit flow has exactly this area ratio (mass conservation).  The mass-balance
    # lip sits on the uniform exit characteristic, so it is exact to round-off; the
    # streamline-traced wall and the mass flux across the kernel characteristics carry
    # the discretisation error, which must fall at second order.
    res = [design_minimum_length(me, g, "planar", int(n)).summary for n in NS]
    ar = area_ratio(me, g)
    for s in res:
        assert abs(s["area_ratio"] / ar - 1) < 1e-10
    e_ar = [s["area_ratio_streamline"] / ar - 1 for s in res]
    e_m = [s["mass_flow_error"] for s in res]
    assert _observed_order(NS, e_ar) >= 1.8, e_ar
    assert _observed_order(NS, e_m) >= 1.8, e_m
    assert np.all(np.abs(np.diff(np.log2(np.abs(e_ar)))) > 1.8)  # every halving, not just the fit


@pytest.mark.parametrize("me, g", [(2.4, 1.4), (3.0, 1.2), (4.0, 1.4)])
def test_axisymmetric_convergence(me, g):
    # Source: NACA Report 1135 A/A*(Me) (mass conservation, as above).  With the fan
    # clustered toward the sonic end (docs/minimum-length.md) the axisymmetric design
    # converges at second order too: streamline-traced lip, mass balance across the
    # characteristics and the gap between the two walls.
    res = [design_minimum_length(me, g, "axisymmetric", int(n)).summary for n in NS]
    ar = area_ratio(me, g)
    for s in res:
        assert abs(s["area_ratio"] / ar - 1) < 1e-9
        assert s["exit_mach_max_dev"] < 1e-9
    e_ar = np.array([s["area_ratio_streamline"] / ar - 1 for s in res])
    e_m = [s["mass_flow_error"] for s in res]
    e_w = [s["wall_streamline_difference"] for s in res]
    assert _observed_order(NS, e_ar) >= 1.8, e_ar
    assert np.all(np.abs(np.diff(np.log2(np.abs(e_ar)))) > 1.5), e_ar
    assert _observed_order(NS, e_m) >= 1.8, e_m
    assert _observed_order(NS, e_w) >= 1.8, e_w
    # the corner angle converges too (secant on the kernel at each n)
    tc = np.array([s["corner_angle_deg"] for s in res])
    d = np.abs(np.diff(tc))
    assert d[-1] < d[0] / 8


@pytest.mark.parametrize("me, geometry, n", [(1.5, "planar", 5), (4.0, "planar", 25), (6.0, "axisymmetric", 12),
                                             (2.4, "planar", 100), (4.0, "axisymmetric", 50)])
def test_cells_tile_the_flow_region(me, geometry, n):
    # exact invariant (common practice for a mesh): positive cell areas that sum to the area
    # of the region bounded by the first fan ray, the wall, the exit characteristic and the axis
    r = design_minimum_length(me, 1.4, geometry, n)
    px, py = r.net.x[r.net.cells], r.net.y[r.net.cells]
    area = 0.5 * np.sum(px * np.roll(py, -1, 1) - np.roll(px, -1, 1) * py, axis=1)
    assert np.all(area > 0)
    w = r.wall
    poly_x = np.concatenate([w["x"], [r.exit["x"][0], r.axis["x"][1]]])
    poly_y = np.concatenate([w["y"], [0.0, 0.0]])
    poly = 0.5 * abs(np.sum(poly_x * np.roll(poly_y, -1) - np.roll(poly_x, -1) * poly_y))
    assert area.sum() == pytest.approx(poly, rel=1e-10)
    # every point is used by some cell, and labels are consistent with the grid
    assert np.unique(r.net.cells).size == r.net.size


def test_planar_turning_region_is_a_simple_wave():
    # Source: Anderson, Modern Compressible Flow, planar minimum-length nozzle (from memory):
    # between the last fan ray and the exit characteristic the planar flow is a simple wave,
    # each C+ a straight line of constant theta and M.  The Goursat solver (the same code as
    # for axisymmetric flow) must reproduce it to round-off.
    n = 30
    r = design_minimum_length(2.4, 1.4, "planar", n)
    net = r.net
    nj = 2 * n + 3  # grid C- labels: n fan rays, then n + 3 turning-region lines
    for i in range(n):
        sel = (net.cplus == i) & (net.cminus >= n - 1) & (net.cminus < nj)
        if np.count_nonzero(sel) < 2:
            continue
        th, m = net.theta[sel], net.mach[sel]
        assert np.ptp(th) < 1e-12 and np.ptp(m) < 1e-10
        x, y = net.x[sel], net.y[sel]
        ang = np.arctan2(np.diff(y), np.diff(x))
        assert np.ptp(ang) < 1e-9
    # and the axisymmetric turning region is not a simple wave (theta varies along a C+)
    a = design_minimum_length(2.4, 1.4, "axisymmetric", n).net
    sel = (a.cplus == n // 2) & (a.cminus >= n - 1) & (a.cminus < nj)
    assert np.ptp(a.theta[sel]) > 1e-4

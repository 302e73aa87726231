"""Gradual-expansion designer (rounded throat, arc, straightening section)."""

import math

import numpy as np
import pytest

from moc.design import design_minimum_length
from moc.design.gradual import design_gradual, max_inflection_deg
from moc.errors import InputError
from moc.flow import area_ratio, prandtl_meyer


@pytest.fixture(scope="module")
def planar_series():
    return {n: design_gradual(2.4, 1.4, "planar", n, 2.0, inflection_deg=14.0) for n in (21, 41, 81)}


def test_exit_area_ratio_converges_to_isentropic(planar_series):
    # Source: mass conservation, the exit of a shock-free uniform nozzle has A_e/A* = A/A*(Me)
    # (NACA Report 1135 closed form; VALIDATION.md "Minimum-length nozzle facts"), A* being the
    # sonic area Cd A_t of the mass the throat solution carries.  Two walls: mass balance
    # (area_ratio_sonic) and the streamline traced from the attachment point.
    ai = area_ratio(2.4, 1.4)
    s = {n: r.summary for n, r in planar_series.items()}
    assert abs(s[81]["area_ratio_sonic"] / ai - 1.0) < 2e-4
    es = {n: abs(s[n]["area_ratio_streamline"] / s[n]["discharge_coefficient"] / ai - 1.0) for n in s}
    assert es[21] > es[41] > es[81]
    assert math.log2(es[41] / es[81]) > 0.8     # measured: 1.1 (41 -> 81), 1.1 (81 -> 161)
    assert es[81] < 1e-4
    assert s[81]["area_ratio"] == pytest.approx(s[81]["area_ratio_sonic"] * s[81]["discharge_coefficient"], rel=1e-12)
    assert s[81]["wall_streamline_difference"] < 3e-4


def test_planar_riemann_invariant_and_wall_angles(planar_series):
    # Exact invariant (planar homentropic flow): theta + nu is constant along a C-
    # characteristic (Anderson, Modern Compressible Flow, MOC chapter; from memory), so on
    # the interpolated C- from the attachment point to the axis it equals nu(Me).
    from moc.design import gradual

    d = gradual._design(2.4, 1.4, 0, 41, 2.0, math.radians(14.0), "sauer", prandtl_meyer(2.4, 1.4))
    inv = d["ae"].theta[1:] + d["ae"].nu[1:]
    assert np.max(np.abs(inv - prandtl_meyer(2.4, 1.4))) < 1e-10
    r = planar_series[41]
    assert r.summary["max_wall_angle_deg"] == pytest.approx(14.0, abs=1e-9)
    assert abs(r.wall["theta"][-1]) < 1e-9          # the lip is parallel to the axis
    assert np.all(np.diff(r.wall["x"]) > 0)


def test_longer_than_minimum_length(planar_series):
    # Source: the minimum-length nozzle is the shortest shock-free nozzle for a given Me
    # (Anderson, Modern Compressible Flow, nozzle design by MOC; from memory).
    mln = design_minimum_length(2.4, 1.4, "planar", 41).summary["length"]
    assert planar_series[41].summary["length"] > mln
    assert planar_series[41].summary["straight_length"] > 0.0


def test_small_throat_radius_approaches_minimum_length():
    # Source: as the throat radius of curvature goes to zero and the inflection angle to its
    # largest value, the rounded throat becomes the sharp corner of the minimum-length nozzle
    # (Zucrow and Hoffman, Gas Dynamics vol. 2, from memory); planar: the angle tends to nu(Me)/2.
    me, n = 3.0, 41
    mln = design_minimum_length(me, 1.4, "planar", n).summary["length"]
    gaps, angles = [], []
    for R in (8.0, 4.0, 2.0):
        t = max_inflection_deg(me, 1.4, "planar", n, R, tol_deg=0.1)   # a feasible angle within 0.1 deg
        r = design_gradual(me, 1.4, "planar", n, R, inflection_deg=t)
        gaps.append(r.summary["length"] - mln)
        angles.append(t)
    assert all(gp > 0 for gp in gaps)
    assert gaps[0] > gaps[1] > gaps[2]
    assert gaps[2] < 0.45 * gaps[0]           # measured: 6.00, 3.69, 2.14 (about R^0.75)
    half = math.degrees(prandtl_meyer(me, 1.4)) / 2
    assert angles[0] < angles[1] < angles[2] <= half + 1e-9


def test_target_length_solves_for_the_angle():
    ref = design_gradual(2.4, 1.4, "planar", 21, 2.0, inflection_deg=12.0)
    r = design_gradual(2.4, 1.4, "planar", 21, 2.0, length=ref.summary["length"])
    assert r.summary["inflection_angle_deg"] == pytest.approx(12.0, abs=0.05)
    assert r.summary["length"] == pytest.approx(ref.summary["length"], rel=1e-4)


def test_bad_inputs():
    with pytest.raises(InputError, match=r"nu\(Me\)/2 = 18.37"):
        design_gradual(2.4, 1.4, "planar", 21, 2.0, inflection_deg=19.0)
    with pytest.raises(InputError, match="allowed is 1 <= R <= 100"):
        design_gradual(2.4, 1.4, "planar", 21, 0.5, inflection_deg=10.0)
    with pytest.raises(InputError, match="0 < inflection"):
        design_gradual(2.4, 1.4, "planar", 21, 2.0, inflection_deg=0.0)
    with pytest.raises(InputError, match="discharge coefficient only"):
        design_gradual(2.4, 1.4, "planar", 21, 2.0, inflection_deg=10.0, throat_solution="kliegel-levine")
    with pytest.raises(InputError, match="exactly one of"):
        design_gradual(2.4, 1.4, "planar", 21, 2.0, inflection_deg=10.0, length=20.0)
    with pytest.raises(InputError, match=r"too large .* allowed is 0 < inflection <= \d+\.\d\d\d deg"):
        design_gradual(3.0, 1.4, "planar", 21, 8.0, inflection_deg=24.0)


@pytest.fixture(scope="module")
def axi_series():
    return {n: design_gradual(3.0, 1.4, "axisymmetric", n, 2.0, inflection_deg=12.0) for n in (41, 81, 100)}


def test_axisymmetric_rounded_throat_nozzle(axi_series):
    # Source: A/A*(Me = 3) = 4.23457 (NACA Report 1135 closed form, VALIDATION.md); the exit
    # of a shock-free uniform nozzle has A_e / A* equal to it, A* = Cd A_t being the sonic
    # area of the mass flow the throat solution carries (mass conservation).
    s = axi_series[100].summary
    assert s["area_ratio_sonic"] == pytest.approx(4.23457, rel=1e-3)
    assert s["exit_mach_max_dev"] < 2e-3
    assert s["wall_streamline_difference"] < 1e-3
    # Source: the minimum-length nozzle is the shortest (Anderson, from memory).
    assert s["length"] > design_minimum_length(3.0, 1.4, "axisymmetric", 50).summary["length"]
    assert s["max_wall_angle_deg"] == pytest.approx(12.0, abs=1e-9)
    # the geometric ratio carries the throat's discharge coefficient
    assert s["area_ratio"] == pytest.approx(s["area_ratio_sonic"] * s["discharge_coefficient"], rel=1e-12)
    assert 0.99 < s["discharge_coefficient"] < 1.0


def test_axisymmetric_area_ratio_converges(axi_series):
    # Source: as above; observed order of the area-ratio error between n = 41 and 81.
    ai = area_ratio(3.0, 1.4)
    e41 = abs(axi_series[41].summary["area_ratio_sonic"] / ai - 1)
    e81 = abs(axi_series[81].summary["area_ratio_sonic"] / ai - 1)
    assert e81 < e41
    assert math.log(e41 / e81) / math.log(81 / 41) > 1.2      # measured: about 1.8

"""Truncation of designed contours and the cost it reports (moc.design.truncate)."""


import numpy as np
import pytest

from moc.design import design_minimum_length
from moc.design.gradual import design_gradual
from moc.design.truncate import truncate
from moc.errors import InputError
from moc.flow import pressure_ratio


@pytest.fixture(scope="module")
def designs():
    return {
        "mln_axi": design_minimum_length(2.4, 1.4, "axisymmetric", 50),
        "mln_planar": design_minimum_length(2.4, 1.4, "planar", 50),
        "gradual_planar": design_gradual(2.4, 1.4, "planar", 41, 2.0, inflection_deg=14.0),
    }


def _removed_wall_force(r, x_cut):
    """Axial pressure force on the wall downstream of x_cut, over p0 A_t (trapezoid in y^(1+d))."""
    d = 1 if r.summary["geometry"] == "axisymmetric" else 0
    x, y, m = r.wall["x"], r.wall["y"], r.wall["mach"]
    k = x > x_cut
    xs = np.concatenate([[x_cut], x[k]])
    ys = np.concatenate([[np.interp(x_cut, x, y)], y[k]])
    ms = np.concatenate([[np.interp(x_cut, x, m)], m[k]])
    p = pressure_ratio(ms, r.summary["gamma"])
    a = ys ** (1 + d)
    return float(np.sum(0.5 * (p[1:] + p[:-1]) * np.diff(a)))


@pytest.mark.parametrize("name", ["mln_axi", "mln_planar", "gradual_planar"])
@pytest.mark.parametrize("fraction", [0.85, 0.6])
def test_truncated_thrust_and_momentum_balance(designs, name, fraction):
    # Exact invariant (momentum conservation, common practice of control-volume analysis):
    # full thrust = truncated thrust across the exit plane + the axial pressure force on the
    # removed wall; hence a truncated ideal nozzle gives less vacuum thrust
    # (Hoffman, J. Propulsion 3(2), 1987, truncated ideal nozzles; from memory).
    r = designs[name]
    t = truncate(r, length_fraction=fraction)
    s = t.summary
    assert s["truncation_thrust_coefficient_vacuum"] < s["truncation_thrust_coefficient_vacuum_full"]
    balance = s["truncation_thrust_coefficient_vacuum"] + _removed_wall_force(r, s["truncation_x"])
    assert balance == pytest.approx(s["truncation_thrust_coefficient_vacuum_full"], abs=1.5e-3)
    # mass conservation across the interpolated exit plane
    cd = r.summary.get("discharge_coefficient", 1.0)
    assert s["truncation_exit_mass_flow_ratio"] == pytest.approx(cd, abs=1.5e-3)
    assert s["length_lost"] == pytest.approx(r.summary["length"] * (1 - fraction), rel=1e-12)
    assert np.all(t.net.x <= s["truncation_x"] + 1e-12)
    assert t.net.cells.size == 0 or t.net.cells.max() < t.net.size


def test_shorter_cut_costs_more(designs):
    r = designs["mln_axi"]
    lost = [truncate(r, length_fraction=f).summary["truncation_thrust_coefficient_lost"] for f in (0.9, 0.7, 0.5)]
    assert 0 < lost[0] < lost[1] < lost[2]


def test_cut_at_the_exit_changes_nothing(designs):
    # Exact invariant: the exit plane at the lip lies in the uniform region, so its thrust
    # equals the one across the exit characteristic.
    r = designs["mln_planar"]
    s = truncate(r, length_fraction=1.0).summary
    assert s["truncation_thrust_coefficient_lost"] == pytest.approx(0.0, abs=1e-9)


def test_area_ratio_and_angle_criteria(designs):
    r = designs["mln_axi"]
    t = truncate(r, area_ratio=2.0)
    assert t.summary["area_ratio"] == pytest.approx(2.0, rel=1e-3)
    t = truncate(r, exit_wall_angle_deg=5.0)
    assert t.summary["exit_wall_angle_deg"] == pytest.approx(5.0, abs=0.3)


def test_beyond_the_contour(designs):
    r = designs["mln_axi"]
    with pytest.raises(InputError, match="allowed is .* < fraction <= 1"):
        truncate(r, length_fraction=1.2)
    with pytest.raises(InputError, match="area ratio <= 2.403"):
        truncate(r, area_ratio=3.0)
    with pytest.raises(InputError, match="straightening section"):
        truncate(r, exit_wall_angle_deg=40.0)
    with pytest.raises(InputError, match="exactly one"):
        truncate(r, length_fraction=0.5, area_ratio=2.0)

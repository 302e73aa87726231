"""Thrust coefficient, discharge and divergence figures (moc.performance)."""

import math

import numpy as np
import pytest

from moc.design import design_minimum_length
from moc.errors import InputError
from moc.flow import area_ratio, pressure_ratio
from moc.performance import exit_fluxes, ideal_thrust_coefficient, performance, wetted_area


@pytest.mark.parametrize("g,matched,vacuum", [(1.2, 1.6169, 1.7423), (1.4, 1.5739, 1.6469)])
def test_ideal_thrust_coefficient_eps10(g, matched, vacuum):
    # Source: Sutton and Biblarz, Rocket Propulsion Elements, ideal-rocket chapter
    # (VALIDATION.md values, 4 digits).
    from moc.flow import mach_from_area_ratio

    pe = pressure_ratio(mach_from_area_ratio(10.0, g), g)
    assert ideal_thrust_coefficient(10.0, g, ambient_ratio=pe) == pytest.approx(matched, abs=6e-5)
    assert ideal_thrust_coefficient(10.0, g) == pytest.approx(vacuum, abs=6e-5)


def test_ideal_thrust_coefficient_infinite_expansion():
    # Source: Sutton and Biblarz: eps -> infinity, g = 1.4 gives 1.8116 (VALIDATION.md).
    assert ideal_thrust_coefficient(1e12, 1.4) == pytest.approx(1.8116, abs=1e-4)


def _cap(alpha, mach, g, geometry, n=801):
    """Exit surface of an ideal source-flow cone/wedge of half-angle alpha: a circular arc
    about the apex, uniform Mach number, radial flow; sized so that it carries the
    throat's one-dimensional sonic mass flow."""
    d = 1 if geometry == "axisymmetric" else 0
    ar = area_ratio(mach, g)
    # flow area of the arc of radius rho: 2 pi rho^2 (1 - cos a) (cap) or rho a (planar)
    rho = math.sqrt(ar / (2 * (1 - math.cos(alpha)))) if d else ar / alpha
    phi = np.linspace(0.0, alpha, n)
    x = rho * np.cos(phi)
    y = rho * np.sin(phi)
    return x, y, phi, np.full(n, mach)


@pytest.mark.parametrize("geometry,alpha_deg,lam", [
    ("axisymmetric", 10, 0.99240), ("axisymmetric", 15, 0.98296), ("axisymmetric", 20, 0.96985),
    ("planar", 15, 0.98862)])
def test_divergence_factor_of_source_flow(geometry, alpha_deg, lam):
    # Source: F. J. Malina, J. Franklin Inst. 230 (1940); Sutton and Biblarz:
    # lambda = (1 + cos a)/2 for a cone, sin(a)/a for a planar wedge (VALIDATION.md values).
    g, me = 1.4, 3.0
    x, y, th, m = _cap(math.radians(alpha_deg), me, g, geometry)
    fl = exit_fluxes(x, y, th, m, g, geometry)
    assert fl["mass"] == pytest.approx(1.0, rel=1e-5)           # sized for the throat flow
    pe = pressure_ratio(me, g)
    ideal_momentum = g * me * me * pe * area_ratio(me, g)       # mdot V / (p0 A_t), 1-D
    assert fl["momentum"] / ideal_momentum == pytest.approx(lam, abs=6e-5)
    assert fl["pressure"] == pytest.approx(pe * fl["area"], rel=1e-9)


@pytest.mark.parametrize("geometry", ["planar", "axisymmetric"])
def test_minimum_length_thrust_matches_ideal(geometry):
    # Source: Sutton and Biblarz ideal C_F; a shock-free uniform-exit nozzle reaches it.
    # Checked (1) across the exit characteristic and (2), independently of the uniform
    # exit, across an interior C+ characteristic of the net (non-uniform flow) plus the
    # wall pressure force downstream of it (momentum conservation, exact invariant).
    g, me = 1.4, 2.4
    r = design_minimum_length(me, g, geometry, 50)
    ideal = ideal_thrust_coefficient(area_ratio(me, g), g)
    p = performance(r)
    assert p["thrust_coefficient_vacuum"] == pytest.approx(ideal, abs=1e-3)
    assert p["divergence_efficiency"] == pytest.approx(1.0, abs=1e-3)
    d = 1 if geometry == "axisymmetric" else 0
    wall_x, wall_y, wall_m = r.wall["x"], r.wall["y"], r.wall["mach"]
    for label in (10, 25):
        idx = r.net.line("+", label)
        x, y, th, m = r.net.x[idx], r.net.y[idx], r.net.theta[idx], r.net.mach[idx]
        fl = exit_fluxes(x, y, th, m, g, geometry)
        k = int(np.argmin(np.hypot(wall_x - x[-1], wall_y - y[-1])))
        assert math.hypot(wall_x[k] - x[-1], wall_y[k] - y[-1]) < 1e-12
        pw = pressure_ratio(wall_m[k:], g)
        aw = wall_y[k:] ** (1 + d)
        wall_force = float(np.sum(0.5 * (pw[1:] + pw[:-1]) * np.diff(aw)))
        assert fl["momentum"] + fl["pressure"] + wall_force == pytest.approx(ideal, abs=1e-3)


def test_ambient_pressure_and_bad_ratio():
    # Source: Sutton and Biblarz: C_F = C_F,vac - (pa/p0) A_e/A_t.
    r = design_minimum_length(2.0, 1.4, "axisymmetric", 20)
    pv = performance(r)
    pa = performance(r, ambient_ratio=0.05)
    assert pa["thrust_coefficient"] == pytest.approx(pv["thrust_coefficient_vacuum"] - 0.05 * pv["exit_area_ratio"])
    assert pa["thrust_coefficient_ideal_1d_ambient"] == pytest.approx(
        ideal_thrust_coefficient(area_ratio(2.0, 1.4), 1.4, 0.05), rel=1e-6)
    with pytest.raises(InputError, match="0 <= pa/p0 < 1"):
        performance(r, ambient_ratio=1.2)
    with pytest.raises(InputError, match="start on the axis"):
        exit_fluxes([0, 1], [0.5, 1.0], [0, 0], [2, 2], 1.4, "planar")


def test_wetted_area_of_a_cone_frustum():
    # Source: lateral area of a frustum pi (r1 + r2) s (elementary geometry, common practice).
    x = np.linspace(0.0, 3.0, 11)
    y = 1.0 + x * math.tan(math.radians(15))
    s = math.hypot(3.0, y[-1] - 1.0)
    assert wetted_area(x, y, "axisymmetric") == pytest.approx(math.pi * (1 + y[-1]) * s, rel=1e-12)
    assert wetted_area(x, y, "planar") == pytest.approx(2 * s, rel=1e-12)


def test_rounded_throat_nozzle_thrust():
    # Source: Sutton and Biblarz ideal C_F; a shock-free uniform-exit nozzle whose throat passes
    # Cd times the one-dimensional mass flow gives C_F = Cd C_F,ideal(Me) (mass and momentum of
    # the uniform exit), so its divergence efficiency is 1.
    from moc.design.gradual import design_gradual

    r = design_gradual(2.4, 1.4, "planar", 41, 2.0, inflection_deg=14.0)
    p = performance(r)
    cd = r.summary["discharge_coefficient"]
    assert p["thrust_coefficient_vacuum"] == pytest.approx(cd * ideal_thrust_coefficient(area_ratio(2.4, 1.4), 1.4),
                                                           rel=1e-3)
    assert p["divergence_efficiency"] == pytest.approx(1.0, abs=1e-6)
    assert p["exit_mass_flow_ratio"] == pytest.approx(cd, rel=1e-3)

"""Shock fitting and coalescence checked against oblique-shock and simple-wave theory."""

import math

import numpy as np
import pytest

from moc.analysis.analyze import analyze
from moc.analysis.contour import Wall
from moc.flow import mach_angle, mach_from_prandtl_meyer, prandtl_meyer, shock_angle


def ramp(angle_deg, height=1.0, length=4.0, n=200):
    """Straight wall turning by angle_deg (negative: into the flow) at x = 0, height 1 above the centre line."""
    x = np.linspace(0.0, length, n)
    s = math.tan(math.radians(angle_deg))
    return Wall(x, height + s * x, np.full_like(x, s))


def concave_arc(radius, turn, height, length, n=3000):
    """Flat-start concave circular arc of `radius` turning the wall by `turn` (rad) toward the axis, then straight."""
    x = np.linspace(0.0, length, n)
    xa = radius * math.sin(turn)
    inside = x < xa
    y = np.where(inside, height - (radius - np.sqrt(np.maximum(radius**2 - x**2, 0.0))), 0.0)
    ya = height - radius * (1.0 - math.cos(turn))
    y = np.where(inside, y, ya - (x - xa) * math.tan(turn))
    s = np.where(inside, -x / np.sqrt(np.maximum(radius**2 - x**2, 1e-300)), -math.tan(turn))
    return Wall(x, y, s)


def test_compression_corner_matches_weak_oblique_shock():
    # Source: NACA Report 1135 (Ames Research Staff, 1953), theta-beta-M relation and oblique-shock table:
    # M1 = 2, theta = 10 deg: beta = 39.314 deg (weak), M2 = 1.6405, p2/p1 = 1.7066.
    r = analyze(ramp(-10.0), gamma=1.4, geometry="planar", n=30, start="uniform", mach_in=2.0)
    s = r.summary
    assert s["shock_free"] is False
    sh = r.shocks[0]
    assert np.max(np.abs(np.degrees(sh["beta"]) - 39.314)) < 0.05
    assert np.allclose(sh["m2"], 1.6405, atol=2e-4)
    assert np.allclose(sh["p2_p1"], 1.7066, atol=2e-4)
    # the shock leaves the corner straight and meets the centre line at x = h / tan(beta) (geometry)
    assert s["shocks"][0]["fate"] == "reflects_axis"
    assert s["shocks"][0]["end_x"] == pytest.approx(1.0 / math.tan(math.radians(39.314)), rel=2e-3)
    # downstream of the shock the flow is the uniform oblique-shock state, parallel to the wall
    p02 = 0.98464  # p02/p01 behind the first shock (NACA Report 1135 oblique-shock relations, closed form)
    behind = np.abs(r.net.p0_ratio - p02) < 1e-4
    assert np.count_nonzero(behind) > 20
    assert np.allclose(r.net.mach[behind], 1.6405, atol=5e-4)
    assert np.allclose(np.degrees(r.net.theta[behind]), -10.0, atol=1e-6)


def test_regular_reflection_from_the_centre_line():
    # Source: NACA Report 1135 theta-beta-M relation (regular reflection = two weak oblique shocks, the second
    # turning the flow back parallel to the centre line), evaluated with moc.flow, which is checked against the
    # report's tables in tests/test_relations.py.  M1 = 2, 10 deg ramp, height 1 above the centre line.
    from moc.flow import oblique_shock

    r = analyze(ramp(-10.0, length=6.0), 1.4, "planar", n=30, start="uniform", mach_in=2.0)
    s = r.summary
    assert len(s["shocks"]) == 2
    first, second = s["shocks"]
    s1 = oblique_shock(2.0, math.radians(10.0), 1.4)
    s2 = oblique_shock(float(s1.m2), math.radians(10.0), 1.4)
    assert second["family"] == "C+" and second["reflected_from"] == 1
    assert second["start_x"] == pytest.approx(first["end_x"]) and second["start_y"] == 0.0
    sh = r.shocks[1]
    assert np.max(np.abs(sh["beta"] - float(s2.beta))) < math.radians(0.05)
    assert np.allclose(sh["m2"], float(s2.m2), atol=1e-4)
    assert second["max_pressure_ratio"] == pytest.approx(float(s2.p2_p1), rel=1e-4)
    # geometry: the straight reflected shock, inclined at beta2 - 10 deg, meets the wall y = 1 - x tan(10 deg)
    k = math.tan(float(s2.beta) - math.radians(10.0))
    xw = (1.0 + first["end_x"] * k) / (k + math.tan(math.radians(10.0)))
    assert second["end_x"] == pytest.approx(xw, rel=1e-3)
    # behind it the flow is parallel to the centre line again, and total pressure is the product of both jumps
    third = np.abs(r.net.p0_ratio - s1.p02_p01 * s2.p02_p01) < 1e-6
    assert np.count_nonzero(third) > 10
    assert np.allclose(r.net.theta[third], 0.0, atol=1e-8)
    # at the wall no regular reflection exists (M3 = 1.285 cannot turn 10 deg): the march stops there with a warning
    assert second["fate"] == "wall" and second["reflection"]["regular"] is False
    assert any("no regular reflection" in w for w in s["warnings"])


def _simple_wave_cusp(radius, turn, height, m1=2.0, gamma=1.4):
    """First point of the envelope of the straight C- characteristics of a simple compression wave.

    Simple-wave theory (Courant and Friedrichs, Supersonic Flow and Shock Waves, 1948, from memory):
    nu - theta = nu1 on the C+ from the uniform stream, so each C- leaving the wall at x is straight with
    direction phi = theta_w - mu; its envelope point lies at distance t = (W' x e) / phi' along it.
    """
    x = np.linspace(0.0, radius * math.sin(turn) * 0.999, 40001)
    th = np.arctan(-x / np.sqrt(radius**2 - x**2))
    yw = height - (radius - np.sqrt(radius**2 - x**2))
    mu = mach_angle(mach_from_prandtl_meyer(prandtl_meyer(m1, gamma) + th, gamma))
    phi = th - mu
    dphi = np.gradient(phi, x)
    ex, ey = np.cos(phi), np.sin(phi)
    cross = 1.0 * ey - np.tan(th) * ex
    t = cross / dphi
    px, py = x + t * ex, yw + t * ey
    k = int(np.argmin(px))
    return px[k], py[k]


def test_first_crossing_converges_to_simple_wave_cusp():
    radius, turn, height = 20.0, math.radians(10.0), 5.0
    cx, cy = _simple_wave_cusp(radius, turn, height)
    errs, sizes = [], []
    for n in (20, 40, 80):
        r = analyze(concave_arc(radius, turn, height, 30.0), 1.4, "planar", n=n, start="uniform", mach_in=2.0)
        c = r.summary["coalescence"]
        errs.append(math.hypot(c["x"] - cx, c["y"] - cy))
        sizes.append(c["cell_size"])
    # located to within about a cell, and converging under refinement
    assert errs[-1] < 1.5 * sizes[-1]
    assert errs[2] < errs[0] * 0.6


def test_shock_far_from_wall_tends_to_oblique_shock_of_total_turning():
    # Source: NACA Report 1135 oblique-shock table: M1 = 2, total turning 10 deg -> beta = 39.314 deg, p2/p1 = 1.7066.
    turn = math.radians(10.0)
    r = analyze(concave_arc(2.0, turn, 10.0, 20.0), 1.4, "planar", n=40, start="uniform", mach_in=2.0)
    sh = r.shocks[0]
    # a wave of total turning 10 deg cannot make a stronger shock than the oblique shock of 10 deg
    assert np.max(sh["p2_p1"]) < 1.7066 + 2e-3
    assert math.degrees(sh["beta"][-1]) == pytest.approx(39.314, abs=0.05)
    assert sh["p2_p1"][-1] == pytest.approx(1.7066, abs=3e-3)
    # total pressure falls across the shock and never rises anywhere (entropy condition, second law)
    assert np.all(sh["p02_p01"] <= 1.0 + 1e-12)
    assert np.max(r.net.p0_ratio) <= 1.0 + 1e-12


def test_shock_train_between_wall_and_centre_line_conserves_mass():
    # Exact invariants (common practice): a shock reflecting back and forth between the wall and the centre line
    # alternates families, loses total pressure at each crossing and never gains it, and the mass flow leaving the
    # exit equals the mass flow entering.  Invented case: 5 deg circular-arc ramp (R = 5) in a Mach 2.5 stream.
    r = analyze(concave_arc(5.0, math.radians(5.0), 1.0, 6.0), 1.4, "planar", n=30, start="uniform", mach_in=2.5)
    s = r.summary
    fams = [sh["family"] for sh in s["shocks"]]
    assert len(fams) >= 4
    assert all(f == ("C-" if i % 2 == 0 else "C+") for i, f in enumerate(fams))
    assert all(sh["fate"].startswith("reflects") for sh in s["shocks"][:-1])
    assert s["shocks"][-1]["fate"] == "exit" and s["march_complete"] is True
    assert s["mass_flow_ratio"] == pytest.approx(1.0, abs=5e-3)
    assert float(np.max(r.net.p0_ratio)) <= 1.0 + 1e-12
    assert all(sh["total_pressure_ratio"] < 1.0 for sh in s["shocks"])

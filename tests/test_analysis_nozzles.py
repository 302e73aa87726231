"""`moc analyze` on nozzle contours: a designed nozzle, an overturned wall, cones; checked against outside facts."""

import json
import math

import numpy as np
import pytest

from moc.analysis.analyze import analyze
from moc.analysis.contour import bell, cone, wall_from_points
from moc.analysis.exitflow import ideal_vacuum_cf
from moc.cli import main


def overturned(length=3.0, a0=20.0, a1=-6.0, n=300):
    """Invented demo contour: the wall opens at a0 deg after a sharp throat and turns back to a1 deg."""
    x = np.linspace(0.0, length, n)
    s0, s1 = math.tan(math.radians(a0)), math.tan(math.radians(a1))
    slope = s0 + (s1 - s0) * x / length
    return x, 1.0 + s0 * x + 0.5 * (s1 - s0) * x**2 / length, slope


def test_designed_planar_nozzle_is_shock_free_and_reproduces_exit_mach(tmp_path):
    # Source: NACA Report 1135 (closed form): A/A*(M = 2.4, gamma 1.4) = 2.40310; a shock-free nozzle with a
    # uniform exit has that area ratio (mass conservation).  Design and analysis must agree to 1e-3.
    d = tmp_path / "design"
    assert main(["design", "--exit-mach", "2.4", "--planar", "-n", "100", "-o", str(d), "--quiet", "--no-plot"]) == 0
    out = tmp_path / "analysis"
    assert main(["analyze", str(d / "wall.csv"), "--planar", "-o", str(out), "--quiet", "--no-plot"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["shock_free"] is True and s["shocks"] == []
    assert s["exit_mach"] == pytest.approx(2.4, abs=1e-3)
    assert s["exit_mach_max_dev"] < 1e-3
    assert s["area_ratio"] == pytest.approx(2.40310, abs=1e-3)
    # mass and momentum conservation: exit-plane mass flow = sonic throat flow; wall and exit-plane thrust agree
    assert s["mass_flow_ratio"] == pytest.approx(1.0, abs=1e-3)
    assert s["thrust_coefficient_exit_plane"] == pytest.approx(s["thrust_coefficient_vacuum"], rel=1e-3)
    # a uniform, shock-free exit gives the ideal 1-D thrust (Sutton and Biblarz, ideal-rocket chapter)
    assert s["thrust_coefficient_vacuum"] == pytest.approx(s["thrust_coefficient_ideal_1d"], rel=1e-3)


def test_design_directory_truncated_is_analysed(tmp_path):
    # common practice: truncating a shock-free contour leaves it shock-free with a smaller area ratio
    d = tmp_path / "design"
    assert main(["design", "--exit-mach", "2.4", "--planar", "-n", "60", "-o", str(d), "--quiet", "--no-plot"]) == 0
    out = tmp_path / "short"
    assert main(["analyze", str(d), "--truncate-fraction", "0.7", "-o", str(out), "--quiet", "--no-plot"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["shock_free"] is True
    assert 1.0 < s["area_ratio"] < 2.40310
    assert s["geometry"] == "planar"


def test_overturned_contour_shock_converges_and_obeys_entropy_condition():
    starts, strength = [], []
    for n in (20, 40, 80):
        x, y, sl = overturned()
        r = analyze(wall_from_points(x, y, sl), 1.4, "planar", n=n)
        s = r.summary
        assert s["shock_free"] is False
        sh = s["shocks"][0]
        starts.append((sh["start_x"], sh["start_y"]))
        strength.append(sh["max_pressure_ratio"])
        # entropy condition (second law): total pressure falls across the shock and never rises anywhere
        assert 0.95 < sh["total_pressure_ratio"] < 1.0
        assert np.all(r.shocks[0]["p02_p01"] <= 1.0 + 1e-12)
        assert np.max(r.net.p0_ratio) <= 1.0 + 1e-12
        assert sh["max_pressure_ratio"] > 1.2
    d1 = math.dist(starts[0], starts[1])
    d2 = math.dist(starts[1], starts[2])
    assert d2 < 0.5 * d1 and d2 < 0.02  # the start point converges under refinement
    assert abs(strength[2] - strength[1]) < abs(strength[1] - strength[0])


def test_overturned_contour_cli_reports_shock(tmp_path):
    x, y, _ = overturned(n=80)
    csv = tmp_path / "wall.csv"
    csv.write_text("# invented demo contour\nx [mm],r [mm]\n" + "".join(f"{a * 4:.9f},{b * 4:.9f}\n" for a, b in zip(x, y)))
    out = tmp_path / "res"
    assert main(["analyze", str(csv), "--planar", "-o", str(out), "--quiet"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["shock_free"] is False
    sh = s["shocks"][0]
    for k in ("start_x", "start_y", "end_x", "end_y", "max_pressure_ratio", "total_pressure_ratio", "fate"):
        assert k in sh
    assert (out / "shocks.png").stat().st_size > 1000
    from moc.result import Result

    res = Result.load(out)
    assert res.kind == "analysis" and len(res.shocks) == 1
    assert res.shocks[0]["x"].size == res.shocks[0]["beta"].size > 5


def _malina_cf(area_ratio, lam, gamma=1.4):
    """Divergence-corrected vacuum C_F: lambda times the 1-D momentum term plus the exit pressure term."""
    cf, _, pe = ideal_vacuum_cf(area_ratio, gamma)
    return lam * (cf - area_ratio * pe) + area_ratio * pe


def test_wedge_thrust_follows_planar_divergence_factor():
    # Source: planar analogue of Malina's factor, sin(a)/a (VALIDATION.md; Malina, J. Franklin Inst. 230, 1940);
    # ideal C_F from Sutton and Biblarz.  15 deg: 0.98862.
    a = math.radians(15.0)
    r = analyze(cone(15.0, 25.0, "planar"), 1.4, "planar", n=40)
    assert r.summary["shock_free"] is True
    ratio = r.summary["thrust_coefficient_vacuum"] / _malina_cf(25.0, math.sin(a) / a)
    assert ratio == pytest.approx(1.0, abs=2e-3)


def test_cone_thrust_tends_to_malina_divergence_factor():
    # Source: F. J. Malina, J. Franklin Inst. 230 (1940), lambda = (1 + cos a)/2 = 0.98296 at 15 deg;
    # ideal C_F from Sutton and Biblarz.  Rounded throat (R = 4), thrust per unit discharge coefficient.
    lam = (1 + math.cos(math.radians(15.0))) / 2
    errs = []
    for n in (20, 40):
        r = analyze(cone(15.0, 10.0, "axisymmetric", throat_radius=4.0), 1.4, "axisymmetric", n=n)
        s = r.summary
        assert s["shock_free"] is True
        errs.append(abs(s["thrust_coefficient_vacuum"] / s["discharge_coefficient"] / _malina_cf(10.0, lam) - 1))
    assert errs[1] < errs[0]
    assert errs[1] < 6e-3


def test_sharp_throat_cone_thrust_tends_to_malina_divergence_factor():
    # Source: Malina (1940) (1 + cos a)/2 = 0.98296 at 15 deg; Sutton and Biblarz ideal C_F.  Sharp throat corner,
    # area ratio 10: the wall ahead of the internal shock reaches the exit, so the thrust is reported.
    lam = (1 + math.cos(math.radians(15.0))) / 2
    errs = []
    for n in (20, 40):
        s = analyze(cone(15.0, 10.0, "axisymmetric"), 1.4, "axisymmetric", n=n).summary
        errs.append(abs(s["thrust_coefficient_vacuum"] / _malina_cf(10.0, lam) - 1))
    assert errs[1] < errs[0]
    assert errs[1] < 3e-3


def test_sharp_cone_analysis_finishes(tmp_path):
    out = tmp_path / "cone"
    assert main(["analyze", "--cone", "15", "--axisymmetric", "--area-ratio", "4", "-o", str(out), "--quiet"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["area_ratio"] == pytest.approx(4.0)
    assert "caution" in s and "licensed engineer" in s["caution"]


def test_designed_axisymmetric_nozzle_agrees_with_its_design():
    # Source: NACA Report 1135 (closed form) A/A*(2.4) = 2.40310; mass conservation through the exit plane.
    from moc.design import design_minimum_length

    res = design_minimum_length(2.4, gamma=1.4, geometry="axisymmetric", n=100)
    w = res.wall
    r = analyze(wall_from_points(w["x"], w["y"], slope=np.tan(w["theta"])), 1.4, "axisymmetric", n=40)
    s = r.summary
    assert s["shock_free"] is True
    assert s["area_ratio"] == pytest.approx(2.40310, abs=1e-3)
    assert s["exit_mach"] == pytest.approx(2.4, abs=1e-3)
    assert s["mass_flow_ratio"] == pytest.approx(1.0, abs=1e-3)


def test_gradual_design_with_rounded_throat_is_shock_free(tmp_path):
    # A rounded-throat (gradual) design analysed from the same transonic start: shock-free, its exit Mach number
    # reproduced to 1e-3, and the mass flow across the initial line equal to the design's discharge coefficient
    # (mass conservation; Sauer's solution, NACA TM 1147, as the design used).
    d = tmp_path / "gradual"
    assert main(["design", "--exit-mach", "2.4", "--planar", "--throat-curvature", "3", "--inflection", "10",
                 "-n", "60", "-o", str(d), "--quiet", "--no-plot"]) == 0
    design = json.loads((d / "summary.json").read_text())
    out = tmp_path / "analysis"
    assert main(["analyze", str(d), "-o", str(out), "--quiet", "--no-plot"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert s["shock_free"] is True
    assert s["exit_mach"] == pytest.approx(2.4, abs=1e-3)
    assert s["discharge_coefficient"] == pytest.approx(design["discharge_coefficient"], abs=1e-4)
    assert s["mass_flow_ratio"] == pytest.approx(s["discharge_coefficient"], abs=1e-3)


def test_planar_bell_shock_reflects_and_conserves_mass_and_momentum(tmp_path):
    # Exact invariants (common practice checks of a shock-fitted solution): mass and axial momentum are conserved
    # across shocks, so the exit-plane mass flow equals the throat flow and the exit-plane thrust equals the
    # wall-pressure thrust; total pressure never rises (second law).  Invented demo bell: 30 to 8 deg, length 6.
    out = tmp_path / "bell"
    assert main(["analyze", "--bell", "30,8", "--length", "6", "--planar", "-n", "40", "-o", str(out), "--quiet"]) == 0
    s = json.loads((out / "summary.json").read_text())
    assert not any("merged" in w for w in s["warnings"])
    assert [sh["fate"] for sh in s["shocks"]] == ["reflects_axis", "exit"]
    assert s["shocks"][1]["family"] == "C+" and s["shocks"][1]["start_y"] == 0.0
    assert s["march_complete"] is True
    assert s["mass_flow_ratio"] == pytest.approx(1.0, abs=1e-2)
    assert s["thrust_coefficient_exit_plane"] == pytest.approx(s["thrust_coefficient_vacuum"], rel=1e-2)
    assert s["min_total_pressure_ratio"] <= s["shocks"][0]["total_pressure_ratio"] * s["shocks"][1]["total_pressure_ratio"] + 1e-3
    assert s["min_total_pressure_ratio"] > 0.9
    from moc.result import Result

    assert float(np.max(Result.load(out).net.p0_ratio)) <= 1.0 + 1e-12


def test_bell_shock_path_converges_under_refinement():
    # common practice: a fitted shock path must converge as the net is refined (differences shrink)
    ys, ends = [], []
    for n in (16, 32, 64):
        r = analyze(bell(30, 8, 6.0, geometry="planar"), 1.4, "planar", n=n)
        sh = r.shocks[0]
        ys.append(np.interp(3.0, sh["x"], sh["y"]))
        ends.append(r.summary["shocks"][0]["end_x"])
        assert r.summary["merged_characteristics"] == 0
        assert r.summary["mass_flow_ratio"] == pytest.approx(1.0, abs=1e-2)
    # measured: the differences fall by a factor of about 4 per doubling (second order)
    assert abs(ys[2] - ys[1]) < 0.5 * abs(ys[1] - ys[0])
    assert abs(ends[2] - ends[1]) < 0.5 * abs(ends[1] - ends[0])

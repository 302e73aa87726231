"""`moc design` end to end: the issue's acceptance numbers, the files, bad input."""

import csv
import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from moc.cli import main
from moc.flow import area_ratio, prandtl_meyer

ROOT = Path(__file__).parents[1]


def design(tmp_path, *argv):
    out = tmp_path / "out"
    assert main(["design", *argv, "-o", str(out), "--quiet", "--no-plot"]) == 0
    return out, json.loads((out / "summary.json").read_text())


def test_planar_acceptance(tmp_path):
    out, s = design(tmp_path, "--exit-mach", "2.4", "--gamma", "1.4", "--planar", "-n", "100")
    # Source: planar minimum-length nozzle corner angle = nu(Me)/2 (Anderson, Modern
    # Compressible Flow, from memory); nu(2.4) = 36.7465 deg (NACA Report 1135).
    assert s["max_wall_angle_deg"] == pytest.approx(np.degrees(prandtl_meyer(2.4)) / 2, abs=1e-3)
    assert s["max_wall_angle_deg"] == pytest.approx(18.373, abs=1e-3)
    # Source: NACA Report 1135 area relation, A/A*(2.4) = 2.4031.
    assert s["area_ratio"] == pytest.approx(2.4031, rel=2e-4)
    assert s["geometry"] == "planar"
    for key in ("gamma", "exit_mach", "exit_mach_max_dev", "area_ratio_isentropic", "length",
                "characteristics", "points", "mass_flow_error"):
        assert key in s


def test_axisymmetric_acceptance(tmp_path):
    out, s = design(tmp_path, "--exit-mach", "3", "--gamma", "1.4", "--axisymmetric", "-n", "100")
    # Source: NACA Report 1135 area relation, A/A*(3) = 4.2346 (mass conservation: exact for a uniform exit).
    assert s["area_ratio"] == pytest.approx(4.2346, rel=1e-3)
    assert s["area_ratio_isentropic"] == pytest.approx(area_ratio(3.0), rel=1e-12)
    assert s["exit_mach_max_dev"] < 2e-3
    # Fact of the trade (Argrow and Emanuel 1988, from memory): axisymmetric corner below nu(Me)/2.
    assert s["max_wall_angle_deg"] < 24.88


def test_files_written_and_wall_csv(tmp_path):
    out, s = design(tmp_path, "--exit-mach", "2", "--planar", "-n", "30", "--throat", "25mm")
    for name in ("summary.json", "wall.csv", "result.npz"):
        assert (out / name).is_file()
    lines = (out / "wall.csv").read_text().splitlines()
    header = next(line for line in lines if not line.startswith("#"))
    assert header.split(",")[1:] == ["x [throat]", "y [throat]", "x [mm]", "y [mm]", "wall_angle [deg]", "mach [-]", "p_p0 [-]"]
    rows = list(csv.reader([line for line in lines if not line.startswith("#")][1:]))
    x, y, xmm, ymm = (np.array([float(r[k]) for r in rows]) for k in (1, 2, 3, 4))
    np.testing.assert_allclose(xmm, 25 * x, rtol=1e-10)
    np.testing.assert_allclose(ymm, 25 * y, rtol=1e-10)
    # exit of the wall equals the reported area ratio (planar: y_e / y*)
    assert y[-1] == pytest.approx(s["area_ratio"], rel=1e-9)
    assert s["length_real"] == pytest.approx(25 * s["length"], rel=1e-12)
    # the saved net reloads with the same summary
    from moc.result import Result

    r = Result.load(out)
    assert r.summary["area_ratio"] == s["area_ratio"]
    assert r.net.size == s["points"]


def test_refuses_to_overwrite_without_force(tmp_path):
    out, _ = design(tmp_path, "--exit-mach", "2", "--planar", "-n", "10")
    before = (out / "summary.json").read_bytes()
    p = subprocess.run([sys.executable, "-m", "moc", "design", "--exit-mach", "2.5", "--planar", "-n", "10",
                        "-o", str(out), "--no-plot"], capture_output=True, text=True)
    assert p.returncode == 2 and "--force" in p.stderr and "Traceback" not in p.stderr
    assert (out / "summary.json").read_bytes() == before


@pytest.mark.parametrize("argv,pattern", [
    (["--exit-mach", "1.0"], "exit_mach"),
    (["--exit-mach", "2", "-n", "2"], "at least 3"),
    (["--exit-mach", "2", "--throat", "0mm"], "throat"),
    (["--exit-mach", "2", "--throat", "12"], "unit"),
    (["--exit-mach", "200", "--gamma", "1.1", "--planar"], "exit Mach number 200"),
])
def test_bad_input_exit_2(tmp_path, argv, pattern):
    p = subprocess.run([sys.executable, "-m", "moc", "design", *argv, "-o", str(tmp_path / "o"), "--no-plot"],
                       capture_output=True, text=True)
    assert p.returncode == 2, p.stderr
    assert "Traceback" not in p.stderr and pattern in p.stderr
    assert len(p.stderr.strip().splitlines()) == 1


def test_readme_quick_start_runs_the_default_case(tmp_path):
    # README's first command: moc design cases/default.toml -o out/default
    readme = (ROOT / "README.md").read_text()
    assert "moc design cases/default.toml -o out/default" in readme
    out = tmp_path / "default"
    assert main(["design", str(ROOT / "cases" / "default.toml"), "-o", str(out), "--quiet"]) == 0
    for name in ("summary.json", "wall.csv", "result.npz", "overview.png"):
        assert (out / name).stat().st_size > 0
    s = json.loads((out / "summary.json").read_text())
    assert s["area_ratio"] == pytest.approx(area_ratio(3.0), rel=2e-3)
    assert s["mass_flow_kg_s"] > 0

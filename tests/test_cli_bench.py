"""The bench commands `moc state` and `moc shock` (issue acceptance values)."""

import json
import subprocess
import sys

import pytest

from moc.cli import main


def run_json(capsys, argv):
    assert main(argv) == 0
    return json.loads(capsys.readouterr().out)


def test_state_json(capsys):
    # Source: NACA Report 1135 isentropic and Prandtl-Meyer tables, M = 2.4.
    d = run_json(capsys, ["state", "--mach", "2.4", "--json"])
    assert d["area_ratio"] == pytest.approx(2.4031, abs=1e-4)
    assert d["prandtl_meyer_deg"] == pytest.approx(36.75, abs=0.01)
    assert d["mach_angle_deg"] == pytest.approx(24.6243, abs=1e-4)
    assert d["p_p0"] == pytest.approx(0.068399, rel=1e-4)
    assert d["T_T0"] == pytest.approx(0.464684, rel=1e-5)


def test_shock_json(capsys):
    # Source: NACA Report 1135 oblique-shock relations, M1 = 2, theta = 15 deg.
    d = run_json(capsys, ["shock", "--mach", "2", "--deflection", "15", "--json"])
    assert d["beta_weak_deg"] == pytest.approx(45.34, abs=0.05)
    assert d["beta_strong_deg"] == pytest.approx(79.8, abs=0.05)
    assert d["theta_max_deg"] == pytest.approx(22.97, abs=0.02)
    assert d["m2_weak"] == pytest.approx(1.4457, abs=1e-4)
    assert d["p2_p1_weak"] == pytest.approx(2.1947, rel=1e-4)
    assert d["p02_p01_weak"] == pytest.approx(0.95236, abs=1e-5)


@pytest.mark.parametrize("argv", [
    ["shock", "--mach", "2", "--deflection", "30"],
    ["state", "--mach", "-1"],
    ["state", "--mach", "2", "--gamma", "0.9"],
    ["shock", "--mach", "0.8", "--deflection", "5"],
    ["state", "--mach", "nan"],
])
def test_bad_input_exit_2_one_line_no_traceback(argv):
    p = subprocess.run([sys.executable, "-m", "moc", *argv], capture_output=True, text=True)
    assert p.returncode == 2
    lines = p.stderr.strip().splitlines()
    assert len(lines) == 1 and "Traceback" not in p.stderr
    assert "error" in lines[0]


def test_help_lists_commands():
    p = subprocess.run([sys.executable, "-m", "moc", "--help"], capture_output=True, text=True)
    assert p.returncode == 0
    for cmd in ("state", "shock"):
        assert cmd in p.stdout

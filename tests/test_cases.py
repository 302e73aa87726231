"""Every example in cases/ runs end to end (TOML cases through `moc design`, wall
CSVs through `moc analyze`), and its key numbers obey the invariants of its kind."""

import json
import re
from pathlib import Path

import pytest

from moc.cli import main
from moc.flow import area_ratio
from moc.io.case import load

CASES = sorted(Path(__file__).parents[1].joinpath("cases").iterdir())


@pytest.mark.parametrize("path", [p for p in CASES if p.suffix == ".toml"], ids=lambda p: p.stem)
def test_design_case_runs(path, tmp_path):
    out = tmp_path / path.stem
    assert main(["design", str(path), "-o", str(out), "--quiet"]) == 0
    s = json.loads((out / "summary.json").read_text())
    case = load(path)
    me, g = case["nozzle"]["exit_mach"], case["gas"]["gamma"]
    for name in ("summary.json", "wall.csv", "result.npz", "overview.png"):
        assert (out / name).stat().st_size > 0
    if case["truncate"]["length_fraction"] is None:
        # Source: mass conservation with a uniform exit: A_e / A* = A/A*(Me) (NACA Report 1135);
        # a rounded throat passes Cd times the one-dimensional flow, so A_e / A_t = Cd A/A*(Me).
        cd = s.get("discharge_coefficient", 1.0)
        assert s["area_ratio"] == pytest.approx(cd * area_ratio(me, g), rel=3e-3)
        assert abs(s["exit_mach"] - me) < 2e-3
    else:
        # a truncated contour is shorter and its exit is short of the full expansion
        assert s["area_ratio"] < area_ratio(me, g)
    if case["chamber"]["pressure"] is not None and (case["nozzle"]["geometry"] == "axisymmetric" or case["nozzle"]["width"]):
        assert s["mass_flow_kg_s"] > 0 and s["thrust_N"] > 0


@pytest.mark.parametrize("path", [p for p in CASES if p.suffix == ".csv"], ids=lambda p: p.stem)
def test_analysis_case_runs(path, tmp_path):
    # the command to run is written in the file's header comment
    cmd = next(line for line in path.read_text().splitlines() if line.lstrip("# ").startswith("moc analyze"))
    argv = cmd.lstrip("# ").split()[1:]
    argv[argv.index("-o") + 1] = str(tmp_path / "out")
    argv[1] = str(path)
    assert main(argv + ["--quiet"]) == 0
    s = json.loads((tmp_path / "out" / "summary.json").read_text())
    assert (tmp_path / "out" / "shocks.png").stat().st_size > 0
    if re.search(r"shock", path.stem):
        assert s["shock_free"] is False and s["shocks"]
        # second law: total pressure never rises across a shock
        assert all(sh["total_pressure_ratio"] <= 1.0 + 1e-9 for sh in s["shocks"])


def test_every_case_is_covered():
    assert all(p.suffix in (".toml", ".csv") for p in CASES if p.is_file())
    assert len([p for p in CASES if p.suffix == ".toml"]) >= 4 and any(p.suffix == ".csv" for p in CASES)

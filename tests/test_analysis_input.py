"""Bad wall contours give a clear ContourError naming the point or line at fault (CLI exit status 2)."""

import math

import numpy as np
import pytest

from moc.analysis.contour import bell, cone, read_wall_csv, wall_from_points
from moc.cli import main
from moc.errors import ContourError


def write(tmp_path, text, name="wall.csv"):
    p = tmp_path / name
    p.write_text(text)
    return p


def good_rows(n=12):
    x = np.linspace(0, 3, n)
    return x, 1 + 0.2 * x - 0.02 * x**2


def test_not_monotone_names_the_line(tmp_path):
    x, y = good_rows()
    rows = [f"{a},{b}" for a, b in zip(x, y)]
    rows[5], rows[6] = rows[6], rows[5]
    p = write(tmp_path, "x [mm],y [mm]\n" + "\n".join(rows) + "\n")
    with pytest.raises(ContourError, match=r"not monotone in x at point 7 \(line 8\)"):
        read_wall_csv(p)


def test_too_few_points(tmp_path):
    p = write(tmp_path, "x [mm],y [mm]\n0,1\n1,1.1\n2,1.2\n")
    with pytest.raises(ContourError, match="at least 5"):
        read_wall_csv(p)


def test_kink_steeper_than_the_flow_can_turn(tmp_path):
    x = np.linspace(0, 3, 12)
    y = 1 + 0.3 * x
    y[7:] = y[6] - 0.8 * (x[7:] - x[6])  # turns back by about 55 deg at point 7
    p = write(tmp_path, "x [throat],y [throat]\n" + "".join(f"{a},{b}\n" for a, b in zip(x, y)))
    with pytest.raises(ContourError, match=r"kinks by .* deg at point 7 \(line 8\)"):
        read_wall_csv(p)


def test_throat_not_narrowest(tmp_path):
    x = np.linspace(0, 3, 12)
    y = 1 + 0.2 * x - 0.1 * x**2  # narrower than the throat from x = 2 on (point 9 at x = 2.18)
    p = write(tmp_path, "x [cm],r [cm]\n" + "".join(f"{a},{b}\n" for a, b in zip(x, y)))
    with pytest.raises(ContourError, match=r"throat is not the narrowest section: point 9 \(line 10\)"):
        read_wall_csv(p)


def test_units_missing(tmp_path):
    x, y = good_rows()
    p = write(tmp_path, "x,y\n" + "".join(f"{a},{b}\n" for a, b in zip(x, y)))
    with pytest.raises(ContourError, match="does not say its length unit"):
        read_wall_csv(p)
    w, info = read_wall_csv(p, units="mm")
    assert info["unit"] == "mm" and w.y_start == pytest.approx(1.0)


def test_inlet_part_is_dropped_and_throat_normalised():
    # common practice: the throat is the narrowest section; lengths are scaled by its size
    x = np.linspace(-2, 4, 61)
    y = 2.0 + 0.1 * x**2
    w = wall_from_points(x, y)
    assert w.x_start == pytest.approx(0.0, abs=1e-12) and w.y_start == pytest.approx(1.0)
    assert w.x_end == pytest.approx(4.0 / 2.0)


def test_bell_exit_radius_from_angles_and_length():
    # parabola x = A y^2 + B y + C tangent at both ends: ye = y0 + 2 L / (cot a0 + cot a1) (docs/analysis.md)
    w = bell(30.0, 8.0, 6.0)
    expect = 1.0 + 2 * 6.0 / (1 / math.tan(math.radians(30)) + 1 / math.tan(math.radians(8)))
    assert w.y_end == pytest.approx(expect, rel=1e-12)
    assert math.degrees(w.angle_end) == pytest.approx(8.0, abs=1e-9)
    assert math.degrees(w.angle_start) == pytest.approx(30.0, abs=1e-9)


def test_cone_bad_values():
    with pytest.raises(ContourError, match="half-angle"):
        cone(80, 4)
    with pytest.raises(ContourError, match="area ratio"):
        cone(15, 0.5)


def test_cli_exit_status_2_on_bad_contour(tmp_path, capsys):
    p = write(tmp_path, "x,y\n0,1\n1,1.1\n")
    assert main(["analyze", str(p), "--units", "mm", "-o", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert "error:" in err and "Traceback" not in err
    assert main(["analyze", "--cone", "15", "-o", str(tmp_path / "o")]) == 2  # no --area-ratio
    assert main(["analyze", "-o", str(tmp_path / "o")]) == 2  # no contour at all


def test_cli_refuses_to_overwrite(tmp_path):
    out = tmp_path / "o"
    args = ["analyze", "--cone", "15", "--planar", "--area-ratio", "3", "-n", "12", "-o", str(out), "--quiet", "--no-plot"]
    assert main(args) == 0
    before = (out / "summary.json").read_bytes()
    assert main(args) == 2
    assert (out / "summary.json").read_bytes() == before
    assert main(args + ["--force"]) == 0

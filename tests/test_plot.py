"""Figures: each writes a readable image of the expected size from an exact flow.

The fixture is an exact homentropic flow, the planar radial source flow in a
wedge (Source: any gas-dynamics text, e.g. Zucrow and Hoffman, Gas Dynamics
vol. 1, 1976, source-flow section; from memory).  Its flow angle is the polar
angle and A/A* = r / r*, so along a C- line theta + nu is constant and along a
C+ line theta - nu is constant (Source: NACA Report 1135, Prandtl-Meyer
relations for planar irrotational flow).  Each net point therefore follows
exactly from its two Riemann invariants, and the picture is of a real flow.
"""

import json

import matplotlib.image as mpimg
import numpy as np
import pytest

from moc import flow
from moc.errors import ExportError, FileExistsRefusal, InputError
from moc.result import Net, Result, write_summary


def source_flow_result(n=9, half_angle_deg=12.0, exit_mach=2.0, gamma=1.4, throat_mm=10.0, shocks=False):
    """An exact planar source-flow 'nozzle' as a Result (lengths in throat half-heights).

    The throat half-height y* = 1 sits at r* = 1/sin(half angle); x is shifted
    so the sonic wall point is at x = 0.
    """
    g = gamma
    phw = np.radians(half_angle_deg)
    nu_e = float(flow.prandtl_meyer(exit_mach, g))
    rstar = 1.0 / np.sin(phw)
    # Riemann invariants: Km = theta + nu (labels C-), Kp = theta - nu (labels C+)
    nu_lo = float(flow.prandtl_meyer(1.05, g))
    km = np.linspace(nu_lo - phw, nu_e + phw, 2 * n)
    kp = np.linspace(-nu_e - phw, phw - nu_lo, 2 * n)
    KM, KP = np.meshgrid(km, kp, indexing="ij")
    th = 0.5 * (KM + KP)
    nu = 0.5 * (KM - KP)
    inside = (np.abs(th) <= phw + 1e-12) & (nu >= nu_lo - 1e-12) & (nu <= nu_e + 1e-12) & (th >= -1e-12)
    mach = flow.mach_from_prandtl_meyer(np.clip(nu, 0, None), g)
    r = rstar * flow.area_ratio(mach, g)
    X = r * np.cos(th) - rstar * np.cos(phw)
    Y = r * np.sin(th)
    index = -np.ones(KM.shape, dtype=int)
    index[inside] = np.arange(int(inside.sum()))
    cells = []
    ni, nj = KM.shape
    for i in range(ni - 1):
        for j in range(nj - 1):
            q = [index[i, j], index[i + 1, j], index[i + 1, j + 1], index[i, j + 1]]
            if min(q) >= 0:
                cells.append(q)
    cells = np.array(cells, dtype=int).reshape(-1, 4)
    xs, ys = X[inside], Y[inside]
    a = 0.5 * ((xs[cells[:, 1]] - xs[cells[:, 0]]) * (ys[cells[:, 2]] - ys[cells[:, 0]])
               - (xs[cells[:, 2]] - xs[cells[:, 0]]) * (ys[cells[:, 1]] - ys[cells[:, 0]]))
    cells = np.where((a < 0)[:, None], cells[:, ::-1], cells)
    net = Net(x=xs, y=ys, theta=th[inside], mach=mach[inside],
              cplus=np.broadcast_to(np.arange(nj)[None, :], KM.shape)[inside],
              cminus=np.broadcast_to(np.arange(ni)[:, None], KM.shape)[inside], cells=cells)
    mw = np.linspace(1.0, exit_mach, 40)
    rw = rstar * flow.area_ratio(mw, g)
    wall = {"x": (rw - rstar) * np.cos(phw), "y": rw * np.sin(phw), "theta": np.full(40, phw), "mach": mw,
            "p_p0": flow.pressure_ratio(mw, g)}
    axis = {"x": rw - rstar * np.cos(phw), "mach": mw}
    re = rw[-1]
    ang = np.linspace(0.0, phw, 15)
    me = np.full(15, exit_mach)
    ex = {"x": re * np.cos(ang) - rstar * np.cos(phw), "y": re * np.sin(ang), "mach": me, "theta": ang}
    summary = {
        "geometry": "planar", "gamma": g, "exit_mach": exit_mach, "exit_mach_max_dev": 0.0,
        "area_ratio": float(flow.area_ratio(exit_mach, g)),
        "area_ratio_isentropic": float(flow.area_ratio(exit_mach, g)),
        "length": float(wall["x"][-1]), "max_wall_angle_deg": half_angle_deg,
        "characteristics": 2 * n, "points": int(net.size), "mass_flow_error": 0.0,
        "divergence_efficiency": float(np.sin(phw) / phw),
    }
    sh = []
    if shocks:
        t = np.linspace(0, 1, 12)
        sh = [{"x": 2.0 + 4.0 * t, "y": 0.3 + 1.0 * t, "beta": np.full(12, 0.6), "p2_p1": 1.2 + 0.3 * t,
               "p02_p01": 1 - 0.01 * t}]
        summary["shock_free"] = False
        summary["shocks"] = [{"start_x": 2.0, "start_y": 0.3, "end_x": 6.0, "end_y": 1.3,
                              "max_pressure_ratio": 1.5, "total_pressure_ratio": 0.99, "fate": "exit"}]
        summary["coalescence"] = {"x": 2.0, "y": 0.3}
    inputs = {"geometry": "planar", "exit_mach": exit_mach, "gamma": g,
              "throat": {"value": throat_mm, "unit": "mm"}}
    return Result(kind="analysis" if shocks else "design", inputs=inputs, summary=summary, net=net, wall=wall,
                  axis=axis, exit=ex, shocks=sh)


@pytest.fixture(scope="module")
def res():
    return source_flow_result()


def test_fixture_is_the_exact_source_flow(res):
    # Source: mass conservation in planar source flow, A/A* = r/r* (closed form,
    # NACA Report 1135 isentropic relations): every net point's radius matches its Mach number.
    net = res.net
    rstar = 1.0 / np.sin(np.radians(12.0))
    r = np.hypot(net.x + rstar * np.cos(np.radians(12.0)), net.y)
    assert np.allclose(r / rstar, flow.area_ratio(net.mach, 1.4), rtol=1e-10)
    # flow angle equals polar angle for a radial flow (exact)
    assert np.allclose(np.arctan2(net.y, net.x + rstar * np.cos(np.radians(12.0))), net.theta, atol=1e-12)


def _png_shape(path):
    img = mpimg.imread(path)
    return img.shape


@pytest.mark.parametrize("name", ["net", "mach", "wall", "distributions", "exit", "shocks"])
def test_each_figure_writes_png_of_expected_size(tmp_path, name):
    from moc import plot

    r = source_flow_result(shocks=(name == "shocks"))
    fig = plot.figure_for(r, name)
    path = plot.save_figure(fig, tmp_path / f"{name}.png", dpi=50)
    h, w = _png_shape(path)[:2]
    # size = inches x dpi (common practice: matplotlib's savefig without tight bbox)
    W, H = plot.SIZES[name]
    assert (w, h) == (round(W * 50), round(H * 50))
    img = mpimg.imread(path)[..., :3]
    # not blank: a real drawing has many distinct grey levels and dark ink
    assert img.std() > 0.05
    assert (img.mean(axis=2) < 0.3).mean() > 0.001


def test_overview_and_refuses_overwrite(tmp_path, res):
    from moc import plot

    p = plot.overview(res, tmp_path / "overview.png", dpi=40)
    h, w = _png_shape(p)[:2]
    assert (w, h) == (round(plot.SIZES["overview"][0] * 40), round(plot.SIZES["overview"][1] * 40))
    before = p.read_bytes()
    with pytest.raises(FileExistsRefusal):
        plot.overview(res, p, force=False)
    assert p.read_bytes() == before
    # no temporary files left behind (atomic writes)
    assert sorted(q.name for q in tmp_path.iterdir()) == ["overview.png"]


def test_triangulation_covers_the_net_area(res):
    # The triangles of the quad cells tile the net exactly: their area equals the
    # sum of the quad areas by the shoelace formula (exact invariant).
    from moc import plot

    r = source_flow_result(throat_mm=1.0)
    tri = plot.triangulation(r)
    x, y, t = tri.x, tri.y, tri.triangles
    a_tri = 0.5 * np.abs((x[t[:, 1]] - x[t[:, 0]]) * (y[t[:, 2]] - y[t[:, 0]])
                         - (x[t[:, 2]] - x[t[:, 0]]) * (y[t[:, 1]] - y[t[:, 0]])).sum()
    c = r.net.cells
    qx, qy = r.net.x[c], r.net.y[c]
    a_quad = 0.5 * np.abs((qx * np.roll(qy, -1, axis=1) - np.roll(qx, -1, axis=1) * qy).sum(axis=1)).sum()
    assert a_tri == pytest.approx(a_quad, rel=1e-12)
    # every triangle is counter-clockwise
    signed = (x[t[:, 1]] - x[t[:, 0]]) * (y[t[:, 2]] - y[t[:, 0]]) - (x[t[:, 2]] - x[t[:, 0]]) * (y[t[:, 1]] - y[t[:, 0]])
    assert (signed > 0).all()


def test_wall_dimensions_in_real_units(res):
    # The throat/exit half-heights are annotated in mm: exit = throat * A/A*(2) (Source:
    # NACA Report 1135, A/A*(M=2, g=1.4) = 1.6875 exactly) -> 16.88 mm for a 10 mm throat.
    from moc import plot

    fig = plot.plot_wall(res)
    texts = " ".join(t.get_text() for t in fig.axes[0].texts)
    assert "10 mm" in texts
    assert "16.88 mm" in texts
    assert fig.axes[0].get_xlabel() == "x (mm)"


def test_net_families_differ_in_colour_and_style(res):
    from moc import plot

    fig = plot.plot_net(res)
    cols = [c for c in fig.axes[0].collections]
    assert len(cols) == 2
    (c1, c2) = cols
    assert c1.get_label().startswith("C+") and c2.get_label().startswith("C-")
    assert not np.allclose(c1.get_colors()[0], c2.get_colors()[0])
    assert c1.get_linestyle() != c2.get_linestyle()
    # grey-scale luminance (Rec. 709 weights; common practice) of the two colours differs too
    lum = [float(np.dot(c.get_colors()[0][:3], [0.2126, 0.7152, 0.0722])) for c in cols]
    assert abs(lum[0] - lum[1]) > 0.1
    # one line per characteristic label
    assert len(c1.get_segments()) == np.unique(res.net.cplus).size


def test_mach_field_colour_bar_spans_the_net(res):
    from moc import plot

    fig = plot.plot_mach_field(res)
    cb_axes = [a for a in fig.axes if a.get_ylabel() == "Mach number M"]
    assert cb_axes, "colour bar labelled with the Mach number"
    lo, hi = cb_axes[0].get_ylim()
    assert lo == pytest.approx(res.net.mach.min()) and hi == pytest.approx(res.net.mach.max())


def test_bad_inputs_raise_clear_errors(tmp_path, res):
    from moc import plot

    with pytest.raises(ExportError, match="png"):
        plot.save_figure(plot.plot_net(res), tmp_path / "x.bmp")
    with pytest.raises(InputError, match="dpi"):
        plot.save_figure(plot.plot_net(res), tmp_path / "x.png", dpi=-3)
    with pytest.raises(InputError, match="unknown figure"):
        plot.figure_for(res, "pressure")
    empty = source_flow_result()
    empty.exit = {}
    with pytest.raises(InputError, match="exit profile"):
        plot.plot_exit(empty)
    assert list(tmp_path.iterdir()) == []


def _save_dir(tmp_path, r):
    d = tmp_path / "res"
    d.mkdir()
    r.save(d)
    write_summary(d, r.summary)
    return d


def test_cli_plot_all_formats(tmp_path, capsys):
    from moc.cli import main

    d = _save_dir(tmp_path, source_flow_result(shocks=True))
    out = tmp_path / "figs"
    assert main(["plot", str(d), "--what", "all", "-o", str(out), "--dpi", "40", "--json"]) == 0
    listed = json.loads(capsys.readouterr().out)
    names = sorted(p.name for p in out.iterdir())
    assert names == sorted(f"{n}.png" for n in ["net", "mach", "wall", "distributions", "exit", "shocks"])
    assert sorted(Path_(p).name for p in listed["files"]) == names
    # refuses to overwrite without --force, exit status 2
    assert main(["plot", str(d), "--what", "net", "-o", str(out)]) == 2
    assert "--force" in capsys.readouterr().err
    assert main(["plot", str(d), "--what", "net,wall", "--format", "svg", "-o", str(out)]) == 0
    svg = (out / "net.svg").read_text()
    assert svg.lstrip().startswith("<?xml") and "</svg>" in svg
    assert main(["plot", str(d), "--what", "wall", "--format", "pdf", "-o", str(out)]) == 0
    assert (out / "wall.pdf").read_bytes().startswith(b"%PDF")
    assert main(["plot", str(d), "--what", "overview", "-o", str(out), "--dpi", "30"]) == 0
    h, w = mpimg.imread(out / "overview.png").shape[:2]
    assert (w, h) == (300, 240)  # 10 x 8 inches at 30 dpi
    assert main(["plot", str(d), "--what", "bogus", "-o", str(out)]) == 2
    assert "unknown figure" in capsys.readouterr().err
    assert main(["plot", str(tmp_path / "nothing"), "-o", str(out)]) == 2


def Path_(p):
    from pathlib import Path

    return Path(p)


def test_every_command_help_has_an_example_and_exit_codes():
    # Common practice for command-line tools: each sub-command's help ends with a
    # runnable example, and the top-level help states the exit statuses.
    import argparse

    from moc.cli import build_parser

    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    assert {"plot", "report"} <= set(sub.choices)
    for name, p in sub.choices.items():
        epilog = p.epilog or ""
        assert "example:" in epilog, name
        assert f"moc {name}" in epilog, name
        assert p.format_help().strip(), name
    assert "0 success, 2 bad input, 1 computation failed" in parser.format_help().replace("\n", " ")


def test_plot_is_quiet_off_a_terminal(tmp_path, capsys):
    # progress goes to stderr only for an interactive terminal (moc/commands/_common.py)
    from moc.cli import main

    d = _save_dir(tmp_path, source_flow_result())
    assert main(["plot", str(d), "--what", "wall", "--dpi", "30", "--quiet"]) == 0
    out, err = capsys.readouterr()
    assert out == "" and err == ""
    assert (d / "wall.png").stat().st_size > 1000


def test_all_skips_what_an_analysis_cannot_draw(tmp_path, capsys):
    # An analysis that stops before the exit stores no exit profile and null exit numbers;
    # 'all' draws the rest and says what it skipped; naming 'exit' explicitly is an error.
    from moc.cli import main

    r = source_flow_result(shocks=True)
    r.exit = {}
    r.summary.update(exit_mach=None, exit_mach_max_dev=None, thrust_coefficient_vacuum=None)
    d = _save_dir(tmp_path, r)
    assert main(["plot", str(d), "--what", "all", "--dpi", "30", "--json"]) == 0
    got = json.loads(capsys.readouterr().out)
    assert sorted(Path_(p).name for p in got["files"]) == sorted(
        f"{n}.png" for n in ["net", "mach", "wall", "distributions", "shocks"])
    assert got["skipped"] == ["exit: not drawn, the result has no exit profile"]
    assert main(["plot", str(d), "--what", "exit"]) == 2
    assert "no exit profile" in capsys.readouterr().err


def test_wall_with_inlet_dimensions_the_inlet_face(res):
    # A circular-arc-and-cone inlet of face half-height 2 (throat units) ahead of the
    # throat: drawn inside the axes and dimensioned in mm (10 mm throat -> 20 mm face).
    from moc import plot

    r = source_flow_result()
    t = np.linspace(0, 1, 30)
    r.inlet = {"x": -3.0 + 3.0 * t, "y": 2.0 - 1.0 * np.sin(0.5 * np.pi * t)}
    fig = plot.plot_wall(r)
    ax = fig.axes[0]
    texts = " ".join(t.get_text() for t in ax.texts)
    assert "inlet half-height\n20 mm" in texts
    assert "inlet 30 mm" in texts
    lo, hi = ax.get_xlim()
    assert lo < -30.0 and hi > r.wall["x"].max() * 10


def test_uniform_exit_region_of_a_real_design_is_shaded():
    # Downstream of the last C+ from the axis a minimum-length nozzle's flow is
    # uniform at Me (the design condition; Anderson, Modern Compressible Flow,
    # nozzle design, from memory): the figure shades that triangle in the colour of Me
    # and its corners are the axis point, the wall exit and the exit on the axis.
    try:
        from moc.design import design_minimum_length
    except ImportError:
        pytest.skip("the minimum-length designer is not in this tree")
    from moc import plot

    r = design_minimum_length(2.0, 1.4, "planar", 12)
    fig = plot.plot_mach_field(r)
    ax = fig.axes[0]
    assert any(t.get_text() == "uniform, M = 2" for t in ax.texts)
    polys = [p for p in ax.patches if p.get_zorder() == 1]
    assert len(polys) == 1
    xy = polys[0].get_xy()
    x_end = r.wall["x"].max()
    assert xy[:, 0].max() == pytest.approx(x_end)
    assert xy[:, 1].min() == pytest.approx(0.0, abs=1e-12)
    assert xy[:, 1].max() == pytest.approx(r.wall["y"][-1], rel=1e-6)

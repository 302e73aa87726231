"""The HTML report: valid, self-contained, carries every summary number and the cautions.

Results come from the exact planar source flow of tests/test_plot.py, and
from the real minimum-length designer when it is available.
"""

import copy
import math
from html.parser import HTMLParser

import numpy as np
import pytest

from moc.errors import FileExistsRefusal, InputError, ResultFileError
from moc.result import write_summary

from test_plot import source_flow_result

VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source", "track", "wbr"}


class Checker(HTMLParser):
    """Strict nesting check (HTML Living Standard void elements; common practice for well-formed pages)."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.stack, self.errors, self.text, self.tags, self.srcs, self.ids = [], [], [], [], [], set()
        self.decl = None

    def handle_decl(self, decl):
        self.decl = decl

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        for k, v in attrs:
            if k in ("src", "href"):
                self.srcs.append(v or "")
            if k == "id":
                if v in self.ids:
                    self.errors.append(f"duplicate id {v!r}")
                self.ids.add(v)
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag, attrs):
        self.handle_starttag(tag, attrs)
        if tag not in VOID:
            self.stack.pop()

    def handle_endtag(self, tag):
        if tag in VOID:
            return
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"unexpected </{tag}> with open {self.stack[-3:]}")
        else:
            self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


def check_html(text):
    c = Checker()
    c.feed(text)
    c.close()
    assert c.decl and c.decl.lower() == "doctype html"
    assert not c.errors, c.errors[:5]
    assert not c.stack, f"unclosed: {c.stack}"
    assert c.tags[0] == "html" and "title" in c.tags and "body" in c.tags
    # self-contained: no outside resource; images are data URIs
    assert all(s.startswith("data:") or s.startswith("#") for s in c.srcs), c.srcs[:3]
    # every in-page link has its target
    assert all(s[1:] in c.ids for s in c.srcs if s.startswith("#")), sorted(c.ids)
    return " ".join(c.text)


def _flat(obj, prefix=""):
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield from _flat(v, f"{prefix}.{k}" if prefix else k)
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from _flat(v, f"{prefix}.{i}")
    else:
        yield prefix, obj


def _text_of(v):
    # 6 significant digits, the format the report promises in its module docstring
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        return f"{v:.6g}"
    return str(v)


def _save(tmp_path, r, name="res"):
    d = tmp_path / name
    d.mkdir()
    r.save(d)
    write_summary(d, r.summary)
    return d


@pytest.fixture(scope="module")
def shock_result():
    r = source_flow_result(shocks=True)
    r.summary["thrust_coefficient_vacuum"] = 1.2345678
    r.summary["discharge_coefficient"] = 0.99375
    r.summary["note"] = "a <b>tag</b> & amp"
    return r


def test_report_is_valid_and_has_every_summary_number(tmp_path, shock_result):
    from moc.report import build_report

    d = _save(tmp_path, shock_result)
    (d / "export").mkdir()
    (d / "export" / "wall.dxf").write_text("0\nEOF\n")
    (d / ".hidden.tmp").write_text("x")
    page = build_report(shock_result, result_dir=d, recompute=False, dpi=30)
    text = check_html(page)
    for key, v in _flat(shock_result.summary):
        assert key in text, key
        assert _text_of(v) in text, (key, v)
    # escaping: the literal text survives, no stray tag
    assert "a <b>tag</b> & amp" in text
    # the cautions (house rule: hardware can hurt people; defer to codes and licensed review)
    low = text.lower()
    assert "injure or kill" in low
    assert "local codes" in low and "licensed" in low
    # the files of the directory are listed
    assert "result.npz" in text and "summary.json" in text and "export/wall.dxf" in text
    assert ".hidden.tmp" not in text
    # figures embedded as PNG data
    assert page.count('src="data:image/png;base64,') >= 5


def test_report_lists_the_shock(shock_result):
    from moc.report import build_report

    text = check_html(build_report(shock_result, recompute=False, figures=False))
    assert "First coalescence of characteristics at x = 2, y = 0.3" in text
    assert "an internal shock forms" in text


def test_verification_numbers_for_the_exact_flow(shock_result):
    # The source flow is exact: its area ratio equals the isentropic A/A*(2) = 1.6875
    # (Source: NACA Report 1135 closed form; VALIDATION.md: 27/16), so the reported error is 0.
    from moc.report import build_report

    r = source_flow_result()  # a design-kind result
    assert r.summary["area_ratio"] == pytest.approx(27 / 16, rel=1e-12)
    text = check_html(build_report(r, recompute=False, figures=False))
    assert "exit area ratio error against isentropic A/A*" in text
    assert "within 0.01" in text


def test_richardson_extrapolation_recovers_a_second_order_limit():
    # Exact property of Richardson extrapolation (L. F. Richardson 1911; P. J. Roache,
    # J. Fluids Eng. 116, 1994, from memory): if f(n) = f0 + C/n^2 then
    # f(n) + (f(n) - f(n/2))/3 = f0 exactly, and log2(e(n/2)/e(n)) = 2.
    from moc.report import refinement_study

    exact = 27 / 16
    fine, coarse = source_flow_result(n=9), source_flow_result(n=5)
    fine.summary.update(characteristics=40, area_ratio=exact + 3.0 / 40**2, length=7.0 + 0.5 / 40**2)
    coarse.summary.update(characteristics=20, area_ratio=exact + 3.0 / 20**2, length=7.0 + 0.5 / 20**2)
    st = refinement_study(fine, coarse)
    rows = {r["quantity"]: r for r in st["rows"]}
    assert rows["area_ratio"]["extrapolated"] == pytest.approx(exact, rel=1e-13)
    assert rows["length"]["extrapolated"] == pytest.approx(7.0, rel=1e-13)
    assert rows["area_ratio"]["error_estimate"] == pytest.approx(3.0 / 40**2, rel=1e-10)
    assert st["observed_order"] == pytest.approx(2.0, abs=1e-9)


def test_exit_mean_mach_is_area_weighted():
    # Exact: for M(y) = 1 + y on 0..1, the planar mean is 1.5; the axisymmetric
    # (weight r) mean is 1 + 2/3 (elementary integrals; trapezoid error O(h^2)).
    from moc.report import _exit_mach_mean

    r = source_flow_result()
    y = np.linspace(0, 1, 401)
    r.exit = {"x": np.zeros_like(y), "y": y, "mach": 1 + y, "theta": 0 * y}
    assert _exit_mach_mean(r) == pytest.approx(1.5, rel=1e-12)
    r.summary["geometry"] = "axisymmetric"
    assert _exit_mach_mean(r) == pytest.approx(1 + 2 / 3, rel=1e-5)


def test_write_report_atomic_and_refuses_overwrite(tmp_path, shock_result):
    from moc.report import write_report

    d = _save(tmp_path, shock_result)
    p = write_report(d, recompute=False, dpi=20)
    assert p == d / "report.html"
    first = p.read_text()
    check_html(first)
    with pytest.raises(FileExistsRefusal):
        write_report(d, recompute=False)
    assert p.read_text() == first
    with pytest.raises(InputError, match="html"):
        write_report(d, tmp_path / "r.txt", recompute=False)
    with pytest.raises(ResultFileError):
        write_report(tmp_path / "missing", tmp_path / "r.html")
    assert not [q for q in d.iterdir() if q.name.startswith(".")]


def test_cli_report(tmp_path, capsys, shock_result):
    from moc.cli import main

    d = _save(tmp_path, shock_result)
    coarse = _save(tmp_path, source_flow_result(n=5, shocks=True), "coarse")
    out = tmp_path / "rep.html"
    assert main(["report", str(d), "-o", str(out), "--coarse", str(coarse), "--dpi", "20"]) == 0
    assert capsys.readouterr().out.strip() == str(out)
    text = check_html(out.read_text())
    assert "Discretisation error from a coarser net" in text
    assert main(["report", str(d), "-o", str(out)]) == 2
    assert "--force" in capsys.readouterr().err
    # a 'coarse' result that is not coarser is refused with exit status 2
    assert main(["report", str(coarse), "-o", str(tmp_path / "x.html"), "--coarse", str(d)]) == 2
    assert "fewer characteristics" in capsys.readouterr().err
    assert not (tmp_path / "x.html").exists()
    assert main(["report", str(d), "-o", str(out), "--dpi", "0", "--force"]) == 2


def _design_api():
    try:
        from moc.design import design_minimum_length  # noqa: F401
        from moc.pipeline import run_case  # noqa: F401
    except ImportError:
        return False
    return True


@pytest.mark.skipif(not _design_api(), reason="the minimum-length designer is not in this tree yet")
def test_report_of_a_real_design_recomputes_the_coarse_net(tmp_path):
    # Source: VALIDATION.md / NACA Report 1135: the exit area ratio of a shock-free,
    # uniform-exit nozzle equals A/A*(Me), and the mass-flow error vanishes as the
    # net is refined.  Richardson (Roache 1994, from memory): for a second-order
    # net (NUMERICS.md) the extrapolated length from (24, 12) is closer to the
    # n = 48 length than the n = 24 one.
    from moc.design import design_minimum_length
    from moc.io.case import validate
    from moc.io.outputs import write_outputs
    from moc.pipeline import run_case
    from moc.report import build_report, coarse_design, refinement_study

    case = validate({"nozzle": {"exit_mach": 2.0, "geometry": "planar", "characteristics": 24,
                                "throat_size": 5.0, "throat_unit": "mm"}})
    r = run_case(case)
    d = tmp_path / "m2"
    write_outputs(r, d)
    c = coarse_design(r)
    assert c is not None and c.summary["characteristics"] == 12
    st = refinement_study(r, c)
    rows = {q["quantity"]: q for q in st["rows"]}
    # the reported order is log2(e_12 / e_24) of the two nets' own errors (exact limit 0) ...
    mf = rows["mass_flow_error"]
    assert mf["observed_order"] == pytest.approx(
        math.log(abs(c.summary["mass_flow_error"]) / abs(r.summary["mass_flow_error"])) / math.log(2.0), rel=1e-12)
    # ... and shows convergence (the designer's own tests pin its exact order)
    assert 0.5 < mf["observed_order"] < 3.0
    assert st["observed_order_quantity"] in ("area_ratio", "area_ratio_streamline", "mass_flow_error")
    fine48 = design_minimum_length(2.0, 1.4, "planar", 48).summary["length"]
    L = rows["length"]
    assert abs(L["extrapolated"] - fine48) < 0.5 * abs(L["fine"] - fine48)
    text = check_html(build_report(r, result_dir=d, coarse=c, dpi=20))
    for key, v in _flat(r.summary):
        assert _text_of(v) in text, (key, v)
    assert "Observed order of accuracy" in text
    assert math.isfinite(st["observed_order"])


def test_report_of_an_incomplete_analysis(shock_result):
    # null numbers and a missing exit profile are reported, not crashed on
    from moc.report import build_report

    r = copy.deepcopy(shock_result)
    r.exit = {}
    r.summary.update(exit_mach=None, exit_mach_max_dev=None, warnings=["the exit plane was not reached."])
    text = check_html(build_report(r, recompute=False, dpi=20))
    assert "the exit plane was not reached." in text
    assert "Not drawn: the result has no exit profile" in text
    assert "null" in text


def _analysis_api():
    try:
        from moc.analysis.analyze import analyze  # noqa: F401
        from moc.analysis.contour import bell  # noqa: F401
    except ImportError:
        return False
    return True


@pytest.mark.skipif(not _analysis_api(), reason="the contour analysis is not in this tree")
def test_figures_and_report_of_a_real_shock_analysis(tmp_path):
    # A planar parabolic bell turning from 30 to 8 deg in 6 throat units overturns
    # the flow, so its C- characteristics coalesce into an internal shock (common
    # practice: a bell's compression turn makes the well-known internal shock).
    # The drawn shock starts at the reported coalescence point (same result, two readers).
    from moc import plot
    from moc.analysis.analyze import analyze
    from moc.analysis.contour import bell
    from moc.report import build_report

    r = analyze(bell(30, 8, 6.0, geometry="planar"), gamma=1.4, geometry="planar", n=20)
    assert r.summary["shock_free"] is False
    fig = plot.plot_shocks(r)
    line = next(l for l in fig.axes[0].lines if l.get_label() == "shock")
    cp = plot.coalescence_point(r.summary)
    assert (line.get_xdata()[0], line.get_ydata()[0]) == pytest.approx(cp, abs=1e-9)
    d = _save(tmp_path, r)
    text = check_html(build_report(r, result_dir=d, dpi=20))
    assert "an internal shock forms" in text
    assert "a property of the analysed or truncated contour" in text
    for key, v in _flat(r.summary):
        assert _text_of(v) in text, (key, v)


@pytest.mark.skipif(not _design_api(), reason="the designers are not in this tree yet")
def test_coarse_recompute_keeps_the_method_and_truncation():
    # The coarse net must be the same nozzle: same method, throat curvature and
    # inflection angle for a rounded throat, same truncation; only n is halved.
    # Exact for a shock-free exit (NACA Report 1135 area relation; mass conservation):
    # A_e / A* of the rounded-throat design tends to A/A*(2) = 27/16 on both nets.
    from moc.io.case import validate
    from moc.pipeline import run_case
    from moc.report import coarse_design, exact_values

    try:
        from moc.design.gradual import design_gradual  # noqa: F401
        from moc.design.truncate import truncate  # noqa: F401
    except ImportError:
        pytest.skip("rounded-throat designer or truncation not in this tree")
    g = run_case(validate({"nozzle": {"method": "gradual", "exit_mach": 2.0, "geometry": "planar",
                                      "characteristics": 20},
                           "throat": {"curvature": 3.0, "inflection_deg": 9.0}}))
    c = coarse_design(g)
    assert c.summary["characteristics"] == 10
    assert c.summary.get("throat_curvature", c.inputs["design"].get("throat_curvature")) == pytest.approx(3.0)
    assert c.summary.get("inflection_angle_deg") == pytest.approx(g.summary["inflection_angle_deg"])
    assert exact_values(g)["area_ratio_sonic"] == pytest.approx(27 / 16, rel=1e-12)
    for r in (g, c):
        assert r.summary["area_ratio_sonic"] == pytest.approx(27 / 16, rel=2e-3)
    t = run_case(validate({"nozzle": {"exit_mach": 2.0, "geometry": "planar", "characteristics": 20},
                           "truncate": {"length_fraction": 0.8}}))
    ct = coarse_design(t)
    assert ct.summary.get("truncated") and ct.summary["length"] == pytest.approx(t.summary["length"], rel=2e-2)
    assert "area_ratio" not in exact_values(t)


@pytest.mark.skipif(not _design_api(), reason="the minimum-length designer is not in this tree yet")
def test_coarse_net_of_a_design_made_from_python():
    # A Result from design_minimum_length (no case file) is recomputed with n/2 too;
    # its exit area ratio stays the exact A/A*(2.4) = 2.40310 (NACA Report 1135).
    from moc.design import design_minimum_length
    from moc.report import coarse_design

    r = design_minimum_length(2.4, 1.4, "planar", 16)
    c = coarse_design(r)
    assert c is not None and c.summary["characteristics"] == 8
    assert c.summary["area_ratio"] == pytest.approx(2.40310, rel=1e-5)

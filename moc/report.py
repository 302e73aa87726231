"""The design report: one self-contained HTML file per saved result.

`build_report(result, ...)` returns the HTML text; `write_report(...)` writes
it atomically.  The page holds the cautions, the inputs, the key numbers,
the verification figures (mass-flow error, exit area ratio against the
isentropic value, the change from a net of half the characteristics with a
Richardson estimate for a second-order scheme), the shock findings, the
figures (embedded PNG, no outside files), the files of the result directory
and a table of every summary.json key.  Numbers in that table are written
with `fmt_value` (6 significant digits), so any reader can find them.

Richardson extrapolation (L. F. Richardson, Phil. Trans. R. Soc. A 210,
1911; form as in P. J. Roache, J. Fluids Eng. 116(3), 1994, from memory):
with f_h on the fine net and f_2h on a net of half the characteristics,
the fine-net error f_h - f of an order-p scheme is about (f_2h - f_h) / (2^p - 1),
and f_h + (f_h - f_2h) / (2^p - 1) is the extrapolated value.
"""

from __future__ import annotations

import base64
import datetime as _dt
import html
import io
import math
from pathlib import Path

import numpy as np

from moc import __version__
from moc.errors import ComputationError, InputError
from moc.io.atomic import atomic_path, check_writable
from moc.plot import number

CAUTIONS = (
    "Nozzles, rocket motors, pressurised wind tunnels and their test cells can injure or kill people: "
    "pressure vessels burst, hot or toxic jets burn, and parts fail without warning.",
    "Every number here comes from an inviscid, steady, ideal-gas model of the flow. It is a starting point for "
    "design, not a certification of any hardware: it does not account for boundary layers, heat loads, "
    "structural strength, material limits, manufacturing tolerances or off-design starting transients.",
    "Before anything is built or pressurised, follow the local codes and standards that apply (pressure equipment, "
    "explosives and propellants, test-site safety) and have the design reviewed and approved by a licensed, "
    "qualified engineer.",
)

#: Order of accuracy assumed for the Richardson estimate (the net is second order).
RICHARDSON_ORDER = 2

_KEY_NUMBERS = [
    # (summary key, label, unit)
    ("exit_mach", "design exit Mach number", ""),
    ("exit_mach_mean", "mean exit Mach number (computed)", ""),
    ("exit_mach_max_dev", "largest exit Mach-number deviation", ""),
    ("exit_mach_spread", "exit Mach-number spread (max - min)", ""),
    ("area_ratio", "exit area ratio A_exit / A_throat", ""),
    ("area_ratio_sonic", "exit over sonic area A_exit / A* (A* = Cd A_throat)", ""),
    ("area_ratio_full", "exit area ratio of the untruncated contour", ""),
    ("area_ratio_isentropic", "isentropic A/A* at the exit Mach number", ""),
    ("length", "length, throat to exit", "throat units"),
    ("length_real", "length, throat to exit", "@unit"),
    ("length_full", "length of the untruncated contour", "throat units"),
    ("truncation_thrust_loss_fraction", "vacuum thrust lost by the truncation (fraction)", ""),
    ("throat_size", "throat size (radius or half-height)", "@unit"),
    ("exit_size_real", "exit size (radius or half-height)", "@unit"),
    ("corner_angle_deg", "throat corner angle", "deg"),
    ("inflection_angle_deg", "inflection (largest) wall angle", "deg"),
    ("inflection_deg", "inflection (largest) wall angle", "deg"),
    ("throat_curvature", "throat wall radius of curvature / throat size", ""),
    ("max_wall_angle_deg", "largest wall angle", "deg"),
    ("exit_flow_angle_max_deg", "largest exit flow angle", "deg"),
    ("discharge_coefficient", "discharge coefficient Cd", ""),
    ("discharge_coefficient_published", "discharge coefficient from the published throat solution", ""),
    ("thrust_coefficient", "thrust coefficient C_F (at the given ambient)", ""),
    ("thrust_coefficient_vacuum", "vacuum thrust coefficient", ""),
    ("thrust_coefficient_ideal_1d", "ideal one-dimensional vacuum thrust coefficient", ""),
    ("thrust_coefficient_ideal_1d_ambient", "ideal one-dimensional thrust coefficient at the given ambient", ""),
    ("thrust_ratio_to_ideal", "thrust over the ideal one-dimensional value", ""),
    ("divergence_efficiency", "divergence efficiency", ""),
    ("mass_flow_parameter", "mass-flow parameter mdot sqrt(R T0) / (p0 A*)", ""),
    ("wetted_area", "wetted wall area", "(throat size)^2"),
    ("mass_flow_kg_s", "mass flow at the given chamber state", "kg/s"),
    ("thrust_N", "thrust at the given chamber and ambient state", "N"),
    ("thrust_vacuum_N", "vacuum thrust at the given chamber state", "N"),
    ("characteristics", "characteristics in the net", ""),
    ("points", "points in the net", ""),
]

_CSS = """
body{font-family:system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;margin:0;color:#1a1a1a;background:#fbfbf8}
main{max-width:1050px;margin:0 auto;padding:1.2rem 1.5rem 3rem}
h1{font-size:1.55rem;margin:.4rem 0 .2rem}h2{font-size:1.15rem;margin:2rem 0 .5rem;border-bottom:2px solid #0B4F8A;padding-bottom:.2rem}
.sub{color:#555;margin:0 0 1rem}
.caution{border:3px solid #D55E00;background:#fff4ec;padding:.6rem 1rem;margin:1rem 0}
.caution strong{color:#8a3200}
table{border-collapse:collapse;margin:.4rem 0;font-size:.92rem}
th,td{border:1px solid #c9c9c9;padding:.22rem .55rem;text-align:left;vertical-align:top}
th{background:#eef2f6}td.num{text-align:right;white-space:nowrap;font-variant-numeric:tabular-nums;font-family:ui-monospace,monospace}
.ok{color:#005f46;font-weight:600}.warn{color:#8a3200;font-weight:600}
figure{margin:1rem 0}figure img{max-width:100%;border:1px solid #ddd;background:#fff}
figcaption{font-size:.88rem;color:#444}
code{font-family:ui-monospace,monospace;font-size:.9em}
nav{font-size:.9rem;margin:.3rem 0 1rem}nav a{margin-right:.9rem;color:#0B4F8A}
@media print{nav{display:none}figure,table{break-inside:avoid}body{background:#fff}}
"""


# -- formatting ------------------------------------------------------------------
def fmt_value(v):
    """Text of one summary value: floats to 6 significant digits, JSON words for bool/None."""
    if isinstance(v, bool):
        return "true" if v else "false"
    if v is None:
        return "null"
    if isinstance(v, (int, np.integer)):
        return str(int(v))
    if isinstance(v, (float, np.floating)):
        return f"{float(v):.6g}"
    return str(v)


def flatten(obj, prefix=""):
    """(dotted key, scalar value) pairs of a nested dict/list, in sorted key order."""
    out = []
    if isinstance(obj, dict):
        for k in sorted(obj, key=str):
            out += flatten(obj[k], f"{prefix}.{k}" if prefix else str(k))
    elif isinstance(obj, (list, tuple)):
        if not obj:
            out.append((prefix, "[]"))
        for i, v in enumerate(obj):
            out += flatten(v, f"{prefix}.{i}" if prefix else str(i))
    else:
        out.append((prefix, obj))
    return out


def _e(text):
    return html.escape(str(text), quote=True)


def _table(rows, head=None, num_cols=()):
    parts = ["<table>"]
    if head:
        parts.append("<thead><tr>" + "".join(f"<th>{_e(h)}</th>" for h in head) + "</tr></thead>")
    parts.append("<tbody>")
    for row in rows:
        cells = []
        for i, c in enumerate(row):
            cls = ' class="num"' if i in num_cols else ""
            cells.append(f"<td{cls}>{c}</td>")
        parts.append("<tr>" + "".join(cells) + "</tr>")
    parts.append("</tbody></table>")
    return "".join(parts)


# -- verification numbers -------------------------------------------------------
def _exit_mach_mean(result):
    """Mean Mach number across the exit, weighted by area (y^delta dy, trapezoidal)."""
    ey = np.asarray(result.exit.get("y", []), dtype=float)
    em = np.asarray(result.exit.get("mach", []), dtype=float)
    if ey.size < 2 or em.size != ey.size:
        return None
    o = np.argsort(ey)
    ey, em = ey[o], em[o]
    w = ey if str(result.summary.get("geometry", "")).startswith("axi") else np.ones_like(ey)
    dy = np.diff(ey)
    den = float(np.sum(0.5 * (w[1:] + w[:-1]) * dy))
    if not den > 0:
        return None
    f = w * em
    return float(np.sum(0.5 * (f[1:] + f[:-1]) * dy) / den)


def _quantities(result):
    """The numbers compared between fine and coarse nets."""
    s = result.summary
    q = {}
    for k in ("area_ratio", "area_ratio_sonic", "area_ratio_streamline", "length", "mass_flow_error", "wall_streamline_difference",
              "exit_mach_max_dev", "thrust_coefficient_vacuum", "discharge_coefficient", "max_wall_angle_deg",
              "corner_angle_deg"):
        v = s.get(k)
        if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v):
            q[k] = float(v)
    m = s.get("exit_mach_mean")
    if not (isinstance(m, (int, float)) and not isinstance(m, bool) and math.isfinite(m)):
        m = _exit_mach_mean(result)
    if m is not None:
        q["exit_mach_mean"] = float(m)
    return q


def exact_values(result):
    """Quantities whose exact value is known for a shock-free, uniform-exit design.

    The exit area ratio (by mass balance or by streamline tracing) must equal
    the isentropic A/A*(Me) (mass conservation; NACA Report 1135 area
    relation); the mass-flow error and the difference between the two wall
    constructions vanish in the limit.
    """
    s = result.summary
    ex = {"mass_flow_error": 0.0, "wall_streamline_difference": 0.0}
    ari = number(s, "area_ratio_isentropic")
    if ari is None or s.get("shock_free", True) is False or s.get("truncated"):
        return ex  # a truncated contour ends before the design exit Mach number
    if "area_ratio_sonic" in s:
        # rounded throat: the exit area over the sonic area A* = Cd x geometric throat
        ex["area_ratio_sonic"] = ari
    else:
        ex["area_ratio"] = ari
        ex["area_ratio_streamline"] = ari
    return ex


def refinement_study(fine, coarse, order=RICHARDSON_ORDER):
    """Compare a result with one from a net of fewer (normally half the) characteristics.

    Returns rows (quantity, fine, coarse, difference, Richardson estimate of
    the fine value's error, extrapolated value) and, where the exact value is
    known (`exact_values`), the observed order log(e_coarse / e_fine) / log(n_fine / n_coarse).
    """
    qf, qc = _quantities(fine), _quantities(coarse)
    nf, nc = fine.summary.get("characteristics"), coarse.summary.get("characteristics")
    ratio_n = 2.0
    if isinstance(nf, (int, float)) and isinstance(nc, (int, float)):
        if not nf > nc > 0:
            raise InputError(f"the coarse result has {nc} characteristics and the reported one {nf}; "
                             "the coarse net must have fewer characteristics (normally half).")
        ratio_n = float(nf) / float(nc)
    factor = ratio_n**order - 1.0
    exact = exact_values(fine)
    rows = []
    for k in qf:
        if k not in qc:
            continue
        d = qf[k] - qc[k]
        err = -d / factor  # estimated (fine - exact)
        row = {"quantity": k, "fine": qf[k], "coarse": qc[k], "difference": d,
               "error_estimate": err, "extrapolated": qf[k] - err}
        if k in exact:
            ef, ec = abs(qf[k] - exact[k]), abs(qc[k] - exact[k])
            row["exact"] = exact[k]
            row["error_fine"] = ef
            row["error_coarse"] = ec
            # an error at rounding level carries no order
            if ef > 1e-12 * max(1.0, abs(exact[k])) and ec > 0:
                row["observed_order"] = math.log(ec / ef) / math.log(ratio_n)
        rows.append(row)
    out = {"rows": rows, "order_assumed": order, "n_fine": nf, "n_coarse": nc, "refinement_ratio": ratio_n}
    by = {r["quantity"]: r for r in rows}
    for k in ("area_ratio", "area_ratio_sonic", "area_ratio_streamline", "mass_flow_error"):
        if "observed_order" in by.get(k, {}):
            out["observed_order"] = by[k]["observed_order"]
            out["observed_order_quantity"] = k
            break
    return out


def coarse_design(result):
    """Recompute the same design with half the characteristics, or return None if that is not possible.

    Uses the case stored in the result's inputs and the pipeline that made it.
    Analyses and results without a stored case give None.
    """
    if result.kind != "design":
        return None
    inputs = result.inputs or {}
    case = inputs.get("case")
    if not isinstance(case, dict) or "nozzle" not in case:
        return _coarse_from_designer_inputs(inputs)
    try:
        from moc.io.case import SCHEMA, validate
        from moc.pipeline import run_case
    except ImportError:
        return None
    raw = {}
    for sec, spec in SCHEMA.items():
        given = case.get(sec or "meta")
        if not isinstance(given, dict):
            continue
        kept = {k: v for k, v in given.items() if k in spec and v is not None}
        if sec:
            raw[sec] = kept
        else:  # top-level keys (title, description) are stored as 'meta'
            raw.update(kept)
    n = int(raw["nozzle"]["characteristics"])
    nc = max(3, n // 2)
    if nc >= n:
        return None
    raw["nozzle"]["characteristics"] = nc
    raw.setdefault("output", {})["plots"] = False
    try:
        return run_case(validate(raw, source="stored inputs"))
    except (InputError, ComputationError):
        return None


def _coarse_from_designer_inputs(d):
    """Coarse net for a Result made by a designer called directly (its inputs are the designer's arguments)."""
    try:
        n = int(d["characteristics"])
        common = dict(exit_mach=float(d["exit_mach"]), gamma=float(d["gamma"]), geometry=str(d["geometry"]))
    except (KeyError, TypeError, ValueError):
        return None
    nc = max(3, n // 2)
    if nc >= n or d.get("truncate"):
        return None
    try:
        if d.get("method") == "minimum_length":
            from moc.design import design_minimum_length

            return design_minimum_length(n=nc, **common)
        if d.get("method") == "gradual":
            from moc.design.gradual import design_gradual

            kw = {k: d[k] for k in ("throat_curvature", "inflection_deg", "throat_solution") if d.get(k) is not None}
            return design_gradual(n=nc, **common, **kw)
    except (ImportError, InputError, ComputationError):
        return None
    return None


# -- figures --------------------------------------------------------------------
def _png_data_uri(fig, dpi=96):
    import matplotlib.pyplot as plt

    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi)
    plt.close(fig)
    return "data:image/png;base64," + base64.b64encode(buf.getvalue()).decode("ascii")


def _figures(result, dpi):
    from moc import plot

    items = [
        ("mach", "Mach-number field over the characteristic net; the wall in black, the centreline dash-dotted."),
        ("net", "Characteristic net: C+ lines solid (blue), C- lines dashed (vermillion)."),
        ("wall", "Wall contour with the throat, exit and length dimensions."),
        ("distributions", "Mach number and static pressure along the wall and the centreline."),
        ("exit", "Exit profile: Mach number and flow angle across the exit section."),
    ]
    if result.shocks or result.summary.get("shocks") or plot.coalescence_point(result.summary):
        items.append(("shocks", "Internal shocks and the first coalescence of characteristics."))
    out = []
    for name, caption in items:
        try:
            fig = plot.figure_for(result, name)
        except InputError as exc:  # e.g. no exit profile in this result
            out.append((name, None, f"{caption} Not drawn: {exc}"))
            continue
        out.append((name, _png_data_uri(fig, dpi), caption))
    return out


# -- the page -------------------------------------------------------------------
def _unit(result):
    t = result.inputs.get("throat") if isinstance(result.inputs, dict) else None
    if isinstance(t, dict) and t.get("unit"):
        return str(t["unit"])
    return str(result.summary.get("throat_unit", ""))


def _key_rows(result):
    s = result.summary
    unit = _unit(result)
    rows = []
    extra = dict(s)
    if "exit_mach_mean" not in extra:
        m = _exit_mach_mean(result)
        if m is not None:
            extra["exit_mach_mean"] = m
    for key, label, u in _KEY_NUMBERS:
        v = extra.get(key)
        if v is None or isinstance(v, (dict, list)):
            continue
        if key == "exit_mach" and result.kind != "design":
            label = "exit Mach number (as the analysis reports it)"
        u = unit if u == "@unit" else u
        rows.append((_e(label), _e(fmt_value(v)), _e(u), f"<code>{_e(key)}</code>"))
    return rows


def _verification(result, study):
    s = result.summary
    rows = []

    def add(label, value, tol=None, note=""):
        if not isinstance(value, (int, float)) or isinstance(value, bool) or not math.isfinite(value):
            return
        status = ""
        if tol is not None:
            good = abs(float(value)) <= tol
            status = f'<span class="{"ok" if good else "warn"}">{"within" if good else "above"} {tol:g}</span>'
        rows.append((_e(label), _e(fmt_value(value)), status, _e(note)))

    design = result.kind == "design"
    add("mass-flow error (wall streamline vs throat flux)", s.get("mass_flow_error"), 1e-2,
        "relative; from the designer")
    ar, ari, arf = number(s, "area_ratio"), number(s, "area_ratio_isentropic"), number(s, "area_ratio_full")
    if number(s, "area_ratio_error") is not None:
        add("exit area ratio error against isentropic A/A*", number(s, "area_ratio_error"), 1e-2,
            "relative, A* the sonic area (Cd times the geometric throat for a rounded throat); "
            "exact for a uniform, shock-free exit (mass conservation)")
    elif s.get("truncated") and arf is not None and ari:
        add("untruncated contour: exit area ratio error against isentropic A/A*", arf / ari - 1.0, 1e-2,
            "relative; the truncated contour ends before the design exit Mach number")
    elif ar is not None and ari and design:
        add("exit area ratio error against isentropic A/A*", ar / ari - 1.0, 1e-2,
            "relative; exact for a uniform, shock-free exit (mass conservation)")
    uniform_exit = design and not s.get("truncated")
    add("largest exit Mach-number deviation", s.get("exit_mach_max_dev"), 1e-2 if uniform_exit else None,
        "absolute, across the exit" + ("" if uniform_exit else
                                       "; a property of the analysed or truncated contour, not an error"))
    add("two wall constructions differ by (mass balance vs streamline)", s.get("wall_streamline_difference"),
        1e-2, "largest distance, throat units")
    parts = [_table(rows, head=("check", "value", "status", "note"), num_cols=(1,))] if rows else [
        "<p>No verification numbers are stored in this result.</p>"]
    if study is None:
        parts.append("<p>No coarse-net comparison: the result does not carry a case that can be recomputed, "
                     "and no coarse result was given (<code>moc report DIR --coarse COARSE_DIR</code>).</p>")
    else:
        nf, nc = study.get("n_fine"), study.get("n_coarse")
        parts.append(f"<p>Discretisation error from a coarser net ({_e(fmt_value(nc))} characteristics against "
                     f"{_e(fmt_value(nf))}), Richardson estimate for order {study['order_assumed']}: "
                     "error of the fine value about (coarse - fine) / (r^2 - 1) with r the ratio of the "
                     "numbers of characteristics (3 for r = 2); the extrapolated value is the fine value "
                     "minus that error.</p>")
        rr = [(f"<code>{_e(r['quantity'])}</code>", _e(fmt_value(r["fine"])), _e(fmt_value(r["coarse"])),
               _e(fmt_value(r["difference"])), _e(fmt_value(r["error_estimate"])), _e(fmt_value(r["extrapolated"])),
               _e(fmt_value(r["exact"])) if "exact" in r else "",
               _e(fmt_value(r["observed_order"])) if "observed_order" in r else "")
              for r in study["rows"]]
        parts.append(_table(rr, head=("quantity", "fine", "coarse", "fine - coarse", "error estimate",
                                      "extrapolated", "exact", "observed order"),
                            num_cols=(1, 2, 3, 4, 5, 6, 7)))
        if "observed_order" in study:
            parts.append(f"<p>Observed order of accuracy from <code>{_e(study['observed_order_quantity'])}</code> "
                         f"against its exact value: {_e(fmt_value(study['observed_order']))} "
                         f"(the scheme is designed for {study['order_assumed']}).</p>")
    return "".join(parts)


def _shock_section(result):
    from moc.plot import coalescence_point

    s = result.summary
    parts = []
    sf = s.get("shock_free")
    if sf is True:
        parts.append('<p class="ok">No internal shock: no two characteristics of one family cross inside the nozzle.</p>')
    elif sf is False:
        parts.append('<p class="warn">The characteristics of one family cross: an internal shock forms.</p>')
    cp = coalescence_point(s)
    if cp is not None:
        parts.append(f"<p>First coalescence of characteristics at x = {_e(fmt_value(cp[0]))}, "
                     f"y = {_e(fmt_value(cp[1]))} (throat units).</p>")
    shocks = s.get("shocks") or []
    rows = []
    for k, sh in enumerate(shocks if isinstance(shocks, list) else []):
        if not isinstance(sh, dict):
            continue
        rows.append((str(k + 1),) + tuple(_e(fmt_value(sh.get(q))) for q in
                                         ("start_x", "start_y", "end_x", "end_y", "max_pressure_ratio",
                                          "total_pressure_ratio")) + (_e(sh.get("fate", "")),))
    if rows:
        parts.append(_table(rows, head=("shock", "start x", "start y", "end x", "end y", "max p2/p1",
                                        "p02/p01", "fate"), num_cols=(1, 2, 3, 4, 5, 6)))
    elif result.shocks:
        for k, sh in enumerate(result.shocks):
            x = np.asarray(sh.get("x", []), dtype=float)
            p = np.asarray(sh.get("p2_p1", []), dtype=float)
            if x.size:
                parts.append(f"<p>Shock {k + 1}: from x = {_e(fmt_value(float(x[0])))} to "
                             f"{_e(fmt_value(float(x[-1])))}"
                             + (f", largest p2/p1 = {_e(fmt_value(float(p.max())))}" if p.size else "") + ".</p>")
    if not parts:
        if result.kind == "design":
            parts.append("<p>This design records no shock check. A contour traced through a shock-free net is "
                         "shock-free by construction; run <code>moc analyze</code> on the built, truncated or "
                         "modified contour to look for internal shocks.</p>")
        else:
            parts.append("<p>This result records no shock analysis.</p>")
    return "".join(parts)


def _files_section(directory):
    if directory is None:
        return "<p>No result directory given.</p>"
    d = Path(directory)
    files = []
    if d.is_dir():
        # the directory and its sub-directories (moc export writes DIR/export/ by default), two levels deep
        for p in sorted(d.rglob("*")):
            rel = p.relative_to(d)
            if p.is_file() and len(rel.parts) <= 3 and not any(part.startswith(".") for part in rel.parts):
                files.append((rel.as_posix(), p.stat().st_size))
    if not files:
        return "<p>No files found.</p>"
    rows = [(f"<code>{_e(name)}</code>", _e(f"{size:,}")) for name, size in files]
    return _table(rows, head=("file", "bytes"), num_cols=(1,))


def _inputs_section(result):
    flat = flatten(result.inputs or {})
    if not flat:
        return "<p>No inputs stored.</p>"
    rows = [(f"<code>{_e(k)}</code>", _e(fmt_value(v))) for k, v in flat]
    return _table(rows, head=("input", "value"))


def build_report(result, result_dir=None, coarse=None, recompute=True, figures=True, dpi=96):
    """Return the report of `result` as one self-contained HTML string.

    coarse: an optional Result of the same design on a coarser net; when absent
    and `recompute` is true, the design is recomputed with half the
    characteristics when the stored inputs allow it.
    """
    s = result.summary
    if not isinstance(s, dict):
        raise InputError("the result has no summary to report.")
    if coarse is None and recompute:
        coarse = coarse_design(result)
    study = refinement_study(result, coarse) if coarse is not None else None
    meta = ((result.inputs or {}).get("case") or {}).get("meta") or {}
    title = meta.get("title") if isinstance(meta, dict) else None
    if not title and isinstance(s.get("contour"), str) and s["contour"] != "contour":
        title = s["contour"]
    kind = "Nozzle design" if result.kind == "design" else "Nozzle analysis"
    head = f"{kind}: {title}" if title else kind
    when = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    geo = s.get("geometry", "")
    g, me = number(s, "gamma"), number(s, "exit_mach")
    sub = ", ".join(b for b in (str(geo), f"gamma = {fmt_value(g)}" if g is not None else "",
                                f"exit M = {fmt_value(me)}" if me is not None else "") if b)
    caution_html = "".join(f"<p>{_e(c)}</p>" for c in CAUTIONS)
    body = [
        f"<h1>{_e(head)}</h1>",
        f'<p class="sub">{_e(sub)}. Written by moc {_e(__version__)} on {_e(when)}. '
        "Lengths in throat units are over the throat radius (axisymmetric) or half-height (planar).</p>",
        '<nav>' + "".join(f'<a href="#{a}">{t}</a>' for a, t in (
            ("key", "Key numbers"), ("verification", "Verification"), ("shocks", "Shocks"),
            ("figures", "Figures"), ("inputs", "Inputs"), ("files", "Files"), ("summary", "All summary values"))
            if figures or a != "figures") + '</nav>',
        f'<section class="caution" id="caution"><p><strong>Safety caution.</strong></p>{caution_html}</section>',
        '<h2 id="key">Key numbers</h2>',
        _table(_key_rows(result), head=("quantity", "value", "unit", "summary key"), num_cols=(1,)),
        '<h2 id="verification">Verification</h2>',
        _verification(result, study),
        '<h2 id="shocks">Shocks</h2>',
        _shock_section(result),
    ]
    warns = s.get("warnings")
    if isinstance(warns, list) and warns:
        body.append('<h2 id="warnings">Warnings from the computation</h2>')
        body.append("<ul>" + "".join(f"<li>{_e(w)}</li>" for w in warns) + "</ul>")
    if figures:
        body.append('<h2 id="figures">Figures</h2>')
        for name, uri, caption in _figures(result, dpi):
            if uri is None:
                body.append(f"<p>{_e(caption)}</p>")
            else:
                body.append(f'<figure id="fig-{_e(name)}"><img src="{uri}" alt="{_e(name)} figure">'
                            f"<figcaption>{_e(caption)}</figcaption></figure>")
    body += [
        '<h2 id="inputs">Inputs</h2>', _inputs_section(result),
        '<h2 id="files">Files in the result directory</h2>', _files_section(result_dir),
        '<h2 id="summary">Every summary.json value</h2>',
        _table([(f"<code>{_e(k)}</code>", _e(fmt_value(v))) for k, v in flatten(s)], head=("key", "value"),
               num_cols=(1,)),
        f'<section class="caution"><p><strong>Caution.</strong> {_e(CAUTIONS[2])}</p></section>',
    ]
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            f"<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{_e(head)}</title>\n"
            f"<style>{_CSS}</style>\n</head>\n<body>\n<main>\n" + "\n".join(body) + "\n</main>\n</body>\n</html>\n")


def write_report(result_dir, path=None, force=False, coarse=None, recompute=True, dpi=96):
    """Load DIR's result and write its HTML report (default DIR/report.html) atomically; return the path."""
    from moc.result import Result

    result = Result.load(result_dir)
    if Path(result_dir).is_file():  # a result.npz path: its directory is the result directory
        result_dir = Path(result_dir).parent
    path = Path(path) if path is not None else Path(result_dir) / "report.html"
    if path.suffix.lower() not in (".html", ".htm"):
        raise InputError(f"the report is an HTML file; give a name ending in .html, got {path.name!r}.")
    check_writable([path], force)
    if coarse is not None and not hasattr(coarse, "summary"):
        coarse = Result.load(coarse)
    text = build_report(result, result_dir=result_dir, coarse=coarse, recompute=recompute, dpi=dpi)
    with atomic_path(path, force=force) as tmp:
        tmp.write_text(text, encoding="utf-8")
    return path

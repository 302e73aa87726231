"""Figures of a saved design or analysis (matplotlib, headless Agg backend).

Every function reads a `moc.result.Result` and nothing else; none recomputes
the flow.  Lengths are drawn in real units when the inputs give the throat
size (``inputs["throat"] = {"value": ..., "unit": ...}``), else in throat
half-heights / radii.  Angles are shown in degrees.

The look is this project's own: the two characteristic families differ in
colour *and* line style (C+ solid, C- dashed) so grey-scale prints keep them
apart; colours come from a colour-blind-safe set (Okabe and Ito, "Color
Universal Design", 2008, from memory) and the Mach field uses the
perceptually uniform, colour-vision-deficiency-friendly ``cividis`` map
(Nunez, Anderton and Renslow, PLOS ONE 13(7), 2018, from memory).

Public API: plot_net, plot_mach_field, plot_wall, plot_distributions,
plot_exit, plot_shocks, plot_overview, figure_for, unavailable,
triangulation, coalescence_point, save_figure, overview, FIGURES, SIZES.
"""

from __future__ import annotations

from pathlib import Path

import matplotlib

matplotlib.use("Agg")  # headless: never needs a display

import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.figure import Figure  # noqa: E402
from matplotlib.ticker import FuncFormatter, MaxNLocator  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402

from moc.errors import ExportError, InputError  # noqa: E402
from moc.io.atomic import atomic_path  # noqa: E402

# -- palette (colour-blind safe, distinct in grey-scale through style too) ----
INK = "#1a1a1a"          # wall, text
CPLUS = "#0B4F8A"        # deep blue, solid (darker than C- in grey-scale)
CMINUS = "#D55E00"       # vermillion, dashed
AXIS = "#7a7a7a"         # centreline, dash-dot
SHOCK = "#CC79A7"        # reddish purple, thick with markers
ACCENT = "#009E73"       # bluish green (exit / second curve)
ACCENT2 = "#E69F00"      # orange
CMAP = "cividis"

STYLE = {
    "cplus": dict(color=CPLUS, linestyle="-", linewidth=0.55),
    "cminus": dict(color=CMINUS, linestyle=(0, (4, 2)), linewidth=0.55),
    "wall": dict(color=INK, linestyle="-", linewidth=2.0),
    "axis": dict(color=AXIS, linestyle="-.", linewidth=0.9),
    "shock": dict(color=SHOCK, linestyle="-", linewidth=2.2, marker="D", markersize=3.5,
                  markevery=0.1),
}

#: Formats `save_figure` writes, by file suffix.
FORMATS = ("png", "svg", "pdf")

#: Figure names accepted by `moc plot --what` and `figure_for`, in order.
FIGURES = ("net", "mach", "wall", "distributions", "exit", "shocks")

#: Default figure size in inches (width, height) of each named figure.
SIZES = {
    "net": (10.0, 4.8),
    "mach": (10.0, 4.8),
    "wall": (10.0, 4.8),
    "distributions": (9.0, 7.0),
    "exit": (9.0, 4.2),
    "shocks": (10.0, 4.8),
    "overview": (10.0, 8.0),
}

_MAX_LINES = 80  # per family, so that very fine nets stay legible


# -- helpers -------------------------------------------------------------------
def number(mapping, key):
    """mapping[key] as a finite float, or None when absent, null, not a number, NaN or infinite."""
    v = mapping.get(key) if isinstance(mapping, dict) else None
    if v is None or isinstance(v, (bool, dict, list, str)):
        return None
    try:
        f = float(v)
    except (TypeError, ValueError):
        return None
    return f if np.isfinite(f) else None


def _geometry(result):
    return str(result.summary.get("geometry", result.inputs.get("geometry", "planar")))


def _is_axi(result):
    return _geometry(result).lower().startswith("axi")


def length_scale(result):
    """Return (scale, unit, real) so that real length = scale * throat-units length.

    When the inputs give no throat size the scale is 1 and the unit names
    the throat half-height (planar) or radius (axisymmetric).
    """
    t = result.inputs.get("throat") if isinstance(result.inputs, dict) else None
    if isinstance(t, dict) and "value" in t:
        try:
            v = float(t["value"])
        except (TypeError, ValueError):
            v = float("nan")
        if np.isfinite(v) and v > 0:
            return v, str(t.get("unit", "")), True
    return 1.0, ("r*" if _is_axi(result) else "h*"), False


def _len_label(result, coord):
    scale, unit, real = length_scale(result)
    if real:
        return f"{coord} ({unit})"
    return f"{coord} / {unit}"


def _radial_name(result):
    return "r" if _is_axi(result) else "y"


def _new_axes(ax, size):
    if ax is not None:
        return ax.figure, ax
    fig = Figure(figsize=size, layout="constrained")
    return fig, fig.add_subplot(1, 1, 1)


def _arr(d, key):
    v = d.get(key) if isinstance(d, dict) else None
    if v is None:
        return np.zeros(0)
    try:
        return np.asarray(v, dtype=float).ravel()
    except (TypeError, ValueError):
        raise InputError(f"the result's {key!r} array is not numeric; the saved result is damaged.") from None


def _require_wall(result):
    x, y = _arr(result.wall, "x"), _arr(result.wall, "y")
    if x.size < 2 or x.size != y.size:
        raise InputError("the result has no wall contour (need at least two wall points x, y) to draw.")
    return x, y


def _subsample(lines, limit):
    """Every k-th line (a uniform stride, so no lone gaps), always with the first and last."""
    if len(lines) <= limit:
        return lines
    k = -(-len(lines) // limit)
    keep = list(range(0, len(lines), k))
    if keep[-1] != len(lines) - 1:
        keep.append(len(lines) - 1)
    return [lines[i] for i in keep]


def _draw_wall(ax, result, scale, label="wall"):
    x, y = _arr(result.wall, "x"), _arr(result.wall, "y")
    if x.size:
        ax.plot(x * scale, y * scale, label=label, zorder=5, **STYLE["wall"])
    ix, iy = _arr(result.inlet, "x"), _arr(result.inlet, "y")
    if ix.size and ix.size == iy.size:
        ax.plot(ix * scale, iy * scale, zorder=5, **STYLE["wall"])


def _draw_axis(ax, result, scale):
    xs = [a[np.isfinite(a)] for a in (_arr(result.wall, "x"), _arr(result.inlet, "x"), result.net.x)]
    xs = [a for a in xs if a.size]
    if not xs:
        return
    lo = min(float(a.min()) for a in xs)
    hi = max(float(a.max()) for a in xs)
    ax.plot([lo * scale, hi * scale], [0.0, 0.0], label="centreline", zorder=4, **STYLE["axis"])


def _finish_xy(ax, result, title):
    ax.set_xlabel(_len_label(result, "x"))
    ax.set_ylabel(_len_label(result, _radial_name(result)))
    ax.set_aspect("equal", adjustable="datalim")
    ax.grid(True, color="#d9d9d9", linewidth=0.5)
    ax.set_title(title, loc="left", fontsize=11)


def _title(result, what):
    s = result.summary
    bits = [what]
    me, g = number(s, "exit_mach"), number(s, "gamma")
    if me is not None:
        bits.append(f"exit M = {me:.4g}")
    if g is not None:
        bits.append(f"gamma = {g:.4g}")
    bits.append(_geometry(result))
    return ", ".join(bits)


# -- the figures ---------------------------------------------------------------
def plot_net(result, ax=None, max_lines=_MAX_LINES):
    """Draw the characteristic net: C+ solid blue, C- dashed vermillion, the wall and axis."""
    fig, ax = _new_axes(ax, SIZES["net"])
    net = result.net
    scale, _, _ = length_scale(result)
    if net.size == 0:
        raise InputError("the result has an empty characteristic net; nothing to draw.")
    pts = np.column_stack([net.x, net.y]) * scale
    for fam, key, name in (("+", "cplus", "C+ (left-running)"), ("-", "cminus", "C- (right-running)")):
        lines = [idx for idx in net.lines(fam) if idx.size >= 2]
        lines = _subsample(lines, max_lines)
        if lines:
            lc = LineCollection([pts[idx] for idx in lines], label=name, zorder=2, **STYLE[key])
            ax.add_collection(lc)
    _draw_wall(ax, result, scale)
    _draw_axis(ax, result, scale)
    ax.autoscale_view()
    ax.legend(loc="upper left", fontsize=8, framealpha=0.9)
    _finish_xy(ax, result, _title(result, "Characteristic net"))
    return fig


def triangulation(result):
    """Triangles of the net: each quad cell split in two; repeated indices give triangles.

    Only points with finite x, y and Mach number are used; cells touching any
    other point, and cells of zero area, are dropped.  The returned
    Triangulation carries `point_index`, the net index of each of its points.
    Without cells, a Delaunay triangulation of the points is used, with
    triangles much longer than the typical edge masked so that concave
    outlines are not filled across.
    """
    net = result.net
    scale, _, _ = length_scale(result)
    good = np.isfinite(net.x) & np.isfinite(net.y) & np.isfinite(net.mach)
    keep = np.flatnonzero(good)
    if keep.size < 3:
        raise InputError("the net has fewer than three points with finite values; no Mach field can be drawn.")
    new = -np.ones(net.size, dtype=np.int64)
    new[keep] = np.arange(keep.size)
    x, y = net.x[keep] * scale, net.y[keep] * scale
    c = net.cells
    t = np.zeros((0, 3), dtype=np.int64)
    if c.size:
        c = c[np.all((c >= 0) & (c < net.size), axis=1)]
        c = new[c]
        t = np.vstack([c[:, [0, 1, 2]], c[:, [0, 2, 3]]])
        t = t[np.all(t >= 0, axis=1)]
        t = t[(t[:, 0] != t[:, 1]) & (t[:, 1] != t[:, 2]) & (t[:, 0] != t[:, 2])]
        area = 0.5 * ((x[t[:, 1]] - x[t[:, 0]]) * (y[t[:, 2]] - y[t[:, 0]])
                      - (x[t[:, 2]] - x[t[:, 0]]) * (y[t[:, 1]] - y[t[:, 0]]))
        big = max(1.0, float(np.ptp(x) * np.ptp(y)))
        t = t[np.abs(area) > 1e-14 * big]
        area = area[np.abs(area) > 1e-14 * big]
        # matplotlib wants counter-clockwise triangles
        t = np.where((area < 0)[:, None], t[:, [0, 2, 1]], t)
    if len(t):
        tri = Triangulation(x, y, t)
    else:
        tri = Triangulation(x, y)
        e = np.hypot(np.diff(x[tri.triangles][:, [0, 1, 2, 0]], axis=1),
                     np.diff(y[tri.triangles][:, [0, 1, 2, 0]], axis=1)).max(axis=1)
        tri.set_mask(e > 5.0 * np.median(e))
    tri.point_index = keep
    return tri


def plot_mach_field(result, ax=None, levels=24, show_net=True):
    """Filled Mach-number contours on the triangulated net, with a labelled colour bar."""
    fig, ax = _new_axes(ax, SIZES["mach"])
    net = result.net
    tri = triangulation(result)
    m = net.mach[tri.point_index]
    lo, hi = float(m.min()), float(m.max())
    if hi - lo < 1e-9:
        hi = lo + 1e-6
    cs = ax.tricontourf(tri, m, levels=np.linspace(lo, hi, levels + 1), cmap=CMAP, zorder=1)
    scale, _, _ = length_scale(result)
    _fill_uniform_region(ax, result, scale, cs)
    if show_net:
        pts = np.column_stack([net.x, net.y]) * scale
        for fam, key in (("+", "cplus"), ("-", "cminus")):
            lines = _subsample([i for i in net.lines(fam) if i.size >= 2], 30)
            st = dict(STYLE[key])
            st.update(color="white", linewidth=0.35, alpha=0.55)
            ax.add_collection(LineCollection([pts[i] for i in lines], zorder=2, **st))
    _draw_wall(ax, result, scale)
    _draw_axis(ax, result, scale)
    _draw_shock_paths(ax, result, scale)
    cb = fig.colorbar(cs, ax=ax, shrink=0.9, pad=0.01, ticks=MaxNLocator(8).tick_values(lo, hi))
    cb.set_label("Mach number M")
    cb.ax.set_ylim(lo, hi)
    ax.legend(loc="upper left", fontsize=8, framealpha=0.9)
    _finish_xy(ax, result, _title(result, "Mach-number field"))
    return fig


def _uniform_boundary(result):
    """(x, y, M) along the characteristic that bounds a design's uniform exit region, or None.

    A designed nozzle's net ends on the C+ characteristic that leaves the axis
    where M reaches the exit value; downstream of it the flow is uniform and
    the net has no points.  That line is the C+ of the net that starts on the
    axis furthest downstream, with a constant Mach number along it; failing
    that, the exit profile when it is such a line (x not constant).
    """
    if result.kind != "design":
        return None
    net = result.net
    x_end = float(_arr(result.wall, "x").max()) if _arr(result.wall, "x").size else None
    if x_end is None or net.size < 2:
        return None
    tol_y = 1e-9 * max(1.0, float(np.nanmax(np.abs(net.y))))
    best = None
    for idx in net.lines("+"):
        if idx.size >= 2 and abs(net.y[idx[0]]) <= tol_y and (best is None or net.x[idx[0]] > net.x[best[0]]):
            best = idx
    cand = []
    if best is not None:
        cand.append((net.x[best], net.y[best], net.mach[best]))
    ex, ey, em = _arr(result.exit, "x"), _arr(result.exit, "y"), _arr(result.exit, "mach")
    if ex.size >= 2 and ey.size == ex.size and em.size == ex.size:
        o = np.argsort(ey)
        cand.append((ex[o], ey[o], em[o]))
    for x, y, m in cand:
        ok = np.isfinite(x) & np.isfinite(y) & np.isfinite(m)
        x, y, m = x[ok], y[ok], m[ok]
        if x.size < 2 or x_end - x[0] < 1e-6 * max(1.0, abs(x_end)):
            continue
        if np.ptp(m) > 1e-3 * max(1.0, float(m.mean())):
            continue
        keep = x <= x_end + 1e-12
        return x[keep], y[keep], float(m.mean()), x_end
    return None


def _fill_uniform_region(ax, result, scale, mappable):
    """Shade the uniform region downstream of the last characteristic in the exit Mach colour.

    Nothing is drawn for analyses, or when no bounding characteristic with a
    uniform Mach number is found (see _uniform_boundary).
    """
    b = _uniform_boundary(result)
    if b is None:
        return
    x, y, m, x_end = b
    if x.size < 2:
        return
    pts = [np.column_stack([x, y])]
    if x[-1] < x_end:
        pts.append([[x_end, y[-1]]])
    pts.append([[x_end, 0.0], [x[0], 0.0]])
    poly = np.vstack(pts) * scale
    colour = mappable.cmap(mappable.norm(m))
    ax.fill(poly[:, 0], poly[:, 1], color=colour, linewidth=0, zorder=1)
    cx = (x[0] + 2.0 * x_end) / 3.0 * scale
    cy = float(np.interp(cx / scale, x, y)) / 3.0 * scale
    ax.text(cx, cy, f"uniform, M = {m:.4g}", ha="center", va="center", fontsize=8.5, color=INK,
            bbox=dict(boxstyle="round,pad=0.2", facecolor="white", edgecolor="none", alpha=0.75), zorder=3)


def _dimension(ax, p0, p1, text, offset=(0, 0), color=INK, rotation=0):
    ax.annotate("", xy=p1, xytext=p0,
                arrowprops=dict(arrowstyle="<|-|>", color=color, linewidth=0.9, shrinkA=0, shrinkB=0))
    mx, my = 0.5 * (p0[0] + p1[0]) + offset[0], 0.5 * (p0[1] + p1[1]) + offset[1]
    ax.text(mx, my, text, ha="center", va="center", fontsize=9, color=color, rotation=rotation,
            bbox=dict(boxstyle="round,pad=0.2", facecolor="white", edgecolor="none", alpha=0.9))


def plot_wall(result, ax=None):
    """The wall contour in real units with the throat, exit and length dimensions annotated.

    With a subsonic inlet, the inlet is drawn too and its face size and length
    are dimensioned.
    """
    fig, ax = _new_axes(ax, SIZES["wall"])
    x, y = _require_wall(result)
    scale, unit, real = length_scale(result)
    X, Y = x * scale, y * scale
    ix, iy = _arr(result.inlet, "x") * scale, _arr(result.inlet, "y") * scale
    has_inlet = ix.size >= 2 and ix.size == iy.size and float(ix.min()) < float(X.min())
    _draw_wall(ax, result, scale)
    _draw_axis(ax, result, scale)
    ax.fill_between(X, Y, 0.0, color="#eeeeee", zorder=0)
    if has_inlet:
        o = np.argsort(ix)
        ax.fill_between(ix[o], iy[o], 0.0, color="#eeeeee", zorder=0)
    axi = _is_axi(result)
    name_t = "throat radius" if axi else "throat half-height"
    name_e = "exit radius" if axi else "exit half-height"
    k0 = int(np.nanargmin(Y))  # the throat is the smallest section
    yt = float(Y[k0])
    ye = float(Y[-1])
    xlo = min(float(X.min()), 0.0, float(ix.min()) if has_inlet else 0.0)
    ytop = max(float(Y.max()), float(iy.max()) if has_inlet else 0.0, 1e-12)
    span = float(X.max() - xlo) or 1.0

    def fmtn(v):
        return f"{v:.4g} {unit}"

    _dimension(ax, (X[k0], 0.0), (X[k0], yt), f"{name_t}\n{fmtn(yt)}", offset=(0.09 * span, 0))
    _dimension(ax, (X[-1], 0.0), (X[-1], ye), f"{name_e}\n{fmtn(ye)}", offset=(-0.09 * span, 0))
    ylen = -0.12 * max(ye, yt)
    _dimension(ax, (X[k0], ylen), (X[-1], ylen), f"length throat to exit {fmtn(X[-1] - X[k0])}")
    ax.plot([X[k0], X[k0]], [ylen, 0], color=INK, linewidth=0.5)
    ax.plot([X[-1], X[-1]], [ylen, 0], color=INK, linewidth=0.5)
    if has_inlet:
        kf = int(np.argmin(ix))
        xf, yf = float(ix[kf]), float(iy[kf])
        _dimension(ax, (xf, 0.0), (xf, yf), f"{'inlet radius' if axi else 'inlet half-height'}\n{fmtn(yf)}",
                   offset=(0.08 * span, 0))
        _dimension(ax, (xf, ylen), (X[k0], ylen), f"inlet {fmtn(X[k0] - xf)}")
        ax.plot([xf, xf], [ylen, 0], color=INK, linewidth=0.5)
    s = result.summary
    notes = []
    for key, text in (("area_ratio", "exit area ratio A_exit / A_throat = {:.5g}"),
                      ("area_ratio_sonic", "exit over sonic area A_exit / A* = {:.5g}"),
                      ("corner_angle_deg", "corner angle = {:.4g} deg"),
                      ("inflection_angle_deg", "inflection angle = {:.4g} deg"),
                      ("max_wall_angle_deg", "max wall angle = {:.4g} deg")):
        v = number(s, key)
        if v is not None:
            notes.append(text.format(v))
    if not real:
        notes.append("lengths in throat units (no throat size given)")
    if notes:
        # in the shaded flow area, clear of the dimension arrows at the throat and the exit
        xm = X[k0] + 0.55 * (X[-1] - X[k0])
        ax.text(xm, 0.3 * min(yt, ye), "\n".join(notes), ha="center", va="bottom", fontsize=8.5,
                bbox=dict(boxstyle="round,pad=0.3", facecolor="white", edgecolor="#bbbbbb"), zorder=6)
    _finish_xy(ax, result, _title(result, "Wall contour"))
    ax.set_aspect("equal", adjustable="box")
    pad = 0.04 * span
    ax.set_xlim(xlo - pad, X.max() + pad)
    ax.set_ylim(ylen * 1.6, ytop * 1.15)
    ax.legend(loc="upper center" if has_inlet else "upper left", fontsize=8, framealpha=0.9)
    return fig


def _p_over_p0(mach, gamma, p0_ratio=None):
    from moc.flow import pressure_ratio

    p = np.asarray(pressure_ratio(np.maximum(mach, 0.0), gamma), dtype=float)
    if p0_ratio is not None and np.size(p0_ratio) == np.size(p):
        p = p * np.asarray(p0_ratio, dtype=float)
    return p


def _gamma(result):
    for src in (result.summary, result.inputs, (result.inputs or {}).get("gas")):
        g = number(src, "gamma")
        if g is not None and g > 1.0:
            return g
    return 1.4


def _me_name(result):
    return "design exit M" if result.kind == "design" else "mean exit M"


def _draw_shock_paths(ax, result, scale, label=True):
    n = 0
    for sh in result.shocks:
        sx, sy = _arr(sh, "x"), _arr(sh, "y")
        if sx.size >= 1 and sx.size == sy.size:
            ax.plot(sx * scale, sy * scale, zorder=6, label="shock" if (label and n == 0) else None, **STYLE["shock"])
            n += 1
    return n


def _sparse_log_label(v, _pos=None):
    """Label minor log ticks only at 2 and 5 times a power of ten."""
    if not v > 0:
        return ""
    mant = v / 10.0 ** np.floor(np.log10(v))
    return f"{v:.3g}" if np.isclose(mant, 2.0) or np.isclose(mant, 5.0) else ""


def plot_distributions(result, fig=None):
    """Wall and centreline Mach number (top) and pressure p/p0 (bottom, log scale) against x."""
    if fig is None:
        fig = Figure(figsize=SIZES["distributions"], layout="constrained")
    ax1, ax2 = fig.subplots(2, 1, sharex=True)
    scale, _, _ = length_scale(result)
    g = _gamma(result)
    wx, wm = _arr(result.wall, "x"), _arr(result.wall, "mach")
    ax_, am = _arr(result.axis, "x"), _arr(result.axis, "mach")
    drawn = False
    if wx.size and wm.size == wx.size:
        ax1.plot(wx * scale, wm, color=INK, linestyle="-", linewidth=1.6, label="wall")
        wp = _arr(result.wall, "p_p0")
        if wp.size != wx.size:
            wp = _p_over_p0(wm, g)
        ax2.semilogy(wx * scale, wp, color=INK, linestyle="-", linewidth=1.6, label="wall")
        drawn = True
    if ax_.size and am.size == ax_.size:
        ax1.plot(ax_ * scale, am, color=ACCENT, linestyle=(0, (5, 2)), linewidth=1.6, marker="o",
                 markersize=2.5, markevery=max(1, ax_.size // 25), label="centreline")
        ap = _arr(result.axis, "p_p0")
        if ap.size != ax_.size:
            ap = _p_over_p0(am, g)
        ax2.semilogy(ax_ * scale, ap, color=ACCENT, linestyle=(0, (5, 2)), linewidth=1.6, marker="o",
                     markersize=2.5, markevery=max(1, ax_.size // 25), label="centreline")
        drawn = True
    if not drawn:
        raise InputError("the result has neither wall nor centreline Mach numbers to plot.")
    me = number(result.summary, "exit_mach")
    if me is not None:
        ax1.axhline(me, color=ACCENT2, linestyle=":", linewidth=1.2, label=f"{_me_name(result)} = {me:.4g}")
        ax2.axhline(float(_p_over_p0(np.array([me]), g)[0]), color=ACCENT2, linestyle=":", linewidth=1.2,
                    label="isentropic p/p0 at exit M")
    for sh in result.shocks:
        sx = _arr(sh, "x")
        if sx.size:
            for a in (ax1, ax2):
                a.axvspan(sx.min() * scale, sx.max() * scale, color=SHOCK, alpha=0.12, linewidth=0)
    ax1.set_ylabel("Mach number M")
    ax2.set_ylabel("static pressure p / p0 (log scale)")
    ax2.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:.3g}"))
    ax2.yaxis.set_minor_formatter(FuncFormatter(_sparse_log_label))
    ax2.set_xlabel(_len_label(result, "x"))
    for a in (ax1, ax2):
        a.grid(True, color="#d9d9d9", linewidth=0.5)
        a.legend(fontsize=8, framealpha=0.9)
    ax1.set_title(_title(result, "Wall and centreline distributions"), loc="left", fontsize=11)
    return fig


def plot_exit(result, fig=None):
    """Mach number and flow angle (deg) across the exit section against y (or r)."""
    if fig is None:
        fig = Figure(figsize=SIZES["exit"], layout="constrained")
    ey, em, et = _arr(result.exit, "y"), _arr(result.exit, "mach"), _arr(result.exit, "theta")
    if ey.size < 2 or em.size != ey.size:
        raise InputError("the result has no exit profile (exit y and mach) to plot.")
    ax1, ax2 = fig.subplots(1, 2)
    scale, _, _ = length_scale(result)
    order = np.argsort(ey)
    Y = ey[order] * scale
    ax1.plot(em[order], Y, color=CPLUS, linestyle="-", marker="o", markersize=3,
             markevery=max(1, ey.size // 20), label="computed")
    me = number(result.summary, "exit_mach")
    if me is not None:
        ax1.axvline(me, color=ACCENT2, linestyle=":", linewidth=1.4, label=f"{_me_name(result)} = {me:.4g}")
    ax1.set_xlabel("Mach number M")
    ax1.set_ylabel(_len_label(result, _radial_name(result)))
    if et.size == ey.size:
        ax2.plot(np.degrees(et[order]), Y, color=CMINUS, linestyle=(0, (4, 2)), marker="s", markersize=3,
                 markevery=max(1, ey.size // 20), label="computed")
        ax2.axvline(0.0, color=AXIS, linestyle="-.", linewidth=1.0, label="axial (0 deg)")
    ax2.set_xlabel("flow angle theta (deg)")
    ax2.set_ylabel(_len_label(result, _radial_name(result)))
    for a in (ax1, ax2):
        a.grid(True, color="#d9d9d9", linewidth=0.5)
        a.legend(fontsize=8, framealpha=0.9)
        a.ticklabel_format(axis="x", useOffset=False)
    dev = number(result.summary, "exit_mach_max_dev")
    extra = f" (max |M - Me| = {dev:.3g})" if dev is not None else ""
    fig.suptitle(_title(result, "Exit profile") + extra, x=0.01, ha="left", fontsize=11)
    return fig


def coalescence_point(summary):
    """(x, y) of the characteristic coalescence point from a summary, or None."""
    if not isinstance(summary, dict):
        return None
    for key in ("coalescence", "coalescence_point"):
        v = summary.get(key)
        if isinstance(v, (list, tuple)) and len(v) == 2:
            v = {"x": v[0], "y": v[1]}
        if isinstance(v, dict):
            x, y = number(v, "x"), number(v, "y")
            if x is not None and y is not None:
                return x, y
    x, y = number(summary, "coalescence_x"), number(summary, "coalescence_y")
    return (x, y) if x is not None and y is not None else None


def plot_shocks(result, ax=None):
    """Shock paths over a faint net, with the coalescence point marked when there is one."""
    fig, ax = _new_axes(ax, SIZES["shocks"])
    net = result.net
    scale, _, _ = length_scale(result)
    if net.size:
        pts = np.column_stack([net.x, net.y]) * scale
        for fam, key in (("+", "cplus"), ("-", "cminus")):
            lines = _subsample([i for i in net.lines(fam) if i.size >= 2], 40)
            st = dict(STYLE[key])
            st.update(alpha=0.35)
            ax.add_collection(LineCollection([pts[i] for i in lines], zorder=1, **st))
    _draw_wall(ax, result, scale)
    _draw_axis(ax, result, scale)
    n = 0
    for k, sh in enumerate(result.shocks):
        sx, sy = _arr(sh, "x"), _arr(sh, "y")
        if sx.size >= 1 and sx.size == sy.size:
            ax.plot(sx * scale, sy * scale, zorder=6, label="shock" if n == 0 else None, **STYLE["shock"])
            pr = _arr(sh, "p2_p1")
            if pr.size == sx.size:
                j = int(np.argmax(pr))
                ax.annotate(f"shock {k + 1}: max p2/p1 = {pr[j]:.3g}", (sx[j] * scale, sy[j] * scale),
                            xytext=(-6, 10), textcoords="offset points", fontsize=8, color=INK, ha="right",
                            bbox=dict(boxstyle="round,pad=0.2", facecolor="white", edgecolor="none", alpha=0.85))
            n += 1
    if n == 0:
        listed = result.summary.get("shocks")
        for sh in listed if isinstance(listed, list) else []:
            ends = [number(sh, q) for q in ("start_x", "start_y", "end_x", "end_y")]
            if None not in ends:
                ax.plot([ends[0] * scale, ends[2] * scale], [ends[1] * scale, ends[3] * scale],
                        zorder=6, label="shock" if n == 0 else None, **STYLE["shock"])
                n += 1
    cp = coalescence_point(result.summary)
    if cp is not None:
        ax.plot(cp[0] * scale, cp[1] * scale, linestyle="none", marker="*", markersize=14,
                markerfacecolor=ACCENT2, markeredgecolor=INK, zorder=7, label="first coalescence")
    if n == 0 and cp is None:
        ax.text(0.5, 0.5, "no shock found in this result", transform=ax.transAxes, ha="center",
                va="center", fontsize=12, color=INK,
                bbox=dict(boxstyle="round,pad=0.4", facecolor="white", edgecolor="#bbbbbb"))
    ax.autoscale_view()
    ax.legend(loc="upper left", fontsize=8, framealpha=0.9)
    _finish_xy(ax, result, _title(result, "Internal shocks"))
    return fig


_PLOTTERS = {
    "net": plot_net,
    "mach": plot_mach_field,
    "wall": plot_wall,
    "distributions": plot_distributions,
    "exit": plot_exit,
    "shocks": plot_shocks,
}


def unavailable(result, name):
    """Why the named figure cannot be drawn from this result, or None when it can."""
    if name == "exit":
        ey, em = _arr(result.exit, "y"), _arr(result.exit, "mach")
        if ey.size < 2 or em.size != ey.size:
            return "the result has no exit profile"
    if name in ("wall", "overview") and _arr(result.wall, "x").size < 2:
        return "the result has no wall contour"
    if name in ("net", "mach", "overview") and result.net.size < 3:
        return "the result has no characteristic net"
    if name == "distributions":
        ok = [(_arr(d, "x").size > 0 and _arr(d, "x").size == _arr(d, "mach").size) for d in (result.wall, result.axis)]
        if not any(ok):
            return "the result has neither wall nor centreline Mach numbers"
    if name == "shocks" and not (result.shocks or result.summary.get("shocks") or coalescence_point(result.summary)):
        return "the result has no shock"
    return None


def figure_for(result, name):
    """Return a new Figure of the named kind (one of FIGURES, or 'overview')."""
    if name == "overview":
        return plot_overview(result)
    if name not in _PLOTTERS:
        raise InputError(f"unknown figure {name!r}; choose from {', '.join(FIGURES)}, overview or all.")
    return _PLOTTERS[name](result)


def save_figure(fig, path, force=False, dpi=150):
    """Write a Figure to `path` atomically; the format comes from the suffix (png, svg, pdf)."""
    path = Path(path)
    fmt = path.suffix.lower().lstrip(".")
    if fmt not in FORMATS:
        raise ExportError(f"cannot write a figure as {path.name!r}; use a .png, .svg or .pdf file name.")
    try:
        dpi = float(dpi)
    except (TypeError, ValueError):
        dpi = float("nan")
    if not (np.isfinite(dpi) and 10 <= dpi <= 1200):
        raise InputError(f"dpi must be a number between 10 and 1200, got {dpi!r}.")
    with atomic_path(path, force=force) as tmp:
        fig.savefig(tmp, format=fmt, dpi=dpi, metadata=_metadata(fmt))
    plt.close(fig)
    return path


def _metadata(fmt):
    if fmt == "png":
        return {"Software": "moc"}
    if fmt == "svg":
        return {"Creator": "moc"}
    return {"Creator": "moc"}


def plot_overview(result):
    """The Mach field over the net (top) and the dimensioned wall (bottom) in one Figure."""
    fig = Figure(figsize=SIZES["overview"], layout="constrained")
    a1, a2 = fig.subplots(2, 1)
    if result.net.size >= 3:
        plot_mach_field(result, ax=a1)
    else:
        plot_net(result, ax=a1)
    plot_wall(result, ax=a2)
    return fig


def overview(result, path, force=True, dpi=130):
    """Write the overview image (see plot_overview) atomically; return the path."""
    return save_figure(plot_overview(result), path, force=force, dpi=dpi)

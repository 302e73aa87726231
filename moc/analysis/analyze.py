"""Analyse a given wall contour: march, find coalescence, fit the shock, report.

`analyze(wall, ...)` returns a `moc.result.Result` of kind "analysis" whose
summary holds the public keys (shock_free, shocks, exit_mach, ...; see
docs/analysis.md).
"""

from __future__ import annotations

import math
import time

import numpy as np

from moc.analysis import exitflow
from moc.analysis.coalescence import first_crossing, unfolded_cells
from moc.analysis.march import march
from moc.analysis.reflect import _Axis, flip, reflect, region_triangle_index
from moc.analysis.shockfit import UpstreamField, fit_shock
from moc.errors import InputError
from moc.flow import max_deflection, oblique_shock, prandtl_meyer
from moc.flow._checks import check_gamma
from moc.net import rotational as rp
from moc.result import Net, Result

CAUTION = ("CAUTION: nozzles, rocket motors and pressurised tunnels can injure or kill. This is an inviscid "
           "analysis; it does not replace local codes, standards and review by a licensed engineer.")

KEYS = rp.KEYS


def _boundary_x(front0, shock, end):
    """x of the upstream edge of the region behind the shock, as a function of y."""
    fy, fx = front0["y"], front0["x"]
    o = np.argsort(fy)
    fy, fx = fy[o], fx[o]
    sx, sy = shock["x"], shock["y"]
    ye = end[1] if end is not None else (sy[-1] if sy.size else fy[0])
    xe = end[0] if end is not None else (sx[-1] if sx.size else fx[0])

    def xb(y):
        y = np.asarray(y, float)
        out = np.full(y.shape, np.inf)
        top = y >= fy[0]
        out[top] = np.interp(y[top], fy, fx, right=fx[-1])
        if sx.size >= 2:
            so = np.argsort(sy)
            mid = (y < fy[0]) & (y >= ye)
            out[mid] = np.interp(y[mid], sy[so], sx[so])
            low = y < min(ye, sy.min())
            out[low] = xe
        else:
            out[y < fy[0]] = xe
        return out

    return xb


def _downstream_of_cplus(D, pvalid, R, end):
    """Points downstream of the region-1 C+ characteristic that starts on the axis just upstream of `end`."""
    xe, ye = end
    ax = D["x"][:R, 0]
    cand = np.flatnonzero(np.isfinite(ax) & (ax <= xe))
    if cand.size == 0:
        return np.zeros_like(pvalid)
    a0 = int(cand[np.argmax(ax[cand])])
    W = D["x"].shape[1] - 1
    aa = np.arange(a0, min(a0 + W + 1, R))
    dd = aa - a0
    lx, ly = D["x"][aa, dd], D["y"][aa, dd]
    good = np.isfinite(lx) & pvalid[aa, dd]
    if not np.any(good):
        return D["x"][:R] > xe
    last = np.flatnonzero(~good)
    n_ok = int(last[0]) if last.size else lx.size
    lx, ly = lx[:max(n_ok, 1)], ly[:max(n_ok, 1)]
    X, Y = D["x"][:R], D["y"][:R]
    xc = np.interp(Y, ly, lx, right=lx[-1])
    return X > xc + 1e-12


def _shock_birth(state, dfl, g):
    """A shock starting at a first crossing: (shock start dict, flow state just behind it).

    `state` is the flow at the crossing (x, y, theta, mach, nu, lnp0) in the frame the shock is
    fitted in; the shock starts as a Mach wave, or, when the two crossing characteristics differ by a
    deflection dfl > 0 below 0.9 theta_max, as the weak oblique shock for that deflection (NACA
    Report 1135 relations), which vanishes as the net is refined.
    """
    m1, th1 = float(state["mach"]), float(state["theta"])
    mu = math.asin(1.0 / m1)
    shock = dict(x=float(state["x"]), y=float(state["y"]), phi=th1 - mu, beta=mu, theta1=th1, m1=m1, m2=m1,
                 p2_p1=1.0, p02_p01=1.0, lnp01=state["lnp0"], deflection=0.0)
    behind = dict(state)
    if np.isfinite(dfl) and dfl > 0 and dfl < 0.9 * float(max_deflection(m1, g)[0]):
        sst = oblique_shock(m1, dfl, g)
        b0, m2 = float(sst.beta), float(sst.m2)
        behind.update(theta=th1 - dfl, mach=m2, nu=float(prandtl_meyer(m2, g)),
                      lnp0=state["lnp0"] + math.log(float(sst.p02_p01)))
        shock.update(phi=th1 - b0, beta=b0, m2=m2, p2_p1=float(sst.p2_p1), p02_p01=float(sst.p02_p01),
                     deflection=dfl)
    return shock, behind


def analyze(wall, gamma=1.4, geometry="planar", n=40, start="corner", mach_in=None, step_factor=1.0,
            initial=None, name="contour", throat_solution="hall", max_reflections=6):
    """Analyse the flow along `wall` (a moc.analysis.contour.Wall); returns a Result (kind "analysis").

    start: "corner" (sharp sonic throat corner at the wall start, or a rounded
    throat when the wall has `throat_arc`: transonic start from moc.throat),
    "uniform" (the wall in a uniform stream of Mach `mach_in`), or "line"
    (an initial C- line `initial`, wall to axis).
    """
    t0 = time.perf_counter()
    g = check_gamma(gamma)
    if geometry not in ("planar", "axisymmetric"):
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    delta = 1 if geometry == "axisymmetric" else 0
    try:
        n = int(n)
    except (TypeError, ValueError):
        raise InputError(f"the number of characteristics must be a whole number, got {n!r}.") from None
    if not 6 <= n <= 1000:
        raise InputError(f"the number of characteristics must be between 6 and 1000, got {n}.")
    if start == "uniform":
        if mach_in is None or not float(mach_in) > 1.0:
            raise InputError(f"a uniform-flow start needs an upstream Mach number above 1, got {mach_in!r}.")
    cf_start = None
    if start == "corner" and wall.throat_arc:
        from moc.analysis.transonic import initial_cminus, line_flux

        initial = initial_cminus(float(wall.throat_arc), g, geometry, n, solution=throat_solution)
        mflow, cf_start = line_flux(initial, g, delta)
        net = march(wall, g, geometry, n=n, start="line", initial=initial)
    else:
        net = march(wall, g, geometry, n=n, start=start, mach_in=mach_in, initial=initial)
        mflow = 1.0
    ok = unfolded_cells(net)
    warnings = list(net.notes)
    x_end = wall.x_end
    uniform = None
    if start in ("uniform", "corner") and cf_start is None:
        m0 = float(net.data["mach"][0, 0])
        uniform = dict(theta=0.0, nu=float(net.data["nu"][0, 0]), mach=m0, lnp0=0.0)
    up = UpstreamField(net, ok, uniform=uniform)
    shocks, coalescence = [], None
    # --- where does a shock start? ---------------------------------------
    th_w0 = wall.angle_start
    start_shock = None
    mirror_start = None
    if start == "uniform" and th_w0 < -1e-12:
        m1 = float(mach_in)
        dfl = -th_w0
        s = oblique_shock(m1, dfl, g)  # raises DetachedShockError with a clear sentence
        b = float(s.beta)
        corner = dict(x=wall.x_start, y=wall.y_start, theta=th_w0, nu=float(prandtl_meyer(float(s.m2), g)),
                      mach=float(s.m2), lnp0=math.log(float(s.p02_p01)))
        start_shock = dict(x=wall.x_start, y=wall.y_start, phi=-b, beta=b, theta1=0.0, m1=m1, m2=float(s.m2),
                           p2_p1=float(s.p2_p1), p02_p01=float(s.p02_p01), lnp01=0.0, deflection=dfl)
        front0 = {k: np.array([corner[k]]) for k in KEYS}
        coalescence = {"x": wall.x_start, "y": wall.y_start, "family": "C-", "kind": "compression corner"}
        y_ref = wall.y_start
    else:
        cr = first_crossing(net)
        if cr is not None and cr.x <= x_end:
            coalescence = {"x": cr.x, "y": cr.y, "family": cr.family, "kind": "crossing of characteristics",
                           "cell_size": cr.cell_size}
            if cr.family == "C+":
                # a C+ shock: fitted as a C- shock in the mirror image (x, -y, -theta), axis as its wall
                a, d = cr.cell
                D = net.data
                upc = [(a, d), (a + 1, d + 1)]  # the earlier C+ of the folded cell
                dnc = [(a, d - 1), (a + 1, d)]  # the later one
                st = {k: float(np.nanmean([D[k][i, j] for i, j in upc if i < net.rows])) for k in KEYS}
                st["x"], st["y"] = cr.x, cr.y
                st["mach"] = float(rp.mach_of_nu(np.array([st["nu"]]), g)[0])
                th_b = float(np.nanmean([D["theta"][i, j] for i, j in dnc if i < net.rows]))
                jd = np.arange(d - 1, -1, -1)
                front0 = {k: np.concatenate([[st[k]], D[k][np.full(jd.size, a), jd]]) for k in KEYS}
                fin = np.isfinite(front0["mach"])
                front0 = {k: v[fin] for k, v in front0.items()}
                front0["cm"] = np.concatenate([[-1], np.full(jd.size, a)])[fin]
                stm = flip(st)
                dfl = th_b - st["theta"]
                start_shock, beh = _shock_birth(stm, dfl, g)
                front0m = flip(front0)
                front0m["theta"][0], front0m["mach"][0] = beh["theta"], beh["mach"]
                front0m["nu"][0], front0m["lnp0"][0] = beh["nu"], beh["lnp0"]
                mirror_start = (front0m, start_shock)
                start_shock = None
                y_ref = float(wall.y_of(cr.x))
            else:
                a, d = cr.cell
                D = net.data
                idx_a = np.arange(a + 1, a + 1 + (net.W - d))
                idx_d = np.arange(d + 1, net.W + 1)
                m = min(idx_a.size, idx_d.size)
                idx_a, idx_d = idx_a[:m], idx_d[:m]
                inrange = idx_a < net.rows
                idx_a, idx_d = idx_a[inrange], idx_d[inrange]
                corners = [(a, d), (a, d - 1)]  # on the upstream C- of the folded cell
                st = {k: float(np.nanmean([D[k][i, j] for i, j in corners])) for k in KEYS}
                st["x"], st["y"] = cr.x, cr.y
                st["mach"] = float(rp.mach_of_nu(np.array([st["nu"]]), g)[0])
                # the two crossing C- characteristics carry the states on either side of the young shock:
                # it starts with the deflection between them (weak root), which vanishes as the net is refined
                down = [(a + 1, d + 1), (a + 1, d)]
                th_b = float(np.nanmean([D["theta"][i, j] for i, j in down if i < net.rows]))
                dfl = st["theta"] - th_b
                start_shock, beh = _shock_birth(st, dfl, g)
                front0 = {k: np.concatenate([[beh[k]], D[k][idx_a, idx_d]]) for k in KEYS}
                fin = np.isfinite(front0["mach"])
                front0 = {k: v[fin] for k, v in front0.items()}
                front0["cm"] = np.concatenate([[-1], idx_a])[fin]
                y_ref = float(wall.y_of(cr.x))
    fit = None
    chain = []  # (fit, frame): frame +1 real coordinates, -1 mirrored (a C+ shock)
    if mirror_start is not None:
        front0m, sm = mirror_start
        step = step_factor * (y_ref / n) * min(1.0 / max(abs(math.sin(sm["phi"])), 1e-9), 1.5)
        upm = UpstreamField(net, ok, uniform=None)
        upm.v = flip(upm.v)
        upm.line0 = None
        fit = fit_shock(upm, _Axis(), sm, front0m, g, delta, step, x_end, lower=lambda x: -float(wall.y_of(x)),
                        lower_angle=lambda x: -float(wall.angle(x)), lower_name="wall", frame=-1)
        chain.append((fit, -1))
        first_frame = -1
    elif start_shock is not None:
        step = step_factor * (y_ref / n) * min(1.0 / max(abs(math.sin(start_shock["phi"])), 1e-9), 1.5)
        fit = fit_shock(up, wall, start_shock, front0, g, delta, step, x_end)
        chain.append((fit, +1))
        first_frame = +1
    if fit is not None:
        while len(chain) <= max_reflections:
            last, frame = chain[-1]
            if last.fate != "axis":
                break
            nxt, info = reflect(last, frame, wall, g, delta, step, x_end)
            if nxt is None:
                if not last.reflection or last.reflection.get("regular"):
                    warnings.append(f"shock {len(chain)}: {last.fate_detail}; {info}.")
                break
            chain.append((nxt, info))
        else:
            warnings.append(f"the march stops after {max_reflections} reflections.")
        for f_, _ in chain:
            warnings += f_.warnings
    last_fit = chain[-1][0] if chain else None
    # --- assemble the points ---------------------------------------------
    D = net.data
    R, W = net.rows, net.W
    pvalid = np.zeros((R, W + 1), bool)
    ia, idd = np.nonzero(ok)
    for i, j in ((ia, idd), (ia + 1, idd + 1), (ia + 1, idd), (ia, idd - 1)):
        pvalid[i, j] = True
    pvalid[0, :] = np.isfinite(D["mach"][0])
    pvalid &= np.isfinite(D["mach"][:R])
    if fit is not None:
        if first_frame == +1:
            xb0 = _boundary_x(front0, fit.shock, fit.end)

            def xb(y):
                return xb0(y)
        else:
            xbm = _boundary_x(mirror_start[0], fit.shock, fit.end)

            def xb(y):
                return xbm(-np.asarray(y, float))
        behind = D["x"][:R] > xb(D["y"][:R]) + 1e-12
        pvalid &= ~behind
        if fit.fate != "exit" and fit.end is not None and len(chain) == 1 and first_frame == +1:
            # beyond the end of the tracked shock: drop what lies downstream of the C+ through its end point
            pvalid &= ~_downstream_of_cplus(D, pvalid, R, fit.end)
    if fit is None and coalescence is not None and coalescence.get("family") not in ("C-", "C+"):
        pvalid &= D["x"][:R] <= coalescence["x"]
    # region 1 arrays
    ia1, id1 = np.nonzero(pvalid)
    flat = {k: D[k][:R][pvalid] for k in KEYS}
    cplus = (ia1 - id1).astype(np.int64)
    cminus = ia1.astype(np.int64)
    index = -np.ones((R, W + 1), np.int64)
    index[ia1, id1] = np.arange(ia1.size)
    ca, cd = np.nonzero(ok)
    quads = np.stack([index[ca, cd], index[ca + 1, cd + 1], index[ca + 1, cd], index[ca, cd - 1]], axis=1)
    tris = []
    ax_ = (cd == 1) & (ca + 1 < R)  # triangles against the axis
    tris.append(np.stack([index[ca[ax_], 0], index[ca[ax_] + 1, 1], index[ca[ax_] + 1, 0]], axis=1))
    wl_ = (cd == W - 1) & (ca + 1 < R)  # triangles against the wall
    tris.append(np.stack([index[ca[wl_], W - 1], index[ca[wl_] + 1, W], index[ca[wl_], W]], axis=1))
    tris = np.concatenate(tris)
    tris = np.concatenate([tris, tris[:, -1:]], axis=1)
    both = np.concatenate([quads, tris])
    cl = [list(q) for q in both[np.all(both >= 0, axis=1)]]
    parts = [flat]
    labs_p, labs_m = [cplus], [cminus]
    off = ia1.size
    # wall points ahead of the shock region: finite and upstream of its boundary (the fitted shock carries
    # the effect of the fold; cells folded next to it do not reach the wall before the region behind it)
    wsel = np.isfinite(D["mach"][:R, W])
    if fit is not None:
        wsel &= D["x"][:R, W] <= xb(D["y"][:R, W]) + 1e-12
    elif coalescence is not None:
        wsel &= D["x"][:R, W] <= coalescence["x"]
    wall_pts = {k: D[k][:R, W][wsel] for k in KEYS}
    polylines = []
    for b in np.unique(cplus):
        sel = np.flatnonzero(cplus == b)
        sel = sel[np.argsort(cminus[sel])]
        polylines.append({k: flat[k][sel] for k in KEYS})
    # regions behind each shock, in real coordinates, cut by the next shock of the chain
    paths = []
    for f_, frame in chain:
        shp = {"x": f_.shock["x"], "y": f_.shock["y"] * frame}
        if f_.end is not None and f_.fate == "axis":
            shp = {"x": np.append(shp["x"], f_.end[0]), "y": np.append(shp["y"], f_.end[1] * frame)}
        paths.append(shp)
    for ci, (f_, frame) in enumerate(chain):
        cut = None
        if ci + 1 < len(chain) and paths[ci + 1]["x"].size >= 2:
            py, px = paths[ci + 1]["y"], paths[ci + 1]["x"]
            o = np.argsort(py)
            cut = (py[o], px[o])
        gidx = []
        for fi, F0 in enumerate(f_.fronts):
            F = {k: F0[k] for k in KEYS}
            if frame == -1:
                F = flip(F)
            m = F["x"].size
            keep = np.ones(m, bool)
            if cut is not None:
                # behind the next shock: downstream of its path; above its highest point the region is ahead of it
                keep = (F["x"] <= np.interp(F["y"], cut[0], cut[1]) + 1e-12) | (F["y"] > cut[0][-1])
            idx = -np.ones(m, np.int64)
            idx[keep] = np.arange(off, off + int(keep.sum()))
            parts.append({k: F[k][keep] for k in KEYS})
            labs_p.append(np.full(int(keep.sum()), 10_000_000 + 100_000 * ci + fi, np.int64))
            labs_m.append(np.asarray(F0.get("cm", np.arange(m) + 20_000_000), np.int64)[keep] + 1_000_000 * ci)
            gidx.append(idx)
            off += int(keep.sum())
            # contiguous runs only: a segment must not jump over dropped points (across the next shock)
            runs = np.split(np.arange(m), np.flatnonzero(np.diff(keep.astype(int)) != 0) + 1)
            for run in runs:
                if run.size >= 2 and keep[run[0]]:
                    polylines.append({k: F[k][run] for k in KEYS})
            if fi == len(f_.fronts) - 1:
                for t in region_triangle_index(f_.fronts, f_.origin):
                    q = [int(gidx[kk][ii]) for kk, ii in t]
                    if min(q) >= 0:
                        cl.append(q + [q[-1]])
            if frame == +1 and m > 1 and keep[-1] and bool(F0.get("at_wall", True)):
                for k in KEYS:
                    wall_pts[k] = np.append(wall_pts[k], F[k][-1])
    allp = {k: np.concatenate([p[k] for p in parts]) for k in KEYS}
    # --- performance ------------------------------------------------------
    o = np.argsort(wall_pts["x"])
    wall_pts = {k: v[o] for k, v in wall_pts.items()}
    y_exit = float(wall.y_of(x_end))
    area_ratio = y_exit**2 if delta else y_exit
    summary = {
        "kind": "analysis",
        "contour": name,
        "geometry": geometry,
        "gamma": g,
        "characteristics": n,
        "start": start,
        "area_ratio": area_ratio,
        "length": x_end - wall.x_start,
        "exit_y": y_exit,
    }
    cf = None
    if start == "corner":
        cf = exitflow.wall_thrust(wall_pts["x"], wall_pts["y"], wall_pts["mach"], wall_pts["lnp0"], x_end, g, delta,
                                  cf_start=cf_start)
        summary["discharge_coefficient"] = mflow
        summary["throat"] = ("rounded, radius of curvature %g (%s start)" % (wall.throat_arc, throat_solution)
                             if cf_start is not None else "sharp corner (sonic, centred fan)")
        cfi, me_1d, pe_1d = exitflow.ideal_vacuum_cf(area_ratio, g)
        summary["thrust_coefficient_ideal_1d"] = cfi
        summary["exit_mach_ideal_1d"] = me_1d
        wall_ahead = fit is not None and first_frame == +1 and front0["x"][-1] >= x_end  # behind-shock region meets the wall past the exit
        if cf is not None and last_fit is not None and last_fit.fate not in ("exit", "decays", "axis") \
                and not wall_ahead:
            warnings.append(f"the shock march stopped early ({last_fit.fate}); the thrust is not reported.")
            cf = None
        summary["thrust_coefficient_vacuum"] = cf
        summary["thrust_ratio_to_ideal"] = (cf / cfi) if cf is not None else None
        if cf is None and not any("thrust is not reported" in w for w in warnings):
            warnings.append("the wall was not computed up to the exit, so the thrust is not reported.")
    else:
        summary["thrust_coefficient_vacuum"] = None
        summary["thrust_coefficient_ideal_1d"] = None
    prof = exitflow.section(polylines, x_end)
    ex = {}
    if prof["y"].size >= 3:
        mach_e = rp.mach_of_nu(prof["nu"], g)
        ex = exitflow.exit_integrals(prof, mach_e, g, delta, y_exit)
        if start == "uniform":
            # a wall in a stream: exit mass flow over the mass flow entering across the initial line
            from moc.analysis.transonic import line_flux

            inflow = line_flux({k: D[k][0] for k in ("x", "y", "theta", "mach", "lnp0")}, g, delta)[0]
            ex["mass_flow_ratio"] = ex["mass_flow_ratio"] / inflow
        summary.update(ex)
        exit_arrays = {"y": prof["y"], "theta": prof["theta"], "mach": mach_e, "p0_ratio": np.exp(prof["lnp0"]),
                       "p_p0": np.exp(prof["lnp0"]) * (1 + 0.5 * (g - 1) * mach_e**2) ** (-g / (g - 1))}
    else:
        summary.update({"exit_mach": None, "exit_mach_max_dev": None})
        exit_arrays = {}
        warnings.append("the exit plane was not reached by the computed flow; no exit profile.")
    # --- shocks -------------------------------------------------------------
    shock_list = []
    for ci, (f_, frame) in enumerate(chain):
        sh = f_.shock
        if sh["x"].size < 1:
            continue
        end = f_.end if f_.end is not None else (sh["x"][-1], sh["y"][-1])
        end = (end[0], end[1] * frame)
        xs_, ys_ = sh["x"], sh["y"] * frame
        if f_.end is not None and f_.fate == "axis":
            xs_, ys_ = np.append(xs_, end[0]), np.append(ys_, end[1])
        arrays = {"x": xs_, "y": ys_}
        for k in ("beta", "p2_p1", "p02_p01", "m1", "m2", "theta1"):
            v = sh[k] * (frame if k == "theta1" else 1)
            arrays[k] = np.append(v, v[-1]) if xs_.size > v.size else v
        inside = arrays["x"] <= x_end
        if f_.fate == "exit" and np.count_nonzero(inside) >= 1 and not np.all(inside):
            # cut the written shock path at the exit plane
            j = int(np.flatnonzero(~inside)[0])
            u = (x_end - arrays["x"][j - 1]) / (arrays["x"][j] - arrays["x"][j - 1]) if j >= 1 else 0.0
            arrays = {k: np.append(v[:j], v[j - 1] + u * (v[j] - v[j - 1]) if j >= 1 else v[0]) for k, v in arrays.items()}
            end = (float(arrays["x"][-1]), float(arrays["y"][-1]))
        shocks.append(arrays)
        fate, detail = f_.fate, f_.fate_detail
        where = "axis" if frame == +1 else "wall"
        if fate == "axis":
            fate = where
            if ci + 1 < len(chain):
                fate = f"reflects_{where}"
                detail += f"; it reflects regularly as shock {ci + 2}"
        entry = {
            "start_x": float(arrays["x"][0]), "start_y": float(arrays["y"][0]),
            "end_x": float(end[0]), "end_y": float(end[1]),
            "max_pressure_ratio": float(np.max(arrays["p2_p1"])) if arrays["p2_p1"].size else 1.0,
            "total_pressure_ratio": float(np.min(arrays["p02_p01"])) if arrays["p02_p01"].size else 1.0,
            "family": "C-" if frame == +1 else "C+",
            "fate": fate,
            "fate_detail": detail,
            "beta_start_deg": float(np.degrees(arrays["beta"][0])) if arrays["beta"].size else None,
            "beta_end_deg": float(np.degrees(arrays["beta"][-1])) if arrays["beta"].size else None,
            "points": int(arrays["x"].size),
        }
        if f_.reflection is not None:
            entry["reflection"] = f_.reflection
        if ci >= 1:
            entry["reflected_from"] = ci
        shock_list.append(entry)
    if fit is not None and delta == 1:
        warnings.append("shock fitting in axisymmetric flow is not yet validated against a published case: "
                        "treat the shock path and strength as indicative.")
    complete = fit is None or last_fit.fate == "exit"
    if coalescence is not None and fit is None:
        complete = False
    if shock_list and max(e["max_pressure_ratio"] for e in shock_list) < 1.02:
        warnings.append("every shock found is very weak (p2/p1 below 1.02): nearly parallel characteristics can "
                        "cross through discretisation alone; repeat with a finer net (-n) before trusting it.")
    merged = sum(f_.merged for f_, _ in chain)
    summary.update({
        "merged_characteristics": int(merged),
        "shock_free": coalescence is None,
        "shocks": shock_list,
        "coalescence": coalescence,
        "march_complete": bool(complete),
        "points": int(allp["x"].size),
        "min_total_pressure_ratio": float(np.nanmin(np.exp(allp["lnp0"]))),
        "warnings": warnings,
        "caution": CAUTION,
        "seconds": round(time.perf_counter() - t0, 3),
    })
    # what is written stops at the exit plane (the march runs a little past it to cover the exit section)
    keep = allp["x"] <= x_end + 1e-9 * max(1.0, abs(x_end))
    new_index = -np.ones(keep.size, np.int64)
    new_index[keep] = np.arange(int(keep.sum()))
    cells = np.asarray(cl, np.int64).reshape(-1, 4)
    cells = new_index[cells[np.all(keep[cells], axis=1)]] if cells.size else cells
    allp = {k: v[keep] for k, v in allp.items()}
    summary["points"] = int(keep.sum())
    net_out = Net(x=allp["x"], y=allp["y"], theta=allp["theta"], mach=allp["mach"],
                  cplus=np.concatenate(labs_p)[keep], cminus=np.concatenate(labs_m)[keep],
                  cells=cells, p0_ratio=np.exp(allp["lnp0"]))
    wk = wall_pts["x"] <= x_end + 1e-12
    if np.any(~wk) and np.any(wk) and wall_pts["x"][wk][-1] < x_end - 1e-12:
        # close the wall at the exit plane (linear between the two wall points around it)
        fin = np.isfinite(wall_pts["mach"])
        endp = {k: float(np.interp(x_end, wall_pts["x"][fin], wall_pts[k][fin])) for k in KEYS}
        endp["y"] = y_exit
        wall_pts = {k: np.append(v[wk], endp[k]) for k, v in wall_pts.items()}
    else:
        wall_pts = {k: v[wk] for k, v in wall_pts.items()}
    wall_out = {"x": wall_pts["x"], "y": wall_pts["y"], "theta": wall_pts["theta"], "mach": wall_pts["mach"],
                "p_p0": np.exp(wall_pts["lnp0"]) * (1 + 0.5 * (g - 1) * wall_pts["mach"] ** 2) ** (-g / (g - 1))}
    # the contour's own points between computed wall points, so that the written wall has its true shape
    # (flow values there linear in x between the computed wall points; "computed" marks which are which)
    fin = np.isfinite(wall_out["mach"])
    if np.count_nonzero(fin) >= 2:
        xc = wall.x[(wall.x > wall_out["x"][fin].min()) & (wall.x < wall_out["x"][fin].max())]
        xc = xc[~np.isin(xc, wall_out["x"])]
        if xc.size:
            extra_pts = {"x": xc, "y": wall.y_of(xc), "theta": wall.angle(xc)}
            for k in ("mach", "p_p0"):
                extra_pts[k] = np.interp(xc, wall_out["x"][fin], wall_out[k][fin])
            comp = np.concatenate([np.ones(wall_out["x"].size, bool), np.zeros(xc.size, bool)])
            wall_out = {k: np.concatenate([wall_out[k], extra_pts[k]]) for k in wall_out}
            o = np.argsort(wall_out["x"], kind="stable")
            wall_out = {k: v[o] for k, v in wall_out.items()}
            wall_out["computed"] = comp[o].astype(np.int8)
    ax = allp["y"] <= 1e-12
    o = np.argsort(allp["x"][ax])
    axis_out = {"x": allp["x"][ax][o], "mach": allp["mach"][ax][o],
                "p_p0": (np.exp(allp["lnp0"][ax]) * (1 + 0.5 * (g - 1) * allp["mach"][ax] ** 2) ** (-g / (g - 1)))[o]}
    inputs = {"geometry": geometry, "gamma": g, "characteristics": n, "start": start, "mach_in": mach_in,
              "contour": name, "step_factor": step_factor}
    return Result(kind="analysis", inputs=inputs, summary=summary, net=net_out, wall=wall_out, axis=axis_out,
                  exit=exit_arrays, shocks=shocks)

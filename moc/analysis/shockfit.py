"""Fit an oblique shock into the net and march the rotational flow behind it.

The shock is tracked as a discontinuity from its start (a compression corner
on the wall, or the first crossing of C- characteristics): each step extends
it by a fixed length at the averaged shock direction, reads the upstream
state from the unfolded part of the shock-free net, and solves the shock
point (`moc.net.shock_point`: theta-beta-M weak root matched to the
downstream C- characteristic).  Behind the shock the flow is marched front by
front, each front a C+ characteristic from the new shock point up to the
wall, with the rotational unit processes (`moc.net.rotational`): total
pressure is carried along streamlines, so it is constant on the wall and
falls across the shock by the Rankine-Hugoniot ratio.  C- characteristics
that run into the shock end there.  The march stops, with the reason in
`fate`, when the shock reaches the axis, leaves through the exit plane,
decays to a Mach wave, or would need a reflection or strength beyond the
weak branch.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from moc.net import rotational as rp
from moc.net.shock_point import solve_beta

KEYS = rp.KEYS


class UpstreamField:
    """The flow ahead of the shock: the unfolded cells of the shock-free net, plus uniform inflow."""

    def __init__(self, net=None, ok=None, uniform=None, vertices=None, gamma=None, near=0.0):
        self.slack = 0.5  # how far outside a triangle (in barycentric units) a point may be read
        self.near = near  # beyond that, the nearest vertex within this distance (0: never)
        self.uniform = uniform
        if vertices is not None:  # triangles given directly: dict of (3, ntri) arrays
            self.v = vertices
            self.gamma = gamma
            self.line0 = None
            return
        self.gamma = net.gamma
        D = net.data
        R, W = net.rows, net.W
        tris = []
        ia, idd = np.nonzero(ok)
        c = [(ia, idd), (ia + 1, idd + 1), (ia + 1, idd), (ia, idd - 1)]
        tris += [(c[0], c[1], c[2]), (c[0], c[2], c[3])]
        # boundary triangles next to a regular cell
        a = np.arange(R - 1)
        ax = a[ok[a, 1]] if W >= 2 else a[:0]
        tris.append(((ax, np.zeros_like(ax)), (ax + 1, np.ones_like(ax)), (ax + 1, np.zeros_like(ax))))
        wl = a[ok[a, W - 1]]
        tris.append(((wl, np.full_like(wl, W - 1)), (wl + 1, np.full_like(wl, W)), (wl, np.full_like(wl, W))))
        self.v = {k: np.stack([np.concatenate([D[k][t[i][0], t[i][1]] for t in tris]) for i in range(3)])
                  for k in KEYS}
        good = np.all(np.isfinite(self.v["mach"]), axis=0)
        self.v = {k: v[:, good] for k, v in self.v.items()}
        self.line0 = (D["x"][0].copy(), D["y"][0].copy())

    def locate(self, x, y):
        if self.uniform is not None and self.line0 is not None:
            # upstream of the initial characteristic the stream is uniform
            lx, ly = self.line0
            order = np.argsort(ly)
            if 0 <= y <= ly.max() and x <= np.interp(y, ly[order], lx[order]) + 1e-12:
                st = dict(self.uniform)
                st["x"], st["y"] = float(x), float(y)
                return st
        vx, vy = self.v["x"], self.v["y"]
        x1, x2, x3 = vx
        y1, y2, y3 = vy
        det = (y2 - y3) * (x1 - x3) + (x3 - x2) * (y1 - y3)
        with np.errstate(divide="ignore", invalid="ignore"):
            l1 = ((y2 - y3) * (x - x3) + (x3 - x2) * (y - y3)) / det
            l2 = ((y3 - y1) * (x - x3) + (x1 - x3) * (y - y3)) / det
        l3 = 1 - l1 - l2
        tol = -1e-9
        inside = (l1 >= tol) & (l2 >= tol) & (l3 >= tol) & np.isfinite(l1)
        k = None
        if np.any(inside):
            k = int(np.flatnonzero(inside)[0])
        elif l1.size:
            # just outside the unfolded sheet (a shock leaving the edge of a fold): nearest triangle, clamped
            lm = np.where(np.isfinite(l1), np.minimum(np.minimum(l1, l2), l3), -np.inf)
            j = int(np.argmax(lm))
            if lm[j] > -self.slack:
                k = j
        if k is None and self.near > 0 and vx.size:
            # just beyond the triangulated region (next to a reflection point): the nearest vertex
            d2 = (vx - x) ** 2 + (vy - y) ** 2
            j = np.unravel_index(int(np.argmin(d2)), d2.shape)
            if d2[j] <= self.near**2:
                st = {q: float(self.v[q][j]) for q in KEYS}
                st["x"], st["y"] = float(x), float(y)
                return st
        if k is not None:
            w = np.clip(np.array([l1[k], l2[k], l3[k]]), 0.0, None)
            w = w / w.sum()
            st = {q: float(w @ self.v[q][:, k]) for q in KEYS}
            st["mach"] = float(rp.mach_of_nu(np.array([st["nu"]]), self.gamma)[0])
            st["x"], st["y"] = float(x), float(y)
            return st
        return None


@dataclass
class ShockFit:
    shock: dict  # arrays along the shock: x, y, beta, theta1, m1, m2, p2_p1, p02_p01, lnp01
    fronts: list  # region-2 fronts, dicts of arrays (shock -> wall)
    fate: str
    fate_detail: str
    warnings: list = field(default_factory=list)
    end: tuple | None = None  # (x, y) where the shock ends
    reflection: dict | None = None
    origin: list = field(default_factory=list)
    merged: int = 0


def _pt(d):
    return {k: np.asarray(float(d[k])) for k in KEYS}


def _stack(points):
    out = {k: np.array([float(p[k]) for p in points]) for k in KEYS}
    out["cm"] = np.array([int(p["cm"]) for p in points], dtype=np.int64)
    return out


def fit_shock(upstream, wall, start, front0, gamma, delta, step, x_stop, max_steps=4000, lower=None,
              lower_angle=None, lower_name="axis", frame=1):
    """March the shock from `start` (dict x, y, phi = shock direction, rad) behind `front0`.

    `front0` is the first known front behind the shock start (dict of arrays
    from the shock to the wall; one point for a compression corner).  `lower`
    is the boundary the shock runs toward, y = lower(x) (default the axis y = 0).
    """
    F = {k: np.atleast_1d(np.asarray(front0[k], float)) for k in KEYS}
    label = [int(start.get("label0", 1_000_000))]

    def new_label():
        label[0] += 1
        return label[0]

    F["cm"] = np.atleast_1d(np.asarray(front0.get("cm", [new_label() for _ in F["x"]]), dtype=np.int64))
    xs, ys, phi = float(start["x"]), float(start["y"]), float(start["phi"])
    sh = {k: [] for k in ("x", "y", "beta", "theta1", "m1", "m2", "p2_p1", "p02_p01", "lnp01", "deflection")}
    for k in sh:
        if k in start:
            sh[k].append(float(start[k]))
    fronts = [F]
    origin = []  # for each new front: index in the previous front of each point's C- parent (-1: none)
    warnings = []
    fate, detail, end, refl = "stopped", "the step limit was reached", None, None
    weak_run = 0
    merged = 0
    lnw = float(F["lnp0"][-1])  # total pressure on the wall streamline
    x_beyond = x_stop + 2.0 * step
    def to_boundary(x0, y0, ph, st):
        """Distance along direction ph from (x0, y0) to the lower boundary (secant steps)."""
        if lower is None:
            return -y0 / math.sin(ph) if math.sin(ph) < 0 else math.inf
        t0, t1 = 0.0, st
        f0, f1 = y0 - float(lower(x0)), y0 + st * math.sin(ph) - float(lower(x0 + st * math.cos(ph)))
        for _ in range(30):
            if f1 == f0:
                break
            t0, t1, f0 = t1, t1 - f1 * (t1 - t0) / (f1 - f0), f1
            f1 = y0 + t1 * math.sin(ph) - float(lower(x0 + t1 * math.cos(ph)))
            if abs(f1) < 1e-13:
                break
        return t1

    final = False
    for _ in range(max_steps):
        phi_new = phi
        status, beta, d, up = "ok", None, None, None
        hit_axis = False
        step_now = step
        tb_ = to_boundary(xs, ys, phi, step)
        if tb_ <= 0.05 * step:
            hit_axis = True
        elif tb_ <= step:
            final, step_now = True, tb_  # a last, shorter step that ends on the boundary
        for _it in range(0 if hit_axis else 3):
            pa = 0.5 * (phi + phi_new)
            xn, yn = xs + step_now * math.cos(pa), ys + step_now * math.sin(pa)
            ylow = 0.0 if lower is None else float(lower(xn))
            if final:
                yn = max(yn, ylow)
            elif yn <= ylow:
                hit_axis = True
                break
            up = upstream.locate(xn, yn)
            if up is None:
                status = "no_upstream"
                break
            status, beta, d = solve_beta(up, xn, yn, F, gamma, delta)
            if status == "vanishes" and d is not None and "q_index" in d:
                status = "ok"  # zero strength here: carry it on as a Mach wave
            if status != "ok":
                break
            phi_new = up["theta"] - beta
        if hit_axis:
            t = max(to_boundary(xs, ys, phi, step), 0.0)
            xe_ = xs + t * math.cos(phi)
            end = (xe_, 0.0 if lower is None else float(lower(xe_)))
            fate = "axis"
            tb = 0.0 if lower_angle is None else float(lower_angle(end[0]))
            refl = regular_reflection(sh, gamma, tb) if sh["m2"] else {"regular": True, "m2": None}
            if refl["regular"] and refl.get("m2") is None:
                detail = f"reaches the {lower_name} at x = {end[0]:.5g} at once (zero strength)"
            elif refl["regular"]:
                detail = (f"reaches the {lower_name} at x = {end[0]:.5g}; a regular "
                          f"reflection exists there (reflected shock angle {refl['beta_reflected_deg']:.4g} deg, "
                          f"pressure ratio {refl['p3_p2']:.4g})")
            else:
                detail = (f"reaches the {lower_name} at x = {end[0]:.5g}, where no regular reflection exists "
                          "(a Mach reflection would form): the march stops there")
            if not refl["regular"]:
                warnings.append("shock " + detail + ".")
            break
        if status != "ok":
            end = (xs, ys)
            if status == "vanishes":
                fate, detail = "decays", f"weakens to a Mach wave near x = {xs:.5g}, y = {ys * frame:.5g}"
            elif status == "too_strong":
                fate, detail = "too_strong", (f"would need more than the weak-shock deflection near x = {xs:.5g}, "
                                              f"y = {ys * frame:.5g} (detachment or Mach reflection): the march stops there")
                warnings.append("shock " + detail + ".")
            elif status == "no_upstream":
                fate, detail = "left_field", (f"leaves the region where the upstream flow is known near x = {xs:.5g}, "
                                              f"y = {ys * frame:.5g}: the march stops there")
                warnings.append("shock " + detail + ".")
            else:
                fate, detail = "lost", f"lost its downstream characteristic near x = {xs:.5g}, y = {ys * frame:.5g}"
                warnings.append("shock " + detail + ".")
            break
        # a shock that has weakened to a Mach wave for many steps has decayed
        weak_run = weak_run + 1 if d["p2_p1"] < 1.0 + 1e-9 else 0
        if weak_run >= 25 and sh["p2_p1"] and max(sh["p2_p1"]) > 1.0 + 1e-6:
            fate, end = "decays", (xs, ys)
            detail = f"weakens to a Mach wave near x = {xs:.5g}, y = {ys * frame:.5g}"
            break
        # accept the shock point
        for k, v in (("x", xn), ("y", yn), ("beta", beta), ("theta1", up["theta"]), ("m1", up["mach"]),
                     ("m2", d["mach"]), ("p2_p1", d["p2_p1"]), ("p02_p01", d["p02_p01"]), ("lnp01", up["lnp0"]),
                     ("deflection", d["deflection"])):
            sh[k].append(float(v))
        xs, ys, phi = xn, yn, phi_new
        # the new front behind the shock: shock point, then C- from the previous front above Q, then the wall
        pts = [dict(x=xn, y=yn, theta=d["theta"], nu=d["nu"], mach=d["mach"], lnp0=d["lnp0"], cm=new_label())]
        nF = F["x"].size
        j0 = d["q_index"] + 1 if nF > 1 else nF
        L = _pt(pts[0])
        broke = False
        at_wall = True
        used = [-1]
        skipped = 0
        for m in range(j0, nF):
            B = {k: np.asarray(F[k][m]) for k in KEYS}
            P = rp.interior(L, B, gamma, delta)
            if not np.isfinite(P["mach"]) or not (P["x"] > L["x"] - 1e-12 and P["y"] > L["y"] - 1e-12):
                # this C- has crossed its neighbour behind the shock (a second coalescence): it is merged
                # into the shock, i.e. dropped, and the march goes on with the next one
                skipped += 1
                continue
            pts.append({k: float(P[k]) for k in KEYS} | {"cm": int(F["cm"][m])})
            used.append(m)
            L = P
            if float(P["x"]) > x_beyond:
                # past the exit plane: nothing downstream of it can act on the nozzle flow; the front ends here
                at_wall = False
                break
        merged += skipped
        if skipped and (len(pts) < 2 or skipped > max(3, (nF - j0) // 2)):
            broke = True
        if broke:
            fate, end = "second_fold", (xs, ys)
            detail = (f"characteristics behind the shock cross again near x = {float(L['x']):.5g}, "
                      f"y = {float(L['y']) * frame:.5g} (a second shock would form there; not tracked): the march stops")
            warnings.append("shock " + detail + ".")
            break
        if not at_wall:
            origin.append(np.array(used, dtype=np.int64))
            F = _stack(pts)
            F["at_wall"] = np.array(False)
            fronts.append(F)
            if final:
                final = False
            if xs > x_stop:
                fate, end = "exit", (xs, ys)
                detail = f"leaves through the exit plane at y = {frame * np.interp(x_stop, sh['x'], sh['y']):.5g}"
                break
            continue
        Wp = rp.wall_point(L, wall, gamma, delta, lnp0_wall=np.asarray(lnw))
        if not np.isfinite(Wp["mach"]) or not float(Wp["x"]) > float(L["x"]) - 1e-12:
            fate, end = "wall_lost", (xs, ys)
            if float(L["mach"]) < 1.1:
                detail = (f"the flow behind the shock slows to sonic speed at the wall near x = {float(F['x'][-1]):.5g} "
                          "(the supersonic march cannot go on; the duct would choke): the march stops")
            else:
                detail = f"the wall point behind the shock after x = {float(F['x'][-1]):.5g} could not be found: the march stops"
            warnings.append("shock " + detail + ".")
            break
        pts.append({k: float(Wp[k]) for k in KEYS} | {"cm": new_label()})
        origin.append(np.array(used + [-1], dtype=np.int64))
        F = _stack(pts)
        F["at_wall"] = np.array(True)
        lnw = float(Wp["lnp0"])
        fronts.append(F)
        if final:
            final = False  # the next pass finds the shock on the boundary and ends it there
        if xs > x_stop and F["x"][-1] > x_stop:
            fate, end = "exit", (xs, ys)
            detail = f"leaves through the exit plane at y = {frame * np.interp(x_stop, sh['x'], sh['y']):.5g}"
            break
    shock = {k: np.asarray(v, float) for k, v in sh.items()}
    if merged:
        warnings.append(f"{merged} C- characteristics crossed behind the shock (compression waves catching up "
                        "with it) and were merged into it; the flow just behind the shock is approximate there.")
    return ShockFit(shock=shock, fronts=fronts, fate=fate, fate_detail=detail, warnings=warnings, end=end,
                    reflection=refl, origin=origin, merged=merged)


def regular_reflection(sh, gamma, boundary_angle=0.0):
    """Whether a regular reflection of the last shock point exists at the boundary (NACA Report 1135 theta_max).

    The flow behind the incident shock (theta1 - deflection) must be turned
    back parallel to the boundary (angle `boundary_angle`).
    """
    from moc.flow import max_deflection, oblique_shock

    m2 = sh["m2"][-1]
    th2 = sh["theta1"][-1] - sh["deflection"][-1]
    dfl = boundary_angle - th2
    out = {"m2": m2, "deflection_deg": math.degrees(dfl), "theta2_deg": math.degrees(th2)}
    if m2 <= 1.0:
        out["regular"] = False
        return out
    tmax, _ = max_deflection(m2, gamma)
    out["theta_max_deg"] = math.degrees(float(tmax))
    out["regular"] = bool(dfl <= float(tmax))
    if out["regular"]:
        s = oblique_shock(m2, max(dfl, 0.0), gamma)
        out["beta_reflected_deg"] = math.degrees(float(s.beta))
        out["p3_p2"] = float(s.p2_p1)
    return out

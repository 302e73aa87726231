"""Where characteristics of one family cross: the fold of the net and the first crossing point.

Each quadrilateral cell of the net is the image of a unit square of
characteristic labels; its signed area (the Jacobian of the map from labels
to x, y) keeps one sign while the net is one-to-one and changes sign where two
neighbouring characteristics of the same family have crossed (their envelope
is where a shock forms: Courant and Friedrichs, Supersonic Flow and Shock
Waves, 1948, simple-wave compression, from memory).  The first crossing is
refined by intersecting the two crossing characteristic segments of that cell.

`unfolded_cells` marks the cells whose whole domain of dependence is
unfolded: the flow upstream of any shock (the "first sheet" of a folded net).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from moc.analysis.march import cells, signed_area


@dataclass
class Crossing:
    x: float
    y: float
    family: str  # "C-" or "C+"
    cell: tuple  # (a, d) of the cell's first corner
    cell_size: float


def cell_jacobian(net):
    """(ia, id, J, cx, cy): J > 0 for a regular cell, <= 0 or NaN where folded or not computed."""
    ia, idd, cx, cy = cells(net)
    J = -signed_area(cx, cy)
    return ia, idd, J, cx, cy


def unfolded_cells(net):
    """Boolean array (rows-1, W+1) over cell labels: regular and with a regular domain of dependence."""
    ia, idd, J, cx, cy = cell_jacobian(net)
    R, W = net.rows, net.W
    good = np.zeros((R - 1, W + 1), bool)
    good[ia, idd] = np.isfinite(J) & (J > 0)
    ok = np.zeros_like(good)
    # fronts s = 2a - d: the neighbours across C- a (a-1, d-1) and across C+ b (a, d+1) lie on front s - 1
    for s in range(-W, 2 * (R - 2) + 2):
        d = np.arange(1, W)
        a = (s + d)
        sel = (a % 2 == 0)
        a, d = a[sel] // 2, d[sel]
        sel = (a >= 0) & (a <= R - 2)
        a, d = a[sel], d[sel]
        if a.size == 0:
            continue
        up1 = np.where((a >= 1) & (d >= 2), ok[np.maximum(a - 1, 0), np.maximum(d - 1, 0)], True)
        up2 = np.where(d + 1 <= W - 1, ok[a, np.minimum(d + 1, W)], True)
        ok[a, d] = good[a, d] & up1 & up2
    return ok


def _seg_intersect(p1, p2, q1, q2):
    """Intersection of segments p1-p2 and q1-q2 (arrays of shape (2,)), or None."""
    r, s = p2 - p1, q2 - q1
    den = r[0] * s[1] - r[1] * s[0]
    if abs(den) < 1e-300:
        return None
    qp = q1 - p1
    t = (qp[0] * s[1] - qp[1] * s[0]) / den
    u = (qp[0] * r[1] - qp[1] * r[0]) / den
    if -1e-9 <= t <= 1 + 1e-9 and -1e-9 <= u <= 1 + 1e-9:
        return p1 + t * r
    return None


def first_crossing(net):
    """The most upstream crossing of two same-family characteristics, or None if the net is one-to-one.

    Only folded cells whose upstream neighbours are regular count (the
    leading edge of a fold); among them the one with the smallest x.
    """
    ia, idd, J, cx, cy = cell_jacobian(net)
    ok = unfolded_cells(net)
    R, W = net.rows, net.W
    folded = np.isfinite(J) & (J <= 0)
    if not np.any(folded):
        return None
    a, d = ia[folded], idd[folded]
    up1 = np.where((a >= 1) & (d >= 2), ok[np.maximum(a - 1, 0), np.maximum(d - 1, 0)], True)
    up2 = np.where(d + 1 <= W - 1, ok[a, np.minimum(d + 1, W)], True)
    lead = up1 & up2
    if not np.any(lead):
        lead = np.ones_like(a, bool)
    fx, fy = cx[:, folded][:, lead], cy[:, folded][:, lead]
    a, d = a[lead], d[lead]
    k = int(np.argmin(fx.mean(axis=0)))
    X, Y = fx[:, k], fy[:, k]
    P = [np.array([X[i], Y[i]]) for i in range(4)]
    # corners: 0 (a,d), 1 (a+1,d+1), 2 (a+1,d), 3 (a,d-1)
    # C- a: 3-0, C- a+1: 1-2; C+ b: 0-1, C+ b+1: 3-2
    hit = _seg_intersect(P[3], P[0], P[2], P[1])
    fam = "C-"
    if hit is None:
        hit = _seg_intersect(P[0], P[1], P[3], P[2])
        fam = "C+"
    if hit is None:
        hit = np.array([X.mean(), Y.mean()])
        fam = "C-" if abs(X[0] - X[3]) + abs(X[1] - X[2]) > 0 else "?"
    size = float(np.sqrt(abs(J[folded][lead][k])) if np.isfinite(J[folded][lead][k]) else 0.0)
    size = max(size, float(np.hypot(X.max() - X.min(), Y.max() - Y.min())))
    return Crossing(float(hit[0]), float(hit[1]), fam, (int(a[k]), int(d[k])), size)

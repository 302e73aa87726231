"""Structured quadrilateral CFD domain of the nozzle interior, with an optional plume region.

Grid lines across the nozzle are straight lines x = const from the axis (or
centreline) to the wall, at stations spread along the wall in proportion to
arc length, each smooth part of the wall getting its share and every corner
(the throat of a minimum-length nozzle) being a station.  Across each line
the cells grow geometrically from the wall with a given first-cell height,
the usual wall grading of boundary-layer meshes (common practice).  The
plume region is a rectangle downstream of the exit, from the axis to a
given height; its rows continue the exit station's rows and grow upward
from the lip with the same first-cell height, and its columns start with
the nozzle's last axial step and grow geometrically downstream.  Named boundaries: inlet,
outlet, wall, axis (axisymmetric) or symmetry (planar), farfield (plume top
and the face above the lip).

Quality figures per cell: equiangle skewness max((a_max - 90)/90,
(90 - a_min)/90) over the corner angles, aspect ratio longest/shortest edge,
signed area (common practice).  A mesh with any inverted or non-convex cell
is refused.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from moc.errors import ExportError


@dataclass
class DomainMesh:
    """points (n, 2); quads (m, 4) counter-clockwise; boundaries name -> (k, 2) point pairs."""

    points: np.ndarray
    quads: np.ndarray
    boundaries: dict = field(default_factory=dict)

    def quality(self):
        return mesh_quality(self.points, self.quads)


def mesh_quality(points, quads):
    """Dict: max_skew, max_aspect, min_area, inverted (cells with a corner turning clockwise)."""
    p = points[quads]                      # (m, 4, 2)
    nxt = np.roll(p, -1, axis=1) - p       # edge k: corner k -> k+1
    prv = np.roll(p, 1, axis=1) - p        # corner k -> k-1
    cross = nxt[..., 0] * prv[..., 1] - nxt[..., 1] * prv[..., 0]
    dot = (nxt * prv).sum(-1)
    ang = np.degrees(np.arctan2(np.abs(cross), dot))
    skew = np.maximum((ang.max(1) - 90.0) / 90.0, (90.0 - ang.min(1)) / 90.0)
    length = np.hypot(nxt[..., 0], nxt[..., 1])
    area = 0.5 * (p[..., 0] * np.roll(p[..., 1], -1, 1) - np.roll(p[..., 0], -1, 1) * p[..., 1]).sum(1)
    bad = (cross <= 0.0).any(axis=1) | (area <= 0.0)
    with np.errstate(divide="ignore"):
        aspect = length.max(1) / length.min(1)
    return {
        "cells": int(len(quads)),
        "points": int(len(points)),
        "max_skew": float(skew.max()),
        "max_aspect": float(aspect.max()),
        "min_area": float(area.min()),
        "inverted": int(bad.sum()),
        "first_inverted": int(np.flatnonzero(bad)[0]) if bad.any() else -1,
    }


def geometric_ratio(total, first, n):
    """Ratio q > 1 with first (1 + q + ... + q^(n-1)) = total, vectorised over total (bisection on ln q)."""
    total = np.asarray(total, dtype=float)
    if np.any(first * n >= total):
        raise ExportError(
            f"the first cell ({first:.4g}) times the cells across ({n}) must be below the smallest height "
            f"to fill ({float(total.min()):.4g}); use a smaller first cell or fewer cells across."
        )
    lo = np.zeros_like(total)
    hi = np.full_like(total, np.log(total / first) + 1.0)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        q = np.exp(mid)
        s = first * np.expm1(n * mid) / np.expm1(mid)
        big = s > total
        hi = np.where(big, mid, hi)
        lo = np.where(big, lo, mid)
    return np.exp(0.5 * (lo + hi))


def graded(total, first, n):
    """Distances from the wall of n + 1 grid rows, first cell `first`, summing to `total` (per station)."""
    total = np.atleast_1d(np.asarray(total, dtype=float))
    q = geometric_ratio(total, first, n)
    k = np.arange(n + 1)
    d = first * np.expm1(k[None, :] * np.log(q)[:, None]) / np.expm1(np.log(q))[:, None]
    d[:, -1] = total
    return d


def wall_stations(contour, n):
    """(x, y) of n + 1 points along the contour: each piece gets cells in proportion to its length."""
    lengths, dense = [], []
    for p in contour.pieces:
        t = np.linspace(p.t0, p.t1, 2001)
        x, y = p.eval(t)
        s = np.concatenate([[0.0], np.cumsum(np.hypot(np.diff(x), np.diff(y)))])
        dense.append((t, s))
        lengths.append(s[-1])
    lengths = np.array(lengths)
    share = np.maximum(1, np.round(n * lengths / lengths.sum()).astype(int))
    share[np.argmax(share)] += n - share.sum()
    if np.any(share < 1):
        raise ExportError(f"{n} axial cells are too few for {len(share)} wall parts; use more axial cells.")
    xs, ys = [], []
    for k, (p, (t, s), m) in enumerate(zip(contour.pieces, dense, share)):
        tt = np.interp(np.linspace(0.0, s[-1], m + 1), s, t)
        x, y = p.eval(tt)
        sl = slice(1, None) if k else slice(None)
        xs.append(x[sl])
        ys.append(y[sl])
    x, y = np.concatenate(xs), np.concatenate(ys)
    if np.any(np.diff(x) <= 0.0):
        raise ExportError(
            "the wall turns back upstream, so straight cross-stream grid lines cannot fill it; "
            "this domain mesher needs a wall whose x increases from inlet to exit."
        )
    return x, y


def build(contour, axial_cells, radial_cells, first_cell, axisymmetric=True, plume_length=0.0,
          plume_height=None, plume_axial_cells=60, plume_radial_cells=40):
    """DomainMesh in the contour's length unit (all lengths in that unit)."""
    xw, yw = wall_stations(contour, axial_cells)
    nx, ny = xw.size, radial_cells + 1
    d = graded(yw, first_cell, radial_cells)          # (nx, ny) from the wall
    Y = (yw[:, None] - d)[:, ::-1]                    # row 0 on the axis, row ny-1 on the wall
    Y[:, 0] = 0.0
    X = np.repeat(xw[:, None], ny, axis=1)
    gid = np.arange(nx * ny).reshape(nx, ny)
    pts = [np.column_stack([X.ravel(), Y.ravel()])]
    blocks = [gid]
    axis_name = "axis" if axisymmetric else "symmetry"
    bnd = {
        "inlet": _line(gid[0, :]),
        "wall": _line(gid[:, -1]),
        axis_name: [_line(gid[:, 0])],
    }
    if plume_length > 0.0:
        ye = yw[-1]
        h = plume_height if plume_height is not None else 3.0 * ye
        if h <= ye * (1 + 1e-9):
            raise ExportError(f"--plume-height ({h:.4g}) must exceed the exit radius/half-height ({ye:.4g}).")
        up = ye + graded(h - ye, first_cell, plume_radial_cells)[0, 1:]
        rows = np.concatenate([Y[-1], up])
        dx = xw[-1] - xw[-2]  # the plume's first column continues the nozzle's last, then grows
        if dx * plume_axial_cells < plume_length * (1 - 1e-9):
            xp = xw[-1] + graded(plume_length, dx, plume_axial_cells)[0, 1:]
        else:
            xp = xw[-1] + plume_length * np.arange(1, plume_axial_cells + 1) / plume_axial_cells
        npr = rows.size
        pg = np.empty((plume_axial_cells + 1, npr), dtype=np.int64)
        pg[0, :ny] = gid[-1]
        nfirst = npr - ny
        start = nx * ny
        pg[0, ny:] = start + np.arange(nfirst)
        pg[1:, :] = start + nfirst + np.arange(plume_axial_cells * npr).reshape(plume_axial_cells, npr)
        pts.append(np.column_stack([np.full(nfirst, xw[-1]), up]))
        PX, PY = np.meshgrid(xp, rows, indexing="ij")
        pts.append(np.column_stack([PX.ravel(), PY.ravel()]))
        blocks.append(pg)
        bnd[axis_name].append(_line(pg[:, 0]))
        bnd["outlet"] = _line(pg[-1, :])
        bnd["farfield"] = np.concatenate([_line(pg[:, -1]), _line(pg[0, ny - 1:])])
    else:
        bnd["outlet"] = _line(gid[-1, :])
    bnd[axis_name] = np.concatenate(bnd[axis_name])
    quads = np.concatenate([
        np.stack([g[:-1, :-1], g[1:, :-1], g[1:, 1:], g[:-1, 1:]], axis=-1).reshape(-1, 4) for g in blocks
    ])
    mesh = DomainMesh(np.concatenate(pts), quads, bnd)
    q = mesh.quality()
    if q["inverted"]:
        c = mesh.points[quads[q["first_inverted"]]].mean(0)
        raise ExportError(
            f"the domain mesh would have {q['inverted']} inverted or non-convex cells (the first near "
            f"x = {c[0]:.4g}, y = {c[1]:.4g}); nothing was written. Use more axial cells or a smaller first cell."
        )
    return mesh


def _line(ids):
    return np.column_stack([ids[:-1], ids[1:]])

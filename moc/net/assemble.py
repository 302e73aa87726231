"""Turning computed grids into net arrays (points, labels, cells) for `moc.result.Net`.

Cells are quadrilaterals in characteristic coordinates; where a cell has one
corner outside the grid (next to the axis) it is a triangle (repeated index),
and the strips between the last grid points of two C+ characteristics and
the wall are triangulated by a zipper between the two point chains.  Every
cell is oriented counter-clockwise in (x, y).
"""

import numpy as np


def grid_cells(index, inside, valid):
    """Cells of the grid: `index` maps [i, j] to a point number (-1 where none)."""
    a = index[:-1, :-1]
    b = index[:-1, 1:]
    c = index[1:, 1:]
    d = index[1:, :-1]
    ia, ib, ic, id_ = inside[:-1, :-1], inside[:-1, 1:], inside[1:, 1:], inside[1:, :-1]
    full = ia & ib & ic & id_
    quads = np.stack([a[full], b[full], c[full], d[full]], axis=1)
    # triangle next to the axis: corner d (i+1, j) is not part of the grid
    tri = ia & ib & ic & ~valid[1:, :-1]
    tris = np.stack([a[tri], b[tri], c[tri], a[tri]], axis=1)
    return np.concatenate([quads, tris], axis=0)


def zipper(chain_a, chain_b, x, y):
    """Triangles between two point chains (point numbers) that start side by side."""
    out = []
    ia = ib = 0
    la, lb = len(chain_a), len(chain_b)
    while ia < la - 1 or ib < lb - 1:
        if ia == la - 1:
            adv_a = False
        elif ib == lb - 1:
            adv_a = True
        else:
            pa, pb = chain_a[ia + 1], chain_b[ib + 1]
            da = np.hypot(x[pa] - x[chain_b[ib]], y[pa] - y[chain_b[ib]])
            db = np.hypot(x[pb] - x[chain_a[ia]], y[pb] - y[chain_a[ia]])
            adv_a = da <= db
        if adv_a:
            out.append((chain_a[ia], chain_b[ib], chain_a[ia + 1], chain_a[ia]))
            ia += 1
        else:
            out.append((chain_a[ia], chain_b[ib], chain_b[ib + 1], chain_a[ia]))
            ib += 1
    return out


def orient_ccw(cells, x, y):
    """Reverse cells whose signed (shoelace) area is negative."""
    cells = np.asarray(cells, dtype=np.int64).reshape(-1, 4)
    px, py = x[cells], y[cells]
    area = 0.5 * np.sum(px * np.roll(py, -1, axis=1) - np.roll(px, -1, axis=1) * py, axis=1)
    flip = area < 0.0
    cells[flip] = cells[flip][:, ::-1]
    return cells


def net_arrays(x, y, theta, mach, cplus, cminus, cells):
    """Keyword arrays for `moc.result.Net` (cells oriented, p0_ratio all ones)."""
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    return dict(x=x, y=y, theta=np.asarray(theta, dtype=float), mach=np.asarray(mach, dtype=float),
                cplus=np.asarray(cplus), cminus=np.asarray(cminus),
                cells=orient_ccw(cells, x, y), p0_ratio=np.ones_like(x))

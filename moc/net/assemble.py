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


def _tri_area(x, y, a, b, c):
    return 0.5 * ((x[b] - x[a]) * (y[c] - y[a]) - (x[c] - x[a]) * (y[b] - y[a]))


def zipper(chain_a, chain_b, x, y):
    """Triangles between two point chains (point numbers) that start side by side.

    The strip polygon is chain_a followed by chain_b reversed; at each step the
    chain to advance is the one giving the shorter diagonal, unless that
    triangle would be turned the wrong way (outside a non-convex strip)."""
    poly = list(chain_a) + list(chain_b)[::-1]
    px, py = x[poly], y[poly]
    sign = np.sign(np.sum(px * np.roll(py, -1) - np.roll(px, -1) * py))
    out = []
    ia = ib = 0
    la, lb = len(chain_a), len(chain_b)
    while ia < la - 1 or ib < lb - 1:
        a0, b0 = chain_a[ia], chain_b[ib]
        ok_a = ia < la - 1 and np.sign(_tri_area(x, y, a0, chain_a[ia + 1], b0)) == sign
        ok_b = ib < lb - 1 and np.sign(_tri_area(x, y, a0, chain_b[ib + 1], b0)) == sign
        if ok_a and ok_b:
            pa, pb = chain_a[ia + 1], chain_b[ib + 1]
            adv_a = np.hypot(x[pa] - x[b0], y[pa] - y[b0]) <= np.hypot(x[pb] - x[a0], y[pb] - y[a0])
        elif ok_a or ok_b:
            adv_a = ok_a
        else:  # degenerate strip: advance whichever chain remains
            adv_a = ia < la - 1
        if adv_a:
            out.append((a0, b0, chain_a[ia + 1], a0))
            ia += 1
        else:
            out.append((a0, b0, chain_b[ib + 1], a0))
            ib += 1
    return out


def orient_ccw(cells, x, y):
    """Reverse cells whose signed (shoelace) area is negative (column by column, to
    keep the temporaries small for large nets)."""
    cells = np.asarray(cells, dtype=np.int64).reshape(-1, 4)
    area = np.zeros(cells.shape[0])
    for k in range(4):
        a, b = cells[:, k], cells[:, (k + 1) % 4]
        area += x[a] * y[b] - x[b] * y[a]
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

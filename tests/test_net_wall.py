"""Wall finding in a computed net (mass balance and streamline tracing), checked on
the exact radial source flow inside a wedge (planar) or a cone (axisymmetric).

Source: exact radial source flow (Zucrow and Hoffman, Gas Dynamics vol. 1, 1976,
from memory): the rays phi = const are streamlines and the mass flux between the
axis and the ray phi_w is rho V r (phi_w) planar or rho V r^2 (1 - cos phi_w)
axisymmetric (per radian), with rho V / (rho* a*) = 1/(A/A*)(M) and
A/A* = (r/r*)^(1+delta) (NACA Report 1135) - so the flux is exactly phi_w or
1 - cos phi_w in throat units, whatever r.
"""

import numpy as np
import pytest

from moc.flow import mach_from_area_ratio
from moc.net import mass_balance_wall, march_from_line, points, trace_streamline

G = 1.4


def arc(r, phi, delta):
    x, y = r * np.cos(phi), r * np.sin(phi)
    return points(x, y, phi, mach_from_area_ratio(r ** (1 + delta), G), G)


PHIW, OUTER = 0.3, 0.45  # wall ray inside the net; the net's own wall is the ray OUTER


def cone_net(k, delta):
    """Net from the arc r = 1.2 (k intervals, the wall ray on a grid point) inside the
    wedge/cone phi < OUTER, marched with inverse wall points to x = 8."""
    ph = np.linspace(0.0, OUTER, k + 1)
    t = np.tan(OUTER)
    return march_from_line(arc(1.2, ph, delta), G, delta,
                           wall=lambda x: (x * t, np.full_like(x, t)), x_end=8.0)


def crossing_rows(g, first):
    """Rows from `first` on whose C+ line crosses the ray PHIW inside the net."""
    out = []
    for r in range(first, g.shape[0]):
        ok = np.isfinite(g.x[r])
        if ok.sum() >= 2 and np.max(np.arctan2(g.y[r][ok], g.x[r][ok])) > PHIW + 1e-3:
            out.append(r)
    return np.array(out)


@pytest.mark.parametrize("delta", [0, 1])
def test_mass_balance_wall_finds_the_streamline(delta):
    target = PHIW if delta == 0 else 1.0 - np.cos(PHIW)
    errs = []
    for k in (12, 24, 48):
        g = cone_net(k, delta)
        rows = crossing_rows(g, k)  # row k starts at the axis end of the arc; later rows too
        assert rows.size >= 5
        w = mass_balance_wall(g, G, delta, target=target, rows=rows)
        errs.append(np.max(np.abs(np.arctan2(w["y"], w["x"]) - PHIW)) + np.max(np.abs(w["theta"] - PHIW)))
    e = np.array(errs)
    assert e[-1] < 1e-4
    assert np.all(np.log2(e[:-1] / e[1:]) > 1.8), e


@pytest.mark.parametrize("delta", [0, 1])
def test_streamline_trace_follows_the_ray(delta):
    errs = []
    for k in (12, 24, 48):
        g = cone_net(k, delta)
        kw = 2 * k // 3  # the arc point on the ray PHIW
        rows = crossing_rows(g, k - kw + 1)
        x0, y0 = 1.2 * np.cos(PHIW), 1.2 * np.sin(PHIW)
        sx, sy, st = trace_streamline(g, x0, y0, PHIW, rows=rows)
        assert sx[-1] > 4.0
        errs.append(np.max(np.abs(np.arctan2(sy, sx) - PHIW)))
    e = np.array(errs)
    if delta == 0:
        # planar: theta on each C+ is exact (Riemann invariant), the ray is traced exactly
        assert np.all(e < 1e-12), e
    else:
        assert e[-1] < 1e-4
        assert np.all(np.log2(e[:-1] / e[1:]) > 1.8), e

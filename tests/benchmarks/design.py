"""Benchmark of the minimum-length designer (a script, not collected by pytest).

Run:  python tests/benchmarks/design.py [n ...]

Designs the axisymmetric Me = 3, gamma = 1.4 nozzle at n = 100, 300 and 1000
characteristics (or the n given) and prints, for each n: the wall time of the
whole design (corner-angle search included), the time of one net (kernel
march + Goursat turning region) with its points per second, the peak memory
traced by tracemalloc during one design, and the error of the exit area ratio
of the streamline-traced wall against the isentropic A/A* (NACA Report 1135).
"""

import sys
import time
import tracemalloc

import numpy as np

from moc.design import design_minimum_length
from moc.design.minimum_length import CLUSTER_POWER, _kernel
from moc.flow import area_ratio, prandtl_meyer
from moc.net._pm import mu_of_nu
from moc.net.march import goursat
from moc.net.points import Points
from moc.net.wall import cumulative_flux, throat_flux

ME, GAMMA = 3.0, 1.4


def net_only(theta_c, n):
    """One kernel march and one Goursat solve, as the designer does them."""
    t0 = time.perf_counter()
    (kgrid, ax, axn), fan = _kernel(theta_c, n, GAMMA, 1, CLUSTER_POWER)
    t1 = time.perf_counter()
    mu_e = float(mu_of_nu(np.array([axn[-1]]), GAMMA)[0])
    ye = area_ratio(ME, GAMMA) ** 0.5 * np.arange(n + 4) / n
    cp = Points(kgrid.x[n - 1, n - 1] + ye / np.tan(mu_e), ye, np.zeros(n + 4),
                np.full(n + 4, axn[-1]), np.full(n + 4, mu_e))
    kcum, _ = cumulative_flux(kgrid.x, kgrid.y, kgrid.mu, GAMMA, 1)
    g = goursat(kgrid.cminus(n - 1), cp, GAMMA, 1, flux0=kcum[:, n - 1], flux_target=throat_flux(1))
    t2 = time.perf_counter()
    return kgrid.size + g.size - n, t1 - t0, t2 - t1


def main(ns):
    print(f"axisymmetric minimum-length nozzle, Me = {ME}, gamma = {GAMMA}")
    print(f"{'n':>6} {'design s':>9} {'net pts':>9} {'kernel s':>9} {'turning s':>9} "
          f"{'us/point':>9} {'pts/s':>10} {'peak MB':>8} {'AR err (stream)':>16} {'mass err':>9}")
    for n in ns:
        t0 = time.perf_counter()
        r = design_minimum_length(ME, GAMMA, "axisymmetric", n)
        t_design = time.perf_counter() - t0
        s = r.summary
        pts, tk, tg = net_only(np.radians(s["corner_angle_deg"]), n)
        tracemalloc.start()
        design_minimum_length(ME, GAMMA, "axisymmetric", n)
        peak = tracemalloc.get_traced_memory()[1] / 2**20
        tracemalloc.stop()
        tn = tk + tg
        print(f"{n:6d} {t_design:9.2f} {pts:9d} {tk:9.3f} {tg:9.3f} {1e6 * tn / pts:9.2f} "
              f"{pts / tn:10.3g} {peak:8.1f} {s['area_ratio_streamline_error']:16.3e} "
              f"{s['mass_flow_error']:9.2e}")
    print(f"(exit area ratio of the mass-balance wall is exact by construction; corner angle at the "
          f"last n: {s['corner_angle_deg']:.6f} deg, nu(Me)/2 = {np.degrees(prandtl_meyer(ME, GAMMA)) / 2:.4f} deg)")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [100, 300, 1000])

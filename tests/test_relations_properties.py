"""Property tests of the relations (hypothesis): exact invariants, no external table."""

import math

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from moc import flow

gammas = st.floats(1.05, 5 / 3)


@settings(max_examples=200, deadline=None)
@given(m=st.floats(1.0, 50.0), g=gammas)
def test_inverse_prandtl_meyer_undoes_forward(m, g):
    # Exact invariant: M(nu(M)) = M.
    nu = flow.prandtl_meyer(m, g)
    assert abs(flow.mach_from_prandtl_meyer(nu, g) - m) <= 1e-10 * m


@settings(max_examples=200, deadline=None)
@given(frac=st.floats(0.0, 0.999), g=gammas)
def test_forward_prandtl_meyer_undoes_inverse(frac, g):
    # Exact invariant: nu(M(nu)) = nu over 0 <= nu < nu_max.
    nu = frac * flow.nu_max(g)
    assert abs(flow.prandtl_meyer(flow.mach_from_prandtl_meyer(nu, g), g) - nu) <= 1e-10 * max(nu, 1e-3)


@settings(max_examples=200, deadline=None)
@given(m=st.floats(1.0, 30.0), g=gammas)
def test_inverse_area_ratio_supersonic(m, g):
    a = flow.area_ratio(m, g)
    assert abs(flow.mach_from_area_ratio(a, g) - m) <= 1e-10 * m + 1e-7 * (m < 1.0001)


@settings(max_examples=200, deadline=None)
@given(m=st.floats(0.01, 1.0), g=gammas)
def test_inverse_area_ratio_subsonic(m, g):
    a = flow.area_ratio(m, g)
    # near M = 1 A/A* - 1 ~ (M-1)^2, so the recoverable accuracy is sqrt(eps) there
    tol = 1e-10 if m < 0.999 else 1e-7
    assert abs(flow.mach_from_area_ratio(a, g, supersonic=False) - m) <= tol


@settings(max_examples=200, deadline=None)
@given(m=st.floats(1.05, 20.0), frac=st.floats(0.0, 1.0), g=gammas)
def test_shock_roots_bracket_beta_max_and_invert(m, frac, g):
    tmax, bmax = flow.max_deflection(m, g)
    th = frac * tmax * 0.999
    bw = flow.shock_angle(m, th, g, "weak")
    bs = flow.shock_angle(m, th, g, "strong")
    # weak root below, strong root above the beta of theta_max
    assert bw <= bmax + 1e-12 <= bs + 2e-12
    # theta(beta) undoes beta(theta) on both branches
    assert abs(flow.deflection_from_shock_angle(m, bw, g) - th) <= 1e-10
    assert abs(flow.deflection_from_shock_angle(m, bs, g) - th) <= 1e-10


@settings(max_examples=200, deadline=None)
@given(m=st.floats(1.0, 20.0), frac=st.floats(0.0, 1.0), g=gammas)
def test_total_pressure_never_rises_across_a_shock(m, frac, g):
    # Second law (entropy never decreases across a shock): p02/p01 <= 1.
    tmax, _ = flow.max_deflection(m, g)
    for root in ("weak", "strong"):
        s = flow.oblique_shock(m, frac * tmax, g, root)
        assert s.p02_p01 <= 1.0 + 1e-12
    assert flow.normal_shock(m, g).p02_p01 <= 1.0 + 1e-12


def test_prandtl_meyer_near_sonic_and_near_max():
    # Robustness at the ends of the range (no failure near M = 1 or near nu_max).
    g = 1.4
    for nu in (1e-14, 1e-10, 1e-6):
        m = flow.mach_from_prandtl_meyer(nu, g)
        assert m > 1.0 and math.isfinite(m)
        assert abs(flow.prandtl_meyer(m, g) - nu) <= 1e-9 * nu + 1e-15
    nmax = flow.nu_max(g)
    m = flow.mach_from_prandtl_meyer(nmax * (1 - 1e-6), g)
    assert math.isfinite(m) and m > 100
    assert np.all(np.isfinite(flow.mach_from_prandtl_meyer(np.linspace(0, nmax * 0.999999, 1001), g)))

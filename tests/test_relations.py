"""Gas-dynamics relations against published tables and closed forms.

Source: NACA Report 1135 (Ames Research Staff, 1953), "Equations, tables, and
charts for compressible flow" (isentropic, Prandtl-Meyer, normal- and
oblique-shock equations and tables; table numbering from memory), values as
collected in ../shared/VALIDATION.md.
"""

import math

import numpy as np
import pytest

from moc import flow
from moc.errors import DetachedShockError, GammaError, MachError, NonFiniteError, PrandtlMeyerError

deg = math.degrees
rad = math.radians


# Source: NACA Report 1135, isentropic-flow table (gamma = 1.4).
ISENTROPIC = [
    # M, p/p0, rho/rho0, T/T0, A/A*
    (0.5, 0.84302, 0.88517, 0.95238, 1.33984),
    (1.5, 0.272403, 0.394984, 0.689655, 1.17617),
    (2.0, 0.127805, 0.230048, 5 / 9, 27 / 16),
    (2.4, 0.068399, 0.147195, 0.464684, 2.40310),
    (3.0, 0.027224, 0.076226, 5 / 14, 4.23457),
    (5.0, 1.890e-3, 1.1340e-2, 1 / 6, 25.0),
]


@pytest.mark.parametrize("m,p,r,t,a", ISENTROPIC)
def test_isentropic_table(m, p, r, t, a):
    # Source: NACA Report 1135 isentropic table; tolerance: last printed digit.
    assert flow.pressure_ratio(m) == pytest.approx(p, rel=2e-4)
    assert flow.density_ratio(m) == pytest.approx(r, rel=2e-4)
    assert flow.temperature_ratio(m) == pytest.approx(t, rel=1e-5)
    assert flow.area_ratio(m) == pytest.approx(a, rel=1e-5)


# Source: NACA Report 1135 Prandtl-Meyer table (gamma = 1.4): nu and mu in degrees.
PM = [(1.5, 11.9052, 41.8103), (2.0, 26.3798, 30.0), (2.4, 36.7465, 24.6243),
      (3.0, 49.7573, 19.4712), (5.0, 76.9202, 11.5370)]


@pytest.mark.parametrize("m,nu,mu", PM)
def test_prandtl_meyer_table(m, nu, mu):
    # Source: NACA Report 1135, Prandtl-Meyer function table.
    assert deg(flow.prandtl_meyer(m)) == pytest.approx(nu, abs=1e-4)
    assert deg(flow.mach_angle(m)) == pytest.approx(mu, abs=1e-4)


def test_inverse_prandtl_meyer_table():
    # Source: NACA Report 1135 / ../shared/VALIDATION.md: nu = 10, 20, 30, 40 deg.
    m = flow.mach_from_prandtl_meyer(np.radians([10, 20, 30, 40]))
    np.testing.assert_allclose(m, [1.43497, 1.77498, 2.13391, 2.53782], atol=1e-5)


def test_nu_max_closed_form():
    # Source: NACA Report 1135 closed form nu_max = 90 (sqrt((g+1)/(g-1)) - 1) deg.
    assert deg(flow.nu_max(1.4)) == pytest.approx(130.454, abs=1e-3)
    assert deg(flow.nu_max(1.25)) == pytest.approx(180.0, abs=1e-12)
    assert deg(flow.nu_max(5 / 3)) == pytest.approx(90.0, abs=1e-12)


def test_other_gammas_closed_forms():
    # Source: closed forms of NACA Report 1135 evaluated for other gammas
    # (values in ../shared/VALIDATION.md); exact special values.
    assert deg(flow.prandtl_meyer(2.0, 1.25)) == pytest.approx(30.0, abs=1e-10)
    assert flow.area_ratio(3.0, 5 / 3) == pytest.approx(3.0, rel=1e-12)
    assert deg(flow.prandtl_meyer(2.0, 1.2)) == pytest.approx(31.4561, abs=1e-4)
    assert deg(flow.prandtl_meyer(3.0, 1.2)) == pytest.approx(63.6540, abs=1e-4)
    assert flow.area_ratio(3.0, 1.2) == pytest.approx(6.73541, rel=1e-5)
    assert deg(flow.prandtl_meyer(2.0, 1.3)) == pytest.approx(28.6809, abs=1e-4)
    assert flow.area_ratio(3.0, 1.3) == pytest.approx(5.15977, rel=1e-5)


def test_mass_flow_parameter_at_throat():
    # Source: closed form; at M = 1 the mass-flow function equals
    # sqrt(g) (2/(g+1))^((g+1)/(2(g-1))) = 0.684731 for gamma = 1.4 (common practice value).
    assert flow.mass_flow_parameter(1.0) == pytest.approx(0.684731, rel=1e-5)
    assert flow.choked_mass_flow_parameter(1.4) == pytest.approx(0.684731, rel=1e-5)
    # A/A* = (mass-flow function at M = 1) / (mass-flow function at M): exact invariant.
    m = np.linspace(0.2, 5, 50)
    np.testing.assert_allclose(flow.choked_mass_flow_parameter(1.3) / flow.mass_flow_parameter(m, 1.3),
                               flow.area_ratio(m, 1.3), rtol=1e-12)


# Source: NACA Report 1135 normal-shock table (gamma = 1.4).
NORMAL = [(1.5, 0.70109, 2.45833, 1.86207, 1.32022, 0.92979),
          (2.0, 0.57735, 4.5, 2.66667, 1.6875, 0.72087),
          (3.0, 0.47519, 10.33333, 3.85714, 2.67901, 0.32834)]


@pytest.mark.parametrize("m1,m2,p,r,t,p0", NORMAL)
def test_normal_shock_table(m1, m2, p, r, t, p0):
    s = flow.normal_shock(m1)
    assert s.m2 == pytest.approx(m2, abs=1e-5)
    assert s.p2_p1 == pytest.approx(p, rel=1e-5)
    assert s.rho2_rho1 == pytest.approx(r, rel=1e-5)
    assert s.T2_T1 == pytest.approx(t, rel=1e-5)
    assert s.p02_p01 == pytest.approx(p0, abs=1e-5)


# Source: NACA Report 1135 oblique-shock equations and charts (gamma = 1.4).
OBLIQUE = [(2, 10, 39.314, 83.700, 1.6405, 1.7066, None),
           (2, 15, 45.344, 79.832, 1.4457, 2.1947, 0.95236),
           (3, 10, 27.383, 86.408, 2.5050, 2.0545, 0.96308),
           (1.5, 10, 56.679, None, 1.1144, 1.6662, None),
           (5, 20, 29.801, None, 3.0222, 7.0374, None)]


@pytest.mark.parametrize("m1,th,bw,bs,m2,p,p0", OBLIQUE)
def test_oblique_shock_table(m1, th, bw, bs, m2, p, p0):
    s = flow.oblique_shock(m1, rad(th))
    assert deg(s.beta) == pytest.approx(bw, abs=2e-3)
    assert s.m2 == pytest.approx(m2, abs=2e-4)
    assert s.p2_p1 == pytest.approx(p, rel=2e-4)
    if p0 is not None:
        assert s.p02_p01 == pytest.approx(p0, abs=2e-5)
    if bs is not None:
        assert deg(flow.shock_angle(m1, rad(th), root="strong")) == pytest.approx(bs, abs=2e-3)


def test_oblique_worked_example():
    # Source: Anderson, Fundamentals of Aerodynamics, oblique-shock chapter worked
    # example (from memory): M1 = 2, theta = 20 deg: beta = 53.42, M2 = 1.2102, p2/p1 = 2.8429.
    s = flow.oblique_shock(2.0, rad(20))
    assert deg(s.beta) == pytest.approx(53.42, abs=0.01)
    assert s.m2 == pytest.approx(1.2102, abs=2e-4)
    assert s.p2_p1 == pytest.approx(2.8429, rel=2e-4)


def test_well_known_weak_and_strong_root():
    # Common practice (a well-known fact of the trade): M1 = 2, 15 deg: weak ~45 deg, strong ~80 deg.
    assert deg(flow.shock_angle(2, rad(15))) == pytest.approx(45.34, abs=0.05)
    assert deg(flow.shock_angle(2, rad(15), root="strong")) == pytest.approx(79.8, abs=0.05)


@pytest.mark.parametrize("m,tmax,bmax", [(1.5, 12.113, 66.59), (2, 22.974, 64.67), (3, 34.073, 65.24), (5, 41.118, 66.58)])
def test_theta_max(m, tmax, bmax):
    # Source: NACA Report 1135 closed form of the maximum deflection (values in VALIDATION.md).
    t, b = flow.max_deflection(m)
    assert deg(t) == pytest.approx(tmax, abs=2e-3)
    assert deg(b) == pytest.approx(bmax, abs=1e-2)


def test_theta_max_hypersonic_limit():
    # Source: NACA Report 1135: theta_max -> 45.58 deg as M1 -> infinity (gamma = 1.4).
    assert deg(flow.max_deflection(1e4)[0]) == pytest.approx(45.58, abs=0.01)


def test_theta_max_is_the_maximum():
    # Exact invariant: theta(beta) has its maximum at beta_max.
    for m in (1.2, 2.0, 4.0):
        t, b = flow.max_deflection(m, 1.3)
        for db in (-1e-3, 1e-3):
            assert flow.deflection_from_shock_angle(m, b + db, 1.3) < t


def test_sonic_deflection_gives_sonic_flow():
    # Exact invariant: behind the shock at (theta_sonic, beta_sonic) the Mach number is 1,
    # and theta_sonic lies just below theta_max (NACA Report 1135 charts).
    for m in (1.5, 2.0, 3.0, 6.0):
        ts, bs = flow.sonic_deflection(m)
        s = flow.oblique_shock_from_angle(m, bs)
        assert s.m2 == pytest.approx(1.0, abs=1e-10)
        assert ts < flow.max_deflection(m)[0]


def test_normal_shock_is_beta_90():
    # Exact invariant: an oblique shock at beta = 90 deg is the normal shock.
    for m in (1.5, 2.5, 4):
        a, b = flow.normal_shock(m), flow.oblique_shock_from_angle(m, math.pi / 2)
        assert a.m2 == pytest.approx(b.m2, rel=1e-12)
        assert a.p02_p01 == pytest.approx(b.p02_p01, rel=1e-12)


def test_vectorised_scalars_in_scalars_out():
    assert isinstance(flow.area_ratio(2.0), float)
    assert flow.area_ratio([2.0, 3.0]).shape == (2,)
    assert flow.shock_angle(np.array([2.0, 3.0]), rad(10)).shape == (2,)


# --- errors -----------------------------------------------------------------

def test_errors_are_specific_sentences():
    with pytest.raises(GammaError, match="above 1"):
        flow.area_ratio(2.0, 1.0)
    with pytest.raises(MachError, match="positive"):
        flow.pressure_ratio(-1.0)
    with pytest.raises(MachError, match="supersonic"):
        flow.prandtl_meyer(0.8)
    with pytest.raises(NonFiniteError, match="finite"):
        flow.area_ratio(float("nan"))
    with pytest.raises(NonFiniteError, match="finite"):
        flow.area_ratio(2.0, float("inf"))
    with pytest.raises(PrandtlMeyerError, match="nu_max"):
        flow.mach_from_prandtl_meyer(rad(140))
    with pytest.raises(DetachedShockError, match=r"theta_max = 22\.97"):
        flow.shock_angle(2.0, rad(30))

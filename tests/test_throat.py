"""Transonic throat solutions: Sauer (1947) and Hall (1962) fields, discharge coefficients,
sonic-line position, and the supersonic initial-value line."""

import numpy as np
import pytest

from moc import throat
from moc.errors import InputError

GEOS = ("planar", "axisymmetric")


def sauer_published(xs, y, R, g, d):
    """Sauer's perturbation velocities, origin at the axis sonic point.

    Source: R. Sauer, NACA TM 1147 (1947); form as in Zucrow and Hoffman, Gas
    Dynamics vol. 2 (1977), from memory (as written in VALIDATION.md).
    """
    a = np.sqrt((1 + d) / ((g + 1) * R))
    up = a * xs + (g + 1) * a**2 * y**2 / (2 * (1 + d))
    vp = (g + 1) * a**2 * xs * y / (1 + d) + (g + 1) ** 2 * a**3 * y**3 / (2 * (1 + d) * (3 + d))
    return 1 + up, vp


@pytest.mark.parametrize("geo,expected", [("planar", 0.18257), ("axisymmetric", 0.19365)])
def test_sauer_sonic_shift_R2(geo, expected):
    # Source: Sauer (1947) via VALIDATION.md "Transonic throat": eps = (g+1) a / (2 (3+d)).
    assert throat.sonic_shift(2.0, 1.4, geo, "sauer") == pytest.approx(expected, abs=1e-5)


@pytest.mark.parametrize("geo", GEOS)
@pytest.mark.parametrize("R,g", [(1.0, 1.4), (3.5, 1.2), (8.0, 1.3)])
def test_sauer_field_matches_published_form(geo, R, g):
    # Source: Sauer (1947) published form (see sauer_published); the module builds its
    # field from the first-order term of the expansion table, so this is an independent check.
    d = GEOS.index(geo)
    eps = (g + 1) * np.sqrt((1 + d) / ((g + 1) * R)) / (2 * (3 + d))
    rng = np.random.default_rng(1)
    x = rng.uniform(-0.3, 0.4, 50)
    y = rng.uniform(0.0, 1.0, 50)
    u, v = throat.velocity(x, y, R, g, geo, "sauer")
    ue, ve = sauer_published(x - eps, y, R, g, d)
    assert np.allclose(u, ue, atol=1e-13) and np.allclose(v, ve, atol=1e-13)


def residuals(R, g, geo, sol):
    """Max |irrotationality| and |continuity| residuals of the field, central differences.

    Equations: irrotational isentropic flow, (a^2-u^2) u_x - 2uv u_y + (a^2-v^2) v_y
    + d a^2 v/y = 0 (Source: Zucrow and Hoffman, Gas Dynamics vol. 1, velocity-potential
    equation; from memory), a^2 = (g+1)/2 - (g-1)/2 (u^2+v^2) in units of a*.
    Points are taken at fixed scaled positions z = x / sqrt((g+1)/((1+d) R)).
    """
    d = GEOS.index(geo)
    s = np.sqrt((g + 1) / ((1 + d) * R))
    zz, yy = np.meshgrid(np.linspace(-0.6, 0.6, 9), np.linspace(0.1, 1.0, 10))
    x, y = (zz * s).ravel(), yy.ravel()
    h = 1e-5
    f = lambda a, b: throat.velocity(a, b, R, g, geo, sol)
    u, v = f(x, y)
    ux = (f(x + h, y)[0] - f(x - h, y)[0]) / (2 * h)
    uy = (f(x, y + h)[0] - f(x, y - h)[0]) / (2 * h)
    vx = (f(x + h, y)[1] - f(x - h, y)[1]) / (2 * h)
    vy = (f(x, y + h)[1] - f(x, y - h)[1]) / (2 * h)
    a2 = (g + 1) / 2 - (g - 1) / 2 * (u * u + v * v)
    cont = (a2 - u * u) * ux - 2 * u * v * uy + (a2 - v * v) * vy + d * a2 * v / y
    return np.max(np.abs(uy - vx)), np.max(np.abs(cont))


@pytest.mark.parametrize("geo", GEOS)
@pytest.mark.parametrize("sol,order", [("sauer", 2.5), ("hall", 4.5)])
def test_field_satisfies_transonic_equations_to_its_order(geo, sol, order):
    # Exact invariant: the expansion to order k leaves a continuity residual of
    # order eps^(k + 3/2) in x-units (eps = 1/R); irrotationality holds exactly.
    # Source: Hall (1962) expansion scheme (residual order: common practice of
    # matched expansions).
    r1 = residuals(10.0, 1.4, geo, sol)
    r2 = residuals(20.0, 1.4, geo, sol)
    assert r1[0] < 1e-8 and r2[0] < 1e-8
    observed = np.log2(r1[1] / r2[1])
    assert observed > order - 0.3


@pytest.mark.parametrize("geo", GEOS)
def test_wall_is_a_streamline(geo):
    # Exact invariant: the throat arc y = 1 + R - sqrt(R^2 - x^2) is a streamline.  At
    # fixed scaled positions z the slope error of an order-k series falls like
    # eps^(k + 3/2): Sauer k = 1, Hall k = 3.
    # Source: boundary condition of Sauer (1947) and Hall (1962).
    d = GEOS.index(geo)
    errs = {}
    for sol in ("sauer", "hall"):
        for R in (10.0, 20.0):
            x = np.linspace(-0.6, 0.6, 7) * np.sqrt(2.4 / ((1 + d) * R))
            yw, slope, _ = throat.throat_wall(x, R)
            u, v = throat.velocity(x, yw, R, 1.4, geo, sol)
            errs[sol, R] = np.max(np.abs(v / u - slope))
    assert np.log2(errs["sauer", 10.0] / errs["sauer", 20.0]) > 2.2
    assert np.log2(errs["hall", 10.0] / errs["hall", 20.0]) > 4.2


@pytest.mark.parametrize(
    "geo,R,cd",
    [("planar", 1, 0.97333), ("planar", 2, 0.99333), ("planar", 5, 0.99893),
     ("axisymmetric", 1, 0.97500), ("axisymmetric", 2, 0.99375), ("axisymmetric", 5, 0.99900)],
)
def test_leading_order_discharge_coefficient(geo, R, cd):
    # Source: I. M. Hall, Q. J. Mech. Appl. Math. 15(4), 1962 (VALIDATION.md values).
    assert throat.discharge_coefficient(R, 1.4, geo, "sauer") == pytest.approx(cd, abs=5e-6)


@pytest.mark.parametrize("geo", GEOS)
def test_sauer_field_mass_flux_gives_hall_leading_order(geo):
    # Source: Hall (1962) leading-order Cd; the integrated mass flux of Sauer's field at
    # the throat must approach it with a relative error falling like 1/R.
    d = GEOS.index(geo)
    rel = []
    for R in (10.0, 20.0, 40.0):
        cd = throat.field_discharge_coefficient(R, 1.4, geo, "sauer")
        rel.append((1 - cd) * (90, 96)[d] * R * R / 2.4 - 1)
    assert abs(rel[2]) < 0.02
    assert rel[1] / rel[2] == pytest.approx(2.0, rel=0.05)


def test_hall_discharge_coefficient_expansion():
    # Source: Hall (1962) leading order 1 - (g+1)/(96 R^2); the next coefficient is fixed
    # by Kliegel and Levine's (AIAA J. 7(7), 1969; from memory) form in 1/(R+1):
    # (1-Cd) 96 R^2/(g+1) = 1 - [2 + (8g-27)/24]/R + O(R^-2).
    for g in (1.2, 1.4):
        f = {}
        for R in (40.0, 80.0):
            cd = throat.discharge_coefficient(R, g, "axisymmetric", "hall")
            f[R] = ((1 - cd) * 96 * R * R / (g + 1) - 1) * R
        c1 = 2 * f[80.0] - f[40.0]          # Richardson: remove the O(1/R) remainder
        assert c1 == pytest.approx(-(2 + (8 * g - 27) / 24), abs=5e-3)


@pytest.mark.parametrize("R,cd", [(2.0, 0.99618), (5.0, 0.99920)])
def test_kliegel_levine_discharge_coefficient(R, cd):
    # Source: Kliegel and Levine, AIAA J. 7(7), 1969 (from memory; VALIDATION.md values).
    assert throat.discharge_coefficient(R, 1.4, "axisymmetric", "kliegel-levine") == pytest.approx(cd, abs=5e-6)


@pytest.mark.parametrize("R", [5.0, 10.0])
def test_hall_and_kliegel_levine_agree_for_gentle_throats(R):
    # Source: both published expansions agree to O(R^-4) (Kliegel and Levine 1969, from memory).
    ch = throat.discharge_coefficient(R, 1.4, "axisymmetric", "hall")
    ck = throat.discharge_coefficient(R, 1.4, "axisymmetric", "kliegel-levine")
    assert abs(ch - ck) < 2.4 / 96 / R**4


@pytest.mark.parametrize("geo", GEOS)
def test_sauer_sonic_line_shape(geo):
    # Source: Sauer (1947): sonic line u' = 0, x = eps - (g+1) a y^2 / (2 (1+d)).  The
    # module solves q = a* including v^2, which differs at O(a^3); compare at R = 10.
    g, R, d = 1.4, 10.0, GEOS.index(geo)
    a = np.sqrt((1 + d) / ((g + 1) * R))
    y = np.linspace(0, 1, 6)
    xs = throat.sonic_line(y, R, g, geo, "sauer")
    expect = (g + 1) * a / (2 * (3 + d)) - (g + 1) * a * y**2 / (2 * (1 + d))
    assert np.allclose(xs, expect, atol=0.05 * (g + 1) * a / (2 * (1 + d)))


@pytest.mark.parametrize("geo", GEOS)
@pytest.mark.parametrize("sol", ["sauer", "hall"])
def test_initial_line_is_supersonic_and_conserves_mass(geo, sol):
    line = throat.initial_line(2.0, 1.4, geo, sol, n=41)
    assert np.all(line.mach > 1.0)
    assert line.theta[0] == 0.0 and np.all(np.diff(line.mach) > 0)
    assert np.all(line.theta + np.arcsin(1 / line.mach) < np.pi / 2)
    # Mass conservation (exact invariant of the flow, approximate for the truncated
    # series): the flux across the initial line equals the throat-plane flux.
    for R, tol in ((2.0, {"sauer": 5e-3, "hall": 5e-4}), (8.0, {"sauer": 5e-5, "hall": 1e-6})):
        cd0 = throat.field_discharge_coefficient(R, 1.4, geo, sol)
        assert throat.initial_line(R, 1.4, geo, sol, n=41).mass_flow == pytest.approx(cd0, abs=tol[sol])
    assert line.y[-1] == pytest.approx(throat.throat_wall(line.x[-1], 2.0)[0])


def test_bad_inputs():
    with pytest.raises(InputError, match="allowed is 1 <= R <= 100"):
        throat.initial_line(0.4, solution="sauer")
    with pytest.raises(InputError, match="0.5 <= R"):
        throat.discharge_coefficient(0.2, solution="kliegel-levine")
    with pytest.raises(InputError, match="throat solution must be one of"):
        throat.initial_line(2.0, solution="exact")
    with pytest.raises(InputError, match="discharge coefficient only"):
        throat.initial_line(2.0, solution="kliegel-levine")
    with pytest.raises(InputError, match="geometry"):
        throat.initial_line(2.0, geometry="conical")
    with pytest.raises(InputError, match="downstream of the axis sonic point"):
        throat.initial_line(2.0, x=0.01)


@pytest.mark.parametrize("geo", GEOS)
def test_initial_characteristic(geo):
    # Exact invariant: the initial line is a C- characteristic of the field, dy/dx = tan(theta - mu),
    # from the throat arc to the axis; its mass flow equals the throat-plane flux of the same
    # field to the series' order (mass conservation).
    c = throat.initial_cminus(2.0, 1.4, geo, "hall", n=40)
    assert c["y"][-1] == 0.0 and c["theta"][-1] == 0.0
    assert c["y"][0] == pytest.approx(throat.throat_wall(c["x"][0], 2.0)[0], abs=1e-6)
    mid_t = 0.5 * (c["theta"][1:] + c["theta"][:-1])
    mid_m = 0.5 * (np.arcsin(1 / c["mach"][1:]) + np.arcsin(1 / c["mach"][:-1]))
    slope = np.diff(c["y"]) / np.diff(c["x"])
    assert np.allclose(slope, np.tan(mid_t - mid_m), rtol=2e-3)
    assert c["mass_flow"] == pytest.approx(throat.field_discharge_coefficient(2.0, 1.4, geo, "hall"), abs=5e-4)

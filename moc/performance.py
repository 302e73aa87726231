"""Nozzle performance from a designed or analysed flowfield.

Thrust is the x-momentum plus pressure flux across any curve from the axis to
the exit lip (the exit characteristic or the exit plane): by momentum
conservation every such curve gives the same value when the flow between it
and the exit plane touches no wall.  Per unit span of the half nozzle
(planar) or over the full circle (axisymmetric), with dA = ((1+d) y^d) dy in
units of the throat area A_t:

    C_F = F / (p0 A_t) = (1+d) INT { p/p0 [g M^2 cos(theta) (cos(theta) dy - sin(theta) dx) + dy]
                                     - pa/p0 dy } y^d

Source: control-volume thrust, Sutton and Biblarz, Rocket Propulsion
Elements, ideal-rocket chapter (momentum and pressure thrust).  The ideal
one-dimensional value is Sutton and Biblarz's relation

    C_F = sqrt(2 g^2/(g-1) (2/(g+1))^((g+1)/(g-1)) (1 - (pe/p0)^((g-1)/g))) + eps (pe - pa)/p0.

Lengths in throat half-heights / radii, angles radians inside (degrees in the
returned dictionary, keys ending in _deg).
"""

from __future__ import annotations

import math

import numpy as np

from moc.errors import InputError
from moc.flow import choked_mass_flow_parameter, mach_from_area_ratio, pressure_ratio
from moc.flow._checks import check_gamma
from moc.design.truncate import exit_fluxes  # noqa: F401  (the thrust integral; re-exported)


def _delta(geometry):
    if geometry not in ("planar", "axisymmetric"):
        raise InputError(f"geometry must be 'planar' or 'axisymmetric', got {geometry!r}.")
    return 1 if geometry == "axisymmetric" else 0


def _check_ambient(ambient_ratio):
    if ambient_ratio is None:
        return None
    try:
        pa = float(ambient_ratio)
    except (TypeError, ValueError):
        raise InputError(f"ambient-to-chamber pressure ratio must be a number, got {ambient_ratio!r}.") from None
    if not math.isfinite(pa) or pa < 0.0 or pa >= 1.0:
        raise InputError(
            f"ambient-to-chamber pressure ratio must satisfy 0 <= pa/p0 < 1 (a nozzle needs a pressure drop), got {pa!r}."
        )
    return pa


def ideal_thrust_coefficient(area_ratio, gamma=1.4, ambient_ratio=None):
    """One-dimensional ideal thrust coefficient for exit/throat area ratio `area_ratio`.

    ambient_ratio: pa/p0 (None: vacuum).  Source: Sutton and Biblarz, Rocket
    Propulsion Elements, ideal-rocket chapter (thrust-coefficient equation).
    """
    g = check_gamma(gamma)
    pa = _check_ambient(ambient_ratio)
    try:
        eps = float(area_ratio)
    except (TypeError, ValueError):
        raise InputError(f"area ratio must be a number of at least 1, got {area_ratio!r}.") from None
    if not math.isfinite(eps) or eps < 1.0:
        raise InputError(f"area ratio A_e/A_t must be a finite number of at least 1, got {area_ratio!r}.")
    me = mach_from_area_ratio(eps, g, supersonic=True)
    pe = pressure_ratio(me, g)
    mom = math.sqrt(2.0 * g * g / (g - 1.0) * (2.0 / (g + 1.0)) ** ((g + 1.0) / (g - 1.0))
                    * (1.0 - pe ** ((g - 1.0) / g)))
    return mom + eps * (pe - (pa or 0.0))


def wetted_area(x, y, geometry):
    """Wall surface area in throat units^2: 2 pi INT y ds (axisymmetric) or the length
    of both contoured walls per unit span, 2 INT ds (planar)."""
    d = _delta(geometry)
    x, y = np.asarray(x, float), np.asarray(y, float)
    ds = np.hypot(np.diff(x), np.diff(y))
    if d:
        return float(2.0 * np.pi * np.sum(0.5 * (y[1:] + y[:-1]) * ds))
    return float(2.0 * np.sum(ds))


def performance(result, ambient_ratio=None):
    """Performance numbers of a design or analysis result, JSON-ready.

    Keys: discharge_coefficient, mass_flow_parameter (mdot sqrt(R T0)/(p0 A_t)),
    exit_mass_flow_ratio (exit flux over the throat's 1-D sonic flow),
    thrust_coefficient_vacuum, thrust_coefficient (at pa/p0 when given, else
    vacuum), thrust_coefficient_ideal_1d (vacuum, Sutton and Biblarz, at the
    effective area ratio A_e/(Cd A_t), per unit sonic area, so a real nozzle's
    C_F compares with Cd times it; Cd here is the exit curve's own mass flow),
    thrust_coefficient_ideal_1d_ambient, divergence_efficiency
    (C_F,vac / (Cd C_F,ideal_1d): 1 for a uniform parallel exit), exit_mach_mean (mass-weighted), exit_mach_spread,
    exit_flow_angle_max_deg, exit_area_ratio, length, wetted_area
    (+ wetted_area_inlet with an inlet).
    """
    s = result.summary
    try:
        g = check_gamma(s["gamma"])
        geometry = s["geometry"]
    except KeyError as exc:
        raise InputError(f"the result's summary lacks {exc.args[0]!r}; it is not a complete moc result.") from None
    d = _delta(geometry)
    pa = _check_ambient(ambient_ratio)
    ex = result.exit
    for k in ("y", "theta", "mach"):
        if k not in ex:
            raise InputError(f"the result has no exit profile field {k!r}; performance needs the exit flow.")
    if "x" in ex:
        ex_x = ex["x"]
    elif "x" in result.wall:  # an exit plane at the end of the wall
        ex_x = np.full(np.shape(ex["y"]), float(np.max(result.wall["x"])))
    else:
        raise InputError("the result has neither exit x positions nor a wall; performance needs the exit flow.")
    fl = exit_fluxes(ex_x, ex["y"], ex["theta"], ex["mach"], g, geometry, p0_ratio=ex.get("p0_ratio"))
    cd = float(s.get("discharge_coefficient", fl["mass"]))
    cf_vac = fl["momentum"] + fl["pressure"]
    cf = cf_vac - (pa or 0.0) * fl["area"]
    # the effective (sonic) area ratio and the efficiency use the mass flow crossing the same
    # exit curve as the thrust, so a discretisation error in the mass flow does not show as a gain
    cd_exit = fl["mass"]
    eps_eff = max(fl["area"] / cd_exit, 1.0)
    cf_1d = ideal_thrust_coefficient(eps_eff, g)
    m = np.asarray(ex["mach"], float)
    out = {
        "discharge_coefficient": cd,
        "mass_flow_parameter": cd * choked_mass_flow_parameter(g),
        "exit_mass_flow_ratio": fl["mass"],
        "thrust_coefficient_vacuum": cf_vac,
        "thrust_coefficient": cf,
        "thrust_coefficient_ideal_1d": cf_1d,
        "divergence_efficiency": cf_vac / (cd_exit * cf_1d),
        "exit_area_ratio": fl["area"],
        "exit_mach_mean": float(mach_from_speed(fl["mass_velocity"], g)),
        "exit_mach_spread": float(m.max() - m.min()),
        "exit_flow_angle_max_deg": float(np.degrees(np.max(np.abs(ex["theta"])))),
        "length": float(np.max(result.wall["x"])) if "x" in result.wall else float(s.get("length", 0.0)),
        "wetted_area": wetted_area(result.wall["x"], result.wall["y"], geometry) if "x" in result.wall else 0.0,
    }
    if pa is not None:
        out["ambient_ratio"] = pa
        out["thrust_coefficient_ideal_1d_ambient"] = ideal_thrust_coefficient(eps_eff, g, pa)
    if result.inlet and "x" in result.inlet:
        out["wetted_area_inlet"] = wetted_area(result.inlet["x"], result.inlet["y"], geometry)
    return out


def mach_from_speed(v_astar, gamma):
    """Mach number from speed over critical speed M* (NACA Report 1135): M^2 = 2 M*^2 / ((g+1) - (g-1) M*^2)."""
    g = float(gamma)
    v2 = float(v_astar) ** 2
    return math.sqrt(2.0 * v2 / ((g + 1.0) - (g - 1.0) * v2))

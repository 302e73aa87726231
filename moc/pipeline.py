"""Run a validated case end to end: design, truncation, inlet, performance.

`run_case(case)` is what `moc design` does, as one Python call:

    from moc.io.case import load
    from moc.pipeline import run_case
    result = run_case(load("cases/default.toml"))

The result carries the inputs (the validated case), the net, the wall and a
summary with the design, performance and real-unit numbers.
"""

from __future__ import annotations

import math

from moc.io.case import LENGTH_UNITS, PRESSURE_UNITS, Case


def _design(case: Case, progress=None):
    noz, th = case["nozzle"], case["throat"]
    common = dict(exit_mach=noz["exit_mach"], gamma=case["gas"]["gamma"], geometry=noz["geometry"],
                  n=noz["characteristics"])
    if noz["method"] == "gradual":
        from moc.design.gradual import design_gradual

        return design_gradual(**common, throat_curvature=th["curvature"], inflection_deg=th["inflection_deg"],
                              length=th["length"], throat_solution=th["solution"])
    from moc.design import design_minimum_length

    return design_minimum_length(**common)


def run_case(case: Case, progress=None):
    """Design the nozzle a case describes and return its `moc.result.Result`."""
    result = _design(case, progress)
    tr = case["truncate"]
    if any(v is not None for v in tr.values()):
        from moc.design.truncate import truncate

        result = truncate(result, **{k: v for k, v in tr.items() if v is not None})
    inlet = case["inlet"]
    if inlet["contraction_ratio"] is not None:
        from moc.geometry import subsonic_inlet

        throat_r = inlet["throat_radius"]
        if throat_r is None:
            throat_r = case["throat"]["curvature"] if case["nozzle"]["method"] == "gradual" else 1.0
        result.inlet = subsonic_inlet(
            contraction_ratio=inlet["contraction_ratio"], entrance_radius=inlet["entrance_radius"],
            throat_radius=throat_r, cone_angle_deg=inlet["cone_angle_deg"], geometry=case["nozzle"]["geometry"],
        )
    ch = case["chamber"]
    ambient_ratio = None
    if ch["ambient_pressure"] is not None and ch["pressure"] is not None:
        ambient_ratio = ch["ambient_pressure"] / ch["pressure"]
    try:
        from moc.performance import performance
    except ModuleNotFoundError:  # performance lands with the rounded-throat work
        performance = None
    if performance is not None:
        result.summary.update(performance(result, ambient_ratio=ambient_ratio))
    result.summary.update(dimensional_summary(case, result.summary))
    # the validated case whole (it re-runs as it is), the throat size every exporter reads,
    # and the designer's own arguments
    result.inputs = {
        "case": case.to_dict(),
        "case_source": case.source,
        "throat": {"value": case["nozzle"]["throat_size"], "unit": case["nozzle"]["throat_unit"]},
        "design": result.inputs,
    }
    return result


def dimensional_summary(case: Case, summary: dict) -> dict:
    """Real-unit numbers: throat and exit sizes, length, and with a chamber state the mass flow and thrust.

    Mass flow mdot = Cd p0 A* Gamma / sqrt(R T0) with Gamma the choked
    mass-flow function (NACA Report 1135); thrust F = C_F p0 A* (Sutton and
    Biblarz, Rocket Propulsion Elements).  Planar nozzles need a span.
    """
    from moc.flow import choked_mass_flow_parameter

    noz, gas, ch = case["nozzle"], case["gas"], case["chamber"]
    unit = noz["throat_unit"]
    h = noz["throat_size"]
    d = {"throat_size": h, "throat_unit": unit}
    if "length" in summary:
        d["length_real"] = summary["length"] * h
    if "area_ratio" in summary:
        scale = math.sqrt(summary["area_ratio"]) if noz["geometry"] == "axisymmetric" else summary["area_ratio"]
        d["exit_size_real"] = scale * h
    h_m = h * LENGTH_UNITS[unit]
    if noz["geometry"] == "axisymmetric":
        a_star = math.pi * h_m * h_m
    elif noz["width"] is not None:
        a_star = 2.0 * h_m * noz["width"] * LENGTH_UNITS[unit]
    else:
        a_star = None
    if a_star is not None:
        d["throat_area_m2"] = a_star
    if a_star is not None and ch["pressure"] is not None and ch["temperature"] is not None:
        p0 = ch["pressure"] * PRESSURE_UNITS[ch["pressure_unit"]]
        cd = summary.get("discharge_coefficient", 1.0)
        d["mass_flow_kg_s"] = cd * p0 * a_star * choked_mass_flow_parameter(gas["gamma"]) / math.sqrt(gas["R"] * ch["temperature"])
        cf = summary.get("thrust_coefficient", summary.get("thrust_coefficient_vacuum"))
        if cf is not None:
            d["thrust_N"] = cf * p0 * a_star
        if "thrust_coefficient_vacuum" in summary:
            d["thrust_vacuum_N"] = summary["thrust_coefficient_vacuum"] * p0 * a_star
    return d

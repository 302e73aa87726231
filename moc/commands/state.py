"""`moc state`: the isentropic state, A/A*, nu and mu at a Mach number."""

NAME = "state"
HELP = "isentropic state, area ratio, Prandtl-Meyer and Mach angle at a Mach number"
EXAMPLE = "moc state --mach 2.4 --gamma 1.4\nmoc state --mach 3 --json"


def add_arguments(p):
    p.add_argument("--mach", "-M", type=float, required=True, help="Mach number (> 0)")
    p.add_argument("--gamma", "-g", type=float, default=1.4, help="ratio of specific heats (> 1, default 1.4)")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def compute(mach, gamma):
    import numpy as np

    from moc import flow

    m, g = mach, gamma
    d = {
        "mach": m,
        "gamma": g,
        "T_T0": flow.temperature_ratio(m, g),
        "p_p0": flow.pressure_ratio(m, g),
        "rho_rho0": flow.density_ratio(m, g),
        "area_ratio": flow.area_ratio(m, g),
        "mass_flow_parameter": flow.mass_flow_parameter(m, g),
    }
    if m >= 1.0:
        d["prandtl_meyer_deg"] = float(np.degrees(flow.prandtl_meyer(m, g)))
        d["mach_angle_deg"] = float(np.degrees(flow.mach_angle(m)))
    else:
        d["prandtl_meyer_deg"] = None
        d["mach_angle_deg"] = None
    d["nu_max_deg"] = float(np.degrees(flow.nu_max(g)))
    return d


def run(args):
    from moc.commands._common import print_json, print_table

    d = compute(args.mach, args.gamma)
    if args.json:
        print_json(d)
        return 0
    rows = [
        ("T/T0", d["T_T0"], ""),
        ("p/p0", d["p_p0"], ""),
        ("rho/rho0", d["rho_rho0"], ""),
        ("A/A*", d["area_ratio"], "(subsonic branch)" if args.mach < 1 else ""),
        ("mass-flow function", d["mass_flow_parameter"], "mdot sqrt(R T0)/(p0 A)"),
    ]
    if d["prandtl_meyer_deg"] is not None:
        rows += [("Prandtl-Meyer nu", d["prandtl_meyer_deg"], "deg"), ("Mach angle mu", d["mach_angle_deg"], "deg")]
    rows.append(("nu_max", d["nu_max_deg"], "deg"))
    print_table(rows, title=f"Isentropic state at M = {args.mach:g}, gamma = {args.gamma:g}")
    return 0

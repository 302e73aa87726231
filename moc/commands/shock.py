"""`moc shock`: oblique shock for a deflection, weak and strong roots, and theta_max."""

NAME = "shock"
HELP = "oblique shock angle and downstream state (weak and strong roots) for a deflection"
EXAMPLE = "moc shock --mach 2 --deflection 15\nmoc shock --mach 3 --deflection 10 --gamma 1.3 --json"


def add_arguments(p):
    p.add_argument("--mach", "-M", type=float, required=True, help="upstream Mach number (> 1)")
    p.add_argument("--deflection", "-d", type=float, required=True, help="flow deflection, degrees (0 to theta_max)")
    p.add_argument("--gamma", "-g", type=float, default=1.4, help="ratio of specific heats (> 1, default 1.4)")
    p.add_argument("--json", action="store_true", help="print one JSON object")


def compute(mach, deflection_deg, gamma):
    import math

    from moc import flow
    from moc.flow._checks import as_float_array

    as_float_array(deflection_deg, "deflection angle")
    th = math.radians(deflection_deg)
    tmax, bmax = flow.max_deflection(mach, gamma)
    tson, bson = flow.sonic_deflection(mach, gamma)
    d = {
        "mach": mach,
        "gamma": gamma,
        "deflection_deg": deflection_deg,
        "theta_max_deg": math.degrees(tmax),
        "beta_at_theta_max_deg": math.degrees(bmax),
        "theta_sonic_deg": math.degrees(tson),
        "beta_sonic_deg": math.degrees(bson),
    }
    for root in ("weak", "strong"):
        s = flow.oblique_shock(mach, th, gamma, root=root)
        d[f"beta_{root}_deg"] = math.degrees(s.beta)
        d[f"m2_{root}"] = s.m2
        d[f"p2_p1_{root}"] = s.p2_p1
        d[f"rho2_rho1_{root}"] = s.rho2_rho1
        d[f"T2_T1_{root}"] = s.T2_T1
        d[f"p02_p01_{root}"] = s.p02_p01
    return d


def run(args):
    from moc.commands._common import print_json

    d = compute(args.mach, args.deflection, args.gamma)
    if args.json:
        print_json(d)
        return 0
    print(f"Oblique shock: M1 = {args.mach:g}, deflection = {args.deflection:g} deg, gamma = {args.gamma:g}")
    print(f"  {'':<16}{'weak':>12}{'strong':>12}")
    for label, key in [("beta (deg)", "beta_{}_deg"), ("M2", "m2_{}"), ("p2/p1", "p2_p1_{}"),
                       ("rho2/rho1", "rho2_rho1_{}"), ("T2/T1", "T2_T1_{}"), ("p02/p01", "p02_p01_{}")]:
        print(f"  {label:<16}{d[key.format('weak')]:>12.6g}{d[key.format('strong')]:>12.6g}")
    print(f"  theta_max = {d['theta_max_deg']:.4f} deg (beta = {d['beta_at_theta_max_deg']:.4f} deg); "
          f"M2 = 1 at theta = {d['theta_sonic_deg']:.4f} deg")
    return 0

"""`moc design`: design a shock-free nozzle contour from a case file or flags."""

NAME = "design"
HELP = "design a shock-free nozzle contour (minimum-length or gradual-expansion) and write its files"
EXAMPLE = """moc design cases/default.toml -o out/default
moc design --exit-mach 2.4 --gamma 1.4 --planar -n 100 --throat 25mm -o out/tunnel
moc design --exit-mach 3 --axisymmetric --throat-curvature 2 --inflection 12 -n 100 -o out/rounded"""


def add_arguments(p):
    p.add_argument("case", nargs="?", help="TOML case file (flags below override its values)")
    p.add_argument("-o", "--output", metavar="DIR", help="output directory (default: the case's [output] directory, else ./moc-out)")
    g = p.add_argument_group("nozzle")
    g.add_argument("--exit-mach", "-M", type=float, help="design exit Mach number (> 1)")
    g.add_argument("--gamma", "-g", type=float, help="ratio of specific heats (default 1.4)")
    geo = g.add_mutually_exclusive_group()
    geo.add_argument("--planar", dest="geometry", action="store_const", const="planar", help="two-dimensional nozzle")
    geo.add_argument("--axisymmetric", dest="geometry", action="store_const", const="axisymmetric",
                     help="nozzle of revolution (default)")
    g.add_argument("-n", "--characteristics", type=int, help="number of characteristics in the net (>= 3, default 50)")
    g.add_argument("--throat", metavar="SIZE", help="throat radius or half-height with a unit, e.g. 12.5mm, 0.5in, 0.02m")
    g.add_argument("--width", type=float, help="planar nozzles: span in the throat unit (for mass flow and thrust)")
    r = p.add_argument_group("rounded throat and gradual expansion (any of these selects the gradual method)")
    r.add_argument("--throat-curvature", type=float, metavar="R", help="wall radius of curvature at the throat over the throat size")
    r.add_argument("--inflection", type=float, metavar="DEG", help="wall angle at the end of the initial expansion arc, deg")
    r.add_argument("--target-length", type=float, metavar="L", help="nozzle length over the throat size (solves for the inflection angle)")
    r.add_argument("--throat-solution", choices=["sauer", "hall", "kliegel-levine"], help="transonic throat solution (default sauer)")
    t = p.add_argument_group("truncation (one of)")
    t.add_argument("--truncate-fraction", type=float, metavar="F", help="keep this fraction of the contour length")
    t.add_argument("--truncate-area-ratio", type=float, metavar="AR", help="cut where the area ratio reaches AR")
    t.add_argument("--truncate-angle", type=float, metavar="DEG", help="cut where the wall angle falls to DEG")
    i = p.add_argument_group("subsonic inlet")
    i.add_argument("--inlet-contraction", type=float, metavar="CR", help="inlet-face area over throat area (> 1)")
    i.add_argument("--inlet-cone", type=float, metavar="DEG", help="half-angle of the convergent cone, deg (default 30)")
    c = p.add_argument_group("chamber state (for mass flow and thrust in real units)")
    c.add_argument("--chamber-pressure", metavar="P", help="stagnation pressure with a unit, e.g. 20bar, 2MPa, 300psi")
    c.add_argument("--chamber-temperature", type=float, metavar="K", help="stagnation temperature, K")
    c.add_argument("--ambient-pressure", metavar="P", help="ambient pressure with a unit, for thrust at altitude")
    o = p.add_argument_group("output")
    o.add_argument("--export", metavar="FMT[,FMT]", help="also export these formats (see 'moc export --help')")
    o.add_argument("--units", help="length unit of exported files")
    o.add_argument("--no-plot", action="store_true", help="do not write overview.png")
    o.add_argument("--force", action="store_true", help="overwrite existing files")
    o.add_argument("--json", action="store_true", help="print summary.json to stdout")
    o.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")


def _with_unit(text, units, what):
    import re

    from moc.errors import InputError

    m = re.fullmatch(r"\s*([-+0-9.eE]+)\s*([A-Za-z]+)\s*", str(text))
    if not m or m.group(2) not in units:
        raise InputError(f"{what} must be a number followed by a unit ({', '.join(units)}), e.g. 12.5{next(iter(units))}; got {text!r}.")
    try:
        v = float(m.group(1))
    except ValueError:
        raise InputError(f"{what} must start with a number, got {text!r}.") from None
    return v, m.group(2)


def case_from_args(args):
    """Merge a case file (if any) with the flags, and validate the lot."""
    from moc.errors import CaseFileError
    from moc.io import case as casefile

    raw = casefile.read_raw(args.case) if args.case else {}
    source = str(args.case) if args.case else "<flags>"

    def put(section, key, value):
        if value is not None:
            raw.setdefault(section, {})[key] = value

    put("nozzle", "exit_mach", args.exit_mach)
    put("gas", "gamma", args.gamma)
    put("nozzle", "geometry", args.geometry)
    put("nozzle", "characteristics", args.characteristics)
    put("nozzle", "width", args.width)
    if args.throat is not None:
        v, u = _with_unit(args.throat, casefile.LENGTH_UNITS, "--throat")
        put("nozzle", "throat_size", v)
        put("nozzle", "throat_unit", u)
    gradual = any(v is not None for v in (args.throat_curvature, args.inflection, args.target_length, args.throat_solution))
    if gradual:
        put("nozzle", "method", "gradual")
    put("throat", "curvature", args.throat_curvature)
    put("throat", "inflection_deg", args.inflection)
    put("throat", "length", args.target_length)
    put("throat", "solution", args.throat_solution)
    put("truncate", "length_fraction", args.truncate_fraction)
    put("truncate", "area_ratio", args.truncate_area_ratio)
    put("truncate", "exit_wall_angle_deg", args.truncate_angle)
    put("inlet", "contraction_ratio", args.inlet_contraction)
    put("inlet", "cone_angle_deg", args.inlet_cone)
    for flag, key in (("chamber_pressure", "pressure"), ("ambient_pressure", "ambient_pressure")):
        val = getattr(args, flag)
        if val is not None:
            v, u = _with_unit(val, casefile.PRESSURE_UNITS, "--" + flag.replace("_", "-"))
            unit = raw.get("chamber", {}).get("pressure_unit", u)
            put("chamber", key, v * casefile.PRESSURE_UNITS[u] / casefile.PRESSURE_UNITS[unit])
            put("chamber", "pressure_unit", unit)
    put("chamber", "temperature", args.chamber_temperature)
    if args.export:
        put("output", "formats", args.export)
    put("output", "units", args.units)
    if "nozzle" not in raw or "exit_mach" not in raw["nozzle"]:
        raise CaseFileError("give a case file or --exit-mach (the design exit Mach number, > 1).")
    return casefile.validate(raw, source)


def run(args):
    import sys
    from pathlib import Path

    from moc.commands._common import print_json, progress_enabled
    from moc.io.outputs import write_outputs
    from moc.pipeline import run_case

    case = case_from_args(args)
    out = Path(args.output or case["output"]["directory"] or "moc-out")
    show = progress_enabled(args)
    if show:
        noz = case["nozzle"]
        print(f"designing {noz['method']} {noz['geometry']} nozzle, Me = {noz['exit_mach']:g}, "
              f"n = {noz['characteristics']} ...", file=sys.stderr)
    result = run_case(case)
    paths = write_outputs(result, out, force=args.force, plots=case["output"]["plots"])
    formats = case["output"]["formats"]
    if formats:
        from moc.io.export import export

        units = case["output"]["units"] or case["nozzle"]["throat_unit"]
        opts = {}
        if case["output"]["chord_tolerance"] is not None:
            opts["chord_tolerance"] = case["output"]["chord_tolerance"]
        paths += export(result, formats, out, units=units, options=opts, force=args.force)
    if args.json:
        print_json(result.summary)
    elif not args.quiet:
        s = result.summary
        print(f"{s['geometry']} {case['nozzle']['method']} nozzle: exit Mach {s['exit_mach']:.5f} "
              f"(max dev {s['exit_mach_max_dev']:.2e}), area ratio {s['area_ratio']:.5f} "
              f"(isentropic {s['area_ratio_isentropic']:.5f}), length {s['length']:.4f} throat units "
              f"= {s['length_real']:.4g} {s['throat_unit']}, max wall angle {s['max_wall_angle_deg']:.4f} deg")
        print("wrote " + ", ".join(str(p) for p in paths))
    return 0

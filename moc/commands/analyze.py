"""`moc analyze`: march a given wall contour, find where characteristics coalesce, fit the shock, report."""

NAME = "analyze"
HELP = "analyse a given wall contour (CSV, cone, parabolic bell or a design): internal shocks, exit flow, thrust"
EXAMPLE = """moc analyze wall.csv --units mm --axisymmetric -o out/drawing
moc analyze --cone 15 --axisymmetric --area-ratio 4 -o out/cone15
moc analyze --bell 30,8 --length 6 --axisymmetric -o out/bell
moc analyze out/m24 --truncate-fraction 0.8 -o out/m24-short
moc analyze ramp.csv --units throat --inflow-mach 2 --planar -o out/ramp"""

OUTPUT_FILES = ("summary.json", "result.npz", "shocks.png")


def add_arguments(p):
    p.add_argument("source", nargs="?", metavar="WALL.csv|DESIGN_DIR",
                   help="wall contour as CSV (x and y or r columns), or a directory written by 'moc design'")
    p.add_argument("-o", "--output", metavar="DIR", default="moc-analysis", help="output directory (default ./moc-analysis)")
    c = p.add_argument_group("analytic contours (instead of SOURCE)")
    c.add_argument("--cone", type=float, metavar="DEG", help="straight cone (or wedge) of this half-angle after the throat")
    c.add_argument("--bell", metavar="START,EXIT", help="parabolic bell from its start and exit wall angles, deg")
    c.add_argument("--length", type=float, metavar="L", help="bell length over the throat size")
    c.add_argument("--area-ratio", type=float, metavar="AR", help="cone exit area over throat area")
    c.add_argument("--throat-radius", type=float, metavar="R",
                   help="throat wall radius of curvature over the throat size: a rounded throat, started from the "
                        "transonic solution (cones and bells get the arc; for a CSV or a design it declares the "
                        "wall's throat arc). Default: sharp corner / uniform sonic throat. Below about 2 the "
                        "transonic series is poor.")
    d = p.add_argument_group("design directory")
    d.add_argument("--truncate-fraction", type=float, metavar="F", help="keep this fraction (0 < F <= 1) of the wall length")
    d.add_argument("--scale", type=float, metavar="S", help="axial scale factor: wall x multiplied by S, radii kept")
    f = p.add_argument_group("flow")
    geo = f.add_mutually_exclusive_group()
    geo.add_argument("--planar", dest="geometry", action="store_const", const="planar", help="two-dimensional flow")
    geo.add_argument("--axisymmetric", dest="geometry", action="store_const", const="axisymmetric",
                     help="flow of revolution (default, or the design's)")
    f.add_argument("--gamma", "-g", type=float, help="ratio of specific heats (default 1.4, or the design's)")
    f.add_argument("-n", "--characteristics", type=int, default=40,
                   help="characteristics across the flow (6 to 1000, default 40)")
    f.add_argument("--units", help="length unit of a CSV without units in its header (m, cm, mm, um, in, ft, throat)")
    f.add_argument("--inflow-mach", type=float, metavar="M",
                   help="analyse the wall in a uniform stream of Mach M (lengths over the wall's first height) "
                        "instead of from a throat")
    o = p.add_argument_group("output")
    o.add_argument("--no-plot", action="store_true", help="do not write shocks.png")
    o.add_argument("--force", action="store_true", help="overwrite existing files")
    o.add_argument("--json", action="store_true", help="print summary.json to stdout")
    o.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")


def _wall_from_args(args):
    """(wall, geometry, gamma, name, extra inputs) from the command line."""
    from pathlib import Path

    from moc.analysis import contour
    from moc.errors import ContourError, InputError

    chosen = [k for k in ("source", "cone", "bell") if getattr(args, k) is not None]
    if len(chosen) != 1:
        raise InputError("give exactly one contour: a WALL.csv or DESIGN_DIR, or --cone DEG, or --bell START,EXIT.")
    geometry = args.geometry
    gamma = args.gamma
    extra = {}
    if args.cone is not None:
        if args.area_ratio is None:
            raise InputError("--cone needs --area-ratio AR (exit area over throat area, above 1).")
        geometry = geometry or "axisymmetric"
        w = contour.cone(args.cone, args.area_ratio, geometry, throat_radius=args.throat_radius)
        return w, geometry, gamma or 1.4, f"{args.cone:g} deg cone", extra
    if args.bell is not None:
        parts = str(args.bell).split(",")
        if len(parts) != 2:
            raise InputError(f"--bell needs two angles START,EXIT in degrees, e.g. 30,8; got {args.bell!r}.")
        if args.length is None:
            raise InputError("--bell needs --length L (axial length over the throat size).")
        try:
            a0, a1 = float(parts[0]), float(parts[1])
        except ValueError:
            raise InputError(f"--bell angles must be numbers, got {args.bell!r}.") from None
        geometry = geometry or "axisymmetric"
        w = contour.bell(a0, a1, args.length, geometry, throat_radius=args.throat_radius)
        return w, geometry, gamma or 1.4, f"parabolic bell {a0:g} to {a1:g} deg", extra
    src = Path(args.source)
    if src.is_dir():
        from moc.result import Result

        res = Result.load(src)
        wl = res.wall
        geometry = geometry or res.summary.get("geometry", "axisymmetric")
        gamma = gamma or res.summary.get("gamma", 1.4)
        import math

        import numpy as np

        x, y = np.asarray(wl["x"], float), np.asarray(wl["y"], float)
        slope = np.tan(np.asarray(wl["theta"], float)) if "theta" in wl else None
        keep = x >= -1e-12
        x, y = x[keep], y[keep]
        slope = slope[keep] if slope is not None else None
        if args.truncate_fraction is not None:
            f = float(args.truncate_fraction)
            if not 0 < f <= 1:
                raise InputError(f"--truncate-fraction must be above 0 and at most 1, got {f:g}.")
            cut = x <= x[0] + f * (x[-1] - x[0]) + 1e-12
            x, y = x[cut], y[cut]
            slope = slope[cut] if slope is not None else None
        if args.scale is not None:
            s = float(args.scale)
            if not 0.05 <= s <= 20:
                raise InputError(f"--scale must be between 0.05 and 20, got {s:g}.")
            x = x * s
            slope = slope / s if slope is not None else None
        w = contour.wall_from_points(x, y, slope=slope, description=f"wall of {src}")
        R = args.throat_radius
        if R is None and res.summary.get("method") == "gradual" and args.scale is None:
            R = res.summary.get("throat_curvature")  # the design's rounded throat: use the transonic start
        if R is not None:
            w = _with_throat_arc(w, R)
            if res.summary.get("throat_solution") in ("sauer", "hall"):
                extra["throat_solution"] = res.summary.get("throat_solution")
        extra["design"] = {"directory": str(src), "exit_mach": res.summary.get("exit_mach"),
                           "area_ratio": res.summary.get("area_ratio"),
                           "truncate_fraction": args.truncate_fraction, "scale": args.scale}
        return w, geometry, gamma, f"design {src.name}", extra
    if not src.exists():
        raise ContourError(f"{src} does not exist; give a wall CSV file or a 'moc design' output directory.")
    if args.inflow_mach is not None:
        w, info = _stream_wall(src, args.units)
    else:
        w, info = contour.read_wall_csv(src, units=args.units)
    extra["csv"] = info
    if args.throat_radius is not None and args.inflow_mach is None:
        w = _with_throat_arc(w, args.throat_radius)
    return w, geometry or "axisymmetric", gamma or 1.4, src.name, extra


def _with_throat_arc(w, R):
    """The same wall with a rounded throat of radius R declared (and its arc continued 30 deg upstream),
    so that the march starts from the transonic solution instead of a uniform sonic line."""
    import math

    import numpy as np

    from moc.analysis import contour
    from moc.errors import ContourError

    R = float(R)
    if not R > 0:
        raise ContourError(f"throat radius of curvature must be positive, got {R:g}.")
    t = np.linspace(-math.radians(30.0), 0.0, 60)[:-1]
    keep = w.x >= 0.0
    x = np.concatenate([R * np.sin(t), w.x[keep]])
    y = np.concatenate([1.0 + R * (1.0 - np.cos(t)), w.y[keep]])
    slope = np.concatenate([np.tan(t), np.tan(w.angle(w.x[keep]))])
    out = contour.Wall(x, y, slope, description=w.description + f", rounded throat R = {R:g}", throat_arc=R)
    out.meta.update(w.meta)
    return out


def _stream_wall(path, units):
    """A CSV wall placed in a uniform stream: lengths over its first height, x from its first point."""
    from moc.analysis import contour

    w, info = contour.read_wall_csv(path, units=units or "throat", normalise=False)
    return w, info


def run(args):
    from pathlib import Path

    from moc.analysis.analyze import analyze
    from moc.commands._common import print_json
    from moc.io.atomic import check_writable
    from moc.result import write_summary

    wall, geometry, gamma, name, extra = _wall_from_args(args)
    out = Path(args.output)
    names = [n for n in OUTPUT_FILES if not (args.no_plot and n.endswith(".png"))]
    check_writable([out / n for n in names], args.force)
    start = "uniform" if args.inflow_mach is not None else "corner"
    ts = extra.get("throat_solution") if extra.get("throat_solution") in ("sauer", "hall") else "hall"
    res = analyze(wall, gamma=gamma, geometry=geometry, n=args.characteristics, start=start,
                  mach_in=args.inflow_mach, name=name, throat_solution=ts)
    res.inputs.update(extra)
    s = res.summary
    s["files"] = sorted(names)
    out.mkdir(parents=True, exist_ok=True)
    res.save(out, force=True)
    if not args.no_plot:
        from moc.plot import plot_shocks, save_figure

        save_figure(plot_shocks(res), out / "shocks.png", force=True)
    write_summary(out, s, force=True)
    if args.json:
        print_json(s)
    elif not args.quiet:
        _report(s, out)
    return 0


def _report(s, out):
    def f(v, fmt=".5g"):
        return "n/a" if v is None else format(v, fmt)

    print(f"Analysis of {s['contour']} ({s['geometry']}, gamma = {s['gamma']:g}, {s['characteristics']} characteristics)")
    print(f"  shock-free          {'yes' if s['shock_free'] else 'no'}")
    if s.get("coalescence"):
        c = s["coalescence"]
        print(f"  first coalescence   x = {c['x']:.5g}, y = {c['y']:.5g} ({c['kind']})")
    for k, sh in enumerate(s["shocks"], 1):
        print(f"  shock {k}             from ({sh['start_x']:.5g}, {sh['start_y']:.5g}) to ({sh['end_x']:.5g}, {sh['end_y']:.5g}); "
              f"max p2/p1 = {sh['max_pressure_ratio']:.5g}, p02/p01 = {sh['total_pressure_ratio']:.5g}")
        print(f"                      {sh['fate_detail']}")
    print(f"  area ratio          {f(s.get('area_ratio'))}")
    print(f"  exit Mach (mean)    {f(s.get('exit_mach'))}   largest deviation {f(s.get('exit_mach_max_dev'), '.3g')}")
    print(f"  C_F vacuum          {f(s.get('thrust_coefficient_vacuum'))}   ideal 1-D {f(s.get('thrust_coefficient_ideal_1d'))}")
    for w in s.get("warnings", []):
        print(f"  warning: {w}")
    print(f"  files in {out}: {', '.join(s['files'])}")
    print(f"  {s['caution']}")

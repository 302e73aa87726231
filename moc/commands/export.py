"""`moc export`: write a saved result's wall and flowfield for machining and CFD."""

NAME = "export"
HELP = "export a saved result: wall CSV/DXF/STL for machining, flowfield VTU/XDMF/Gmsh, CFD domain mesh SU2/Gmsh"
EXAMPLE = """moc export out/default --format csv,dxf,stl --units mm --chord-tolerance 0.002
moc export out/default --format vtu,su2 -o out/cfd --first-cell 0.005 --plume-length 200
moc export out/default --format all --force"""


def _format_help():
    from moc.io.export import describe

    lines = ["comma-separated formats, or 'all' (files keep these names in the output directory):"]
    lines += [f"  {name:<11} {fname:<21} {text}" for name, fname, text in describe()]
    return "\n".join(lines)


def add_arguments(p):
    p.add_argument("result", metavar="RESULT_DIR", help="directory written by 'moc design' or 'moc analyze' (holds result.npz)")
    p.add_argument("--format", "-f", required=True, metavar="FMT[,FMT...]", help="formats to write (listed above), or all")
    p.add_argument("--units", "-u", help="length unit of the files: mm, cm, m, um, in, ft (default: the throat's unit)")
    p.add_argument("-o", "--output", metavar="DIR", help="output directory (default: RESULT_DIR/export)")
    p.add_argument("--force", action="store_true", help="overwrite existing files (without it nothing is overwritten)")
    p.add_argument("--json", action="store_true", help="print the written files and notes as JSON")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")
    w = p.add_argument_group("wall (csv, dxf, stl); lengths in --units")
    w.add_argument("--chord-tolerance", type=float, metavar="LEN",
                   help="largest distance between the smooth wall and the straight segments between points "
                        "(default 1e-4 throat radii)")
    w.add_argument("--segments", type=int, metavar="N", help="facets around the axis of the revolved STL (default 180)")
    w.add_argument("--width", type=float, metavar="LEN", help="planar STL span (default twice the exit half-height)")
    s = p.add_argument_group("flowfield sector (sector-vtu)")
    s.add_argument("--sector-angle", type=float, metavar="DEG", help="angle of the revolved sector, degrees (default 90)")
    s.add_argument("--sector-segments", type=int, metavar="N", help="cells around the sector (default 24)")
    m = p.add_argument_group("CFD domain mesh (su2, mesh-msh); lengths in --units")
    m.add_argument("--axial-cells", type=int, metavar="N", help="cells along the nozzle (default 120)")
    m.add_argument("--radial-cells", type=int, metavar="N", help="cells from the axis to the wall (default 60)")
    m.add_argument("--first-cell", type=float, metavar="LEN", help="height of the wall cell (default 1e-3 throat radii)")
    m.add_argument("--plume-length", type=float, metavar="LEN", help="extend the domain this far past the exit (default 0: none)")
    m.add_argument("--plume-height", type=float, metavar="LEN", help="plume region height from the axis (default 3 exit radii)")
    m.add_argument("--plume-axial-cells", type=int, metavar="N", help="plume cells downstream of the exit (default 60)")
    m.add_argument("--plume-radial-cells", type=int, metavar="N", help="plume cells above the lip (default 40)")
    # the command line gives every command a raw-text description: the format list goes there
    p.description = HELP + "\n\n" + _format_help() + (
        "\n\nEvery file is written to a temporary name and renamed when all formats succeeded; existing files are "
        "kept unless --force.\nCAUTION: exported hardware geometry must be verified against local codes and a "
        "licensed engineering review.")


OPTION_NAMES = ("chord_tolerance", "segments", "width", "sector_angle", "sector_segments", "axial_cells",
                "radial_cells", "first_cell", "plume_length", "plume_height", "plume_axial_cells",
                "plume_radial_cells")


def run(args):
    import json
    import sys
    import warnings
    from pathlib import Path

    from moc.io.export import FORMATS, export
    from moc.result import Result

    result = Result.load(args.result)
    fmt = args.format.strip().lower()
    formats = list(FORMATS) if fmt == "all" else fmt
    if fmt == "all" and (result.summary or {}).get("geometry") == "planar":
        formats = [f for f in formats if f != "sector-vtu"]
    options = {k: getattr(args, k) for k in OPTION_NAMES if getattr(args, k, None) is not None}
    src = Path(args.result)
    out = Path(args.output) if args.output else (src if src.is_dir() else src.parent) / "export"
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # meshio's chatter; our own notes say what matters
        report = export(result, formats, out, units=args.units, options=options, force=args.force)
    if args.json:
        print(json.dumps({"unit": report.unit, "files": {f: str(p) for f, p in report.files}, "notes": report.notes},
                         indent=2, sort_keys=True))
    elif not args.quiet:
        for note in report.notes:
            print(note)
        print(f"wrote ({report.unit}) " + ", ".join(str(p) for p in report))
        print("CAUTION: verify exported geometry against local codes and a licensed engineering review.",
              file=sys.stderr)
    return 0

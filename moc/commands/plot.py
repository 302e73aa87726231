"""`moc plot`: figures of a saved design or analysis (PNG, SVG or PDF)."""

NAME = "plot"
HELP = "draw the net, Mach field, wall, distributions, exit profile or shocks of a saved result"
EXAMPLE = (
    "moc plot out/m24 --what all\n"
    "moc plot out/m24 --what net,wall --format svg -o figures --force\n"
    "moc plot out/bump --what shocks,distributions --dpi 200"
)


def add_arguments(p):
    p.add_argument("result_dir", metavar="RESULT_DIR", help="directory written by 'moc design' or 'moc analyze'")
    p.add_argument("--what", "-w", default="all",
                   help="comma-separated figures: net, mach, wall, distributions, exit, shocks, overview (the two-panel "
                        "image 'moc design' writes), or all "
                        "(default all; 'all' leaves out what the result cannot draw, e.g. shocks when it has none)")
    p.add_argument("--format", "-f", dest="fmt", default="png", choices=["png", "svg", "pdf"],
                   help="image format (default png)")
    p.add_argument("-o", "--output", metavar="DIR", default=None,
                   help="directory for the images (default: RESULT_DIR); files are named NAME.FORMAT")
    p.add_argument("--force", action="store_true", help="overwrite existing image files")
    p.add_argument("--dpi", type=float, default=150.0, help="resolution of PNG images, dots per inch (default 150)")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing on success")
    p.add_argument("--json", action="store_true", help="print the list of written files as JSON")


def parse_what(text, result=None):
    """Turn '--what' text into (figure names in the canonical order, skipped [(name, reason)]).

    'all' means every figure the result can draw; the others are skipped
    with their reason.  A figure named explicitly is always attempted.
    """
    from moc.errors import InputError
    from moc.plot import FIGURES, unavailable

    names = [w.strip().lower() for w in str(text).split(",") if w.strip()]
    if not names:
        raise InputError("--what is empty; give figure names such as net,wall or all.")
    chosen, skipped = [], []
    for w in names:
        if w == "all":
            for f in FIGURES:
                why = unavailable(result, f) if result is not None else None
                if why:
                    skipped.append((f, why))
                else:
                    chosen.append(f)
        elif w in FIGURES or w == "overview":
            chosen.append(w)
        else:
            raise InputError(f"unknown figure {w!r} in --what; choose from {', '.join(FIGURES)}, overview or all.")
    skipped = [(f, why) for f, why in skipped if f not in chosen]
    order = list(FIGURES) + ["overview"]
    return [f for f in order if f in chosen], skipped


def run(args):
    import sys
    from pathlib import Path

    from moc import plot
    from moc.commands._common import print_json, progress_enabled
    from moc.io.atomic import check_writable
    from moc.result import Result

    result = Result.load(args.result_dir)
    names, skipped = parse_what(args.what, result)
    rdir = Path(args.result_dir)
    if rdir.is_file():  # a result.npz path
        rdir = rdir.parent
    outdir = Path(args.output) if args.output else rdir
    if outdir.exists() and not outdir.is_dir():
        from moc.errors import InputError

        raise InputError(f"output {outdir} is a file; -o takes a directory for the images.")
    paths = [outdir / f"{n}.{args.fmt}" for n in names]
    check_writable(paths, args.force)  # refuse before drawing anything
    show = progress_enabled(args)
    written = []
    for k, (n, path) in enumerate(zip(names, paths)):
        if show:
            print(f"\r  drawing {n} ({k + 1}/{len(names)})".ljust(40), end="", file=sys.stderr, flush=True)
        fig = plot.figure_for(result, n)
        written.append(str(plot.save_figure(fig, path, force=args.force, dpi=args.dpi)))
    if show:
        print(file=sys.stderr)
    notes = [f"{n}: not drawn, {why}" for n, why in skipped]
    if args.json:
        print_json({"files": written, "skipped": notes})
    elif not args.quiet:
        for w in written:
            print(w)
        for note in notes:
            print(f"  ({note})")
    return 0

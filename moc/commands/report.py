"""`moc report`: one self-contained HTML design report of a saved result."""

NAME = "report"
HELP = "write a self-contained HTML report (inputs, key numbers, verification, shocks, figures, cautions)"
EXAMPLE = (
    "moc report out/m24\n"
    "moc report out/m24 -o m24-report.html --force\n"
    "moc report out/m24 --coarse out/m24-n25 --no-recompute"
)


def add_arguments(p):
    p.add_argument("result_dir", metavar="RESULT_DIR", help="directory written by 'moc design' or 'moc analyze'")
    p.add_argument("-o", "--output", metavar="FILE", default=None,
                   help="HTML file to write (default: RESULT_DIR/report.html)")
    p.add_argument("--coarse", metavar="DIR", default=None,
                   help="a result of the same design on a coarser net, for the discretisation-error estimate")
    p.add_argument("--no-recompute", action="store_true",
                   help="do not recompute the design with half the characteristics for the error estimate")
    p.add_argument("--dpi", type=float, default=96.0, help="resolution of the embedded figures (default 96)")
    p.add_argument("--force", action="store_true", help="overwrite an existing report")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing on success")
    p.add_argument("--json", action="store_true", help="print the written path as JSON")


def run(args):
    import sys

    from moc.commands._common import print_json, progress_enabled
    from moc.errors import InputError
    from moc.report import write_report

    if not (10 <= args.dpi <= 600):
        raise InputError(f"--dpi must be between 10 and 600 for an embedded figure, got {args.dpi:g}.")
    if progress_enabled(args):
        note = "" if args.no_recompute or args.coarse else " (recomputing on a coarser net for the error estimate)"
        print(f"  writing the report{note}...", file=sys.stderr, flush=True)
    path = write_report(args.result_dir, args.output, force=args.force, coarse=args.coarse,
                        recompute=not args.no_recompute, dpi=args.dpi)
    if args.json:
        print_json({"report": str(path)})
    elif not args.quiet:
        print(path)
    return 0

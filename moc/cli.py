"""The `moc` command line: a thin edge over the Python API.

Each command lives in `moc/commands/<name>.py` and defines `NAME`, `HELP`,
`EXAMPLE`, `add_arguments(parser)` and `run(args) -> int`.  Heavy imports go
inside `run`, so `moc --help` stays fast.

Exit status: 0 success, 2 bad input (the error's sentence on stderr), 1 the
computation failed (with a message).  `--debug` shows the traceback.
"""

import argparse
import importlib
import sys

from moc import __version__
from moc.errors import InputError, MocError

#: Command modules in the order `moc --help` lists them.
COMMANDS = ["design", "analyze", "export", "plot", "report", "state", "shock"]


def _load_commands():
    mods = []
    for name in COMMANDS:
        try:
            mods.append(importlib.import_module(f"moc.commands.{name}"))
        except ModuleNotFoundError as exc:
            if exc.name != f"moc.commands.{name}":
                raise
    return mods


def build_parser():
    common = argparse.ArgumentParser(add_help=False)
    common.add_argument("--debug", action="store_true", help="show a full traceback on errors")
    parser = argparse.ArgumentParser(
        prog="moc",
        description="Supersonic nozzle contours by the method of characteristics: "
        "design, internal-shock analysis, and export for machining and CFD.",
        epilog="Run 'moc COMMAND --help' for a command's options and an example. "
        "Exit status: 0 success, 2 bad input, 1 computation failed.",
        parents=[common],
    )
    parser.add_argument("--version", action="version", version=f"moc {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for mod in _load_commands():
        p = sub.add_parser(
            mod.NAME,
            help=mod.HELP,
            description=mod.HELP,
            epilog="example:\n  " + "\n  ".join(mod.EXAMPLE.strip().splitlines()),
            formatter_class=argparse.RawDescriptionHelpFormatter,
            parents=[common],
        )
        mod.add_arguments(p)
        p.set_defaults(_run=mod.run)
    return parser


def main(argv=None):
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "command", None):
        parser.print_help()
        return 2
    try:
        return int(args._run(args) or 0)
    except InputError as exc:
        if args.debug:
            raise
        print(f"moc {args.command}: error: {exc}", file=sys.stderr)
        return 2
    except MocError as exc:
        if args.debug:
            raise
        print(f"moc {args.command}: failed: {exc}", file=sys.stderr)
        return 1
    except KeyboardInterrupt:
        print("moc: interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())

"""Export a saved result for machining and CFD: one module per file format.

    from moc.io.export import export, write, FORMATS
    report = export(result, ["csv", "dxf", "stl"], "out", units="mm",
                    options={"chord_tolerance": 0.005}, force=False)

`export` checks every target before it writes any, writes each file to a
temporary name beside its target and renames them all only when every
format has succeeded, so a failed export leaves nothing behind and never
touches what was there.  `write` is the same for one format and one path.
Adding a format is adding a module with write(path, ctx) (and optionally
check(ctx), run before anything is written) and one entry in `TABLE`.
"""

from __future__ import annotations

import contextlib
import importlib
from dataclasses import dataclass, field
from pathlib import Path

from moc.errors import ExportError
from moc.io.atomic import atomic_path, check_writable

#: format name -> (module, file name, description): the public contract of `moc export --format`.
TABLE = {
    "csv": ("csv_wall", "wall_points.csv",
             "wall points for machining (inlet face to exit) with slope and curvature, chord-error spaced"),
    "dxf": ("dxf_wall", "wall.dxf",
             "wall as splines (one per smooth part) and a polyline, axis on its own layer (DXF R2000, units in $INSUNITS)"),
    "stl": ("stl_wall", "wall.stl",
             "closed cavity of the wetted wall (revolved or extruded) with end caps, binary STL"),
    "vtu": ("vtu", "flowfield.vtu",
             "characteristic net with Mach, p/p0, T/T0, rho/rho0, flow angle, velocity/a0, total pressure (VTK XML)"),
    "xdmf": ("xdmf", "flowfield.xdmf",
             "characteristic net with the same flow data (XDMF 3, data inline as XML, one file)"),
    "msh": ("msh", "flowfield.msh",
             "characteristic net with the same flow data as Gmsh node data (MSH 2.2 binary)"),
    "sector-vtu": ("sector", "flowfield_sector.vtu",
             "axisymmetric net revolved into a 3-D sector with the same flow data, for viewing (VTK XML)"),
    "su2": ("su2", "domain.su2",
             "structured CFD domain mesh with named markers inlet/outlet/wall/axis|symmetry[/farfield] (SU2)"),
    "mesh-msh": ("mesh_msh", "domain.msh",
             "the same CFD domain mesh with named physical groups (Gmsh MSH 2.2 ASCII)"),
}

FORMATS = tuple(TABLE)


def format_module(fmt):
    """The module that writes format `fmt`, or ExportError listing the known ones."""
    key = str(fmt).strip().lower()
    if key not in TABLE:
        raise ExportError(f"unknown export format '{fmt}'; known formats: {', '.join(FORMATS)}.")
    return importlib.import_module(f"moc.io.export.{TABLE[key][0]}")


def describe():
    """(name, default file name, one-line description) for every format (imports nothing heavy)."""
    return [(name, TABLE[name][1], TABLE[name][2]) for name in FORMATS]


def parse_formats(formats):
    """Accept 'csv,dxf' or ['csv', 'dxf']; return the validated list without repeats."""
    if isinstance(formats, str):
        formats = formats.split(",")
    names = []
    for f in formats:
        f = str(f).strip().lower()
        if not f:
            continue
        format_module(f)
        if f not in names:
            names.append(f)
    if not names:
        raise ExportError(f"no export format given; choose from {', '.join(FORMATS)}.")
    return names


@dataclass
class ExportReport:
    """What an export wrote: files[(format, path)] and the notes to show the user.

    Iterating over a report yields the written paths, so `paths += export(...)` works.
    """

    unit: str
    files: list = field(default_factory=list)
    notes: list = field(default_factory=list)

    def __iter__(self):
        return iter([p for _, p in self.files])

    def __len__(self):
        return len(self.files)


def _write_all(ctx, jobs, force):
    """Write (format, module, target) jobs all or nothing; every check runs before the first write."""
    for _, mod, _ in jobs:
        check = getattr(mod, "check", None)
        if check:
            check(ctx)
    check_writable([t for _, _, t in jobs], force)
    report = ExportReport(unit=ctx.unit)
    try:
        with contextlib.ExitStack() as stack:
            for name, mod, target in jobs:
                tmp = stack.enter_context(atomic_path(target, force=force))
                mod.write(tmp, ctx)
                report.files.append((name, target))
    except OSError as exc:
        where = exc.filename or ", ".join(str(t) for _, _, t in jobs)
        raise ExportError(f"could not write {where}: {exc.strerror or exc}; no exported file was written or changed.") from exc
    report.notes = list(ctx.notes)
    return report


def export(result, formats, out_dir, units=None, options=None, force=False):
    """Write the requested formats of `result` into `out_dir`, all or nothing.

    formats: list or comma-separated names from FORMATS.  units: a length unit
    (default: the unit of the saved throat size, else mm).  options: a dict
    of ExportOptions fields (or an ExportOptions).  force: overwrite existing
    files.  Returns an ExportReport.
    """
    from moc.io.export.context import ExportContext

    names = parse_formats(formats)
    ctx = ExportContext(result, units, options)
    out_dir = Path(out_dir)
    if out_dir.exists() and not out_dir.is_dir():
        raise ExportError(f"{out_dir} exists and is not a directory; give a directory for the exported files.")
    return _write_all(ctx, [(n, format_module(n), out_dir / TABLE[n][1]) for n in names], force)


def write(fmt, path, result, options=None, units=None, force=False):
    """Write one format of `result` to `path` atomically; returns the ExportReport."""
    from moc.io.export.context import ExportContext

    mod = format_module(fmt)
    return _write_all(ExportContext(result, units, options), [(str(fmt).strip().lower(), mod, Path(path))], force)


def __getattr__(name):
    if name == "ExportOptions":
        from moc.io.export.context import ExportOptions

        return ExportOptions
    raise AttributeError(name)


__all__ = ["FORMATS", "ExportOptions", "ExportReport", "describe", "export", "format_module", "parse_formats", "write"]

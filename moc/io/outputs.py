"""Write a result directory: summary.json, wall.csv, result.npz and the overview PNG.

All files are written atomically; existing files are refused without force,
and every target is checked before the first one is written.
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from moc.io.atomic import atomic_write, check_writable
from moc.result import write_summary

CAUTION = ("CAUTION: pressurised and hot-gas hardware can injure or kill. These numbers come from an "
           "inviscid model; they are no substitute for local codes, standards and review by a licensed engineer.")

OUTPUT_FILES = ("summary.json", "wall.csv", "result.npz", "overview.png")


def wall_table(result):
    """Rows of the wall from the inlet face (if any) through the throat to the exit.

    Columns: section, x and y in throat units, x and y in the real unit, wall
    angle (deg), Mach number and p/p0.  Inlet Mach numbers are the
    quasi-one-dimensional subsonic values from the local area ratio (NACA
    Report 1135 area relation): an estimate, marked as such in the header.
    """
    from moc.flow import mach_from_area_ratio, pressure_ratio

    gamma = result.summary["gamma"]
    axi = result.summary["geometry"] == "axisymmetric"
    w = result.wall
    parts = []
    inlet = result.inlet or {}
    if len(inlet.get("x", ())) > 1:
        xi, yi = np.asarray(inlet["x"], float), np.asarray(inlet["y"], float)
        keep = xi < w["x"][0] - 1e-12
        xi, yi = xi[keep], yi[keep]
        if xi.size:
            ang = np.degrees(np.arctan(np.gradient(yi, xi))) if xi.size > 1 else np.zeros_like(xi)
            ar = np.maximum(yi ** (2 if axi else 1), 1.0)
            mi = mach_from_area_ratio(ar, gamma, supersonic=False)
            parts.append(("inlet", xi, yi, ang, mi, pressure_ratio(mi, gamma)))
    parts.append(("nozzle", np.asarray(w["x"]), np.asarray(w["y"]), np.degrees(np.asarray(w["theta"])),
                  np.asarray(w["mach"]), np.asarray(w["p_p0"])))
    return parts


def wall_csv_text(result):
    throat = result.inputs.get("throat", {"value": 1.0, "unit": "m"})
    h, unit = float(throat["value"]), throat["unit"]
    axi = result.summary["geometry"] == "axisymmetric"
    yname = "r" if axi else "y"
    buf = io.StringIO()
    buf.write(f"# moc wall contour, {result.summary['geometry']}, throat {'radius' if axi else 'half-height'} "
              f"= {h:g} {unit}; lengths in throat units are over that size.\n")
    buf.write("# inlet-section Mach numbers are quasi-one-dimensional estimates.\n")
    buf.write(f"# {CAUTION}\n")
    buf.write(f"section,x [throat],{yname} [throat],x [{unit}],{yname} [{unit}],wall_angle [deg],mach [-],p_p0 [-]\n")
    for name, x, y, ang, m, p in wall_table(result):
        for row in zip(x, y, x * h, y * h, ang, m, p):
            buf.write(name + "," + ",".join(f"{v:.12g}" for v in row) + "\n")
    return buf.getvalue()


def write_outputs(result, directory, force=False, plots=True):
    """Write every output file of a result into `directory`; return the list of paths."""
    d = Path(directory)
    names = [n for n in OUTPUT_FILES if plots or not n.endswith(".png")]
    check_writable([d / n for n in names], force)
    d.mkdir(parents=True, exist_ok=True)
    result.summary["files"] = sorted(names)
    paths = [result.save(d, force=True)]
    atomic_write(d / "wall.csv", wall_csv_text(result))
    paths.append(d / "wall.csv")
    if plots:
        from moc.plot import overview

        overview(result, d / "overview.png", force=True)
        paths.append(d / "overview.png")
    paths.append(write_summary(d, result.summary))
    return [Path(p) for p in paths]

"""Export options and the shared state every format writer reads.

All user-facing lengths in the options are in the chosen output unit; the
context converts them to throat units once.  Nothing here recomputes the
flow: writers read the saved net, wall and inlet.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from moc.errors import ExportError
from moc.io import units as _units

CAUTION = (
    "CAUTION: nozzles, rocket motors and pressurised tunnels can hurt people. "
    "Verify this geometry against local codes and a licensed engineering review "
    "before making or running hardware."
)


@dataclass
class ExportOptions:
    """Settings of `moc export`; lengths in the output unit, None = default.

    chord_tolerance: largest allowed distance between the smooth wall and the
        straight segments between exported points (default 1e-4 throat radii).
    segments: facets around the axis for the revolved STL (default 180).
    width: span of a planar nozzle's STL (default twice the exit half-height).
    sector_angle: angle of the revolved 3-D flowfield sector, degrees (90).
    sector_segments: cells around the sector (24).
    axial_cells, radial_cells: cells of the CFD domain mesh along the nozzle
        and from the axis to the wall (120, 60).
    first_cell: height of the wall cell of the domain mesh
        (default 1e-3 throat radii).
    plume_length: extension of the domain mesh downstream of the exit
        (default 0: no plume region).
    plume_height: outer edge of the plume region from the axis
        (default 3 exit radii).
    plume_axial_cells, plume_radial_cells: cells of the plume region
        downstream of the exit and above the lip (60, 40).
    """

    chord_tolerance: float | None = None
    segments: int = 180
    width: float | None = None
    sector_angle: float = 90.0
    sector_segments: int = 24
    axial_cells: int = 120
    radial_cells: int = 60
    first_cell: float | None = None
    plume_length: float = 0.0
    plume_height: float | None = None
    plume_axial_cells: int = 60
    plume_radial_cells: int = 40

    @classmethod
    def from_any(cls, options):
        if options is None:
            return cls()
        if isinstance(options, cls):
            return options
        if not isinstance(options, dict):
            raise ExportError(f"export options must be a table of settings, got {type(options).__name__}.")
        known = {f.name for f in dataclasses.fields(cls)}
        clean = {}
        for k, v in options.items():
            key = str(k).replace("-", "_")
            if key not in known:
                raise ExportError(f"unknown export option '{k}'; known options: {', '.join(sorted(known))}.")
            if v is not None:
                clean[key] = v
        return cls(**clean)

    def __post_init__(self):
        for name in ("chord_tolerance", "width", "first_cell", "plume_height"):
            v = getattr(self, name)
            if v is not None:
                setattr(self, name, _positive(name, v))
        self.plume_length = _positive("plume_length", self.plume_length, allow_zero=True)
        self.sector_angle = _positive("sector_angle", self.sector_angle)
        if self.sector_angle > 360.0:
            raise ExportError(f"sector_angle must be at most 360 degrees, got {self.sector_angle:g}.")
        for name, lo in (("segments", 3), ("sector_segments", 1), ("axial_cells", 2), ("radial_cells", 2),
                         ("plume_axial_cells", 1), ("plume_radial_cells", 1)):
            setattr(self, name, _count(name, getattr(self, name), lo))
        if self.sector_angle / self.sector_segments > 45.0:
            raise ExportError(
                f"each of the {self.sector_segments} sector segments would span "
                f"{self.sector_angle / self.sector_segments:g} degrees; use enough --sector-segments "
                "for at most 45 degrees each."
            )


def _label(name):
    return name.replace("_", "-")


def _positive(name, v, allow_zero=False):
    try:
        f = float(v)
    except (TypeError, ValueError):
        raise ExportError(f"--{_label(name)} must be a number, got {v!r}.") from None
    if not math.isfinite(f) or f < 0.0 or (f == 0.0 and not allow_zero):
        need = "zero or positive" if allow_zero else "positive"
        raise ExportError(f"--{_label(name)} must be a finite {need} number, got {v!r}.")
    return f


def _count(name, v, lo):
    if isinstance(v, bool) or not isinstance(v, (int, np.integer)) and not (isinstance(v, float) and v.is_integer()):
        raise ExportError(f"--{_label(name)} must be a whole number, got {v!r}.")
    n = int(v)
    if n < lo or n > 100000:
        raise ExportError(f"--{_label(name)} must be between {lo} and 100000, got {n}.")
    return n


class ExportContext:
    """One result prepared for export: unit, scale, options, contour, notes."""

    def __init__(self, result, units=None, options=None):
        self.result = result
        s = result.summary or {}
        self.geometry = s.get("geometry")
        if self.geometry not in ("planar", "axisymmetric"):
            raise ExportError(
                f"the result's geometry is {self.geometry!r}; exports need 'planar' or 'axisymmetric'."
            )
        inputs = result.inputs or {}
        gas = inputs.get("gas") if isinstance(inputs.get("gas"), dict) else {}
        try:
            self.gamma = float(s.get("gamma", inputs.get("gamma", gas.get("gamma"))))
        except (TypeError, ValueError):
            raise ExportError("the result's summary has no ratio of specific heats 'gamma'.") from None
        if not (math.isfinite(self.gamma) and self.gamma > 1.0):
            raise ExportError(f"the result's gamma must be above 1, got {self.gamma!r}.")
        self.unit = _units.normalise_unit(units) if units else _units.default_unit(result.inputs)
        self.notes = []
        if _units.throat_size(result.inputs) is None:
            self.notes.append(f"the result holds no throat size: 1 throat radius/half-height is written as 1 {self.unit}.")
            self.scale = 1.0
        else:
            self.scale = _units.scale_factor(result.inputs, self.unit)
        self.options = ExportOptions.from_any(options)

    @property
    def axisymmetric(self):
        return self.geometry == "axisymmetric"

    @property
    def radial_name(self):
        """'r' for axisymmetric, 'y' for planar results."""
        return "r" if self.axisymmetric else "y"

    def to_throat(self, length):
        """A length in the output unit, in throat units."""
        return None if length is None else float(length) / self.scale

    def note(self, text):
        self.notes.append(text)

    def header_lines(self, what):
        """Short descriptive lines (no comment marks) for a file header."""
        s = self.result.summary or {}
        bits = [f"{self.geometry} nozzle", f"gamma {self.gamma:g}"]
        if "exit_mach" in s:
            bits.append(f"exit Mach {float(s['exit_mach']):g}")
        return [
            f"moc {what}: " + ", ".join(bits),
            f"lengths in {self.unit}; 1 throat {'radius' if self.axisymmetric else 'half-height'} = {self.scale:.12g} {self.unit}",
            CAUTION,
        ]

    # -- shared, computed once from the saved wall -------------------------
    @cached_property
    def contour(self):
        from moc.io.export.contour import Contour

        return Contour.from_result(self.result)

    @cached_property
    def chord_tolerance(self):
        """Chord tolerance in throat units."""
        t = self.options.chord_tolerance
        return 1e-4 if t is None else t / self.scale

    @cached_property
    def profile(self):
        """Wall points within the chord tolerance (throat units), see contour.sample."""
        from moc.io.export.contour import sample

        return sample(self.contour, self.chord_tolerance)

    @cached_property
    def domain(self):
        """The structured CFD domain mesh (moc.io.domain_mesh) in the output unit, with its quality noted."""
        from moc.io import domain_mesh

        o = self.options
        first = 1e-3 if o.first_cell is None else self.to_throat(o.first_cell)
        mesh = domain_mesh.build(
            self.contour, o.axial_cells, o.radial_cells, first, axisymmetric=self.axisymmetric,
            plume_length=self.to_throat(o.plume_length), plume_height=self.to_throat(o.plume_height),
            plume_axial_cells=o.plume_axial_cells, plume_radial_cells=o.plume_radial_cells,
        )
        mesh.points = mesh.points * self.scale
        q = mesh.quality()
        self.note(
            f"domain mesh: {q['cells']} quads, {q['points']} points; largest skew {q['max_skew']:.3f}, "
            f"largest aspect ratio {q['max_aspect']:.4g}, smallest cell area {q['min_area']:.4g} {self.unit}^2"
        )
        return mesh

"""Case files: the TOML description of one nozzle job, validated key by key.

The schema is documented in docs/case-file.md.  Every key is checked; an
unknown key is an error that names it and the nearest valid one.  The result
is a plain dict of validated values (`Case.data`) that the designers, the CLI
and the saved result share.
"""

from __future__ import annotations

import difflib
import math
import tomllib
from dataclasses import dataclass
from pathlib import Path

from moc.errors import CaseFileError
from moc.units import METRES_PER_UNIT as LENGTH_UNITS
from moc.units import PASCALS_PER_UNIT as PRESSURE_UNITS


def _num(lo=None, hi=None, lo_open=True, integer=False):
    def check(v, where):
        if isinstance(v, bool) or not isinstance(v, (int, float)):
            raise CaseFileError(f"{where} must be a number, got {v!r}.")
        v = float(v)
        if not math.isfinite(v):
            raise CaseFileError(f"{where} must be a finite number, got {v}.")
        if integer:
            if v != int(v):
                raise CaseFileError(f"{where} must be a whole number, got {v:g}.")
            v = int(v)
        if lo is not None and (v <= lo if lo_open else v < lo):
            raise CaseFileError(f"{where} must be {'above' if lo_open else 'at least'} {lo:g}, got {v:g}.")
        if hi is not None and v > hi:
            raise CaseFileError(f"{where} must be at most {hi:g}, got {v:g}.")
        return v
    return check


def _choice(*options):
    def check(v, where):
        if v not in options:
            near = difflib.get_close_matches(str(v), options, n=1)
            hint = f" (did you mean {near[0]!r}?)" if near else ""
            raise CaseFileError(f"{where} must be one of {', '.join(map(repr, options))}, got {v!r}{hint}.")
        return v
    return check


def _text(v, where):
    if not isinstance(v, str):
        raise CaseFileError(f"{where} must be text, got {v!r}.")
    return v


def _bool(v, where):
    if not isinstance(v, bool):
        raise CaseFileError(f"{where} must be true or false, got {v!r}.")
    return v


def _text_list(v, where):
    if isinstance(v, str):
        v = [s.strip() for s in v.split(",") if s.strip()]
    if not isinstance(v, list) or not all(isinstance(s, str) for s in v):
        raise CaseFileError(f"{where} must be a list of names such as [\"csv\", \"dxf\"], got {v!r}.")
    return v


#: section -> key -> (validator, default, one-line description).  A default of
#: None means "not set"; REQUIRED keys must be given.
REQUIRED = object()
SCHEMA = {
    "": {
        "title": (_text, "", "a short name for the job, printed in reports"),
        "description": (_text, "", "free text"),
    },
    "gas": {
        "gamma": (_num(1.0), 1.4, "ratio of specific heats (> 1)"),
        "R": (_num(0.0), 287.05, "specific gas constant, J/(kg K)"),
        "name": (_text, "", "a label for the gas"),
    },
    "nozzle": {
        "method": (_choice("minimum-length", "gradual"), "minimum-length",
                   "'minimum-length' (sharp throat corner) or 'gradual' (rounded throat, gradual expansion)"),
        "geometry": (_choice("axisymmetric", "planar"), "axisymmetric", "'axisymmetric' or 'planar'"),
        "exit_mach": (_num(1.0), REQUIRED, "design exit Mach number (> 1)"),
        "throat_size": (_num(0.0), 1.0, "throat radius (axisymmetric) or half-height (planar), in throat_unit"),
        "throat_unit": (_choice(*LENGTH_UNITS), "mm", "unit of throat_size: " + ", ".join(LENGTH_UNITS)),
        "characteristics": (_num(3, 5000, lo_open=False, integer=True), 50, "number of characteristics in the net (at least 3)"),
        "width": (_num(0.0), None, "planar nozzles: span (depth) in throat_unit, for thrust, mass flow and STL"),
    },
    "throat": {
        "curvature": (_num(0.0), 2.0, "gradual method: wall radius of curvature at the throat / throat size"),
        "inflection_deg": (_num(0.0, 90.0), None, "gradual method: wall angle at the end of the initial arc, deg"),
        "length": (_num(0.0), None, "gradual method: target nozzle length / throat size (solves for the inflection angle)"),
        "solution": (_choice("sauer", "hall", "kliegel-levine"), "sauer", "transonic throat solution"),
    },
    "truncate": {
        "length_fraction": (_num(0.0, 1.0), None, "keep this fraction of the contour length (0 < f <= 1)"),
        "area_ratio": (_num(1.0), None, "cut where the local area ratio reaches this value"),
        "exit_wall_angle_deg": (_num(0.0, 90.0, lo_open=False), None, "cut where the wall angle falls to this value, deg"),
    },
    "inlet": {
        "contraction_ratio": (_num(1.0), None, "inlet-face area over throat area (> 1); enables the subsonic inlet"),
        "entrance_radius": (_num(0.0), 1.0, "radius of the arc at the inlet face / throat size"),
        "throat_radius": (_num(0.0), None, "radius of the arc on the throat side / throat size (default: throat curvature)"),
        "cone_angle_deg": (_num(0.0, 89.0), 30.0, "half-angle of the straight convergent part, deg"),
    },
    "chamber": {
        "pressure": (_num(0.0), None, "stagnation pressure, in pressure_unit"),
        "pressure_unit": (_choice(*PRESSURE_UNITS), "bar", "unit of pressure and ambient_pressure: " + ", ".join(PRESSURE_UNITS)),
        "temperature": (_num(0.0), None, "stagnation temperature, K"),
        "ambient_pressure": (_num(0.0, lo_open=False), None, "ambient pressure for thrust at altitude, in pressure_unit"),
    },
    "output": {
        "directory": (_text, None, "where results go (the -o option overrides it)"),
        "plots": (_bool, True, "write the PNG overview of the wall and net"),
        "formats": (_text_list, [], "export formats written after the design (see 'moc export --help')"),
        "units": (_choice(*LENGTH_UNITS), None, "length unit of exported files (default: throat_unit)"),
        "chord_tolerance": (_num(0.0), None, "largest chord error of exported wall points, in units"),
    },
}


def _nearest(key, options):
    near = difflib.get_close_matches(key, list(options), n=1, cutoff=0.5)
    return f"; the nearest valid key is {near[0]!r}" if near else ""


@dataclass
class Case:
    """A validated case: `data[section][key]`, every key present (defaults filled)."""

    data: dict
    source: str = "<flags>"

    def __getitem__(self, section):
        return self.data[section]

    def to_dict(self):
        return {k: dict(v) if isinstance(v, dict) else v for k, v in self.data.items()}


def validate(raw: dict, source="<flags>") -> Case:
    """Check every key of a parsed case (nested dict) and fill defaults."""
    if not isinstance(raw, dict):
        raise CaseFileError(f"{source}: a case must be a table of sections.")
    sections = [s for s in SCHEMA if s]
    data = {}
    top = SCHEMA[""]
    for key, value in raw.items():
        if isinstance(value, dict):
            if key not in SCHEMA or key == "":
                raise CaseFileError(f"{source}: unknown section [{key}]{_nearest(key, sections).replace('key', 'section')}.")
            continue
        if key not in top:
            where = [s for s in sections if key in SCHEMA[s]]
            hint = f"; it belongs in section [{where[0]}]" if where else _nearest(key, list(top) + sections)
            raise CaseFileError(f"{source}: unknown key {key!r} at the top level{hint}.")
    for sec in SCHEMA:
        spec = SCHEMA[sec]
        given = raw if sec == "" else raw.get(sec, {})
        out = {}
        for key, value in given.items():
            if sec == "" and isinstance(value, dict):
                continue
            if key not in spec:
                raise CaseFileError(f"{source}: unknown key {key!r} in [{sec}]{_nearest(key, spec)}.")
            where = f"{source}: {'[' + sec + '] ' if sec else ''}{key}"
            out[key] = spec[key][0](value, where)
        for key, (_, default, _) in spec.items():
            if key not in out:
                if default is REQUIRED:
                    raise CaseFileError(f"{source}: [{sec}] {key} is required ({spec[key][2]}).")
                out[key] = list(default) if isinstance(default, list) else default
        data[sec or "meta"] = out
    tr = [k for k, v in data["truncate"].items() if v is not None]
    if len(tr) > 1:
        raise CaseFileError(f"{source}: [truncate] takes one of length_fraction, area_ratio, exit_wall_angle_deg, got {', '.join(tr)}.")
    th = data["throat"]
    if th["inflection_deg"] is not None and th["length"] is not None:
        raise CaseFileError(f"{source}: [throat] takes inflection_deg or length, not both.")
    return Case(data, source)


def load(path) -> Case:
    """Read and validate a TOML case file."""
    return validate(read_raw(path), source=str(path))


def read_raw(path) -> dict:
    """Parse a TOML case file without validating it (flags may still be merged in)."""
    p = Path(path)
    if not p.is_file():
        raise CaseFileError(f"case file {p} does not exist (give a .toml file; see docs/case-file.md).")
    try:
        raw = tomllib.loads(p.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        raise CaseFileError(f"{p} is not valid TOML: {exc}.") from None
    except UnicodeDecodeError:
        raise CaseFileError(f"{p} is not a UTF-8 text file.") from None
    return raw


def reference_markdown() -> str:
    """The schema as a Markdown reference (docs/case-file.md is generated from it)."""
    lines = []
    for sec, spec in SCHEMA.items():
        lines.append(f"### {'top level' if not sec else '[' + sec + ']'}\n")
        lines.append("| key | default | meaning |\n|---|---|---|")
        for key, (_, default, doc) in spec.items():
            d = "required" if default is REQUIRED else ("not set" if default is None else repr(default))
            lines.append(f"| `{key}` | {d} | {doc} |")
        lines.append("")
    return "\n".join(lines)

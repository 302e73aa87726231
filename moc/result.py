"""Result objects shared by designers, analysers, plots, exports and the CLI.

A `Result` holds the inputs, the characteristic net, the wall, the centreline,
the exit profile, any shocks and a summary dict.  Everything downstream reads
from it; nothing recomputes.  It is saved as `result.npz` (format described in
docs/result-file.md) beside `summary.json`, and reloaded with `Result.load`.

Conventions: lengths in throat half-heights (planar) or throat radii
(axisymmetric), x downstream with the throat at x = 0, angles in radians.
"""

from __future__ import annotations

import io
import json
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from moc.errors import ResultFileError
from moc.io.atomic import atomic_write

FORMAT_NAME = "moc-result"
FORMAT_VERSION = 1


@dataclass
class Net:
    """A characteristic net stored as points with two family labels.

    Each point lies on one C+ characteristic (label `cplus`) and one C-
    characteristic (label `cminus`); points with the same label form one line
    of that family, in marching order.  `cells` are quadrilaterals (point
    indices, counter-clockwise in x, y); a repeated index marks a triangle
    (for example against the axis).  `p0_ratio` is the local total pressure
    over the chamber value: 1 everywhere in homentropic flow.
    """

    x: np.ndarray
    y: np.ndarray
    theta: np.ndarray
    mach: np.ndarray
    cplus: np.ndarray
    cminus: np.ndarray
    cells: np.ndarray
    p0_ratio: np.ndarray | None = None

    def __post_init__(self):
        for name in ("x", "y", "theta", "mach"):
            setattr(self, name, np.asarray(getattr(self, name), dtype=float))
        self.cplus = np.asarray(self.cplus, dtype=np.int64)
        self.cminus = np.asarray(self.cminus, dtype=np.int64)
        self.cells = np.asarray(self.cells, dtype=np.int64).reshape(-1, 4)
        if self.p0_ratio is None:
            self.p0_ratio = np.ones_like(self.x)
        else:
            self.p0_ratio = np.asarray(self.p0_ratio, dtype=float)

    @property
    def size(self):
        return int(self.x.size)

    def line(self, family, label):
        """Indices of the points on one characteristic ('+' or '-') in marching order."""
        lab = self.cplus if family == "+" else self.cminus
        idx = np.flatnonzero(lab == label)
        other = self.cminus if family == "+" else self.cplus
        return idx[np.argsort(other[idx], kind="stable")]

    def lines(self, family):
        """List of index arrays, one per characteristic of the family ('+' or '-')."""
        lab = self.cplus if family == "+" else self.cminus
        return [self.line(family, k) for k in np.unique(lab)]


@dataclass
class Result:
    """Outcome of `moc design` or `moc analyze`.

    kind: "design" or "analysis".  inputs: the validated case as a plain dict.
    summary: JSON-ready key numbers (the contract of summary.json).
    wall, axis, exit, inlet: dicts of 1-D arrays (see docs/result-file.md).
    shocks: list of dicts of 1-D arrays (x, y, beta, p2_p1, p02_p01, ...).
    """

    kind: str
    inputs: dict
    summary: dict
    net: Net
    wall: dict
    axis: dict = field(default_factory=dict)
    exit: dict = field(default_factory=dict)
    inlet: dict = field(default_factory=dict)
    shocks: list = field(default_factory=list)

    def __repr__(self):
        s = self.summary
        keys = ("geometry", "exit_mach", "area_ratio", "length", "points")
        inner = ", ".join(f"{k}={s[k]!r}" for k in keys if k in s)
        return f"<moc {self.kind} result: {inner}>"

    # -- saving and loading -------------------------------------------------
    def to_arrays(self):
        arrays = {
            "format": np.array(FORMAT_NAME),
            "format_version": np.array(FORMAT_VERSION),
            "kind": np.array(self.kind),
            "inputs_json": np.array(json.dumps(self.inputs, sort_keys=True)),
            "summary_json": np.array(json.dumps(self.summary, sort_keys=True)),
            "shock_count": np.array(len(self.shocks)),
        }
        for name in ("x", "y", "theta", "mach", "cplus", "cminus", "cells", "p0_ratio"):
            arrays[f"net_{name}"] = getattr(self.net, name)
        for group in ("wall", "axis", "exit", "inlet"):
            for k, v in getattr(self, group).items():
                arrays[f"{group}_{k}"] = np.asarray(v)
        for n, sh in enumerate(self.shocks):
            for k, v in sh.items():
                arrays[f"shock{n}_{k}"] = np.asarray(v)
        return arrays

    def save(self, directory, force=True):
        """Write DIR/result.npz atomically (summary.json is written by the caller)."""
        buf = io.BytesIO()
        np.savez_compressed(buf, **self.to_arrays())
        path = Path(directory) / "result.npz"
        atomic_write(path, buf.getvalue(), force=force)
        return path

    @classmethod
    def load(cls, directory):
        """Read a saved result from a directory (or a result.npz path)."""
        p = Path(directory)
        path = p / "result.npz" if p.is_dir() else p
        if not path.exists():
            raise ResultFileError(
                f"no saved result at {path}; give a directory written by 'moc design' or 'moc analyze'."
            )
        try:
            with np.load(path, allow_pickle=False) as z:
                d = {k: z[k] for k in z.files}
        except Exception as exc:  # damaged archive
            raise ResultFileError(f"{path} is not a readable moc result file ({exc}).") from None
        if str(d.get("format", "")) != FORMAT_NAME:
            raise ResultFileError(f"{path} is not a moc result file (no '{FORMAT_NAME}' marker).")
        version = int(d["format_version"])
        if version != FORMAT_VERSION:
            raise ResultFileError(
                f"{path} has result format version {version}; this moc reads version {FORMAT_VERSION}. "
                "Re-run the design or analysis with this version."
            )
        net = Net(**{k: d[f"net_{k}"] for k in ("x", "y", "theta", "mach", "cplus", "cminus", "cells", "p0_ratio")})
        groups = {g: {} for g in ("wall", "axis", "exit", "inlet")}
        shocks = [dict() for _ in range(int(d["shock_count"]))]
        for k, v in d.items():
            head, _, tail = k.partition("_")
            if head in groups:
                groups[head][tail] = v
            elif head.startswith("shock") and head[5:].isdigit():
                shocks[int(head[5:])][tail] = v
        return cls(
            kind=str(d["kind"]),
            inputs=json.loads(str(d["inputs_json"])),
            summary=json.loads(str(d["summary_json"])),
            net=net,
            shocks=shocks,
            **groups,
        )


def write_summary(directory, summary, force=True):
    """Write DIR/summary.json atomically (sorted keys, 2-space indent)."""
    path = Path(directory) / "summary.json"
    atomic_write(path, json.dumps(summary, indent=2, sort_keys=True) + "\n", force=force)
    return path

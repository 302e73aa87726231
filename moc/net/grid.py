"""A block of the characteristic net stored in characteristic coordinates.

`Grid` holds 2-D arrays indexed [i, j]: i labels the C+ characteristic and j
the C- characteristic through a point; entries that are not part of the net
are NaN (`valid` is False there).  Offsets `i0`, `j0` give the labels of row
and column 0, so blocks of one net share labels.
"""

from dataclasses import dataclass

import numpy as np

from moc.net.points import Points

FIELDS = ("x", "y", "theta", "nu", "mu")


@dataclass
class Grid:
    x: np.ndarray
    y: np.ndarray
    theta: np.ndarray
    nu: np.ndarray
    mu: np.ndarray
    i0: int = 0
    j0: int = 0

    @classmethod
    def empty(cls, ni, nj, i0=0, j0=0):
        return cls(*(np.full((ni, nj), np.nan) for _ in FIELDS), i0=i0, j0=j0)

    @classmethod
    def from_fronts(cls, fronts):
        """Assemble from a list of (i_labels, j_labels, Points) blocks."""
        ii = np.concatenate([f[0] for f in fronts])
        jj = np.concatenate([f[1] for f in fronts])
        i0, j0 = int(ii.min()), int(jj.min())
        ni, nj = int(ii.max()) - i0 + 1, int(jj.max()) - j0 + 1
        flat = (ii - i0) * nj + (jj - j0)  # one flat index for all fields (3x faster scatter)
        arrays = []
        for name_k in range(len(FIELDS)):
            a = np.full(ni * nj, np.nan)
            a[flat] = np.concatenate([np.atleast_1d(f[2][name_k]) for f in fronts])
            arrays.append(a.reshape(ni, nj))
        return cls(*arrays, i0=i0, j0=j0)

    @property
    def shape(self):
        return self.x.shape

    @property
    def valid(self):
        return np.isfinite(self.x)

    @property
    def mach(self):
        return 1.0 / np.sin(self.mu)

    def at(self, index):
        """Points at a numpy index into the 2-D arrays."""
        return Points(*(getattr(self, f)[index] for f in FIELDS))

    def cplus(self, label):
        """Points of one C+ characteristic (label i), in marching order (increasing j)."""
        r = label - self.i0
        ok = self.valid[r]
        return self.at((r, ok))

    def cminus(self, label):
        """Points of one C- characteristic (label j), in marching order (increasing i)."""
        c = label - self.j0
        ok = self.valid[:, c]
        return self.at((ok, c))

    @property
    def size(self):
        return int(np.count_nonzero(self.valid))

"""Gas models.

`PerfectGas` is a calorically perfect gas: constant gamma and specific gas
constant R.  The relations in `moc.flow` take gamma directly; this object
carries it (with R for dimensional mass flow and thrust) through designs and
results, and validates it once.
"""

from dataclasses import dataclass

from moc.errors import InputError
from moc.flow._checks import check_gamma

#: Specific gas constant of dry air, J/(kg K) (common practice value).
R_AIR = 287.05


@dataclass(frozen=True)
class PerfectGas:
    """Calorically perfect gas of ratio of specific heats `gamma` and gas constant `R` (J/(kg K))."""

    gamma: float = 1.4
    R: float = R_AIR

    def __post_init__(self):
        object.__setattr__(self, "gamma", check_gamma(self.gamma))
        try:
            r = float(self.R)
        except (TypeError, ValueError):
            raise InputError(f"gas constant R must be a positive number in J/(kg K), got {self.R!r}.") from None
        if not r > 0 or r != r or r == float("inf"):
            raise InputError(f"gas constant R must be a positive finite number in J/(kg K), got {self.R!r}.")
        object.__setattr__(self, "R", r)

    @property
    def cp(self):
        """Specific heat at constant pressure, J/(kg K)."""
        return self.gamma * self.R / (self.gamma - 1.0)

    def to_dict(self):
        return {"model": "perfect", "gamma": self.gamma, "R": self.R}

"""Nozzle designers: each builds a characteristic net and a wall and returns a `moc.result.Result`.

`design_minimum_length` (sharp-corner throat, this package's `minimum_length`
module); the rounded-throat designers live in their own modules.
"""

from moc.design.minimum_length import design_minimum_length

__all__ = ["design_minimum_length"]

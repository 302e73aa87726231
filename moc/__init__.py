"""moc: supersonic nozzle contours by the method of characteristics.

Layers (lower never imports higher): `moc.gas`, `moc.flow` (pure relations),
`moc.net` (characteristic net, unit processes), `moc.throat`, `moc.design`,
`moc.analysis`, `moc.geometry` / `moc.performance`, `moc.io`, `moc.plot`,
`moc.cli`.
"""

__version__ = "0.1.0"

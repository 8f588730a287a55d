"""The pure calculation core: plain numbers and numpy arrays in, plain results out.

No database, terminal or files, and nothing of ours imported but :mod:`ledger.errors`
(``tests/test_layers.py`` holds it to that). SI throughout.

- :mod:`~ledger.core.massprops`: mass, moment and CG; %MAC; moment index.
- :mod:`~ledger.core.envelope`: envelope polygons, inclusive containment, margins, CG paths.
- :mod:`~ledger.core.sweep`: very many loading cases against one envelope.
- :mod:`~ledger.core.fuel`: densities, temperature correction, tank arms, fuel burn.
- :mod:`~ledger.core.corrections`: weight shift, ballast, offload, room left at a station.
- :mod:`~ledger.core.weighing`: empty weight and CG from scale readings.
- :mod:`~ledger.core.inertia`: item shapes, build-up about the CG, body and principal axes.
- :mod:`~ledger.core.ground`: road vehicles: axle loads, ratings, axle-group rules, CG height.
- :mod:`~ledger.core.factors`: the exact conversion factors the core needs.
"""

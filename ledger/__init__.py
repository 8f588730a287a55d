"""wbledger: a weight-and-balance ledger for aircraft and road vehicles.

The package is layered so that data flows one way: ``cli`` → ``typedata`` / ``store`` →
``core`` → ``report``. ``ledger.core`` is pure calculation and imports nothing else of ours.
"""

__version__ = "0.1.0"

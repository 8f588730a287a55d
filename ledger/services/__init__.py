"""Services: one module per use case, the one home of the work that combines the store, the type
data and the calculations.

A service is a few plain functions. Each takes the engine first (``ledger.services.database``
opens it), opens one unit of work (one transaction: it all commits or nothing does), reads
through the store, calls the pure builders (``ledger.loadsheet``, ``ledger.analysis``) and the
core, and returns a result object: a frozen dataclass or a typed document that the CLI renders,
a test inspects, or a screen shows. Services take the user's text where the user typed it and
parse it with ``ledger.units`` and ``ledger.typedata``; they never print, prompt or exit, and
they raise only subclasses of :class:`ledger.errors.LedgerError` for what the user can mend.

A new use case is a new module here, not new logic in the store or the CLI.
"""

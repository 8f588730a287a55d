"""Export a vehicle's ledger to CSV or JSON and import one back, exactly.

Both formats carry every stored column of every entry (:data:`COLUMNS`): SI values, floats
written with Python's ``repr`` (which reads back to the same double), dates as ISO text,
``recorded_at`` in UTC with microseconds, the detail as canonical JSON, and the hashes. So an
export imported into an empty vehicle of the same registration reproduces every value and every
hash, and exporting that again gives the same file.

Import
------
:func:`import_history` appends the file's entries after the vehicle's newest entry. Each row is
checked as if it were appended by hand (kinds, dates in order and not in the future, items
installed before they are removed, corrections of entries that exist), its running totals are
computed, and the hash chain is continued. Columns a person writing a file by hand may leave out
or empty: ``seq``, ``recorded_at`` (then: now), the deltas, running totals, ``baseline_seq``,
``z_known`` (except for weighings with a vertical CG) and the hashes. When they are given they
must agree with what the ledger computes (floats to a relative 1e-9); the hashes must agree
exactly, so an exported file that was edited is refused (remove the two hash columns to import
an edited file, or one exported from another registration).

A JSON history is held to :mod:`ledger.bounds` as a whole (nesting, sizes of numbers, no NUL:
``FILE: entries[3].actor = …``), and every text, number and whole number of a row as it is read
(CSV too); an imported weighing's empty mass must be plausible for the vehicle's type, as for a
weighing recorded by hand (:func:`ledger.core.weighing.plausible_empty_mass`).

A bad row is reported as ``FILE line N: FIELD = VALUE: what is allowed`` and nothing of that
import is written: every row is checked before the first insert, and the inserts run in the
caller's one transaction. Inserts go through SQLAlchemy Core ``executemany`` in chunks.

The file format is :mod:`ledger.store.history_file`, the import :mod:`ledger.store.bulk_import`;
this module gathers both.
"""

from ledger.store.bulk_import import CHUNK, ImportSummary, import_entries, import_history
from ledger.store.history_file import COLUMNS, FORMATS, export_history, parse_history

__all__ = [
    "COLUMNS",
    "FORMATS",
    "CHUNK",
    "ImportSummary",
    "export_history",
    "parse_history",
    "import_history",
    "import_entries",
]

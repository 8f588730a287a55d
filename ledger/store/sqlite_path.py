"""The SQLite driver-level insert of ledger entries.

A single append is one short transaction, and SQLAlchemy's per-statement work (cache look-up,
parameter and result processing) costs about as much as SQLite's own insert. On SQLite the two
statements of an append (and the rows of a bulk import) therefore go to the driver (sqlite3, on
the session's connection and in its transaction) as plain SQL and tuples, converted by
SQLAlchemy's own SQLite bind and result processors so that values are stored and read back
exactly as through the ORM (``tests/store/test_sqlite_driver_path.py`` checks both paths
against each other). PostgreSQL keeps the Core statements.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from functools import lru_cache
from operator import itemgetter
from typing import Any, NamedTuple

from sqlalchemy.engine.processors import to_float

from ledger.store.models import LedgerEntryRow

__all__ = ["SqliteInsert", "sqlite_insert", "driver"]

_E = LedgerEntryRow


class SqliteInsert(NamedTuple):
    """The entry insert as SQLite driver SQL: column names and the bind converters by index."""

    sql: str
    cols: tuple[str, ...]
    #: The bind converters by column index, but for ``floats``.
    converters: tuple[tuple[int, Any], ...]
    #: ``values`` in the order of ``cols`` (one C call per row).
    pick: Callable[[Mapping[str, Any]], tuple]
    #: Indexes of the columns whose converter is SQLAlchemy's ``to_float``: a Python float is
    #: passed as it is (the converter would return an equal float), anything else converted.
    floats: tuple[int, ...]

    def memo(self) -> tuple[dict, ...]:
        """Empty memos for :meth:`row` (one per converter), for a bulk insert."""
        return tuple({} for _ in self.converters)

    def row(self, values: Mapping[str, Any], memo: tuple[dict, ...] | None = None) -> tuple:
        """``values`` (column → value) as the driver's parameter tuple; a ``memo`` kept across
        the rows of a bulk insert converts each distinct value once."""
        t = list(self.pick(values))
        for (k, proc), seen in zip(self.converters, memo or self.memo()):
            v = t[k]
            if v is not None:
                done = seen.get(v)
                if done is None:
                    done = seen[v] = proc(v)
                t[k] = done
        for k in self.floats:
            v = t[k]
            if v is not None and v.__class__ is not float:
                t[k] = to_float(v)
        return tuple(t)


def driver(conn):
    """The sqlite3 connection under ``conn``, in ``conn``'s transaction."""
    return conn.connection.driver_connection


@lru_cache(maxsize=4)
def sqlite_insert(dialect) -> SqliteInsert:
    """The insert of a ledger entry (every column but ``id``) for the sqlite3 driver."""
    table = _E.__table__
    cols = tuple(c.name for c in table.columns if c.name != "id")
    converters, floats = [], []
    for k, name in enumerate(cols):
        proc = table.c[name].type.dialect_impl(dialect).bind_processor(dialect)
        if proc is to_float:
            floats.append(k)
        elif proc is not None:
            converters.append((k, proc))
    sql = (f"INSERT INTO {table.name} ({', '.join(cols)}) "
           f"VALUES ({', '.join('?' for _ in cols)})")
    return SqliteInsert(sql, cols, tuple(converters), itemgetter(*cols), tuple(floats))

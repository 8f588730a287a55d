"""Opening the ledger's database for a use case, and the unit of work every service runs in."""

from __future__ import annotations

from sqlalchemy.engine import Engine

from ledger.store.db import check_schema, make_engine, session_scope

__all__ = ["check_database", "open_database", "unit_of_work"]

#: One transaction: it commits when the block ends normally and rolls back on any error.
unit_of_work = session_scope

#: Refuse a database that is not initialised or not at this version's schema.
check_database = check_schema


def open_database(url: str | None = None, *, check: bool = True) -> Engine:
    """The engine for ``url`` (``--db``, else ``$WBLEDGER_DB``, else the user's default file).

    With ``check``, a database that is not initialised or not at this version's schema is
    refused with the command that mends it.
    """
    engine = make_engine(url)
    if check:
        check_database(engine)
    return engine

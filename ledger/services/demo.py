"""The demo's database: never the user's own ledger.

``wbledger demo`` writes to a database of its own: the one ``--db`` or ``$WBLEDGER_DB`` names if
that one holds no vehicle yet, else a fresh SQLite file in the demo's output folder (made anew
each run). The steps of the demo are ordinary commands, run by the command line.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from sqlalchemy import func, select

from ledger.errors import ConflictError
from ledger.files import make_private_folder
from ledger.services.database import open_database
from ledger.store.db import ENV_VAR, table_names
from ledger.store.models import VehicleRow

__all__ = ["DEMO_DB_NAME", "DemoDatabase", "demo_database"]

#: The demo's own database file in its output folder.
DEMO_DB_NAME = "demo.sqlite3"


@dataclass(frozen=True)
class DemoDatabase:
    """Where the demo writes: ``url`` (SQLAlchemy form) and ``out``, its output folder."""

    url: str
    out: Path


def _vehicle_count(url: str) -> int:
    """How many vehicles the database at ``url`` holds (0 when it has no ledger yet)."""
    engine = open_database(url, check=False)
    try:
        if "vehicles" not in table_names(engine):
            return 0
        with engine.connect() as conn:
            return conn.execute(select(func.count()).select_from(VehicleRow)).scalar_one()
    finally:
        engine.dispose()


def demo_database(url: str | None, out: Path) -> DemoDatabase:
    """The database the demo writes to, and its output folder ``out`` made (0700 when new).

    ``url`` (``--db``), else ``$WBLEDGER_DB``, must name a database with no vehicle; without
    either, the demo uses ``out/demo.sqlite3``, removed first with what SQLite left beside it.

    Raises
    ------
    ConflictError
        The named database already holds vehicles (nothing is written).
    """
    url = url or os.environ.get(ENV_VAR)
    if url:
        count = _vehicle_count(url)
        if count:
            raise ConflictError(
                f"the demo needs an empty database, and {url} already holds {count} "
                f"vehicle(s); unset WBLEDGER_DB or give --db a new database")
    else:
        make_private_folder(out)
        path = out / DEMO_DB_NAME
        for leftover in (path, path.with_name(path.name + "-wal"),
                         path.with_name(path.name + "-shm")):
            leftover.unlink(missing_ok=True)
        url = f"sqlite:///{path}"
    make_private_folder(out)  # 0700 when new; an existing folder keeps its mode
    return DemoDatabase(url, out)

"""The demo's database: never the user's own ledger.

``wbledger demo`` writes to a database of its own: the one ``--db`` or ``$WBLEDGER_DB`` names if
that one holds no vehicle yet, else a fresh SQLite file in the demo's output folder (made anew
each run). The steps of the demo are ordinary commands, run by the command line.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from sqlalchemy import func, make_url, select

from ledger.errors import ConflictError
from ledger.files import make_private_folder, write_output
from ledger.services.database import open_database
from ledger.store.db import ENV_VAR, table_names
from ledger.store.models import VehicleRow

__all__ = ["DEMO_DB_NAME", "DEMO_FLEET_FOLDER", "DemoDatabase", "copy_fleet", "demo_database"]

#: The demo's own database file in its output folder.
DEMO_DB_NAME = "demo.sqlite3"
#: The folder of the output folder that receives a copy of the demo fleet's files.
DEMO_FLEET_FOLDER = "fleet"


@dataclass(frozen=True)
class DemoDatabase:
    """Where the demo writes: ``url`` (SQLAlchemy form) and ``out``, its output folder.

    ``shown_url`` is ``url`` with any password hidden, for printing.
    """

    url: str
    out: Path

    @property
    def shown_url(self) -> str:
        return make_url(self.url).render_as_string(hide_password=True)


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


def copy_fleet(fleet: Path, out: Path) -> Path:
    """Copy the demo fleet's type files and plans from ``fleet`` into ``out/fleet`` and return
    that folder, so that the demo's commands name short paths the user can run and edit
    (issue 13 item 21). Files of an earlier run are replaced; like everything the demo writes,
    the copies are private (0600 in 0700 folders)."""
    target = out / DEMO_FLEET_FOLDER
    make_private_folder(target / "plans")
    for source in [*fleet.glob("*.toml"), *(fleet / "plans").glob("*.toml")]:
        write_output(target / source.relative_to(fleet), source.read_bytes(), "--out")
    return target

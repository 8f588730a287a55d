"""Opening the ledger's database for a use case, the unit of work every service runs in, and the
database's own use cases: create, upgrade, status and (PostgreSQL) group roles."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from sqlalchemy.engine import Engine

from ledger.store import db, roles
from ledger.store.db import (
    LOCK_TIMEOUT_VAR,
    check_schema,
    lock_timeout,
    make_engine,
    session_scope,
    shown_url,
)

__all__ = [
    "LOCK_TIMEOUT_VAR",
    "lock_timeout",
    "shown_url",
    "check_database",
    "open_database",
    "unit_of_work",
    "SchemaChange",
    "SchemaStatus",
    "GroupRole",
    "init_database",
    "upgrade_database",
    "database_status",
    "roles_sql",
    "create_roles",
]

#: One transaction: it commits when the block ends normally and rolls back on any error.
unit_of_work = session_scope

#: Refuse a database that is not initialised or not at this version's schema.
check_database = check_schema


def open_database(url: str | None = None, *, check: bool = True,
                  on_lock_wait: Callable[[], None] | None = None) -> Engine:
    """The engine for ``url`` (``--db``, else ``$WBLEDGER_DB``, else the user's default file).

    With ``check``, a database that is not initialised or not at this version's schema is
    refused with the command that mends it. ``on_lock_wait`` is called when a transaction
    has waited about a second for a lock another process holds (the CLI says so).
    """
    engine = make_engine(url, on_lock_wait=on_lock_wait)
    if check:
        check_database(engine)
    return engine


def _shown(engine: Engine) -> str:
    return shown_url(engine.url)


@dataclass(frozen=True)
class SchemaChange:
    """A schema brought up to date: the database (URL without password), the revision before
    (None: empty), the one after, and the backup of a SQLite file made first (if any)."""

    url: str
    before: str | None
    after: str
    backup: Path | None

    @property
    def changed(self) -> bool:
        return self.before != self.after


@dataclass(frozen=True)
class SchemaStatus:
    """The database's schema revision (None: never initialised) and the one this wbledger
    needs."""

    url: str
    schema_revision: str | None
    required_revision: str

    @property
    def up_to_date(self) -> bool:
        return self.schema_revision == self.required_revision

    def to_dict(self) -> dict[str, Any]:
        return {"url": self.url, "schema_revision": self.schema_revision,
                "required_revision": self.required_revision, "up_to_date": self.up_to_date}


@dataclass(frozen=True)
class GroupRole:
    """A PostgreSQL group role made by :func:`create_roles`: its kind (``loadmaster``…), its
    name, and the tables it may add rows to (it may read every table)."""

    role: str
    name: str
    inserts: tuple[str, ...]


def init_database(engine: Engine) -> SchemaChange:
    """Create the schema in a new database, or bring an existing one up to date."""
    return SchemaChange(_shown(engine), *db.init_db(engine))


def upgrade_database(engine: Engine) -> SchemaChange:
    """Upgrade the schema to this version of wbledger (a SQLite file is backed up first)."""
    return SchemaChange(_shown(engine), *db.upgrade(engine))


def database_status(engine: Engine) -> SchemaStatus:
    """The database's schema revision and the one this wbledger needs."""
    with engine.connect() as conn:
        current = db.current_revision(conn)
    return SchemaStatus(_shown(engine), current, db.head_revision())


def roles_sql(prefix: str = "wbledger") -> list[str]:
    """The statements :func:`create_roles` runs (``db roles --dry-run``), without a database."""
    return roles.roles_sql(prefix)


def create_roles(engine: Engine, prefix: str = "wbledger") -> list[GroupRole]:
    """Create (or bring up to date) the PostgreSQL group roles, each granted only what it
    needs; run as the tables' owner."""
    with engine.begin() as conn:
        names = roles.create_roles(conn, prefix)
    return [GroupRole(role, name, roles.ROLE_GRANTS[role][0]) for role, name in names.items()]

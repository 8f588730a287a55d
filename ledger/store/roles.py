"""PostgreSQL group roles for the people who use a shared ledger, each with only what it needs.

``wbledger db roles`` creates (or brings up to date) four roles that cannot log in; a person's
own login role is made a member of one (``GRANT wbledger_maintenance TO alice``). None of them
owns a table, so none can drop or disable the append-only guards (:mod:`ledger.store.guards`),
and on PostgreSQL the database itself checks that a new entry, sheet or configuration names the
user who writes it (the guards' ``recorded_by`` triggers).

========================  ===================================================================
role                      may
========================  ===================================================================
``PREFIX_auditor``        read everything (``verify``, ``history``, ``sheet show``, exports)
``PREFIX_loadmaster``     read; save loading sheets (``sheet prepare --save``, ``sheet amend``)
``PREFIX_maintenance``    read; record weighings, installations, removals, corrections and
                          CG heights; define configurations of a vehicle
``PREFIX_weight_engineer``  read; import type revisions, add vehicles, define configurations
========================  ===================================================================

Saving a sheet or appending an entry locks the vehicle's row (``SELECT … FOR UPDATE``), which
PostgreSQL allows only with an UPDATE privilege: those roles get UPDATE on ``vehicles.id``
alone, and the append-only guard refuses any actual update.
"""

from __future__ import annotations

import re

from sqlalchemy.engine import Connection

from ledger.errors import InputError
from ledger.store.guards import GUARDED_TABLES

__all__ = ["ROLE_GRANTS", "role_names", "roles_sql", "create_roles", "recorder"]

_READ = (*GUARDED_TABLES, "alembic_version")

#: What each role may write: tables it may INSERT into, and whether it locks vehicles.
ROLE_GRANTS: dict[str, tuple[tuple[str, ...], bool]] = {
    "auditor": ((), False),
    "loadmaster": (("loading_sheets",), True),
    "maintenance": (("ledger_entries", "configurations"), True),
    "weight_engineer": (("vehicle_types", "type_revisions", "vehicles", "configurations"),
                        False),
}


def role_names(prefix: str = "wbledger") -> dict[str, str]:
    """``{"auditor": "wbledger_auditor", …}`` for ``prefix``."""
    if not re.fullmatch(r"[a-z][a-z0-9_]{0,30}", prefix or ""):
        raise InputError("--prefix", prefix, "1 to 31 lower-case letters, digits or '_', "
                         "starting with a letter")
    return {r: f"{prefix}_{r}" for r in ROLE_GRANTS}


def roles_sql(prefix: str = "wbledger", *, schema: str = "public",
              sequences: dict[str, str] | None = None) -> list[str]:
    """The statements :func:`create_roles` runs, in order (shown by ``db roles --dry-run``);
    ``sequences`` maps a table to its id sequence (default ``SCHEMA.TABLE_id_seq``).

    They are idempotent: a role that exists is kept and its privileges on the ledger's tables
    are set again from nothing.
    """
    names = role_names(prefix)
    seqs = sequences or {t: f"{schema}.{t}_id_seq" for t in GUARDED_TABLES}
    out = []
    tables = ", ".join(_READ)
    for role, name in names.items():
        inserts, locks = ROLE_GRANTS[role]
        out.append(f"DO $$ BEGIN IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = "
                   f"'{name}') THEN CREATE ROLE {name} NOLOGIN; END IF; END $$")
        out.append(f"REVOKE ALL ON {tables} FROM {name}")
        out.append(f"GRANT USAGE ON SCHEMA {schema} TO {name}")
        out.append(f"GRANT SELECT ON {tables} TO {name}")
        for t in inserts:
            out.append(f"GRANT INSERT ON {t} TO {name}")
            out.append(f"GRANT USAGE ON SEQUENCE {seqs[t]} TO {name}")
        if locks:
            out.append(f"GRANT UPDATE (id) ON vehicles TO {name}")
    return out


def create_roles(conn: Connection, prefix: str = "wbledger") -> dict[str, str]:
    """Create or update the group roles on the PostgreSQL database of ``conn``."""
    if conn.dialect.name != "postgresql":
        raise InputError("--db", conn.engine.url.render_as_string(hide_password=True),
                         "a PostgreSQL database; a SQLite file is a single-user ledger with "
                         "no roles (protect the file itself)")
    schema = conn.exec_driver_sql("SELECT current_schema()").scalar_one()
    seqs = {t: conn.exec_driver_sql(f"SELECT pg_get_serial_sequence('{t}', 'id')").scalar_one()
            for t in GUARDED_TABLES}
    for stmt in roles_sql(prefix, schema=schema, sequences=seqs):
        conn.exec_driver_sql(stmt)
    return role_names(prefix)


def recorder(conn: Connection, name: str) -> str:
    """Who is recorded as writing a row: ``name`` (``--by``), except on PostgreSQL for anyone
    who does not own the ledger's tables, where it is the database user (``current_user``) —
    the same rule the ``recorded_by`` triggers hold the database to. ``conn`` is the
    connection of the session that writes (``session.connection()``)."""
    if conn.dialect.name != "postgresql":
        return name
    user, owner = conn.exec_driver_sql(
        "SELECT current_user::text, pg_has_role(current_user, c.relowner, 'MEMBER') "
        "FROM pg_class c WHERE c.oid = 'ledger_entries'::regclass").one()
    return name if owner else user

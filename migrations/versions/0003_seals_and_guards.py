"""Seals on every table, configuration versions, and append-only guards

Revision ID: 0003
Revises: 0002
Create Date: 2026-12-04

Adds ``row_hash`` (and ``prev_hash`` where rows form a chain) to type revisions, vehicles,
configurations and loading sheets, ``entry_hash`` (the ledger head a sheet was built on) to
loading sheets, and ``version`` to configurations (a redefinition becomes a new row). Existing
rows are sealed as they are found, so run ``wbledger verify`` before upgrading a database you
do not trust. Then installs the triggers of :mod:`ledger.store.guards`.
"""
from __future__ import annotations

import sqlalchemy as sa
from alembic import op

from ledger.store import guards
from ledger.store.seal import (GENESIS_HASH, configuration_seal, sheet_seal,
                               type_revision_seal, vehicle_seal)

revision = '0003'
down_revision = '0002'
branch_labels = None
depends_on = None

_TS = sa.DateTime(timezone=True)
_types = sa.table("vehicle_types", sa.column("id"), sa.column("name"))
_revs = sa.table("type_revisions", sa.column("id"), sa.column("type_id"), sa.column("revision"),
                 sa.column("content_sha256"), sa.column("source_name"),
                 sa.column("source_text"), sa.column("spec_json"),
                 sa.column("imported_at", _TS), sa.column("prev_hash"), sa.column("row_hash"))
_vehicles = sa.table("vehicles", sa.column("id"), sa.column("registration"),
                     sa.column("type_id"), sa.column("serial"), sa.column("note"),
                     sa.column("created_at", _TS), sa.column("row_hash"))
_configs = sa.table("configurations", sa.column("id"), sa.column("type_id"),
                    sa.column("vehicle_id"), sa.column("name"), sa.column("description"),
                    sa.column("items_json"), sa.column("created_at", _TS),
                    sa.column("created_by"), sa.column("version"), sa.column("prev_hash"),
                    sa.column("row_hash"))
_entries = sa.table("ledger_entries", sa.column("id"), sa.column("seq"),
                    sa.column("entry_hash"))
_sheets = sa.table("loading_sheets", sa.column("id"), sa.column("vehicle_id"),
                   sa.column("type_revision_id"), sa.column("entry_id"),
                   sa.column("amends_id"), sa.column("content_sha256"),
                   sa.column("entry_hash"), sa.column("prev_hash"), sa.column("row_hash"))

_NEW = {
    "type_revisions": ("prev_hash", "row_hash"),
    "vehicles": ("row_hash",),
    "configurations": ("prev_hash", "row_hash"),
    "loading_sheets": ("entry_hash", "prev_hash", "row_hash"),
}


def _seal_existing(conn) -> None:
    type_names = dict(conn.execute(sa.select(_types.c.id, _types.c.name)).all())
    rev_hash: dict[int, str] = {}
    rev_no: dict[int, int] = {}
    last: dict[int, str] = {}
    for r in conn.execute(sa.select(_revs).order_by(_revs.c.type_id, _revs.c.revision)):
        prev = last.get(r.type_id, GENESIS_HASH)
        h = type_revision_seal(type_name=type_names[r.type_id], revision=r.revision,
                               content_sha256=r.content_sha256, source_name=r.source_name,
                               source_text=r.source_text, spec_json=r.spec_json,
                               imported_at=r.imported_at, prev_hash=prev)
        conn.execute(_revs.update().where(_revs.c.id == r.id).values(prev_hash=prev,
                                                                    row_hash=h))
        last[r.type_id] = rev_hash[r.id] = h
        rev_no[r.id] = r.revision
    registrations = {}
    for v in conn.execute(sa.select(_vehicles)):
        registrations[v.id] = v.registration
        h = vehicle_seal(registration=v.registration, type_name=type_names[v.type_id],
                         serial=v.serial, note=v.note, created_at=v.created_at)
        conn.execute(_vehicles.update().where(_vehicles.c.id == v.id).values(row_hash=h))
    for c in conn.execute(sa.select(_configs).order_by(_configs.c.id)):
        kind, owner = (("type", type_names[c.type_id]) if c.type_id is not None
                       else ("vehicle", registrations[c.vehicle_id]))
        h = configuration_seal(owner_kind=kind, owner=owner, name=c.name, version=1,
                               description=c.description, items_json=c.items_json,
                               created_at=c.created_at, created_by=c.created_by,
                               prev_hash=GENESIS_HASH)
        conn.execute(_configs.update().where(_configs.c.id == c.id).values(
            version=1, prev_hash=GENESIS_HASH, row_hash=h))
    entries = {e.id: (e.seq, e.entry_hash) for e in conn.execute(sa.select(_entries))}
    sheet_hash: dict[int, str] = {}
    last_sheet: dict[int, str] = {}
    for s in conn.execute(sa.select(_sheets).order_by(_sheets.c.id)):
        seq, ehash = entries[s.entry_id]
        prev = last_sheet.get(s.vehicle_id, GENESIS_HASH)
        rev_type = conn.execute(sa.select(_revs.c.type_id).where(
            _revs.c.id == s.type_revision_id)).scalar_one()
        h = sheet_seal(registration=registrations[s.vehicle_id],
                       content_sha256=s.content_sha256, type_name=type_names[rev_type],
                       type_revision=rev_no[s.type_revision_id],
                       type_hash=rev_hash[s.type_revision_id], entry_seq=seq,
                       entry_hash=ehash, amends_hash=sheet_hash.get(s.amends_id),
                       prev_hash=prev)
        conn.execute(_sheets.update().where(_sheets.c.id == s.id).values(
            entry_hash=ehash, prev_hash=prev, row_hash=h))
        last_sheet[s.vehicle_id] = sheet_hash[s.id] = h


def upgrade() -> None:
    conn = op.get_bind()  # (on SQLite with foreign keys off: ledger.store.db)
    for table, cols in _NEW.items():
        for col in cols:
            op.add_column(table, sa.Column(col, sa.String(length=64), nullable=True))
    op.add_column("configurations", sa.Column("version", sa.Integer(), nullable=True))
    _seal_existing(conn)
    for table, cols in _NEW.items():
        with op.batch_alter_table(table, schema=None) as batch_op:
            for col in cols:
                batch_op.alter_column(col, existing_type=sa.String(length=64), nullable=False)
            if table == "configurations":
                batch_op.alter_column("version", existing_type=sa.Integer(), nullable=False)
                batch_op.drop_constraint(op.f("uq_configurations_type_id_name"), type_="unique")
                batch_op.drop_constraint(op.f("uq_configurations_vehicle_id_name"), type_="unique")
                batch_op.create_unique_constraint(
                    op.f("uq_configurations_type_id_name_version"),
                    ["type_id", "name", "version"])
                batch_op.create_unique_constraint(
                    op.f("uq_configurations_vehicle_id_name_version"),
                    ["vehicle_id", "name", "version"])
                batch_op.create_check_constraint(op.f("ck_configurations_version_positive"),
                                                 "version >= 1")
            if table == "loading_sheets":
                batch_op.create_unique_constraint(
                    op.f("uq_loading_sheets_vehicle_id_prev_hash"), ["vehicle_id", "prev_hash"])
    guards.install(conn)


def downgrade() -> None:
    conn = op.get_bind()
    guards.drop(conn)
    with op.batch_alter_table("loading_sheets", schema=None) as batch_op:
        batch_op.drop_constraint(op.f("uq_loading_sheets_vehicle_id_prev_hash"), type_="unique")
    # Only the version in force of each configuration fits the old schema.
    older = sa.text("DELETE FROM configurations WHERE version < (SELECT max(c2.version) FROM "
                    "configurations c2 WHERE c2.name = configurations.name AND "
                    "c2.type_id IS NOT DISTINCT FROM configurations.type_id AND "
                    "c2.vehicle_id IS NOT DISTINCT FROM configurations.vehicle_id)"
                    if conn.dialect.name != "sqlite" else
                    "DELETE FROM configurations WHERE version < (SELECT max(c2.version) FROM "
                    "configurations c2 WHERE c2.name = configurations.name AND "
                    "c2.type_id IS configurations.type_id AND "
                    "c2.vehicle_id IS configurations.vehicle_id)")
    conn.execute(older)
    with op.batch_alter_table("configurations", schema=None) as batch_op:
        batch_op.drop_constraint(op.f("ck_configurations_version_positive"), type_="check")
        batch_op.drop_constraint(op.f("uq_configurations_vehicle_id_name_version"), type_="unique")
        batch_op.drop_constraint(op.f("uq_configurations_type_id_name_version"), type_="unique")
        batch_op.create_unique_constraint(op.f("uq_configurations_type_id_name"),
                                          ["type_id", "name"])
        batch_op.create_unique_constraint(op.f("uq_configurations_vehicle_id_name"),
                                          ["vehicle_id", "name"])
    for table, cols in _NEW.items():
        with op.batch_alter_table(table, schema=None) as batch_op:
            for col in cols:
                batch_op.drop_column(col)
            if table == "configurations":
                batch_op.drop_column("version")

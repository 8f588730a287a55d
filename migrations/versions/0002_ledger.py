"""The ledger: entries, configurations and loading sheets

Revision ID: 0002
Revises: 0001
Create Date: 2026-12-01
"""
from __future__ import annotations

import sqlalchemy as sa
from alembic import op

revision = '0002'
down_revision = '0001'
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table('configurations',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('type_id', sa.Integer(), nullable=True),
    sa.Column('vehicle_id', sa.Integer(), nullable=True),
    sa.Column('name', sa.String(length=120), nullable=False),
    sa.Column('description', sa.Text(), nullable=True),
    sa.Column('items_json', sa.Text(), nullable=False),
    sa.Column('created_at', sa.DateTime(timezone=True), nullable=False),
    sa.Column('created_by', sa.String(length=200), nullable=False),
    sa.CheckConstraint('(type_id IS NULL) <> (vehicle_id IS NULL)', name=op.f('ck_configurations_one_owner')),
    sa.ForeignKeyConstraint(['type_id'], ['vehicle_types.id'], name=op.f('fk_configurations_type_id_vehicle_types')),
    sa.ForeignKeyConstraint(['vehicle_id'], ['vehicles.id'], name=op.f('fk_configurations_vehicle_id_vehicles')),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_configurations')),
    sa.UniqueConstraint('type_id', 'name', name=op.f('uq_configurations_type_id_name')),
    sa.UniqueConstraint('vehicle_id', 'name', name=op.f('uq_configurations_vehicle_id_name'))
    )
    op.create_table('ledger_entries',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('vehicle_id', sa.Integer(), nullable=False),
    sa.Column('seq', sa.Integer(), nullable=False),
    sa.Column('kind', sa.String(length=20), nullable=False),
    sa.Column('entry_date', sa.Date(), nullable=False),
    sa.Column('recorded_at', sa.DateTime(timezone=True), nullable=False),
    sa.Column('actor', sa.String(length=200), nullable=False),
    sa.Column('reason', sa.Text(), nullable=True),
    sa.Column('reference', sa.String(length=200), nullable=True),
    sa.Column('item', sa.String(length=200), nullable=True),
    sa.Column('item_mass_kg', sa.Float(), nullable=True),
    sa.Column('item_x_m', sa.Float(), nullable=True),
    sa.Column('item_y_m', sa.Float(), nullable=True),
    sa.Column('item_z_m', sa.Float(), nullable=True),
    sa.Column('delta_mass_kg', sa.Float(), nullable=False),
    sa.Column('delta_mx_kgm', sa.Float(), nullable=False),
    sa.Column('delta_my_kgm', sa.Float(), nullable=False),
    sa.Column('delta_mz_kgm', sa.Float(), nullable=False),
    sa.Column('empty_mass_kg', sa.Float(), nullable=False),
    sa.Column('empty_mx_kgm', sa.Float(), nullable=False),
    sa.Column('empty_my_kgm', sa.Float(), nullable=False),
    sa.Column('empty_mz_kgm', sa.Float(), nullable=False),
    sa.Column('z_known', sa.Integer(), nullable=False),
    sa.Column('baseline_seq', sa.Integer(), nullable=False),
    sa.Column('reverses_seq', sa.Integer(), nullable=True),
    sa.Column('detail_json', sa.Text(), nullable=False),
    sa.Column('prev_hash', sa.String(length=64), nullable=False),
    sa.Column('entry_hash', sa.String(length=64), nullable=False),
    sa.CheckConstraint("kind IN ('weighing', 'install', 'remove', 'correction', 'cg_height')", name=op.f('ck_ledger_entries_kind_known')),
    sa.CheckConstraint('empty_mass_kg >= 0', name=op.f('ck_ledger_entries_empty_mass_not_negative')),
    sa.CheckConstraint('z_known IN (0, 1)', name=op.f('ck_ledger_entries_z_known_flag')),
    sa.CheckConstraint('baseline_seq >= 1 AND baseline_seq <= seq', name=op.f('ck_ledger_entries_baseline_not_after')),
    sa.CheckConstraint('reverses_seq IS NULL OR (reverses_seq >= 1 AND reverses_seq < seq)', name=op.f('ck_ledger_entries_reverses_earlier')),
    sa.CheckConstraint('seq >= 1', name=op.f('ck_ledger_entries_seq_positive')),
    sa.ForeignKeyConstraint(['vehicle_id'], ['vehicles.id'], name=op.f('fk_ledger_entries_vehicle_id_vehicles')),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_ledger_entries')),
    sa.UniqueConstraint('vehicle_id', 'seq', name=op.f('uq_ledger_entries_vehicle_id_seq'))
    )
    with op.batch_alter_table('ledger_entries', schema=None) as batch_op:
        batch_op.create_index('ix_ledger_entries_vehicle_kind_seq', ['vehicle_id', 'kind', 'seq'], unique=False)
        batch_op.create_index('ix_ledger_entries_vehicle_item_seq', ['vehicle_id', 'item', 'seq'], unique=False)

    op.create_table('loading_sheets',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('vehicle_id', sa.Integer(), nullable=False),
    sa.Column('type_revision_id', sa.Integer(), nullable=False),
    sa.Column('entry_id', sa.Integer(), nullable=False),
    sa.Column('amends_id', sa.Integer(), nullable=True),
    sa.Column('created_at', sa.DateTime(timezone=True), nullable=False),
    sa.Column('preparer', sa.String(length=200), nullable=False),
    sa.Column('verdict', sa.String(length=20), nullable=False),
    sa.Column('plan_json', sa.Text(), nullable=False),
    sa.Column('result_json', sa.Text(), nullable=False),
    sa.Column('content_sha256', sa.String(length=64), nullable=False),
    sa.CheckConstraint("verdict IN ('in_limits', 'out_of_limits')", name=op.f('ck_loading_sheets_verdict_known')),
    sa.ForeignKeyConstraint(['amends_id'], ['loading_sheets.id'], name=op.f('fk_loading_sheets_amends_id_loading_sheets')),
    sa.ForeignKeyConstraint(['entry_id'], ['ledger_entries.id'], name=op.f('fk_loading_sheets_entry_id_ledger_entries')),
    sa.ForeignKeyConstraint(['type_revision_id'], ['type_revisions.id'], name=op.f('fk_loading_sheets_type_revision_id_type_revisions')),
    sa.ForeignKeyConstraint(['vehicle_id'], ['vehicles.id'], name=op.f('fk_loading_sheets_vehicle_id_vehicles')),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_loading_sheets'))
    )


def downgrade() -> None:
    op.drop_table("loading_sheets")
    with op.batch_alter_table("ledger_entries", schema=None) as batch_op:
        batch_op.drop_index("ix_ledger_entries_vehicle_item_seq")
        batch_op.drop_index("ix_ledger_entries_vehicle_kind_seq")
    op.drop_table("ledger_entries")
    op.drop_table("configurations")

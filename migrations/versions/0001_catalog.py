"""Vehicle types, their revisions, and vehicles

Revision ID: 0001
Revises: 
Create Date: 2026-12-01
"""
from __future__ import annotations

import sqlalchemy as sa
from alembic import op

revision = '0001'
down_revision = None
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table('vehicle_types',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('name', sa.String(length=120), nullable=False),
    sa.Column('created_at', sa.DateTime(timezone=True), nullable=False),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_vehicle_types')),
    sa.UniqueConstraint('name', name=op.f('uq_vehicle_types_name'))
    )
    op.create_table('type_revisions',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('type_id', sa.Integer(), nullable=False),
    sa.Column('revision', sa.Integer(), nullable=False),
    sa.Column('content_sha256', sa.String(length=64), nullable=False),
    sa.Column('source_name', sa.String(length=500), nullable=False),
    sa.Column('source_text', sa.Text(), nullable=False),
    sa.Column('spec_json', sa.Text(), nullable=False),
    sa.Column('imported_at', sa.DateTime(timezone=True), nullable=False),
    sa.CheckConstraint('revision >= 1', name=op.f('ck_type_revisions_revision_positive')),
    sa.ForeignKeyConstraint(['type_id'], ['vehicle_types.id'], name=op.f('fk_type_revisions_type_id_vehicle_types')),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_type_revisions')),
    sa.UniqueConstraint('type_id', 'content_sha256', name=op.f('uq_type_revisions_type_id_content_sha256')),
    sa.UniqueConstraint('type_id', 'revision', name=op.f('uq_type_revisions_type_id_revision'))
    )
    op.create_table('vehicles',
    sa.Column('id', sa.Integer(), autoincrement=True, nullable=False),
    sa.Column('registration', sa.String(length=40), nullable=False),
    sa.Column('type_id', sa.Integer(), nullable=False),
    sa.Column('serial', sa.String(length=120), nullable=True),
    sa.Column('note', sa.Text(), nullable=True),
    sa.Column('created_at', sa.DateTime(timezone=True), nullable=False),
    sa.ForeignKeyConstraint(['type_id'], ['vehicle_types.id'], name=op.f('fk_vehicles_type_id_vehicle_types')),
    sa.PrimaryKeyConstraint('id', name=op.f('pk_vehicles')),
    sa.UniqueConstraint('registration', name=op.f('uq_vehicles_registration'))
    )


def downgrade() -> None:
    op.drop_table("vehicles")
    op.drop_table("type_revisions")
    op.drop_table("vehicle_types")

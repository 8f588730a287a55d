"""Typed SQLAlchemy 2 ORM models of the ledger database.

Everything is stored in SI (kg, m, kg·m); column names carry the unit. Ledger entries are
append-only: the application never updates or deletes them, and each one carries the SHA-256 of
its own content chained to the previous entry of the same vehicle (see :mod:`ledger.store.chain`).

The tables:

``vehicle_types`` / ``type_revisions``
    A type (by name) and every imported revision of its type file: source text, canonical JSON
    in SI and its content hash. A changed file makes a new revision; old ones stay.
``vehicles``
    A registration and its type.
``ledger_entries``
    Weighings, installations, removals, corrections and CG-height records, each with the
    running empty mass and moments after it.
``configurations``
    Named groups of removable items, kept per type or per vehicle; a redefinition is a new
    version.
``loading_sheets``
    Saved plans with their results, the type revision and ledger entry they used, and the sheet
    they amend, if any.

Every table is append-only: migration 0003 installs triggers that refuse UPDATE and DELETE
(and TRUNCATE on PostgreSQL), and every row carries a seal (``row_hash``, or ``entry_hash``
for ledger entries) that :mod:`ledger.store.evidence` checks.
"""

from __future__ import annotations

import datetime as dt
from typing import Annotated

from sqlalchemy import (
    CheckConstraint,
    Date,
    DateTime,
    Float,
    ForeignKey,
    Index,
    Integer,
    MetaData,
    String,
    Text,
    UniqueConstraint,
)
from sqlalchemy.orm import DeclarativeBase, Mapped, mapped_column

__all__ = [
    "Base",
    "VehicleTypeRow",
    "TypeRevisionRow",
    "VehicleRow",
    "LedgerEntryRow",
    "ConfigurationRow",
    "LoadingSheetRow",
    "ENTRY_KINDS",
]

NAMING_CONVENTION = {
    "ix": "ix_%(column_0_label)s",
    "uq": "uq_%(table_name)s_%(column_0_N_name)s",
    "ck": "ck_%(table_name)s_%(constraint_name)s",
    "fk": "fk_%(table_name)s_%(column_0_name)s_%(referred_table_name)s",
    "pk": "pk_%(table_name)s",
}

#: What a ledger entry may record.
ENTRY_KINDS = ("weighing", "install", "remove", "correction", "cg_height")

IntPK = Annotated[int, mapped_column(Integer, primary_key=True, autoincrement=True)]
Name = Annotated[str, mapped_column(String(120), nullable=False)]
Sha256 = Annotated[str, mapped_column(String(64), nullable=False)]
Kilograms = Annotated[float, mapped_column(Float, nullable=False)]
Timestamp = Annotated[dt.datetime, mapped_column(DateTime(timezone=True), nullable=False)]


class Base(DeclarativeBase):
    metadata = MetaData(naming_convention=NAMING_CONVENTION)


class VehicleTypeRow(Base):
    __tablename__ = "vehicle_types"

    id: Mapped[IntPK]
    name: Mapped[str] = mapped_column(String(120), nullable=False, unique=True)
    created_at: Mapped[Timestamp]


class TypeRevisionRow(Base):
    __tablename__ = "type_revisions"
    __table_args__ = (
        UniqueConstraint("type_id", "revision"),
        UniqueConstraint("type_id", "content_sha256"),
        CheckConstraint("revision >= 1", name="revision_positive"),
    )

    id: Mapped[IntPK]
    type_id: Mapped[int] = mapped_column(ForeignKey("vehicle_types.id"), nullable=False)
    revision: Mapped[int] = mapped_column(Integer, nullable=False)
    content_sha256: Mapped[Sha256]
    source_name: Mapped[str] = mapped_column(String(500), nullable=False)
    source_text: Mapped[str] = mapped_column(Text, nullable=False)
    spec_json: Mapped[str] = mapped_column(Text, nullable=False)
    imported_at: Mapped[Timestamp]
    # The seal (ledger.store.seal): the previous revision's row_hash, and this row's own.
    prev_hash: Mapped[Sha256]
    row_hash: Mapped[Sha256]


class VehicleRow(Base):
    __tablename__ = "vehicles"

    id: Mapped[IntPK]
    registration: Mapped[str] = mapped_column(String(40), nullable=False, unique=True)
    type_id: Mapped[int] = mapped_column(ForeignKey("vehicle_types.id"), nullable=False)
    serial: Mapped[str | None] = mapped_column(String(120))
    note: Mapped[str | None] = mapped_column(Text)
    created_at: Mapped[Timestamp]
    # The seal over the registration, the type's name and the rest (ledger.store.seal).
    row_hash: Mapped[Sha256]


class LedgerEntryRow(Base):
    """One line of a vehicle's running empty-weight record. Never updated, never deleted."""

    __tablename__ = "ledger_entries"
    __table_args__ = (
        UniqueConstraint("vehicle_id", "seq"),
        CheckConstraint("seq >= 1", name="seq_positive"),
        CheckConstraint(
            "kind IN ('weighing', 'install', 'remove', 'correction', 'cg_height')",
            name="kind_known",
        ),
        CheckConstraint("empty_mass_kg >= 0", name="empty_mass_not_negative"),
        CheckConstraint("z_known IN (0, 1)", name="z_known_flag"),
        CheckConstraint("baseline_seq >= 1 AND baseline_seq <= seq", name="baseline_not_after"),
        CheckConstraint("reverses_seq IS NULL OR (reverses_seq >= 1 AND reverses_seq < seq)",
                        name="reverses_earlier"),
        Index("ix_ledger_entries_vehicle_kind_seq", "vehicle_id", "kind", "seq"),
        # The state of one item (installed or not) is its newest entry: found through this.
        Index("ix_ledger_entries_vehicle_item_seq", "vehicle_id", "item", "seq"),
    )

    id: Mapped[IntPK]
    vehicle_id: Mapped[int] = mapped_column(ForeignKey("vehicles.id"), nullable=False)
    seq: Mapped[int] = mapped_column(Integer, nullable=False)
    kind: Mapped[str] = mapped_column(String(20), nullable=False)
    entry_date: Mapped[dt.date] = mapped_column(Date, nullable=False)
    recorded_at: Mapped[Timestamp]
    actor: Mapped[str] = mapped_column(String(200), nullable=False)
    reason: Mapped[str | None] = mapped_column(Text)
    reference: Mapped[str | None] = mapped_column(String(200))
    item: Mapped[str | None] = mapped_column(String(200))
    # The item's own mass and arms (installations, removals, corrections).
    item_mass_kg: Mapped[float | None] = mapped_column(Float)
    item_x_m: Mapped[float | None] = mapped_column(Float)
    item_y_m: Mapped[float | None] = mapped_column(Float)
    item_z_m: Mapped[float | None] = mapped_column(Float)
    # Change to the empty vehicle this entry makes, and the running state after it.
    delta_mass_kg: Mapped[Kilograms]
    delta_mx_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    delta_my_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    delta_mz_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    empty_mass_kg: Mapped[Kilograms]
    empty_mx_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    empty_my_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    empty_mz_kgm: Mapped[float] = mapped_column(Float, nullable=False)
    # Whether the vertical moment is known (a weighing alone gives no vertical CG).
    z_known: Mapped[int] = mapped_column(Integer, nullable=False, default=0)
    baseline_seq: Mapped[int] = mapped_column(Integer, nullable=False)
    reverses_seq: Mapped[int | None] = mapped_column(Integer)
    # Weighing readings, item shape for inertia, CG-height fit, … as canonical JSON.
    detail_json: Mapped[str] = mapped_column(Text, nullable=False, default="{}")
    prev_hash: Mapped[Sha256]
    entry_hash: Mapped[Sha256]


class ConfigurationRow(Base):
    """A named group of removable items applied on top of the empty vehicle."""

    __tablename__ = "configurations"
    __table_args__ = (
        # One owner per row, so each pair is unique among the rows of that owner (the NULL of
        # the other owner never collides: SQL treats NULLs in a UNIQUE constraint as distinct).
        UniqueConstraint("type_id", "name", "version"),
        UniqueConstraint("vehicle_id", "name", "version"),
        CheckConstraint(
            "(type_id IS NULL) <> (vehicle_id IS NULL)", name="one_owner"
        ),
        CheckConstraint("version >= 1", name="version_positive"),
    )

    id: Mapped[IntPK]
    type_id: Mapped[int | None] = mapped_column(ForeignKey("vehicle_types.id"))
    vehicle_id: Mapped[int | None] = mapped_column(ForeignKey("vehicles.id"))
    name: Mapped[Name]
    description: Mapped[str | None] = mapped_column(Text)
    items_json: Mapped[str] = mapped_column(Text, nullable=False)
    created_at: Mapped[Timestamp]
    created_by: Mapped[str] = mapped_column(String(200), nullable=False)
    # A redefinition is a new row with the next version; the newest version is in force.
    version: Mapped[int] = mapped_column(Integer, nullable=False)
    prev_hash: Mapped[Sha256]
    row_hash: Mapped[Sha256]


class LoadingSheetRow(Base):
    """A saved loading sheet. Immutable: an amendment is a new row that points at this one."""

    __tablename__ = "loading_sheets"
    __table_args__ = (
        CheckConstraint("verdict IN ('in_limits', 'out_of_limits')", name="verdict_known"),
        # One chain per vehicle: two sheets can never follow the same one.
        UniqueConstraint("vehicle_id", "prev_hash"),
    )

    id: Mapped[IntPK]
    vehicle_id: Mapped[int] = mapped_column(ForeignKey("vehicles.id"), nullable=False)
    type_revision_id: Mapped[int] = mapped_column(ForeignKey("type_revisions.id"), nullable=False)
    entry_id: Mapped[int] = mapped_column(ForeignKey("ledger_entries.id"), nullable=False)
    amends_id: Mapped[int | None] = mapped_column(ForeignKey("loading_sheets.id"))
    created_at: Mapped[Timestamp]
    preparer: Mapped[str] = mapped_column(String(200), nullable=False)
    verdict: Mapped[str] = mapped_column(String(20), nullable=False)
    plan_json: Mapped[str] = mapped_column(Text, nullable=False)
    result_json: Mapped[str] = mapped_column(Text, nullable=False)
    content_sha256: Mapped[Sha256]
    # The ledger head the sheet was built on (the entry_hash of entry_id), the previous sheet
    # of the same vehicle's row_hash, and this sheet's seal over all of it (ledger.store.seal).
    entry_hash: Mapped[Sha256]
    prev_hash: Mapped[Sha256]
    row_hash: Mapped[Sha256]

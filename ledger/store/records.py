"""What the ledger gives back: an entry as stored, the empty state after it, an installed item.

Masses kg, arms m, moments kg·m; JSON-able through ``to_dict`` with unit-named keys.
"""

from __future__ import annotations

import datetime as dt
import json
from dataclasses import dataclass, field

from ledger.errors import ChainError

__all__ = ["Entry", "EmptyState", "InstalledItem", "ENTRY_COLUMNS", "entry_from_row", "utc"]

#: Columns read back for an :class:`Entry`, in order.
ENTRY_COLUMNS = (
    "id", "seq", "kind", "entry_date", "recorded_at", "actor", "reason", "reference", "item",
    "item_mass_kg", "item_x_m", "item_y_m", "item_z_m",
    "delta_mass_kg", "delta_mx_kgm", "delta_my_kgm", "delta_mz_kgm",
    "empty_mass_kg", "empty_mx_kgm", "empty_my_kgm", "empty_mz_kgm",
    "z_known", "baseline_seq", "reverses_seq", "detail_json", "prev_hash", "entry_hash",
)


def utc(value: dt.datetime) -> dt.datetime:
    """``value`` in UTC; a naive one is taken as UTC (SQLite gives back naive datetimes; they
    were stored as UTC)."""
    if value.tzinfo is None:
        return value.replace(tzinfo=dt.UTC)
    return value.astimezone(dt.UTC)


@dataclass(frozen=True)
class Entry:
    """One ledger entry as stored. Masses kg, arms m, moments kg·m.

    ``delta_*`` is the change this entry made to the empty vehicle, ``empty_*`` the running
    empty state after it. ``empty_mz_kgm`` means something only when ``z_known``.
    """

    registration: str
    id: int
    seq: int
    kind: str
    entry_date: dt.date
    recorded_at: dt.datetime
    actor: str
    reason: str | None
    reference: str | None
    item: str | None
    item_mass_kg: float | None
    item_x_m: float | None
    item_y_m: float | None
    item_z_m: float | None
    delta_mass_kg: float
    delta_mx_kgm: float
    delta_my_kgm: float
    delta_mz_kgm: float
    empty_mass_kg: float
    empty_mx_kgm: float
    empty_my_kgm: float
    empty_mz_kgm: float
    z_known: bool
    baseline_seq: int
    reverses_seq: int | None
    detail_json: str = field(repr=False)
    prev_hash: str = field(repr=False)
    entry_hash: str = field(repr=False)

    @property
    def detail(self) -> dict:
        try:
            return json.loads(self.detail_json)
        except (TypeError, ValueError):
            raise ChainError(f"entry {self.seq} of {self.registration}: its stored detail is "
                             "not valid JSON; it was changed outside wbledger. See "
                             f"`wbledger verify {self.registration}`") from None

    @property
    def cg_x_m(self) -> float:
        return self.empty_mx_kgm / self.empty_mass_kg

    @property
    def cg_y_m(self) -> float:
        return self.empty_my_kgm / self.empty_mass_kg

    @property
    def cg_z_m(self) -> float | None:
        return self.empty_mz_kgm / self.empty_mass_kg if self.z_known else None

    def state(self) -> EmptyState:
        """The running empty state after this entry."""
        return EmptyState(self.registration, self.id, self.seq, self.entry_date,
                          self.empty_mass_kg, self.empty_mx_kgm, self.empty_my_kgm,
                          self.empty_mz_kgm, self.z_known, self.baseline_seq,
                          self.entry_hash)

    def to_dict(self) -> dict:
        """JSON-able, SI values with unit-named keys."""
        return {
            "registration": self.registration, "seq": self.seq, "kind": self.kind,
            "entry_date": self.entry_date.isoformat(),
            "recorded_at": utc(self.recorded_at).isoformat(),
            "actor": self.actor, "reason": self.reason, "reference": self.reference,
            "item": self.item, "item_mass_kg": self.item_mass_kg, "item_x_m": self.item_x_m,
            "item_y_m": self.item_y_m, "item_z_m": self.item_z_m,
            "delta_mass_kg": self.delta_mass_kg, "delta_mx_kgm": self.delta_mx_kgm,
            "delta_my_kgm": self.delta_my_kgm,
            "delta_mz_kgm": self.delta_mz_kgm if self.z_known else None,
            "empty_mass_kg": self.empty_mass_kg, "empty_mx_kgm": self.empty_mx_kgm,
            "empty_my_kgm": self.empty_my_kgm,
            "empty_mz_kgm": self.empty_mz_kgm if self.z_known else None,
            "cg_x_m": self.cg_x_m, "cg_y_m": self.cg_y_m, "cg_z_m": self.cg_z_m,
            "z_known": self.z_known, "baseline_seq": self.baseline_seq,
            "reverses_seq": self.reverses_seq, "detail": self.detail,
            "entry_hash": self.entry_hash,
        }


@dataclass(frozen=True)
class EmptyState:
    """The empty vehicle after one ledger entry: what a loading sheet starts from.

    ``entry_id`` is the database id of that entry (a saved sheet keeps it), ``seq`` its number
    in the vehicle's ledger. ``mz_kgm`` means something only when ``z_known``.
    """

    registration: str
    entry_id: int
    seq: int
    entry_date: dt.date
    mass_kg: float
    mx_kgm: float
    my_kgm: float
    mz_kgm: float
    z_known: bool
    baseline_seq: int
    #: The entry's hash: the ledger head a sheet built on this state records and prints.
    entry_hash: str | None = None

    @property
    def moments_kgm(self) -> tuple[float, float, float | None]:
        """(Σm·x, Σm·y, Σm·z or None when the vertical CG is not known)."""
        return (self.mx_kgm, self.my_kgm, self.mz_kgm if self.z_known else None)

    @property
    def cg_m(self) -> tuple[float, float, float | None]:
        m = self.mass_kg
        return (self.mx_kgm / m, self.my_kgm / m, self.mz_kgm / m if self.z_known else None)


@dataclass(frozen=True)
class InstalledItem:
    """An item on the vehicle by the ledger: installed at ``seq`` and not removed since."""

    name: str
    seq: int
    entry_date: dt.date
    mass_kg: float
    x_m: float
    y_m: float
    z_m: float | None
    shape: dict | None = None

    def to_dict(self) -> dict:
        return {"name": self.name, "seq": self.seq, "entry_date": self.entry_date.isoformat(),
                "mass_kg": self.mass_kg, "x_m": self.x_m, "y_m": self.y_m, "z_m": self.z_m,
                "shape": self.shape}


def entry_from_row(registration: str, row) -> Entry:
    """An :class:`Entry` from a row of :data:`ENTRY_COLUMNS`."""
    values = dict(zip(ENTRY_COLUMNS, row))
    values["z_known"] = bool(values["z_known"])
    values["recorded_at"] = utc(values["recorded_at"])
    return Entry(registration=registration, **values)

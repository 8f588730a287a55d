"""Vehicle types: import type files as revisions (or preview an import), list the types, show
one revision.

Every vehicle of a type is computed with the type's newest revision, so an import that makes a
new revision moves all of them onto it. :func:`preview_types` (``type import --dry-run``) says
what would change, field by field, and which vehicles would move, and writes nothing;
:func:`import_types` reports the same for what it did.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import Any

from sqlalchemy.engine import Engine

from ledger.services.database import unit_of_work
from ledger.store import catalog, type_users
from ledger.typedata import VehicleType, read_type_file
from ledger.typedata.type_diff import FieldChange, type_changes

__all__ = ["TypeFile", "ImportedType", "TypeRevision", "read_type_files", "import_types",
           "preview_types", "list_types", "show_type"]


@dataclass(frozen=True)
class TypeFile:
    """A type file read and parsed: the path as given, the type, and the exact text parsed."""

    file: str
    vehicle_type: VehicleType
    text: str


@dataclass(frozen=True)
class ImportedType:
    """One type file imported, or previewed (``dry_run``): the revision it is or would be
    (``new_revision``: made by this import), the type's newest revision before
    (``previous_revision``, None for a new type), what changed from it (``changes``, in SI with
    the new revision's display units in ``units``) and the vehicles that move onto the new
    revision (``vehicles_moved``; none when no revision is made)."""

    file: str
    name: str
    revision: int
    new_revision: bool
    content_sha256: str
    previous_revision: int | None = None
    changes: tuple[FieldChange, ...] = ()
    vehicles_moved: tuple[str, ...] = ()
    units: dict[str, Any] | None = None
    dry_run: bool = False

    def to_dict(self) -> dict[str, Any]:
        return {"file": self.file, "type": self.name, "revision": self.revision,
                "new_revision": self.new_revision, "content_sha256": self.content_sha256,
                "dry_run": self.dry_run, "previous_revision": self.previous_revision,
                "changes": [c.to_dict() for c in self.changes],
                "vehicles_moved": list(self.vehicles_moved), "units": self.units}


@dataclass(frozen=True)
class TypeRevision:
    """One stored revision of a type, its chain of revisions verified."""

    vehicle_type: VehicleType
    revision: int
    imported_at: str
    content_sha256: str

    @property
    def name(self) -> str:
        return self.vehicle_type.name

    def to_dict(self) -> dict[str, Any]:
        """The JSON document of ``type show``: the type's canonical dict (SI) and its revision."""
        return {"name": self.name, "revision": self.revision, "imported_at": self.imported_at,
                "content_sha256": self.content_sha256, "spec": self.vehicle_type.to_dict()}


def read_type_files(files: Sequence[str | os.PathLike[str]], *,
                    max_size: int | None = None) -> list[TypeFile]:
    """Read and parse type files (each at most ``max_size`` bytes), all before any is stored."""
    return [TypeFile(str(f), *read_type_file(f, max_size=max_size)) for f in files]


def _preview(session, f: TypeFile) -> ImportedType:
    """What importing ``f`` would do, read in ``session`` (nothing written)."""
    vt = f.vehicle_type
    digest = vt.content_hash()
    units = {"mass": vt.units.mass, "length": vt.units.length, "volume": vt.units.volume,
             "moment": vt.units.moment_unit, "moment_divisor": vt.units.moment_divisor}
    newest = type_users.newest_revision(session, vt.name)
    if newest is None:
        return ImportedType(f.file, vt.name, 1, True, digest, units=units, dry_run=True)
    same = type_users.revision_with_content(session, vt.name, digest)
    if same is not None:
        return ImportedType(f.file, vt.name, same, False, digest,
                            previous_revision=newest.revision, units=units, dry_run=True)
    current = catalog.load_type(session, newest)  # verifies the type's chain of revisions
    return ImportedType(f.file, vt.name, newest.revision + 1, True, digest,
                        previous_revision=newest.revision,
                        changes=tuple(type_changes(current.to_dict(), vt.to_dict())),
                        vehicles_moved=tuple(type_users.type_vehicles(session, vt.name)),
                        units=units, dry_run=True)


def preview_types(engine: Engine, files: Sequence[TypeFile]) -> list[ImportedType]:
    """What :func:`import_types` would do with ``files``, writing nothing: per file the
    revision it would be, the differences from the type's newest revision, and the vehicles
    that would move onto it. Each file is compared with what is stored now."""
    with unit_of_work(engine) as session:
        return [_preview(session, f) for f in files]


def import_types(engine: Engine, files: Sequence[TypeFile]) -> list[ImportedType]:
    """Import type files read by :func:`read_type_files`, in one transaction; a changed file
    becomes a new revision of its type, an unchanged one is reported as the revision it is.
    Each result says what changed and which vehicles moved onto the new revision."""
    done = []
    with unit_of_work(engine) as session:
        for f in files:
            seen = _preview(session, f)
            made = catalog.import_type(session, f.vehicle_type, f.file, f.text)
            done.append(replace(seen, revision=made.revision, new_revision=made.created,
                                dry_run=False))
    return done


def list_types(engine: Engine) -> list[dict[str, Any]]:
    """Every type with its newest revision and the number of vehicles of that type."""
    with unit_of_work(engine) as session:
        return catalog.list_types(session)


def show_type(engine: Engine, name: str, revision: int | None = None) -> TypeRevision:
    """Revision ``revision`` (default: the newest) of type ``name``."""
    with unit_of_work(engine) as session:
        row = catalog.type_revision(session, name, revision)
        return TypeRevision(catalog.load_type(session, row), revision=row.revision,
                            imported_at=row.imported_at.isoformat(),
                            content_sha256=row.content_sha256)

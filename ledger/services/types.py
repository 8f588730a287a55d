"""Vehicle types: import type files as revisions, list the types, show one revision."""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from sqlalchemy.engine import Engine

from ledger.services.database import unit_of_work
from ledger.store import catalog
from ledger.typedata import VehicleType, read_type_file

__all__ = ["TypeFile", "ImportedType", "TypeRevision", "read_type_files", "import_types",
           "list_types", "show_type"]


@dataclass(frozen=True)
class TypeFile:
    """A type file read and parsed: the path as given, the type, and the exact text parsed."""

    file: str
    vehicle_type: VehicleType
    text: str


@dataclass(frozen=True)
class ImportedType:
    """One type file imported: the revision it is (``new_revision``: made by this import)."""

    file: str
    name: str
    revision: int
    new_revision: bool
    content_sha256: str

    def to_dict(self) -> dict[str, Any]:
        return {"file": self.file, "type": self.name, "revision": self.revision,
                "new_revision": self.new_revision, "content_sha256": self.content_sha256}


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


def import_types(engine: Engine, files: Sequence[TypeFile]) -> list[ImportedType]:
    """Import type files read by :func:`read_type_files`, in one transaction; a changed file
    becomes a new revision of its type, an unchanged one is reported as the revision it is."""
    with unit_of_work(engine) as session:
        done = [(f.file, catalog.import_type(session, f.vehicle_type, f.file, f.text))
                for f in files]
    return [ImportedType(f, r.name, r.revision, r.created, r.content_sha256) for f, r in done]


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

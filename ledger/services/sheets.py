"""Loading sheets: prepare one from a plan (and save it), amend a saved one, show and list them.

The use cases behind ``wbledger sheet …``. A plan comes from the user in two steps: first
:func:`read_plan` reads the plan file or builds a quick plan from the command-line options (no
database yet, so a bad plan is reported before anything else), then :func:`prepare` checks it
against the vehicle's type and builds the sheet in one unit of work, saving it on request.

Every figure starts from data that verifies: the vehicle's empty weight is read with
:func:`ledger.store.entries.current_empty`, which refuses a chain changed behind wbledger's back,
and a saved sheet is amended only when it verifies itself.

Two levels, the same work:

- :func:`prepare`, :func:`amend`, :func:`show` and :func:`list_saved` take the engine and open
  their own unit of work: what the command line calls.
- :func:`prepare_sheet`, :func:`save_prepared` and :func:`amend_sheet` take an open session, for
  callers that already hold a unit of work (other services, tests, benchmarks).
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, NamedTuple

from sqlalchemy.engine import Engine
from sqlalchemy.orm import Session

from ledger.errors import ChainError, ConflictError
from ledger.loadsheet import build_sheet
from ledger.loadsheet.text import mass_text
from ledger.services.database import unit_of_work
from ledger.store.catalog import get_vehicle
from ledger.store.configs import ConfigurationView, configuration_items
from ledger.store.entry_reads import current_empty
from ledger.store.records import EmptyState
from ledger.store.roles import recorder
from ledger.store.typeinfo import vehicle_type_info
from ledger.typedata import VehicleType
from ledger.typedata.plan import (
    Plan,
    QuickOptions,
    merge_options,
    parse_plan,
    plan_from_options,
    plan_vehicle,
    read_plan_file,
)

if TYPE_CHECKING:
    # Saved sheets and amendments are imported where they are used: a check (the command run
    # before every trip, ledger.services.check) prepares a sheet and needs neither.
    from ledger.loadsheet import AmendmentCheck
    from ledger.store.models import VehicleRow
    from ledger.store.sheets import SavedSheet

__all__ = [
    "QuickOptions",
    "Document",
    "PlanInput",
    "read_plan",
    "read_amendment_plan",
    "PreparedSheet",
    "SheetResult",
    "AmendedSheet",
    "ShownSheet",
    "prepare",
    "amend",
    "show",
    "list_saved",
    "summaries",
    "prepare_sheet",
    "save_prepared",
    "amend_sheet",
]


# --- the plan as the user gave it -----------------------------------------------------------------

@dataclass(frozen=True)
class PlanInput:
    """A raw plan (``docs/plan-format.md``, not yet checked against a type) and where it came
    from: the plan file's name, ``"command line"`` or ``"amendment"``."""

    raw: dict = field(repr=False)
    source: str

    def preparer(self, by: str | None, user: str) -> str:
        """Who prepares the sheet: ``--by``, else the plan's ``prepared_by``, else ``user``
        (whoever runs the command)."""
        named = self.raw.get("prepared_by")
        return by or (named if isinstance(named, str) else None) or user


def _is_file(target: str) -> bool:
    # A registration never holds a path separator, so such an argument is a (mistyped) path.
    return (target.lower().endswith(".toml") or Path(target).exists()
            or "/" in target or "\\" in target)


def read_plan(target: str, options: QuickOptions | None = None, *,
              max_size: int | None = None) -> PlanInput:
    """The plan ``target`` names: a plan file (a path that exists, ends in ``.toml`` or holds a
    path separator) with ``options`` applied over it, or a registration whose quick plan the
    ``options`` give.

    Raises
    ------
    PlanError
        The file cannot be read or is not a plan; an option is malformed.
    """
    options = options or QuickOptions()
    if _is_file(target):
        raw = read_plan_file(target, max_size=max_size)
        if not options.empty:
            raw = merge_options(raw, options)
        return PlanInput(raw, target)
    return PlanInput(plan_from_options(target, options), "command line")


def read_amendment_plan(path: str, *, max_size: int | None = None) -> PlanInput:
    """A whole new plan for an amendment (``wbledger sheet amend ID --plan FILE``)."""
    return PlanInput(read_plan_file(path, max_size=max_size), str(path))


#: A loading-sheet document (``docs/sheet-document.md``), as the builder or the store gives it.
Document = Mapping[str, Any]


# --- results --------------------------------------------------------------------------------------

@dataclass(frozen=True)
class PreparedSheet:
    """A computed sheet and everything needed to save it."""

    document: Document = field(repr=False)
    plan: Plan = field(repr=False)
    raw_plan: dict = field(repr=False)
    registration: str = ""
    vehicle_id: int = 0
    type_revision_id: int = 0
    entry_id: int = 0
    preparer: str = ""
    prepared_at: dt.datetime | None = None

    @property
    def verdict(self) -> str:
        return self.document["verdict"]

    def plan_record(self) -> dict:
        """What a saved sheet keeps of the plan: the plan as given and as resolved in SI."""
        return {"raw": _jsonable(self.raw_plan), "plan": self.plan.to_dict()}


@dataclass(frozen=True)
class SheetResult:
    """What :func:`prepare` made: the sheet document (``docs/sheet-document.md``) and, when it
    was saved, the saved sheet (whose document is the one given here)."""

    document: Document = field(repr=False)
    saved: SavedSheet | None = None

    @property
    def in_limits(self) -> bool:
        return self.document.get("verdict") == "in_limits"


@dataclass(frozen=True)
class AmendedSheet:
    """The saved amendment, and how the change measured against the type's tolerance."""

    saved: SavedSheet
    check: AmendmentCheck

    @property
    def document(self) -> Document:
        return self.saved.document

    @property
    def in_limits(self) -> bool:
        return self.document.get("verdict") == "in_limits"


@dataclass(frozen=True)
class ShownSheet:
    """A saved sheet as it was saved; ``verified`` is also in ``document["sheet"]``."""

    saved: SavedSheet
    verified: bool
    ledger_problem: str | None = None   # the vehicle's evidence does not verify: why

    @property
    def document(self) -> Document:
        return self.saved.document


def _jsonable(value: Any) -> Any:
    """The raw plan as JSON can hold it (TOML dates become ISO text)."""
    if isinstance(value, dict):
        return {str(k): _jsonable(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_jsonable(v) for v in value]
    if isinstance(value, (dt.date, dt.time, dt.datetime)):
        return value.isoformat()
    return value


# --- the use cases, each in its own unit of work --------------------------------------------------

def prepare(engine: Engine, plan: PlanInput, *, user: str, by: str | None = None,
            save: bool = False) -> SheetResult:
    """Check ``plan`` against its vehicle's type and build its sheet; with ``save``, save it
    (immutable from then on). Nothing is written unless the sheet is saved.

    ``by`` is who prepares it (``--by``); without it the plan's ``prepared_by``, else ``user``.
    """
    with unit_of_work(engine) as session:
        prepared = prepare_sheet(session, plan.raw, source=plan.source,
                                 preparer=plan.preparer(by, user))
        saved = save_prepared(session, prepared) if save else None
    return SheetResult(prepared.document if saved is None else saved.document, saved)


def amend(engine: Engine, sheet_id: int, *, user: str, options: QuickOptions | None = None,
          plan: PlanInput | None = None, by: str | None = None) -> AmendedSheet:
    """Amend saved sheet ``sheet_id`` for a last-minute change and save the amendment.

    The change is the quick ``options`` applied over the saved plan, or a whole new ``plan``
    (:func:`read_amendment_plan`); see :func:`amend_sheet`.
    """
    given = plan or PlanInput({}, "amendment")
    raw = None if plan is None else plan.raw
    with unit_of_work(engine) as session:
        saved, check = amend_sheet(session, sheet_id, options=None if raw else options, raw=raw,
                                   source=given.source if raw else "amendment",
                                   preparer=given.preparer(by, user))
    return AmendedSheet(saved, check)


def show(engine: Engine, sheet_id: int) -> ShownSheet:
    """Saved sheet ``sheet_id`` as it was saved, with whether it verifies (its content hash,
    its seal and its vehicle's chain of sheets up to it).

    ``ledger_problem`` says why the vehicle's evidence (its ledger, the entry the sheet was
    built on) does not verify, if it does not: the caller shows no verdict then.
    """
    from ledger.store.catalog import get_vehicle
    from ledger.store.evidence import require_vehicle
    from ledger.store.sheets import get_sheet, verify_sheet

    with unit_of_work(engine) as session:
        saved = get_sheet(session, sheet_id)
        ok = verify_sheet(session, sheet_id)
        try:
            require_vehicle(session, get_vehicle(session, saved.registration))
            ledger_problem = None
        except ChainError as exc:
            ledger_problem = str(exc)
    saved.document["sheet"]["verified"] = ok
    return ShownSheet(saved, ok, ledger_problem)


def list_saved(engine: Engine, registration: str | None = None, *,
               limit: int = 50) -> list[SavedSheet]:
    """Saved sheets, newest first; of one vehicle if ``registration`` is given."""
    from ledger.store.sheets import list_sheets

    with unit_of_work(engine) as session:
        return list_sheets(session, registration, limit=limit)


def summaries(engine: Engine, registration: str | None = None, *,
              limit: int = 50) -> list[dict[str, Any]]:
    """What ``sheet list`` shows: :meth:`SavedSheet.summary` of each saved sheet, newest first,
    with ``verified`` (its content hash, seal and chain of sheets), so that a sheet changed
    behind wbledger's back is never listed with its stored verdict as if it held."""
    from ledger.store.sheets import list_sheets, verify_sheet

    with unit_of_work(engine) as session:
        return [{**s.summary(), "verified": verify_sheet(session, s.id)}
                for s in list_sheets(session, registration, limit=limit)]


# --- the same work inside a caller's unit of work -------------------------------------------------

class _Context(NamedTuple):
    """What a sheet for one vehicle is built from."""

    vehicle: VehicleRow
    revision_id: int
    revision: int
    vtype: VehicleType
    empty: EmptyState
    configuration: ConfigurationView | None


def _context(session: Session, raw: dict, source: str,
             sheet: SavedSheet | None = None) -> _Context:
    """The vehicle the plan names, its type (the newest revision, or the one ``sheet`` used),
    its current empty weight (its evidence verified first) and the configuration the plan
    names."""
    vehicle = get_vehicle(session, plan_vehicle(raw, source))
    if sheet is None:
        info = vehicle_type_info(session, vehicle)
        rev_id, revision, vtype = info.revision_id, info.revision, info.vtype
    else:
        from ledger.store.sheets import sheet_type

        rev_id, revision = sheet.type_revision_id, sheet.type_revision
        vtype = sheet_type(session, sheet)
    empty = current_empty(session, vehicle.registration)
    cfg = None
    name = raw.get("configuration")
    if isinstance(name, str) and name.strip():
        cfg = configuration_items(session, vehicle.registration, name.strip())
    return _Context(vehicle, rev_id, revision, vtype, empty, cfg)


def _build(ctx: _Context, plan: Plan, *, preparer: str, prepared_at: dt.datetime,
           with_fixes: bool = True) -> Document:
    cfg = ctx.configuration
    return build_sheet(ctx.vtype, ctx.empty, plan,
                       configuration_items=None if cfg is None else cfg.items,
                       prepared_by=preparer, prepared_at=prepared_at,
                       type_revision=ctx.revision, registration=ctx.vehicle.registration,
                       with_fixes=with_fixes)


def _parse(ctx: _Context, raw: dict, source: str) -> Plan:
    cfg = ctx.configuration
    return parse_plan(raw, ctx.vtype, source=source,
                      disabled_stations=None if cfg is None else cfg.disables_stations)


def prepare_sheet(session: Session, raw: dict, *, source: str, preparer: str,
                  prepared_at: dt.datetime | None = None,
                  with_fixes: bool = True) -> PreparedSheet:
    """Check a raw plan against the vehicle's type and build its sheet (nothing is written).

    The vehicle is the one the plan names; its type is the newest revision, its empty weight
    the current ledger state (:func:`ledger.store.entries.current_empty`), its configuration
    the one the plan names (:func:`ledger.store.configs.configuration_items`).

    Raises
    ------
    PlanError
        A bad plan (exit code 2).
    NotFoundError, ConflictError
        Unknown vehicle or configuration; a vehicle with no empty weight recorded yet.
    ChainError
        The vehicle's evidence does not verify.
    """
    prepared_at = prepared_at or dt.datetime.now(dt.UTC)
    preparer = recorder(session.connection(), preparer)
    ctx = _context(session, raw, source)
    plan = _parse(ctx, raw, source)
    doc = _build(ctx, plan, preparer=preparer, prepared_at=prepared_at, with_fixes=with_fixes)
    return PreparedSheet(doc, plan, dict(raw), ctx.vehicle.registration, ctx.vehicle.id,
                         ctx.revision_id, ctx.empty.entry_id, preparer, prepared_at)


def save_prepared(session: Session, prepared: PreparedSheet, *,
                  amends_id: int | None = None) -> SavedSheet:
    """Save a prepared sheet (immutable from then on)."""
    from ledger.store.sheets import save_sheet

    return save_sheet(session, vehicle_id=prepared.vehicle_id,
                      type_revision_id=prepared.type_revision_id, entry_id=prepared.entry_id,
                      plan=prepared.plan_record(), document=prepared.document,
                      preparer=prepared.preparer, created_at=prepared.prepared_at,
                      amends_id=amends_id)


def _root(session: Session, sheet: SavedSheet) -> SavedSheet:
    """The first sheet of the amendment chain ``sheet`` belongs to."""
    from ledger.store.sheets import get_sheet

    seen = {sheet.id}
    while sheet.amends_id is not None:
        sheet = get_sheet(session, sheet.amends_id)
        if sheet.id in seen:  # pragma: no cover - ids only ever point back
            break
        seen.add(sheet.id)
    return sheet


def _persons(count: int) -> str:
    return f"{count} {'person' if count == 1 else 'persons'}"


def _beyond_tolerance(root: SavedSheet, vtype: VehicleType, check: AmendmentCheck) -> ConflictError:
    du = vtype.units
    if check.structural:
        why = "it changes " + "; ".join(check.structural)
    else:
        why = (f"it changes {mass_text(check.mass_change_kg, du)} and "
               f"{_persons(check.person_change)}")
    return ConflictError(
        f"the change to sheet {root.id} is beyond the last-minute tolerance of type "
        f"{vtype.name} ({mass_text(check.tolerance_mass_kg, du)} and "
        f"{_persons(check.tolerance_persons)}): {why}; prepare a new sheet with "
        f"`wbledger sheet PLAN --save`")


def _amendable(session: Session, sheet_id: int) -> SavedSheet:
    """Saved sheet ``sheet_id`` when it verifies and is the newest of its amendment chain."""
    from ledger.store.evidence import sheet_problem
    from ledger.store.sheets import amendments_of, get_sheet

    original = get_sheet(session, sheet_id)
    problem = sheet_problem(session, original.id)
    if problem:
        raise ChainError(f"sheet {original.id} does not verify, so it is not amended: "
                         f"{problem}. See `wbledger verify {original.registration}`")
    later = amendments_of(session, original.id)
    if later:
        raise ConflictError(f"loading sheet {original.id} was already amended by sheet "
                            f"{later[-1]}; amend the newest one "
                            f"(`wbledger sheet amend {later[-1]} …`)")
    return original


def amend_sheet(session: Session, sheet_id: int, *, options: QuickOptions | None = None,
                raw: dict | None = None, source: str = "command line", preparer: str,
                prepared_at: dt.datetime | None = None) -> tuple[SavedSheet, AmendmentCheck]:
    """Make and save an amended sheet for a last-minute change to saved sheet ``sheet_id``.

    Give the change as quick ``options`` (:class:`ledger.typedata.plan.QuickOptions`, applied
    over the saved plan) or as a whole new ``raw`` plan. The change is measured against the
    first sheet of the amendment chain (:func:`ledger.loadsheet.amend.compare_plans`).

    Returns
    -------
    (SavedSheet, AmendmentCheck)

    Raises
    ------
    ChainError
        The sheet does not verify.
    ConflictError
        The sheet was already amended (amend the newest one); the empty weight or type data
        changed since; nothing changed; or the change is beyond the type's last-minute
        tolerance: a new sheet is needed.
    """
    from ledger.loadsheet import compare_plans
    from ledger.loadsheet.amend import amendment_doc

    preparer = recorder(session.connection(), preparer)
    original = _amendable(session, sheet_id)
    base_raw = original.plan.get("raw") or {}
    if raw is None:
        if options is None or options.empty:
            raise ConflictError("an amendment needs a change: give --person, --vacate, "
                                "--cargo, --fuel, --taxi or --trip, or a new plan file")
        raw = merge_options(base_raw, options)
        source = "amendment"
    if raw.get("vehicle") != base_raw.get("vehicle"):
        raise ConflictError(f"sheet {original.id} is for {original.registration}; an amendment "
                            "cannot change the vehicle: prepare a new sheet")
    ctx = _context(session, raw, source, original)
    newest = vehicle_type_info(session, ctx.vehicle)
    if newest.revision_id != original.type_revision_id or ctx.empty.entry_id != original.entry_id:
        raise ConflictError(
            f"the type data or the empty weight of {original.registration} changed since sheet "
            f"{original.id} (then: type revision {original.type_revision}, ledger entry "
            f"#{original.entry_seq}; now: revision {newest.revision}, entry #{ctx.empty.seq}); "
            f"a last-minute change cannot carry that: prepare a new sheet with "
            f"`wbledger sheet PLAN --save`")
    plan = _parse(ctx, raw, source)
    root = _root(session, original)
    check = compare_plans(Plan.from_dict(root.plan["plan"]), plan, ctx.vtype.tolerances)
    if not check.changes and not check.structural:
        raise ConflictError(f"the amendment changes nothing on sheet {original.id}")
    if not check.within:
        raise _beyond_tolerance(root, ctx.vtype, check)
    prepared_at = prepared_at or dt.datetime.now(dt.UTC)
    built = _build(ctx, plan, preparer=preparer, prepared_at=prepared_at)
    doc = {**built, "amendment": amendment_doc(
        check, of=original.id, first_sheet=root.id,
        before_plan=Plan.from_dict(original.plan["plan"]), after_plan=plan,
        before=original.document, after=built)}
    prepared = PreparedSheet(doc, plan, dict(raw), ctx.vehicle.registration, ctx.vehicle.id,
                             ctx.revision_id, ctx.empty.entry_id, preparer, prepared_at)
    return save_prepared(session, prepared, amends_id=original.id), check

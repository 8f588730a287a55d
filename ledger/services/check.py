"""A pre-trip check: is a plan in limits? (``wbledger check PLAN``)

The same work as preparing a loading sheet (:func:`ledger.services.sheets.prepare`: the
vehicle's evidence verified, the plan checked against its type, every phase, the fuel-burn path
and the fixes), nothing saved; the command line prints the verdict lines or the document as
JSON. The check is run before every trip, so this module stays light: it pulls in nothing that
renders a sheet.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from sqlalchemy.engine import Engine

from ledger.services.sheets import Document, PlanInput, prepare

__all__ = ["CheckResult", "check"]


@dataclass(frozen=True)
class CheckResult:
    """The sheet document of the checked plan (``docs/sheet-document.md``), not saved."""

    document: Document = field(repr=False)

    @property
    def in_limits(self) -> bool:
        return self.document.get("verdict") == "in_limits"


def check(engine: Engine, plan: PlanInput, *, user: str, by: str | None = None) -> CheckResult:
    """Check ``plan`` (:func:`ledger.services.sheets.read_plan`) against its vehicle's type.

    ``by`` is who checks it (``--by``); without it the plan's ``prepared_by``, else ``user``.
    """
    return CheckResult(prepare(engine, plan, user=user, by=by).document)

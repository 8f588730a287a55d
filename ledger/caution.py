"""The caution every loading sheet, check and inertia report carries."""

from __future__ import annotations

__all__ = ["CAUTION", "CAUTION_SHORT", "GROUND_CAUTION"]

CAUTION = (
    "CAUTION: these figures are computed from the data recorded in this ledger and are not "
    "approved data. The approved flight manual or the manufacturer's weight and balance data "
    "and local regulations govern. A qualified person must verify this loading before operation."
)

CAUTION_SHORT = (
    "Not approved data: the approved flight manual / manufacturer's data and local regulations "
    "govern; a qualified person verifies before operation."
)

GROUND_CAUTION = (
    "Axle-group rules are shown as an advisory check, never as a legal determination: the "
    "manufacturer's ratings and the local road rules govern."
)

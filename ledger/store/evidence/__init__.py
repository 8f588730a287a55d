"""Evidence: checking that everything a verdict depends on is as it was written.

A loading sheet's verdict depends on the vehicle's type revision (its limits and envelopes), the
vehicle's link to that type, its ledger (the empty weight), the configuration it names, and, for
an amendment, the sheet it amends. Each of these is sealed (:mod:`ledger.store.seal`,
:mod:`ledger.store.chain`); this module recomputes the seals and follows the links:

- :func:`checked_type` reads a type revision only if the type's chain of revisions verifies and
  the stored spec, parsed, still has the content hash the revision was sealed with;
- :func:`require_vehicle` is what every command that builds figures for operation calls first
  (through :func:`ledger.store.entries.current_empty`): the vehicle's record,
  its type's revisions, its ledger chain, and the ledger head recorded by its newest saved sheet;
- :func:`verify_fleet` is ``wbledger verify``: all of the above for every type and vehicle, every
  configuration version and every saved sheet, and the hashes a user kept (``--expect``).

What no seal can show by itself — rows rewritten with every later seal recomputed, the newest
rows removed, a forged row appended with a correct seal — is caught by comparing with hashes
kept outside the database: a printed sheet's hashes (``--expect``) or a checkpoint file
(:mod:`ledger.store.checkpoint`).

The checks live by what they check: :mod:`~ledger.store.evidence.revisions`,
:mod:`~ledger.store.evidence.vehicles`, :mod:`~ledger.store.evidence.configurations`,
:mod:`~ledger.store.evidence.sheets`, and the whole fleet in :mod:`~ledger.store.evidence.fleet`
(with :mod:`~ledger.store.evidence.parallel` for a large one).
"""

from __future__ import annotations

from ledger.store.evidence.configurations import check_configuration_chain
from ledger.store.evidence.fleet import (
    EvidenceReport,
    TypeEvidence,
    VehicleEvidence,
    parse_hash,
    unverified_vehicles,
    verify_fleet,
)
from ledger.store.evidence.revisions import checked_type
from ledger.store.evidence.sheets import sheet_problem
from ledger.store.evidence.vehicles import require_vehicle

__all__ = [
    "TypeEvidence",
    "VehicleEvidence",
    "EvidenceReport",
    "checked_type",
    "check_configuration_chain",
    "require_vehicle",
    "sheet_problem",
    "unverified_vehicles",
    "verify_fleet",
    "parse_hash",
]

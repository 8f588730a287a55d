"""An envelope violation below the envelope names the envelope's bottom at that CG.

Issue 13 (the "below" case of ``_envelope_violation``): the limit is the phase mass minus the
distance down to the envelope (``mass - to_min_mass``), not plus it. Invented test type.
"""

from __future__ import annotations

from ledger.testing import assert_close
from tests.loadsheet.common import LB, empty_lb_in, envelope, lb_in_type, make_type, sheet


def test_below_the_envelope_names_its_bottom_as_the_limit():
    # A rectangle 70..90 in, 5,000..8,000 lb; the vehicle is 4,000 lb at 80 in: 1,000 lb below
    # the bottom edge at its CG (common practice: the envelope's lowest mass at that arm).
    vt = make_type(lb_in_type(name="TEST-LOW",
                              envelopes=envelope([(70, 5000), (90, 5000), (90, 8000),
                                                  (70, 8000)])))
    doc = sheet(vt, empty_lb_in(4000, 80.0), "", with_fixes=False)
    below = [v for v in doc["violations"] if v.get("side") == "below"]
    assert below, doc["violations"]
    v = below[0]
    assert_close(v["limit"] / LB, 5000.0, unit="lb", rtol=1e-9)
    assert_close(v["actual"] / LB, 4000.0, unit="lb", rtol=1e-9)
    assert_close(v["excess"] / LB, 1000.0, unit="lb", rtol=1e-9)
    assert "(5000 lb at CG 80.00 in)" in v["message"]

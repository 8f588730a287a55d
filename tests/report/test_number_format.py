"""Issue 13 item 16: any figure a report prints can be typed back as input.

The sheet printed ``2,398 lb`` while the input parser (ledger/units) refuses thousands
separators; every printed figure now goes through one formatting home
(:func:`ledger.units.fixed`) without them. Invented test type (tests/report/common.py).
"""

from __future__ import annotations

import re

import pytest

from ledger.report.sheet_text import check_lines, sheet_text
from ledger.units import fixed, parse_length, parse_mass, parse_volume
from tests.report.common import OVER_ZF_PLAN, built

_QUANTITY = re.compile(r"(?<![\w.,])([+-]?\d[\d,]*(?:\.\d+)?) (lb|in|USgal)\b")
_PARSE = {"lb": parse_mass, "in": parse_length, "USgal": parse_volume}


def _quantities(text: str) -> list[str]:
    return [f"{n} {u}" for n, u in _QUANTITY.findall(text)]


@pytest.mark.parametrize("render", [lambda d: sheet_text(d, 100),
                                    lambda d: "\n".join(check_lines(d, 100))])
def test_every_printed_quantity_parses_back(render):
    doc = built(OVER_ZF_PLAN, empty_lb=2250.0)  # masses over 1,000 lb: where a comma went
    text = render(doc)
    found = _quantities(text)
    assert any(float(q.split()[0].replace(",", "")) >= 1000 for q in found), found
    for q in found:
        number, unit = q.split()
        value = _PARSE[unit](q)  # raises UnitError on "2,398 lb"
        assert value == pytest.approx(_PARSE[unit](f"{float(number.replace(',', ''))} {unit}"))


def test_the_one_home_has_no_thousands_separator():
    assert fixed(2398.0, 0) == "2398"
    assert fixed(-1234567.25, 2, signed=True) == "-1234567.25"
    assert parse_mass(fixed(2398.0, 0) + " lb") == pytest.approx(2398 * 0.45359237)

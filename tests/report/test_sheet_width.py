"""Issue 13 item 3: no figure is split across lines, at any width the sheet accepts.

``sheet prepare --width 60…79`` used to fold numbers inside table cells ("1454." / ".0"). A
table too wide now goes on in a second part (its first column repeated); below the minimum of
60 columns the width is refused, exit 2 naming --width. The figures checked are the table
cells (the document's figures formatted in its display units): each must appear whole in the
text as often as the tables hold it.
"""

from __future__ import annotations

import re

import pytest
from rich.cells import cell_len

from ledger.errors import InputError
from ledger.report.sheet_text import MIN_WIDTH, sheet_text
from ledger.report.sheet_view import SheetView
from tests.report import samples
from tests.report.common import OVER_ZF_PLAN, built, saved_sheet_vehicle

DOCS = {"over_zf": lambda: built(OVER_ZF_PLAN, note="n"),
        "helicopter_lateral": samples.helicopter_lateral,
        "ground_vehicle": samples.ground_vehicle,
        "moment_envelope": samples.airplane_moment_envelope}
_FIGURE = re.compile(r"^[+-]?\d+(\.\d+)?$")


def _figures(doc: dict) -> dict[str, int]:
    """Every numeric cell of the sheet's tables, with how many times the tables hold it."""
    view = SheetView(doc)
    counts: dict[str, int] = {}
    for t in (view.items_table(), view.stations_table(), view.fuel_table(),
              view.phases_table(), view.margins_table(), view.axles_table()):
        for r in t.rows if t else []:
            for i in t.numeric:
                cell = r[i].rstrip("*")
                if _FIGURE.match(cell):
                    counts[cell] = counts.get(cell, 0) + 1
    return counts


@pytest.mark.parametrize("name", DOCS)
def test_no_figure_is_split_at_any_width(name):
    doc = DOCS[name]()
    figures = _figures(doc)
    assert len(figures) > 10
    for width in range(40, 201):
        if width < MIN_WIDTH:
            with pytest.raises(InputError, match="--width"):
                sheet_text(doc, width)
            continue
        text = sheet_text(doc, width)
        # the hashes at the foot are not figures (a 64-digit hash folds at 60 columns)
        body = text.split("\nType data")[0]
        assert max(cell_len(s) for s in body.splitlines()) <= width, width
        tokens = re.findall(r"(?<![\w.])[+-]?\d+(?:\.\d+)?(?![\w.])", body)
        for fig, n in figures.items():
            assert tokens.count(fig) >= n, (width, fig, tokens.count(fig), n)


def test_cli_refuses_a_width_under_the_minimum(cli, tmp_path):
    saved_sheet_vehicle(cli, tmp_path)
    r = cli("sheet", "prepare", tmp_path / "ok.toml", "--width", "59")
    assert r.exit_code == 2
    assert "--width" in r.stderr + r.stdout
    r = cli("sheet", "prepare", tmp_path / "ok.toml", "--width", "60")
    assert r.exit_code == 0, r.stderr
    assert max(cell_len(s) for s in r.stdout.split("\nType data")[0].splitlines()) <= 60

"""ledger.bounds: the limits on what comes from outside, and that they match the database.

The column sizes are read from the ORM models (the migrations build the same columns,
``tests/store/test_db.py``); the integer range is PostgreSQL's ``integer`` type (PostgreSQL
documentation, "Numeric Types": -2147483648 to +2147483647).
"""

from __future__ import annotations

import json

import pytest

from ledger import bounds
from ledger.errors import InputError
from ledger.store import models


@pytest.mark.parametrize("column, limit", [
    (models.LedgerEntryRow.actor, bounds.TEXT_MAX),
    (models.LedgerEntryRow.reference, bounds.TEXT_MAX),
    (models.LedgerEntryRow.item, bounds.TEXT_MAX),
    (models.LoadingSheetRow.preparer, bounds.TEXT_MAX),
    (models.ConfigurationRow.created_by, bounds.TEXT_MAX),
    (models.ConfigurationRow.name, bounds.NAME_MAX),
    (models.VehicleRow.serial, bounds.NAME_MAX),
    (models.TypeRevisionRow.source_name, bounds.SOURCE_NAME_MAX),
])
def test_text_limits_are_the_column_sizes(column, limit):
    assert column.property.columns[0].type.length == limit


def test_id_max_is_the_postgresql_integer_maximum():
    assert bounds.ID_MAX == 2147483647  # PostgreSQL docs, "Numeric Types" (integer)
    # Every id, entry number and revision column is such an integer.
    from sqlalchemy import Integer

    for col in (models.LedgerEntryRow.seq, models.LoadingSheetRow.id,
                models.TypeRevisionRow.revision):
        assert type(col.property.columns[0].type) is Integer


def _message(call) -> str:
    with pytest.raises(InputError) as info:
        call()
    assert "\n" not in str(info.value)
    return str(info.value)


def _nested(levels: int) -> dict:
    """A document of ``levels`` levels: the document itself, then arrays inside it."""
    return {"x": json.loads("[" * (levels - 1) + "]" * (levels - 1))}


def test_nesting_is_bounded_at_64_levels():
    assert bounds.check_document(_nested(64)) == _nested(64)
    assert _message(lambda: bounds.check_document(_nested(65), source="f.json")) == (
        "f.json: x" + "[1]" * 13 + "… = (nested 65 levels deep): at most 64 levels of nesting")
    # Deeper than the JSON and TOML parsers follow: one line, not a RecursionError.
    deep = "[" * 100_000 + "]" * 100_000
    assert _message(lambda: bounds.load_json(deep, source="f.json")) == (
        "f.json: document = (nested too deep to read): at most 64 levels of nesting")
    assert _message(lambda: bounds.load_toml("x = " + deep, source="f.toml")) == (
        "f.toml: document = (nested too deep to read): at most 64 levels of nesting")


@pytest.mark.parametrize("value, ok", [
    (1e15, True), (-1e15, True), (10**15, True), (2**49, True),
    (1e15 * (1 + 1e-15), False), (10**15 + 1, False), (-(10**15) - 1, False),
    (2**63 - 1, False), (10**30, False), (1e300, False),
])
def test_numbers_in_a_document_are_at_most_1e15(value, ok):
    doc = {"a": [value]}
    if ok:
        assert bounds.check_document(doc) is doc
    else:
        assert _message(lambda: bounds.check_document(doc)).startswith("a[1] = ")


def test_nan_and_infinity_are_left_to_the_field():
    # The field that reads them refuses them in its own words ("a mass must be finite").
    doc = {"a": float("nan"), "b": float("inf")}
    assert bounds.check_document(doc) is doc


def test_a_number_too_long_for_python_is_one_line():
    assert _message(lambda: bounds.load_json("[" + "9" * 5000 + "]", source="f.json")) == (
        "f.json: document = (a whole number too long to read): a number from -1e+15 to 1e+15")
    assert _message(lambda: bounds.load_toml("x = " + "9" * 5000, source="f.toml")) == (
        "f.toml: document = (a whole number too long to read): a number from -1e+15 to 1e+15")


def test_nul_in_texts_and_keys():
    assert _message(lambda: bounds.load_json('{"a": {"b": "x\\u0000"}}', source="f")) == (
        "f: a.b = 'x\\x00': text without NUL characters")
    assert _message(lambda: bounds.load_json('{"a": [{"k\\u0000": 1}]}', source="f")) == (
        "f: a key in a[1] = 'k\\x00': a key without NUL characters")
    assert _message(lambda: bounds.load_toml('t = "a\\u0000"', source="f")) == (
        "f: t = 'a\\x00': text without NUL characters")
    assert _message(lambda: bounds.check_document("a\x00")) == (
        "document = 'a\\x00': text without NUL characters")


def test_check_text_length_is_inclusive():
    assert bounds.check_text("--by", "b" * 200, 200) == "b" * 200
    assert _message(lambda: bounds.check_text("--by", "b" * 201, 200)) == (
        "--by = '" + "b" * 40 + "…': at most 200 characters")

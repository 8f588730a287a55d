"""Alembic migration scripts of wbledger (shipped in the wheel as ``ledger._migrations``)."""

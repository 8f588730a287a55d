"""The schema revision every command compares with is the head of the shipped migrations."""

from __future__ import annotations

from alembic.script import ScriptDirectory

from ledger.store.db import HEAD_REVISION, alembic_config, head_revision, script_revisions


def test_head_revision_constant_is_the_alembic_head():
    # Adding a migration means raising HEAD_REVISION with it; this test says so when forgotten.
    head = ScriptDirectory.from_config(alembic_config()).get_current_head()
    assert HEAD_REVISION == head
    assert head_revision() == head


def test_script_revisions_holds_every_migration():
    revisions = {s.revision for s in ScriptDirectory.from_config(alembic_config()).walk_revisions()}
    assert script_revisions() == revisions
    assert HEAD_REVISION in revisions

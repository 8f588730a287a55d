"""Alembic environment for wbledger.

wbledger runs its migrations from code (:func:`ledger.store.db.upgrade`), handing over its own
connection in ``config.attributes["connection"]``. The ``alembic`` command line works too, from
the checkout: ``alembic -c migrations/alembic.ini -x url=sqlite:///file.db upgrade head``.
"""

from __future__ import annotations

from alembic import context
from sqlalchemy import create_engine

from ledger.store.models import Base

config = context.config
target_metadata = Base.metadata


def _configure(connection) -> None:
    context.configure(
        connection=connection,
        target_metadata=target_metadata,
        # SQLite cannot ALTER most things in place; batch mode copies the table instead.
        render_as_batch=connection.dialect.name == "sqlite",
        compare_type=True,
    )


def run_migrations_online() -> None:
    connection = config.attributes.get("connection")
    if connection is not None:
        _configure(connection)
        with context.begin_transaction():
            context.run_migrations()
        return
    url = context.get_x_argument(as_dictionary=True).get("url") or config.get_main_option(
        "sqlalchemy.url"
    )
    engine = create_engine(url)
    with engine.connect() as conn:
        _configure(conn)
        with context.begin_transaction():
            context.run_migrations()


if context.is_offline_mode():
    raise SystemExit("wbledger migrations run online only (they need a connection)")
run_migrations_online()

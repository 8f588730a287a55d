"""Integrity commands: ``verify``, ``checkpoint`` and ``checkpoint-key``.

The work is :mod:`ledger.services.integrity`: ``verify`` recomputes every seal and follows every
chain, and compares with hashes kept outside the database: ``--expect`` (printed on a sheet)
and ``--against`` (a checkpoint file).
"""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common


def register(app: typer.Typer) -> None:
    app.command("verify")(verify)
    app.command("checkpoint")(checkpoint)
    app.command("checkpoint-key")(checkpoint_key)


def verify(ctx: typer.Context,
           registration: str = typer.Argument(None, metavar="REG",
                                              help="One vehicle (default: every one)."),
           expect: list[str] = typer.Option(None, "--expect", metavar="HASH",
                                            help="A hash kept outside the database (a ledger "
                                                 "head or sheet hash printed on a sheet, a head "
                                                 "printed here) that must still be in a chain; "
                                                 "may be repeated."),
           against: Path = typer.Option(None, "--against", metavar="FILE",
                                        help="A checkpoint file: every head it recorded must "
                                             "still be in its place."),
           public_key: Path = typer.Option(None, "--public-key", metavar="FILE",
                                           help="With --against: the checkpoint must be signed "
                                                "by the key whose public half this is."),
           exact: bool = typer.Option(False, "--exact",
                                      help="With --against: nothing may have been added since "
                                           "the checkpoint either (no entry, sheet, revision "
                                           "or vehicle)."),
           as_json: bool = common.JSON_OPTION) -> None:
    """Check every seal and chain: types, vehicles, ledgers, configurations, saved sheets and
    the database's append-only guards; name the first thing that does not match (exit 1)."""
    from ledger.errors import ChainError
    from ledger.report.ledger import render_verify
    from ledger.services.integrity import verify as run_verify
    from ledger.services.integrity import verify_request

    request = verify_request(registration, expect=expect or (), against=against,
                             public_key=public_key, exact=exact)
    result = run_verify(common.state(ctx).engine(), request)
    common.emit(result.document, render_verify, as_json)
    if result.failure is not None:
        raise ChainError(result.failure)


def checkpoint(ctx: typer.Context,
               output: Path = typer.Argument(..., metavar="FILE",
                                             help="The checkpoint file to write (JSON)."),
               sign: Path = typer.Option(None, "--sign", metavar="KEYFILE",
                                         help="Sign it with this Ed25519 private key (from "
                                              "`wbledger checkpoint-key`)."),
               as_json: bool = common.JSON_OPTION) -> None:
    """Write the heads of every chain to FILE, to be kept away from the database; a later
    `wbledger verify --against FILE` catches a rewrite, truncation or forged append since."""
    from ledger.files import check_output_path
    from ledger.services.integrity import write_checkpoint
    from ledger.units.display import counted

    check_output_path(output, "FILE")
    summary = write_checkpoint(common.state(ctx).engine(), output, sign=sign).to_dict()

    def render(d):
        counts = ", ".join(counted(d[k], k[:-1]) for k in ("types", "vehicles", "configurations"))
        typer.echo(f"Wrote checkpoint {d['file']}:")
        typer.echo(f"  {counts}{', signed' if d['signed'] else ''}.")
        typer.echo(f"  digest {d['digest']}")
        typer.echo("Keep it where the database's users cannot write. Check later with")
        typer.echo(f"`wbledger verify --against {d['file']}`.")

    common.emit(summary, render, as_json)


def checkpoint_key(keyfile: Path = typer.Argument(..., metavar="KEYFILE",
                                                  help="The new private key file (a public "
                                                       "key is written beside it as "
                                                       "KEYFILE.pub).")) -> None:
    """Make a new Ed25519 key pair for signing checkpoints (the private key is created 0600
    and never overwrites a file)."""
    from ledger.services.integrity import make_key_pair

    keys = make_key_pair(keyfile)
    typer.echo(f"Wrote the private key {keys.private} (keep it secret; only its holder can sign) "
               f"and the public key {keys.public} (give it to whoever checks).")

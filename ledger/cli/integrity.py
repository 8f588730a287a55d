"""Integrity commands: ``verify``, ``checkpoint`` and ``checkpoint-key``.

``verify`` recomputes every seal and follows every chain (:mod:`ledger.store.evidence`), and
compares with hashes kept outside the database: ``--expect`` (printed on a sheet) and
``--against`` (a checkpoint file, :mod:`ledger.store.checkpoint`).
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
           registration: str = typer.Argument(None, metavar="[REG]",
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
    from ledger.errors import ChainError, InputError
    from ledger.report.ledger import render_verify
    from ledger.store import checkpoint as cp
    from ledger.store.db import session_scope
    from ledger.store.evidence import parse_hash, verify_fleet

    hashes = [parse_hash(h) for h in expect or ()]
    if public_key is not None and against is None:
        raise InputError("--public-key", str(public_key), "only with --against FILE")
    if exact and against is None:
        raise InputError("--exact", "true", "only with --against FILE")
    if against is not None and registration is not None:
        raise InputError("REG", registration, "none with --against: a checkpoint is compared "
                         "with the whole database")
    saved = cp.read(against) if against is not None else None
    with session_scope(common.state(ctx).engine()) as session:
        report = verify_fleet(session, registration, expect=hashes)
        doc = report.to_dict()
        if saved is not None:
            found = cp.compare_with(session, saved, report, public_key=public_key)
            problems = list(found.problems)
            if exact:
                problems += [f"added since the checkpoint: {a}" for a in found.added]
            doc["checkpoint"] = {"file": str(against), "created_at": saved["created_at"],
                                 **found.to_dict(), "problems": problems, "exact": exact}
            doc["problems"] += problems
            doc["ok"] = doc["ok"] and not problems
    common.emit(doc, render_verify, as_json)
    if not report.ok:
        raise ChainError(report.summary())
    if not doc["ok"]:
        raise ChainError(f"the database does not match the checkpoint {against}: "
                         f"{doc['checkpoint']['problems'][0]}")


def checkpoint(ctx: typer.Context,
               output: Path = typer.Argument(..., metavar="FILE",
                                             help="The checkpoint file to write (JSON)."),
               sign: Path = typer.Option(None, "--sign", metavar="KEYFILE",
                                         help="Sign it with this Ed25519 private key (from "
                                              "`wbledger checkpoint-key`)."),
               as_json: bool = common.JSON_OPTION) -> None:
    """Write the heads of every chain to FILE, to be kept away from the database; a later
    `wbledger verify --against FILE` catches a rewrite, truncation or forged append since."""
    import json

    from ledger.files import check_output_path, write_output
    from ledger.store import checkpoint as cp
    from ledger.store.db import session_scope

    check_output_path(output, "FILE")
    engine = common.state(ctx).engine()
    with session_scope(engine) as session:
        doc = cp.take(session, database=engine.url.render_as_string(hide_password=True))
    if sign is not None:
        doc = cp.sign(doc, sign)
    write_output(output, json.dumps(doc, indent=1, ensure_ascii=False) + "\n", "FILE")
    summary = {"file": str(output), "created_at": doc["created_at"], "digest": doc["digest"],
               "types": len(doc["types"]), "vehicles": len(doc["vehicles"]),
               "configurations": len(doc["configurations"]),
               "signed": "signature" in doc}

    def render(d):
        typer.echo(f"Wrote checkpoint {d['file']}: {d['types']} types, {d['vehicles']} "
                   f"vehicles, {d['configurations']} configurations"
                   f"{', signed' if d['signed'] else ''}.")
        typer.echo(f"  digest {d['digest']}")
        typer.echo("Keep it where the database's users cannot write; check later with "
                   f"`wbledger verify --against {d['file']}`.")

    common.emit(summary, render, as_json)


def checkpoint_key(keyfile: Path = typer.Argument(..., metavar="KEYFILE",
                                                  help="The new private key file (a public "
                                                       "key is written beside it as "
                                                       "KEYFILE.pub).")) -> None:
    """Make a new Ed25519 key pair for signing checkpoints (the private key is created 0600
    and never overwrites a file)."""
    from ledger.errors import InputError
    from ledger.files import check_output_path, write_new
    from ledger.store.checkpoint import new_key_pair

    public = keyfile.with_name(keyfile.name + ".pub")
    for path in (keyfile, public):
        check_output_path(path, "KEYFILE")
        if path.exists() or path.is_symlink():
            raise InputError("KEYFILE", str(path), "a new file; it exists already and a key "
                             "is never overwritten")
    private_pem, public_pem = new_key_pair()
    private = write_new(keyfile, private_pem, "KEYFILE")
    write_new(public, public_pem, "KEYFILE")
    typer.echo(f"Wrote the private key {private} (keep it secret; only its holder can sign) "
               f"and the public key {public} (give it to whoever checks).")

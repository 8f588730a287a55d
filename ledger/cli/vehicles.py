"""``wbledger vehicle …``: add, list and show vehicles."""

from __future__ import annotations

import typer

from ledger.cli import common
from ledger.cli.conventions import examples

vehicle_app = typer.Typer(help="Vehicles: registrations of an imported type.",
                          no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.add_typer(vehicle_app, name="vehicle")


@vehicle_app.command("add", epilog=examples("wbledger vehicle add KVA-101 --type KV-P4"))
def add(ctx: typer.Context,
        registration: str = typer.Argument(..., metavar="REG", help="Registration or fleet id."),
        type_name: str = typer.Option(..., "--type", metavar="NAME",
                                      help="Name of an imported type."),
        serial: str = typer.Option(None, "--serial", metavar="TEXT", help="Serial number."),
        note: str = typer.Option(None, "--note", metavar="TEXT", help="Free text."),
        ) -> None:
    """Add a vehicle of an imported type."""
    import shlex

    from ledger.services.fleet import add_vehicle

    reg = add_vehicle(common.state(ctx).engine(), registration, type_name, serial=serial,
                      note=note)
    typer.echo(f"Added {reg} ({type_name}); next, its first weighing: "
               f"`wbledger weigh {shlex.quote(reg)}`.")


@vehicle_app.command("list", epilog=examples(
    "wbledger vehicle list", "wbledger vehicle list --json"))
def list_(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """The fleet: each vehicle's current empty mass and CG, last weighing and warnings."""
    from ledger.report.ledger import render_fleet
    from ledger.services.fleet import fleet

    data = fleet(common.state(ctx).engine())
    common.emit(data, render_fleet, as_json)


@vehicle_app.command("show", epilog=examples("wbledger vehicle show KVA-101"))
def show(ctx: typer.Context,
         registration: str = typer.Argument(..., metavar="REG",
                                            help="Registration or fleet id."),
         as_json: bool = common.JSON_OPTION) -> None:
    """One vehicle: its type, current empty mass and CG, and last entries."""
    from ledger.report.ledger import render_vehicle
    from ledger.services.fleet import vehicle

    data = vehicle(common.state(ctx).engine(), registration)
    common.emit(data, render_vehicle, as_json)
